"""A progress bar on stderr for long checks (rich), shown only when stderr is a terminal."""
from __future__ import annotations

import contextlib
import sys
from typing import Callable, Iterator, Optional


@contextlib.contextmanager
def stage_progress(enabled: bool) -> Iterator[Optional[Callable[[int, int], None]]]:
    """Yield a ``progress(done, total)`` callback drawing a bar, or None when not wanted."""
    if not enabled or not sys.stderr.isatty():
        yield None
        return
    from rich.console import Console
    from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn

    bar = Progress(TextColumn("stages"), BarColumn(), MofNCompleteColumn(), TimeElapsedColumn(),
                   console=Console(stderr=True), transient=True)
    task = None

    def progress(done: int, total: int) -> None:
        nonlocal task
        if task is None:
            task = bar.add_task("stages", total=total)
        bar.update(task, completed=done, total=total)

    with bar:
        yield progress

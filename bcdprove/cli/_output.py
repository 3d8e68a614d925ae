"""What a checking command prints and writes once it has a result: report files first, then
one JSON object, one verdict line, or the text report followed by the files written."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Optional, Sequence

import typer

from ._options import write_text_file


@dataclass
class ReportFile:
    """A report file the user asked for: ``path`` None when not asked."""

    label: str                    # the report line's label, e.g. "junit"
    path: Optional[str]
    what: str                     # for an error writing it, e.g. "JUnit report"
    text: Callable[[], str]       # built only when the file is asked for
    note: str                     # shown after the path in the text report


def deliver(files: Sequence[ReportFile], *, as_json: bool, json_text: Callable[[], str],
            quiet: bool, verdict_line: Callable[[], str], report: Callable[[], str]) -> None:
    written = []
    for item in files:
        if item.path:
            write_text_file(item.path, item.text(), item.what)
            written.append(f"{item.label:<12}{item.path} {item.note}")
    if as_json:
        typer.echo(json_text())
    elif quiet:
        typer.echo(verdict_line())
    else:
        typer.echo(report())
        for line in written:
            typer.echo(line)


def verdict_line(verdict, subject: str, seconds: float, inputs: dict | None = None,
                 extra: str = "") -> str:
    """The one line of ``--quiet``: verdict, what was checked, engine and time, then the
    failing input (and ``extra``) when there is one, else the reason when there is one."""
    line = f"{verdict.status}: {subject} ({verdict.engine}, {seconds:.2f} s)"
    if inputs is not None:
        line += "; counterexample " + ", ".join(f"{k}={v}" for k, v in inputs.items()) + extra
    elif verdict.reason:
        line += f"; {verdict.reason}"
    return line

"""The command line: ``bcdprove eval``, ``check`` and ``equiv`` (a thin layer over the public API)."""
from __future__ import annotations

import os
import sys

import typer

from ..errors import BcdproveError

app = typer.Typer(
    add_completion=False,
    no_args_is_help=True,
    help="Prove binary/BCD converter designs written in Verilog, or show the input that breaks them.",
    pretty_exceptions_enable=False,
)


def _register_commands() -> None:
    from . import eval_cmd
    eval_cmd.register(app)
    try:
        from . import check_cmd
    except ImportError:  # pragma: no cover - only while the check command is being built
        return
    check_cmd.register(app)
    from . import equiv_cmd
    equiv_cmd.register(app)


_register_commands()


def main() -> None:
    """Console-script entry: bad input is one ``file:line: message`` line and exit code 2."""
    debug = "--debug" in sys.argv
    try:
        code = app(standalone_mode=False)
    except BcdproveError as error:
        if debug:
            raise
        print(f"bcdprove: error: {error}" if error.file is None else str(error), file=sys.stderr)
        sys.exit(2)
    except typer.Exit as done:  # raised through when a command ends early
        sys.exit(done.exit_code)
    except (typer.Abort, KeyboardInterrupt):
        print("bcdprove: interrupted", file=sys.stderr)
        sys.exit(130)
    except Exception as error:  # usage errors and anything unexpected
        if hasattr(error, "show") and hasattr(error, "exit_code"):  # click's (typer's own copy)
            error.show()
            sys.exit(error.exit_code)
        if debug:
            raise
        print(f"bcdprove: internal error: {type(error).__name__}: {error} (run with --debug for the "
              f"traceback, and please report it)", file=sys.stderr)
        sys.exit(2)
    sys.exit(code if isinstance(code, int) else 0)


def console() -> None:
    """The installed ``bcdprove`` command and ``python -m bcdprove``: :func:`main`, then the
    process ends without the interpreter's teardown.

    The verdict and every report are written by then.  Freeing a wide design's model object
    by object at exit took longer than some checks (1.3 s for a 128-bit doubling-table
    converter, measured with bench/bench_stages.py), so the streams are flushed and the
    process ends at once; the operating system reclaims the memory.
    """
    try:
        main()
        code = 0
    except SystemExit as ended:
        if ended.code is not None and not isinstance(ended.code, int):
            raise
        code = ended.code or 0
    try:
        sys.stdout.flush()
        sys.stderr.flush()
    except (OSError, ValueError):  # a closed pipe: the exit code still matters
        pass
    os._exit(code)

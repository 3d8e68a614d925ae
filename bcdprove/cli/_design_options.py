"""Options every command that reads a design shares, and the one place that reads it."""
from __future__ import annotations

from typing import List, Optional

import typer

from ._options import parse_assignments

FILES = typer.Argument(..., help="Verilog source files, read in order.", show_default=False)
TOP = typer.Option(..., "--top", help="The top module to elaborate.", show_default=False)
PARAM = typer.Option(None, "--param", metavar="NAME=VALUE",
                     help="Override a parameter of the top module (repeatable).")
INCLUDE = typer.Option(None, "-I", "--include-dir", metavar="DIR",
                       help="Directory searched by `include (repeatable).")
DEFINE = typer.Option(None, "-D", "--define", metavar="NAME[=VALUE]",
                      help="Define a preprocessor macro (repeatable).")
DEBUG = typer.Option(False, "--debug", help="Show a traceback on errors.")


def parse_defines(items: Optional[List[str]]) -> dict[str, str]:
    defines = {}
    for item in items or []:
        name, _, value = item.partition("=")
        defines[name.strip()] = value
    return defines


def read(files: List[str], top: str, params: Optional[List[str]], include_dirs: Optional[List[str]],
         defines: Optional[List[str]]):
    """Read and elaborate the design named on the command line."""
    from ..verilog import read_design
    return read_design(files, top, parse_assignments(params or [], "--param"),
                       include_dirs=include_dirs or [], defines=parse_defines(defines))

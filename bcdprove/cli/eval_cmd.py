"""``bcdprove eval``: evaluate a design's model on given input vectors, or cycle by cycle."""
from __future__ import annotations

import json
from typing import List, Optional

import typer

from ..errors import BcdproveError
from . import _design_options as opt
from ._options import parse_assignments, parse_number, read_vector_file

_VECTORS_HELP = ("A file of vectors: one per line, PORT=VALUE pairs. With --cycles, line k is "
                 "cycle k unless it starts with @T (the values of cycle T; later lines follow "
                 "on from T+1), and PORT@T=VALUE sets one input in cycle T; an input keeps its "
                 "value until set again.")


def register(app: typer.Typer) -> None:
    app.command("eval", help="Evaluate the model of a design on input vectors (no proof).")(eval_command)


def eval_command(
    files: List[str] = opt.FILES,
    top: str = opt.TOP,
    param: Optional[List[str]] = opt.PARAM,
    include_dir: Optional[List[str]] = opt.INCLUDE,
    define: Optional[List[str]] = opt.DEFINE,
    set_: Optional[List[str]] = typer.Option(
        None, "--set", metavar="PORT[@T]=VALUE",
        help="An input value (repeatable); one vector. With --cycles, PORT@T=VALUE sets it from "
             "cycle T on (PORT=VALUE: from cycle 0)."),
    vectors: Optional[str] = typer.Option(None, "--vectors", metavar="PATH", help=_VECTORS_HELP),
    cycles: Optional[int] = typer.Option(
        None, "--cycles", metavar="N",
        help="Run a clocked design for N clock cycles (active edge at the end of each); "
             "registers start unknown (x) unless initialised."),
    clock: Optional[str] = typer.Option(None, "--clock", metavar="PORT",
                                        help="With --cycles: the clock input (default: the "
                                             "registers' clock)."),
    registers: bool = typer.Option(False, "--registers",
                                   help="With --cycles: show every register too."),
    as_json: bool = typer.Option(False, "--json",
                                 help="One JSON object per vector (per cycle with --cycles) per "
                                      "line."),
    debug: bool = opt.DEBUG,
) -> None:
    if cycles is None and vectors is None and not set_:
        raise BcdproveError("give the inputs either with --set PORT=VALUE ... or with --vectors PATH")
    if bool(set_) and bool(vectors):
        raise BcdproveError("give the inputs either with --set PORT=VALUE ... or with --vectors PATH")
    if cycles is None and (clock is not None or registers):
        raise BcdproveError("--clock and --registers go with --cycles N")
    model = opt.read(files, top, param, include_dir, define)
    if cycles is not None:
        _eval_cycles(model, cycles, clock, set_, vectors, registers, as_json)
        return
    if vectors:
        rows = read_vector_file(vectors)
        source = vectors
    else:
        rows = [(None, parse_assignments(set_, "--set"))]
        source = None
    from ..evaluation import evaluate_vectors
    results = evaluate_vectors(model, [vector for _, vector in rows],
                               where=[(source, line) for line, _ in rows])
    from ..reports.values import vector_table
    _show(model, results, as_json, lambda: vector_table(model, results))


def _cycle_of(text: str, what: str, file, line) -> int:
    value = parse_number(text, what, file, line)
    if value < 0:
        raise BcdproveError(f"{what}: cycle {value} is negative", file, line)
    return value


def _place(settings: dict, where: dict, cycle: int, name: str, value: int, file, line) -> None:
    slot = settings.setdefault(cycle, {})
    if name in slot:
        raise BcdproveError(f"`{name}` is given twice for cycle {cycle}", file, line)
    slot[name] = value
    where.setdefault(cycle, (file, line))


def _split(item: str, what: str, file, line) -> tuple[str, Optional[int], int]:
    name, sep, value = item.partition("=")
    if not sep or not name.strip():
        raise BcdproveError(f"{what}: expected PORT=VALUE or PORT@T=VALUE, got `{item}`", file, line)
    port, at, cycle = name.strip().partition("@")
    when = _cycle_of(cycle, f"{what} {port}@", file, line) if at else None
    return port, when, parse_number(value, f"{what} {name.strip()}", file, line)


def parse_cycle_settings(set_: Optional[List[str]], vectors: Optional[str]):
    """(settings per cycle, where per cycle) from ``--set`` items or a vector file (see
    _VECTORS_HELP for the format)."""
    settings: dict[int, dict[str, int]] = {}
    where: dict[int, tuple] = {}
    if not vectors:
        for item in set_ or []:
            port, when, value = _split(item, "--set", None, None)
            _place(settings, where, when or 0, port, value, None, None)
        return settings, where
    try:
        with open(vectors, encoding="utf-8") as handle:
            lines = handle.read().splitlines()
    except OSError as error:
        raise BcdproveError(f"cannot read vector file: {error.strerror}", vectors) from None
    cycle = 0
    for number, text in enumerate(lines, start=1):
        words = text.split()
        if not words or words[0].startswith("#"):
            continue
        if words[0].startswith("@"):
            cycle = _cycle_of(words[0][1:], "cycle", vectors, number)
            words = words[1:]
        for item in words:
            port, when, value = _split(item, "vector", vectors, number)
            _place(settings, where, cycle if when is None else when, port, value, vectors, number)
        settings.setdefault(cycle, {})
        cycle += 1
    return settings, where


def _eval_cycles(model, cycles: int, clock, set_, vectors, registers: bool, as_json: bool) -> None:
    from ..evaluation import evaluate_cycles

    settings, where = parse_cycle_settings(set_, vectors)
    results = evaluate_cycles(model, cycles, settings, clock, where)
    from ..reports.clocked_text import evaluation_table
    _show(model, results, as_json, lambda: evaluation_table(results, registers))


def _show(model, results, as_json: bool, table) -> None:
    """One JSON object per result, or the model's notes on stderr and ``table()``."""
    if as_json:
        for result in results:
            typer.echo(json.dumps(result.as_json()))
        return
    for note in model.notes:
        typer.echo(f"note: {note}", err=True)
    typer.echo(table())

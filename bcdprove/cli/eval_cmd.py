"""``bcdprove eval``: evaluate a design's model on given input vectors."""
from __future__ import annotations

import json
from typing import List, Optional

import typer

from ..errors import BcdproveError
from . import _design_options as opt
from ._options import parse_assignments, read_vector_file


def register(app: typer.Typer) -> None:
    app.command("eval", help="Evaluate the model of a design on input vectors (no proof).")(eval_command)


def eval_command(
    files: List[str] = opt.FILES,
    top: str = opt.TOP,
    param: Optional[List[str]] = opt.PARAM,
    include_dir: Optional[List[str]] = opt.INCLUDE,
    define: Optional[List[str]] = opt.DEFINE,
    set_: Optional[List[str]] = typer.Option(None, "--set", metavar="PORT=VALUE",
                                             help="An input value (repeatable); one vector."),
    vectors: Optional[str] = typer.Option(None, "--vectors", metavar="PATH",
                                          help="A file of vectors: one per line, PORT=VALUE pairs."),
    as_json: bool = typer.Option(False, "--json", help="One JSON object per vector per line."),
    debug: bool = opt.DEBUG,
) -> None:
    if bool(set_) == bool(vectors):
        raise BcdproveError("give the inputs either with --set PORT=VALUE ... or with --vectors PATH")
    model = opt.read(files, top, param, include_dir, define)
    if vectors:
        rows = read_vector_file(vectors)
        source = vectors
    else:
        rows = [(None, parse_assignments(set_, "--set"))]
        source = None
    from ..evaluation import evaluate_vectors
    results = evaluate_vectors(model, [vector for _, vector in rows],
                               where=[(source, line) for line, _ in rows])
    if as_json:
        for result in results:
            typer.echo(json.dumps(result.as_json()))
        return
    from ..reports.values import vector_table
    for note in model.notes:
        typer.echo(f"note: {note}", err=True)
    typer.echo(vector_table(model, results))

"""``bcdprove equiv``: show that two designs compute the same outputs, or the input where not.

Clocked pairs: pipelines (``--latency``) or handshakes (``--start``/``--done``/``--max-cycles``),
see ``spec/clocked_equivalence.py``.

Exit codes as for ``check``: 0 equivalent (proved), 1 different (disproved), 2 usage or input
error, 3 unknown.
"""
from __future__ import annotations

import time
from typing import List, Optional

import typer

from ..errors import BcdproveError
from . import _clocked_options as clocked
from . import _design_options as opt
from ._options import parse_assignments


def register(app: typer.Typer) -> None:
    app.command("equiv", help="Check that two designs compute the same outputs for every "
                              "input.")(equiv_command)


def _mapping(items: Optional[List[str]]) -> dict[str, str]:
    mapping: dict[str, str] = {}
    for item in items or []:
        for part in item.split(","):
            name_a, sep, name_b = part.partition("=")
            name_a, name_b = name_a.strip(), name_b.strip()
            if not sep or not name_a or not name_b:
                raise BcdproveError(f"--map: expected PORT=PORT, got `{part}`")
            if name_a in mapping:
                raise BcdproveError(f"--map: port `{name_a}` is mapped twice")
            mapping[name_a] = name_b
    return mapping


def _verdict_line(result) -> str:
    """One line for --quiet: verdict, both tops, the differing input and outputs if any."""
    from ._output import verdict_line

    found = result.verdict.counterexample
    return verdict_line(result.verdict, f"{result.model_a.top} against {result.model_b.top}",
                        result.seconds, None if found is None else found.inputs,
                        "" if found is None else f"; differing {', '.join(found.differing)}")


def equiv_command(
    files: List[str] = opt.FILES,
    top: str = opt.TOP,
    against: List[str] = typer.Option(..., "--against", metavar="FILE",
                                      help="A source file of the other design (repeatable).",
                                      show_default=False),
    against_top: str = typer.Option(..., "--against-top", metavar="MODULE",
                                    help="The top module of the other design.",
                                    show_default=False),
    param: Optional[List[str]] = opt.PARAM,
    against_param: Optional[List[str]] = typer.Option(
        None, "--against-param", metavar="NAME=VALUE",
        help="Override a parameter of the other design's top module (repeatable)."),
    map_ports: Optional[List[str]] = typer.Option(
        None, "--map", metavar="PORT=PORT",
        help="Pair a port of the design with a port of the other one (repeatable); other "
             "ports pair by name."),
    include_dir: Optional[List[str]] = opt.INCLUDE,
    define: Optional[List[str]] = opt.DEFINE,
    engine: str = typer.Option("auto", "--engine", help="auto (= sweep), sweep, miter or random."),
    timeout: Optional[float] = typer.Option(None, "--timeout", metavar="SECONDS",
                                            help="Bound the whole run; past it: unknown."),
    vectors: int = typer.Option(1 << 13, "--vectors", metavar="N",
                                help="Random vectors of the difference hunt."),
    seed: int = typer.Option(1, "--seed", help="Seed of the random vectors."),
    as_json: bool = typer.Option(False, "--json", help="One JSON object on stdout, nothing else."),
    quiet: bool = typer.Option(False, "--quiet", "-q", help="Only the verdict line on stdout."),
    junit: Optional[str] = typer.Option(None, "--junit", metavar="PATH",
                                        help="Also write a JUnit XML report."),
    testbench_path: Optional[str] = typer.Option(
        None, "--testbench", metavar="PATH",
        help="Also write a self-checking Verilog test bench instantiating both designs."),
    clock: Optional[str] = clocked.CLOCK,
    reset: Optional[str] = clocked.RESET,
    reset_low: Optional[bool] = clocked.RESET_LOW,
    start: Optional[str] = clocked.START,
    done: Optional[str] = clocked.DONE,
    latency: Optional[int] = clocked.LATENCY,
    hold_input: bool = clocked.HOLD_INPUT,
    max_cycles: Optional[int] = clocked.MAX_CYCLES,
    debug: bool = opt.DEBUG,
) -> None:
    if timeout is not None and timeout <= 0:
        raise BcdproveError(f"--timeout {timeout:g}: give a positive number of seconds")
    if vectors < 0:
        raise BcdproveError(f"--vectors {vectors}: give zero or more")
    from ..equivalence import equiv_models
    from ..verilog import read_design

    started = time.monotonic()          # --timeout counts reading the designs too
    overrides_a = parse_assignments(param or [], "--param")
    overrides_b = parse_assignments(against_param or [], "--against-param")
    defines = opt.parse_defines(define)
    model_a = read_design(files, top, overrides_a, include_dirs=include_dir or [],
                          defines=defines)
    model_b = read_design(against, against_top, overrides_b, include_dirs=include_dir or [],
                          defines=defines)
    if testbench_path and (model_a.is_clocked or model_b.is_clocked):
        raise BcdproveError("--testbench: not written for clocked pairs yet; leave it out")
    if testbench_path:
        from ..verilog import module_names
        shared = (module_names(files, include_dir or [], defines)
                  & module_names(against, include_dir or [], defines))
        if shared:
            raise BcdproveError(
                f"--testbench: both designs define module(s) {', '.join(sorted(shared))}; one "
                f"simulation cannot hold both, so no test bench is written (rename the modules "
                f"of one design, or leave out --testbench)")
    result = equiv_models(model_a, model_b, mapping=_mapping(map_ports), engine=engine,
                          timeout=timeout, vectors=vectors, seed=seed, latency=latency,
                          clock=clock, reset=reset, reset_low=reset_low, start=start, done=done,
                          hold_input=hold_input, max_cycles=max_cycles,
                          started=started)
    result.overrides_a, result.overrides_b = overrides_a, overrides_b
    from ..reports.equiv_testbench import write_equiv_testbench
    from ..reports.equiv_text import equiv_report
    from ..reports.json_report import equiv_json
    from ..reports.junit import equiv_junit
    from ._output import ReportFile, deliver

    deliver([ReportFile("junit", junit, "JUnit report", lambda: equiv_junit(result),
                        "(unknown is written as an error element)"),
             ReportFile("testbench", testbench_path, "test bench",
                        lambda: write_equiv_testbench(result),
                        "(top module bcdprove_equiv_tb; compile it with both designs' files)")],
            as_json=as_json, json_text=lambda: equiv_json(result), quiet=quiet,
            verdict_line=lambda: _verdict_line(result), report=lambda: equiv_report(result))
    if result.exit_code:
        raise SystemExit(result.exit_code)

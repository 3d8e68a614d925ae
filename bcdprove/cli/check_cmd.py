"""``bcdprove check``: prove a binary-to-BCD converter, or show the input that breaks it.

Exit codes: 0 proved, 1 disproved, 2 usage or input error (raised as BcdproveError and
printed by the command line's entry point), 3 unknown.
"""
from __future__ import annotations

import time
from typing import List, Optional

import typer

from ..engines.smt_miter import DEFAULT_FORM
from ..errors import BcdproveError
from . import _design_options as opt
from . import _clocked_options as clocked
from ._options import parse_assignments, parse_number


def register(app: typer.Typer) -> None:
    app.command("check", help="Check a converter against its specification: by default that "
                              "every output nibble is the matching decimal digit of the input "
                              "(--spec bin2bcd); also BCD to binary (--spec bcd2bin) and signed "
                              "input to sign and magnitude digits (--spec signed).")(check_command)


def _names(items: Optional[List[str]]) -> Optional[List[str]]:
    if not items:
        return None
    return [name.strip() for item in items for name in item.split(",") if name.strip()]


def _verdict_line(result) -> str:
    """One line for --quiet: verdict, top, and the failing input when there is one."""
    from ._output import verdict_line

    found = result.verdict.counterexample
    inputs = None if found is None else dict(found.inputs)
    if inputs and result.problem.spec == "bcd2bin":
        # Packed BCD reads as its digits in hexadecimal; in decimal it means nothing.
        inputs.update({name: f"0x{inputs[name]:x}" for name in result.problem.input_ports})
    return verdict_line(result.verdict, result.model.top, result.seconds, inputs)


def check_command(
    files: List[str] = opt.FILES,
    top: str = opt.TOP,
    param: Optional[List[str]] = opt.PARAM,
    include_dir: Optional[List[str]] = opt.INCLUDE,
    define: Optional[List[str]] = opt.DEFINE,
    spec: str = typer.Option("bin2bcd", "--spec",
                             help="bin2bcd (binary in, BCD digits out), bcd2bin (BCD digits in, "
                                  "binary out) or signed (two's complement in, sign and "
                                  "magnitude digits out)."),
    in_port: Optional[List[str]] = typer.Option(
        None, "--in", metavar="PORT[,PORT...]",
        help="The data input port; for --spec bcd2bin the digit input port(s), least "
             "significant digit first."),
    invalid_flag: Optional[str] = typer.Option(
        None, "--invalid-flag", metavar="PORT",
        help="--spec bcd2bin: an output that must be 1 exactly when a digit is above 9."),
    sign: Optional[str] = typer.Option(None, "--sign", metavar="PORT",
                                       help="--spec signed: the sign output (1 for negative)."),
    out_ports: Optional[List[str]] = typer.Option(
        None, "--out", metavar="PORT[,PORT...]",
        help="The digit output port(s), least significant digit first; for --spec bcd2bin "
             "the binary output."),
    msd_first: bool = typer.Option(False, "--msd-first",
                                   help="The low nibble holds the most significant digit."),
    max_input: Optional[str] = typer.Option(None, "--max-input", metavar="N",
                                            help="Check inputs 0..N only."),
    tie: Optional[List[str]] = typer.Option(None, "--tie", metavar="PORT=VALUE",
                                            help="Hold an input at a value (repeatable)."),
    engine: str = typer.Option("auto", "--engine",
                               help="auto, exhaustive, random, smt or stages."),
    timeout: Optional[float] = typer.Option(None, "--timeout", metavar="SECONDS",
                                            help="Bound the whole check; past it: unknown."),
    exhaustive_limit: int = typer.Option(24, "--exhaustive-limit", metavar="BITS",
                                         help="Exhaustive simulation up to 2**BITS inputs."),
    vectors: int = typer.Option(1 << 20, "--vectors", metavar="N",
                                help="Vectors of the random engine."),
    seed: int = typer.Option(1, "--seed", help="Seed of the random vectors."),
    smt_form: str = typer.Option(DEFAULT_FORM, "--smt-form",
                                 help="Miter formulation of the smt engine: divide or multiply."),
    as_json: bool = typer.Option(False, "--json", help="One JSON object on stdout, nothing else."),
    quiet: bool = typer.Option(False, "--quiet", "-q",
                               help="Only the verdict line on stdout; no progress bar."),
    junit: Optional[str] = typer.Option(None, "--junit", metavar="PATH",
                                        help="Also write a JUnit XML report."),
    testbench_path: Optional[str] = typer.Option(None, "--testbench", metavar="PATH",
                                                 help="Also write a self-checking Verilog test "
                                                      "bench."),
    clock: Optional[str] = clocked.CLOCK,
    reset: Optional[str] = clocked.RESET,
    reset_low: Optional[bool] = clocked.RESET_LOW,
    start: Optional[str] = clocked.START,
    done: Optional[str] = clocked.DONE,
    latency: Optional[int] = clocked.LATENCY,
    hold_input: bool = clocked.HOLD_INPUT,
    max_cycles: Optional[int] = clocked.MAX_CYCLES,
    vcd: Optional[str] = clocked.VCD,
    debug: bool = opt.DEBUG,
) -> None:
    if timeout is not None and timeout <= 0:
        raise BcdproveError(f"--timeout {timeout:g}: give a positive number of seconds")
    if exhaustive_limit < 0 or exhaustive_limit > 40:
        raise BcdproveError(f"--exhaustive-limit {exhaustive_limit}: choose 0 .. 40 bits")
    from ..checking import SPECS
    if spec not in SPECS:
        raise BcdproveError(f"--spec {spec}: choose one of {', '.join(SPECS)}")
    limit = parse_number(max_input, "--max-input") if max_input is not None else None
    started = time.monotonic()          # --timeout counts reading the design too
    model = opt.read(files, top, param, include_dir, define)
    protocol = clocked.ClockedArgs(clock=clock, reset=reset, reset_low=reset_low, start=start,
                                   done=done, latency=latency, hold_input=hold_input,
                                   max_cycles=max_cycles, vcd=vcd)
    if clocked.wants_clocked(model, protocol):
        if spec != "bin2bcd":
            raise BcdproveError(f"--spec {spec}: clocked designs (registers or clocking "
                                f"options) are checked against --spec bin2bcd only; "
                                f"{spec} for clocked designs is not supported yet")
        code = clocked.run_clocked_check(
            model, protocol, inputs=_names(in_port), outputs=_names(out_ports),
            msd_first=msd_first, max_input=limit, ties=parse_assignments(tie or [], "--tie"),
            engine=engine, timeout=timeout, exhaustive_limit=exhaustive_limit, vectors=vectors,
            seed=seed, smt_form=smt_form, as_json=as_json, junit=junit,
            testbench_path=testbench_path, quiet=quiet, overrides=parse_assignments(param or [], "--param"))
        if code:
            raise SystemExit(code)
        return
    from ..checking import check_model
    from ._progress import stage_progress

    with stage_progress(enabled=not (quiet or as_json)) as progress:
        result = check_model(model, inputs=_names(in_port), outputs=_names(out_ports),
                             msd_first=msd_first, max_input=limit,
                             ties=parse_assignments(tie or [], "--tie"), engine=engine,
                             timeout=timeout, exhaustive_limit=exhaustive_limit,
                             random_vectors=vectors, seed=seed, smt_form=smt_form,
                             started=started, progress=progress, spec=spec,
                             invalid_flag=invalid_flag, sign=sign)
    result.overrides = parse_assignments(param or [], "--param")
    from ..reports.json_report import check_json
    from ..reports.junit import check_junit
    from ..reports.testbench import write_testbench
    from ..reports.text import check_report
    from ._output import ReportFile, deliver

    deliver([ReportFile("junit", junit, "JUnit report", lambda: check_junit(result),
                        "(unknown is written as an error element)"),
             ReportFile("testbench", testbench_path, "test bench",
                        lambda: write_testbench(result), "(top module bcdprove_tb)")],
            as_json=as_json, json_text=lambda: check_json(result), quiet=quiet,
            verdict_line=lambda: _verdict_line(result), report=lambda: check_report(result))
    if result.exit_code:
        # SystemExit, not typer.Exit: click returns (drops) an Exit's code when the entry
        # point runs it with standalone_mode=False, and the verdict must reach the shell.
        raise SystemExit(result.exit_code)

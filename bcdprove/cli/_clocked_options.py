"""Command-line options of clocked checks, and the one call ``bcdprove check`` makes for them.

How ``check_cmd`` wires this in (the lead owns check_cmd.py):

1. add the parameters, with these module constants as their defaults::

       clock: Optional[str] = CLOCK, reset: Optional[str] = RESET,
       reset_low: Optional[bool] = RESET_LOW, start: Optional[str] = START,
       done: Optional[str] = DONE, latency: Optional[int] = LATENCY,
       hold_input: bool = HOLD_INPUT, max_cycles: Optional[int] = MAX_CYCLES,
       vcd: Optional[str] = VCD,

2. after reading the model, build ``args = ClockedArgs(clock=clock, reset=reset, ...)`` and::

       if wants_clocked(model, args):
           code = run_clocked_check(model, args, inputs=_names(in_port),
                                    outputs=_names(out_ports), msd_first=msd_first,
                                    max_input=limit, ties=parse_assignments(tie or [], "--tie"),
                                    engine=engine, timeout=timeout,
                                    exhaustive_limit=exhaustive_limit, vectors=vectors,
                                    seed=seed, smt_form=smt_form, as_json=as_json,
                                    junit=junit, testbench_path=testbench_path,
                                    overrides=parse_assignments(param or [], "--param"))
           if code:
               raise SystemExit(code)
           return

``run_clocked_check`` prints the report (text, or one JSON object with ``as_json``), writes
the ``--vcd`` / ``--testbench`` files and returns the exit code: 0 proved, 1 disproved,
3 unknown.  Bad input raises BcdproveError (exit code 2 from the entry point).
"""
from __future__ import annotations

import json
from dataclasses import dataclass
from typing import Mapping, Optional, Sequence

import typer

from ._options import write_text_file

CLOCK = typer.Option(None, "--clock", metavar="PORT",
                     help="Clocked check: the clock input (default: the registers' clock).")
RESET = typer.Option(None, "--reset", metavar="PORT",
                     help="Reset input, active in cycle 0 only (default: a common reset name).")
RESET_LOW = typer.Option(None, "--reset-low/--reset-high",
                         help="The reset's active level (default: from the sensitivity list or "
                              "the name, e.g. rst_n is active low).", show_default=False)
START = typer.Option(None, "--start", metavar="PORT",
                     help="Handshake: input held high for one cycle with the value.")
DONE = typer.Option(None, "--done", metavar="PORT",
                    help="Handshake: output that marks the result; read in its first high cycle.")
LATENCY = typer.Option(None, "--latency", metavar="CYCLES",
                       help="Pipeline: the value presented in cycle t shows in cycle t+CYCLES.")
HOLD_INPUT = typer.Option(False, "--hold-input",
                          help="Hold the data input after it is presented (handshake), or from "
                               "cycle 0 on (with --latency: a free-running converter).")
MAX_CYCLES = typer.Option(None, "--max-cycles", metavar="N",
                          help="Handshake: done must rise within N cycles of start "
                               "(default 2*W + 8).")
VCD = typer.Option(None, "--vcd", metavar="PATH",
                   help="Clocked check: write the failing run as a Value Change Dump.")


@dataclass
class ClockedArgs:
    """The clocked options as given on the command line (None: not given)."""

    clock: Optional[str] = None
    reset: Optional[str] = None
    reset_low: Optional[bool] = None
    start: Optional[str] = None
    done: Optional[str] = None
    latency: Optional[int] = None
    hold_input: bool = False
    max_cycles: Optional[int] = None
    vcd: Optional[str] = None

    def given(self) -> list[str]:
        """The clocked options present, by their command-line names."""
        names = {"clock": "--clock", "reset": "--reset", "reset_low": "--reset-low/--reset-high",
                 "start": "--start", "done": "--done", "latency": "--latency",
                 "max_cycles": "--max-cycles", "vcd": "--vcd"}
        found = [flag for attr, flag in names.items() if getattr(self, attr) is not None]
        if self.hold_input:
            found.append("--hold-input")
        return found


def wants_clocked(model, args: ClockedArgs) -> bool:
    """Whether ``check`` should run the clocked check: the model has registers or a clocked
    option was given (which, for a model without registers, gives a clear error)."""
    return bool(model.is_clocked or args.given())


def run_clocked_check(model, args: ClockedArgs, *, inputs: Optional[Sequence[str]] = None,
                      outputs: Optional[Sequence[str]] = None, msd_first: bool = False,
                      max_input: Optional[int] = None, ties: Mapping[str, int] | None = None,
                      engine: str = "auto", timeout: Optional[float] = None,
                      exhaustive_limit: int = 24, vectors: int = 1 << 20, seed: int = 1,
                      smt_form: str = "multiply", as_json: bool = False,
                      junit: Optional[str] = None, testbench_path: Optional[str] = None,
                      quiet: bool = False,
                      overrides: Mapping[str, int] | None = None) -> int:
    """Check ``model`` as a clocked converter, print the report, write the requested files;
    return the exit code (see the module docstring)."""
    from ..clocked import check_clocked_model

    result = check_clocked_model(model, clock=args.clock, reset=args.reset,
                                 reset_low=args.reset_low, start=args.start, done=args.done,
                                 latency=args.latency, hold_input=args.hold_input,
                                 max_cycles=args.max_cycles, inputs=inputs, outputs=outputs,
                                 msd_first=msd_first, max_input=max_input, ties=ties,
                                 engine=engine, timeout=timeout,
                                 exhaustive_limit=exhaustive_limit, random_vectors=vectors,
                                 seed=seed, smt_form=smt_form)
    result.overrides = dict(overrides or {})
    written = []
    failing = result.failing
    if args.vcd:
        if failing is None:
            written.append(("vcd", f"{args.vcd} not written: no failing run"))
        else:
            from ..reports.vcd import vcd_text
            write_text_file(args.vcd, vcd_text(failing.clocked.unrolled, failing.trace,
                                      f"bcdprove: {failing.title} of {model.top}"), "VCD file")
            written.append(("vcd", f"{args.vcd} (the failing run, {len(failing.trace)} cycles)"))
    if junit:
        from ..reports.junit import clocked_junit
        write_text_file(junit, clocked_junit(result), "JUnit report")
        written.append(("junit", f"{junit} (unknown is written as an error element)"))
    if testbench_path:
        from ..reports.clocked_testbench import write_clocked_testbench
        write_text_file(testbench_path, write_clocked_testbench(result), "test bench")
        written.append(("testbench", f"{testbench_path} (top module bcdprove_tb)"))
    if as_json:
        typer.echo(json.dumps(result.as_dict(), sort_keys=False))
    elif quiet:
        line = f"{result.status}: {model.top} (clocked, {result.seconds:.2f} s)"
        if failing is not None:
            found = failing.verdict.counterexample
            line += (f"; {failing.main.title}: counterexample "
                     + ", ".join(f"{k}={v}" for k, v in found.inputs.items()))
        typer.echo(line)
    else:
        from ..reports.clocked_text import clocked_report
        typer.echo(clocked_report(result))
        for label, text in written:
            typer.echo(f"{label:<12}{text}")
    return result.exit_code

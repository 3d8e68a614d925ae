"""Benchmark: the stage engine on the wide designs, architecture x width x engine.

Goals (issue "wide converters"), from command start to verdict: 64 bits within 3 s, 128 within
10 s, 256 within 60 s; the time at 2W at most 4.5 times the time at W (32 to 256); at 24 bits at
least 100 times faster than one monolithic z3 miter given 120 s.  Prints tables; asserts nothing.

Every row runs the command line in a fresh process (`bcdprove check ... --json`), so "total" is
what a user waits for: interpreter start, reading, elaborating, building the problem, the
engines and the report; "read+chk" is the same seen from inside the process (no interpreter
start); "check" is the engines alone, from the per-engine seconds that `auto` reports (blank for
a single engine).  The machine is shared: compare runs made close together, and read CPU beside
wall time.

    python3 bench/bench_stages.py [--widths 32,64,128,256] [--designs a,b] [--engines auto,stages]
                                  [--repeat N] [--miter]
"""
from __future__ import annotations

import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

DESIGNS = ROOT / "designs" / "wide"
ARCHITECTURES = {
    "meter_wide_loop": ("loop, one register", {}),
    "meter_wide_digit_array": ("loop, digit array", {}),
    "meter_wide_add3_full": ("add-3 array, full", {}),
    "meter_wide_add3_triangle": ("add-3 array, triangle", {}),
    "meter_wide_doubling": ("doubling table cells", {}),
    "meter_wide_wrapped": ("loop + short path", {"en": 1}),
    # Generated per width by designs/tools/gate_netlist.py (a 256-bit netlist is 15 MB).
    "meter_wide_gates": ("gate-level netlist", {}),
}
GENERATED = {"meter_wide_gates"}
_NETLISTS = Path(tempfile.mkdtemp(prefix="bcdprove-bench-"))


def _source(top: str, width: int) -> tuple[Path, str, dict]:
    """File, top module and parameters of an architecture at ``width`` bits."""
    if top not in GENERATED:
        return DESIGNS / f"{top}.v", top, {"W": width}
    path = _NETLISTS / f"{top}{width}.v"
    if not path.exists():
        sys.path.insert(0, str(ROOT / "designs" / "tools"))
        import gate_netlist
        path.write_text(gate_netlist.build_wide(width))
    return path, f"{top}{width}", {}
GOALS = {64: 3.0, 128: 10.0, 256: 60.0}   # seconds from command start to verdict
GROWTH_GOAL = 4.5


def _command(top: str, width: int, ties: dict, engine: str) -> list[str]:
    path, module, parameters = _source(top, width)
    command = [sys.executable, "-m", "bcdprove", "check", str(path), "--top", module,
               "--engine", engine, "--json"]
    for name, value in parameters.items():
        command += ["--param", f"{name}={value}"]
    for port, value in ties.items():
        command += ["--tie", f"{port}={value}"]
    return command


def _run_cli(top: str, width: int, ties: dict, engine: str) -> dict:
    """One command-line run: wall and CPU seconds of the child, and what its report says."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    started = time.monotonic()
    done = subprocess.run(_command(top, width, ties, engine), capture_output=True, text=True,
                          cwd=ROOT, env={**os.environ, "PYTHONPATH": str(ROOT)})
    wall = time.monotonic() - started
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    try:
        report = json.loads(done.stdout)
    except json.JSONDecodeError:
        return {"wall": wall, "cpu": cpu, "in_process": 0.0, "check": None, "verdict": "error",
                "obligations": 0, "distinct": 0, "error": done.stderr.strip().splitlines()[-1:]}
    stats = report.get("stats", {})
    engines = stats.get("engines")
    stage_stats = next((e for e in engines or [] if e.get("engine") == "stages"), stats)
    # auto reports each engine's own seconds: their sum is the check without the reading.
    check = sum(e.get("seconds", 0.0) for e in engines) if engines else None
    return {"wall": wall, "cpu": cpu, "in_process": report["seconds"], "check": check,
            "verdict": report["verdict"], "obligations": stage_stats.get("obligations", 0),
            "distinct": stage_stats.get("distinct_obligations", 0)}


def _miter_seconds(top: str, width: int, ties: dict, timeout: float) -> tuple[str, float]:
    """One z3 query: some output digit differs from (x div 10**i) mod 10."""
    import z3

    from bcdprove.model.smt import Z3Encoder, check_within
    from bcdprove.spec.bin2bcd import build_problem
    from bcdprove.verilog import read_design

    path, module, parameters = _source(top, width)
    model = read_design([str(path)], top=module, parameters=parameters)
    problem = build_problem(model, ties=ties or None)
    encoder = Z3Encoder(z3.Context())
    ctx = encoder.ctx
    x = encoder.term(problem.x)
    wide = z3.ZeroExt(8, x)
    wrong = []
    for i, digit in enumerate(problem.digits):
        power = z3.BitVecVal(10 ** i, width + 8, ctx)
        expected = z3.Extract(3, 0, z3.URem(z3.UDiv(wide, power), z3.BitVecVal(10, width + 8, ctx)))
        wrong.append(encoder.term(digit) != expected)
    solver = z3.Solver(ctx=ctx)
    started = time.monotonic()
    answer = check_within(solver, timeout, [z3.Or(*wrong)])
    return str(answer), time.monotonic() - started


def _ratio(times: dict, key: tuple, width: int) -> str:
    small = times.get(key + (width // 2,))
    if small is None or small <= 0 or key + (width,) not in times:
        return ""
    return f"{times[key + (width,)] / small:.2f}"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--widths", default="32,64,128,256")
    parser.add_argument("--designs", default=",".join(ARCHITECTURES))
    parser.add_argument("--engines", default="auto",
                        help="comma-separated engines to run each design with (auto, stages)")
    parser.add_argument("--repeat", type=int, default=1,
                        help="runs per row; the fastest is kept (the machine is shared)")
    parser.add_argument("--miter", action="store_true",
                        help="also time one monolithic z3 miter at 24 bits (up to 120 s)")
    args = parser.parse_args()
    widths = [int(w) for w in args.widths.split(",")]
    tops = args.designs.split(",")
    engines = args.engines.split(",")

    # total: command start to verdict (wall); cpu: the child's CPU; read+chk: inside the
    # process from the command's start (reading included) to the verdict; check: the
    # engines alone (auto only: its report gives each engine's seconds).
    print(f"{'architecture':24} {'W':>4} {'engine':>7} {'verdict':>8} {'total s':>8} "
          f"{'cpu s':>7} {'read+chk':>8} {'check s':>8} {'oblig.':>7} {'distinct':>8} "
          f"{'2W/W tot':>8} {'2W/W chk':>8} {'goal':>6}")
    totals: dict[tuple, float] = {}
    checks: dict[tuple, float] = {}
    for top in tops:
        label, ties = ARCHITECTURES[top]
        for engine in engines:
            for width in widths:
                runs = [_run_cli(top, width, ties, engine) for _ in range(max(1, args.repeat))]
                row = min(runs, key=lambda r: r["wall"])
                totals[(top, engine, width)] = row["wall"]
                if row["check"] is not None:
                    checks[(top, engine, width)] = row["check"]
                check = "" if row["check"] is None else f"{row['check']:.2f}"
                goal = GOALS.get(width)
                met = "" if goal is None else ("met" if row["wall"] <= goal else "MISSED")
                print(f"{label:24} {width:>4} {engine:>7} {row['verdict']:>8} {row['wall']:8.2f} "
                      f"{row['cpu']:7.2f} {row['in_process']:8.2f} {check:>8} {row['obligations']:>7} "
                      f"{row['distinct']:>8} {_ratio(totals, (top, engine), width):>8} "
                      f"{_ratio(checks, (top, engine), width):>8} {met:>6}", flush=True)
                if "error" in row:
                    print(f"    error: {row['error']}", flush=True)

    worst = max((totals[k] / totals[k[:2] + (k[2] // 2,)]
                 for k in totals if k[:2] + (k[2] // 2,) in totals), default=None)
    if worst is not None:
        print(f"\nlargest growth of the total 2W/W: {worst:.2f} (goal <= {GROWTH_GOAL})")

    if args.miter:
        from bcdprove.engines.base import Budget
        from bcdprove.engines.stages import StageEngine
        from bcdprove.spec.bin2bcd import build_problem
        from bcdprove.verilog import read_design

        print("\nmonolithic z3 miter at 24 bits, 120 s limit, against the stage engine")
        for top in tops:
            label, ties = ARCHITECTURES[top]
            answer, seconds = _miter_seconds(top, 24, ties, 120.0)
            path, module, parameters = _source(top, 24)
            model = read_design([str(path)], top=module, parameters=parameters)
            ours = StageEngine().run(build_problem(model, ties=ties or None), Budget(300.0)).seconds
            # The command's total at 24 bits (default engine), when the table above has it.
            total = totals.get((top, "auto", 24))
            whole = "" if total is None else (f"   bcdprove check {total:5.2f} s, "
                                              f"ratio >= {seconds / total:5.0f}x")
            print(f"  {label:24} miter {answer:>8} {seconds:7.1f} s   stages {ours:6.2f} s   "
                  f"ratio >= {seconds / ours:6.0f}x{whole}", flush=True)


if __name__ == "__main__":
    main()

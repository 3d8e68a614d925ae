"""Benchmark: the stage engine on the wide designs, architecture x width.

Goals (issue "wide converters"): 64 bits within 3 s, 128 within 10 s, 256 within 60 s; the
time at 2W at most 4.5 times the time at W; at 24 bits at least 100 times faster than one
monolithic z3 miter given 120 s.  Prints tables; asserts nothing.

    python3 bench/bench_stages.py [--widths 24,32,64,128,256] [--designs a,b] [--miter]
"""
from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from bcdprove.engines.base import Budget  # noqa: E402
from bcdprove.engines.stages import StageEngine  # noqa: E402
from bcdprove.spec.bin2bcd import build_problem  # noqa: E402
from bcdprove.verilog import read_design  # noqa: E402

DESIGNS = Path(__file__).resolve().parent.parent / "designs" / "wide"
ARCHITECTURES = {
    "meter_wide_loop": ("loop, one register", {}),
    "meter_wide_digit_array": ("loop, digit array", {}),
    "meter_wide_add3_full": ("add-3 array, full", {}),
    "meter_wide_add3_triangle": ("add-3 array, triangle", {}),
    "meter_wide_doubling": ("doubling table cells", {}),
    "meter_wide_wrapped": ("loop + short path", {"en": 1}),
}


def _problem(top: str, width: int, ties: dict):
    model = read_design([str(DESIGNS / f"{top}.v")], top=top, parameters={"W": width})
    return build_problem(model, ties=ties or None)


def _miter_seconds(top: str, width: int, ties: dict, timeout: float) -> tuple[str, float]:
    """One z3 query: some output digit differs from (x div 10**i) mod 10."""
    import z3

    from bcdprove.model.smt import Z3Encoder, check_within

    problem = _problem(top, width, ties)
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


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--widths", default="24,32,64,128,256")
    parser.add_argument("--designs", default=",".join(ARCHITECTURES))
    parser.add_argument("--miter", action="store_true",
                        help="also time one monolithic z3 miter at 24 bits (up to 120 s)")
    parser.add_argument("--budget", type=float, default=300.0)
    args = parser.parse_args()
    widths = [int(w) for w in args.widths.split(",")]
    tops = args.designs.split(",")

    print(f"{'architecture':24} {'W':>4} {'read s':>7} {'check s':>8} {'verdict':>9} "
          f"{'oblig.':>7} {'distinct':>8} {'slowest s':>9}")
    times: dict[tuple[str, int], float] = {}
    for top in tops:
        label, ties = ARCHITECTURES[top]
        for width in widths:
            started = time.monotonic()
            problem = _problem(top, width, ties)
            read = time.monotonic() - started
            verdict = StageEngine().run(problem, Budget(args.budget))
            times[(top, width)] = verdict.seconds
            stats = verdict.stats
            print(f"{label:24} {width:>4} {read:7.2f} {verdict.seconds:8.2f} {verdict.status:>9} "
                  f"{stats.get('obligations', 0):>7} {stats.get('distinct_obligations', 0):>8} "
                  f"{stats.get('slowest_obligation_seconds', 0):9.3f}", flush=True)

    print("\ngrowth: check seconds at 2W / at W (goal <= 4.5)")
    for top in tops:
        ratios = []
        for width in widths:
            if (top, 2 * width) in times and times[(top, width)] > 0:
                ratios.append(f"{width}->{2 * width}: {times[(top, 2 * width)] / times[(top, width)]:.2f}")
        print(f"  {ARCHITECTURES[top][0]:24} " + "  ".join(ratios))

    if args.miter:
        print("\nmonolithic z3 miter at 24 bits, 120 s limit, against the stage engine")
        for top in tops:
            label, ties = ARCHITECTURES[top]
            answer, seconds = _miter_seconds(top, 24, ties, 120.0)
            ours = times.get((top, 24))
            if ours is None:
                ours = StageEngine().run(_problem(top, 24, ties), Budget(args.budget)).seconds
            print(f"  {label:24} miter {answer:>8} {seconds:7.1f} s   stages {ours:6.2f} s   "
                  f"ratio >= {seconds / ours:6.0f}x", flush=True)


if __name__ == "__main__":
    main()

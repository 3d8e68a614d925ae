"""Benchmark: ``bcdprove equiv`` on pairs of wide converters, pair x width.

Goal (issue 6, "Design against design"): two different double-dabble variants at 64 bits
shown equivalent in seconds.  Each row reads both designs, builds the problem and runs the
engine (the sweeping engine by default; ``--engine miter`` for one z3 query per output,
without sweeping).  Prints a table with wall and CPU seconds, the verdict, internal pairs
proposed/proved and z3 queries; asserts nothing.

    python3 bench/bench_equiv.py [--widths 16,32,64,128] [--pairs loop-array,...]
                                 [--engine auto|miter] [--timeout 300]
"""
from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from bcdprove.equivalence import equiv_models  # noqa: E402
from bcdprove.verilog import read_design  # noqa: E402

DESIGNS = Path(__file__).resolve().parent.parent / "designs" / "wide"
PAIRS = {
    "loop-array": ("meter_wide_loop", "meter_wide_digit_array"),
    "loop-triangle": ("meter_wide_loop", "meter_wide_add3_triangle"),
    "array-full": ("meter_wide_digit_array", "meter_wide_add3_full"),
    "triangle-full": ("meter_wide_add3_triangle", "meter_wide_add3_full"),
}


def _row(name: str, width: int, engine: str, timeout: float) -> list[str]:
    top_a, top_b = PAIRS[name]
    wall, cpu = time.monotonic(), time.process_time()
    model_a = read_design([str(DESIGNS / f"{top_a}.v")], top_a, {"W": width})
    model_b = read_design([str(DESIGNS / f"{top_b}.v")], top_b, {"W": width})
    read_wall = time.monotonic() - wall
    result = equiv_models(model_a, model_b, engine=engine, timeout=timeout)
    stats = result.verdict.stats
    sweep = stats.get("sweep", {})
    return [name, str(width), result.verdict.status, f"{read_wall:.2f}",
            f"{time.monotonic() - wall:.2f}", f"{time.process_time() - cpu:.2f}",
            f"{sweep.get('proved', 0)}/{sweep.get('proposed', 0)}",
            str(sweep.get("structural", 0)), str(stats.get("z3_queries", 0)),
            f"{stats.get('slowest_query', {}).get('seconds', 0):.2f}"]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--widths", default="16,32,64")
    parser.add_argument("--pairs", default="loop-array,loop-triangle")
    parser.add_argument("--engine", default="auto")
    parser.add_argument("--timeout", type=float, default=300.0)
    args = parser.parse_args()
    header = ["pair", "W", "verdict", "read s", "wall s", "cpu s", "pairs proved",
              "structural", "z3 queries", "slowest s"]
    rows = [header]
    for name in args.pairs.split(","):
        for width in (int(w) for w in args.widths.split(",")):
            rows.append(_row(name, width, args.engine, args.timeout))
            print("  ".join(rows[-1]), file=sys.stderr, flush=True)
    widths = [max(len(r[c]) for r in rows) for c in range(len(header))]
    for row in rows:
        print("  ".join(cell.rjust(w) for cell, w in zip(row, widths)))


if __name__ == "__main__":
    main()

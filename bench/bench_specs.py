"""Benchmark: the stage engines of the bcd2bin and signed specs on the wide shipped designs.

Goal (issue 6): 20 digits -> 67 bits and 40 digits -> 133 bits proved in seconds.  Prints a
table design x size x verdict x CPU/wall seconds x obligations x shapes (read+check; the
Verilog reading is in the wall time); asserts nothing.  With --miter also one monolithic
z3 miter per row (the smt engine) with a time limit, for comparison.

    python3 bench/bench_specs.py [--digits 20,40,80] [--widths 32,64,128] [--miter SECONDS]
"""
from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from bcdprove.checking import check  # noqa: E402

DESIGNS = Path(__file__).resolve().parent.parent / "designs"


def _run(path: Path, top: str, parameters: dict, engine: str, timeout: float, **options):
    wall, cpu = time.perf_counter(), time.process_time()
    result = check([str(path)], top, parameters=parameters, engine=engine, timeout=timeout,
                   **options)
    return result, time.process_time() - cpu, time.perf_counter() - wall


def _row(design: str, size: str, result, cpu: float, wall: float) -> str:
    verdict = result.verdict
    stats = verdict.stats
    inner = stats.get("magnitude_stages", {})
    obligations = stats.get("obligations", inner.get("obligations", "-"))
    shapes = stats.get("shapes", inner.get("distinct_obligations", "-"))
    return (f"{design:<28} {size:>10} {verdict.status:>10} {verdict.engine:>10} "
            f"{cpu:>8.2f} {wall:>8.2f} {str(obligations):>11} {str(shapes):>7}")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--digits", default="20,40")
    parser.add_argument("--widths", default="32,64")
    parser.add_argument("--timeout", type=float, default=600.0)
    parser.add_argument("--miter", type=float, default=0.0,
                        help="also run the smt engine with this time limit")
    args = parser.parse_args()
    print(f"{'design':<28} {'size':>10} {'verdict':>10} {'engine':>10} {'cpu s':>8} "
          f"{'wall s':>8} {'obligations':>11} {'shapes':>7}")
    engines = ["stages"] + (["smt"] if args.miter else [])
    for digits in [int(d) for d in args.digits.split(",") if d]:
        bits = (10 ** digits - 1).bit_length()
        for top in ("meter_wide_bcd2bin", "meter_wide_bcd2bin_weights", "meter_wide_bcd2bin_bug"):
            for engine in engines:
                timeout = args.timeout if engine == "stages" else args.miter
                result, cpu, wall = _run(DESIGNS / "bcd2bin" / f"{top}.v", top,
                                         {"D": digits, "W": bits}, engine, timeout,
                                         spec="bcd2bin")
                print(_row(top, f"{digits}d->{bits}b", result, cpu, wall), flush=True)
    for width in [int(w) for w in args.widths.split(",") if w]:
        for top in ("meter_net_flow", "meter_net_flow_bug"):
            for engine in engines:
                timeout = args.timeout if engine == "stages" else args.miter
                result, cpu, wall = _run(DESIGNS / "signed" / f"{top}.v", top, {"W": width},
                                         engine, timeout, spec="signed", sign="exporting")
                print(_row(top, f"{width} bits", result, cpu, wall), flush=True)


if __name__ == "__main__":
    main()

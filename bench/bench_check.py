"""Benchmark: the check engines at 8..32 bits, the two smt miter forms, and Icarus for scale.

Goals (issue "bcdprove check"): exhaustive simulation of all 2**24 inputs of a 24-bit
converter in at most 5 s; the smt form that is faster at 8..20 bits is the default; and the
ratio between our exhaustive run and Icarus running the same exhaustive check through a test
bench (timed at 20 bits, extrapolated to 24).  Prints tables; asserts nothing.

    python3 bench/bench_check.py [--quick] [--smt-timeout SECONDS]
"""
from __future__ import annotations

import argparse
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from bcdprove.engines.base import Budget  # noqa: E402
from bcdprove.engines.registry import EngineOptions, make_engine  # noqa: E402
from bcdprove.spec.bin2bcd import build_problem  # noqa: E402
from tests.spec.hand_models import packed_converter, packed_verilog  # noqa: E402


def _digits(width: int) -> int:
    return len(str((1 << width) - 1))


def _problem(width: int, threshold: int = 5):
    return build_problem(packed_converter(width, _digits(width), threshold=threshold))


def _cell(verdict) -> str:
    return f"{verdict.status[:5]} {verdict.seconds:7.2f}"


def engine_table(widths, smt_timeout: float) -> None:
    print("engines on a shift-and-add-3 converter (correct / threshold-6 bug); seconds")
    header = f"{'bits':>4}  " + "  ".join(f"{name:>15}" for name in
                                          ("random 2^16", "exhaustive", "smt", "auto"))
    print(header)
    options = EngineOptions(random_vectors=1 << 16)
    for width in widths:
        for label, threshold in (("ok", 5), ("bug", 6)):
            problem = _problem(width, threshold)
            cells = []
            for name in ("random", "exhaustive", "smt", "auto"):
                budget = Budget(smt_timeout if name in ("smt", "auto") else None)
                cells.append(_cell(make_engine(name, options).run(problem, budget)))
            print(f"{width:>4}  " + "  ".join(f"{c:>15}" for c in cells) + f"  {label}",
                  flush=True)


def smt_forms(widths, smt_timeout: float) -> None:
    print(f"\nsmt miter forms on the correct converter (timeout {smt_timeout:g} s); seconds")
    print(f"{'bits':>4}  {'multiply':>15}  {'divide':>15}")
    for width in widths:
        problem = _problem(width)
        cells = [_cell(make_engine("smt", EngineOptions(smt_form=form)).run(
            problem, Budget(smt_timeout))) for form in ("multiply", "divide")]
        print(f"{width:>4}  {cells[0]:>15}  {cells[1]:>15}", flush=True)


def exhaustive_goal() -> float:
    problem = _problem(24)
    verdict = make_engine("exhaustive").run(problem, Budget())
    print(f"\nexhaustive, all 2^24 inputs of a 24-bit converter: {verdict.status} in "
          f"{verdict.seconds:.2f} s (goal: at most 5 s)")
    return verdict.seconds


def _icarus_bench(width: int) -> str:
    digits = _digits(width)
    compares = " || ".join(f"bcd[{4 * k + 3}:{4 * k}] !== ((i / {10 ** k}) % 10)"
                           for k in range(digits))
    return f"""
module exhaustive_tb;
  reg [{width - 1}:0] bin;
  wire [{4 * digits - 1}:0] bcd;
  conv dut (.bin(bin), .bcd(bcd));
  integer i, bad;
  initial begin
    bad = 0;
    for (i = 0; i < {1 << width}; i = i + 1) begin
      bin = i;
      #1;
      if ({compares}) bad = bad + 1;
    end
    $display("exhaustive: %0d wrong", bad);
    $finish;
  end
endmodule
"""


def icarus_ratio(ours_24: float, width: int = 20) -> None:
    if not (shutil.which("iverilog") and shutil.which("vvp")):
        print("\nIcarus Verilog not on PATH: ratio not measured")
        return
    with tempfile.TemporaryDirectory() as tmp:
        source = Path(tmp) / "bench.v"
        source.write_text(packed_verilog(width, _digits(width)) + _icarus_bench(width))
        compiled = Path(tmp) / "bench.vvp"
        subprocess.run(["iverilog", "-g2005", "-o", str(compiled), "-s", "exhaustive_tb",
                        str(source)], check=True)
        start = time.perf_counter()
        ran = subprocess.run(["vvp", "-n", str(compiled)], capture_output=True, text=True,
                             check=True)
        seconds = time.perf_counter() - start
    ours = make_engine("exhaustive").run(_problem(width), Budget()).seconds
    scaled = seconds * (1 << (24 - width))
    print(f"\nIcarus, all 2^{width} inputs through a test bench: {seconds:.2f} s "
          f"({ran.stdout.strip()}); ours at {width} bits: {ours:.2f} s "
          f"(ratio {seconds / max(ours, 1e-9):.0f}x)")
    print(f"Icarus extrapolated to 2^24 inputs: {scaled:.0f} s; ours measured {ours_24:.2f} s "
          f"(ratio {scaled / max(ours_24, 1e-9):.0f}x)")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="fewer widths, short timeouts")
    parser.add_argument("--smt-timeout", type=float, default=120.0)
    args = parser.parse_args()
    timeout = 20.0 if args.quick else args.smt_timeout
    ours_24 = exhaustive_goal()
    icarus_ratio(ours_24, 16 if args.quick else 20)
    smt_forms([8, 12, 16] if args.quick else [8, 10, 12, 14, 16, 18, 20], timeout)
    engine_table([8, 16, 24] if args.quick else [8, 12, 16, 20, 24, 28, 32], timeout)


if __name__ == "__main__":
    main()

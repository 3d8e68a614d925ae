"""Benchmark: reading Verilog and evaluating the model (prints a table; not a test).

Goals (issue "Read real converter Verilog"): parse + elaborate a 128-bit behavioural
double-dabble converter in at most 5 s (256-bit reported too); evaluate 100,000 vectors of a
64-bit converter in at most 5 s.

The second table reads the wide designs of designs/wide/ (issue "wide converters": reading is
part of the 3 s / 10 s / 60 s from command start to verdict at 64 / 128 / 256 bits).  Each
reading runs in a fresh process so no cache of an earlier row helps; the table shows the
fastest of ``--repeat`` runs, wall and CPU seconds of ``read_design`` alone (the machine is
shared: compare runs made close together).

    python3 bench/bench_read.py [--wide-only] [--widths 64,128,256] [--designs a,b] [--repeat N]
"""
from __future__ import annotations

import argparse
import json
import os
import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from bcdprove.evaluation import evaluate_vectors  # noqa: E402
from bcdprove.verilog import read_design  # noqa: E402

# A behavioural shift-and-add-3 converter written for this benchmark (a display driver of a
# flow totaliser); the digit count comes from a constant function, as in real files.
SOURCE = """
module totaliser_bin2bcd #(parameter W = 16) (
    input  wire [W-1:0] bin,
    output reg  [4*digits_for(W)-1:0] bcd
);
    function integer digits_for(input integer bits);
        integer value, n;
        begin
            n = 1;
            value = 10;
            while ((value >> bits) == 0 && n < 200) begin
                value = value * 10;
                n = n + 1;
            end
            digits_for = n;
        end
    endfunction
    localparam D = digits_for(W);
    integer i, j;
    reg [4*D-1:0] work;
    always @* begin
        work = 0;
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (work[4*j +: 4] >= 5)
                    work[4*j +: 4] = work[4*j +: 4] + 3;
            work = {work[4*D-2:0], bin[i]};
        end
        bcd = work;
    end
endmodule
"""


WIDE = ("meter_wide_doubling", "meter_wide_loop", "meter_wide_digit_array",
        "meter_wide_add3_full", "meter_wide_add3_triangle", "meter_wide_wrapped")

# Run in a fresh interpreter: reads one wide design and prints wall and CPU seconds as JSON.
_ONE_READ = """
import json, sys, time
from bcdprove.verilog import read_design
path, top, width = sys.argv[1], sys.argv[2], int(sys.argv[3])
wall, cpu = time.perf_counter(), time.process_time()
model = read_design([path], top, {"W": width})
print(json.dumps({"wall": time.perf_counter() - wall, "cpu": time.process_time() - cpu,
                  "nodes": len(model.graph)}))
"""


def _read_once(top: str, width: int) -> dict:
    done = subprocess.run([sys.executable, "-c", _ONE_READ, str(ROOT / "designs" / "wide" / f"{top}.v"),
                           top, str(width)], capture_output=True, text=True, cwd=ROOT,
                          env={**os.environ, "PYTHONPATH": str(ROOT)}, check=True)
    return json.loads(done.stdout.strip().splitlines()[-1])


def wide_table(designs: list[str], widths: list[int], repeat: int) -> None:
    """Reading seconds of the wide designs: fastest of ``repeat`` fresh-process runs."""
    print(f"{'design':26} {'bits':>5} {'wall s':>8} {'cpu s':>8} {'nodes':>9}")
    for top in designs:
        for width in widths:
            runs = [_read_once(top, width) for _ in range(repeat)]
            wall = min(r["wall"] for r in runs)
            cpu = min(r["cpu"] for r in runs)
            print(f"{top:26} {width:>5} {wall:>8.2f} {cpu:>8.2f} {runs[0]['nodes']:>9}", flush=True)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--wide-only", action="store_true", help="only the wide-design table")
    parser.add_argument("--widths", default="64,128,256")
    parser.add_argument("--designs", default=",".join(WIDE))
    parser.add_argument("--repeat", type=int, default=3)
    options = parser.parse_args()
    if not options.wide_only:
        behavioural_table()
        print()
    wide_table(options.designs.split(","), [int(w) for w in options.widths.split(",")],
               options.repeat)


def behavioural_table() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "totaliser_bin2bcd.v"
        path.write_text(SOURCE)
        rows = []
        for width in (32, 64, 128, 256):
            start = time.perf_counter()
            model = read_design([str(path)], "totaliser_bin2bcd", {"W": width})
            seconds = time.perf_counter() - start
            rows.append((f"read + elaborate {width}-bit", f"{seconds:.2f}", len(model.graph)))
        model = read_design([str(path)], "totaliser_bin2bcd", {"W": 64})
        rng = random.Random(1)
        vectors = [{"bin": rng.getrandbits(64)} for _ in range(100_000)]
        start = time.perf_counter()
        results = evaluate_vectors(model, vectors)
        seconds = time.perf_counter() - start
        wrong = sum(1 for v, r in zip(vectors, results)
                    if r.outputs["bcd"].value != int(str(v["bin"]), 16))
        rows.append(("evaluate 100,000 vectors, 64-bit", f"{seconds:.2f}", f"{wrong} wrong"))
    print(f"{'what':40} {'seconds':>8} {'nodes / note':>14}")
    for what, seconds, extra in rows:
        print(f"{what:40} {seconds:>8} {extra!s:>14}")


if __name__ == "__main__":
    main()

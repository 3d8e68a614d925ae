"""Benchmark: reading Verilog and evaluating the model (prints a table; not a test).

Goals (issue "Read real converter Verilog"): parse + elaborate a 128-bit behavioural
double-dabble converter in at most 5 s (256-bit reported too); evaluate 100,000 vectors of a
64-bit converter in at most 5 s.

    python3 bench/bench_read.py
"""
from __future__ import annotations

import random
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

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


def main() -> None:
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

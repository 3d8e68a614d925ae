"""Both spellings of reduction and binary XNOR, `~^` and `^~` (IEEE 1364-2005 clause 5.1.11,
table 5-13 lists both), against Icarus Verilog and Python's own parity computation."""
from pathlib import Path

from bcdprove.evaluation import evaluate_vectors
from bcdprove.verilog import read_design
from tests.support.icarus import run_icarus

SOURCE = """
module xnor_spellings(input [3:0] a, input [3:0] b, output y1, output y2, output [3:0] z);
  assign y1 = ^~a;
  assign y2 = ~^a;
  assign z = a ^~ b;
endmodule
"""

BENCH = """
module bench;
  reg [3:0] a, b; wire y1, y2; wire [3:0] z; integer i;
  xnor_spellings dut(.a(a), .b(b), .y1(y1), .y2(y2), .z(z));
  initial begin
    for (i = 0; i < 16; i = i + 1) begin
      a = i; b = 15 - i; #1 $display("%0d %0d %0d %0d", i, y1, y2, z);
    end
  end
endmodule
"""


def test_both_spellings_of_xnor_agree_with_icarus_and_parity(tmp_path: Path):
    path = tmp_path / "xnor_spellings.v"
    path.write_text(SOURCE)
    model = read_design([str(path)], "xnor_spellings")
    results = evaluate_vectors(model, [{"a": i, "b": 15 - i} for i in range(16)])
    icarus = [list(map(int, line.split())) for line in run_icarus([path], "bench", BENCH).split("\n")
              if line.strip()]
    for i, result, (_, y1, y2, z) in zip(range(16), results, icarus):
        parity_complement = 1 - bin(i).count("1") % 2     # Python reference: ~^ is even parity
        assert result.outputs["y1"].value == y1 == parity_complement
        assert result.outputs["y2"].value == y2 == parity_complement
        assert result.outputs["z"].value == z == (~(i ^ (15 - i)) & 0xF)

"""Procedural code: always blocks, case, loops, functions, probes (IEEE 1364-2005 clauses 9, 10).

Clause numbers are cited from memory of IEEE 1364-2005; expected values come from Python
reference code or were printed by Icarus Verilog 11, as noted beside each check.
"""
from __future__ import annotations

import pytest

from bcdprove.errors import DesignError
from tests.verilog.test_elaborate_helpers import elaborate_text, outputs, signal


def test_if_else_and_blocking_order(tmp_path):
    # clause 9.2.1: a blocking assignment is seen by the statements after it
    model = elaborate_text(tmp_path, """module dut(input [3:0] a, output reg [3:0] y);
always @* begin
  y = a;
  if (a > 4'd7) y = y - 4'd8; else y = y + 4'd1;
end
endmodule
""")
    assert outputs(model, a=9)["y"] == 1 and outputs(model, a=3)["y"] == 4


def test_case_is_priority_ordered_with_default(tmp_path):
    # clause 9.5: the first matching item wins
    model = elaborate_text(tmp_path, """module dut(input [1:0] s, output reg [3:0] y);
always @(*) case (s)
  2'd0, 2'd1: y = 4'd10;
  2'd1: y = 4'd11;
  default: y = 4'd12;
endcase
endmodule
""")
    assert [outputs(model, s=s)["y"] for s in range(4)] == [10, 10, 12, 12]


def test_case_item_with_x_never_matches_a_known_value(tmp_path):
    # clause 9.5: case compares with ===, so 2'b1x matches no 2-valued selector
    model = elaborate_text(tmp_path, """module dut(input [1:0] s, output reg y);
always @* case (s) 2'b1x: y = 1'b1; default: y = 1'b0; endcase
endmodule
""")
    assert [outputs(model, s=s)["y"] for s in range(4)] == [0, 0, 0, 0]


def test_casez_treats_z_and_question_mark_as_wildcards(tmp_path):
    # clause 9.5.1: in casez, z and ? item bits do not take part in the comparison
    model = elaborate_text(tmp_path, """module dut(input [3:0] s, output reg [1:0] y);
always @* casez (s)
  4'b1???: y = 2'd3;
  4'b01z?: y = 2'd2;
  4'b0x01: y = 2'd1;
  default: y = 2'd0;
endcase
endmodule
""")
    # 4'b0x01 has an x bit, which casez compares literally, so it never matches
    expected = [3 if s >= 8 else 2 if s >> 2 == 1 else 0 for s in range(16)]
    assert [outputs(model, s=s)["y"] for s in range(16)] == expected


def test_casex_treats_x_as_wildcard_too(tmp_path):
    # clause 9.5.1: in casex, x and z item bits are both wildcards
    model = elaborate_text(tmp_path, """module dut(input [3:0] s, output reg y);
always @* casex (s) 4'b0x01: y = 1'b1; default: y = 1'b0; endcase
endmodule
""")
    assert [s for s in range(16) if outputs(model, s=s)["y"]] == [0b0001, 0b0101]


def test_for_loop_is_unrolled_and_records_probes(tmp_path):
    # clause 9.6: the loop runs while its condition holds; probes name work@i=<value>
    model = elaborate_text(tmp_path, """module dut(input [7:0] a, output reg [3:0] ones);
integer i;
always @* begin
  ones = 0;
  for (i = 0; i < 8; i = i + 1) ones = ones + a[i];
end
endmodule
""")
    assert outputs(model, a=0b10110111)["ones"] == bin(0b10110111).count("1")
    # after iteration i = 2 the count holds bits 0..2 of a (Python reference)
    assert signal(model, "ones@i=2", a=0b10110111) == bin(0b111).count("1")
    assert model.signals["ones@i=2"].kind == "probe"


def test_nested_loop_probes_join_the_loop_variables(tmp_path):
    model = elaborate_text(tmp_path, """module dut(input [3:0] a, output reg [7:0] s);
integer i, j;
always @* begin
  s = 0;
  for (i = 0; i < 2; i = i + 1)
    for (j = 0; j < 2; j = j + 1)
      s = s + a;
end
endmodule
""")
    assert signal(model, "s@i=1,j=0", a=5) == 3 * 5
    assert signal(model, "s@i=0", a=5) == 2 * 5


def test_while_loop(tmp_path):
    # clause 9.6 while; Python reference: sum(range(5))
    model = elaborate_text(tmp_path, """module dut(output reg [7:0] s);
integer k;
always @* begin
  s = 0; k = 0;
  while (k < 5) begin s = s + k; k = k + 1; end
end
endmodule
""")
    assert outputs(model)["s"] == sum(range(5))


def test_loop_without_constant_bound_is_an_error(tmp_path):
    with pytest.raises(Exception) as caught:
        elaborate_text(tmp_path, """module dut(input [3:0] n, output reg [7:0] s);
integer k;
always @* begin
  s = 0;
  for (k = 0; k < n; k = k + 1) s = s + 1;
end
endmodule
""")
    assert "loop without constant bound" in str(caught.value)
    assert caught.value.line == 5


def test_latch_is_reported(tmp_path):
    with pytest.raises(DesignError) as caught:
        elaborate_text(tmp_path, """module dut(input [3:0] a, output reg [3:0] q);
always @* begin
  if (a[0]) q = a;
end
endmodule
""")
    assert "latch: `q` is not assigned on every path of the always block at" in caught.value.message
    assert caught.value.line == 2


def test_function_with_a_loop_called_with_a_signal(tmp_path):
    # clause 10.4: the function is inlined; Python reference: bit reversal
    model = elaborate_text(tmp_path, """module dut(input [7:0] a, output [7:0] y);
function [7:0] reverse;
  input [7:0] v;
  integer k;
  begin
    for (k = 0; k < 8; k = k + 1) reverse[k] = v[7 - k];
  end
endfunction
assign y = reverse(a);
endmodule
""")
    assert outputs(model, a=0b11010001)["y"] == int(f"{0b11010001:08b}"[::-1], 2)


def test_constant_function_sizes_a_port(tmp_path):
    # clause 10.4.5: constant functions are evaluated during elaboration
    model = elaborate_text(tmp_path, """module dut #(parameter W = 20) (input [W-1:0] a, output [4*digits(W)-1:0] y);
function integer digits;
  input integer w;
  integer v, d;
  begin
    v = 1; d = 0;
    while (v < (1 << w)) begin v = v * 10; d = d + 1; end
    digits = d;
  end
endfunction
assign y = a;
endmodule
""")
    # Python reference: len(str(2**20 - 1)) == 7
    assert model.port("y").width == 4 * len(str(2 ** 20 - 1))


def test_nonblocking_in_a_combinational_block_uses_the_old_values(tmp_path):
    # clause 9.2.2: right sides are evaluated first, updates happen at the end
    model = elaborate_text(tmp_path, """module dut(input [3:0] a, output reg [3:0] x, y);
always @* begin
  x <= a;
  y <= a + 4'd1;
end
endmodule
""")
    assert outputs(model, a=3) == {"x": 3, "y": 4}


def test_read_before_write_is_a_loop(tmp_path):
    with pytest.raises(DesignError) as caught:
        elaborate_text(tmp_path, """module dut(input [3:0] a, output reg [3:0] y);
always @* begin
  y = y + a;
end
endmodule
""")
    assert "combinational loop" in caught.value.message and caught.value.line == 2


def test_memory_with_variable_index_write_and_read(tmp_path):
    # clause 4.9.3 memories; a write with a variable address updates the addressed word
    model = elaborate_text(tmp_path, """module dut(input [1:0] w, r, input [3:0] d, output reg [3:0] q);
reg [3:0] m [0:3];
integer k;
always @* begin
  for (k = 0; k < 4; k = k + 1) m[k] = k;
  m[w] = d;
  q = m[r];
end
endmodule
""")
    assert outputs(model, w=2, r=2, d=9)["q"] == 9
    assert outputs(model, w=2, r=1, d=9)["q"] == 1


def test_display_is_ignored_with_a_note(tmp_path):
    model = elaborate_text(tmp_path, """module dut(input a, output reg y);
always @* begin y = a; $display("a=%b", a); end
endmodule
""")
    assert outputs(model, a=1)["y"] == 1
    assert any("$display" in note for note in model.notes)


def test_incomplete_sensitivity_list_gives_a_note(tmp_path):
    model = elaborate_text(tmp_path, """module dut(input a, b, output reg y);
always @(a) y = a & b;
endmodule
""")
    assert outputs(model, a=1, b=1)["y"] == 1
    assert any("incomplete sensitivity list" in note and "b" in note for note in model.notes)


def test_systemverilog_loop_forms(tmp_path):
    # IEEE 1800 clause 12.7.1: for (int i = ...; ...; i++) with a loop-local variable
    model = elaborate_text(tmp_path, """module dut(input logic [3:0] a, output logic [3:0] y);
always_comb begin
  y = '0;
  for (int i = 0; i < 4; i++) y[i] = a[3 - i];
end
endmodule
""", name="case.sv")
    assert outputs(model, a=0b0001)["y"] == 0b1000


def test_loop_counter_shared_by_a_clocked_and_a_combinational_block(tmp_path):
    # common practice: one `integer i` serves as loop counter in several always blocks
    model = elaborate_text(tmp_path, """module dut(input clk, input [3:0] a, output reg [3:0] y, q);
integer i;
always @* begin
  for (i = 0; i < 4; i = i + 1) y[i] = a[3 - i];
end
always @(posedge clk) begin
  for (i = 0; i < 4; i = i + 1) q[i] <= a[i];
end
endmodule
""")
    assert outputs(model, a=0b0011)["y"] == 0b1100
    assert any("several always blocks" in note for note in model.notes)

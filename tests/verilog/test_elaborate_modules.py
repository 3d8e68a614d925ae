"""Hierarchy, parameters, generate, gates, registers (IEEE 1364-2005 clauses 7, 12).

Clause numbers are cited from memory of IEEE 1364-2005; expected values come from Python
reference code or were printed by Icarus Verilog 11, as noted beside each check.
"""
from __future__ import annotations

import pytest

from bcdprove.errors import BcdproveError
from bcdprove.model import Op
from tests.verilog.test_elaborate_helpers import elaborate_text, outputs, signal


ADDER = """module add #(parameter W = 4) (input [W-1:0] a, b, output [W:0] s);
  assign s = a + b;
endmodule
"""


def test_named_connections_and_named_parameter_override(tmp_path):
    # clause 12.2.2.2 (named #(.W(8))) and 12.3.6 (named port connections)
    model = elaborate_text(tmp_path, ADDER + """module dut(input [7:0] x, y, output [8:0] z);
  add #(.W(8)) u_add (.a(x), .b(y), .s(z));
endmodule
""")
    assert outputs(model, x=250, y=10)["z"] == 260
    assert model.signals["u_add.s"].kind == "instance port"
    assert model.signals["u_add.a"].kind == "instance port"


def test_positional_connections_and_parameter_override(tmp_path):
    # clause 12.2.2.1 (ordered parameter list) and 12.3.5 (ordered port list)
    model = elaborate_text(tmp_path, ADDER + """module dut(input [5:0] x, y, output [6:0] z);
  add #(6) u (x, y, z);
endmodule
""")
    assert outputs(model, x=63, y=63)["z"] == 126


def test_port_width_mismatch_is_a_note_and_follows_assignment_rules(tmp_path):
    # clause 12.3.9.2: a narrower connection is zero-extended into the port, a wider one
    # truncated
    model = elaborate_text(tmp_path, ADDER + """module dut(input [7:0] x, y, output [2:0] z);
  add u (.a(x), .b(y), .s(z));
endmodule
""")
    assert outputs(model, x=0x17, y=0x01)["z"] == (0x7 + 0x1) & 0x7
    assert any("port width mismatch" in note for note in model.notes)


def test_unconnected_input_is_unknown_with_a_note(tmp_path):
    model = elaborate_text(tmp_path, ADDER + """module dut(input [3:0] x, output [4:0] z);
  add u (.a(x), .b(), .s(z));
endmodule
""")
    assert outputs(model, free=0, x=3)["z"] == 3
    assert outputs(model, free=1, x=3)["z"] == 4
    assert any("not connected" in note for note in model.notes)


def test_top_parameter_override_and_parameters_field(tmp_path):
    model = elaborate_text(tmp_path, """module dut #(parameter W = 4, localparam D = W + 1)
  (input [W-1:0] a, output [D-1:0] y);
  assign y = a;
endmodule
""", parameters={"W": 9})
    assert model.port("a").width == 9 and model.parameters["D"] == 10


def test_unknown_top_parameter_lists_the_known_ones(tmp_path):
    with pytest.raises(BcdproveError) as caught:
        elaborate_text(tmp_path, "module dut #(parameter W = 4) (input [W-1:0] a);\nendmodule\n",
                       parameters={"WIDTH": 9})
    assert "`WIDTH`" in caught.value.message and "W" in caught.value.message


def test_generate_for_names_blocks_and_keeps_their_signals(tmp_path):
    # clause 12.4.1: a generate loop block named blk creates scopes blk[0], blk[1], ...
    model = elaborate_text(tmp_path, """module dut(input [3:0] a, output [3:0] y);
  genvar g;
  generate for (g = 0; g < 4; g = g + 1) begin : blk
    wire q;
    assign q = ~a[g];
    assign y[g] = q;
  end endgenerate
endmodule
""")
    assert outputs(model, a=0b0101)["y"] == 0b1010
    assert signal(model, "blk[2].q", a=0b0101) == 0
    assert signal(model, "blk[1].q", a=0b0101) == 1


def test_generate_if_unnamed_block_is_genblk_numbered(tmp_path):
    # clause 12.4.3: an unnamed generate block gets genblk<n>, n counting the generate
    # constructs of the scope
    model = elaborate_text(tmp_path, """module dut(input a, output y);
  parameter P = 1;
  if (P == 0) begin : never wire t; end
  if (P == 1) begin wire t; assign t = a; end
  assign y = genblk2.t;
endmodule
""")
    assert "genblk2.t" in model.signals and outputs(model, a=1)["y"] == 1


def test_generate_case(tmp_path):
    # clause 12.4.2 generate case
    model = elaborate_text(tmp_path, """module dut(input [3:0] a, output [3:0] y);
  parameter MODE = 2;
  case (MODE)
    1: begin : one assign y = a; end
    2: begin : two assign y = ~a; end
    default: begin : other assign y = 0; end
  endcase
endmodule
""")
    assert outputs(model, a=0b0011)["y"] == 0b1100


def test_generate_chain_through_one_vector_is_not_a_loop(tmp_path):
    # drivers are kept per bit range, so c[i+1] from c[i] is an ordinary ripple chain
    model = elaborate_text(tmp_path, """module dut(input [7:0] a, b, output [8:0] s);
  wire [8:0] c;
  assign c[0] = 1'b0;
  genvar i;
  for (i = 0; i < 8; i = i + 1) begin : bit_cell
    assign s[i] = a[i] ^ b[i] ^ c[i];
    assign c[i + 1] = (a[i] & b[i]) | (c[i] & (a[i] ^ b[i]));
  end
  assign s[8] = c[8];
endmodule
""")
    assert outputs(model, a=201, b=99)["s"] == 300


def test_gate_primitives(tmp_path):
    # clause 7.2 / 7.3: first terminal of and/or/... is the output; buf/not drive all but
    # the last
    model = elaborate_text(tmp_path, """module dut(input a, b, c, output y1, y2, y3, y4, y5, y6);
  and g1 (y1, a, b, c);
  nor (y2, a, b);
  xnor g3 (y3, a, b);
  not (y4, y5, a);
  nand (y6, a, b);
endmodule
""")
    for a, b, c in ((1, 1, 0), (1, 1, 1), (0, 1, 0), (0, 0, 0)):
        got = outputs(model, a=a, b=b, c=c)
        # Python reference for each primitive's truth table
        expected = (a & b & c, 1 - (a | b), 1 - (a ^ b), 1 - a, 1 - a, 1 - (a & b))
        assert (got["y1"], got["y2"], got["y3"], got["y4"], got["y5"], got["y6"]) == expected


def test_implicit_net_from_a_port_connection(tmp_path):
    # clause 6.5: an undeclared identifier in a port connection is an implicit 1-bit wire
    model = elaborate_text(tmp_path, """module inv(input a, output y); assign y = ~a; endmodule
module dut(input a, output y);
  inv u1 (.a(a), .y(mid));
  inv u2 (.a(mid), .y(y));
endmodule
""")
    assert outputs(model, a=1)["y"] == 1 and "mid" in model.signals


def test_clocked_block_with_asynchronous_reset_is_a_register(tmp_path):
    model = elaborate_text(tmp_path, """module dut(input clk, rst_n, input [3:0] d, output reg [3:0] q);
  always @(posedge clk or negedge rst_n)
    if (!rst_n) q <= 4'd0;
    else q <= q + d;
endmodule
""")
    (register,) = model.registers
    assert register.name == "q" and register.clock == "clk" and register.edge == "posedge"
    assert register.reset is not None and register.reset.signal == "rst_n"
    assert register.reset.active_high is False and register.reset.value.value == 0
    assert model.port("q").node is register.state
    from bcdprove.model import evaluate
    env = {register.state.id: 7, model.port("d").node.id: 5}
    assert evaluate([register.next], env) == [12]


def test_clocked_block_without_full_assignment_keeps_the_value(tmp_path):
    # clause 9.2.2: a register not assigned on a path keeps its value (no latch error)
    model = elaborate_text(tmp_path, """module dut(input clk, en, input [3:0] d, output reg [3:0] q = 4'd5);
  always @(posedge clk) if (en) q <= d;
endmodule
""")
    (register,) = model.registers
    from bcdprove.model import evaluate
    assert evaluate([register.next], {register.state.id: 3, model.port("en").node.id: 0,
                                      model.port("d").node.id: 9}) == [3]
    assert register.init is not None and register.init.value == 5


def test_register_initialised_by_an_initial_block(tmp_path):
    model = elaborate_text(tmp_path, """module dut(input clk, output reg [3:0] q);
  initial q = 4'd9;
  always @(posedge clk) q <= q + 4'd1;
endmodule
""")
    assert model.registers[0].init.value == 9


def test_signals_hold_every_declared_net_and_variable(tmp_path):
    model = elaborate_text(tmp_path, ADDER + """module dut(input [3:0] x, output [4:0] z);
  wire [3:0] w = x;
  reg [3:0] r;
  always @* r = w;
  add u (.a(r), .b(4'd1), .s(z));
endmodule
""")
    assert {"x", "z", "w", "r", "u.a", "u.b", "u.s"} <= set(model.signals)
    assert model.signals["w"].kind == "net" and model.signals["r"].kind == "variable"
    assert model.signals["x"].kind == "port"
    assert [p.name for p in model.ports] == ["x", "z"]
    assert model.port("x").node.op == Op.INPUT


CELL = """module cell(input [3:0] d, output [3:0] q, output u);
  reg [3:0] t;
  integer k;
  always @* begin
    t = 0;
    for (k = 0; k < 4; k = k + 1) t[k] = d[3 - k];
  end
  assign q = t;
  assign u = 1'bx;
endmodule
"""


def test_repeated_instances_keep_their_own_values_names_and_probes(tmp_path):
    model = elaborate_text(tmp_path, CELL + """module dut(input [7:0] a, output [7:0] y, output [1:0] z);
  genvar i;
  for (i = 0; i < 2; i = i + 1) begin : lane
    cell c (.d(a[4*i +: 4]), .q(y[4*i +: 4]), .u(z[i]));
  end
endmodule
""")
    assert outputs(model, a=0x1E)["y"] == 0x87           # each nibble bit-reversed
    assert signal(model, "lane[1].c.q", a=0x1E) == 0x8
    assert signal(model, "lane[0].c.t@k=0", a=0x1E) == 0x1   # t[0] = d[3] of 4'b1110
    assert signal(model, "lane[1].c.t@k=0", a=0x1E) == 0x0   # t[0] = d[3] of 4'b0001
    # the x of each instance is its own unknown: z can be 01 (not only 00 or 11)
    from bcdprove.model import Op, evaluate, leaves
    free = [leaf for leaf in leaves([model.port("z").node]) if leaf.op == Op.FREE]
    assert len(free) == 2
    assert evaluate([model.port("z").node], {free[0].id: 1, free[1].id: 0})[0] in (1, 2)

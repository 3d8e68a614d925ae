"""Unrolling against Icarus Verilog: the cycle-by-cycle values of small clocked designs.

Referee: Icarus Verilog simulates each design under a bench written here (inputs change
1 ns into a 10 ns cycle, outputs sampled at 8 ns, the active edge ends the cycle, as the
timing contract of bcdprove.model.unroll says); the unrolled model's trace must match it
cycle by cycle.  Registers without reset are set to 0 at time 0 in the bench and given 0
in the trace, so both start from the same power-up state.
"""
from __future__ import annotations

import pytest

from bcdprove.errors import BcdproveError, UnsupportedConstruct
from bcdprove.model.node import Op
from bcdprove.model.unroll import unroll
from bcdprove.verilog import read_design
from tests.support.icarus import run_icarus

COUNTER = """
module tick_counter(input clk, input rst, input en, input [3:0] d,
                    output [3:0] count, output [7:0] history, output [3:0] sum);
    reg [3:0] count_r;
    reg [7:0] shift;
    always @(posedge clk)
        if (rst) count_r <= 4'd0;
        else if (en) count_r <= count_r + 4'd1;
    always @(posedge clk) shift <= {shift[3:0], d};
    assign count = count_r;
    assign history = shift;
    assign sum = count_r + d;
endmodule
"""

ASYNC = """
module async_hold(input clk, input arst_n, input [3:0] d, output reg [3:0] q, output reg [3:0] q2);
    always @(posedge clk or negedge arst_n)
        if (!arst_n) begin q <= 4'd9; q2 <= 4'd0; end
        else begin q <= d; q2 <= q; end
endmodule
"""

TWO_EDGES = """
module two_edges(input clk, input [3:0] d, output [3:0] a_out, output [3:0] b_out);
    reg [3:0] a, b;
    always @(negedge clk) a <= d + 4'd1;
    always @(posedge clk) b <= a + b;
    assign a_out = a;
    assign b_out = b;
endmodule
"""

FALLING = """
module falling_shift(input clk, input [3:0] d, output [3:0] q);
    reg [3:0] r1, r2;
    always @(negedge clk) begin r1 <= d; r2 <= r1; end
    assign q = r2 ^ d;
endmodule
"""


def _model(tmp_path, text: str, top: str):
    path = tmp_path / f"{top}.v"
    path.write_text(text)
    return path, read_design([str(path)], top, {})


def _icarus_run(path, top: str, model, stimulus: list[dict[str, int]], edges: str,
                registers: list[str]) -> list[dict[str, int]]:
    """Output values per cycle from Icarus under the timing contract of unroll."""
    inputs = [p for p in model.inputs if p.name != "clk"]
    outputs = model.outputs
    lines = ["`timescale 1ns/1ns", "module bench;", "  reg clk;"]
    lines += [f"  reg [{p.width - 1}:0] {p.name};" for p in inputs]
    lines += [f"  wire [{p.width - 1}:0] {p.name};" for p in outputs]
    lines.append(f"  {top} dut (" + ", ".join(f".{p.name}({p.name})" for p in model.ports) + ");")
    if edges == "posedge":
        start, plan = 0, [(9, 1), (10, 0)]
    elif edges == "negedge":
        start, plan = 1, [(9, 0), (10, 1)]
    else:
        start, plan = 1, [(5, 0), (10, 1)]
    lines += ["  initial begin", f"    clk = {start};", "    #2;"]
    lines += [f"    dut.{name} = 0;" for name in registers]
    for values in stimulus:
        events = sorted([(1, "in", None), (8, "show", None)] + [(a, "clk", v) for a, v in plan],
                        key=lambda e: e[0])
        now = 0
        for at, kind, level in events:
            if at > now:
                lines.append(f"    #{at - now};")
                now = at
            if kind == "in":
                lines += [f"    {name} = {value};" for name, value in values.items()]
            elif kind == "clk":
                lines.append(f"    clk = {level};")
            else:
                lines.append('    $display("' + " ".join("%0d" for _ in outputs) + '", '
                             + ", ".join(p.name for p in outputs) + ");")
    lines += ["    $finish;", "  end", "endmodule", ""]
    text = run_icarus([path], "bench", "\n".join(lines))
    rows = [line.split() for line in text.splitlines() if line.strip()]
    assert len(rows) == len(stimulus), text
    return [{p.name: int(v) for p, v in zip(outputs, row)} for row in rows]


def _model_run(model, stimulus: list[dict[str, int]]) -> list[dict[str, int]]:
    unrolled = unroll(model, len(stimulus))
    values = {}
    for t, setting in enumerate(stimulus):
        for name, value in setting.items():
            values[unrolled.leaf(name, t).id] = value
    return [c.outputs for c in unrolled.trace(values)]      # power-up values default to 0


def test_counter_and_shift_register_match_icarus(tmp_path):
    path, model = _model(tmp_path, COUNTER, "tick_counter")
    stimulus = [{"rst": 1, "en": 0, "d": 3}, {"rst": 0, "en": 1, "d": 5},
                {"rst": 0, "en": 1, "d": 15}, {"rst": 0, "en": 0, "d": 1},
                {"rst": 0, "en": 1, "d": 8}, {"rst": 1, "en": 1, "d": 2},
                {"rst": 0, "en": 1, "d": 9}]
    expected = _icarus_run(path, "tick_counter", model, stimulus, "posedge", ["count_r", "shift"])
    assert _model_run(model, stimulus) == expected


def test_asynchronous_reset_acts_within_the_cycle_like_icarus(tmp_path):
    # IEEE 1364-2005 clause 9.7.2: the block wakes on the falling reset edge itself.
    path, model = _model(tmp_path, ASYNC, "async_hold")
    stimulus = [{"arst_n": 1, "d": 4}, {"arst_n": 1, "d": 6}, {"arst_n": 1, "d": 7},
                {"arst_n": 0, "d": 1}, {"arst_n": 1, "d": 2}, {"arst_n": 1, "d": 3},
                {"arst_n": 1, "d": 5}]
    expected = _icarus_run(path, "async_hold", model, stimulus, "posedge", ["q", "q2"])
    got = _model_run(model, stimulus)
    assert got == expected
    assert got[3]["q"] == 9 and got[4]["q"] == 9     # the reset value, this cycle and the next


def test_negedge_only_design_matches_icarus(tmp_path):
    path, model = _model(tmp_path, FALLING, "falling_shift")
    stimulus = [{"d": v} for v in (1, 2, 3, 12, 5, 0)]
    expected = _icarus_run(path, "falling_shift", model, stimulus, "negedge", ["r1", "r2"])
    assert _model_run(model, stimulus) == expected


def test_both_edges_are_half_cycles_like_icarus(tmp_path):
    path, model = _model(tmp_path, TWO_EDGES, "two_edges")
    stimulus = [{"d": v} for v in (1, 2, 3, 4, 9, 0)]
    expected = _icarus_run(path, "two_edges", model, stimulus, "both", ["a", "b"])
    unrolled = unroll(model, len(stimulus))
    assert unrolled.half_cycles
    assert _model_run(model, stimulus) == expected


def test_power_up_values_are_free_and_distinct(tmp_path):
    _, model = _model(tmp_path, COUNTER, "tick_counter")
    unrolled = unroll(model, 2)
    first = unrolled.registers[0]
    assert first["count_r"].op == Op.FREE and first["shift"].op == Op.FREE
    assert first["count_r"] is not first["shift"]


def test_inputs_are_leaves_per_cycle_and_the_clock_is_not_one(tmp_path):
    _, model = _model(tmp_path, COUNTER, "tick_counter")
    unrolled = unroll(model, 3)
    names = {p.name for p in unrolled.model.inputs}
    assert {"rst@0", "en@2", "d@1"} <= names and not any(n.startswith("clk") for n in names)
    assert "count_r@2" in unrolled.model.signals
    assert unrolled.model.signals["count_r@2"].kind == "register"


def test_an_x_is_a_fresh_unknown_in_every_cycle(tmp_path):
    text = """
module x_every_cycle(input clk, input [1:0] s, output reg [3:0] q);
    reg [3:0] table_ [0:2];
    always @(posedge clk) q <= table_[s];
endmodule
"""
    _, model = _model(tmp_path, text, "x_every_cycle")
    unrolled = unroll(model, 3)
    from bcdprove.model.node import leaves
    free_1 = {n.id for n in leaves([unrolled.registers[2]["q"]]) if n.op == Op.FREE}
    free_0 = {n.id for n in leaves([unrolled.registers[1]["q"]]) if n.op == Op.FREE}
    assert free_1 - free_0, "cycle 1 must read an unknown of its own"


def test_a_clock_read_as_data_is_refused(tmp_path):
    text = """
module clock_as_data(input clk, input d, output q, output reg r);
    always @(posedge clk) r <= d;
    assign q = r & clk;
endmodule
"""
    _, model = _model(tmp_path, text, "clock_as_data")
    with pytest.raises(UnsupportedConstruct, match="reads its clock"):
        unroll(model, 2)


def test_several_clocks_are_refused(tmp_path):
    text = """
module two_clocks(input clk_a, input clk_b, input d, output reg qa, output reg qb);
    always @(posedge clk_a) qa <= d;
    always @(posedge clk_b) qb <= d;
endmodule
"""
    _, model = _model(tmp_path, text, "two_clocks")
    with pytest.raises(UnsupportedConstruct, match="several clocks"):
        unroll(model, 2)


def test_a_combinational_model_has_nothing_to_unroll(tmp_path):
    text = "module plain(input [3:0] a, output [3:0] b); assign b = a; endmodule\n"
    _, model = _model(tmp_path, text, "plain")
    with pytest.raises(BcdproveError, match="no registers"):
        unroll(model, 2)


def test_selective_unrolling_builds_the_same_outputs_and_fewer_registers(tmp_path):
    _, model = _model(tmp_path, COUNTER, "tick_counter")
    whole = unroll(model, 5)
    part = unroll(model, 5, outputs={4: {"sum"}})
    assert part.selective and "shift" not in part.registers[3]
    assert set(part.outputs[4]) == {"sum"} and not part.outputs[3]
    stimulus = {whole.leaf("d", t).id: 3 * t + 1 for t in range(5)}
    stimulus.update({whole.leaf("en", t).id: 1 for t in range(5)})
    assert part.trace(stimulus) == whole.trace(stimulus)


def test_trace_cross_checks_the_nodes_against_a_cycle_by_cycle_run(tmp_path):
    _, model = _model(tmp_path, ASYNC, "async_hold")
    unrolled = unroll(model, 4)
    # Tamper with one built node: the trace must notice, not show either value silently.
    unrolled.outputs[2]["q"] = model.graph.const(5, 4)
    with pytest.raises(AssertionError, match="cycle 2: q"):
        unrolled.trace({unrolled.leaf("arst_n", t).id: 1 for t in range(4)})

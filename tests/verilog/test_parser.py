"""The parser: pyverilog's grammar plus the constructs real converter files use.

Every snippet here is also compiled by Icarus Verilog (``-g2005-sv``) in
``test_icarus_accepts_every_accepted_snippet``, so the inputs are known to be legal code and
the parse shapes are checked against what the source says.  Clause numbers are IEEE
1364-2005 (recalled from memory); SystemVerilog forms are IEEE 1800 (also recalled).
"""
from __future__ import annotations

import os
import subprocess
import sys
import tempfile
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from pyverilog.vparser import ast as vast

from bcdprove.errors import BcdproveError, UnsupportedConstruct
from bcdprove.model import SourceLocation
from bcdprove.verilog.parser import FillConst, Int, Logic, LoopDeclaration, location, parse
from bcdprove.verilog.preprocess import Preprocessed, preprocess
from tests.support.icarus import run_icarus

REPOSITORY = Path(__file__).resolve().parents[2]


def _pre(text: str, file: str = "snippet.v") -> Preprocessed:
    count = text.count("\n") + 1
    return Preprocessed(text + "\n", [(file, n) for n in range(1, count + 1)])


def _module(text: str) -> vast.ModuleDef:
    return parse(_pre(text)).description.definitions[0]


def _all(node, cls) -> list:
    """Every node of class ``cls`` below (and including) ``node``, in tree order."""
    found = [node] if isinstance(node, cls) else []
    for child in node.children():
        found.extend(_all(child, cls))
    return found


def _one(node, cls):
    found = _all(node, cls)
    assert len(found) == 1, f"expected one {cls.__name__}, found {len(found)}"
    return found[0]


def _int(node) -> int:
    assert isinstance(node, vast.IntConst), node
    return int(node.value)


# Snippets that must parse; each is a complete module named after its key (for Icarus).
ACCEPTED = {
    "localparam_in_parameter_ports":
        "module localparam_in_parameter_ports #(parameter W = 8, localparam D = W / 4,\n"
        "    parameter integer N = 2) (input [W-1:0] a, output [D-1:0] y);\n"
        "  assign y = a[D-1:0];\nendmodule",
    "inline_genvar":
        "module inline_genvar(input [3:0] a, output [3:0] y);\n"
        "  for (genvar g = 0; g < 4; g = g + 1) begin : stage\n"
        "    assign y[g] = a[3 - g];\n  end\nendmodule",
    "inline_genvar_in_region":
        "module inline_genvar_in_region(input [3:0] a, output [3:0] y);\n"
        "  generate\n    for (genvar g = 0; g < 4; g++) begin : stage\n"
        "      assign y[g] = ~a[g];\n    end\n  endgenerate\nendmodule",
    "ansi_function":
        "module ansi_function(input [3:0] x, output [7:0] y);\n"
        "  function automatic [7:0] add3(input [3:0] a, input b);\n"
        "    add3 = a + (b ? 3 : 0);\n  endfunction\n"
        "  assign y = add3(x, 1'b1);\nendmodule",
    "ansi_function_plain":
        "module ansi_function_plain(input [3:0] x, output [3:0] y);\n"
        "  function [3:0] pass(input [3:0] a, b);\n    pass = a | b;\n  endfunction\n"
        "  assign y = pass(x, x);\nendmodule",
    "function_integer_ansi":
        "module function_integer_ansi(output [7:0] y);\n"
        "  function automatic integer twice(input integer v);\n    twice = 2 * v;\n"
        "  endfunction\n  assign y = twice(5);\nendmodule",
    "function_signed":
        "module function_signed(input signed [3:0] x, output signed [7:0] y);\n"
        "  function signed [7:0] widen(input signed [3:0] a);\n    widen = a;\n"
        "  endfunction\n  assign y = widen(x);\nendmodule",
    "function_automatic_integer_old_style":
        "module function_automatic_integer_old_style(output [7:0] y);\n"
        "  function automatic integer digits;\n    input integer v;\n"
        "    begin\n      digits = v / 10;\n    end\n  endfunction\n"
        "  assign y = digits(99);\nendmodule",
    "output_initial_value":
        "module output_initial_value(input clk, output reg [3:0] y = 0);\n"
        "  always @(posedge clk) y <= y + 1;\nendmodule",
    "fill_literals":
        "module fill_literals(output [3:0] a, b, c, d);\n"
        "  assign a = '0;\n  assign b = '1;\n  assign c = 'x;\n  assign d = 'z;\nendmodule",
    "int_and_steps":
        "module int_and_steps(input [7:0] x, output reg [7:0] y);\n  int n;\n"
        "  always @* begin\n    y = 0;\n    for (int i = 0; i < 8; i++) y[i] = x[7 - i];\n"
        "    n = 0;\n    n++;\n    n--;\n    ++n;\n    --n;\n    n += 3;\n    n -= 1;\n"
        "  end\nendmodule",
    "labels":
        "module labels(input a, output reg y);\n  always @* begin : body\n    y = a;\n"
        "  end : body\nendmodule : labels",
    "always_kinds":
        "module always_kinds(input clk, input d, output logic q, output logic c,\n"
        "    output logic l);\n  always_comb c = d;\n  always_ff @(posedge clk) q <= d;\n"
        "  always_latch if (clk) l = d;\nendmodule",
    "logic_variables":
        "module logic_variables(input logic a, output logic b);\n  logic [3:0] t;\n"
        "  always_comb begin t = {4{a}}; b = t[0]; end\nendmodule",
    "signed_ports_and_arithmetic_shift":
        "module signed_ports_and_arithmetic_shift(input signed [7:0] a,\n"
        "    output signed [7:0] y);\n  assign y = a >>> 2;\nendmodule",
    "casez_wildcards":
        "module casez_wildcards(input [3:0] a, output reg [1:0] y);\n"
        "  always @* casez (a)\n    4'b1???: y = 3;\n    4'b01??: y = 2;\n"
        "    default: y = 0;\n  endcase\nendmodule",
    "casex_wildcards":
        "module casex_wildcards(input [3:0] a, output reg y);\n"
        "  always @* casex (a)\n    4'b1xxx: y = 1;\n    default: y = 0;\n  endcase\nendmodule",
    "indexed_selects":
        "module indexed_selects(input [7:0] a, output [3:0] hi, lo);\n"
        "  assign hi = a[7 -: 4];\n  assign lo = a[0 +: 4];\nendmodule",
    "power":
        "module power(output [7:0] y);\n  assign y = 2 ** 3;\nendmodule",
    "gate_primitives":
        "module gate_primitives(input a, b, output y, z);\n  and g1 (y, a, b);\n"
        "  or (z, a, b);\nendmodule",
    "non_ansi_ports":
        "module non_ansi_ports(a, y);\n  input [3:0] a;\n  output [3:0] y;\n"
        "  wire [3:0] y;\n  assign y = a;\nendmodule",
    "while_loop":
        "module while_loop(output reg [7:0] y);\n  integer i;\n"
        "  always @* begin\n    i = 0;\n    y = 0;\n    while (i < 4) begin y = y + i; i = i + 1; end\n"
        "  end\nendmodule",
    "net_declaration_assignment":
        "module net_declaration_assignment(input [3:0] a, output [3:0] y);\n"
        "  wire [3:0] t = a ^ 4'b1010, u = t;\n  assign y = u;\nendmodule",
    "variable_initial_value":
        "module variable_initial_value(output [3:0] y);\n  reg [3:0] r = 4'd9;\n"
        "  assign y = r;\nendmodule",
    "concatenation_target":
        "module concatenation_target(input [3:0] a, b, output c, output [3:0] s);\n"
        "  assign {c, s} = a + b;\nendmodule",
    "memory":
        "module memory(input [2:0] k, output [3:0] y);\n  reg [3:0] table_ [0:7];\n"
        "  assign y = table_[k];\nendmodule",
    "integer_and_system_functions":
        "module integer_and_system_functions(input [7:0] a, output [7:0] y);\n"
        "  localparam W = $clog2(100);\n  integer k;\n"
        "  initial $display(\"W=%0d\", W);\n  assign y = $signed(a) >>> 1;\nendmodule",
    "constant_function":
        "module constant_function(output [7:0] y);\n"
        "  function integer bits(input integer v);\n    begin\n      bits = 0;\n"
        "      while (v > 0) begin bits = bits + 1; v = v >> 1; end\n    end\n"
        "  endfunction\n  localparam L = bits(99);\n  assign y = L;\nendmodule",
    "generate_if_and_case":
        "module generate_if_and_case #(parameter P = 1) (output [1:0] y);\n"
        "  generate\n    if (P > 0) begin : positive\n      assign y[0] = 1'b1;\n"
        "    end else begin : other\n      assign y[0] = 1'b0;\n    end\n"
        "    case (P)\n      0: begin : zero\n        assign y[1] = 1'b0;\n      end\n"
        "      default: begin : nonzero\n        assign y[1] = 1'b1;\n      end\n"
        "    endcase\n  endgenerate\nendmodule",
    "generate_if_without_region":
        "module generate_if_without_region #(parameter P = 0) (output y);\n"
        "  if (P) begin : on\n    assign y = 1'b1;\n  end else begin : off\n"
        "    assign y = 1'b0;\n  end\nendmodule",
    "instances":
        "module nibble_cell #(parameter W = 4) (input [W-1:0] a, output [W-1:0] y);\n"
        "  assign y = a;\nendmodule\n"
        "module instances(input [7:0] a, output [7:0] y);\n"
        "  nibble_cell #(.W(4)) low (.a(a[3:0]), .y(y[3:0]));\n"
        "  nibble_cell #(4) high (a[7:4], y[7:4]);\nendmodule",
    "compound_on_selects":
        "module compound_on_selects(input [7:0] a, output reg [7:0] y);\n"
        "  always @* begin\n    y = a;\n    y[3:0] += 4'd3;\n    y[7] ^= 1'b1;\n"
        "    y <<= 1;\n  end\nendmodule",
    "unnamed_block_declarations":
        "module unnamed_block_declarations(input [3:0] a, output logic [3:0] y);\n"
        "  always_comb begin\n    logic [3:0] t;\n    t = a + 1;\n    y = t;\n  end\nendmodule",
    "null_statements":
        "module null_statements(input [1:0] a, output reg y);\n"
        "  always @* begin\n    y = 0;\n    case (a)\n      2'd0: ;\n      default y = 1;\n"
        "    endcase\n    if (a[0]) ; else y = ~y;\n  end\nendmodule",
}


@pytest.mark.parametrize("key", sorted(ACCEPTED))
def test_snippet_parses(key):
    source = parse(_pre(ACCEPTED[key]))
    names = [d.name for d in source.description.definitions]
    assert key in names


@pytest.mark.icarus
def test_icarus_accepts_every_accepted_snippet(tmp_path):
    for key, text in ACCEPTED.items():
        path = tmp_path / f"{key}.v"
        path.write_text(text + "\n")
        run_icarus([path], key)      # raises AssertionError with Icarus's message


# -- shapes of the added constructs ---------------------------------------------------------
def test_localparam_inside_parameter_ports():
    module = _module(ACCEPTED["localparam_in_parameter_ports"])
    declared = [decl.list[0] for decl in module.paramlist.params]
    assert [type(p) for p in declared] == [vast.Parameter, vast.Localparam, vast.Parameter]
    assert [p.name for p in declared] == ["W", "D", "N"]
    assert isinstance(declared[1].value.var, vast.Divide)
    # 1364-2005 clause 12.2: an integer parameter is 32-bit signed.
    assert declared[2].signed and _int(declared[2].width.msb) == 31


def test_inline_genvar_declares_the_loop_variable():
    module = _module(ACCEPTED["inline_genvar"])
    generate = _one(module, vast.GenerateStatement)
    loop = generate.items[0]
    assert isinstance(loop, vast.ForStatement)
    assert isinstance(loop.pre, LoopDeclaration) and isinstance(loop.pre, vast.BlockingSubstitution)
    assert loop.pre.kind == "genvar"
    assert isinstance(loop.pre.variable, vast.Genvar) and loop.pre.variable.name == "g"
    assert loop.pre.left.var.name == "g" and _int(loop.pre.right.var) == 0
    assert isinstance(loop.statement, vast.Block) and loop.statement.scope == "stage"


def test_inline_genvar_with_increment_step():
    loop = _one(_module(ACCEPTED["inline_genvar_in_region"]), vast.ForStatement)
    assert loop.pre.kind == "genvar"
    step = loop.post
    assert isinstance(step, vast.BlockingSubstitution)
    assert isinstance(step.right.var, vast.Plus) and step.right.var.left.name == "g"


def test_ansi_function_ports_become_input_declarations():
    function = _one(_module(ACCEPTED["ansi_function"]), vast.Function)
    assert function.name == "add3" and function.automatic is True
    assert _int(function.retwidth.msb) == 7 and _int(function.retwidth.lsb) == 0
    first, second, body = function.statement
    assert isinstance(first, vast.Decl) and isinstance(first.list[0], vast.Input)
    assert first.list[0].name == "a" and _int(first.list[0].width.msb) == 3
    assert second.list[0].name == "b" and second.list[0].width is None
    assert isinstance(body, vast.BlockingSubstitution)


def test_ansi_function_port_without_direction_repeats_the_previous_type():
    function = _one(_module(ACCEPTED["ansi_function_plain"]), vast.Function)
    assert function.automatic is False
    ports = [decl.list[0] for decl in function.statement[:-1]]
    assert [p.name for p in ports] == ["a", "b"]
    assert all(isinstance(p, vast.Input) and _int(p.width.msb) == 3 for p in ports)


def test_integer_function_is_32_bit_signed():
    function = _one(_module(ACCEPTED["function_integer_ansi"]), vast.Function)
    assert function.return_type == "integer" and function.signed is True
    assert _int(function.retwidth.msb) == 31
    port = function.statement[0].list[0]
    assert port.name == "v" and port.signed and _int(port.width.msb) == 31


def test_signed_function_result():
    function = _one(_module(ACCEPTED["function_signed"]), vast.Function)
    assert function.signed is True and function.return_type == "implicit"
    assert function.statement[0].list[0].signed is True


def test_automatic_integer_function_with_old_style_inputs():
    function = _one(_module(ACCEPTED["function_automatic_integer_old_style"]), vast.Function)
    assert function.automatic and function.return_type == "integer"
    declared, body = function.statement
    assert isinstance(declared.list[0], vast.Input) and declared.list[0].name == "v"
    assert isinstance(body, vast.Block)


def test_output_port_initial_value_is_the_reg_value():
    module = _module(ACCEPTED["output_initial_value"])
    port = module.portlist.ports[1]
    assert isinstance(port.first, vast.Output) and isinstance(port.second, vast.Reg)
    assert isinstance(port.second.value, vast.Rvalue) and _int(port.second.value.var) == 0


def test_output_wire_may_not_have_an_initial_value():
    with pytest.raises(BcdproveError) as caught:
        _module("module m(output [3:0] y = 0);\nendmodule")
    assert caught.value.line == 1 and "initial value" in caught.value.message


def test_fill_literals_are_their_own_constant_class():
    module = _module(ACCEPTED["fill_literals"])
    fills = _all(module, FillConst)
    assert [f.value for f in fills] == ["'0", "'1", "'x", "'z"]
    assert all(isinstance(f, vast.IntConst) for f in fills)


def test_fill_literal_digit_is_lower_case():
    fill = _one(_module("module m(output [3:0] y);\n  assign y = 'X;\nendmodule"), FillConst)
    assert fill.value == "'x"


def test_int_is_a_32_bit_signed_integer():
    declared = _one(_module(ACCEPTED["int_and_steps"]), vast.Decl).list[0]
    assert isinstance(declared, Int) and isinstance(declared, vast.Integer)
    assert declared.name == "n" and declared.signed and _int(declared.width.msb) == 31


def test_for_loop_with_int_variable_and_increment():
    loop = _one(_module(ACCEPTED["int_and_steps"]), vast.ForStatement)
    assert isinstance(loop.pre, LoopDeclaration) and loop.pre.kind == "int"
    assert isinstance(loop.pre.variable, Int) and loop.pre.variable.name == "i"
    step = loop.post.right.var
    assert isinstance(step, vast.Plus) and step.left.name == "i" and _int(step.right) == 1


def _steps(module) -> list[tuple[str, str, int]]:
    """(target, operator class, amount) of each ``n ...`` statement after ``n = 0``."""
    block = _one(module, vast.Always).statement
    found = []
    for statement in block.statements:
        if (isinstance(statement, vast.BlockingSubstitution) and
                isinstance(statement.left.var, vast.Identifier) and statement.left.var.name == "n"
                and isinstance(statement.right.var, vast.Operator)):
            operation = statement.right.var
            found.append((operation.left.name, type(operation).__name__, _int(operation.right)))
    return found


def test_increments_and_compound_assignments_are_ordinary_assignments():
    # IEEE 1800: n++ is n += 1, and n op= e is n = n op (e).
    assert _steps(_module(ACCEPTED["int_and_steps"])) == [
        ("n", "Plus", 1), ("n", "Minus", 1), ("n", "Plus", 1), ("n", "Minus", 1),
        ("n", "Plus", 3), ("n", "Minus", 1)]


def test_compound_assignment_on_a_part_select_reads_the_same_part():
    block = _one(_module(ACCEPTED["compound_on_selects"]), vast.Always).statement
    _, low, top, shifted = block.statements
    assert isinstance(low.left.var, vast.Partselect)
    assert isinstance(low.right.var, vast.Plus) and isinstance(low.right.var.left, vast.Partselect)
    assert low.right.var.left is not low.left.var          # a copy, not a shared node
    assert isinstance(top.right.var, vast.Xor) and isinstance(top.right.var.left, vast.Pointer)
    assert isinstance(shifted.right.var, vast.Sll)


def test_end_labels_and_endmodule_label():
    module = _module(ACCEPTED["labels"])
    assert module.name == "labels"
    assert _one(module, vast.Block).scope == "body"


def test_mismatched_end_label_is_an_error():
    with pytest.raises(BcdproveError) as caught:
        _module("module m;\n  initial begin : one\n  end : two\nendmodule")
    assert caught.value.line == 3 and "two" in caught.value.message


def test_mismatched_endmodule_label_is_an_error():
    with pytest.raises(BcdproveError) as caught:
        _module("module m;\nendmodule : n")
    assert caught.value.line == 2


def test_always_kinds_are_kept():
    module = _module(ACCEPTED["always_kinds"])
    kinds = [type(item) for item in module.items]
    assert kinds == [vast.AlwaysComb, vast.AlwaysFF, vast.AlwaysLatch]
    clocked = module.items[1]
    assert [(s.type, s.sig.name) for s in clocked.sens_list.list] == [("posedge", "clk")]


def test_always_without_event_control_is_rejected():
    with pytest.raises(BcdproveError) as caught:
        _module("module m(output reg y);\n  always y = 1;\nendmodule")
    assert caught.value.line == 2 and "event control" in caught.value.message


def test_logic_is_a_reg_that_stays_recognisable():
    module = _module(ACCEPTED["logic_variables"])
    inputs, outputs = module.portlist.ports
    assert isinstance(inputs.first, vast.Input) and inputs.second is None
    assert isinstance(outputs.first, vast.Output) and isinstance(outputs.second, Logic)
    local = _one(module, vast.Decl).list[0]
    assert isinstance(local, Logic) and isinstance(local, vast.Reg) and local.name == "t"


def test_declaration_assignments_pair_each_name_with_an_assign():
    # pyverilog's shape, which the elaborator reads: [Reg, Assign] is an initial value
    # (1364-2005 clause 6.2.1), [Wire, Assign] a continuous assignment (clause 6.1.1).
    declared = _module(ACCEPTED["variable_initial_value"]).items[0].list
    assert [type(n).__name__ for n in declared] == ["Reg", "Assign"]
    assert declared[1].left.var.name == "r" and declared[1].right.var.value == "4'd9"
    nets = _module(ACCEPTED["net_declaration_assignment"]).items[0].list
    assert [type(n).__name__ for n in nets] == ["Wire", "Assign", "Wire", "Assign"]
    assert nets[3].left.var.name == "u" and nets[3].right.var.name == "t"
    assert _int(nets[2].width.msb) == 3           # the range applies to every name


# -- constructs pyverilog already handled (kept working) ------------------------------------
def test_signed_ports_and_arithmetic_shift():
    module = _module(ACCEPTED["signed_ports_and_arithmetic_shift"])
    assert all(port.first.signed for port in module.portlist.ports)
    assert isinstance(_one(module, vast.Assign).right.var, vast.Sra)


def test_signed_continues_to_the_next_port_name():
    # 1364-2005 clause 12.3.4: a port list entry without its own type repeats the previous.
    module = _module("module m(input signed [3:0] a, b, output wire signed [4:0] c, d);\n"
                     "endmodule")
    a, b, c, d = module.portlist.ports
    assert b.first.signed and _int(b.first.width.msb) == 3 and isinstance(b.first, vast.Input)
    assert isinstance(d.first, vast.Output) and isinstance(d.second, vast.Wire)
    assert d.first.signed and _int(d.first.width.msb) == 4


def test_casez_and_casex_keep_their_kind_and_wildcards():
    casez = _one(_module(ACCEPTED["casez_wildcards"]), vast.CasezStatement)
    assert casez.caselist[0].cond[0].value == "4'b1???"
    assert casez.caselist[-1].cond is None                       # default
    casex = _one(_module(ACCEPTED["casex_wildcards"]), vast.CasexStatement)
    assert casex.caselist[0].cond[0].value == "4'b1xxx"


def test_indexed_part_selects_keep_pyverilogs_shape():
    # pyverilog writes v[b +: w] as Partselect(v, b, Plus(b, w)) with b shared (the
    # elaborator relies on that identity); -: uses Minus.
    high, low = _all(_module(ACCEPTED["indexed_selects"]), vast.Partselect)
    assert isinstance(high.lsb, vast.Minus) and high.lsb.left is high.msb
    assert isinstance(low.lsb, vast.Plus) and low.lsb.left is low.msb
    assert _int(high.msb) == 7 and _int(high.lsb.right) == 4


def test_power_operator():
    assert isinstance(_one(_module(ACCEPTED["power"]), vast.Assign).right.var, vast.Power)


def test_gate_primitives_with_and_without_instance_names():
    lists = _all(_module(ACCEPTED["gate_primitives"]), vast.InstanceList)
    assert [(l.module, l.instances[0].name) for l in lists] == [("and", "g1"), ("or", "")]
    assert len(lists[1].instances[0].portlist) == 3


def test_non_ansi_ports():
    module = _module(ACCEPTED["non_ansi_ports"])
    assert [p.name for p in module.portlist.ports] == ["a", "y"]
    kinds = [type(d.list[0]).__name__ for d in module.items if isinstance(d, vast.Decl)]
    assert kinds == ["Input", "Output", "Wire"]


def test_while_loop():
    loop = _one(_module(ACCEPTED["while_loop"]), vast.WhileStatement)
    assert isinstance(loop.cond, vast.LessThan)


def test_concatenation_as_assignment_target():
    target = _one(_module(ACCEPTED["concatenation_target"]), vast.Assign).left.var
    assert isinstance(target, vast.LConcat) and [v.name for v in target.list] == ["c", "s"]


def test_memory_declaration():
    memory = _one(_module(ACCEPTED["memory"]), vast.Reg)
    assert memory.name == "table_" and len(memory.dimensions.lengths) == 1
    assert _int(memory.dimensions.lengths[0].msb) == 0 and _int(memory.dimensions.lengths[0].lsb) == 7


def test_integer_clog2_display_and_signed():
    module = _module(ACCEPTED["integer_and_system_functions"])
    calls = [c.syscall for c in _all(module, vast.SystemCall)]
    assert calls == ["clog2", "display", "signed"]
    assert _one(module, vast.Integer).name == "k"


def test_constant_function_call_in_a_localparam():
    module = _module(ACCEPTED["constant_function"])
    localparam = _one(module, vast.Localparam)
    assert isinstance(localparam.value.var, vast.FunctionCall)
    assert localparam.value.var.name.name == "bits"


def test_generate_if_and_generate_case():
    module = _module(ACCEPTED["generate_if_and_case"])
    generate = _one(module, vast.GenerateStatement)
    branch, choice = generate.items
    assert isinstance(branch, vast.IfStatement)
    assert branch.true_statement.scope == "positive" and branch.false_statement.scope == "other"
    assert isinstance(choice, vast.CaseStatement)
    assert [c.statement.scope for c in choice.caselist] == ["zero", "nonzero"]
    assert choice.caselist[1].cond is None


def test_generate_if_outside_a_generate_region():
    # 1364-2005 clause 12.4: the generate ... endgenerate keywords are optional.
    generate = _one(_module(ACCEPTED["generate_if_without_region"]), vast.GenerateStatement)
    assert isinstance(generate.items[0], vast.IfStatement)


def test_named_and_positional_connections_and_parameter_overrides():
    module = parse(_pre(ACCEPTED["instances"])).description.definitions[1]
    named, positional = _all(module, vast.InstanceList)
    assert [(a.paramname, _int(a.argname)) for a in named.parameterlist] == [("W", 4)]
    assert [(a.paramname, _int(a.argname)) for a in positional.parameterlist] == [(None, 4)]
    assert [p.portname for p in named.instances[0].portlist] == ["a", "y"]
    assert [p.portname for p in positional.instances[0].portlist] == [None, None]


# -- rejected SystemVerilog constructs --------------------------------------------------------
@pytest.mark.parametrize("text, word, line", [
    ("module m;\n  typedef enum {IDLE, RUN} state_t;\nendmodule", "typedef", 2),
    ("module m;\n  struct packed { logic a; } s;\nendmodule", "struct", 2),
    ("interface bus;\nendinterface", "interface", 1),
    ("package digits;\nendpackage", "package", 1),
    ("module m;\n  import digits::*;\nendmodule", "import", 2),
    ("class counter;\nendclass", "class", 1),
    ("module m;\n  bit [3:0] n;\nendmodule", "bit", 2),
    ("module m;\n  function integer f(input integer v);\n    return v + 1;\n"
     "  endfunction\nendmodule", "return", 3),
])
def test_systemverilog_constructs_are_rejected_by_name(text, word, line):
    with pytest.raises(UnsupportedConstruct) as caught:
        parse(_pre(text))
    assert f"`{word}`" in caught.value.message
    assert (caught.value.file, caught.value.line) == ("snippet.v", line)


def test_systemverilog_words_are_still_ordinary_identifiers_in_verilog():
    # Not keywords in 1364-2005 (Annex B, recalled): a net may be called `bit`.
    module = _module("module m(input bit, output y);\n  assign y = bit;\nendmodule")
    assert module.portlist.ports[0].first.name == "bit"


def test_a_net_named_like_a_systemverilog_type_is_not_blamed_for_a_later_error():
    with pytest.raises(BcdproveError) as caught:
        parse(_pre("module m;\n  wire bit;\n  assign = 1;\nendmodule"))
    assert not isinstance(caught.value, UnsupportedConstruct)
    assert caught.value.line == 3 and "'='" in caught.value.message


# -- errors and locations -------------------------------------------------------------------
def test_syntax_error_names_the_token_and_the_original_line(tmp_path):
    header = tmp_path / "cells.vh"
    header.write_text("wire ok;\nassign = ;\n")
    top = tmp_path / "top.v"
    top.write_text('module m;\n`include "cells.vh"\nendmodule\n')
    with pytest.raises(BcdproveError) as caught:
        parse(preprocess([str(top)]))
    assert (caught.value.file, caught.value.line) == (str(header), 2)
    assert "'='" in caught.value.message


def test_unexpected_end_of_input():
    with pytest.raises(BcdproveError) as caught:
        parse(_pre("module m;\n  wire w;\n"))
    assert "end of input" in caught.value.message


def test_illegal_character_is_a_syntax_error_with_line():
    with pytest.raises(BcdproveError) as caught:
        parse(_pre("module m;\n  wire ä;\nendmodule"))
    assert caught.value.line == 2


def test_assignment_pattern_is_named_in_the_error():
    with pytest.raises(BcdproveError) as caught:
        parse(_pre("module m(output [1:0] y);\n  assign y = '{1'b0, 1'b1};\nendmodule"))
    assert caught.value.line == 2 and "assignment pattern" in caught.value.message


def test_location_maps_a_node_to_the_original_file_and_line(tmp_path):
    header = tmp_path / "body.vh"
    header.write_text("\n  assign y = 1'b1;\n")
    top = tmp_path / "top.v"
    top.write_text('module m(output y);\n`include "body.vh"\nendmodule\n')
    pre = preprocess([str(top)])
    assign = _one(parse(pre), vast.Assign)
    assert location(pre, assign) == SourceLocation(str(header), 2)


def test_every_node_has_a_line_of_the_text():
    text = ACCEPTED["always_kinds"] + "\n" + ACCEPTED["indexed_selects"]
    lines = text.count("\n") + 1
    assert all(1 <= node.lineno <= lines for node in _all(parse(_pre(text)), vast.Node))


def test_a_long_expression_chain_parses():
    terms = " + ".join(f"a[{i % 8}]" for i in range(3000))
    tree = parse(_pre(f"module m(input [7:0] a, output [15:0] y);\n  assign y = {terms};\n"
                      "endmodule"))
    assert tree.description.definitions[0].name == "m"


def test_shipped_designs_parse():
    files = sorted((REPOSITORY / "designs").rglob("*.v")) + sorted(
        (REPOSITORY / "designs").rglob("*.sv"))
    for path in files:
        if path.parent.name == "include":
            continue
        include = path.parent / "include"
        pre = preprocess([str(path)], include_dirs=[str(include)] if include.is_dir() else [])
        parse(pre)


# -- parse tables never land in the user's folder ----------------------------------------------
_PARSE_IN_CHILD = """
import sys
from bcdprove.verilog.preprocess import preprocess
from bcdprove.verilog.parser import parse
tree = parse(preprocess(["unit.v"]))
print(tree.description.definitions[0].name)
"""


def _parse_in_fresh_process(folder: Path, cache_home: str, home: str | None = None) -> str:
    (folder / "unit.v").write_text("module unit(input a, output y);\n  assign y = a;\nendmodule\n")
    env = dict(os.environ, XDG_CACHE_HOME=cache_home, PYTHONPATH=str(REPOSITORY))
    if home is not None:
        env["HOME"] = home
    done = subprocess.run([sys.executable, "-c", _PARSE_IN_CHILD], cwd=folder, env=env,
                          capture_output=True, text=True, check=True)
    return done.stdout.strip()


def _package_files() -> set[str]:
    import pyverilog
    folders = [Path(pyverilog.__file__).parent / "vparser", REPOSITORY / "bcdprove" / "verilog"]
    return {str(p) for folder in folders for p in folder.iterdir()}


def test_parsing_writes_nothing_into_the_current_folder(tmp_path):
    work = tmp_path / "work"
    work.mkdir()
    before = _package_files()
    assert _parse_in_fresh_process(work, str(tmp_path / "cache")) == "unit"
    assert sorted(p.name for p in work.iterdir()) == ["unit.v"]
    assert list((tmp_path / "cache" / "bcdprove").rglob("*.pickle"))      # cached per user
    assert _package_files() == before
    # A second run reads the cached tables and still writes nothing here.
    assert _parse_in_fresh_process(work, str(tmp_path / "cache")) == "unit"
    assert sorted(p.name for p in work.iterdir()) == ["unit.v"]


def test_unwritable_cache_falls_back_to_tables_in_memory(tmp_path):
    work = tmp_path / "work"
    work.mkdir()
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("")
    assert _parse_in_fresh_process(work, str(blocker)) == "unit"
    assert sorted(p.name for p in work.iterdir()) == ["unit.v"]


def test_relative_cache_settings_never_write_into_the_current_folder(tmp_path):
    work = tmp_path / "work"
    work.mkdir()
    assert _parse_in_fresh_process(work, "relative-cache", home="relative-home") == "unit"
    assert sorted(p.name for p in work.iterdir()) == ["unit.v"]


# -- damaged input raises only BcdproveError ---------------------------------------------------
_SEED = """`timescale 1ns/1ps
`define DIGITS 3
`define ADD3(v) ((v) > 4 ? (v) + 3 : (v))
// fuel-pump totaliser readout
module pump_readout #(parameter W = 8, localparam D = `DIGITS) (
    input  wire [W-1:0] count,
    output reg  [4*D-1:0] bcd = '0);
  integer i;
  function automatic [3:0] adjust(input [3:0] n);
    adjust = `ADD3(n);
  endfunction
  always @* begin : convert
    bcd = 0;
    for (int i = W - 1; i >= 0; i--) begin
      bcd[3:0] = adjust(bcd[3:0]);
      bcd = {bcd[4*D-2:0], count[i]};
    end
  end : convert
`ifdef CHECK
  initial $display("%b", bcd);
`endif
  genvar g;
  generate for (g = 0; g < D; g = g + 1) begin : digit
    wire [3:0] nibble = bcd[4*g +: 4];
  end endgenerate
endmodule : pump_readout
"""


@st.composite
def _damaged(draw) -> bytes:
    data = bytearray(_SEED.encode())
    for _ in range(draw(st.integers(1, 4))):
        kind = draw(st.sampled_from(["truncate", "splice", "corrupt", "delete"]))
        if not data:
            break
        at = draw(st.integers(0, len(data)))
        if kind == "truncate":
            del data[at:]
        elif kind == "splice":
            start = draw(st.integers(0, len(_SEED)))
            piece = _SEED.encode()[start:start + draw(st.integers(1, 60))]
            data[at:at] = piece
        elif kind == "corrupt":
            for offset in range(draw(st.integers(1, 4))):
                if at + offset < len(data):
                    data[at + offset] = draw(st.integers(0, 255))
        else:
            del data[at:at + draw(st.integers(1, 20))]
    return bytes(data)


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(_damaged())
def test_damaged_files_raise_only_bcdprove_errors(content):
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "damaged.v"
        path.write_bytes(content)
        try:
            parse(preprocess([str(path)]))
        except BcdproveError as error:
            assert error.file is not None
            assert error.line is None or error.line >= 1


def test_each_module_gets_the_default_nettype_in_force_before_it(tmp_path):
    # 1364-2005 clause 19.2: `default_nettype applies to the modules after it.
    path = tmp_path / "nets.v"
    path.write_text("module a; endmodule\n`default_nettype none\nmodule b; endmodule\n"
                    "`resetall\nmodule c; endmodule\n")
    modules = parse(preprocess([str(path)])).description.definitions
    assert [(m.name, m.default_nettype) for m in modules] == [
        ("a", "wire"), ("b", "none"), ("c", "wire")]


def test_endfunction_label():
    function = _one(_module("module m(output [3:0] y);\n  function [3:0] f(input [3:0] a);\n"
                            "    f = a;\n  endfunction : f\n  assign y = f(4'd3);\nendmodule"),
                    vast.Function)
    assert function.name == "f"
    with pytest.raises(BcdproveError):
        _module("module m;\n  function f(input a);\n    f = a;\n  endfunction : g\nendmodule")


def test_function_body_of_several_statements_becomes_one_block():
    # IEEE 1800 allows several statements in a function without begin ... end.
    function = _one(_module("module m(output [3:0] y);\n  function [3:0] f(input [3:0] a);\n"
                            "    f = a;\n    f = f + 1;\n  endfunction\n"
                            "  assign y = f(4'd3);\nendmodule"), vast.Function)
    body = function.statement[-1]
    assert isinstance(body, vast.Block) and len(body.statements) == 2


def test_every_module_item_is_kept_in_source_order():
    # Module items (IEEE 1364-2005 clause 12.1) are collected in one growing list (linear
    # time for netlists of 10**5 items); all 3,000 must be there, in the order written.
    count = 1000
    lines = ["module many (input a, output [999:0] y);"]
    lines += [f"    wire w{i};" for i in range(count)]
    lines += [f"    not g{i} (w{i}, a);" for i in range(count)]
    lines += [f"    assign y[{i}] = w{i};" for i in range(count)]
    module = _module("\n".join(lines + ["endmodule"]))
    kinds = [type(item).__name__ for item in module.items]
    assert kinds == ["Decl"] * count + ["InstanceList"] * count + ["Assign"] * count
    names = [item.list[0].name for item in module.items[:count]]
    assert names == [f"w{i}" for i in range(count)]
    gates = [item.instances[0].name for item in module.items[count:2 * count]]
    assert gates == [f"g{i}" for i in range(count)]

"""Every error a user can act on: message and line (file:line, never a traceback)."""
from __future__ import annotations

import pytest

from bcdprove.errors import BcdproveError, DesignError, UnsupportedConstruct
from tests.verilog.test_elaborate_helpers import elaborate_text


def fails(tmp_path, text: str, kind=BcdproveError, top: str = "dut", **parameters):
    with pytest.raises(kind) as caught:
        elaborate_text(tmp_path, text, top, parameters or None)
    error = caught.value
    assert error.file is not None and error.file.endswith("case.v") or error.line is None
    return error


def test_undeclared_identifier_in_an_expression(tmp_path):
    error = fails(tmp_path, "module dut(input a, output y);\n\nassign y = a & b;\nendmodule\n")
    assert error.message == "undeclared identifier `b`" and error.line == 3


def test_default_nettype_none_forbids_implicit_nets(tmp_path):
    error = fails(tmp_path, "`default_nettype none\nmodule dut(input a, output y);\n"
                            "assign t = a;\nassign y = a;\nendmodule\n")
    assert "undeclared identifier `t`" in error.message and error.line == 3


def test_unknown_top_module_lists_the_modules_found(tmp_path):
    error = fails(tmp_path, "module alpha; endmodule\nmodule beta; endmodule\n", top="gamma")
    assert "unknown top module `gamma`" in error.message and "alpha, beta" in error.message


def test_unknown_module_instantiated(tmp_path):
    error = fails(tmp_path, "module dut(input a, output y);\n  nowhere u (.a(a), .y(y));\n"
                            "endmodule\n")
    assert error.message == "unknown module `nowhere` instantiated" and error.line == 2


def test_unknown_parameter_override_of_an_instance(tmp_path):
    error = fails(tmp_path, "module sub #(parameter W = 1) (input a);\nendmodule\n"
                            "module dut(input a);\n  sub #(.WIDTH(3)) u (.a(a));\nendmodule\n")
    assert "unknown parameter `WIDTH`" in error.message and error.line == 4


def test_same_bit_driven_by_two_assigns(tmp_path):
    error = fails(tmp_path, "module dut(input a, b, output [1:0] y);\nassign y[0] = a;\n"
                            "assign y[1] = b;\nassign y[0] = b;\nendmodule\n", DesignError)
    assert "`y[0]` is driven twice" in error.message and error.line == 4


def test_assign_and_always_driving_one_variable(tmp_path):
    error = fails(tmp_path, "module dut(input a, output reg y);\nalways @* y = a;\n"
                            "assign y = ~a;\nendmodule\n", DesignError)
    assert "`y` is driven twice" in error.message and error.line == 3


def test_two_always_blocks_driving_one_variable(tmp_path):
    error = fails(tmp_path, "module dut(input a, output reg y);\nalways @* y = a;\n"
                            "always @* y = ~a;\nendmodule\n", DesignError)
    assert "driven twice" in error.message and error.line == 3


def test_combinational_loop_names_the_signals(tmp_path):
    error = fails(tmp_path, "module dut(input a, output y);\nwire p, q;\nassign p = q & a;\n"
                            "assign q = p | a;\nassign y = p;\nendmodule\n", DesignError)
    assert error.message.startswith("combinational loop:")
    assert "`p`" in error.message and "`q`" in error.message


def test_unsupported_construct_is_named(tmp_path):
    error = fails(tmp_path, "module dut(input a, output reg y);\nalways @* begin\n"
                            "  y = a;\n  fork y = ~a; join\nend\nendmodule\n",
                  UnsupportedConstruct)
    assert error.message == "unsupported construct `fork`" and error.line == 4


def test_disable_is_unsupported(tmp_path):
    error = fails(tmp_path, "module dut(input a, output reg y);\nalways @* begin : b\n"
                            "  y = a;\n  disable b;\nend\nendmodule\n", UnsupportedConstruct)
    assert "`disable`" in error.message and error.line == 4


def test_select_out_of_the_declared_range_in_a_constant_context(tmp_path):
    error = fails(tmp_path, "module dut(input [3:0] a, output [3:0] y);\n"
                            "localparam [3:0] P = 4'b1010;\nlocalparam Q = P[6:5];\n"
                            "assign y = Q;\nendmodule\n")
    assert "outside the declared range" in error.message and error.line == 3


def test_assignment_target_outside_the_declared_range(tmp_path):
    error = fails(tmp_path, "module dut(input a, output [3:0] y);\nassign y[5] = a;\n"
                            "endmodule\n")
    assert "outside the declared range" in error.message and error.line == 2


def test_recursive_module_instantiation(tmp_path):
    error = fails(tmp_path, "module dut(input a, output y);\n  dut u (.a(a), .y(y));\n"
                            "endmodule\n")
    assert "instantiates itself" in error.message and error.line == 2


def test_errors_point_at_the_original_file_and_line(tmp_path):
    # the message prints as file:line: message (errors.py contract)
    error = fails(tmp_path, "module dut(input a, output y);\nassign y = nope;\nendmodule\n")
    assert str(error).endswith("case.v:2: undeclared identifier `nope`")

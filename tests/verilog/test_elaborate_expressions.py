"""Expressions: widths (IEEE 1364-2005 clause 5.4), signedness (5.5), operators (5.1), literals (3.5).

Clause numbers are cited from memory of IEEE 1364-2005; expected values come from Python
reference code or were printed by Icarus Verilog 11, as noted beside each check.
"""
from __future__ import annotations

import pytest

from tests.verilog.test_elaborate_helpers import elaborate_text, outputs


def one(tmp_path, ports: str, body: str, **inputs: int) -> dict[str, int]:
    model = elaborate_text(tmp_path, f"module dut({ports});\n{body}\nendmodule\n")
    return outputs(model, **inputs)


def test_addition_in_a_wider_context_keeps_the_carry(tmp_path):
    # clause 5.4.2: a + b assigned to 9 bits is computed in 9 bits; Python int reference
    got = one(tmp_path, "input [7:0] a, b, output [8:0] y", "assign y = a + b;", a=200, b=100)
    assert got["y"] == 300


def test_addition_inside_concatenation_is_self_determined(tmp_path):
    # clause 5.4.1 Table 5-22: concatenation operands are self-determined, so the carry is lost
    got = one(tmp_path, "input [7:0] a, b, output [9:0] y", "assign y = {1'b1, a + b};",
              a=200, b=100)
    assert got["y"] == (1 << 8) | ((200 + 100) % 256)


def test_comparison_operands_are_sized_to_each_other_not_to_the_target(tmp_path):
    # clause 5.4.1: a + b < a compares at 8 bits (the wrap is visible); the 1-bit result
    # zero-extends to y
    got = one(tmp_path, "input [7:0] a, b, output [7:0] y", "assign y = (a + b) < a;",
              a=200, b=100)
    assert got["y"] == 1


def test_mixed_signed_and_unsigned_operands_are_unsigned(tmp_path):
    # clause 5.5.1: an expression is signed only if every operand is; -1 as 4 bits is 15
    got = one(tmp_path, "input signed [3:0] s, input [3:0] u, output y",
              "assign y = s < u;", s=0b1111, u=1)
    assert got["y"] == 0          # 15 < 1 is false when compared unsigned


def test_signed_comparison_when_both_operands_are_signed(tmp_path):
    # clause 5.5.1: both signed, so -1 < 1
    got = one(tmp_path, "input signed [3:0] s, t, output y", "assign y = s < t;", s=0b1111, t=1)
    assert got["y"] == 1


def test_signed_operand_is_sign_extended_only_in_a_signed_expression(tmp_path):
    # clause 5.5.2: s + 8'sd0 is signed, so s is sign-extended; s + 8'd0 is unsigned: zero-extended
    got = one(tmp_path, "input signed [3:0] s, output [7:0] y, z",
              "assign y = s + 8'sd0;\nassign z = s + 8'd0;", s=0b1110)
    assert got["y"] == (-2) & 0xFF and got["z"] == 0b1110


def test_unsized_decimal_literal_is_32_bit_signed(tmp_path):
    # clause 3.5.1: 5 is a 32-bit signed integer, so s - 5 with a signed s stays signed
    got = one(tmp_path, "input signed [3:0] s, output [7:0] y", "assign y = s - 5;", s=0b1111)
    assert got["y"] == (-1 - 5) & 0xFF


def test_dollar_signed_and_unsigned(tmp_path):
    # clause 17.8 ($signed/$unsigned) with clause 5.5.2 extension rules
    got = one(tmp_path, "input [3:0] u, output [7:0] y, z",
              "assign y = $signed(u) + 8'sd0;\nassign z = $unsigned($signed(u)) + 8'sd0;",
              u=0b1000)
    assert got["y"] == (-8) & 0xFF and got["z"] == 8


def test_signed_division_truncates_toward_zero_and_modulo_takes_dividend_sign(tmp_path):
    # clause 5.1.5: -7 / 2 = -3, -7 % 2 = -1 (Python: int(-7 / 2) and math.fmod(-7, 2))
    got = one(tmp_path, "input signed [7:0] a, b, output signed [7:0] q, r",
              "assign q = a / b;\nassign r = a % b;", a=(-7) & 0xFF, b=2)
    assert got["q"] == (-3) & 0xFF and got["r"] == (-1) & 0xFF


def test_division_by_zero_is_unknown(tmp_path):
    # clause 5.1.5: division or modulus by zero yields x, a free value here (not 0, not all ones)
    model = elaborate_text(tmp_path, "module dut(input [3:0] a, b, output [3:0] q);\n"
                                     "assign q = a / b;\nendmodule\n")
    assert outputs(model, free=5, a=9, b=0)["q"] == 5
    assert outputs(model, free=5, a=9, b=2)["q"] == 4


@pytest.mark.parametrize("base, exponent, expected", [
    # clause 5.1.5 Table 5-6 (recalled from the standard; checked in Icarus 11 by hand)
    (-3, 3, -27), (2, -1, 0), (-1, -3, -1), (-1, -2, 1), (1, -5, 1), (3, 0, 1), (-2, -1, 0),
])
def test_power_of_signed_operands(tmp_path, base, exponent, expected):
    got = one(tmp_path, "input signed [7:0] a, input signed [3:0] e, output [7:0] y",
              "assign y = a ** e;", a=base & 0xFF, e=exponent & 0xF)
    assert got["y"] == expected & 0xFF


def test_zero_to_a_negative_power_is_unknown(tmp_path):
    # clause 5.1.5 Table 5-6: 0 ** negative is x
    model = elaborate_text(tmp_path, "module dut(input signed [7:0] a, input signed [3:0] e, "
                                     "output [7:0] y);\nassign y = a ** e;\nendmodule\n")
    assert outputs(model, free=77, a=0, e=0xF)["y"] == 77
    assert outputs(model, free=77, a=0, e=2)["y"] == 0


def test_power_with_constant_operands_and_unsigned_exponent(tmp_path):
    # clause 5.1.5; Python reference 3 ** 5 mod 2**8
    got = one(tmp_path, "input [7:0] a, output [7:0] y", "assign y = a ** 3'd5;", a=3)
    assert got["y"] == 3 ** 5 % 256


@pytest.mark.parametrize("expr, a, expected", [
    # clause 5.1.12; Python reference: shifts on ints with 8-bit masks
    ("a << 3", 0b10110001, (0b10110001 << 3) & 0xFF),
    ("a >> 3", 0b10110001, 0b10110001 >> 3),
    ("a <<< 2", 0b10110001, (0b10110001 << 2) & 0xFF),
    ("$signed(a) >>> 2", 0b10110001, ((0b10110001 - 256) >> 2) & 0xFF),
    ("a >>> 2", 0b10110001, 0b10110001 >> 2),            # unsigned: logical
    ("a >> 9", 0xFF, 0),
])
def test_shifts(tmp_path, expr, a, expected):
    got = one(tmp_path, "input [7:0] a, output [7:0] y", f"assign y = {expr};", a=a)
    assert got["y"] == expected


_A = 0b1011
_PARITY = bin(_A).count("1") % 2


@pytest.mark.parametrize("expr, expected", [
    # clause 5.1.11 reductions and 5.1.9 logical operators on 4'b1011; Python reference
    ("&a", int(_A == 0xF)), ("~&a", int(_A != 0xF)), ("|a", int(_A != 0)),
    ("~|a", int(_A == 0)), ("^a", _PARITY), ("~^a", 1 - _PARITY), ("!a", int(not _A)),
    ("a && 0", int(bool(_A) and False)), ("a || 0", int(bool(_A) or False)),
    ("~a", ~_A & 0xF), ("a ~^ 4'b1111", ~(_A ^ 0xF) & 0xF), ("a ^~ 4'b0", ~(_A ^ 0) & 0xF),
])
def test_reductions_and_logical_operators(tmp_path, expr, expected):
    got = one(tmp_path, "input [3:0] a, output [3:0] y", f"assign y = {expr};", a=0b1011)
    assert got["y"] == expected


def test_replication_and_zero_replication_inside_concatenation(tmp_path):
    # clause 5.1.14: {0{a}} has no width inside a concatenation with other operands
    got = one(tmp_path, "input [1:0] a, output [7:0] y, z",
              "assign y = {3{a}};\nassign z = {{0{a}}, a};", a=0b10)
    assert got["y"] == 0b101010 and got["z"] == 0b10


@pytest.mark.parametrize("decl, expr, value, expected", [
    # clause 5.2.1 selects, with declared ranges in either direction and negative indices;
    # the values were printed by Icarus 11 for the same declarations
    ("[7:0]", "v[6:3]", 0b11010110, 0b1010),
    ("[0:7]", "v[3:6]", 0b11010110, 0b1011),           # v[3] is model bit 4
    ("[3:-4]", "v[0:-3]", 0b11010110, 0b1011),
    ("[7:0]", "v[2 +: 4]", 0b11010110, 0b0101),
    ("[7:0]", "v[5 -: 4]", 0b11010110, 0b0101),
    ("[0:7]", "v[2 +: 4]", 0b11010110, 0b0101),        # v[2:5]: model bits 5..2
    ("[7:0]", "v[3]", 0b00001000, 1),
])
def test_constant_selects(tmp_path, decl, expr, value, expected):
    got = one(tmp_path, f"input {decl} v, output [7:0] y", f"assign y = {expr};", v=value)
    assert got["y"] == expected


def test_variable_bit_select_and_out_of_range_read(tmp_path):
    # clause 5.2.1: a variable index selects that bit; outside the range it reads x (free)
    model = elaborate_text(tmp_path, "module dut(input [7:0] v, input [3:0] i, output y, "
                                     "output [3:0] p);\nassign y = v[i];\n"
                                     "assign p = v[i +: 4];\nendmodule\n")
    assert outputs(model, free=1, v=0b00100000, i=5)["y"] == 1
    assert outputs(model, free=0, v=0b00100000, i=4)["y"] == 0
    assert outputs(model, free=1, v=0, i=9)["y"] == 1          # x
    assert outputs(model, free=0, v=0xA5, i=2)["p"] == (0xA5 >> 2) & 0xF
    assert outputs(model, free=15, v=0, i=5)["p"] == 15        # bits 8 and up do not exist


def test_literal_with_x_and_z_bits_has_free_bits(tmp_path):
    # clause 3.5.1: 4'b1x0z has unknown bits 2 and 0; the known ones are kept
    model = elaborate_text(tmp_path, "module dut(output [3:0] y);\nassign y = 4'b1x0z;\n"
                                     "endmodule\n")
    assert outputs(model, free=0)["y"] == 0b1000
    assert outputs(model, free=1)["y"] == 0b1101


def test_literal_leftmost_x_extends(tmp_path):
    # clause 3.5.1: 8'bx0 extends x to the left, so only bit 0 is known
    model = elaborate_text(tmp_path, "module dut(output [7:0] y);\nassign y = 8'bx0;\n"
                                     "endmodule\n")
    assert outputs(model, free=-1)["y"] == 0b11111110
    assert outputs(model, free=0)["y"] == 0


def test_fill_literals_take_the_context_width(tmp_path):
    # IEEE 1800 clause 5.7.1 (SystemVerilog fill literals)
    got = one(tmp_path, "output [11:0] y, z", "assign y = '1;\nassign z = '0;")
    assert got["y"] == 0xFFF and got["z"] == 0


def test_conditional_with_unknown_condition_merges_bitwise(tmp_path):
    # clause 5.1.13: equal bits stay known, differing bits become x
    model = elaborate_text(tmp_path, "module dut(output [3:0] y);\n"
                                     "assign y = 1'bx ? 4'b1100 : 4'b1010;\nendmodule\n")
    assert outputs(model, free=0)["y"] == 0b1000
    assert outputs(model, free=0xF)["y"] == 0b1110


def test_conditional_arms_are_context_determined(tmp_path):
    # clause 5.4.1: ?: arms are extended to the context, so the carry of a + b survives
    got = one(tmp_path, "input [7:0] a, b, input c, output [8:0] y",
              "assign y = c ? a + b : 9'd0;", a=255, b=1, c=1)
    assert got["y"] == 256


def test_real_constant_functions_size_a_parameter(tmp_path):
    # clause 17.11.2 $log10 / $ceil; clause 4.8.2 real to integer; Python math reference:
    # ceil(20 * log10(2)) = 7
    got = one(tmp_path, "output [31:0] y",
              "localparam D = $ceil(20 * $log10(2));\nassign y = D;")
    assert got["y"] == 7


def test_real_to_integer_rounds_half_away_from_zero(tmp_path):
    # clause 4.8.2: 2.5 -> 3, -2.5 -> -3
    got = one(tmp_path, "output [7:0] y, z", "localparam R = 2.5;\nlocalparam integer N = -R;\n"
              "assign y = R;\nassign z = N;")
    assert got["y"] == 3 and got["z"] == (-3) & 0xFF


def test_clog2(tmp_path):
    # clause 17.11.1; Python reference (n - 1).bit_length()
    got = one(tmp_path, "output [7:0] a, b, c, d",
              "assign a = $clog2(0);\nassign b = $clog2(1);\nassign c = $clog2(16);\n"
              "assign d = $clog2(17);")
    assert (got["a"], got["b"], got["c"], got["d"]) == (0, 0, 4, 5)


def test_assignment_truncates_a_wider_right_side(tmp_path):
    # clause 9.2.1 / 5.4: the right side is evaluated at its own larger width, then truncated
    got = one(tmp_path, "input [7:0] a, output [3:0] y", "assign y = a + 8'd1;", a=0x1F)
    assert got["y"] == 0x0


def test_concatenation_on_the_left(tmp_path):
    # clause 6.1.2: {c, s} = a + b splits the 5-bit sum
    got = one(tmp_path, "input [3:0] a, b, output c, output [3:0] s",
              "assign {c, s} = a + b;", a=9, b=8)
    assert got["c"] == 1 and got["s"] == 1


def test_string_literal_is_eight_bits_per_character(tmp_path):
    # clause 3.6: "AB" is 16 bits, 0x4142 (Python: int.from_bytes(b"AB", "big"))
    got = one(tmp_path, "output [15:0] y", 'assign y = "AB";')
    assert got["y"] == int.from_bytes(b"AB", "big")


def test_case_equality_with_an_x_literal_is_false_for_a_signal(tmp_path):
    # clause 5.1.8: === compares x bits literally, so a two-valued signal never matches 4'bx
    got = one(tmp_path, "input [3:0] a, output y, z", "assign y = a === 4'bx;\n"
              "assign z = a !== 4'b10x1;", a=0b1011)
    assert got["y"] == 0 and got["z"] == 1

"""Every disagreement the differential campaign found, minimised, with Icarus's value.

Each entry is a module (ports in ANSI form, ranges written out), one input vector and the
bits Icarus Verilog 11 prints for each output (most significant first), cross-checked with
the IEEE 1364-2005 clause named (where Icarus itself is wrong, ``icarus_prints`` records what
it prints and the expected bits come from the clause and Python's int).  ``reader_bug`` names the defect while it is open: the test
of that entry is then an expected failure (strict, so a fix shows up as an unexpected pass,
and the mark must be removed), and the campaigns leave the construct out (``avoid``) so
they keep testing everything else.
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Optional

from .generator import Case, Port


@dataclass(frozen=True)
class Regression:
    name: str
    text: str                       # one module named ``top``
    vector: dict
    expected: dict                  # output name -> Icarus's bits
    source: str                     # where the expected value comes from, besides Icarus
    reader_bug: Optional[str] = None
    avoid: tuple = ()               # generator construct tags that reach this bug
    # Icarus 11 itself deviates from the standard here: ``expected`` then comes from the
    # named source (Python's int as reference code), and ``icarus_prints`` records Icarus
    icarus_prints: Optional[dict] = None
    # the reader follows Icarus rather than the clause here (a decision for the project,
    # kept visible as an expected failure of the model test)
    reader_follows_icarus: Optional[str] = None
    fixed: Optional[str] = None     # the commit that fixed the reader bug this entry found

    def case(self) -> Case:
        """The entry as a generated-style case (so the harness can run it)."""
        inputs, outputs = [], []
        top_text = self.text[self.text.rfind("module "):]
        for direction, signed, msb, lsb, name in _PORT.findall(top_text):
            port = Port(name, abs(int(msb) - int(lsb)) + 1, bool(signed), int(msb), int(lsb))
            (inputs if direction == "input" else outputs).append(port)
        top = re.match(r"module\s+(\w+)", top_text).group(1)
        return Case(top, self.text, (), tuple(inputs), tuple(outputs), f"regression:{self.name}")


_PORT = re.compile(r"(input|output)( signed)?\s*\[(-?\d+):(-?\d+)\]\s*(\w+)")


REGRESSIONS = [
    Regression(
        "unary_reduction_xnor_caret_tilde",
        "module reg_xnor1(input [3:0] a, output [0:0] y, output [0:0] z);\n"
        "  assign y = ^~a;\n"
        "  assign z = ~^a;\n"
        "endmodule\n",
        {"a": 0b0011},
        {"y": "1", "z": "1"},
        "IEEE 1364-2005 clause 5.1.11 and table 5-19: ^~ and ~^ are both reduction XNOR; "
        "two 1 bits give 1",
        fixed="204e4c6",
    ),
    Regression(
        "unary_reduction_xnor_of_parameter",
        "module reg_xnor2(input [0:0] a, output [3:0] y);\n"
        "  localparam P = 7;\n"
        "  assign y = (^~P) ^ a;\n"
        "endmodule\n",
        {"a": 0},
        {"y": "0000"},
        "IEEE 1364-2005 clause 5.1.11: reduction XNOR of 32-bit 7 (three 1 bits) is 0",
        fixed="204e4c6",
    ),
    Regression(
        "shift_amount_holding_a_division",
        "module reg_shiftdiv(input [3:0] a, input [3:0] b, input [3:0] c, output [3:0] y);\n"
        "  assign y = a << (b / c);\n"
        "endmodule\n",
        {"a": 3, "b": 2, "c": 1},
        {"y": "1100"},
        "IEEE 1364-2005 clause 5.1.12: 3 << (2 / 1) = 12; the divisor is not zero, so "
        "nothing is x (clause 5.1.5)",
        fixed="043eccf",
    ),
    Regression(
        "shift_amount_holding_a_guarded_modulus",
        "module reg_shiftmod(input [3:0] a, input [3:0] b, input [3:0] c, output [3:0] y);\n"
        "  assign y = a << (b % (c | 1'b1));\n"
        "endmodule\n",
        {"a": 3, "b": 2, "c": 2},
        {"y": "1100"},
        "IEEE 1364-2005 clause 5.1.12: 3 << (2 % 3) = 12; an odd divisor is never zero",
        fixed="043eccf",
    ),
    Regression(
        "bit_select_index_holding_a_division",
        "module reg_seldiv(input [3:0] a, input [3:0] b, input [3:0] c, output [0:0] y);\n"
        "  assign y = a[b / c];\n"
        "endmodule\n",
        {"a": 3, "b": 2, "c": 3},
        {"y": "1"},
        "IEEE 1364-2005 clause 5.2.1: a[2 / 3] is a[0] = 1 (in range, divisor not zero)",
        fixed="043eccf",
    ),
    Regression(
        "shift_amount_holding_a_variable_select",
        "module reg_shiftsel(input [2:0] a, input [7:0] b, output [3:0] y);\n"
        "  assign y = 4'd3 << b[a];\n"
        "endmodule\n",
        {"a": 0, "b": 1},
        {"y": "0110"},
        "IEEE 1364-2005 clause 5.1.12: 3 << b[0] = 3 << 1 = 6; a 3-bit index is always "
        "inside [7:0]",
        fixed="043eccf",
    ),
    Regression(
        "select_index_holding_a_variable_select",
        "module reg_selsel(input [2:0] a, input [7:0] b, input [1:0] c, output [0:0] y);\n"
        "  assign y = c[b[a]];\n"
        "endmodule\n",
        {"a": 0, "b": 1, "c": 2},
        {"y": "1"},
        "IEEE 1364-2005 clause 5.2.1: c[b[0]] = c[1] = 1",
        fixed="043eccf",
    ),
    Regression(
        "conditional_on_a_variable_select",
        "module reg_condsel(input [2:0] a, input [7:0] b, output [3:0] y);\n"
        "  assign y = b[a] ? 4'd0 : 4'b0111;\n"
        "endmodule\n",
        {"a": 0, "b": 0},
        {"y": "0111"},
        "IEEE 1364-2005 clause 5.1.13: the condition b[0] is a known 0, so the result is "
        "the third operand (the x merge applies only to an x condition); a 3-bit index is "
        "always inside [7:0]",
        fixed="043eccf",
    ),
    Regression(
        "conditional_on_a_guarded_quotient",
        "module reg_conddiv(input [3:0] a, input [3:0] b, output [3:0] y);\n"
        "  assign y = (a / (b | 1'b1)) ? 4'd0 : 4'b0111;\n"
        "endmodule\n",
        {"a": 0, "b": 0},
        {"y": "0111"},
        "IEEE 1364-2005 clause 5.1.13: 0 / 1 is a known 0, so the result is the third operand",
        fixed="043eccf",
    ),
    Regression(
        "wide_all_ones_divided_by_one",
        "module reg_widediv(input [64:0] a, input [1:0] b, output [31:0] y);\n"
        "  assign y = a / b;\n"
        "endmodule\n",
        {"a": (1 << 65) - 1, "b": 1},
        {"y": format(((1 << 65) - 1) // 1 & 0xFFFFFFFF, "032b")},   # Python int: 2**65-1 // 1
        "IEEE 1364-2005 clause 5.1.5 (integer division); Python's int as reference code",
        icarus_prints={"y": "0" * 32},
    ),
    Regression(
        "one_to_a_negative_power_in_a_wide_context",
        "module reg_pow(input [1:0] e, output [32:0] y);\n"
        "  assign y = 1'b1 ** $signed(e);\n"
        "endmodule\n",
        {"e": 3},
        {"y": "0" * 32 + "1"},
        "IEEE 1364-2005 clause 5.1.5 table 5-6: op1 == 1 gives 1 whatever op2 (here -1)",
        icarus_prints={"y": "0" * 33},
    ),
    Regression(
        "signed_exponent_of_an_unsigned_base",
        "module reg_powsign(input [1:0] e, output [1:0] y);\n"
        "  assign y = 2'b11 ** $signed(e);\n"
        "endmodule\n",
        {"e": 3},
        {"y": "00"},
        "IEEE 1364-2005 clause 5.1.5 table 5-6: op1 = 3 (> 1) and op2 = $signed(2'b11) = -1 "
        "(the exponent is self-determined, table 5-22) give 0; Icarus reads the exponent "
        "as 3 here and gives 3 ** 3 = 27, low bits 11",
        icarus_prints={"y": "11"},
    ),
    Regression(
        "unsized_constant_shifted_out",
        "module reg_lossless(input [64:0] a, output [64:0] y);\n"
        "  assign y = a + (7 % ((2147483647 <<< 8'd225) | 2'b10));\n"
        "endmodule\n",
        {"a": 0},
        {"y": format(0 + 7 % ((((2147483647 << 225) & ((1 << 65) - 1)) | 2)), "065b")},
        "IEEE 1364-2005 clauses 5.4.1 and 5.1.12: the shift is 65 bits wide (context), so "
        "every bit of 2147483647 is shifted out and 7 % 2 = 1 (Python's int as reference "
        "code); Icarus evaluates the unsized constant without loss and gives 7 % (huge) = 7",
        icarus_prints={"y": format(7, "065b")},
    ),
    Regression(
        "unsigned_cast_on_a_port_connection",
        "module reg_portcast_sub(input [5:0] x, output [5:0] q);\n"
        "  assign q = x;\n"
        "endmodule\n"
        "module reg_portcast(input signed [3:0] a, output [5:0] y);\n"
        "  reg_portcast_sub u (.x($unsigned(a)), .q(y));\n"
        "endmodule\n",
        {"a": 0b1111},
        {"y": "001111"},
        "IEEE 1364-2005 clause 5.5.3: $unsigned(a) is unsigned, so it is zero-extended to "
        "the 6-bit port (clause 12.3.11: as in an assignment); Icarus sign-extends",
        icarus_prints={"y": "111111"},
    ),
    Regression(
        "genvar_in_a_product",
        "module reg_genvar(input [61:0] a, output [2:0] y);\n"
        "  genvar g;\n"
        "  generate\n"
        "    for (g = 0; g < 3; g = g + 1) begin : slot\n"
        "      assign y[g] = (a * g) >> 62;\n"
        "    end\n"
        "  endgenerate\n"
        "endmodule\n",
        {"a": (1 << 62) - 1},
        {"y": "".join(str((((1 << 62) - 1) * g & ((1 << 62) - 1)) >> 62) for g in (2, 1, 0))},
        "IEEE 1364-2005 clause 5.4.1: the product is as wide as its widest operand, 62 bits "
        "(a genvar is read as an integer, clause 12.4.1 as recalled from memory), so nothing "
        "is left above bit 61 (Python's int as reference code); Icarus widens the product "
        "for the genvar without loss and gives 1 for g = 2",
        icarus_prints={"y": "100"},
    ),
    Regression(
        "shift_amount_selected_from_a_one_bit_signed_vector",
        "module reg_onebit(input signed [0:0] s, input [7:0] a, output [7:0] y);\n"
        "  reg [7:0] r;\n"
        "  always @* r = a >> s[0];\n"
        "  assign y = r;\n"
        "endmodule\n",
        {"s": 1, "a": 0xFF},
        {"y": format(0xFF >> 1, "08b")},
        "IEEE 1364-2005 clause 5.5.1: a bit-select is unsigned, so s[0] = 1 and "
        "8'hff >> 1 = 8'h7f (clause 5.1.12; Python's int as reference code); Icarus "
        "shifts everything out",
        icarus_prints={"y": "00000000"},
    ),
    Regression(
        "shift_amount_selected_whole_from_a_signed_vector",
        "module reg_wholesel(input signed [1:0] s, input [7:0] a, output [7:0] y);\n"
        "  reg [7:0] r;\n"
        "  always @* r = a >>> s[1:0];\n"
        "  assign y = r;\n"
        "endmodule\n",
        {"s": 3, "a": 0xFF},
        {"y": format(0xFF >> 3, "08b")},
        "IEEE 1364-2005 clauses 5.5.1 and 5.1.12: a part-select is unsigned and an amount is "
        "read unsigned, so 8'hff >>> 3 = 8'h1f (a is unsigned: a logical shift; Python's int "
        "as reference code); Icarus shifts everything out",
        icarus_prints={"y": "00000000"},
    ),
    Regression(
        "port_expression_sized_by_the_port",
        "module reg_portctx_sub(input [7:0] x, output [7:0] q);\n"
        "  assign q = x;\n"
        "endmodule\n"
        "module reg_portctx(input [0:0] a, output [7:0] y);\n"
        "  reg_portctx_sub u (.x(~a), .q(y));\n"
        "endmodule\n",
        {"a": 0},
        {"y": "11111111"},
        "IEEE 1364-2005 clause 12.3.11: an expression on a port is sized and evaluated as "
        "in an assignment, so ~a is taken at the port's 8 bits (clause 5.4.2)",
        icarus_prints={"y": "00000001"},
    ),
]


def avoided_constructs() -> frozenset:
    """Generator tags of every construct that reaches an open reader bug."""
    return frozenset(tag for r in REGRESSIONS if r.reader_bug for tag in r.avoid)

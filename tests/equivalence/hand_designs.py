"""Small Verilog pairs written for the equivalence tests, each with the source of its verdict."""
from __future__ import annotations

from pathlib import Path


def write(tmp_path: Path, name: str, text: str) -> str:
    path = tmp_path / name
    path.write_text(text)
    return str(path)


# IEEE 1364-2005 clause 5.1.5: + is addition modulo 2**width, commutative.
SUM_AB = """module sum_ab(input [7:0] a, input [7:0] b, output [7:0] y);
  assign y = a + b;
endmodule
"""
SUM_BA = """module sum_ba(input [7:0] a, input [7:0] b, output [7:0] y);
  assign y = b + a;
endmodule
"""
# Clause 5.1.5 (multiplication modulo 2**width) and 5.1.12 (a left shift by k multiplies by
# 2**k, bits shifted out are lost): x*10 == (x<<3) + (x<<1) for every 12-bit x.
TIMES_TEN = """module times_ten(input [11:0] x, output [11:0] y);
  assign y = x * 12'd10;
endmodule
"""
SHIFT_ADD_TEN = """module shift_add_ten(input [11:0] x, output [11:0] y);
  assign y = (x << 3) + (x << 1);
endmodule
"""
# (x<<3) + x is 9*x: differs from 10*x wherever x is odd (low bit: 10x is even, 9x is odd).
SHIFT_ADD_NINE = """module shift_add_nine(input [11:0] x, output [11:0] y);
  assign y = (x << 3) + x;
endmodule
"""
# Clause 5.1.13: `sel ? a : 4'bx` is x when sel is 0.
X_WHEN_OFF = """module x_when_off(input sel, input [3:0] a, output [3:0] y);
  assign y = sel ? a : 4'bx;
endmodule
"""
ZERO_WHEN_OFF = """module zero_when_off(input sel, input [3:0] a, output [3:0] y);
  assign y = sel ? a : 4'b0;
endmodule
"""
# Clause 5.1.10 (bitwise and with 0 is 0 whatever the other bit, x included).
X_MASKED = """module x_masked(input sel, input [3:0] a, output [3:0] y);
  assign y = sel ? a : (4'bx & 4'b0);
endmodule
"""
# Two designs that each define a module `cell`, doing different things.
CELL_PLUS_ONE = """module cell(input [3:0] a, output [3:0] y);
  assign y = a + 4'd1;
endmodule
module top_plus(input [3:0] a, output [3:0] y);
  cell c(.a(a), .y(y));
endmodule
"""
CELL_ONE_PLUS = """module cell(input [3:0] a, output [3:0] y);
  assign y = 4'd1 + a;
endmodule
module top_plus(input [3:0] a, output [3:0] y);
  cell c(.a(a), .y(y));
endmodule
"""
CELL_PLUS_TWO = """module cell(input [3:0] a, output [3:0] y);
  assign y = a + 4'd2;
endmodule
module top_plus(input [3:0] a, output [3:0] y);
  cell c(.a(a), .y(y));
endmodule
"""
# Same function as SUM_AB with other port names.
SUM_RENAMED = """module sum_renamed(input [7:0] left, input [7:0] right, output [7:0] total);
  assign total = right + left;
endmodule
"""
NARROW_SUM = """module narrow_sum(input [7:0] a, input [7:0] b, output [6:0] y);
  assign y = a + b;
endmodule
"""
SUM_WITH_CARRY = """module sum_with_carry(input [7:0] a, input [7:0] b, output [7:0] y, output c);
  assign {c, y} = a + b;
endmodule
"""

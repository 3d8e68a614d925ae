"""What the reader reuses while elaborating wide designs must not show in the model.

Constant expressions and constant function calls are evaluated once per value of what they
read, a net's drivers are found by bisection, repeated modules are stamped from one template,
and the cycle collector is handed the result.  These tests check that the values, names,
errors and the collector's state come out as the standard and Python say.  Clause numbers
are cited from memory of IEEE 1364-2005; expected values come from Python reference code.
"""
from __future__ import annotations

import gc

import pytest

from bcdprove.errors import DesignError
from tests.verilog.test_elaborate_helpers import elaborate_text, outputs, signal

REVERSER = """module dut(input [7:0] x, output [7:0] y, output [3:0] n);
  function [7:0] spread(input [7:0] v);
    integer k;
    begin
      spread = 0;
      for (k = 0; k < 8; k = k + 1) spread[k] = v[7 - k];
    end
  endfunction
  genvar s;
  for (s = 0; s < 4; s = s + 1) begin : lane
    if (spread(8'd1 << s) == (8'h80 >> s)) begin : kept
      assign n[s] = x[s];
    end else begin : dropped
      assign n[s] = 1'b0;
    end
  end
  for (s = 0; s < 4; s = s + 1) begin : again
    if (spread(8'd1) != 8'h80) begin : never
      assign y[s] = 1'b1;
    end
  end
  assign y = spread(x);
endmodule
"""


def _reversed_byte(value: int) -> int:
    return int(f"{value:08b}"[::-1], 2)     # Python reference: the bits in reverse order


def test_repeated_constant_function_calls_keep_values_and_later_call_names(tmp_path):
    # Clause 10.4.5: a constant function call is evaluated at elaboration; each of the 4 + 4
    # generate conditions calls `spread` once (the last four with the same argument), so the
    # call in the continuous assignment is the ninth: its loop probes are named `spread#9`.
    model = elaborate_text(tmp_path, REVERSER)
    for x in (0x00, 0x01, 0x5A, 0xF0):
        assert outputs(model, x=x) == {"y": _reversed_byte(x), "n": x & 0xF}
    assert signal(model, "spread#9.spread@k=0", x=0x01) == 0      # bit 0 takes v[7] = 0
    assert signal(model, "spread#9.spread@k=7", x=0x01) == 0x80   # all eight bits placed
    assert not any(name.startswith("spread#10.") for name in model.signals)
    assert not any(".never" in name for name in model.signals)


def test_procedural_loop_counters_index_as_before(tmp_path):
    # Clause 9.6 (for loop) and 5.2.1 (indexed part-select): the counter's value selects
    # the digit; Python's int gives the reference sums.
    model = elaborate_text(tmp_path, """module dut(input [15:0] x, output reg [5:0] sum);
  integer k;
  always @* begin
    sum = 0;
    for (k = 0; k < 4; k = k + 1)
      sum = sum + x[4*k +: 4] + (k == 2 ? 1 : 0);
  end
endmodule
""")
    for x in (0x0000, 0x1234, 0xFFFF, 0x9A0C):
        expected = sum((x >> (4 * k)) & 0xF for k in range(4)) + 1
        assert outputs(model, x=x)["sum"] == expected


def test_bit_by_bit_drivers_read_back_in_order(tmp_path):
    # Clause 12.4.1: every iteration drives its own bit of `c`; Python's int is the reference
    # (the carry chain of an incrementer).
    model = elaborate_text(tmp_path, """module dut(input [7:0] a, output [7:0] y);
  wire [8:0] c;
  assign c[0] = 1'b1;
  genvar j;
  for (j = 0; j < 8; j = j + 1) begin : bit_
    assign y[j] = a[j] ^ c[j];
    assign c[j+1] = a[j] & c[j];
  end
endmodule
""")
    for a in (0x00, 0x7F, 0xFF, 0x3C):
        assert outputs(model, a=a)["y"] == (a + 1) & 0xFF


def test_overlapping_driver_in_a_generate_array_names_the_first_one(tmp_path):
    # The reader's rule (DEVELOPERS.md, "driven twice"): one bit, two continuous drivers is
    # an error naming the first driver; here the loop at line 4 drove c[5] first.
    path_text = """module dut(input [7:0] a, output [7:0] y);
  wire [7:0] c;
  genvar j;
  for (j = 0; j < 8; j = j + 1) begin : bit_ assign c[j] = a[j]; end
  assign c[5] = 1'b0;
  assign y = c;
endmodule
"""
    with pytest.raises(DesignError) as raised:
        elaborate_text(tmp_path, path_text)
    assert "`c[5]` is driven twice" in raised.value.message
    assert "case.v:4" in raised.value.message and raised.value.line == 5


CELL_WITH_UNUSED_LOOP = """module cell(input [3:0] d, output [3:0] q);
  reg [3:0] t, unused;
  integer k;
  always @* begin
    t = 0;
    unused = 0;
    for (k = 0; k < 4; k = k + 1) begin
      t[k] = d[3 - k];
      unused = unused + d[k];
    end
  end
  assign q = t;
endmodule
"""


def test_repeated_cells_probe_values_outside_their_outputs(tmp_path):
    # `unused` feeds no output: its loop probes are rebuilt per instance on their own.
    # Python reference: the running count of one bits of each nibble.
    model = elaborate_text(tmp_path, CELL_WITH_UNUSED_LOOP + """module dut(input [11:0] a, output [11:0] y);
  genvar i;
  for (i = 0; i < 3; i = i + 1) begin : lane
    cell c (.d(a[4*i +: 4]), .q(y[4*i +: 4]));
  end
endmodule
""")
    a = 0xB71
    for lane in range(3):
        nibble = (a >> (4 * lane)) & 0xF
        for k in range(4):
            expected = sum((nibble >> b) & 1 for b in range(k + 1))
            assert signal(model, f"lane[{lane}].c.unused@k={k}", a=a) == expected
    assert outputs(model, a=a)["y"] == 0xDE8      # each nibble bit-reversed (Python: 1->8, 7->E, B->D)


def test_reading_leaves_the_cycle_collector_on_and_a_callers_frozen_objects_frozen(tmp_path):
    # Python's gc module documentation: freeze() moves tracked objects to a permanent
    # generation that get_freeze_count() counts and unfreeze() releases.
    gc.freeze()
    try:
        frozen = gc.get_freeze_count()
        elaborate_text(tmp_path, CELL_WITH_UNUSED_LOOP.replace("module cell", "module dut"))
        assert gc.isenabled()
        # Reference counting may free a few frozen objects; unfreezing would release all.
        assert gc.get_freeze_count() > frozen // 2
    finally:
        gc.unfreeze()
    elaborate_text(tmp_path, CELL_WITH_UNUSED_LOOP.replace("module cell", "module dut"))
    assert gc.isenabled() and gc.get_freeze_count() == 0

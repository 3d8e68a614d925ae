"""bcdprove.equiv on small hand-written pairs: verdicts, counterexamples, port errors.

Each expected verdict names its source in tests/equivalence/hand_designs.py (IEEE 1364-2005
clauses); counterexamples are checked with Python int arithmetic.
"""
from __future__ import annotations

import pytest

from bcdprove import BcdproveError, equiv
from bcdprove.engines.base import DISPROVED, PROVED

from . import hand_designs as hd


def _equiv(tmp_path, text_a, top_a, text_b, top_b, **options):
    a = hd.write(tmp_path, f"{top_a}_a.v", text_a)
    b = hd.write(tmp_path, f"{top_b}_b.v", text_b)
    return equiv([a], top_a, [b], top_b, **options)


@pytest.mark.parametrize("engine", ["auto", "miter"])
def test_a_plus_b_is_b_plus_a(tmp_path, engine):
    result = _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.SUM_BA, "sum_ba", engine=engine)
    assert result.verdict.status == PROVED          # clause 5.1.5: + commutes
    assert result.exit_code == 0


@pytest.mark.parametrize("engine", ["auto", "miter"])
def test_times_ten_is_shift_three_plus_shift_one(tmp_path, engine):
    result = _equiv(tmp_path, hd.TIMES_TEN, "times_ten", hd.SHIFT_ADD_TEN, "shift_add_ten",
                    engine=engine)
    assert result.verdict.status == PROVED          # clauses 5.1.5 and 5.1.12


def test_times_ten_is_not_nine_x(tmp_path):
    result = _equiv(tmp_path, hd.TIMES_TEN, "times_ten", hd.SHIFT_ADD_NINE, "shift_add_nine")
    assert result.verdict.status == DISPROVED
    assert result.exit_code == 1
    found = result.verdict.counterexample
    x = found.inputs["x"]
    (out,) = found.outputs
    # Python int arithmetic modulo 2**12 as the reference.
    assert out.value_a == (10 * x) % 4096 and out.value_b == (9 * x) % 4096
    assert out.value_a != out.value_b
    assert x == 1                                   # the smallest differing input (9 != 10)


def test_random_engine_never_proves(tmp_path):
    result = _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.SUM_BA, "sum_ba", engine="random")
    assert result.verdict.status == "unknown"
    assert result.exit_code == 3


def test_an_x_output_is_not_equivalent_to_a_zero(tmp_path):
    # Clause 5.1.13: with sel = 0 one design shows x; the conservative reading lets it be 1.
    result = _equiv(tmp_path, hd.X_WHEN_OFF, "x_when_off", hd.ZERO_WHEN_OFF, "zero_when_off")
    assert result.verdict.status == DISPROVED
    found = result.verdict.counterexample
    assert found.inputs["sel"] == 0
    assert found.uses_unknowns
    (out,) = found.outputs
    assert out.value_b == 0 and out.value_a != 0


def test_an_x_output_is_not_equivalent_to_itself(tmp_path):
    # The unknowns of the two designs are independent: each may resolve x its own way.
    result = _equiv(tmp_path, hd.X_WHEN_OFF, "x_when_off", hd.X_WHEN_OFF, "x_when_off")
    assert result.verdict.status == DISPROVED
    assert result.verdict.counterexample.inputs["sel"] == 0


def test_an_x_masked_by_and_with_zero_is_fine(tmp_path):
    result = _equiv(tmp_path, hd.X_MASKED, "x_masked", hd.ZERO_WHEN_OFF, "zero_when_off")
    assert result.verdict.status == PROVED          # clause 5.1.10: x & 0 is 0


def test_same_module_names_are_read_independently(tmp_path):
    a = hd.write(tmp_path, "one.v", hd.CELL_PLUS_ONE)
    b = hd.write(tmp_path, "two.v", hd.CELL_ONE_PLUS)
    c = hd.write(tmp_path, "three.v", hd.CELL_PLUS_TWO)
    assert equiv([a], "top_plus", [b], "top_plus").verdict.status == PROVED
    differ = equiv([a], "top_plus", [c], "top_plus")
    assert differ.verdict.status == DISPROVED
    (out,) = differ.verdict.counterexample.outputs
    a_in = differ.verdict.counterexample.inputs["a"]
    assert (out.value_a, out.value_b) == ((a_in + 1) % 16, (a_in + 2) % 16)


def test_ports_mapped_by_name(tmp_path):
    result = _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.SUM_RENAMED, "sum_renamed",
                    mapping={"a": "left", "b": "right", "y": "total"})
    assert result.verdict.status == PROVED


def test_an_unpaired_input_is_an_error_naming_it(tmp_path):
    with pytest.raises(BcdproveError, match="input `a` of `sum_ab` has no counterpart"):
        _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.SUM_RENAMED, "sum_renamed")


def test_an_extra_output_is_an_error_naming_it(tmp_path):
    with pytest.raises(BcdproveError, match="output `c` of `sum_with_carry` has no counterpart"):
        _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.SUM_WITH_CARRY, "sum_with_carry")


def test_a_width_difference_names_the_port_and_both_widths(tmp_path):
    with pytest.raises(BcdproveError, match="output `y` is 8 bits in `sum_ab` but `y` is 7 bits"):
        _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.NARROW_SUM, "narrow_sum")


def test_a_bad_map_names_the_missing_port(tmp_path):
    with pytest.raises(BcdproveError, match="has no port `nope`"):
        _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.SUM_RENAMED, "sum_renamed",
               mapping={"a": "nope"})


def test_a_spent_time_limit_is_unknown_with_the_reason(tmp_path):
    # The two outputs are different nodes, so without any solver time nothing is decided.
    result = _equiv(tmp_path, hd.TIMES_TEN, "times_ten", hd.SHIFT_ADD_TEN, "shift_add_ten",
                    timeout=1e-9)
    assert result.verdict.status == "unknown"
    assert result.exit_code == 3
    assert "time limit" in result.verdict.reason


def test_structurally_equal_outputs_need_no_solver(tmp_path):
    # a + b and b + a are one node once both cones share the inputs (the graph orders the
    # arguments of a commutative operator), so even a spent time limit proves them.
    result = _equiv(tmp_path, hd.SUM_AB, "sum_ab", hd.SUM_BA, "sum_ba", timeout=1e-9)
    assert result.verdict.status == PROVED


def test_text_report_marks_the_differing_nibbles(tmp_path):
    from bcdprove.reports.equiv_text import equiv_report

    result = _equiv(tmp_path, hd.TIMES_TEN, "times_ten", hd.SHIFT_ADD_NINE, "shift_add_nine")
    text = equiv_report(result)
    # x = 1: 10 is 0x00a (nibbles 0 0 10), 9 is 0x009 (0 0 9): only the low nibble differs.
    assert "input x = 1 (0x001)" in text
    assert "times_ten       10  0x00a  nibbles  0  0 10" in text
    assert "shift_add_nine   9  0x009  nibbles  0  0  9" in text
    marks = text.splitlines()[text.splitlines().index(
        "    shift_add_nine   9  0x009  nibbles  0  0  9") + 1]
    assert marks.rstrip().endswith("^") and marks.count("^") == 1
    assert text.rstrip().endswith("differing bits: 0, 1")   # 0b1010 ^ 0b1001 = 0b0011

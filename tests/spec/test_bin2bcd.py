"""The binary-to-BCD problem: reference digits, digit counts, digit splitting, replay."""
from __future__ import annotations

import pytest
from hypothesis import given, settings, strategies as st

from bcdprove.errors import BcdproveError
from bcdprove.model.node import evaluate
from bcdprove.spec.bin2bcd import build_problem, decimal_digits, digits_needed
from tests.spec.hand_models import packed_converter, split_converter


# OEIS A034887, number of decimal digits of 2^n, terms recalled from memory:
# a(0..10) = 1, 1, 1, 1, 2, 2, 2, 3, 3, 3, 4; cross-checked below with len(str(2**n)).
A034887_START = [1, 1, 1, 1, 2, 2, 2, 3, 3, 3, 4]


def test_digit_counts_follow_a034887():
    for n, count in enumerate(A034887_START):
        assert len(str(2 ** n)) == count          # reference code: Python str
        if n:
            # 2**n - 1 has as many digits as 2**n (2**n is never a power of ten for n >= 1)
            assert digits_needed(2 ** n - 1) == count


def test_needed_digits_for_common_widths():
    # Python str as reference: 2**8-1 = 255, 2**16-1 = 65535, 2**32-1 = 4294967295
    for width, expected in ((8, 3), (16, 5), (32, 10)):
        problem = build_problem(packed_converter(width, expected))
        assert problem.needed_digits() == expected == len(str(2 ** width - 1))
        assert problem.fits()


def test_worked_value_225():
    # common practice: 225 in BCD is 0010 0010 0101, least significant digit first 5, 2, 2
    assert decimal_digits(225, 3) == [0b0101, 0b0010, 0b0010]


@given(st.integers(min_value=0, max_value=10 ** 30), st.integers(min_value=1, max_value=32))
def test_decimal_digits_match_python_int_arithmetic(value, count):
    # reference code: Python int // and %
    assert decimal_digits(value, count) == [(value // 10 ** i) % 10 for i in range(count)]


def test_correct_converter_replays_right_everywhere():
    problem = build_problem(packed_converter(8, 3))
    assert all(problem.replay(v) is None for v in range(256))


def test_digits_ok_node_agrees_with_python_reference():
    problem = build_problem(packed_converter(8, 3, threshold=4))
    ok = problem.digits_ok()
    for v in range(256):
        shown = problem.evaluate(v)
        right = shown == decimal_digits(v, 3)        # reference: Python str
        assert evaluate([ok], {problem.x.id: v})[0] == int(right)


def test_buggy_converter_counterexample_is_replayed():
    problem = build_problem(packed_converter(8, 3, threshold=4))
    found = problem.replay(8)
    assert found is not None and found.replayed
    # 8 = digits 8, 0, 0 (Python str); adding 3 at >= 4 corrupts the ones digit
    assert found.expected == [8, 0, 0]
    assert found.wrong == [0]
    assert found.inputs == {"bin": 8}


def test_value_past_capacity_is_always_wrong():
    problem = build_problem(packed_converter(8, 2))
    assert not problem.fits()
    assert problem.capacity() == 100               # 10**2, Python int
    found = problem.replay(100)
    assert found is not None
    assert found.expected == [0, 0, 1]             # digits of 100, Python str
    assert 2 in found.wrong
    assert problem.below_capacity().top_value == 99


def test_trimmed_top_digit_is_zero_extended():
    problem = build_problem(packed_converter(8, 3, out_width=10))
    assert [d.width for d in problem.digits] == [4, 4, 4]
    assert problem.digit_sources == ["bcd[3:0]", "bcd[7:4]", "bcd[9:8]"]
    assert problem.evaluate(255) == [5, 5, 2]      # Python str of 255
    assert all(problem.replay(v) is None for v in range(256))


def test_msd_first_reverses_nibbles():
    problem = build_problem(packed_converter(8, 3), msd_first=True)
    # the design puts the ones digit low, so read msd-first 123 shows as 3, 2, 1 reversed
    assert problem.evaluate(123) == [1, 2, 3]
    assert problem.replay(123) is not None


def test_msd_first_refuses_partial_nibbles():
    with pytest.raises(BcdproveError, match="whole nibbles"):
        build_problem(packed_converter(8, 3, out_width=10), msd_first=True)


def test_split_ports_with_two_bit_top_digit():
    problem = build_problem(split_converter(8, ["ones", "tens", "hundreds"], top_width=2))
    assert problem.output_ports == ["ones", "tens", "hundreds"]
    assert problem.evaluate(255) == [5, 5, 2]
    assert problem.replay(255) is None


def test_free_input_is_chosen_to_expose_the_failure():
    problem = build_problem(packed_converter(8, 3, enable=True))
    found = problem.replay(5)
    assert found is not None and found.inputs == {"bin": 5, "en": 0}


def test_tie_removes_the_free_input():
    problem = build_problem(packed_converter(8, 3, enable=True), ties={"en": 1})
    assert problem.free_leaves() == []
    assert all(problem.replay(v) is None for v in range(256))


def test_unknown_value_found_by_solver():
    problem = build_problem(packed_converter(8, 3, free_default=True))
    found = problem.replay(9)
    assert found is not None and found.free_values
    assert problem.replay(8) is None              # digit 0 is 8, not 9: the hole is not used


def test_unknown_value_the_output_does_not_read_there_is_not_reported_as_chosen():
    # Threshold 6 instead of 5 breaks the conversion at 10 (common practice: the correction
    # must fire for 5..9); the hole is only read where digit 0 comes out as 9, and at 10 it
    # comes out as 10 (0xA), so no unknown value had to be chosen for the wrong output.
    problem = build_problem(packed_converter(8, 3, threshold=6, free_default=True))
    assert problem.free_leaves()
    found = problem.replay(10)
    assert found is not None and found.actual[0] == 10 and found.expected[0] == 0
    assert found.free_values == {}


def test_tie_errors():
    model = packed_converter(8, 3, enable=True)
    with pytest.raises(BcdproveError, match="no input port `nope`"):
        build_problem(model, ties={"nope": 1})
    with pytest.raises(BcdproveError, match="does not fit"):
        build_problem(model, ties={"en": 2})


def test_max_input_range_checked():
    with pytest.raises(BcdproveError, match="outside"):
        build_problem(packed_converter(8, 3), max_input=256)
    assert build_problem(packed_converter(8, 3), max_input=199).top_value == 199


@settings(max_examples=30, deadline=None)
@given(st.integers(min_value=0, max_value=2 ** 12 - 1))
def test_replay_agrees_with_python_reference_on_buggy_design(value):
    problem = build_problem(packed_converter(12, 4, threshold=6))
    shown = problem.evaluate(value)
    found = problem.replay(value)
    assert (found is None) == (shown == decimal_digits(value, 4))   # reference: Python str

"""The signed specification: the most negative value's digits, the contract's order, ports."""
from __future__ import annotations

from dataclasses import replace

import pytest

from bcdprove.checking import check
from bcdprove.errors import BcdproveError
from bcdprove.model.simulate import pack
from tests.designs.catalog import DESIGNS

TARE = str(DESIGNS / "signed" / "scale_tare_signed.v")
TARE_BUG = str(DESIGNS / "signed" / "scale_tare_signed_bug.v")
FREEZER = str(DESIGNS / "signed" / "freezer_temperature.v")


def test_most_negative_value_never_needs_an_extra_digit():
    """len(str(2**(W-1))) == len(str(2**(W-1) - 1)) for every W >= 2 (Python int/str): a
    power of two above 1 is never a power of ten; the report still names both counts."""
    for width in range(2, 513):
        assert len(str(2 ** (width - 1))) == len(str(2 ** (width - 1) - 1))


def test_expected_digits_of_the_extremes():
    problem = check([TARE], "scale_tare_signed", spec="signed", engine="exhaustive").problem
    # -2048 has magnitude 2048 (Python abs/str): sign 1, digits 8 4 0 2 least significant first
    assert problem.expectation(0x800).values == [1, 8, 4, 0, 2]
    assert problem.expectation(0x7FF).values == [0, 7, 4, 0, 2]
    assert problem.expectation(0xFFF).values == [1, 1, 0, 0, 0]
    assert problem.needed_digits() == len(str(2048)) == 4
    assert problem.fits()


def test_restricted_domain_order_and_planes():
    problem = check([TARE], "scale_tare_signed", spec="signed", engine="exhaustive").problem
    below = problem.below_capacity()
    # 4 digits hold every magnitude up to 2048, so the restriction keeps all 2**12 inputs
    assert below.max_magnitude == 2048 and below.domain_size() == 4096
    small = replace(problem, max_magnitude=5, _ok_node=None)
    order = [small.domain_value(i) for i in range(small.domain_size())]
    # 0..5, then -5..-1 as 12-bit patterns (Python int & mask)
    assert order == [0, 1, 2, 3, 4, 5] + [v & 0xFFF for v in range(-5, 0)]
    assert small.domain_planes(3, 6) == pack(order[3:9], 12)
    assert small.span_words(0, 10) == "0 .. 5 and -5 .. -1"


def test_bug_at_the_most_negative_value():
    result = check([TARE_BUG], "scale_tare_signed_bug", spec="signed", engine="exhaustive")
    found = result.verdict.counterexample
    assert found.inputs == {"grams": 2048}            # -2048 as 12 bits (catalogue, Icarus)
    assert found.expected == [1, 8, 4, 0, 2] and found.actual == [1, 0, 0, 0, 0]


def test_too_few_digits_for_a_signed_width():
    """14 bits reach -8192 (Python int): 4 digits; 3 digit ports of the freezer readout on a
    wider input would be too few, shown with the smallest magnitude they cannot show."""
    from bcdprove.model.design import Model, Port
    from bcdprove.model.node import Graph
    from tests.spec.hand_models import shift_add3_digits
    graph = Graph()
    x = graph.input("t", 11)
    negative = graph.extract(x, 10, 10)
    magnitude = graph.ite(negative, graph.neg(x), x)
    digits = shift_add3_digits(graph, magnitude, 3)
    model = Model(graph=graph, top="t11", files=["hand"], ports=[
        Port("t", "input", 11, False, x), Port("neg", "output", 1, False, negative),
        Port("bcd", "output", 12, False, graph.concat(*reversed(digits)))])
    from bcdprove.checking import check_model
    result = check_model(model, spec="signed", engine="exhaustive")
    assert result.verdict.status == "disproved"
    found = result.verdict.counterexample
    assert found.inputs["t"] == 1000                  # 10**3, the first magnitude 3 digits miss
    assert result.problem.needed_digits() == 4        # len(str(1024))
    assert result.digits_check.status == "proved"


def test_freezer_ports_and_sign_are_inferred():
    result = check([FREEZER], "freezer_temperature", spec="signed", engine="smt")
    assert result.problem.sign_port == "sign"
    assert result.problem.output_ports == ["ones", "tens", "hundreds"]
    assert result.verdict.status == "proved"


@pytest.mark.parametrize("options, message", [
    ({"sign": "nope"}, "--sign nope: `scale_tare_signed` has no output port `nope`"),
    ({"sign": "bcd"}, "the sign output must be 1 bit"),
    ({"sign": "minus", "outputs": ["minus"]}, "is the sign output, not a digit"),
    ({"invalid_flag": "minus"}, "--invalid-flag is an option of --spec bcd2bin"),
    ({"max_input": 3}, "--max-input is an option of --spec bin2bcd"),
])
def test_bad_options_are_errors(options, message):
    with pytest.raises(BcdproveError, match=message):
        check([TARE], "scale_tare_signed", spec="signed", **options)


def test_sign_must_be_named_when_not_inferable():
    path = str(DESIGNS / "comb" / "scale_digit_ports.v")
    with pytest.raises(BcdproveError, match="name it with --sign PORT"):
        check([path], "scale_digit_ports", spec="signed")

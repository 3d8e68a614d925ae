"""The BCD-to-binary specification: reference values, the contract's order, ports, errors."""
from __future__ import annotations

import decimal
import random

import pytest

from bcdprove.checking import check, check_model
from bcdprove.errors import BcdproveError
from bcdprove.model.design import Model, Port
from bcdprove.model.node import Graph
from bcdprove.model.simulate import pack
from bcdprove.spec.bcd2bin import bcd_value, build_problem, to_bcd
from tests.designs.catalog import DESIGNS

TENS_ONES = str(DESIGNS / "bcd2bin" / "pump_tens_ones.v")
KEYPAD = str(DESIGNS / "bcd2bin" / "pump_keypad_loop.v")
CHECKED = str(DESIGNS / "bcd2bin" / "pump_keypad_checked.v")


def hand_model(digits: int = 2, out_width: int = 7, flag: bool = False,
               extra_input: bool = False) -> Model:
    """``keys`` (4 * digits bits) -> ``value`` = sum(d_i * 10**i), optionally ``bad`` and ``en``."""
    graph = Graph()
    keys = graph.input("keys", 4 * digits)
    value = graph.zero(out_width)
    for i in reversed(range(digits)):
        digit = graph.zext(graph.extract(keys, 4 * i + 3, 4 * i), out_width)
        value = graph.add(graph.mul(value, graph.const(10, out_width)), digit)
    ports = [Port("keys", "input", 4 * digits, False, keys), Port("value", "output", out_width, False, value)]
    if flag:
        bad = graph.const(0, 1)
        for i in range(digits):
            bad = graph.or_(bad, graph.ult(graph.const(9, 4), graph.extract(keys, 4 * i + 3, 4 * i)))
        ports.append(Port("bad", "output", 1, False, bad))
    if extra_input:
        en = graph.input("en", 1)
        ports.append(Port("en", "input", 1, False, en))
    return Model(graph=graph, top="keypad", files=["hand"], ports=ports)


def test_reference_values_agree_with_decimal():
    """bcd_value/to_bcd against Python's decimal module (reference code)."""
    rng = random.Random(6)
    for _ in range(200):
        value = rng.randrange(10 ** 12)
        digits = decimal.Decimal(value).as_tuple().digits       # most significant first
        packed = 0
        for d in digits:
            packed = packed << 4 | d
        assert to_bcd(value) == packed
        assert bcd_value(packed, 12) == value


def test_handbook_two_digit_value():
    """1001 1001 in two-digit BCD is 99 (common practice)."""
    assert bcd_value(0b1001_1001, 2) == 99
    assert bcd_value(0b1001_1010, 2) is None                    # nibble 1010 is not a digit


def test_tens_ones_ports_are_inferred_least_significant_first():
    result = check([TENS_ONES], "pump_tens_ones", spec="bcd2bin", engine="exhaustive")
    problem = result.problem
    assert problem.input_ports == ["ones", "tens"]
    assert problem.digit_count == 2 and result.verdict.status == "proved"
    # 1001 1001 is 99 (common practice): tens = 9, ones = 9 shows 99
    x = problem.x
    assert problem.input_fields(0x99) == {"ones": 9, "tens": 9}
    assert problem.evaluate(0x99) == [99]
    assert x.width == 8


def test_domain_planes_hold_the_valid_vectors_in_value_order():
    problem = build_problem(hand_model(digits=3, out_width=10))
    for low, count in [(0, 1000), (7, 53), (990, 10), (95, 200)]:
        count = min(count, problem.domain_size() - low)
        expected = [to_bcd(v) for v in range(low, low + count)]       # Python str reference
        assert problem.domain_planes(low, count) == pack(expected, problem.width)
        assert [problem.domain_value(low + i) for i in range(count)] == expected


def test_flag_domain_is_every_nibble_pattern():
    problem = build_problem(hand_model(digits=2, flag=True), invalid_flag="bad")
    assert problem.domain_size() == 256
    assert problem.replay(0xA9) is None                          # flagged, value not checked
    assert problem.replay(0x99) is None


def test_replay_names_the_wrong_output():
    model = hand_model(digits=2, out_width=7)
    problem = build_problem(model)
    assert problem.replay(0x42) is None
    narrow = build_problem(hand_model(digits=3, out_width=9))
    found = narrow.replay(to_bcd(512))
    assert found is not None and found.expected == [512] and found.actual == [0]


def test_too_narrow_output_is_disproved_at_two_to_the_width():
    result = check_model(hand_model(digits=3, out_width=9), spec="bcd2bin", engine="exhaustive")
    found = result.verdict.counterexample
    assert result.verdict.status == "disproved"
    assert result.problem.input_value(found) == to_bcd(512)      # 2**9, Python int
    assert "512 is the smallest value the 9-bit output" in found.note
    assert result.digits_check.status == "proved"


@pytest.mark.parametrize("options, message", [
    ({"invalid_flag": "nope"}, "--invalid-flag nope: `keypad` has no output port `nope`"),
    ({"invalid_flag": "keys"}, "has no output port `keys`"),
    ({"max_input": 5}, "--max-input is an option of --spec bin2bcd"),
    ({"msd_first": True}, "--msd-first is an option of --spec bin2bcd"),
    ({"sign": "bad"}, "--sign is an option of --spec signed"),
    ({"outputs": ["value", "bad"]}, "--out takes one binary output port"),
    ({"inputs": ["en"]}, "every BCD input digit must be 4 bits"),
])
def test_bad_options_are_errors(options, message):
    with pytest.raises(BcdproveError, match=message.replace("(", r"\(")):
        check_model(hand_model(flag=True, extra_input=True), spec="bcd2bin", **options)


def test_ambiguous_inputs_ask_for_in():
    graph = Graph()
    a, b = graph.input("a", 8), graph.input("b", 8)
    model = Model(graph=graph, top="two", files=["hand"], ports=[
        Port("a", "input", 8, False, a), Port("b", "input", 8, False, b),
        Port("y", "output", 8, False, graph.add(a, b))])
    with pytest.raises(BcdproveError, match="name the digit inputs with --in"):
        build_problem(model)


def test_invalid_flag_only_on_bcd2bin():
    with pytest.raises(BcdproveError, match="--invalid-flag is an option of --spec bcd2bin"):
        check([KEYPAD], "pump_keypad_loop", invalid_flag="litres")


def test_flag_design_proved_with_flag_and_binary_output_unchecked_for_bad_digits():
    result = check([CHECKED], "pump_keypad_checked", spec="bcd2bin", invalid_flag="bad_key",
                   engine="smt")
    assert result.verdict.status == "proved"
    # Without the flag the same design is checked on valid digits only, and is right there.
    assert check([CHECKED], "pump_keypad_checked", spec="bcd2bin", outputs=["litres"],
                 engine="exhaustive").verdict.status == "proved"


def test_clocked_design_is_refused():
    path = str(DESIGNS / "clocked" / "meter_serial_bcd.v")
    with pytest.raises(BcdproveError, match="clocked ones are not supported yet"):
        check([path], "meter_serial_bcd", spec="bcd2bin")


def test_numbered_digit_inputs_are_read_index_0_least_significant():
    """bcd0 .. bcd3 (common practice: index 0 the ones digit) join into one input."""
    graph = Graph()
    ports = [graph.input(f"bcd{i}", 4) for i in (3, 1, 0, 2)]      # declared out of order
    by_name = {p.params[0]: p for p in ports}
    value = graph.zero(14)
    for i in (3, 2, 1, 0):
        value = graph.add(graph.mul(value, graph.const(10, 14)), graph.zext(by_name[f"bcd{i}"], 14))
    model = Model(graph=graph, top="four", files=["hand"],
                  ports=[Port(p.params[0], "input", 4, False, p) for p in ports]
                  + [Port("total", "output", 14, False, value)])
    problem = build_problem(model)
    assert problem.input_ports == ["bcd0", "bcd1", "bcd2", "bcd3"]
    assert problem.evaluate(0x4321) == [4321]                         # Python int("4321")
    assert problem.input_fields(0x4321) == {"bcd0": 1, "bcd1": 2, "bcd2": 3, "bcd3": 4}
    assert check_model(model, spec="bcd2bin", engine="exhaustive").verdict.status == "proved"

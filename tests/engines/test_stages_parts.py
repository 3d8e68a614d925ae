"""The parts of the stage engine: reference step, shape hashing, cone copies, lifting.

Expected values come from Python's ``int``/``str`` (reference code) unless noted.
"""
from __future__ import annotations

import random

import pytest

from bcdprove.engines.stages.cuts import ConeBuilder, Cut
from bcdprove.engines.stages.lifting import candidate_inputs
from bcdprove.engines.stages.mining import reference_planes, stimuli
from bcdprove.engines.stages.obligations import PROVED, FAILED, ObligationSolver, shape_key
from bcdprove.engines.stages.reference import (digit_count, step_digits, step_nodes, step_planes,
                                               top_pair_bound)
from bcdprove.model.node import Graph, evaluate, mask
from bcdprove.model.simulate import pack, unpack
from tests.support.converters import double_dabble


def _digits(value: int, count: int) -> list[int]:
    """Decimal digits, least significant first, from Python ``str`` (reference code)."""
    text = str(value)[::-1]
    return [int(text[i]) if i < len(text) else 0 for i in range(count)]


# -- reference step ------------------------------------------------------------------------
@pytest.mark.parametrize("stage", [0, 1, 3, 4, 7, 10, 64, 128, 256])
def test_digit_count_is_the_length_of_the_largest_prefix(stage):
    # Python str of 2**s - 1 (for s >= 1 the same count as OEIS A034887, digits of 2**s).
    expected = len(str((1 << stage) - 1)) if stage else 0
    assert digit_count(stage) == expected


def test_digit_count_at_64_and_128_bits():
    # 2**64 - 1 = 18446744073709551615 has 20 digits, 2**128 - 1 has 39 (Python str).
    assert digit_count(64) == len("18446744073709551615") == 20
    assert digit_count(128) == len(str(2 ** 128 - 1)) == 39


@pytest.mark.parametrize("stage", [1, 2, 3, 4, 5, 10, 33, 64])
def test_top_pair_bound_is_the_top_two_digits_of_the_largest_prefix(stage):
    top = (1 << stage) - 1
    text = str(top)                      # Python str as reference
    assert top_pair_bound(stage) == int(text[:2])


def test_step_digits_doubles_and_adds_the_bit():
    rng = random.Random(5)
    for _ in range(300):
        stage = rng.randint(0, 60)
        value = rng.getrandbits(stage) if stage else 0
        bit = rng.getrandbits(1)
        count = digit_count(stage + 1)
        got = step_digits(_digits(value, count), bit)
        assert got == _digits(2 * value + bit, count)     # Python int arithmetic


def test_step_planes_agrees_with_integers_on_every_digit_pair():
    # Exhaustive over two digits 0..9 and the input bit: 200 lanes.
    lanes = [(low, high, bit) for low in range(10) for high in range(10) for bit in (0, 1)]
    low_planes = pack([l for l, _, _ in lanes], 4)
    high_planes = pack([h for _, h, _ in lanes], 4)
    bit_plane = pack([b for _, _, b in lanes], 1)[0]
    out = step_planes([tuple(low_planes), tuple(high_planes)], bit_plane, mask(len(lanes)))
    got_low = unpack(list(out[0]), len(lanes))
    got_high = unpack(list(out[1]), len(lanes))
    for k, (low, high, bit) in enumerate(lanes):
        value = 2 * (10 * high + low) + bit            # Python int
        assert [got_low[k], got_high[k]] == _digits(value % 100, 2)


def test_step_nodes_agrees_with_integers():
    graph = Graph()
    digits = [graph.input(f"d{j}", 4) for j in range(3)]
    bit = graph.input("b", 1)
    out = step_nodes(graph, digits, bit)
    rng = random.Random(9)
    for _ in range(200):
        value = rng.randrange(500)        # below 500, so doubling fits three digits
        b = rng.getrandbits(1)
        env = {d.id: v for d, v in zip(digits, _digits(value, 3))}
        env[bit.id] = b
        assert evaluate(out, env) == _digits(2 * value + b, 3)


def test_reference_planes_hold_the_digits_of_every_prefix():
    width = 20
    values = stimuli(width, seed=3, random_count=16, boundary_count=16)
    stages = reference_planes(pack(values, width), width, len(values))
    for stage in (0, 1, 4, 11, 20):
        columns = [unpack(list(key), len(values)) for key in stages[stage]]
        for lane, x in enumerate(values):
            prefix = x >> (width - stage)
            assert [c[lane] for c in columns] == _digits(prefix, digit_count(stage))


def test_stimuli_include_every_all_ones_prefix():
    width = 12
    values = stimuli(width, seed=1)
    for k in range(1, width + 1):
        assert any(v >> (width - k) == mask(k) for v in values)


# -- shape hashing ------------------------------------------------------------------------
def test_shape_key_ignores_leaf_names_but_not_constants():
    graph = Graph()
    a, b, c = (graph.input(n, 4) for n in "abc")
    interned: dict = {}
    first = shape_key(graph.ult(graph.add(a, graph.const(3, 4)), b), interned)
    renamed = shape_key(graph.ult(graph.add(c, graph.const(3, 4)), a), interned)
    other = shape_key(graph.ult(graph.add(a, graph.const(4, 4)), b), interned)
    shared = shape_key(graph.ult(graph.add(a, graph.const(3, 4)), a), interned)
    assert first == renamed
    assert first != other
    assert first != shared        # one leaf used twice is a different question


def test_solver_proves_each_shape_once():
    graph = Graph()
    solver = ObligationSolver()
    for name in ("p", "q", "r"):
        v = graph.input(name, 4)
        # v <= 9 implies v + 6 does not wrap: a true fact (common practice: 9 + 6 = 15).
        bad = graph.and_(graph.ule(v, graph.const(9, 4)),
                         graph.ult(graph.add(v, graph.const(6, 4)), v))
        assert solver.check(bad, name).status == PROVED
    assert solver.posed == 3
    assert solver.solved == 1


def test_solver_returns_values_for_a_failed_obligation():
    graph = Graph()
    v = graph.input("d0", 4)
    outcome = ObligationSolver().check(graph.eq(v, graph.const(7, 4)), "seven")
    assert outcome.status == FAILED
    assert outcome.values == {"in:d0": 7}


# -- cone copies ------------------------------------------------------------------------------
def test_cone_copy_with_no_cut_computes_the_same_digits():
    width = 10
    graph = Graph()
    x, digits = double_dabble(graph, width)
    cone = Graph()
    builder = ConeBuilder(cone, x, width, Cut.empty())
    copies = [builder.slice(d, 3, 0) for d in digits]
    bit_leaves = {}
    for leaf in [n for n in _leaves(copies)]:
        offset = int(leaf.params[0][1:])
        bit_leaves[leaf.id] = width - 1 - offset
    rng = random.Random(2)
    for _ in range(50):
        value = rng.getrandbits(width)
        env = {leaf_id: value >> index & 1 for leaf_id, index in bit_leaves.items()}
        assert evaluate(copies, env) == evaluate(digits, {x.id: value})
        assert evaluate(digits, {x.id: value}) == _digits(value, len(digits))   # Python str


def _leaves(roots):
    from bcdprove.model.node import leaves
    return leaves(roots)


def test_cone_copy_pushes_a_slice_through_a_wide_shift():
    graph = Graph()
    word = graph.input("w", 64)
    shifted = graph.shl(word, graph.const(1, 8))
    cone = Graph()
    builder = ConeBuilder(cone, graph.input("x", 8), 8, Cut.empty())
    copy = builder.slice(shifted, 11, 8)
    # Only bits 10..7 of w are read: four 1-bit leaves, not a 64-bit word.
    names = {leaf.params[0] for leaf in _leaves([copy])}
    assert names == {f"in{word.id}_{i}" for i in (7, 8, 9, 10)}
    assert all(leaf.width == 1 for leaf in _leaves([copy]))


# -- lifting -------------------------------------------------------------------------------
def test_lifted_inputs_start_with_the_stage_value():
    # Stage 7 of a 12-bit input holding 105: x = 105 << 5 with the solver's next bit b0 = 1.
    inputs = candidate_inputs({"in:d0": 5, "in:d1": 0, "in:d2": 1, "in:b0": 1}, 12, 7, 3)
    assert inputs
    for x in inputs:
        assert x >> 5 == 105
        assert x >> 4 & 1 == 1


def test_an_unreachable_state_lifts_to_nothing():
    # 130 is not below 2**7 = 128, so no input reaches it at stage 7 (Python int).
    assert candidate_inputs({"in:d0": 0, "in:d1": 3, "in:d2": 1}, 12, 7, 3) == []


def test_facts_spread_through_a_complement_as_complements():
    # not(a) holds digit 0 bit 1 and the constant 1: so a holds the complement of that digit
    # bit and the constant 0 (bitwise negation, IEEE 1364-2005 clause 5.1.10, clause number
    # recalled from memory).
    from bcdprove.engines.stages.cuts import ConstBit, DigitBit
    from bcdprove.engines.stages.engine import _spread

    graph = Graph()
    a = graph.xor(graph.input("p", 2), graph.input("q", 2))
    inverted = graph.not_(a)
    facts = {inverted.id: [ConstBit(1), DigitBit(0, 1)]}
    _spread(facts, {inverted.id: inverted})
    assert facts[a.id] == [ConstBit(0), DigitBit(0, 1, negated=True)]


def test_an_input_test_constant_over_the_range_is_folded_and_others_are_kept():
    # x > 200 is false for every x <= 150 and true for x = 201 <= 250 (integer comparison,
    # IEEE 1364-2005 clause 5.1.7, clause number recalled from memory).
    from bcdprove.engines.stages.cuts import digit_leaf, input_bit_leaf
    from bcdprove.engines.stages.side_conditions import fold_input_tests, input_tests

    cone = Graph()
    x = cone.concat(*[input_bit_leaf(cone, 8, 8, i) for i in range(7, -1, -1)])
    above = cone.ult(cone.const(200, 8), x)
    digit = digit_leaf(cone, 0)
    shown = cone.ite(above, cone.const(9, 4), digit)
    bad = cone.ne(shown, digit)
    assert input_tests(bad) == [above]
    solver = ObligationSolver()
    assert fold_input_tests(cone, bad, 8, 8, 150, solver, 10.0).op == "const"
    assert fold_input_tests(cone, bad, 8, 8, 250, solver, 10.0) is bad

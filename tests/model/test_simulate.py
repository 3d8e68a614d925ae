"""The lane simulator agrees with scalar evaluate() lane by lane, and is sound when three-valued.

Reference values: ``evaluate`` (scalar, from apply_op) for random DAGs, Python ``str`` for
decimal digits, and Python int bit arithmetic for pack/unpack.
"""
from __future__ import annotations

import random

import pytest
from hypothesis import given, settings, strategies as st

from bcdprove.model._bitnet import Program
from bcdprove.model.node import Graph, evaluate, leaves
from bcdprove.model.simulate import Planes, Simulator, counting_planes, pack, simulate, unpack
from tests.support.converters import (buggy_double_dabble, digit_count, division_by_ten,
                                      double_dabble)

from .random_dags import random_dag


def _decimal_digits(value: int, count: int) -> list[int]:
    """Decimal digits of ``value``, least significant first (Python ``str`` as reference)."""
    return [int(c) for c in reversed(str(value).zfill(count))]


# pack / unpack / counting_planes -------------------------------------------------------------

@settings(max_examples=100, deadline=None)
@given(width=st.integers(1, 140), data=st.data())
def test_pack_puts_bit_i_of_lane_j_at_bit_j_of_plane_i(width, data):
    values = data.draw(st.lists(st.integers(0, (1 << width) - 1), min_size=1, max_size=70))
    planes = pack(values, width)
    assert len(planes) == width
    for i, plane in enumerate(planes):
        # Direct definition with Python int bit arithmetic.
        assert plane == sum(((v >> i) & 1) << j for j, v in enumerate(values))
    assert unpack(planes, len(values)) == values


def test_pack_reduces_values_modulo_the_width():
    assert unpack(pack([256 + 5, -1], 8), 2) == [5, 255]   # Python: (256+5) % 256, -1 % 256


@pytest.mark.parametrize("start,lanes,width", [(0, 64, 6), (5, 100, 9), (1000, 3, 40),
                                               (2**30 - 7, 50, 31), (0, 1, 1), (123, 777, 12),
                                               (7, 0, 5)])
def test_counting_planes_are_consecutive_values(start, lanes, width):
    expected = [(start + j) % (1 << width) for j in range(lanes)]   # Python int reference
    assert unpack(counting_planes(start, lanes, width), lanes) == expected


# two-valued agreement with evaluate() --------------------------------------------------------

def _check_against_evaluate(dag, rng, lanes):
    roots = dag.nodes
    simulator = Simulator(roots)
    vectors = [{leaf.id: rng.getrandbits(leaf.width) for leaf in simulator.leaves}
               for _ in range(lanes)]
    values = {leaf.id: pack([v[leaf.id] for v in vectors], leaf.width) for leaf in simulator.leaves}
    results = simulator.run(lanes, values)
    per_lane = [evaluate(roots, v) for v in vectors]
    for r, (root, planes) in enumerate(zip(roots, results)):
        assert len(planes.value) == root.width
        assert not any(planes.unknown)
        assert unpack(planes.value, lanes) == [lane[r] for lane in per_lane], root


@settings(max_examples=60, deadline=None)
@given(seed=st.integers(0, 2**32 - 1), operations=st.integers(1, 15), lanes=st.integers(1, 40))
def test_lanes_equal_scalar_evaluation(seed, operations, lanes):
    rng = random.Random(seed)
    dag = random_dag(rng, operations=operations, max_width=130, heavy_width=24, free_leaves=1)
    _check_against_evaluate(dag, rng, lanes)


@pytest.mark.parametrize("compile_after", [0, 10**9], ids=["compiled", "interpreted"])
@pytest.mark.parametrize("seed", range(25))
def test_lanes_equal_scalar_evaluation_narrow_words(seed, compile_after, monkeypatch):
    # Both ways of running a schedule: straight-line Python and the interpreter.
    monkeypatch.setattr(Program, "COMPILE_AFTER", compile_after)
    # Narrow words make carries, zero divisors and out-of-range shifts common.
    rng = random.Random(seed)
    dag = random_dag(rng, operations=20, max_width=9, free_leaves=1)
    _check_against_evaluate(dag, rng, 200)


def test_wide_words_work():
    g = Graph()
    a, b, s = g.input("a", 600), g.input("b", 600), g.input("s", 10)
    roots = [g.add(a, b), g.ult(a, b), g.shl(a, s), g.ashr(b, s), g.eq(a, g.not_(b))]
    rng = random.Random(7)
    vectors = [{a.id: rng.getrandbits(600), b.id: rng.getrandbits(600), s.id: rng.getrandbits(10)}
               for _ in range(20)]
    vectors.append({a.id: 5, b.id: (1 << 600) - 6, s.id: 599})
    got = simulate(roots, {k: [v[k] for v in vectors] for k in vectors[0]})
    for j, v in enumerate(vectors):
        assert [lane[j] for lane in got] == [(x, 0) for x in evaluate(roots, v)]


def test_missing_input_is_a_key_error_naming_it():
    g = Graph()
    x = g.input("meter_count", 8)
    with pytest.raises(KeyError, match="meter_count"):
        Simulator([g.add(x, g.const(1, 8))]).run(4, {})


def test_constant_roots_fill_every_lane():
    g = Graph()
    (result,) = Simulator([g.const(0b101, 3)]).run(5, {})
    assert result == Planes([0b11111, 0, 0b11111], [0, 0, 0])


# three-valued soundness ----------------------------------------------------------------------

def _check_ternary_sound(dag, rng, lanes, tries=6, mark_inputs=False):
    """Known bits must equal evaluate() for every completion of the unknown leaf bits.

    FREE leaves are left out of the run (all unknown); with ``mark_inputs`` some bits of
    the given inputs are marked unknown too, and completions redraw exactly those bits.
    """
    roots = dag.nodes
    simulator = Simulator(roots)
    inputs = [leaf for leaf in simulator.leaves if leaf.op != "free"]
    frees = [leaf for leaf in simulator.leaves if leaf.op == "free"]
    vectors = [{leaf.id: rng.getrandbits(leaf.width) for leaf in inputs} for _ in range(lanes)]
    marks = [{leaf.id: rng.getrandbits(leaf.width) & rng.getrandbits(leaf.width) if mark_inputs
              else 0 for leaf in inputs} for _ in range(lanes)]
    values = {leaf.id: pack([v[leaf.id] for v in vectors], leaf.width) for leaf in inputs}
    unknown = {leaf.id: pack([m[leaf.id] for m in marks], leaf.width) for leaf in inputs}
    results = simulator.run(lanes, values, unknown)
    reported = [(unpack(r.value, lanes), unpack(r.unknown, lanes)) for r in results]
    for _ in range(tries):
        for j, vector in enumerate(vectors):
            chosen = {leaf.id: vector[leaf.id] & ~marks[j][leaf.id]
                      | rng.getrandbits(leaf.width) & marks[j][leaf.id] for leaf in inputs}
            chosen.update({leaf.id: rng.getrandbits(leaf.width) for leaf in frees})
            actual = evaluate(roots, chosen)
            for root, (value_lanes, unknown_lanes), value in zip(roots, reported, actual):
                known = ~unknown_lanes[j] & ((1 << root.width) - 1)
                assert value_lanes[j] & ~known == 0, "value bits under unknown must be 0"
                assert value & known == value_lanes[j], (root, j)


@settings(max_examples=40, deadline=None)
@given(seed=st.integers(0, 2**32 - 1), operations=st.integers(1, 15))
def test_bits_reported_known_do_not_depend_on_unknown_leaves(seed, operations):
    rng = random.Random(seed)
    dag = random_dag(rng, operations=operations, max_width=40, heavy_width=12, free_leaves=2,
                     leaf_count=2)
    _check_ternary_sound(dag, rng, lanes=8)


@pytest.mark.parametrize("compile_after", [0, 10**9], ids=["compiled", "interpreted"])
@pytest.mark.parametrize("seed", range(15))
def test_bits_reported_known_do_not_depend_on_bits_marked_unknown(seed, compile_after,
                                                                   monkeypatch):
    monkeypatch.setattr(Program, "COMPILE_AFTER", compile_after)
    rng = random.Random(1000 + seed)
    dag = random_dag(rng, operations=15, max_width=10, free_leaves=1, leaf_count=3)
    _check_ternary_sound(dag, rng, lanes=16, mark_inputs=True)


@pytest.mark.parametrize("seed", range(10))
def test_three_valued_runs_are_exact_away_from_unknown_leaves(seed):
    # Soundness alone would allow "everything unknown": nodes that do not depend on the
    # unknown leaf must come out fully known and right, though the ternary program runs.
    rng = random.Random(seed)
    dag = random_dag(rng, operations=15, max_width=10, free_leaves=1, leaf_count=2)
    simulator = Simulator(dag.nodes)
    vector = {leaf.id: rng.getrandbits(leaf.width) for leaf in dag.input_leaves}
    given = {leaf.id: pack([vector[leaf.id]], leaf.width)
             for leaf in simulator.leaves if leaf.op != "free"}
    results = simulator.run(1, given)
    unknown_leaf = dag.free_leaves[0]
    for node, planes in zip(dag.nodes, results):
        if any(leaf is unknown_leaf for leaf in leaves([node])):
            continue
        assert not any(planes.unknown), node
        assert unpack(planes.value, 1) == evaluate([node], vector), node


def test_known_zero_masks_an_unknown_and_ite_keeps_agreeing_arms():
    g = Graph()
    x, u, c = g.input("x", 4), g.free(4, "test"), g.free(1, "test")
    masked = g.and_(u, g.const(0b0011, 4))
    agree = g.ite(c, g.or_(x, g.const(0b1000, 4)), g.const(0b1001, 4))
    results = Simulator([masked, agree]).run(1, {x.id: pack([0b0001], 4)})
    # AND with known 0 is known 0: only the two low bits stay unknown.
    assert results[0] == Planes([0, 0, 0, 0], [1, 1, 0, 0])
    # x | 1000 = 1001 = the other arm: every bit known although the condition is not.
    assert results[1] == Planes([1, 0, 0, 1], [0, 0, 0, 0])


def test_given_unknown_marks_are_honoured():
    g = Graph()
    x = g.input("x", 4)
    (result,) = Simulator([g.not_(x)]).run(2, {x.id: pack([0b0101, 0b0011], 4)},
                                             unknown={x.id: pack([0b0001, 0], 4)})
    assert unpack(result.unknown, 2) == [0b0001, 0]
    assert unpack(result.value, 2) == [0b1010, 0b1100]


def test_simulate_reports_unknown_free_bits():
    g = Graph()
    x, f = g.input("x", 8), g.free(8, "test")
    root = g.concat(g.extract(x, 3, 0), g.extract(f, 3, 0))
    assert simulate([root], {x.id: [0xA5]}) == [[(0x50, 0x0F)]]
    assert simulate([root], {x.id: [0xA5]}, free={f.id: [0x3C]}) == [[(0x5C, 0)]]


# converters from tests/support/converters.py -----------------------------------------------------

def test_worked_example_225():
    # 225 in BCD is 0010 0010 0101 (common practice).
    g = Graph()
    x, digits = double_dabble(g, 8)
    got = simulate(digits, {x.id: [225]})
    assert [lane[0] for lane in got] == [(0b0101, 0), (0b0010, 0), (0b0010, 0)]


@pytest.mark.parametrize("width", [1, 3, 4, 7, 10])
@pytest.mark.parametrize("builder", [double_dabble, division_by_ten])
def test_converters_give_the_decimal_digits_of_every_input(builder, width):
    g = Graph()
    x, digits = builder(g, width)
    count = len(str((1 << width) - 1))      # Python str: digits of the largest input
    assert len(digits) == digit_count(width) == count
    lanes = 1 << width
    results = Simulator(digits).run(lanes, {x.id: counting_planes(0, lanes, width)})
    per_digit = [unpack(r.value, lanes) for r in results]
    for value in range(lanes):
        assert [d[value] for d in per_digit] == _decimal_digits(value, count)


def test_buggy_converter_is_wrong_at_ten():
    g = Graph()
    x, digits = buggy_double_dabble(g, 6)
    got = simulate(digits, {x.id: [10, 4]})
    values = [[lane[j][0] for lane in got] for j in range(2)]
    assert values[0] != _decimal_digits(10, 2)   # 10 = 1010: a 5 is shifted without the +3
    assert values[1] == _decimal_digits(4, 2)


@pytest.mark.slow
@pytest.mark.parametrize("width", [16, 20])
def test_double_dabble_exhaustive(width):
    g = Graph()
    x, digits = double_dabble(g, width)
    simulator = Simulator(digits)
    chunk = 1 << 16
    for start in range(0, 1 << width, chunk):
        results = simulator.run(chunk, {x.id: counting_planes(start, chunk, width)})
        per_digit = [unpack(r.value, chunk) for r in results]
        for j in range(chunk):
            assert [d[j] for d in per_digit] == _decimal_digits(start + j, len(digits))


# a simulator extending another's lowering ------------------------------------------------------

def test_an_extending_simulator_agrees_with_evaluate_and_leaves_the_base_intact():
    # Reference: scalar evaluate() (from apply_op) lane by lane, two- and three-valued.
    g = Graph()
    rng = random.Random(11)
    x = g.input("scale_reading", 12)
    y = g.input("tare", 12)                  # a leaf only the extension's cone has
    u = g.free(12, "test: an unknown value")
    base_root = g.add(g.mul(x, g.const(5, 12)), u)
    base = Simulator([base_root], shareable=True)
    roots = [g.sub(base_root, y), g.xor(x, y), base_root]
    grown = Simulator(roots, extend=base)
    assert grown.leaves[:len(base.leaves)] == base.leaves
    assert {leaf.id for leaf in grown.leaves} == {x.id, y.id, u.id}
    lanes = 40
    vectors = [{x.id: rng.getrandbits(12), y.id: rng.getrandbits(12), u.id: rng.getrandbits(12)}
               for _ in range(lanes)]
    planes = {leaf.id: pack([v[leaf.id] for v in vectors], 12) for leaf in grown.leaves}
    results = grown.run(lanes, planes)
    for root, got in zip(roots, results):
        assert unpack(got.value, lanes) == [evaluate([root], v)[0] for v in vectors]
    (again,) = base.run(lanes, {leaf.id: planes[leaf.id] for leaf in base.leaves})
    assert unpack(again.value, lanes) == [evaluate([base_root], v)[0] for v in vectors]
    # u left unknown: x ^ y stays known, the rest depends on u
    known = grown.run(lanes, {x.id: planes[x.id], y.id: planes[y.id]})
    assert unpack(known[1].value, lanes) == [v[x.id] ^ v[y.id] for v in vectors]
    assert not any(known[1].unknown)
    assert known[0].unknown[0] == (1 << lanes) - 1     # bit 0 is x0 ^ u0 ^ y0: u0 unknown

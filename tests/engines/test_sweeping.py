"""The SAT-sweeping parts: the pair prover with cut points, and the sweep's merges.

Expected values: Python int arithmetic modulo 2**width (IEEE 1364-2005 clause 5.1.5 for
+ and *, 5.1.12 for shifts).
"""
from __future__ import annotations

from bcdprove.engines.base import PROVED, Budget
from bcdprove.engines.pair_prover import (PROVED as PAIR_PROVED, REFUTED, PairProver, bounded_cone,
                                             cone_shape)
from bcdprove.engines.sweeping import SweepingEngine
from bcdprove.model.design import Model, Port
from bcdprove.model.node import Graph, evaluate
from bcdprove.spec.equivalence import build_equivalence


def _times_ten(g: Graph, x):
    return g.mul(x, g.const(10, x.width))


def _shift_add_ten(g: Graph, x):
    return g.add(g.shl(x, g.const(3, 4)), g.shl(x, g.const(1, 4)))


def test_pair_prover_proves_ten_x_by_shifts():
    g = Graph()
    x = g.input("x", 12)
    outcome = PairProver().prove_equal(_times_ten(g, x), _shift_add_ten(g, x), Budget(60))
    assert outcome.status == PAIR_PROVED


def test_pair_prover_refutes_with_leaf_values_that_differ():
    g = Graph()
    x = g.input("x", 12)
    ten, nine = _times_ten(g, x), g.mul(x, g.const(9, 12))
    outcome = PairProver().prove_equal(ten, nine, Budget(60))
    assert outcome.status == REFUTED
    value = outcome.values[x.id]
    assert (10 * value) % 4096 != (9 * value) % 4096
    assert evaluate([ten, nine], {x.id: value}) == [(10 * value) % 4096, (9 * value) % 4096]


def test_one_prover_answers_queries_in_turn_over_shared_terms():
    # Queries without a cut point share the prover's translations: a proof, then a
    # refutation over the same node, then a query with a cut point over that node, then the
    # refutation again, each answered as alone (Python int arithmetic modulo 2**12).
    g = Graph()
    x = g.input("x", 12)
    ten = _times_ten(g, x)
    nine = g.mul(x, g.const(9, 12))
    prover = PairProver()
    assert prover.prove_equal(ten, _shift_add_ten(g, x), Budget(60)).status == PAIR_PROVED
    outcome = prover.prove_equal(ten, nine, Budget(60))
    assert outcome.status == REFUTED
    value = outcome.values[x.id]
    assert evaluate([ten, nine], {x.id: value}) == [(10 * value) % 4096, (9 * value) % 4096]
    assert (10 * value) % 4096 != (9 * value) % 4096
    a = g.xor(ten, g.const(5, 12))
    b = g.not_(g.xor(g.not_(ten), g.const(5, 12)))
    assert ten in bounded_cone([a, b], ("meet", 16))[1]
    assert prover.prove_equal(a, b, Budget(60)).status == PAIR_PROVED
    again = prover.prove_equal(ten, g.add(nine, g.const(1, 12)), Budget(60))
    assert again.status == REFUTED
    value = again.values[x.id]
    assert (10 * value) % 4096 != (9 * value + 1) % 4096


def test_a_cut_where_the_two_sides_meet_is_a_free_variable():
    g = Graph()
    x = g.input("x", 12)
    shared = _times_ten(g, x)
    a = g.xor(shared, g.const(5, 12))
    b = g.not_(g.xor(g.not_(shared), g.const(5, 12)))
    expanded, cuts = bounded_cone([a, b], ("meet", 16))
    assert shared in cuts and shared not in expanded
    assert PairProver().prove_equal(a, b, Budget(60)).status == PAIR_PROVED


def _model(g: Graph, name: str, ins: dict, outs: dict) -> Model:
    model = Model(g, name, [f"{name}.v"])
    for port, node in ins.items():
        model.ports.append(Port(port, "input", node.width, False, node))
    for port, node in outs.items():
        model.ports.append(Port(port, "output", node.width, False, node))
    return model


def test_sweep_merges_an_internal_pair_then_the_outputs_meet_structurally():
    ga, gb = Graph(), Graph()
    xa, za = ga.input("x", 12), ga.input("z", 12)
    xb, zb = gb.input("x", 12), gb.input("z", 12)
    a = _model(ga, "a", {"x": xa, "z": za}, {"y": ga.xor(_times_ten(ga, xa), za)})
    b = _model(gb, "b", {"x": xb, "z": zb}, {"y": gb.xor(_shift_add_ten(gb, xb), zb)})
    verdict = SweepingEngine().run(build_equivalence(a, b), Budget(120))
    assert verdict.status == PROVED
    sweep = verdict.stats["sweep"]
    assert sweep["proposed"] >= 1 and sweep["proved"] >= 1
    assert sweep["structural"] >= 1                  # the xor of merged arguments
    assert verdict.stats["outputs_proved"] == ["y"]


def test_the_miter_alone_agrees():
    from bcdprove.engines.sweeping import make_equivalence_engine

    ga, gb = Graph(), Graph()
    xa, xb = ga.input("x", 10), gb.input("x", 10)
    a = _model(ga, "a", {"x": xa}, {"y": _times_ten(ga, xa)})
    b = _model(gb, "b", {"x": xb}, {"y": _shift_add_ten(gb, xb)})
    verdict = make_equivalence_engine("miter").run(build_equivalence(a, b), Budget(120))
    assert verdict.status == PROVED
    assert "sweep" not in verdict.stats


def test_a_query_of_a_proved_shape_is_not_asked_again():
    # 10*x == (x<<3)+(x<<1) for x and for y: one formula up to the name of its variable.
    g = Graph()
    x, y = g.input("x", 12), g.input("y", 12)
    prover = PairProver()
    assert prover.prove_equal(_times_ten(g, x), _shift_add_ten(g, x), Budget(60)).status == PAIR_PROVED
    asked = prover.stats.queries
    assert prover.prove_equal(_times_ten(g, y), _shift_add_ten(g, y), Budget(60)).status == PAIR_PROVED
    assert prover.stats.queries == asked and prover.stats.shape_hits == 1
    # A different constant is a different shape: asked, and refuted (9*y != 10*y).
    outcome = prover.prove_equal(g.mul(y, g.const(9, 12)), _shift_add_ten(g, y), Budget(60))
    assert outcome.status == REFUTED and prover.stats.queries == asked + 1


def _add3_if_five_or_more(g: Graph, digit):
    # One double-dabble cell: a digit of 5 or more gets 3 added (4-bit arithmetic).
    return g.ite(g.ult(digit, g.const(5, 4)), digit, g.add(digit, g.const(3, 4)))


def _low_three(g: Graph, digit):
    # Another node for a digit of at most 3 (its two low bits survive "and 7"), so that the
    # two sides meet below the roots.
    return g.and_(digit, g.const(7, 4))


def test_a_query_shape_seen_satisfiable_with_cut_points_skips_that_limit():
    # m = x & 3 is at most 3, so the cell never adds 3 and the pair is equal (Python:
    # all((v & 3) < 5 and v & 3 == v & 3 & 7 for v in range(16))); cut at m (where both sides meet) the cell looks
    # able to fire, a spurious answer, and only the full cone proves it.  The second pair is
    # the same formula over another input: its cut query is known satisfiable by its shape.
    g = Graph()
    prover = PairProver()
    inputs = [g.input("x", 4), g.input("y", 4)]
    for value in (3, 5, 7):     # made first, so both pairs' operands come in one order
        g.const(value, 4)
    for leaf in inputs:
        m = g.and_(leaf, g.const(3, 4))
        outcome = prover.prove_equal(_add3_if_five_or_more(g, m), _low_three(g, m), Budget(60))
        assert outcome.status == PAIR_PROVED
    assert prover.stats.spurious == 2 and prover.stats.spurious_shape_hits == 1


def test_a_shape_known_satisfiable_under_cuts_is_still_asked_without_cuts():
    # The same formula over a real input has no cut point: it must be asked and refuted with
    # an input that replays (the cell adds 3 to 5..15 only; Python int arithmetic mod 16).
    g = Graph()
    prover = PairProver()
    x, _, z = g.input("x", 4), g.const(3, 4), g.input("z", 4)   # operand order as for m
    m = g.and_(x, g.const(3, 4))
    cut_only = prover.prove_equal(_add3_if_five_or_more(g, m), _low_three(g, m), Budget(60),
                                  limits=(("meet", 16),))
    assert cut_only.status != PAIR_PROVED and prover.stats.spurious == 1
    cone = bounded_cone([_add3_if_five_or_more(g, m), _low_three(g, m)], ("meet", 16))
    uncut = bounded_cone([_add3_if_five_or_more(g, z), _low_three(g, z)], None)
    assert cone[1] == [m] and uncut[1] == []
    assert (cone_shape([_add3_if_five_or_more(g, m), _low_three(g, m)], cone[0])
            == cone_shape([_add3_if_five_or_more(g, z), _low_three(g, z)], uncut[0]))
    outcome = prover.prove_equal(_add3_if_five_or_more(g, z), _low_three(g, z), Budget(60))
    assert outcome.status == REFUTED
    value = outcome.values[z.id]
    expected = (value + 3) % 16 if value >= 5 else value
    assert expected != value & 7
    assert evaluate([_add3_if_five_or_more(g, z), _low_three(g, z)], {z.id: value}) == [
        expected, value & 7]

"""The z3 translation means what evaluate() computes.

Reference values: ``evaluate`` (scalar, from apply_op) for random DAGs, checked through z3's
own ``simplify`` with the leaves replaced by constants; shift results from Python ints.
"""
from __future__ import annotations

import random

import pytest
import z3
from hypothesis import given, settings, strategies as st

from bcdprove.model.node import Graph, evaluate
from bcdprove.model.smt import Z3Encoder

from tests.support.converters import buggy_double_dabble, division_by_ten, double_dabble

from .random_dags import random_dag


def _value_by_z3(encoder: Z3Encoder, node, leaves, values) -> int:
    pairs = [(encoder.leaf(leaf), z3.BitVecVal(values[leaf.id], leaf.width, encoder.ctx))
             for leaf in leaves]
    term = z3.substitute(encoder.term(node), *pairs) if pairs else encoder.term(node)
    result = z3.simplify(term)
    assert z3.is_bv_value(result), result
    return result.as_long()


@settings(max_examples=60, deadline=None)
@given(seed=st.integers(0, 2**32 - 1), operations=st.integers(1, 12))
def test_terms_simplify_to_the_evaluated_value(seed, operations):
    rng = random.Random(seed)
    dag = random_dag(rng, operations=operations, max_width=130, free_leaves=1)
    values = {leaf.id: rng.getrandbits(leaf.width) for leaf in dag.leaves}
    expected = evaluate(dag.nodes, values)
    encoder = Z3Encoder(z3.Context())
    for node, value in zip(dag.nodes, expected):
        assert encoder.term(node).size() == node.width
        assert _value_by_z3(encoder, node, dag.leaves, values) == value, node


@pytest.mark.parametrize("op", ["shl", "lshr", "ashr"])
@pytest.mark.parametrize("amount_width", [1, 3, 8, 12])
def test_shift_amounts_narrower_and_wider_than_the_value(op, amount_width):
    g = Graph()
    a, s = g.input("a", 8), g.input("s", amount_width)
    node = getattr(g, op)(a, s)
    encoder = Z3Encoder(z3.Context())
    for value in (0b10110001, 0b01110110):
        for amount in sorted({0, 1, 7, 8, 9, 255, 256, 4095} & set(range(1 << amount_width))):
            signed = value - 256 if value >= 128 else value
            # Python int reference: amounts of 8 or more shift every bit out.
            expected = {"shl": (value << amount) % 256 if amount < 8 else 0,
                        "lshr": value >> amount,
                        "ashr": (signed >> amount) % 256}[op]
            got = _value_by_z3(encoder, node, [a, s], {a.id: value, s.id: amount})
            assert got == expected, (value, amount)


def test_adding_zero_is_proved_by_unsat_negation():
    g = Graph()
    x = g.input("x", 16)
    encoder = Z3Encoder(z3.Context())
    # y - y is a zero the graph does not fold, so the solver has to do the work.
    y = g.input("y", 16)
    total = g.add(x, g.sub(y, y))
    assert total is not x
    solver = z3.Solver(ctx=encoder.ctx)
    solver.add(encoder.term(total) != encoder.term(x))
    assert solver.check() == z3.unsat


def test_counterexample_values_come_back_by_node_id():
    g = Graph()
    x, f = g.input("x", 8), g.free(4, "test")
    encoder = Z3Encoder(z3.Context())
    solver = z3.Solver(ctx=encoder.ctx)
    solver.add(encoder.term(g.eq(x, g.const(200, 8))) == 1)
    assert solver.check() == z3.sat
    assert encoder.leaf_values(solver.model(), [x, f]) == {x.id: 200, f.id: 0}
    assert str(encoder.leaf(x)) == "in:x" and str(encoder.leaf(f)).startswith("free:")


def test_deep_chains_do_not_recurse():
    g = Graph()
    x = g.input("x", 8)
    node = x
    for k in range(6000):   # far deeper than Python's recursion limit
        node = g.add(g.xor(node, g.const(k & 255, 8)), g.const(1, 8))
    encoder = Z3Encoder(z3.Context())
    assert encoder.term(node).size() == 8


def _miter(builder, width):
    """One graph: ``builder``'s digits against repeated division by ten, on the same input."""
    g = Graph()
    x, digits = builder(g, width)
    _, reference = division_by_ten(g, width)
    assert g.input("x", width) is x        # both builders read the same input leaf
    differ = g.const(0, 1)
    for mine, theirs in zip(digits, reference):
        differ = g.or_(differ, g.ne(mine, theirs))
    return x, digits, differ


def test_shift_and_add_3_equals_division_by_ten_at_8_bits():
    x, _, differ = _miter(double_dabble, 8)
    encoder = Z3Encoder(z3.Context())
    solver = z3.Solver(ctx=encoder.ctx)
    solver.add(encoder.term(differ) == 1)
    assert solver.check() == z3.unsat


def test_wrong_threshold_gives_a_counterexample_that_replays():
    x, digits, differ = _miter(buggy_double_dabble, 8)
    encoder = Z3Encoder(z3.Context())
    solver = z3.Solver(ctx=encoder.ctx)
    solver.add(encoder.term(differ) == 1)
    assert solver.check() == z3.sat
    value = encoder.leaf_values(solver.model(), [x])[x.id]
    shown = evaluate(digits, {x.id: value})
    # Python str as the reference for the right digits.
    assert shown != [int(c) for c in reversed(str(value).zfill(3))]

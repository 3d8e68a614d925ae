"""Graph rewriting keeps meaning; hash-consing shares; apply_op matches reference code.

Reference values come from tests/model/random_dags.py ``reference_op``: Python int
arithmetic written from the Op comments, with division by zero as the SMT-LIB
FixedSizeBitVectors theory defines it.
"""
from __future__ import annotations

import random

from hypothesis import given, settings, strategies as st

from bcdprove.model.node import Graph, Op, apply_op, evaluate

from .random_dags import random_dag, reference_op, reference_values


@settings(max_examples=150, deadline=None)
@given(seed=st.integers(0, 2**32 - 1), operations=st.integers(1, 25))
def test_rewritten_graph_means_what_was_asked(seed, operations):
    rng = random.Random(seed)
    dag = random_dag(rng, operations=operations, max_width=130, free_leaves=1)
    values = {leaf.id: rng.getrandbits(leaf.width) for leaf in dag.leaves}
    expected = reference_values(dag, values)
    assert evaluate(dag.nodes, values) == expected


@settings(max_examples=300, deadline=None)
@given(op=st.sampled_from([Op.UDIV, Op.UREM, Op.SDIV, Op.SREM, Op.ADD, Op.SUB, Op.MUL,
                           Op.SHL, Op.LSHR, Op.ASHR, Op.ULT, Op.SLT, Op.EQ]),
       width=st.integers(1, 130), data=st.data())
def test_apply_op_agrees_with_reference(op, width, data):
    # Zero and the signed extremes are where division and shifts go wrong.
    special = st.sampled_from([0, 1, (1 << width) - 1, 1 << (width - 1), (1 << (width - 1)) - 1])
    value = st.one_of(special, st.integers(0, (1 << width) - 1))
    a, b = data.draw(value), data.draw(value)
    result_width = 1 if op in Op.COMPARE else width
    assert apply_op(op, result_width, (), [a, b], [width, width]) == \
        reference_op(op, result_width, (), [a, b], [width, width])


def test_division_by_zero_follows_smt_lib():
    # SMT-LIB FixedSizeBitVectors: bvudiv x 0 = all ones, bvurem x 0 = x,
    # bvsdiv x 0 = -1 for x >= 0 and 1 for x < 0, bvsrem x 0 = x.
    assert apply_op(Op.UDIV, 8, (), [37, 0], [8, 8]) == 255
    assert apply_op(Op.UREM, 8, (), [37, 0], [8, 8]) == 37
    assert apply_op(Op.SDIV, 8, (), [37, 0], [8, 8]) == 255
    assert apply_op(Op.SDIV, 8, (), [200, 0], [8, 8]) == 1
    assert apply_op(Op.SREM, 8, (), [200, 0], [8, 8]) == 200


def test_signed_division_truncates_toward_zero():
    # -7 / 2 = -3 remainder -1: truncation toward zero, remainder with the dividend's sign
    # (IEEE 1364-2005 5.1.5, clause number recalled from memory; Python reference:
    # int(-7 / 2) == -3 and math.fmod(-7, 2) == -1.0).
    assert apply_op(Op.SDIV, 8, (), [256 - 7, 2], [8, 8]) == 256 - 3
    assert apply_op(Op.SREM, 8, (), [256 - 7, 2], [8, 8]) == 256 - 1
    assert apply_op(Op.SREM, 8, (), [7, 256 - 2], [8, 8]) == 1


def test_same_arguments_give_the_same_node():
    g = Graph()
    x, y = g.input("x", 8), g.input("y", 8)
    assert g.add(x, y) is g.add(x, y)
    assert g.and_(x, y) is g.and_(y, x)           # commutative operands are ordered
    assert g.extract(g.add(x, y), 3, 0) is g.extract(g.add(x, y), 3, 0)
    assert g.input("x", 8) is x
    assert g.free(8, "a") is not g.free(8, "a")   # each free value is its own unknown


def test_simple_identities_fold_away():
    g = Graph()
    x = g.input("x", 8)
    assert g.xor(x, x) is g.zero(8)
    assert g.not_(g.not_(x)) is x
    assert g.concat(g.extract(x, 7, 4), g.extract(x, 3, 0)) is x
    assert g.add(g.const(3, 8), g.const(255, 8)).value == 2   # (3 + 255) mod 256

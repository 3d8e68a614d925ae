"""The bit form (model/bit_form.py) and the cone copy (model/combine.py) keep every node's meaning.

Reference values come from tests/model/random_dags.py ``reference_values`` (Python int code
written from the operator comments and SMT-LIB, independent of ``apply_op``).
"""
from __future__ import annotations

import random

import pytest

from bcdprove.model.bit_form import BitForm
from bcdprove.model.combine import transplant
from bcdprove.model.node import Graph, Op, evaluate, topological

from .random_dags import random_dag, reference_values


def _bit_forms(graph, nodes):
    form = BitForm(graph)
    bits = {}
    for node in topological(nodes):
        if node.op in Op.LEAVES:
            bits[node.id] = form.leaf(node)
        else:
            bits[node.id] = form.apply(node, [bits[a.id] for a in node.args])
    return form, bits


@pytest.mark.parametrize("seed", range(40))
def test_bit_form_word_means_the_node(seed):
    rng = random.Random(seed)
    dag = random_dag(rng, operations=14, max_width=40, free_leaves=1)
    form, bits = _bit_forms(dag.graph, dag.nodes)
    words = [form.word(bits[n.id]) for n in dag.nodes]
    for _ in range(4):
        values = {leaf.id: rng.getrandbits(leaf.width) for leaf in dag.leaves}
        expected = reference_values(dag, values)
        assert evaluate(words, values) == expected


def test_bit_form_folds_a_patch_chain_to_the_digit_cell():
    # A digit read back through patches of other digits is the digit itself: ite(c, v, v) = v
    # (IEEE 1364-2005 clause 5.1.13: both branches equal, the condition does not matter).
    g = Graph()
    work = g.input("work", 12)
    c = g.input("c", 1)
    patched = g.ite(c, work, g.concat(g.extract(work, 11, 8), g.const(0, 4), g.extract(work, 3, 0)))
    form, bits = _bit_forms(g, [patched])
    top = form.word(bits[patched.id][8:12])
    assert top is g.extract(work, 11, 8)


@pytest.mark.parametrize("seed", range(20))
def test_transplant_keeps_values_and_pairs_unknowns(seed):
    rng = random.Random(100 + seed)
    dag = random_dag(rng, operations=12, max_width=40, free_leaves=2)
    target = Graph()
    leaf_map = {leaf.id: target.input(f"t{k}", leaf.width)
                for k, leaf in enumerate(dag.input_leaves)}
    copy = transplant(target, dag.nodes, leaf_map)
    values = {leaf.id: rng.getrandbits(leaf.width) for leaf in dag.leaves}
    copied_values = {leaf_map[i].id: v for i, v in values.items() if i in leaf_map}
    for original, fresh in copy.free_pairs:
        assert fresh.op == Op.FREE and fresh.width == original.width
        copied_values[fresh.id] = values[original.id]
    assert evaluate(copy.roots, copied_values) == reference_values(dag, values)


def test_transplant_refuses_an_unmapped_input():
    g = Graph()
    node = g.add(g.input("a", 4), g.input("b", 4))
    with pytest.raises(KeyError, match="input:b"):
        transplant(Graph(), [node], {g.input("a", 4).id: Graph().input("a", 4)})

"""Tests of the input alone in the step to the outputs, decided over the checked range.

A wrapper around a converter often tests the input itself: saturation (``count > LIMIT``
shows all nines), a short path for small values, an overflow flag.  In the step to the
outputs such a test reads input bits beside the stage digits, and relating the two is the
whole conversion again (the refinement in the engine excludes one prefix value per solver
call: hopeless for a 64-bit comparator).  When the check is restricted to
``x <= max_input``, a 1-bit test that takes one value over that whole range is proved to,
by a query over the input bits alone (a comparator is easy for z3), and replaced by that
value; the step then reads the digits only.

Sound only where the obligation is itself restricted to that range: the engine uses it in
the step to the outputs, never in the stages, which hold for every input.
"""
from __future__ import annotations

from typing import Optional

from ...model.node import Graph, Node, Op, evaluate, leaves, substitute, topological
from . import obligations as outcomes
from .cuts import input_bit_leaf


def _is_input_bit(node: Node) -> bool:
    return node.op == Op.INPUT and node.width == 1 and node.params[0].startswith("b")


def input_tests(bad: Node) -> list[Node]:
    """The 1-bit nodes of ``bad``'s cone that read input bits only, each read by a node that
    reads something else too (the outermost such tests)."""
    pure: dict[int, bool] = {}
    reads_input: dict[int, bool] = {}
    tests: dict[int, Node] = {}
    for node in topological([bad]):
        if node.op == Op.CONST:
            pure[node.id], reads_input[node.id] = True, False
        elif node.op in Op.LEAVES:
            pure[node.id] = reads_input[node.id] = _is_input_bit(node)
        else:
            pure[node.id] = all(pure[a.id] for a in node.args)
            reads_input[node.id] = any(reads_input[a.id] for a in node.args)
            if not pure[node.id]:
                for arg in node.args:
                    if (pure[arg.id] and reads_input[arg.id] and arg.width == 1
                            and arg.op not in Op.LEAVES):
                        tests[arg.id] = arg
    return list(tests.values())


def fold_input_tests(cone: Graph, bad: Node, width: int, stage: int, max_input: int,
                     solver, timeout: Optional[float]) -> Node:
    """``bad`` with every input test that is constant over ``0 .. max_input`` replaced by
    its value (proved by ``solver``; an unproved test is left as it was)."""
    tests = input_tests(bad)
    if not tests:
        return bad
    x = cone.concat(*[input_bit_leaf(cone, width, stage, i) for i in range(width - 1, -1, -1)])
    in_range = cone.ule(x, cone.const(max_input, width))
    mapping: dict[int, Node] = {}
    for test in tests:
        at_zero = evaluate([test], {leaf.id: 0 for leaf in leaves([test])})[0]  # 0 is in range
        value = cone.const(at_zero, 1)
        outcome = solver.check(cone.and_(in_range, cone.ne(test, value)),
                               f"input test {test!r} is {at_zero} for x <= {max_input}", timeout)
        if outcome.status == outcomes.PROVED:
            mapping[test.id] = value
    if not mapping:
        return bad
    return substitute(cone, [bad], mapping)[0]

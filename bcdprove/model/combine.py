"""Copying a cone of one graph into another, so that two designs can share their inputs.

Two designs are read independently (each with its own :class:`Graph`, so module names, net
names and register names of one never meet the other's).  To compare them, both cones are
copied into one graph with :func:`transplant`: input leaves are replaced by the leaves the
caller maps them to (the shared inputs), every unknown value becomes a fresh unknown value of
the target graph (the unknowns of two designs are independent), and every operator node is
rebuilt by the target graph, whose hash-consing then merges whatever the two cones have in
common structurally.
"""
from __future__ import annotations

from typing import Mapping, Sequence

from .node import Graph, Node, Op, topological

__all__ = ["Transplant", "transplant"]


class Transplant:
    """The result of one copy: ``roots`` rebuilt in the target graph, and the leaf pairing.

    ``nodes`` maps a source node id to its copy; ``free_pairs`` lists, for every unknown value
    of the cone, ``(source leaf, target leaf)``, so a choice of unknown values in the target
    graph can be read back as a choice in the source design (and so replayed on it).
    """

    def __init__(self, roots: list[Node], nodes: dict[int, Node],
                 free_pairs: list[tuple[Node, Node]]):
        self.roots = roots
        self.nodes = nodes
        self.free_pairs = free_pairs


def transplant(target: Graph, roots: Sequence[Node], leaf_map: Mapping[int, Node]) -> Transplant:
    """Copy the cone of ``roots`` into ``target``.

    ``leaf_map`` maps the id of every INPUT and STATE leaf of the cone to the target node that
    stands for it (same width).  FREE leaves become fresh ``target.free`` leaves with the same
    reason.  A leaf of the cone missing from ``leaf_map`` raises KeyError naming it; a width
    mismatch raises ValueError.  The copy means exactly what the source meant: the target's
    rewriting only applies identities.
    """
    copies: dict[int, Node] = {}
    free_pairs: list[tuple[Node, Node]] = []
    for node in topological(roots):
        if node.op == Op.CONST:
            copy = target.const(node.value, node.width)
        elif node.op == Op.FREE:
            copy = target.free(node.width, node.params[1])
            free_pairs.append((node, copy))
        elif node.op in Op.LEAVES:
            if node.id not in leaf_map:
                raise KeyError(f"no target for leaf {node!r}")
            copy = leaf_map[node.id]
            if copy.width != node.width:
                raise ValueError(f"leaf {node!r} mapped to {copy!r} of another width")
        else:
            args = [copies[a.id] for a in node.args]
            if node.op in (Op.ZEXT, Op.SEXT):
                copy = target.op(node.op, *args, params=(node.width,))
            else:
                copy = target.op(node.op, *args, params=node.params)
        copies[node.id] = copy
    return Transplant([copies[r.id] for r in roots], copies, free_pairs)

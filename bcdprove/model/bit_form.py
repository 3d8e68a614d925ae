"""A bit form of words: wiring taken apart into single bits, arithmetic kept as words.

A design that keeps its digits in one wide register (``work[W+4*k +: 4] = ...`` inside a
loop) builds a chain of wide ITE and CONCAT nodes, each patching one digit; as a node, a digit
read back from the end of the chain depends on the whole chain, while a design with one
register per digit has small, separate cells.  In the bit form both become the same small
nodes: every word is a list of 1-bit nodes, least significant first, and the operators that
only route or select bits (concatenation, slices, shifts by a constant, extensions, bitwise
logic, ITE) act bit by bit, so ``ite(c, v, v)`` folds for every bit a patch does not touch.
Arithmetic and comparisons stay word operators, applied to the concatenation of their
arguments' bits; two designs that compute a digit with the same cell then share that node.

Every step is an identity on bit-vectors (the meaning of ``apply_op``) for every value of the
leaves, so the word rebuilt from a bit form means exactly what the original node meant.
"""
from __future__ import annotations

from typing import Sequence

from .node import Graph, Node, Op

__all__ = ["BitForm"]

_BITWISE = frozenset({Op.AND, Op.OR, Op.XOR})


class BitForm:
    """Builds bit forms of nodes in ``graph`` from the bit forms of their arguments."""

    def __init__(self, graph: Graph):
        self.graph = graph

    def word(self, bits: Sequence[Node]) -> Node:
        """The word whose bits (least significant first) are ``bits``."""
        if len(bits) == 1:
            return bits[0]
        return self.graph.concat(*reversed(bits))

    def leaf(self, node: Node) -> list[Node]:
        """The bits of a leaf or constant of ``graph``."""
        graph = self.graph
        if node.op == Op.CONST:
            return [graph.const(node.value >> i & 1, 1) for i in range(node.width)]
        return [graph.extract(node, i, i) for i in range(node.width)]

    def of_word(self, node: Node) -> list[Node]:
        """The bits of a word node of ``graph``: each a slice of it (constants: constant bits)."""
        if node.op == Op.CONST:
            return self.leaf(node)
        if node.op == Op.CONCAT:
            bits: list[Node] = []
            for part in reversed(node.args):
                bits.extend(self.of_word(part))
            return bits
        return [self.graph.extract(node, i, i) for i in range(node.width)]

    def apply(self, node: Node, args: Sequence[list[Node]]) -> list[Node]:
        """The bits of ``node`` (an operator node of any graph) with its arguments' bit forms
        ``args`` (in ``graph``)."""
        graph = self.graph
        op, width = node.op, node.width
        zero = graph.const(0, 1)
        if op == Op.CONCAT:
            bits: list[Node] = []
            for part in reversed(args):
                bits.extend(part)
            return bits
        if op == Op.EXTRACT:
            hi, lo = node.params
            return list(args[0][lo:hi + 1])
        if op == Op.ZEXT:
            return list(args[0]) + [zero] * (width - len(args[0]))
        if op == Op.SEXT:
            return list(args[0]) + [args[0][-1]] * (width - len(args[0]))
        if op == Op.NOT:
            return [graph.not_(b) for b in args[0]]
        if op in _BITWISE:
            return [graph.op(op, a, b) for a, b in zip(args[0], args[1])]
        if op == Op.ITE:
            cond = args[0][0]
            return [graph.ite(cond, a, b) for a, b in zip(args[1], args[2])]
        if op in Op.SHIFTS and all(b.op == Op.CONST for b in args[1]):
            amount = sum(b.value << i for i, b in enumerate(args[1]))
            source = args[0]
            if op == Op.SHL:
                return ([zero] * min(amount, width) + list(source))[:width]
            fill = zero if op == Op.LSHR else source[-1]
            return (list(source[amount:]) + [fill] * width)[:width]
        # Arithmetic and comparisons: one word node over the words of the arguments.
        words = [self.word(a) for a in args]
        if op in (Op.ZEXT, Op.SEXT):
            result = graph.op(op, *words, params=(width,))
        else:
            result = graph.op(op, *words, params=node.params)
        return self.of_word(result)

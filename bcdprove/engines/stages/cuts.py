"""Cutting a design's logic at a stage: rebuild a cone with the stage's signals as fresh leaves.

A *cut* at stage ``s`` says, for some design nodes, what each of their bits is known to be:
a bit of digit ``j`` of ``P_s`` (:class:`DigitBit`), a bit of the input ``x``
(:class:`InputBit`) or a constant (:class:`ConstBit`); bits with no such fact keep their own
logic.  :class:`ConeBuilder` copies the logic that computes a slice of a later node into a
private *cone graph*, stopping at the cut nodes (and at the nodes of every earlier proved
stage).  The copy only follows the bits a slice needs (extracts are pushed through
concatenation, extension, bitwise operators, multiplexers, constant shifts and the low bits
of additions; chains of single-digit updates of one register are jumped over), so the cone
of one digit stays the size of one digit's cells however wide the registers around it are.

Soundness: a cut node is replaced only by what its proved facts say it is, so the copy
equals the original for every input on which those facts hold, which is every input.

Leaves of the cone graph are named relative to the stage, so every stage of a loop builds the
very same nodes: ``d{j}`` (4 bits) is digit ``j`` of the stage, ``b{o}`` (1 bit) is input bit
``x[W - s - 1 - o]`` (``b0`` is the next bit to shift in), ``e{k}_{j}`` digit ``j`` of the
proved stage ``k`` steps earlier (older stages stop the copy too: their facts are proved),
``free{id}_{i}`` bit ``i`` of the design's unknown value node ``id``, ``in{id}_{i}``
bit ``i`` of another input leaf.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Optional, Union

from ...model.node import Graph, Node, Op, mask


@dataclass(frozen=True)
class DigitBit:
    digit: int
    bit: int
    negated: bool = False      # the design holds the complement of this digit bit


@dataclass(frozen=True)
class InputBit:
    index: int      # bit of x


@dataclass(frozen=True)
class ConstBit:
    value: int


Fact = Union[DigitBit, InputBit, ConstBit, None]


class NotACut(Exception):
    """The cone reached too far past the cut: the stage signals do not separate it."""


@dataclass
class Cut:
    """What is known at one stage: per cut node (by id), one fact (or None) per bit."""

    stage: int
    digits: int                               # digits of P_s that may be non-zero
    facts: dict[int, list]                    # node id -> [Fact per bit, bit 0 first]

    @staticmethod
    def empty() -> "Cut":
        return Cut(stage=0, digits=0, facts={})


def digit_leaf(cone: Graph, digit: int, distance: int = 0) -> Node:
    """Digit ``digit`` of the current stage, or of the stage ``distance`` steps before it."""
    return cone.input(f"d{digit}" if distance == 0 else f"e{distance}_{digit}", 4)


def input_bit_leaf(cone: Graph, width: int, stage: int, index: int) -> Node:
    """The leaf for ``x[index]``, named by its distance below the stage's last bit."""
    return cone.input(f"b{width - stage - 1 - index}", 1)


class ConeBuilder:
    """Copies slices of design nodes into ``cone``, with the nodes of ``cut`` replaced.

    ``limit`` bounds the number of distinct slices copied; past it :class:`NotACut` is
    raised, because a cone that large means the copy ran back past the stage signals.
    """

    def __init__(self, cone: Graph, x: Node, width: int, cut: Cut,
                 owners: Optional[dict[int, Cut]] = None,
                 zero_test: Optional[Callable[["ConeBuilder", Node], bool]] = None,
                 limit: int = 200_000):
        self.cone = cone
        self.x = x
        self.width = width
        self.cut = cut
        self.limit = limit
        self.zero_test = zero_test
        # Every proved stage's nodes stop the copy (node id -> its newest proved cut), not
        # only the current one: their facts are proved, so reading them as fresh digits is sound.
        self._owners = owners if owners is not None else {n: cut for n in cut.facts}
        self._memo: dict[tuple[int, int, int], Node] = {}
        self._through: dict[int, Optional[tuple[Node, int, int]]] = {}
        self.replaced: dict[int, Node] = {}      # design node id -> whole cone-graph value

    def replace(self, node: Node, value: Node) -> None:
        """Stop the copy at ``node``, whose value is ``value`` (a cone-graph node)."""
        if value.width != node.width:
            raise ValueError(f"replacement of {node!r} has width {value.width}")
        self.replaced[node.id] = value

    # public --------------------------------------------------------------------------------
    def whole(self, node: Node) -> Node:
        return self.slice(node, node.width - 1, 0)

    def slice(self, node: Node, hi: int, lo: int) -> Node:
        """The cone-graph node equal to ``node[hi:lo]`` given the cut's facts."""
        key = (node.id, hi, lo)
        found = self._memo.get(key)
        if found is None:
            if len(self._memo) >= self.limit:
                raise NotACut(f"the cone grew past {self.limit} slices")
            if (self.zero_test is not None and node.id not in self._owners
                    and node.op not in Op.LEAVES and self.zero_test(self, node)):
                found = self.cone.zero(hi - lo + 1)
            else:
                found = self._build(node, hi, lo)
            self._memo[key] = found
        return found

    # private ---------------------------------------------------------------------------------
    def _bits(self, make, hi: int, lo: int) -> Node:
        """Concatenate single-bit nodes ``make(i)`` for i = hi down to lo."""
        return self.cone.concat(*[make(i) for i in range(hi, lo - 1, -1)])

    def build_plain(self, node: Node) -> Node:
        """The whole of ``node`` copied from its arguments (no zero test on ``node`` itself)."""
        return self._build(node, node.width - 1, 0)

    def _cut_bit(self, node: Node, owner: Cut, distance: int, i: int) -> Node:
        fact = owner.facts[node.id][i]
        cone = self.cone
        if isinstance(fact, DigitBit):
            bit = cone.extract(digit_leaf(cone, fact.digit, distance), fact.bit, fact.bit)
            return cone.not_(bit) if fact.negated else bit
        if isinstance(fact, InputBit):
            return input_bit_leaf(cone, self.width, self.cut.stage, fact.index)
        if isinstance(fact, ConstBit):
            return cone.const(fact.value, 1)
        # No fact for this bit: copy its own logic (the node may hold facts only in part,
        # e.g. a part of a stage register that the facts were spread to).
        key = (node.id, i, -1 - i)
        found = self._memo.get(key)
        if found is None:
            found = self._memo[key] = self._define(node, i, i)
        return found

    def _leaf_bit(self, node: Node, i: int) -> Node:
        if node is self.x:
            return input_bit_leaf(self.cone, self.width, self.cut.stage, i)
        if node.op == Op.FREE:
            return self.cone.input(f"free{node.id}_{i}", 1)
        return self.cone.input(f"in{node.id}_{i}", 1)

    def _build(self, node: Node, hi: int, lo: int) -> Node:
        if node.id in self.replaced:
            return self.cone.extract(self.replaced[node.id], hi, lo)
        # A chain of single-digit updates of one wide register passes every other bit
        # through unchanged: jump down the chain to the update that touches [hi:lo] (or
        # to a cut node), instead of copying each level.
        while node.id not in self._owners and node.id not in self.replaced:
            through = self._pass_through(node)
            if through is None:
                break
            low, high = through[1], through[2]
            if hi < low or lo > high:
                node = through[0]
                continue
            if lo < low or hi > high:
                # Wider than the update: split at its edges so each side can jump on.
                parts = []
                if hi > high:
                    parts.append(self.slice(node, hi, high + 1))
                parts.append(self.slice(node, min(hi, high), max(lo, low)))
                if lo < low:
                    parts.append(self.slice(node, low - 1, lo))
                return self.cone.concat(*parts)
            break
        if node.id in self.replaced:
            return self.cone.extract(self.replaced[node.id], hi, lo)
        if (node.id, hi, lo) in self._memo:
            return self._memo[(node.id, hi, lo)]
        owner = self._owners.get(node.id)
        if owner is not None and owner.stage <= self.cut.stage:
            return self._cut_slice(node, owner, self.cut.stage - owner.stage, hi, lo)
        return self._define(node, hi, lo)

    def _cut_slice(self, node: Node, owner: Cut, distance: int, hi: int, lo: int) -> Node:
        """A cut node's slice from its facts, in runs: a digit's bits as one slice of its
        leaf, constant bits as one constant (most significant part first)."""
        cone = self.cone
        facts = owner.facts[node.id]
        parts: list[Node] = []
        i = hi
        while i >= lo:
            fact = facts[i]
            j = i
            if isinstance(fact, DigitBit) and not fact.negated:
                while (j - 1 >= lo and isinstance(facts[j - 1], DigitBit)
                       and facts[j - 1].digit == fact.digit and not facts[j - 1].negated
                       and facts[j - 1].bit == facts[j].bit - 1):
                    j -= 1
                leaf = digit_leaf(cone, fact.digit, distance)
                parts.append(cone.extract(leaf, fact.bit, facts[j].bit))
            elif isinstance(fact, ConstBit):
                value = fact.value
                while j - 1 >= lo and isinstance(facts[j - 1], ConstBit):
                    j -= 1
                    value = (value << 1) | facts[j].value
                parts.append(cone.const(value, i - j + 1))
            else:
                parts.append(self._cut_bit(node, owner, distance, i))
            i = j - 1
        return cone.concat(*parts)

    def _pass_through(self, node: Node) -> Optional[tuple[Node, int, int]]:
        """``(source, low, high)`` when ``node`` equals ``source`` outside bits high..low.

        Recognised: a concatenation of aligned slices of one source around new bits, and a
        multiplexer between such a concatenation and its source."""
        if node.id in self._through:
            return self._through[node.id]
        found = None
        if node.op == Op.CONCAT:
            found = _concat_through(node)
        elif node.op == Op.ITE:
            then, other = node.args[1], node.args[2]
            for updated, source in ((then, other), (other, then)):
                inner = _concat_through(updated) if updated.op == Op.CONCAT else None
                if inner is not None and inner[0] is source:
                    found = inner
                    break
        self._through[node.id] = found
        return found

    def _define(self, node: Node, hi: int, lo: int) -> Node:
        """``node[hi:lo]`` from the node's own operator and arguments."""
        cone = self.cone
        width = hi - lo + 1
        op = node.op
        if op == Op.CONST:
            return cone.const((node.value >> lo) & mask(width), width)
        if op in Op.LEAVES:
            return self._bits(lambda i: self._leaf_bit(node, i), hi, lo)
        args = node.args
        if op == Op.EXTRACT:
            base = node.params[1]
            return self.slice(args[0], base + hi, base + lo)
        if op == Op.CONCAT:
            parts = []
            offset = node.width
            for part in args:
                offset -= part.width
                top, bottom = offset + part.width - 1, offset
                if bottom > hi or top < lo:
                    continue
                parts.append(self.slice(part, min(hi, top) - offset, max(lo, bottom) - offset))
            return cone.concat(*parts)
        if op in (Op.ZEXT, Op.SEXT):
            inner = args[0]
            if hi < inner.width:
                return self.slice(inner, hi, lo)
            if op == Op.ZEXT:
                if lo >= inner.width:
                    return cone.zero(width)
                return cone.concat(cone.zero(hi - inner.width + 1), self.slice(inner, inner.width - 1, lo))
            sign = self.slice(inner, inner.width - 1, inner.width - 1)
            low = [] if lo >= inner.width else [self.slice(inner, inner.width - 1, lo)]
            return cone.concat(*([sign] * (hi - max(lo, inner.width) + 1) + low))
        if op in (Op.NOT, Op.AND, Op.OR, Op.XOR):
            return cone.op(op, *[self.slice(a, hi, lo) for a in args])
        if op == Op.ITE:
            return cone.ite(self.slice(args[0], 0, 0), self.slice(args[1], hi, lo),
                            self.slice(args[2], hi, lo))
        if op in (Op.ADD, Op.SUB, Op.MUL, Op.NEG):
            # Low result bits depend only on low argument bits.
            low = cone.op(op, *[self.slice(a, hi, 0) for a in args])
            return cone.extract(low, hi, lo)
        if op in Op.SHIFTS and args[1].op == Op.CONST:
            return self._constant_shift(node, args[1].value, hi, lo)
        full = cone.op(op, *[self.whole(a) for a in args], params=node.params)
        return cone.extract(full, hi, lo)

    def _constant_shift(self, node: Node, amount: int, hi: int, lo: int) -> Node:
        cone = self.cone
        source = node.args[0]
        top = node.width - 1
        amount = min(amount, node.width)
        if node.op == Op.SHL:
            # bit i of the result is source[i - amount], zero below amount
            if hi < amount:
                return cone.zero(hi - lo + 1)
            if lo >= amount:
                return self.slice(source, hi - amount, lo - amount)
            return cone.concat(self.slice(source, hi - amount, 0), cone.zero(amount - lo))
        # right shifts: bit i is source[i + amount]; past the top, zero or the sign
        fill_bit = None if node.op == Op.LSHR else self.slice(source, top, top)
        inside_hi = min(hi, top - amount)
        parts = []
        if hi > inside_hi:
            count = hi - max(lo, inside_hi + 1) + 1
            parts.append(cone.zero(count) if fill_bit is None else cone.concat(*[fill_bit] * count))
        if inside_hi >= lo:
            parts.append(self.slice(source, inside_hi + amount, lo + amount))
        return cone.concat(*parts)


def _concat_through(node: Node) -> Optional[tuple[Node, int, int]]:
    """For ``concat(s[a:b], new, s[c:d])`` with every slice of ``s`` at its own offset:
    ``(s, low, high)`` of the bits that differ from ``s``; None otherwise."""
    source = None
    low, high = node.width, -1
    offset = node.width
    for part in node.args:
        offset -= part.width
        top = offset + part.width - 1
        if (part.op == Op.EXTRACT and part.params[1] == offset
                and (source is None or part.args[0] is source)
                and part.args[0].width == node.width):
            source = part.args[0]
            continue
        low, high = min(low, offset), max(high, top)
    if source is None or high < 0:
        return None
    return source, low, high

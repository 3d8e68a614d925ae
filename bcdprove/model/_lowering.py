"""Lowering word operators of the model to bit gates of a :class:`BitNetlist`.

Each word becomes a list of bit signals, least significant first.  The lowering follows
:func:`bcdprove.model.node.apply_op` operator by operator: ripple adders, comparator chains,
re-indexing for constant shifts and structure, barrel muxes for variable shifts,
shift-and-add multiplication and restoring division (which by itself gives the SMT-LIB
results for a zero divisor: quotient all ones, remainder the dividend).
"""
from __future__ import annotations

from typing import Sequence

from ._bitnet import FALSE, TRUE, BitNetlist
from .node import Node, Op

Bits = list[int]


def lower(net: BitNetlist, order: Sequence[Node], leaf_index: dict[int, int],
          done: dict[int, Bits] | None = None) -> dict[int, Bits]:
    """Bits of every node of ``order`` (topological: each node after its arguments, or
    after its arguments appear in ``done``, the bits of nodes lowered before into ``net``).

    Leaf ``n`` loads its planes from leaf number ``leaf_index[n.id]``.  Returns a new dict
    holding ``done``'s entries and those of ``order``.
    """
    bits: dict[int, Bits] = dict(done) if done else {}
    for node in order:
        if node.op == Op.CONST:
            value = node.value
            bits[node.id] = [TRUE if value >> i & 1 else FALSE for i in range(node.width)]
        elif node.op in Op.LEAVES:
            k = leaf_index[node.id]
            bits[node.id] = [net.load(k, i) for i in range(node.width)]
        else:
            bits[node.id] = _lower_operator(net, node, [bits[a.id] for a in node.args])
    return bits


def _lower_operator(net: BitNetlist, node: Node, args: list[Bits]) -> Bits:
    op, width = node.op, node.width
    if op == Op.NOT:
        return [net.not_(a) for a in args[0]]
    if op == Op.AND:
        return [net.and_(a, b) for a, b in zip(*args)]
    if op == Op.OR:
        return [net.or_(a, b) for a, b in zip(*args)]
    if op == Op.XOR:
        return [net.xor(a, b) for a, b in zip(*args)]
    if op == Op.NEG:
        return negate(net, args[0])
    if op == Op.ADD:
        return add(net, args[0], args[1])[0]
    if op == Op.SUB:
        return subtract(net, args[0], args[1])[0]
    if op == Op.MUL:
        return multiply(net, args[0], args[1])
    if op == Op.UDIV:
        return divide(net, args[0], args[1])[0]
    if op == Op.UREM:
        return divide(net, args[0], args[1])[1]
    if op in (Op.SDIV, Op.SREM):
        return _signed_divide(net, op, args[0], args[1])
    if op in Op.SHIFTS:
        return shift(net, op, args[0], args[1])
    if op == Op.EQ:
        return [net.not_(net.any_([net.xor(a, b) for a, b in zip(*args)]))]
    if op == Op.ULT:
        return [less_than(net, args[0], args[1], signed=False)]
    if op == Op.SLT:
        return [less_than(net, args[0], args[1], signed=True)]
    if op == Op.CONCAT:
        out: Bits = []
        for part in reversed(args):
            out.extend(part)
        return out
    if op == Op.EXTRACT:
        hi, lo = node.params
        return args[0][lo:hi + 1]
    if op == Op.ZEXT:
        return args[0] + [FALSE] * (width - len(args[0]))
    if op == Op.SEXT:
        return args[0] + [args[0][-1]] * (width - len(args[0]))
    if op == Op.ITE:
        return select(net, args[0][0], args[1], args[2])
    raise ValueError(f"operator {op!r} cannot be simulated")


def select(net: BitNetlist, condition: int, then: Bits, other: Bits) -> Bits:
    """Bitwise ``condition ? then : other``.

    A part of a wide register written under a condition (``if (..) work[4*j +: 4] = ..``)
    is an ITE of the whole register whose sides differ in a few bits only.  The equal
    prefix and suffix are found by bisection on list slices (compared in C) and copied;
    only the bits between them get a multiplexer, so lowering such a chain costs per
    update what the update changes, not the register's width in Python steps.
    """
    width = len(then)
    mux = net.mux
    if width <= 32:                 # bisection does not pay for itself on narrow words
        return [t if t == e else mux(condition, t, e) for t, e in zip(then, other)]
    low = _agreeing(then, other, range(width))
    if low == width:
        return list(other)
    high = width - _agreeing(then, other, range(width - 1, low - 1, -1))
    middle = [t if t == e else mux(condition, t, e)
              for t, e in zip(then[low:high], other[low:high])]
    return other[:low] + middle + other[high:]


def _agreeing(a: Bits, b: Bits, positions: range) -> int:
    """How many of ``positions`` (walked in order) ``a`` and ``b`` agree on before the
    first difference, by bisection over slices."""
    def same(start: int, stop: int) -> bool:      # positions[start:stop] agree
        window = positions[start:stop]
        if not window:
            return True
        first, last = window[0], window[-1]
        if first <= last:
            return a[first:last + 1] == b[first:last + 1]
        return a[last:first + 1] == b[last:first + 1]

    count = len(positions)
    if same(0, count):
        return count
    good, bad = 0, count          # positions[:good] agree; positions[:bad] do not
    while bad - good > 1:
        middle = (good + bad) // 2
        if same(good, middle):
            good = middle
        else:
            bad = middle
    return good


def add(net: BitNetlist, a: Bits, b: Bits, carry: int = FALSE) -> tuple[Bits, int]:
    """Ripple-carry sum of equal-width ``a`` and ``b`` plus ``carry``; returns (sum, carry out)."""
    out = []
    for x, y in zip(a, b):
        half = net.xor(x, y)
        out.append(net.xor(half, carry))
        # Carry out is the carry in where x and y differ, else their common value.
        carry = net.mux(half, carry, x)
    return out, carry


def subtract(net: BitNetlist, a: Bits, b: Bits) -> tuple[Bits, int]:
    """``a - b`` modulo the width; the carry out is 1 exactly when ``a >= b``."""
    return add(net, a, [net.not_(y) for y in b], TRUE)


def negate(net: BitNetlist, a: Bits) -> Bits:
    return subtract(net, [FALSE] * len(a), a)[0]


def less_than(net: BitNetlist, a: Bits, b: Bits, signed: bool) -> int:
    """1 where ``a < b``: decided by the most significant bit where they differ."""
    less = FALSE
    top = len(a) - 1
    for i, (x, y) in enumerate(zip(a, b)):
        differ = net.xor(x, y)
        # Of two different sign bits, the set one is the negative, smaller number.
        less = net.mux(differ, x if signed and i == top else y, less)
    return less


def multiply(net: BitNetlist, a: Bits, b: Bits) -> Bits:
    """Product modulo the width, shift-and-add over the bits of one factor."""
    width = len(a)
    # Walk the factor with more constant-zero bits: each such bit costs nothing.
    if sum(x == FALSE for x in a) > sum(y == FALSE for y in b):
        a, b = b, a
    total = [FALSE] * width
    for i, y in enumerate(b):
        if y == FALSE:
            continue
        partial = [net.and_(x, y) for x in a[:width - i]]
        high, _ = add(net, total[i:], partial)
        total = total[:i] + high
    return total


def divide(net: BitNetlist, a: Bits, b: Bits) -> tuple[Bits, Bits]:
    """Unsigned restoring division: (quotient, remainder), SMT-LIB results for ``b == 0``.

    The partial remainder after ``k`` dividend bits is below ``2**k``, and below ``b`` when
    ``b`` is a nonzero constant, so it is kept only that wide; the wider part of ``b`` then
    only matters through "is any of it set".
    """
    width = len(a)
    keep = width
    if all(y in (FALSE, TRUE) for y in b):
        constant = sum(1 << i for i, y in enumerate(b) if y == TRUE)
        if constant:
            keep = constant.bit_length()
    quotient = [FALSE] * width
    remainder: Bits = []
    for i in range(width - 1, -1, -1):
        shifted = [a[i]] + remainder
        n = len(shifted)
        difference, no_borrow = subtract(net, shifted, b[:n])
        fits = net.and_(no_borrow, net.not_(net.any_(b[n:])))
        quotient[i] = fits
        chosen = [net.mux(fits, d, s) for d, s in zip(difference, shifted)]
        remainder = chosen[:keep]
    return quotient, remainder + [FALSE] * (width - len(remainder))


def _signed_divide(net: BitNetlist, op: str, a: Bits, b: Bits) -> Bits:
    """Truncating signed division through magnitudes; the remainder takes the dividend's sign."""
    sign_a, sign_b = a[-1], b[-1]
    magnitude_a = [net.mux(sign_a, n, x) for n, x in zip(negate(net, a), a)]
    magnitude_b = [net.mux(sign_b, n, y) for n, y in zip(negate(net, b), b)]
    quotient, remainder = divide(net, magnitude_a, magnitude_b)
    if op == Op.SDIV:
        flip, result = net.xor(sign_a, sign_b), quotient
    else:
        flip, result = sign_a, remainder
    return [net.mux(flip, n, r) for n, r in zip(negate(net, result), result)]


def shift(net: BitNetlist, op: str, a: Bits, amount: Bits) -> Bits:
    """Barrel shifter; an amount of ``width`` or more gives 0 (sign copies for ASHR)."""
    width = len(a)
    fill = a[-1] if op == Op.ASHR else FALSE
    current = list(a)
    too_far = []
    for j, s in enumerate(amount):
        step = 1 << j
        if step >= width:
            too_far.append(s)
            continue
        if s == FALSE:
            continue
        if op == Op.SHL:
            moved = [FALSE] * step + current[:width - step]
        else:
            moved = current[step:] + [fill] * step
        current = [net.mux(s, m, c) for m, c in zip(moved, current)]
    overflow = net.any_(too_far)
    return [net.mux(overflow, fill, c) for c in current]

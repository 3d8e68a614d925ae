"""Canonical stages and the reference step R, in three forms that must agree.

Stage ``s`` of a ``W``-bit input ``x`` is ``P_s = x >> (W - s)``, the value of its top ``s``
bits.  After its ``s``-th step every shift-and-correct converter holds the decimal digits of
``P_s``.  The reference step from stage ``s`` to ``s + 1`` doubles the digit vector and adds the
next input bit: ``t_j = 2*d_j + c_j``, ``out_j = t_j mod 10``, ``c_{j+1} = [d_j >= 5]``.

This module gives R as Python integers (for lifting and tests), as bit planes over many lanes
(for mining) and as graph nodes (for the solver obligations).
"""
from __future__ import annotations

from ...model.node import Graph, Node


def digit_count(stage: int) -> int:
    """How many digits of ``P_s`` can be non-zero: the digits of ``2**stage - 1`` (0 for stage 0)."""
    top = (1 << stage) - 1
    return len(str(top)) if top else 0


def stage_value(x: int, width: int, stage: int) -> int:
    """``P_stage``: the top ``stage`` bits of the ``width``-bit ``x``."""
    return x >> (width - stage)


def top_pair_bound(stage: int) -> int | None:
    """The largest value the top two digits of ``P_stage`` can read as a two-digit number.

    For top digit ``j`` this is ``(2**stage - 1) div 10**(j - 1)``; with a single digit it is
    simply ``2**stage - 1``.  None for stage 0 (no digits).
    """
    count = digit_count(stage)
    if count == 0:
        return None
    top = (1 << stage) - 1
    if count == 1:
        return top
    return top // 10 ** (count - 2)


def step_digits(digits: list[int], bit: int) -> list[int]:
    """R on Python integers: the digits (least significant first) after shifting in ``bit``.

    The carry out of the top digit is dropped; it is zero whenever the digit vector has
    room for the next stage.
    """
    out = []
    carry = bit
    for d in digits:
        t = 2 * d + carry
        out.append(t % 10)
        carry = int(t >= 10)
    return out


# -- bit planes --------------------------------------------------------------------------
def step_planes(digits: list[tuple[int, int, int, int]], bit: int, lanes_mask: int
                ) -> list[tuple[int, int, int, int]]:
    """R on bit planes: each digit is four planes (bit 0 first), one lane per plane bit.

    Valid only on lanes where every digit is at most 9 (always so for reference digits).
    ``d - 5`` for ``d`` in 5..9 has bits ``e0 = ~d0``, ``e1 = d1 d0 | d3 ~d0``, ``e2 = d3 d0``.
    """
    out = []
    carry = bit
    for d0, d1, d2, d3 in digits:
        big = d3 | (d2 & (d1 | d0))
        small = ~big & lanes_mask
        nd0 = ~d0 & lanes_mask
        e0, e1, e2 = nd0, (d1 & d0) | (d3 & nd0), d3 & d0
        out.append((carry, (big & e0) | (small & d0), (big & e1) | (small & d1),
                    (big & e2) | (small & d2)))
        carry = big
    return out


# -- graph nodes -------------------------------------------------------------------------
def step_nodes(graph: Graph, digits: list[Node], bit: Node) -> list[Node]:
    """R as graph nodes over 4-bit digit nodes and a 1-bit input bit node (arithmetic form).

    Stated with addition and a comparison against ten rather than the bit formulas of
    :func:`step_planes`, so the two forms check each other.
    """
    five = graph.const(5, 4)
    ten = graph.const(10, 5)
    out = []
    carry = bit
    for d in digits:
        wide = graph.zext(d, 5)
        t = graph.add(graph.add(wide, wide), graph.zext(carry, 5))
        reduced = graph.ite(graph.ult(t, ten), t, graph.sub(t, ten))
        out.append(graph.extract(reduced, 3, 0))
        carry = graph.not_(graph.ult(d, five))
    return out

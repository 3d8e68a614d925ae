"""Binary-to-BCD converter models built directly with :class:`Graph`, for tests and benches.

Each builder returns ``(x, digits)``: the INPUT leaf ``x`` of ``width`` bits and one 4-bit
node per decimal digit, least significant digit first, as many digits as ``2**width - 1``
has.  The correct builders compute the decimal digits of ``x`` for every input (checked
in tests/model/test_simulate.py against Python's ``str``); the buggy one does not.
"""
from __future__ import annotations

from bcdprove.model.node import Graph, Node


def digit_count(width: int) -> int:
    """Decimal digits of the largest ``width``-bit value (Python ``str`` as reference)."""
    return len(str((1 << width) - 1))


def python_digits(x: int, count: int) -> list[int]:
    """The ``count`` low decimal digits of ``x``, least significant first (Python ``str`` as
    reference)."""
    text = str(x)[::-1]
    return [int(text[i]) if i < len(text) else 0 for i in range(count)]


def double_dabble(graph: Graph, width: int, name: str = "x", threshold: int = 4,
                  addend: int = 3) -> tuple[Node, list[Node]]:
    """Shift-and-add-3: before each shift, every digit above ``threshold`` gets ``addend``.

    With the defaults (4 and 3, common practice) this is the correct algorithm: a digit of
    5..9 becomes 8..12, so the shift carries it into the next digit as doubling would.
    """
    x = graph.input(name, width)
    four_bits = lambda value: graph.const(value, 4)  # noqa: E731 - local shorthand
    digits = [four_bits(0) for _ in range(digit_count(width))]
    for i in range(width - 1, -1, -1):
        digits = [graph.ite(graph.ult(four_bits(threshold), d), graph.add(d, four_bits(addend)), d)
                  for d in digits]
        carry = graph.extract(x, i, i)
        shifted = []
        for d in digits:
            shifted.append(graph.concat(graph.extract(d, 2, 0), carry))
            carry = graph.extract(d, 3, 3)
        digits = shifted
    return x, digits


def buggy_double_dabble(graph: Graph, width: int, threshold: int = 5,
                        name: str = "x") -> tuple[Node, list[Node]]:
    """Shift-and-add-3 with a wrong threshold (default 5: a digit of exactly 5 is missed).

    Wrong for some input as soon as a digit can reach 5 before a shift, e.g. 10 for
    threshold 5 and width at least 4 (common practice; the tests check it).
    """
    return double_dabble(graph, width, name=name, threshold=threshold)


def division_by_ten(graph: Graph, width: int, name: str = "x") -> tuple[Node, list[Node]]:
    """Digits by repeated ``urem``/``udiv`` by ten, the reference way of computing them."""
    x = graph.input(name, width)
    wide = max(width, 4)
    value = graph.zext(x, wide)
    ten = graph.const(10, wide)
    digits = []
    for _ in range(digit_count(width)):
        digits.append(graph.extract(graph.urem(value, ten), 3, 0))
        value = graph.udiv(value, ten)
    return x, digits

"""Input values for simulation: corners where binary-to-BCD converters break, and random ones.

They live with the specifications because which values are interesting is a property of the
contract; the simulation engines draw from them through ``problem.corner_inputs()`` and
``problem.random_inputs()``.
"""
from __future__ import annotations

import random


def corner_values(width: int, top: int) -> list[int]:
    """Inputs where converters usually break, in order, without repeats, all ``<= top``.

    0, 1, the powers of two and their neighbours (2**k - 1 is all ones in the low bits),
    the powers of ten and their neighbours (a digit rolls over), and ``top`` with its
    neighbours (common practice in converter test benches).
    """
    picks = [0, 1, 2, top, top - 1, top - 2]
    for k in range(1, width + 1):
        picks += [(1 << k) - 1, 1 << k, (1 << k) + 1]
    power = 10
    while power <= top + 1:
        picks += [power - 1, power, power + 1]
        power *= 10
    seen: set[int] = set()
    result = []
    for v in picks:
        if 0 <= v <= top and v not in seen:
            seen.add(v)
            result.append(v)
    return result


def random_values(width: int, top: int, count: int, rng: random.Random) -> list[int]:
    """``count`` inputs ``<= top``: half uniform, half with the top bits set.

    Uniform inputs rarely reach the largest digits; forcing the top ``k`` bits to one for a
    random ``k`` gives every high digit large values too.
    """
    values = []
    for i in range(count):
        v = rng.getrandbits(width)
        if i % 2:
            k = rng.randint(1, width)
            v |= ((1 << k) - 1) << (width - k)
        if v > top:
            v = rng.randint(0, top)
        values.append(v)
    return values

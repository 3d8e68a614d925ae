"""The random engine: bit-parallel simulation of corner values, then random vectors.

It can only disprove.  A clean run is ``unknown`` with "N random vectors passed", because a
sample, however large, is not a proof.
"""
from __future__ import annotations

import random
import time

from .base import DISPROVED, UNKNOWN, Budget, Verdict
from .replay import LaneChecker, shrink

CHUNK = 1 << 14


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


class RandomEngine:
    """Corners first, then ``vectors`` random inputs, in chunks of :data:`CHUNK` lanes."""

    name = "random"

    def __init__(self, vectors: int = 1 << 20, seed: int = 1) -> None:
        self.vectors = vectors
        self.seed = seed

    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        top = problem.top_value
        checker = LaneChecker(problem)
        rng = random.Random(self.seed)
        corners = corner_values(problem.width, top)
        passed = 0
        stats = {"corner_vectors": len(corners), "seed": self.seed}
        pending = [corners]
        remaining = self.vectors
        stopped = ""
        while pending or remaining > 0:
            if budget.expired():
                stopped = "the time limit was reached"
                break
            if pending:
                batch = pending.pop()
            else:
                size = min(CHUNK, remaining)
                remaining -= size
                batch = random_values(problem.width, top, size, rng)
            result = checker.check_values(batch)
            passed += result.passed
            if result.counterexample is not None:
                stats["vectors"] = passed + 1
                found = shrink(checker, result.counterexample, budget)
                if found is not result.counterexample:
                    stats["shrunk_from"] = str(result.counterexample.inputs[problem.input_ports[0]])
                return Verdict(DISPROVED, self.name, time.monotonic() - started,
                               counterexample=found,
                               covered=f"{passed:,} vector{'' if passed == 1 else 's'} passed before the failing one",
                               stats=stats)
            if result.gave_up:
                stopped = result.stop_reason
                break
        stats["vectors"] = passed
        stats["settled_unknown_lanes"] = checker.settled_total
        reason = "random simulation can only disprove"
        if stopped:
            reason = f"{reason}; stopped early: {stopped}"
        return Verdict(UNKNOWN, self.name, time.monotonic() - started,
                       covered=f"{passed:,} random vectors passed (corner values first)",
                       reason=reason, stats=stats)

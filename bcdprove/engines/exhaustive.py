"""The exhaustive engine: every input in the contract, bit-parallel, in chunks of 2**20 lanes.

It proves when every input of the contract (``problem.domain_size()`` of them, visited in
the order of ``problem.domain_value``; for bin2bcd ``0 .. top``) was simulated and every
lane came out right (lanes that depend on unknown values are settled by z3 with the input
fixed).  Contracts larger than the limit are refused as ``unknown`` before any work, so a
user is never left waiting on 2**40 vectors.
"""
from __future__ import annotations

import time

from .base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict
from .replay import LaneChecker

CHUNK_BITS = 20
DEFAULT_LIMIT = 24


class ExhaustiveEngine:
    """Simulate all inputs when the contract holds at most ``2**limit`` of them."""

    name = "exhaustive"

    def __init__(self, limit: int = DEFAULT_LIMIT, chunk_bits: int = CHUNK_BITS) -> None:
        self.limit = limit
        self.chunk_bits = chunk_bits

    def applies(self, problem) -> bool:
        """Whether the contract is small enough for this engine."""
        return problem.domain_size() <= (1 << self.limit)

    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        total = problem.domain_size()
        if not self.applies(problem):
            return Verdict(UNKNOWN, self.name, 0.0, covered="nothing simulated",
                           reason=f"{total:,} inputs exceed the exhaustive limit of 2**{self.limit} "
                                  f"(raise it with --exhaustive-limit)")
        checker = LaneChecker(problem)
        chunk = 1 << self.chunk_bits
        done = 0
        while done < total:
            if budget.expired():
                return Verdict(UNKNOWN, self.name, time.monotonic() - started,
                               covered=f"{done:,} of {total:,} inputs simulated, all right",
                               reason="the time limit was reached",
                               stats={"inputs": done, "chunks": done // chunk})
            count = min(chunk, total - done)
            result = checker.check_range(done, count)
            if result.counterexample is not None:
                return Verdict(DISPROVED, self.name, time.monotonic() - started,
                               counterexample=result.counterexample,
                               covered=f"inputs {problem.span_words(0, done + result.passed - 1)} right; "
                                       f"the next one fails" if done + result.passed else
                                       "the first input fails",
                               stats={"inputs": done + result.passed + 1})
            if result.gave_up:
                return Verdict(UNKNOWN, self.name, time.monotonic() - started,
                               covered=f"{done + result.passed:,} of {total:,} inputs right",
                               reason=result.stop_reason,
                               stats={"inputs": done + result.passed})
            done += count
        return Verdict(PROVED, self.name, time.monotonic() - started,
                       covered=f"all {total:,} inputs simulated ({problem.span_words(0, total - 1)})",
                       stats={"inputs": total, "chunks": -(-total // chunk),
                              "settled_unknown_lanes": checker.settled_total})

"""The random engine: bit-parallel simulation of corner values, then random vectors.

It can only disprove.  A clean run is ``unknown`` with "N random vectors passed", because a
sample, however large, is not a proof.
"""
from __future__ import annotations

import random
import time

from ..model.node import Op
from .base import DISPROVED, UNKNOWN, Budget, Verdict
from .replay import LaneChecker, shrink

CHUNK = 1 << 14


class RandomEngine:
    """Corners first, then ``vectors`` random inputs, in chunks of :data:`CHUNK` lanes."""

    name = "random"

    def __init__(self, vectors: int = 1 << 20, seed: int = 1) -> None:
        self.vectors = vectors
        self.seed = seed

    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        # Only disproves, and every failure is replayed: unknown values fixed at 0 are fine.
        checker = LaneChecker(problem, fix_unknown_values=True)
        rng = random.Random(self.seed)
        corners = problem.corner_inputs()
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
                batch = problem.random_inputs(size, rng)
            result = checker.check_values(batch)
            passed += result.passed
            if result.counterexample is not None:
                stats["vectors"] = passed + 1
                found = shrink(checker, result.counterexample, budget)
                if found is not result.counterexample:
                    stats["shrunk_from"] = str(problem.input_value(result.counterexample))
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
        # Say what the lanes were simulated with: a pass holds for unknown values at 0 only.
        fixed = ("; unknown values (x) in the design simulated as 0"
                 if any(leaf.op == Op.FREE for leaf in problem.free_leaves()) else "")
        return Verdict(UNKNOWN, self.name, time.monotonic() - started,
                       covered=f"{passed:,} random vectors passed (corner values first{fixed})",
                       reason=reason, stats=stats)

"""The auto engine: a quick random bug hunt, then the strongest engine that fits the width.

Order: random (``hunt_vectors``), then exhaustive when the contract has at most
``2**exhaustive_limit`` inputs (from :data:`STAGES_FIRST_BITS` bits on, the stage engine
first, briefly), else stages (when installed), else the smt miter.  A counterexample found
while exhaustive simulation fits is replaced by the smallest failing input.  For the
bcd2bin and signed specs the stage engine may leave designs it cannot cut undecided, so the
smt miter follows it there, for at most :data:`FALLBACK_SMT_SECONDS`.  The
verdict is the first decisive one; otherwise unknown, with what every engine covered.
"""
from __future__ import annotations

import time

from .base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict
from .registry import EngineOptions, stage_engine


# The miter after the bcd2bin/signed stage engines is a last try, not a wait without end
# when no --timeout was given.
FALLBACK_SMT_SECONDS = 120.0
# From this width on, the stage engine goes before exhaustive simulation, for at most
# STAGES_FIRST_SECONDS: it proves a 24-bit converter in a fraction of a second where
# simulating all 2**24 inputs took up to 6 s (bench/bench_stages.py --widths 24); when it
# cannot decide, exhaustive simulation still does.
STAGES_FIRST_BITS = 20
STAGES_FIRST_SECONDS = 5.0


class _Bounded:
    """An engine run with at most ``seconds`` of the shared budget."""

    def __init__(self, engine, seconds: float) -> None:
        self.engine = engine
        self.seconds = seconds
        self.name = engine.name

    def run(self, problem, budget: Budget) -> Verdict:
        left = budget.remaining()
        limit = self.seconds if left is None else min(left, self.seconds)
        return self.engine.run(problem, Budget(limit))


class AutoEngine:
    name = "auto"

    def __init__(self, options: EngineOptions | None = None) -> None:
        self.options = options or EngineOptions()

    def _plan(self, problem) -> list:
        from .exhaustive import ExhaustiveEngine
        from .random_sim import RandomEngine
        from .smt_miter import SmtEngine

        plan = [RandomEngine(self.options.hunt_vectors, self.options.seed)]
        exhaustive = ExhaustiveEngine(self.options.exhaustive_limit)
        stages = stage_engine(self.options)
        if exhaustive.applies(problem):
            if (problem.spec == "bin2bcd" and problem.width >= STAGES_FIRST_BITS
                    and stages is not None):
                plan.append(_Bounded(stages, STAGES_FIRST_SECONDS))
            plan.append(exhaustive)
            return plan
        if problem.spec != "bin2bcd":
            # The stage engines of the other specs cover the designs they can cut; for the
            # rest a miter with the time that is left is the better bet than unknown.
            if stages is not None:
                plan.append(stages)
            plan.append(_Bounded(SmtEngine(self.options.smt_form), FALLBACK_SMT_SECONDS))
            return plan
        # Past the exhaustive limit a monolithic miter rarely finishes (see ENGINE.md), so it
        # is only the fallback when the stage engine is not installed.
        plan.append(stages if stages is not None else SmtEngine(self.options.smt_form))
        return plan

    def _smallest(self, problem, budget: Budget, found: Verdict, stats: dict) -> Verdict:
        """When every input can be simulated, the smallest failing one reads best in a report;
        exhaustive simulation stops at it, so this costs no more than reaching it."""
        from .exhaustive import ExhaustiveEngine

        exhaustive = ExhaustiveEngine(self.options.exhaustive_limit)
        if not exhaustive.applies(problem) or budget.expired():
            return found
        smallest = exhaustive.run(problem, budget)
        stats["engines"].append({"engine": smallest.engine, "status": smallest.status,
                                 "seconds": round(smallest.seconds, 3), **smallest.stats})
        if smallest.status == DISPROVED and smallest.counterexample.replayed:
            return smallest
        return found

    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        covered: list[str] = []
        reasons: list[str] = []
        stats: dict = {"engines": []}
        for engine in self._plan(problem):
            if budget.expired():
                reasons.append(f"{engine.name}: not started, the time limit was reached")
                break
            verdict = engine.run(problem, budget)
            stats["engines"].append({"engine": verdict.engine, "status": verdict.status,
                                     "seconds": round(verdict.seconds, 3), **verdict.stats})
            if verdict.covered:
                covered.append(verdict.covered)
            if verdict.status in (PROVED, DISPROVED):
                if verdict.status == DISPROVED and (verdict.counterexample is None
                                                    or not verdict.counterexample.replayed):
                    reasons.append(f"{verdict.engine}: a counterexample without replay was ignored")
                    continue
                if verdict.status == DISPROVED and verdict.engine in ("random", "stages"):
                    smallest = self._smallest(problem, budget, verdict, stats)
                    if smallest is not verdict:
                        covered.append(f"smallest failing input: {smallest.covered}")
                        verdict = smallest
                return Verdict(verdict.status, f"auto ({verdict.engine})",
                               time.monotonic() - started, counterexample=verdict.counterexample,
                               covered="; ".join(covered), stats=stats)
            if verdict.reason and verdict.engine != "random":
                reasons.append(f"{verdict.engine}: {verdict.reason}")
        return Verdict(UNKNOWN, "auto", time.monotonic() - started, covered="; ".join(covered),
                       reason="; ".join(reasons) or "no engine decided", stats=stats)

"""Running an engine under the soundness rules every caller needs: one place, not one per caller."""
from __future__ import annotations

import gc
import time
from contextlib import contextmanager

from ..spec.replaying import ReplayUndecided
from .base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict

STATUSES = (PROVED, DISPROVED, UNKNOWN)


def assert_sound(verdict: Verdict) -> None:
    """The last line of defence: no disproof leaves here without a replayed counterexample."""
    if verdict.status == DISPROVED:
        found = verdict.counterexample
        if found is None or not found.replayed:
            raise AssertionError(f"engine {verdict.engine} disproved without a replayed "
                                 f"counterexample")
    if verdict.status not in STATUSES:
        raise AssertionError(f"engine {verdict.engine} returned status {verdict.status!r}")


def run_engine(runner, problem, budget: Budget) -> Verdict:
    """``runner.run(problem, budget)``; a replay the solver could not settle is unknown."""
    started = time.monotonic()
    try:
        with _collector_spares_model():
            verdict = runner.run(problem, budget)
    except ReplayUndecided as undecided:
        verdict = Verdict(UNKNOWN, runner.name, time.monotonic() - started,
                          covered="a candidate counterexample was found but could not be replayed",
                          reason=str(undecided))
    assert_sound(verdict)
    return verdict


@contextmanager
def _collector_spares_model():
    """Keep the cycle collector off the objects that exist before the engine starts.

    The model of a wide design is millions of objects; every full collection the engine's
    own allocations trigger scanned all of them again (measured: a third of the stage
    engine's time on a 128-bit doubling-table design).  Frozen objects are still freed by
    reference counting; they only skip cycle detection until they are unfrozen here.
    """
    gc.freeze()
    try:
        yield
    finally:
        gc.unfreeze()

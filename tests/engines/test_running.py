"""The soundness guard every caller of an engine goes through (bcdprove.engines.running)."""
import pytest

from bcdprove.engines.base import DISPROVED, UNKNOWN, Budget, Counterexample, Verdict
from bcdprove.engines.running import assert_sound, run_engine
from bcdprove.spec.replaying import ReplayUndecided


class _Raising:
    name = "raising"

    def run(self, problem, budget):
        raise ReplayUndecided("the solver could not settle input 7")


def test_an_undecided_replay_is_unknown_with_its_reason():
    verdict = run_engine(_Raising(), problem=None, budget=Budget())
    assert verdict.status == UNKNOWN
    assert "could not settle input 7" in verdict.reason


def test_a_disproof_without_a_replayed_counterexample_is_refused():
    claimed = Counterexample(inputs={"x": 10}, expected=[0, 1], actual=[10, 0], wrong=[0, 1])
    with pytest.raises(AssertionError):
        assert_sound(Verdict(DISPROVED, "claims", counterexample=claimed))   # replayed=False
    with pytest.raises(AssertionError):
        assert_sound(Verdict(DISPROVED, "claims"))                          # no evidence at all

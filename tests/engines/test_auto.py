"""The auto engine's order past STAGES_FIRST_BITS: the stage engine first, briefly, and
exhaustive simulation whenever it does not decide.

The designs are the graph-built shift-and-add-3 converters of tests/support/converters.py,
whose digits match Python's ``str`` for every input (tests/model/test_simulate.py).
"""
from __future__ import annotations

import pytest

from bcdprove.engines import auto
from bcdprove.engines.base import PROVED, UNKNOWN, Budget, Verdict
from bcdprove.engines.registry import EngineOptions
from bcdprove.model import Graph, Model, Port
from bcdprove.spec.bin2bcd import build_problem
from tests.support.converters import double_dabble


def _problem(width: int):
    graph = Graph()
    x, digits = double_dabble(graph, width)
    packed = graph.concat(*reversed(digits))
    model = Model(graph=graph, top="hand_built", files=[],
                  ports=[Port("x", "input", width, False, x),
                         Port("bcd", "output", packed.width, False, packed)])
    return build_problem(model, inputs=["x"], outputs=["bcd"])


class _Undecided:
    """A stand-in stage engine that never decides, and counts its calls."""

    name = "stages"
    calls = 0

    def run(self, problem, budget):
        _Undecided.calls += 1
        return Verdict(UNKNOWN, self.name, reason="stand-in")


@pytest.fixture
def undecided(monkeypatch):
    _Undecided.calls = 0
    monkeypatch.setattr(auto, "stage_engine", lambda options: _Undecided())
    return _Undecided


def test_at_20_bits_the_stage_engine_proves_before_exhaustive_simulation():
    verdict = auto.AutoEngine(EngineOptions()).run(_problem(20), Budget(300))
    assert verdict.status == PROVED
    assert verdict.engine == "auto (stages)"
    assert [e["engine"] for e in verdict.stats["engines"]] == ["random", "stages"]


def test_when_the_stage_engine_does_not_decide_exhaustive_simulation_does(undecided):
    verdict = auto.AutoEngine(EngineOptions()).run(_problem(20), Budget(300))
    assert undecided.calls == 1
    assert verdict.status == PROVED
    assert verdict.engine == "auto (exhaustive)"


def test_below_20_bits_exhaustive_simulation_goes_alone(undecided):
    assert auto.STAGES_FIRST_BITS == 20
    verdict = auto.AutoEngine(EngineOptions()).run(_problem(12), Budget(300))
    assert undecided.calls == 0
    assert verdict.engine == "auto (exhaustive)"

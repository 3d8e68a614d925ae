"""The stage engine on converter models built directly as graphs.

Expected digits come from Python's ``str`` (reference code); every claimed counterexample
is checked against it here, independently of the engine's own replay.
"""
from __future__ import annotations

import pytest

from bcdprove.engines.base import DISPROVED, PROVED, UNKNOWN, Budget
from bcdprove.engines.stages import StageEngine
from bcdprove.model import Graph, Model, Port
from bcdprove.spec.bin2bcd import build_problem
from tests.support.converters import (buggy_double_dabble, division_by_ten, double_dabble,
                                      python_digits)

STATS = ("stages_matched", "stages_total", "obligations", "distinct_obligations",
         "slowest_obligation_seconds", "slowest_obligation")


def _problem(builder, width: int, max_input=None, **options):
    graph = Graph()
    x, digits = builder(graph, width, **options)
    packed = graph.concat(*reversed(digits))
    model = Model(graph=graph, top="hand_built", files=[],
                  ports=[Port("x", "input", width, False, x),
                         Port("bcd", "output", packed.width, False, packed)])
    return build_problem(model, inputs=["x"], outputs=["bcd"], max_input=max_input)


@pytest.mark.parametrize("width", [4, 8, 13, 24])
def test_double_dabble_is_proved(width):
    verdict = StageEngine().run(_problem(double_dabble, width), Budget(120))
    assert verdict.status == PROVED, verdict.reason
    assert verdict.engine == "stages"
    assert verdict.stats["stages_total"] == width + 1
    assert verdict.stats["stages_matched"] == width + 1


def test_verdict_reports_every_required_statistic():
    verdict = StageEngine().run(_problem(double_dabble, 16), Budget(120))
    for key in STATS:
        assert key in verdict.stats
    # Shape hashing: fewer distinct shapes than obligations (every digit of a row repeats).
    assert verdict.stats["distinct_obligations"] < verdict.stats["obligations"]


def test_progress_reaches_the_width():
    seen = []
    StageEngine(progress=lambda done, total: seen.append((done, total))).run(
        _problem(double_dabble, 12), Budget(120))
    assert seen[0] == (0, 12)
    assert seen[-1] == (12, 12)
    assert [d for d, _ in seen] == sorted(d for d, _ in seen)


@pytest.mark.parametrize("width", [8, 20])
def test_wrong_threshold_is_disproved_with_a_real_counterexample(width):
    problem = _problem(buggy_double_dabble, width)
    verdict = StageEngine().run(problem, Budget(120))
    assert verdict.status == DISPROVED
    found = verdict.counterexample
    assert found.replayed
    x = found.inputs["x"]
    expected = python_digits(x, len(problem.digits))
    assert found.expected[:len(expected)] == expected
    # The model really shows something else at x (scalar evaluation, independent of lanes).
    assert problem.evaluate(x) != expected


def test_threshold_six_is_disproved():
    # Adding 3 only above 6 misses 5 and 6 (common practice: the threshold is 4, i.e. >= 5).
    problem = _problem(double_dabble, 10, threshold=6)
    verdict = StageEngine().run(problem, Budget(120))
    assert verdict.status == DISPROVED
    x = verdict.counterexample.inputs["x"]
    assert problem.evaluate(x) != python_digits(x, len(problem.digits))


def test_max_input_restricts_only_the_outputs():
    # Four digits for a 14-bit input are right up to 9999 (Python str: 10**4 needs five).
    graph = Graph()
    x, digits = double_dabble(graph, 14)
    packed = graph.concat(*reversed(digits[:4]))
    model = Model(graph=graph, top="four_digits", files=[],
                  ports=[Port("x", "input", 14, False, x),
                         Port("bcd", "output", 16, False, packed)])
    inside = build_problem(model, inputs=["x"], outputs=["bcd"], max_input=9999)
    assert StageEngine().run(inside, Budget(120)).status == PROVED
    outside = build_problem(model, inputs=["x"], outputs=["bcd"], max_input=10000)
    verdict = StageEngine().run(outside, Budget(120))
    assert verdict.status == DISPROVED
    assert verdict.counterexample.inputs["x"] == 10000     # the only input above 9999 allowed


def test_division_by_ten_is_proved_multiplicatively():
    verdict = StageEngine().run(_problem(division_by_ten, 12), Budget(120))
    assert verdict.status == PROVED, verdict.reason
    assert "10*q" in verdict.covered


def test_a_design_of_neither_family_is_unknown_with_both_reasons():
    # Digits of x + 1 (a wrong converter that is neither shifts nor divisions of x).
    def plus_one(graph, width):
        x = graph.input("x", width)
        wide = graph.zext(x, width + 1)
        value = graph.add(wide, graph.const(1, width + 1))
        ten = graph.const(10, width + 1)
        digits = []
        for _ in range(len(str((1 << width) - 1))):
            digits.append(graph.extract(graph.urem(value, ten), 3, 0))
            value = graph.udiv(value, ten)
        return x, digits
    problem = _problem(plus_one, 10)
    verdict = StageEngine().run(problem, Budget(120))
    # It is wrong (x = 0 shows 1; Python int), so a replayed counterexample is fine too.
    if verdict.status == DISPROVED:
        x = verdict.counterexample.inputs["x"]
        assert problem.evaluate(x) != python_digits(x, len(problem.digits))
    else:
        assert verdict.status == UNKNOWN
        assert "division" in verdict.reason


def test_an_exhausted_budget_is_unknown_with_the_reason():
    budget = Budget(seconds=0.0)
    verdict = StageEngine().run(_problem(double_dabble, 16), budget)
    assert verdict.status == UNKNOWN
    assert "time limit" in verdict.reason


@pytest.mark.slow
@pytest.mark.parametrize("width", [64, 128])
def test_wide_double_dabble_graph_is_proved(width):
    verdict = StageEngine().run(_problem(double_dabble, width), Budget(600))
    assert verdict.status == PROVED, verdict.reason

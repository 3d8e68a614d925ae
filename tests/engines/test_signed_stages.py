"""The signed reduction (magnitude cut, then the binary-to-BCD stages) on hand-built models."""
from __future__ import annotations

from bcdprove.engines.base import Budget
from bcdprove.engines.registry import EngineOptions, stage_engine
from bcdprove.model.design import Model, Port, Signal
from bcdprove.model.node import Graph
from bcdprove.spec.signed import build_problem
from tests.spec.hand_models import shift_add3_digits


def signed_model(width: int, magnitude_first: bool = True, off_by_one: bool = False) -> Model:
    """``v`` (two's complement) -> ``neg`` and ``bcd``.  ``magnitude_first``: one converter on
    ``|v|``; otherwise two converters (on ``v`` and ``-v``) and a choice of their digits.
    ``off_by_one``: the magnitude of a negative value is ``~v`` (a deliberate bug)."""
    graph = Graph()
    v = graph.input("v", width)
    negative = graph.extract(v, width - 1, width - 1)
    digit_count = len(str(2 ** (width - 1)))             # Python int: digits of the magnitude
    signals = {}
    if magnitude_first:
        flipped = graph.not_(v) if off_by_one else graph.neg(v)
        magnitude = graph.ite(negative, flipped, v)
        signals["magnitude"] = Signal("magnitude", magnitude, "net")
        digits = shift_add3_digits(graph, magnitude, digit_count)
    else:
        plain = shift_add3_digits(graph, v, digit_count + 1)[:digit_count]
        negated = shift_add3_digits(graph, graph.neg(v), digit_count + 1)[:digit_count]
        digits = [graph.ite(negative, n, p) for n, p in zip(negated, plain)]
    bcd = graph.concat(*reversed(digits))
    model = Model(graph=graph, top="signed_hand", files=["hand"], signals=signals, ports=[
        Port("v", "input", width, False, v), Port("neg", "output", 1, False, negative),
        Port("bcd", "output", 4 * digit_count, False, bcd)])
    return model


def _stages():
    return stage_engine(EngineOptions())


def test_magnitude_first_design_is_proved_through_the_cut():
    verdict = _stages().run(build_problem(signed_model(20)), Budget(300))
    assert verdict.status == "proved"
    assert "magnitude node proved equal" in verdict.covered


def test_wrong_magnitude_is_a_replayed_counterexample():
    problem = build_problem(signed_model(20, off_by_one=True))
    verdict = _stages().run(problem, Budget(300))
    assert verdict.status == "disproved" and verdict.counterexample.replayed
    x = verdict.counterexample.inputs["v"]
    assert x >> 19 == 1                                     # a negative input (top bit set)


def test_design_without_a_magnitude_node_is_unknown_with_the_reason():
    verdict = _stages().run(build_problem(signed_model(12, magnitude_first=False)), Budget(60))
    assert verdict.status == "unknown"
    assert "does not take the magnitude first" in verdict.reason


def test_auto_falls_back_to_the_miter_when_there_is_no_cut():
    from bcdprove.checking import check_model
    result = check_model(signed_model(12, magnitude_first=False), spec="signed",
                         engine="auto", exhaustive_limit=4)
    assert result.verdict.status == "proved" and result.verdict.engine == "auto (smt)"
    assert [e["engine"] for e in result.verdict.stats["engines"]] == ["random", "stages", "smt"]

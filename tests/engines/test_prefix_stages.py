"""The prefix-stage engine (BCD to binary) on hand-built models: its steps, cuts and lifting.

Expected values: Python int arithmetic (the prefix value of the top k digits is
``value // 10**(D-k)``) and the catalogue's Icarus-checked designs.
"""
from __future__ import annotations

from bcdprove.engines.base import Budget
from bcdprove.engines.prefix_stages import PrefixStageEngine
from bcdprove.model.design import Model, Port, Signal
from bcdprove.model.node import Graph
from bcdprove.spec.bcd2bin import bcd_value, build_problem


def loop_model(digits: int, width: int, times_nine_at: int | None = None,
               name_stages: bool = True) -> Model:
    """``reading`` -> ``units`` by ``v = 10 v + d`` from the top digit down; the step at
    ``times_nine_at`` multiplies by 9 instead (a deliberate bug)."""
    graph = Graph()
    reading = graph.input("reading", 4 * digits)
    value = graph.zero(width)
    signals = {}
    for i in reversed(range(digits)):
        digit = graph.zext(graph.extract(reading, 4 * i + 3, 4 * i), width)
        factor = 9 if i == times_nine_at else 10
        value = graph.add(graph.mul(value, graph.const(factor, width)), digit)
        if name_stages:
            signals[f"units@i={i}"] = Signal(f"units@i={i}", value, "probe")
    ports = [Port("reading", "input", 4 * digits, False, reading),
             Port("units", "output", width, False, value)]
    return Model(graph=graph, top="loop", files=["hand"], ports=ports, signals=signals)


def test_mining_finds_every_prefix_value():
    problem = build_problem(loop_model(12, 40))
    stages = PrefixStageEngine().mine(problem)
    assert sorted(stages) == list(range(1, 12))          # P_1 .. P_11 (P_12 is the output)


def test_proof_shares_one_shape_across_the_loop():
    verdict = PrefixStageEngine().run(build_problem(loop_model(30, 100)), Budget(120))
    assert verdict.status == "proved"
    assert verdict.stats["obligations"] == 30
    assert verdict.stats["shapes"] <= 3                    # base, loop step, loose vs exact


def test_a_wrong_step_is_lifted_and_replayed():
    problem = build_problem(loop_model(16, 54, times_nine_at=5))
    verdict = PrefixStageEngine().run(problem, Budget(120))
    assert verdict.status == "disproved"
    found = verdict.counterexample
    assert found.replayed
    x = problem.input_value(found)
    value = bcd_value(x, 16)
    # Python int: times nine at position 5 drops P_10 * 10**5 from the result
    assert found.actual == [value - (value // 10 ** 6) * 10 ** 5]
    assert found.expected == [value]


def test_without_named_stages_one_monolithic_step_still_proves_small_designs():
    problem = build_problem(loop_model(4, 14, name_stages=False))
    verdict = PrefixStageEngine().run(problem, Budget(60))
    assert verdict.status == "proved" and verdict.stats["stages_mined"] == 0


def test_too_narrow_output_checked_below_its_capacity():
    """14 digits need 47 bits (Python int bit_length); at 45 bits the values below 2**45
    are proved through the limit, which the steps carry as a cap on each prefix."""
    problem = build_problem(loop_model(14, 45))
    assert not problem.fits()
    verdict = PrefixStageEngine().run(problem.below_capacity(), Budget(120))
    assert verdict.status == "proved"


def weights_model(digits: int, width: int, wrong_weight_at: int | None = None) -> Model:
    """``units = sum(d_i * 10**i)`` accumulated from the ones digit up; the weight at
    ``wrong_weight_at`` is 10**i + 1 (a deliberate bug)."""
    graph = Graph()
    reading = graph.input("reading", 4 * digits)
    value = graph.zero(width)
    signals = {}
    for i in range(digits):
        weight = 10 ** i + (1 if i == wrong_weight_at else 0)
        digit = graph.zext(graph.extract(reading, 4 * i + 3, 4 * i), width)
        value = graph.add(value, graph.mul(digit, graph.const(weight, width)))
        signals[f"units@i={i}"] = Signal(f"units@i={i}", value, "probe")
    ports = [Port("reading", "input", 4 * digits, False, reading),
             Port("units", "output", width, False, value)]
    return Model(graph=graph, top="weights", files=["hand"], ports=ports, signals=signals)


def test_suffix_family_proves_designs_that_accumulate_from_the_ones_digit():
    problem = build_problem(weights_model(24, 80))
    assert sorted(PrefixStageEngine().mine(problem, "suffix")) == list(range(1, 24))
    verdict = PrefixStageEngine().run(problem, Budget(120))
    assert verdict.status == "proved" and verdict.stats["family"] == "suffix"
    assert verdict.stats["obligations"] == 24


def test_suffix_family_lifts_a_wrong_weight():
    problem = build_problem(weights_model(24, 80, wrong_weight_at=9))
    verdict = PrefixStageEngine().run(problem, Budget(120))
    assert verdict.status == "disproved"
    found = verdict.counterexample
    value = bcd_value(problem.input_value(found), 24)
    digit9 = value // 10 ** 9 % 10
    assert digit9 != 0 and found.actual == [value + digit9]      # Python int: one extra d_9


def test_stages_are_mined_through_split_digit_ports():
    """Digit ports d0 .. d9 are joined into one input; the design's signals, written over
    the ports, are rebuilt over it before mining."""
    graph = Graph()
    ports = [graph.input(f"d{i}", 4) for i in range(10)]
    value = graph.zero(34)
    signals = {}
    for i in reversed(range(10)):
        value = graph.add(graph.mul(value, graph.const(10, 34)), graph.zext(ports[i], 34))
        signals[f"acc@{i}"] = Signal(f"acc@{i}", value, "probe")
    model = Model(graph=graph, top="split", files=["hand"], signals=signals,
                  ports=[Port(f"d{i}", "input", 4, False, p) for i, p in enumerate(ports)]
                  + [Port("total", "output", 34, False, value)])
    problem = build_problem(model)
    assert problem.input_ports == [f"d{i}" for i in range(10)]
    engine = PrefixStageEngine()
    assert sorted(engine.mine(problem)) == list(range(1, 10))
    verdict = engine.run(problem, Budget(60))
    assert verdict.status == "proved" and verdict.stats["steps"] == 10

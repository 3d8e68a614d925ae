"""The stage engine on the shipped wide designs (designs/wide/), read from Verilog.

Correct designs must be proved; buggy ones disproved with a counterexample whose expected
digits come from Python's ``str`` (reference code) and which Icarus Verilog, run on the same
source, also shows wrong.  The 64- and 128-bit sweeps are marked slow.
"""
from __future__ import annotations

from pathlib import Path

import pytest

from bcdprove.engines.base import DISPROVED, PROVED, Budget
from bcdprove.engines.stages import StageEngine
from bcdprove.spec.bin2bcd import build_problem
from bcdprove.verilog import read_design
from tests.support.converters import python_digits
from tests.support.icarus import icarus_bcd_digits

DESIGNS = Path(__file__).resolve().parents[2] / "designs" / "wide"

CORRECT = [
    ("meter_wide_loop", {}),             # behavioural loop over one {digits, binary} register
    ("meter_wide_digit_array", {}),      # loop with a separate digit register array
    ("meter_wide_add3_full", {}),        # structural add-3 cell array, a cell on every digit
    ("meter_wide_add3_triangle", {}),    # triangular add-3 cell array
    ("meter_wide_doubling", {}),         # doubling-table cells with x entries for 10..15
    ("meter_wide_wrapped", {"en": 1}),   # loop core behind a short path and an enable
]


def _problem(top: str, width: int, ties=None, max_input=None):
    model = read_design([str(DESIGNS / f"{top}.v")], top=top, parameters={"W": width})
    return build_problem(model, ties=ties or None, max_input=max_input)


def _check_disproved(top: str, width: int, verdict, problem) -> int:
    assert verdict.status == DISPROVED, verdict.reason
    assert verdict.engine == "stages"
    found = verdict.counterexample
    assert found.replayed
    x = found.inputs["count"]
    shown = len(problem.digits)
    expected = python_digits(x, max(shown, len(str(x))))
    assert found.expected == expected
    icarus = icarus_bcd_digits(DESIGNS / f"{top}.v", top, width, x, shown, {"W": width})
    # Wrong in Icarus too: a digit differs, or the number needs more digits than are shown.
    assert icarus != expected[:shown] or len(str(x)) > shown
    return x


@pytest.mark.parametrize("top,ties", CORRECT, ids=[t for t, _ in CORRECT])
def test_correct_designs_at_32_bits_are_proved(top, ties):
    verdict = StageEngine().run(_problem(top, 32, ties), Budget(300))
    assert verdict.status == PROVED, verdict.reason
    assert verdict.stats["stages_total"] == 33


@pytest.mark.icarus
def test_short_path_one_too_wide_is_found_at_64_bits():
    # The short path is taken for count <= 10 instead of < 10: of the 2**64 inputs only 10
    # is shown wrong (designs/catalog.json, first_failing_input from Icarus).
    problem = _problem("meter_wide_short_path_bug", 64)
    verdict = StageEngine().run(problem, Budget(300))
    assert _check_disproved("meter_wide_short_path_bug", 64, verdict, problem) == 10


@pytest.mark.icarus
def test_stage_bug_is_disproved_at_64_bits():
    problem = _problem("meter_wide_stage_bug", 64)
    verdict = StageEngine().run(problem, Budget(300))
    _check_disproved("meter_wide_stage_bug", 64, verdict, problem)


@pytest.mark.icarus
def test_missing_top_digit_is_disproved_at_64_bits():
    # 19 digits for 64 bits: 10**19 is the smallest input they cannot show (Python int).
    problem = _problem("meter_wide_digit_count_bug", 64)
    verdict = StageEngine().run(problem, Budget(300))
    x = _check_disproved("meter_wide_digit_count_bug", 64, verdict, problem)
    assert x >= 10 ** 19


def test_missing_top_digit_is_proved_below_its_capacity():
    problem = _problem("meter_wide_digit_count_bug", 64, max_input=10 ** 19 - 1)
    verdict = StageEngine().run(problem, Budget(300))
    assert verdict.status == PROVED, verdict.reason


def test_division_design_is_proved_at_32_bits():
    # Repeated % 10 and / 10: proved step by step as q_i == 10*q_(i+1) + d_i, d_i <= 9.
    verdict = StageEngine().run(_problem("meter_wide_divide", 32), Budget(300))
    assert verdict.status == PROVED, verdict.reason
    assert verdict.engine == "stages"


def test_stage_bug_is_absent_at_32_bits():
    # The faulty cell sits at stage 40, which a 32-bit array does not have.
    verdict = StageEngine().run(_problem("meter_wide_stage_bug", 32), Budget(300))
    assert verdict.status == PROVED, verdict.reason


@pytest.mark.slow
@pytest.mark.parametrize("width", [64, 128])
@pytest.mark.parametrize("top,ties", CORRECT, ids=[t for t, _ in CORRECT])
def test_correct_wide_designs_are_proved(top, ties, width):
    verdict = StageEngine().run(_problem(top, width, ties), Budget(600))
    assert verdict.status == PROVED, verdict.reason


@pytest.mark.slow
@pytest.mark.icarus
@pytest.mark.parametrize("top", ["meter_wide_short_path_bug", "meter_wide_stage_bug",
                                 "meter_wide_digit_count_bug"])
def test_buggy_designs_are_disproved_at_128_bits(top):
    problem = _problem(top, 128)
    verdict = StageEngine().run(problem, Budget(600))
    _check_disproved(top, 128, verdict, problem)


@pytest.mark.parametrize("width", [32, 64, pytest.param(128, marks=pytest.mark.slow)])
def test_a_saturating_wrapper_is_proved_up_to_the_display_maximum(width):
    # The display has two digits fewer than 2**width - 1 needs (Python str); above its
    # largest value, 10**S - 1, it shows all nines.  The step to the outputs reads the
    # saturation test `count > LIMIT`, false over the whole checked range.
    shown = len(str((1 << width) - 1)) - 2
    problem = _problem("meter_wide_saturating", width, max_input=10 ** shown - 1)
    assert len(problem.digits) == shown
    verdict = StageEngine().run(problem, Budget(600))
    assert verdict.status == PROVED, verdict.reason


def test_a_saturation_limit_one_digit_short_is_not_proved(tmp_path):
    # Saturating above 10**(S-1) - 1 shows all nines for 10**(S-1) (Python int), which the
    # display could show: the folding must not take the test for constant.
    shown = len(str((1 << 32) - 1)) - 2
    text = (DESIGNS / "meter_wide_saturating.v").read_text().replace(
        "all_nines(S);", "all_nines(S - 1);")
    assert "all_nines(S - 1)" in text
    path = tmp_path / "short_limit.v"
    path.write_text(text)
    model = read_design([str(path)], top="meter_wide_saturating", parameters={"W": 32})
    problem = build_problem(model, max_input=10 ** shown - 1)
    verdict = StageEngine().run(problem, Budget(120))
    assert verdict.status != PROVED
    assert problem.evaluate(10 ** (shown - 1)) != python_digits(10 ** (shown - 1), shown)

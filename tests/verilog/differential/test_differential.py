"""Random differential testing of the Verilog reader against Icarus Verilog (the referee).

Every campaign prints its seed; ``generate_case(seed, index, x_campaign, avoid)`` rebuilds
any case from it.  Set BCDPROVE_FUZZ_SEED to add one more seed to the default run.
Constructs that reach an open reader bug (regressions.py) are left out of the campaigns
while the bug is open, so the campaigns keep testing everything else.
"""
from __future__ import annotations

import pytest

from tests.support.icarus import require_icarus

from .generator import generate_case
from .harness import environment_seed, replay, run_campaign
from .regressions import REGRESSIONS, avoided_constructs

MAIN_SEEDS = (101, 202)
CASES_PER_SEED = 500          # 2 seeds x 500 = 1000 main-campaign cases in the default run
X_SEED = 303
X_CASES = 100


def _main_seeds() -> list[int]:
    extra = environment_seed()
    return list(MAIN_SEEDS) + ([extra] if extra is not None else [])


def _assert_clean(result, seed, count) -> None:
    assert result.cases == count
    assert result.vectors > 0
    shown = "\n\n".join(f.describe() for f in result.findings[:5])
    assert not result.findings, (f"{len(result.findings)} finding(s) with seed {seed} "
                                 f"(avoiding {sorted(avoided_constructs())}):\n{shown}")


@pytest.mark.icarus
@pytest.mark.parametrize("seed", _main_seeds())
def test_main_campaign_agrees_with_icarus(seed):
    # Icarus Verilog 11 is the referee for every value; no x may appear on either side
    require_icarus()
    print(f"differential main campaign: seed {seed}, {CASES_PER_SEED} cases")
    result = run_campaign(seed, CASES_PER_SEED, avoid=avoided_constructs())
    print(f"  {result.vectors} vectors, {result.compared_bits} bits compared")
    _assert_clean(result, seed, CASES_PER_SEED)


@pytest.mark.icarus
def test_x_campaign_unknown_where_icarus_prints_x():
    # IEEE 1364-2005 clauses 3.5.1 (x literals), 5.1.5 (x / 0), 5.2.1 (select out of range):
    # wherever Icarus prints x or z the model must say "unknown"
    require_icarus()
    print(f"differential x campaign: seed {X_SEED}, {X_CASES} cases")
    result = run_campaign(X_SEED, X_CASES, x_campaign=True, avoid=avoided_constructs())
    _assert_clean(result, X_SEED, X_CASES)


def test_generator_is_a_function_of_its_seed():
    # common practice: a failure must be reproducible from the printed seed alone
    first = [generate_case(7, i).text() for i in range(30)]
    again = [generate_case(7, i).text() for i in range(30)]
    assert first == again
    assert len(set(first)) == 30


def test_main_campaign_cases_never_hold_x_sources():
    # the main campaign guards divisors and selects; only the x campaign may hold x sources
    assert not any(generate_case(5, i).has_x_source for i in range(300))
    assert any(generate_case(5, i, x_campaign=True).has_x_source for i in range(300))


def _regression_params():
    for entry in REGRESSIONS:
        marks = ()
        if entry.reader_bug:
            marks = pytest.mark.xfail(strict=True, reason=f"reader bug: {entry.reader_bug}")
        elif entry.reader_follows_icarus:
            marks = pytest.mark.xfail(strict=True, reason="reader follows Icarus, not the "
                                      f"clause: {entry.reader_follows_icarus}")
        yield pytest.param(entry, id=entry.name, marks=marks)


@pytest.mark.icarus
@pytest.mark.parametrize("entry", list(REGRESSIONS), ids=[r.name for r in REGRESSIONS])
def test_regression_record_matches_icarus(entry):
    # the recorded bits are Icarus Verilog 11's: the expected value, or (where Icarus
    # deviates from the clause in entry.source) what Icarus is recorded to print instead
    require_icarus()
    outputs = replay(entry.case(), entry.vector)
    printed = {name: bits for name, (bits, _) in outputs.items()}
    assert printed == (entry.icarus_prints or entry.expected)


@pytest.mark.icarus
@pytest.mark.parametrize("entry", list(_regression_params()))
def test_regression_model_matches_icarus(entry):
    # expected bits: Icarus Verilog 11, cross-checked with the IEEE clause in entry.source
    require_icarus()
    outputs = replay(entry.case(), entry.vector)
    assert {name: model for name, (_, model) in outputs.items()} == entry.expected


@pytest.mark.slow
@pytest.mark.icarus
@pytest.mark.parametrize("seed", [1, 2, 3, 4])
def test_large_main_sweep(seed):
    require_icarus()
    print(f"differential sweep: seed {seed}, 2500 cases")
    result = run_campaign(seed, 2500, avoid=avoided_constructs())
    _assert_clean(result, seed, 2500)


@pytest.mark.slow
@pytest.mark.icarus
@pytest.mark.parametrize("seed", [11, 12])
def test_large_x_sweep(seed):
    require_icarus()
    print(f"differential x sweep: seed {seed}, 600 cases")
    result = run_campaign(seed, 600, x_campaign=True, avoid=avoided_constructs())
    _assert_clean(result, seed, 600)

"""The engines on the shipped designs: verdicts from designs/catalog.json, counterexamples
shown to fail in Icarus Verilog through the generated test bench.

The catalogue's expected verdicts and first failing inputs were found with Icarus (see
tests/designs/); the exhaustive engine must find exactly that smallest failing input.
"""
from __future__ import annotations

import pytest

from bcdprove.checking import check
from bcdprove.reports.testbench import write_testbench
from tests.designs.catalog import load_catalog
from tests.support.icarus import run_icarus

ENTRIES = [e for e in load_catalog() if e.file.startswith("comb/") and not e.clocked]


def _check(entry, engine, **extra):
    return check([str(entry.path)], entry.top, parameters=entry.parameters,
                 include_dirs=[str(d) for d in entry.include_dirs], inputs=entry.inputs,
                 outputs=entry.outputs, ties=entry.ties, max_input=entry.max_input,
                 engine=engine, random_vectors=1 << 14, **extra)


@pytest.mark.parametrize("entry", ENTRIES, ids=lambda e: e.name)
def test_auto_verdict_matches_catalog(entry):
    result = _check(entry, "auto")
    assert result.verdict.status == entry.expected        # catalogue, from Icarus
    if entry.expected == "disproved":
        found = result.verdict.counterexample
        assert found.replayed


@pytest.mark.parametrize("entry", [e for e in ENTRIES if e.expected == "disproved"],
                         ids=lambda e: e.name)
def test_exhaustive_finds_the_first_failing_input(entry):
    result = _check(entry, "exhaustive")
    found = result.verdict.counterexample
    # the smallest input Icarus shows wrong (catalogue field first_failing_input)
    assert found.inputs[entry.inputs[0]] == entry.first_failing_input


DISPROVED = [e for e in ENTRIES if e.expected == "disproved"]


def _quick_then_slow(entries, quick):
    """The first ``quick`` entries in the default run, the rest only with -m slow."""
    return entries[:quick] + [pytest.param(e, marks=pytest.mark.slow) for e in entries[quick:]]


@pytest.mark.parametrize("entry", _quick_then_slow(DISPROVED, 3), ids=lambda e: e.name)
def test_counterexamples_fail_in_icarus(entry):
    result = _check(entry, "smt", timeout=60)
    if result.verdict.status != "disproved":
        pytest.fail(f"smt did not disprove: {result.verdict.reason}")
    found = result.verdict.counterexample
    bench = write_testbench(result)
    text = run_icarus([entry.path], "bcdprove_tb", bench, include_dirs=entry.include_dirs)
    assert f"bcdprove testbench: FAIL at input {found.inputs[entry.inputs[0]]}" in text


@pytest.mark.parametrize("entry", _quick_then_slow([e for e in ENTRIES
                                                   if e.expected == "proved"], 3),
                         ids=lambda e: e.name)
def test_proved_designs_pass_their_testbench_in_icarus(entry):
    result = _check(entry, "exhaustive")
    assert result.verdict.status == "proved"
    text = run_icarus([entry.path], "bcdprove_tb", write_testbench(result),
                      include_dirs=entry.include_dirs)
    assert "bcdprove testbench: PASS" in text


@pytest.mark.parametrize("entry", _quick_then_slow([e for e in ENTRIES if e.width <= 14], 4),
                         ids=lambda e: e.name)
def test_smt_agrees_with_catalog(entry):
    result = _check(entry, "smt", timeout=60)
    assert result.verdict.status == entry.expected


@pytest.mark.parametrize("entry", DISPROVED, ids=lambda e: e.name)
def test_random_disproves_catalog_bugs(entry):
    result = _check(entry, "random")
    assert result.verdict.status == "disproved"        # catalogue, from Icarus
    assert result.verdict.counterexample.replayed

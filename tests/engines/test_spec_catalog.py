"""The engines on the shipped bcd2bin and signed designs: verdicts from designs/catalog.json
(found with Icarus, see tests/designs/test_spec_designs_in_icarus.py), counterexamples
replayed in Icarus through the generated test bench."""
from __future__ import annotations

import pytest

from bcdprove.checking import check
from bcdprove.reports.spec_testbench import write_spec_testbench
from tests.designs.catalog import load_catalog
from tests.support.icarus import run_icarus

ENTRIES = load_catalog(spec="bcd2bin") + load_catalog(spec="signed")
NARROW = [e for e in ENTRIES if (e.width if e.spec == "signed" else 4 * e.raw["digits"]) <= 16]
WIDE = [e for e in ENTRIES if e not in NARROW]


def _heavy(entry) -> bool:
    """Entries past 32 signed bits or 20 digits take seconds each: the long run only."""
    if entry.slow:
        return True
    return entry.width > 32 if entry.spec == "signed" else entry.raw["digits"] > 20


def _slow_marked(entries):
    return [pytest.param(e, id=e.name, marks=[pytest.mark.slow] if _heavy(e) else [])
            for e in entries]


def _check(entry, engine, **extra):
    options = dict(spec=entry.spec, inputs=entry.inputs, outputs=entry.outputs,
                   ties=entry.ties, engine=engine, random_vectors=1 << 14)
    if entry.spec == "bcd2bin":
        options["invalid_flag"] = entry.raw.get("invalid_flag")
    else:
        options["sign"] = entry.raw["sign"]
    options.update(extra)
    return check([str(entry.path)], entry.top, parameters=entry.parameters, **options)


@pytest.mark.parametrize("entry", _slow_marked(ENTRIES))
def test_auto_verdict_matches_catalog(entry):
    result = _check(entry, "auto", timeout=120)
    assert result.verdict.status == entry.expected        # catalogue, from Icarus
    if entry.expected == "disproved":
        assert result.verdict.counterexample.replayed


@pytest.mark.parametrize("entry", [e for e in NARROW if e.expected == "disproved"],
                         ids=lambda e: e.name)
def test_exhaustive_finds_the_first_failing_input(entry):
    result = _check(entry, "exhaustive")
    found = result.verdict.counterexample
    # the smallest input Icarus shows wrong, in the order of an exhaustive run (catalogue)
    assert result.problem.input_value(found) == entry.first_failing_input


@pytest.mark.parametrize("entry", NARROW, ids=lambda e: e.name)
def test_smt_agrees_with_catalog(entry):
    assert _check(entry, "smt", timeout=60).verdict.status == entry.expected


@pytest.mark.parametrize("entry", [e for e in NARROW if e.expected == "disproved"],
                         ids=lambda e: e.name)
def test_random_disproves_the_buggy_designs(entry):
    result = _check(entry, "random")
    assert result.verdict.status == "disproved"


@pytest.mark.parametrize("entry", [e for e in NARROW if e.expected == "proved"],
                         ids=lambda e: e.name)
def test_exhaustive_proves_the_correct_designs(entry):
    assert _check(entry, "exhaustive").verdict.status == "proved"


@pytest.mark.parametrize("entry", _slow_marked(WIDE))
def test_stages_decide_the_wide_designs(entry):
    result = _check(entry, "stages", timeout=120)
    assert result.verdict.status == entry.expected        # catalogue, from Icarus
    if entry.expected == "proved" and entry.spec == "bcd2bin":
        stats = result.verdict.stats
        # one obligation per digit; the steps of a prefix loop share their shape
        assert stats["obligations"] == entry.raw["digits"]
        if stats["family"] == "prefix":
            assert stats["shapes"] <= 3


@pytest.mark.parametrize("entry", _slow_marked([e for e in ENTRIES if e.expected == "disproved"]))
def test_counterexamples_fail_in_icarus(entry):
    engine = "exhaustive" if entry in NARROW else "stages"
    result = _check(entry, engine, timeout=120)
    found = result.verdict.counterexample
    x = result.problem.input_value(found)
    text = run_icarus([entry.path], "bcdprove_tb", write_spec_testbench(result))
    assert f"bcdprove testbench: FAIL at input {result.problem.describe_input(x)}" in text


@pytest.mark.parametrize("entry", [e for e in NARROW if e.expected == "proved"],
                         ids=lambda e: e.name)
def test_proved_designs_pass_their_testbench_in_icarus(entry):
    result = _check(entry, "exhaustive")
    text = run_icarus([entry.path], "bcdprove_tb", write_spec_testbench(result))
    assert "bcdprove testbench: PASS" in text

"""Every shipped design in designs/ elaborates, and the correct ones compute decimal digits.

Expected digits come from Python's ``str(int)`` (the reference code named in the rules);
the catalogue (designs/catalog.json) says which designs are correct, their ports and ties.
"""
from __future__ import annotations

import json
import random
from pathlib import Path

import pytest

from bcdprove.verilog import read_design
from tests.verilog.test_elaborate_helpers import values

DESIGNS = Path(__file__).resolve().parents[2] / "designs"


def _entries():
    catalog = DESIGNS / "catalog.json"
    if not catalog.is_file():
        return []
    # bcd2bin and signed entries have their own tests (tests/designs/test_spec_designs_in_icarus.py)
    entries = [e for e in json.loads(catalog.read_text())["designs"]
               if e.get("spec", "bin2bcd") == "bin2bcd"]
    marked = []
    for entry in entries:
        label = f"{entry['file']}:{entry.get('parameters') or {}}"
        wide = (entry.get("width") or 0) > 32 or entry.get("slow")
        marks = [pytest.mark.slow] if wide else []
        marked.append(pytest.param(entry, id=label, marks=marks))
    return marked


def _digits(model, entry, x: int) -> list[int]:
    inputs = {entry["in"][0]: x, **entry.get("ties", {})}
    outs = [model.port(name) for name in entry["out"]]
    results = values(model, [p.node for p in outs], 0, **inputs)
    packed, shift = 0, 0
    for port, value in zip(outs, results):
        packed |= value << shift
        shift += port.width
    return [(packed >> (4 * k)) & 15 for k in range((shift + 3) // 4)]


@pytest.mark.parametrize("entry", _entries())
def test_design_elaborates_and_correct_ones_convert(entry):
    include = [str(DESIGNS / d) for d in entry.get("include_dirs", [])]
    model = read_design([str(DESIGNS / entry["file"])], entry["top"],
                        entry.get("parameters") or None, include_dirs=include)
    assert model.port(entry["in"][0]).direction == "input"
    if entry["clocked"]:
        assert model.registers
        return
    width = model.port(entry["in"][0]).width
    rng = random.Random(7)
    samples = [0, 1, 9, 10, 99, (1 << width) - 1] + [rng.getrandbits(width) for _ in range(40)]
    if entry.get("first_failing_input") is not None:
        samples.append(entry["first_failing_input"])
    limit = entry.get("max_input")
    wrong = []
    for x in samples:
        x = x & ((1 << width) - 1)
        if limit is not None and x > limit:
            continue
        digits = _digits(model, entry, x)
        expected = [int(c) for c in reversed(str(x))]   # Python reference: str(int)
        expected += [0] * (len(digits) - len(expected))
        if digits != expected[:len(digits)] or len(expected) > len(digits) and any(expected[len(digits):]):
            wrong.append(x)
    if entry["bug"]:
        if entry.get("first_failing_input") is not None:
            assert entry["first_failing_input"] in wrong
    else:
        assert wrong == []

"""Generated test benches, run under Icarus Verilog: PASS for right designs, FAIL at the
counterexample for wrong ones (Icarus is the referee; the design text is written
independently of the hand-built model)."""
from __future__ import annotations

import re

import pytest

from bcdprove.checking import check_model
from bcdprove.reports.testbench import write_testbench
from tests.spec.hand_models import packed_converter, packed_verilog
from tests.support.icarus import run_icarus


def _bench(verilog: str, result) -> str:
    return run_icarus([], "bcdprove_tb", verilog + write_testbench(result)).strip().splitlines()[-1]


@pytest.mark.parametrize("kwargs", [{}, {"out_width": 10}])
def test_proved_design_passes(kwargs):
    result = check_model(packed_converter(8, 3, **kwargs))
    assert result.verdict.status == "proved"
    line = _bench(packed_verilog(8, 3, **kwargs), result)
    assert re.fullmatch(r"bcdprove testbench: PASS \d+ vectors", line)


@pytest.mark.parametrize("kwargs", [{"threshold": 4}, {"threshold": 6}, {"enable": True}])
def test_counterexample_fails_in_icarus(kwargs):
    result = check_model(packed_converter(8, 3, **kwargs))
    found = result.verdict.counterexample
    assert found is not None and found.replayed
    line = _bench(packed_verilog(8, 3, **kwargs), result)
    assert line.startswith(f"bcdprove testbench: FAIL at input {found.inputs['bin']}:")


def test_tied_enable_passes():
    result = check_model(packed_converter(8, 3, enable=True), ties={"en": 1})
    assert result.verdict.status == "proved"
    line = _bench(packed_verilog(8, 3, enable=True), result)
    assert line.startswith("bcdprove testbench: PASS")


def test_too_few_digits_fails_only_at_the_capacity_value():
    result = check_model(packed_converter(8, 2))
    line = _bench(packed_verilog(8, 2), result)
    # every vector below 100 passes first; 100 = 10**2 cannot be shown by two digits
    assert line.startswith("bcdprove testbench: FAIL at input 100:")

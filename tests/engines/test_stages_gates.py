"""The stage engine on gate-level netlists, whose digits live in four separate 1-bit nets.

The netlists come from designs/tools/gate_netlist.py (the triangular add-3 array lowered to
and/or/xor/not primitives); the shipped 32-bit one is in the catalogue, checked in Icarus
by tests/designs.  Expected digits come from Python's ``str`` (reference code); a
counterexample must also be wrong in Icarus Verilog, run on the same file.
"""
from __future__ import annotations

import sys
from pathlib import Path

import pytest

from bcdprove.engines.base import DISPROVED, PROVED, Budget
from bcdprove.engines.stages import StageEngine
from bcdprove.engines.stages.mining import mine
from bcdprove.spec.bin2bcd import build_problem
from bcdprove.verilog import read_design
from tests.support.converters import digit_count, python_digits
from tests.support.icarus import icarus_bcd_digits

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT / "designs" / "tools"))
import gate_netlist  # noqa: E402  (the generator of the shipped netlists)

SHIPPED = ROOT / "designs" / "wide" / "meter_wide_gates32.v"


def _netlist(tmp_path: Path, width: int, fault=None) -> tuple[Path, str]:
    path = tmp_path / f"gates{width}.v"
    path.write_text(gate_netlist.build_wide(width, fault))
    return path, f"meter_wide_gates{width}"


def _problem(path: Path, top: str):
    return build_problem(read_design([str(path)], top=top))


def test_the_shipped_netlist_is_the_generators_output():
    assert SHIPPED.read_text() == gate_netlist.build_wide(32)


def test_no_word_holds_a_digit_so_digits_are_assembled_from_nets():
    mining = mine(_problem(SHIPPED, "meter_wide_gates32"))
    # Stage 20: 2**20 - 1 = 1048575 has 7 digits (Python str); each gets a candidate made
    # of 1-bit nets (tier 3), since the netlist has no 4-bit signal at all.
    assert mining.matched(20)
    assert all(options and options[0].tier == 3 for options in mining.candidates[20][:7])
    assert all(mining.candidates[20][j][0].node.id in mining.synthetic for j in range(7))


def test_the_shipped_32_bit_netlist_is_proved():
    verdict = StageEngine().run(_problem(SHIPPED, "meter_wide_gates32"), Budget(300))
    assert verdict.status == PROVED, verdict.reason
    assert verdict.stats["stages_proved"] == 32


@pytest.mark.slow
def test_a_64_bit_netlist_is_proved(tmp_path):
    path, top = _netlist(tmp_path, 64)
    verdict = StageEngine().run(_problem(path, top), Budget(600))
    assert verdict.status == PROVED, verdict.reason


@pytest.mark.parametrize("width,fault", [(32, (24, 4)), (48, (40, 10))])
def test_a_faulty_cell_is_disproved_and_icarus_agrees(tmp_path, width, fault):
    path, top = _netlist(tmp_path, width, fault)
    problem = _problem(path, top)
    verdict = StageEngine().run(problem, Budget(300))
    assert verdict.status == DISPROVED, verdict.reason
    found = verdict.counterexample
    assert found.replayed
    x = found.inputs["count"]
    shown = digit_count(width)
    assert found.expected == python_digits(x, shown)
    assert icarus_bcd_digits(path, top, width, x, shown) != python_digits(x, shown)


def test_a_faulty_cell_that_no_input_reaches_is_proved(tmp_path):
    # 2**40 - 1 = 1099511627775 (Python int): digit 12 is the top digit of stage 40 and at
    # most 1 there, so the cell that misses 5 and 6 never misbehaves on a reachable state.
    assert str((1 << 40) - 1)[0] == "1" and len(str((1 << 40) - 1)) == 13
    path, top = _netlist(tmp_path, 48, (40, 12))
    verdict = StageEngine().run(_problem(path, top), Budget(300))
    assert verdict.status == PROVED, verdict.reason

"""``bcdprove check`` as a user runs it: a subprocess on shipped Verilog designs.

Expected verdicts come from designs/catalog.json (found with Icarus); the written test
bench is run under Icarus.
"""
from __future__ import annotations

import json
import subprocess
import sys
import xml.etree.ElementTree as ElementTree

from tests.designs.catalog import DESIGNS, REPOSITORY
from tests.support.icarus import run_icarus


def _bcdprove(*arguments: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-c", "from bcdprove.cli import main; main()",
                           "check", *arguments], capture_output=True, text=True,
                          cwd=REPOSITORY, timeout=300)


def test_proved_design_exits_0():
    ran = _bcdprove(str(DESIGNS / "comb/scale_add3_triangle8.v"), "--top", "scale_add3_triangle8")
    assert ran.returncode == 0, ran.stderr
    assert "PROVED" in ran.stdout and "input `grams`" in ran.stdout


def test_buggy_design_exits_1_and_its_testbench_fails_in_icarus(tmp_path):
    design = DESIGNS / "comb/meter_threshold6_bug.v"
    bench = tmp_path / "bench.v"
    ran = _bcdprove(str(design), "--top", "meter_threshold6_bug", "--param", "W=12",
                    "--param", "D=4", "--json", "--testbench", str(bench))
    assert ran.returncode == 1, ran.stderr
    record = json.loads(ran.stdout)
    # catalogue: the smallest input Icarus shows wrong is 10
    assert record["counterexample"]["inputs"] == {"litres": "10"}
    text = run_icarus([design], "bcdprove_tb", bench.read_text())
    assert "bcdprove testbench: FAIL at input 10" in text


def test_untied_enable_then_tied(tmp_path):
    design = str(DESIGNS / "comb/pump_enable.v")
    ran = _bcdprove(design, "--top", "pump_enable")
    assert ran.returncode == 1 and "--tie en=VALUE" in ran.stdout
    junit = tmp_path / "report.xml"
    ran = _bcdprove(design, "--top", "pump_enable", "--tie", "en=1", "--junit", str(junit))
    assert ran.returncode == 0, ran.stdout + ran.stderr
    suite = ElementTree.parse(junit).getroot()
    assert suite.attrib["tests"] == "1" and suite.attrib["failures"] == "0"


def test_unknown_exits_3():
    ran = _bcdprove(str(DESIGNS / "comb/meter_bin2bcd_loop.v"), "--top", "meter_bin2bcd_loop",
                    "--engine", "random", "--vectors", "1000")
    assert ran.returncode == 3 and "UNKNOWN" in ran.stdout


def test_input_error_is_one_line_with_file_and_line(tmp_path):
    broken = tmp_path / "broken.v"
    broken.write_text("module broken(input [7:0] a, output [11:0] y);\n"
                      "  assign y = nothere;\nendmodule\n")
    ran = _bcdprove(str(broken), "--top", "broken")
    assert ran.returncode == 2
    assert ran.stderr.strip().startswith(f"{broken}:2:")
    assert "Traceback" not in ran.stderr and len(ran.stderr.strip().splitlines()) == 1


def test_ambiguous_ports_ask_for_in(tmp_path):
    two = tmp_path / "two.v"
    two.write_text("module two(input [7:0] a, input [7:0] b, output [11:0] y);\n"
                   "  assign y = a + b;\nendmodule\n")
    ran = _bcdprove(str(two), "--top", "two")
    assert ran.returncode == 2 and "--in PORT" in ran.stderr

"""``bcdprove equiv`` on the command line: exit codes, --json, --junit, --quiet, --testbench.

Expected verdicts: see test_hand_pairs.py (IEEE 1364-2005 clauses) and the catalogue; the
written test benches are run in Icarus Verilog, the independent simulator.
"""
from __future__ import annotations

import json
import subprocess
import sys
import xml.etree.ElementTree as ElementTree

import pytest

from tests.designs.catalog import DESIGNS
from tests.support.icarus import run_icarus

from . import hand_designs as hd

CORRECT = str(DESIGNS / "comb/water_short_path.v")
BUGGY = str(DESIGNS / "comb/water_short_path_bug.v")
LOOP = str(DESIGNS / "wide/meter_wide_loop.v")
ARRAY = str(DESIGNS / "wide/meter_wide_digit_array.v")


def bcdprove(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "bcdprove", "equiv", *args],
                          capture_output=True, text=True, timeout=600)


def test_equivalent_designs_exit_0_and_say_proved():
    ran = bcdprove(LOOP, "--top", "meter_wide_loop", "--param", "W=10", "--against", ARRAY,
                   "--against-top", "meter_wide_digit_array", "--against-param", "W=10")
    assert ran.returncode == 0, ran.stderr
    assert "verdict     PROVED" in ran.stdout
    assert "the outputs agree for every input" in ran.stdout


def test_different_designs_exit_1_with_both_outputs_side_by_side():
    ran = bcdprove(CORRECT, "--top", "water_short_path", "--against", BUGGY,
                   "--against-top", "water_short_path_bug")
    assert ran.returncode == 1, ran.stderr
    assert "verdict     DISPROVED" in ran.stdout
    assert "input litres = " in ran.stdout
    assert "water_short_path " in ran.stdout and "water_short_path_bug " in ran.stdout
    assert "^" in ran.stdout                     # a differing nibble is marked


def test_an_unpaired_port_exits_2_naming_it(tmp_path):
    a = hd.write(tmp_path, "a.v", hd.SUM_AB)
    b = hd.write(tmp_path, "b.v", hd.SUM_RENAMED)
    ran = bcdprove(a, "--top", "sum_ab", "--against", b, "--against-top", "sum_renamed")
    assert ran.returncode == 2
    assert "input `a` of `sum_ab` has no counterpart" in ran.stderr


def test_map_pairs_ports_on_the_command_line(tmp_path):
    a = hd.write(tmp_path, "a.v", hd.SUM_AB)
    b = hd.write(tmp_path, "b.v", hd.SUM_RENAMED)
    ran = bcdprove(a, "--top", "sum_ab", "--against", b, "--against-top", "sum_renamed",
                   "--map", "a=left,b=right", "--map", "y=total", "--quiet")
    assert ran.returncode == 0, ran.stderr
    assert ran.stdout.startswith("proved: sum_ab against sum_renamed")


def test_random_engine_exits_3(tmp_path):
    a = hd.write(tmp_path, "a.v", hd.SUM_AB)
    b = hd.write(tmp_path, "b.v", hd.SUM_BA)
    ran = bcdprove(a, "--top", "sum_ab", "--against", b, "--against-top", "sum_ba",
                   "--engine", "random", "--vectors", "100")
    assert ran.returncode == 3


def test_json_holds_the_counterexample_and_stats(tmp_path):
    ran = bcdprove(CORRECT, "--top", "water_short_path", "--against", BUGGY,
                   "--against-top", "water_short_path_bug", "--json",
                   "--junit", str(tmp_path / "report.xml"))
    assert ran.returncode == 1
    record = json.loads(ran.stdout)
    assert record["verdict"] == "disproved"
    assert record["designs"]["design"]["top"] == "water_short_path"
    assert record["designs"]["against"]["top"] == "water_short_path_bug"
    found = record["counterexample"]
    litres = int(found["inputs"]["litres"])
    (out,) = found["outputs"]
    assert out["differs"] and out["design_value"] != out["against_value"]
    # The correct design shows the decimal digits of the input (Python str as reference).
    assert int(out["design_value"]) == int(str(litres), 16)
    assert found["replayed"] is True
    suite = ElementTree.parse(tmp_path / "report.xml").getroot()
    assert suite.get("failures") == "1" and suite.get("tests") == "1"


def test_json_of_a_proof_counts_the_sweep(tmp_path):
    ran = bcdprove(LOOP, "--top", "meter_wide_loop", "--param", "W=10", "--against", ARRAY,
                   "--against-top", "meter_wide_digit_array", "--against-param", "W=10",
                   "--json")
    record = json.loads(ran.stdout)
    assert record["verdict"] == "proved"
    sweep = record["stats"]["sweep"]
    assert sweep["candidates"] > 0
    assert sweep["proved"] <= sweep["proposed"]
    assert record["stats"]["outputs_proved"] == ["bcd"]


@pytest.mark.parametrize("against,against_top,verdict", [
    (BUGGY, "water_short_path_bug", "FAIL at vector 1"),
    (str(DESIGNS / "comb/meter_threshold6_bug.v"), "meter_threshold6_bug", "FAIL at vector 1"),
])
def test_testbench_of_different_designs_fails_in_icarus(tmp_path, against, against_top, verdict):
    bench = tmp_path / "bench.v"
    ran = bcdprove(CORRECT, "--top", "water_short_path", "--against", against,
                   "--against-top", against_top, "--testbench", str(bench), "--quiet")
    assert ran.returncode == 1
    out = run_icarus([CORRECT, against], "bcdprove_equiv_tb", bench.read_text())
    assert verdict in out


def test_testbench_of_equivalent_designs_passes_in_icarus(tmp_path):
    bench = tmp_path / "bench.v"
    ran = bcdprove(LOOP, "--top", "meter_wide_loop", "--param", "W=10", "--against", ARRAY,
                   "--against-top", "meter_wide_digit_array", "--against-param", "W=10",
                   "--testbench", str(bench), "--quiet")
    assert ran.returncode == 0
    out = run_icarus([LOOP, ARRAY], "bcdprove_equiv_tb", bench.read_text())
    assert "bcdprove testbench: PASS" in out


def test_testbench_refused_when_both_designs_define_one_module_name(tmp_path):
    a = hd.write(tmp_path, "one.v", hd.CELL_PLUS_ONE)
    b = hd.write(tmp_path, "two.v", hd.CELL_ONE_PLUS)
    ran = bcdprove(a, "--top", "top_plus", "--against", b, "--against-top", "top_plus",
                   "--testbench", str(tmp_path / "bench.v"))
    assert ran.returncode == 2
    assert "both designs define module(s) cell, top_plus" in ran.stderr
    assert not (tmp_path / "bench.v").exists()


def test_pipelines_on_the_command_line():
    pipe = str(DESIGNS / "clocked/scale_pipeline_bcd.v")
    skew = str(DESIGNS / "clocked/scale_pipeline_skew_bug.v")
    ran = bcdprove(pipe, "--top", "scale_pipeline_bcd", "--against", skew,
                   "--against-top", "scale_pipeline_skew_bug", "--latency", "9", "--quiet")
    assert ran.returncode == 1, ran.stderr       # designs/catalog.json: the skew bug, latency 9
    assert "differing bcd@9" in ran.stdout
    refused = bcdprove(pipe, "--top", "scale_pipeline_bcd", "--against", skew,
                       "--against-top", "scale_pipeline_skew_bug", "--latency", "9",
                       "--testbench", "unused.v")
    assert refused.returncode == 2
    assert "not written for clocked pairs yet" in refused.stderr


def test_protocol_options_for_combinational_designs_are_an_error(tmp_path):
    a = hd.write(tmp_path, "a.v", hd.SUM_AB)
    b = hd.write(tmp_path, "b.v", hd.SUM_BA)
    ran = bcdprove(a, "--top", "sum_ab", "--against", b, "--against-top", "sum_ba",
                   "--latency", "2")
    assert ran.returncode == 2
    assert "--latency: both designs are combinational" in ran.stderr


def test_handshake_pairs_on_the_command_line():
    serial = str(DESIGNS / "clocked/meter_serial_bcd.v")
    twin = str(DESIGNS / "clocked/meter_serial_count_bug.v")
    sizes = ("--param", "W=12", "--param", "D=4", "--against-param", "W=12",
             "--against-param", "D=4")
    ran = bcdprove(serial, "--top", "meter_serial_bcd", "--against", twin,
                   "--against-top", "meter_serial_count_bug", *sizes, "--quiet")
    assert ran.returncode == 1, ran.stderr   # designs/catalog.json: the count bug fails at 1
    assert "differing bcd@done" in ran.stdout
    same = bcdprove(serial, "--top", "meter_serial_bcd", "--against", serial,
                    "--against-top", "meter_serial_bcd", *sizes, "--start", "start",
                    "--done", "done", "--max-cycles", "14", "--quiet")
    assert same.returncode == 0, same.stdout + same.stderr
    refused = bcdprove(serial, "--top", "meter_serial_bcd", "--against", twin,
                       "--against-top", "meter_serial_count_bug", *sizes,
                       "--testbench", "unused.v")
    assert refused.returncode == 2
    assert "not written for clocked pairs yet" in refused.stderr

"""``bcdprove check --spec bcd2bin|signed`` on the shipped designs: exit codes, reports, errors."""
from __future__ import annotations

import json
import sys
import xml.etree.ElementTree as ElementTree

import pytest

from bcdprove.cli import main
from tests.designs.catalog import DESIGNS


def _run(monkeypatch, capsys, *arguments):
    monkeypatch.setattr(sys, "argv", ["bcdprove", "check", *arguments])
    try:
        main()
        code = 0
    except SystemExit as done:
        code = done.code
    out, err = capsys.readouterr()
    return code, out, err


def _design(name: str) -> str:
    return str(DESIGNS / name)


def test_bcd2bin_proved_on_split_ports(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, _design("bcd2bin/pump_tens_ones.v"), "--top",
                        "pump_tens_ones", "--spec", "bcd2bin", "--in", "ones,tens")
    assert code == 0 and "PROVED" in out and "inputs `ones`, `tens`: named with --in" in out


def test_bcd2bin_quiet_line_shows_packed_digits_in_hex(monkeypatch, capsys):
    # Too narrow: 40 digits into 67 bits; the smallest value the output cannot hold is 2**67
    # (Python int: 147573952589676412928), written as packed BCD its decimal digits in hex.
    code, out, _ = _run(monkeypatch, capsys, _design("bcd2bin/meter_wide_bcd2bin.v"), "--top",
                        "meter_wide_bcd2bin", "--spec", "bcd2bin", "--param", "D=40",
                        "--param", "W=67", "--quiet")
    assert code == 1
    assert out.strip().endswith(f"counterexample reading=0x{2 ** 67}")


def test_bcd2bin_counterexample_report(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, _design("bcd2bin/pump_keypad_loop_x9_bug.v"),
                        "--top", "pump_keypad_loop_x9_bug", "--spec", "bcd2bin",
                        "--engine", "exhaustive")
    assert code == 1
    # digits 1 0 spell 10 (Python int); times nine gives 9
    assert "counterexample: digits 0 0 1 0 (= 10); keys = 0x10" in out
    assert "litres  10        9       <- wrong" in out


def test_bcd2bin_json_and_junit(monkeypatch, capsys, tmp_path):
    junit = tmp_path / "out.xml"
    code, out, _ = _run(monkeypatch, capsys, _design("bcd2bin/pump_keypad_narrow_bug.v"),
                        "--top", "pump_keypad_narrow_bug", "--spec", "bcd2bin", "--json",
                        "--junit", str(junit))
    assert code == 1
    record = json.loads(out)
    assert record["spec"] == "bcd2bin" and record["verdict"] == "disproved"
    # 2**13 = 8192 (Python int) is the smallest value 13 bits cannot hold
    assert record["counterexample"]["input_value"] == "8192"
    assert record["counterexample"]["inputs"] == {"keys": str(0x8192)}
    assert record["digits_check"]["verdict"] == "proved"
    assert record["design"]["widths"] == {"digits": 4, "output": 13, "output_needed": 14}
    suite = ElementTree.parse(junit).getroot()
    assert [c.get("name") for c in suite] == ["pump_keypad_narrow_bug: bcd2bin",
                                              "pump_keypad_narrow_bug: bcd2bin below 8192"]


def test_signed_report_names_the_digit_counts(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, _design("signed/scale_tare_signed_bug.v"), "--top",
                        "scale_tare_signed_bug", "--spec", "signed", "--sign", "minus")
    assert code == 1
    assert "-2,048 needs 4 for its magnitude, 2,047 needs 4; the design has them" in out
    assert "counterexample: grams = -2,048 (0x800)" in out


def test_signed_testbench_fails_in_icarus(monkeypatch, capsys, tmp_path):
    from tests.support.icarus import run_icarus
    bench = tmp_path / "tb.v"
    path = _design("signed/scale_tare_signed_bug.v")
    code, _, _ = _run(monkeypatch, capsys, path, "--top", "scale_tare_signed_bug", "--spec",
                      "signed", "--engine", "exhaustive", "--testbench", str(bench))
    assert code == 1
    text = run_icarus([path], "bcdprove_tb", bench.read_text())
    assert "bcdprove testbench: FAIL at input -2,048" in text


@pytest.mark.parametrize("arguments, message", [
    (["--spec", "bcd"], "--spec bcd: choose one of bin2bcd, bcd2bin, signed"),
    (["--spec", "bcd2bin", "--sign", "litres"], "--sign is an option of --spec signed"),
    (["--invalid-flag", "litres"], "--invalid-flag is an option of --spec bcd2bin"),
    (["--spec", "bcd2bin", "--max-input", "5"], "--max-input is an option of --spec bin2bcd"),
    (["--spec", "bcd2bin", "--in", "litres"], "port `litres` of `pump_keypad_loop` is an output"),
    (["--spec", "bcd2bin", "--invalid-flag", "oops"], "has no output port `oops`"),
])
def test_bad_options_exit_2_with_one_line(monkeypatch, capsys, arguments, message):
    code, _, err = _run(monkeypatch, capsys, _design("bcd2bin/pump_keypad_loop.v"), "--top",
                        "pump_keypad_loop", *arguments)
    assert code == 2
    assert message in err and "Traceback" not in err
    assert len(err.strip().splitlines()) == 1


@pytest.mark.parametrize("spec", ["bcd2bin", "signed"])
def test_clocked_designs_are_refused_for_the_new_specs(monkeypatch, capsys, spec):
    code, _, err = _run(monkeypatch, capsys, _design("clocked/meter_serial_bcd.v"), "--top",
                        "meter_serial_bcd", "--spec", spec)
    assert code == 2 and f"--spec {spec}: clocked designs" in err and "not supported yet" in err


def test_json_marks_the_binary_output_unchecked_next_to_a_raised_flag(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, _design("bcd2bin/pump_keypad_checked_bug.v"),
                        "--top", "pump_keypad_checked_bug", "--spec", "bcd2bin",
                        "--invalid-flag", "bad_key", "--engine", "exhaustive", "--json")
    assert code == 1
    found = json.loads(out)["counterexample"]
    # nibble A (1010) is not a decimal digit (common practice): the flag must be 1
    assert found["inputs"] == {"keys": "10"} and found["input_value"] is None
    assert found["not_checked"] == [0] and found["wrong_digits"] == [1]

"""``bcdprove check`` on the command line: exit codes 0/1/2/3, --json, --junit, --testbench.

The design reader is replaced by hand-built models here, so these tests exercise the
command itself; tests/cli/test_check_verilog.py runs it on Verilog files.
"""
from __future__ import annotations

import json
import sys
import xml.etree.ElementTree as ElementTree

import pytest

from bcdprove.cli import _design_options, main
from tests.spec.hand_models import packed_converter


def _run(monkeypatch, capsys, model, *arguments):
    monkeypatch.setattr(_design_options, "read", lambda *a, **k: model)
    monkeypatch.setattr(sys, "argv", ["bcdprove", "check", "design.v", "--top", "conv",
                                      *arguments])
    try:
        main()
        code = 0                      # the entry point returns normally on success
    except SystemExit as done:
        code = done.code
    out, err = capsys.readouterr()
    return code, out, err


def test_proved_exits_0(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, packed_converter(8, 3))
    assert code == 0 and "PROVED" in out


def test_disproved_exits_1(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, packed_converter(8, 3, threshold=4))
    assert code == 1 and "counterexample: bin = 8" in out


def test_unknown_exits_3(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, packed_converter(8, 3), "--engine", "random",
                        "--vectors", "100")
    assert code == 3 and "UNKNOWN" in out


@pytest.mark.parametrize("arguments, message", [
    (["--engine", "magic"], "choose one of"),
    (["--in", "nope"], "no input port `nope`"),
    (["--tie", "en"], "NAME=VALUE"),
    (["--max-input", "lots"], "not a number"),
    (["--max-input", "300"], "outside"),
    (["--timeout", "0"], "positive"),
])
def test_input_errors_exit_2_with_one_line(monkeypatch, capsys, arguments, message):
    code, out, err = _run(monkeypatch, capsys, packed_converter(8, 3), *arguments)
    assert code == 2
    assert message in err and "Traceback" not in err
    assert len(err.strip().splitlines()) == 1


def test_json_is_the_only_stdout(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, packed_converter(8, 3, threshold=4), "--json")
    assert code == 1
    record = json.loads(out)            # exactly one object: json.loads rejects trailing text
    assert record["verdict"] == "disproved"
    assert record["counterexample"]["inputs"]["bin"] == "8"


def test_tie_and_out_options(monkeypatch, capsys):
    code, out, _ = _run(monkeypatch, capsys, packed_converter(8, 3, enable=True),
                        "--tie", "en=1", "--out", "bcd", "--in", "bin", "--engine", "smt")
    assert code == 0 and "`en` = 1" in out


def test_junit_and_testbench_files(monkeypatch, capsys, tmp_path):
    junit = tmp_path / "report.xml"
    bench = tmp_path / "bench.v"
    code, out, _ = _run(monkeypatch, capsys, packed_converter(8, 3), "--junit", str(junit),
                        "--testbench", str(bench))
    assert code == 0
    root = ElementTree.parse(junit).getroot()
    assert root.tag == "testsuite" and root.attrib["failures"] == "0"
    assert "module bcdprove_tb;" in bench.read_text()


def test_timeout_bounds_the_check(monkeypatch, capsys):
    # a wide converter with exhaustive simulation refused and a tiny time limit
    code, out, _ = _run(monkeypatch, capsys, packed_converter(24, 8), "--timeout", "0.05",
                        "--engine", "smt", "--json")
    record = json.loads(out)
    assert code == 3 and record["verdict"] == "unknown" and record["reason"]

"""`check --junit` and `--quiet` on clocked designs.

Expected verdicts from designs/catalog.json, whose entries tests/designs checks in Icarus
Verilog: the not-cleared accumulator fails only on the second conversion."""
import subprocess
import sys
import xml.etree.ElementTree as ElementTree
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def _check(*args):
    return subprocess.run([sys.executable, "-m", "bcdprove", "check", *args], cwd=ROOT,
                          capture_output=True, text=True, timeout=300)


def test_junit_has_one_testcase_per_conversion(tmp_path):
    report = tmp_path / "clocked.xml"
    done = _check("designs/clocked/meter_serial_not_cleared_bug.v", "--top",
                  "meter_serial_not_cleared_bug", "--junit", str(report), "--quiet")
    assert done.returncode == 1
    suite = ElementTree.parse(report).getroot()
    # The usual JUnit schema: testsuite with name/tests/failures/errors, testcases with
    # name and classname.
    assert suite.tag == "testsuite" and suite.get("name") == "bcdprove"
    assert (suite.get("tests"), suite.get("failures"), suite.get("errors")) == ("2", "1", "0")
    cases = suite.findall("testcase")
    assert all(c.get("name") and c.get("classname") for c in cases)
    first, second = cases
    assert "first conversion" in first.get("name") and first.find("failure") is None
    assert "second conversion" in second.get("name") and second.find("failure") is not None


def test_quiet_clocked_check_is_one_line():
    done = _check("designs/clocked/meter_serial_not_cleared_bug.v", "--top",
                  "meter_serial_not_cleared_bug", "--quiet")
    lines = done.stdout.splitlines()
    assert done.returncode == 1 and len(lines) == 1
    assert lines[0].startswith("disproved: meter_serial_not_cleared_bug")
    assert "second conversion" in lines[0]

"""`check --quiet`: one verdict line on stdout and the usual exit codes."""
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def _run(*args):
    return subprocess.run([sys.executable, "-m", "bcdprove", "check", *args], cwd=ROOT,
                          capture_output=True, text=True, timeout=300)


def test_quiet_proved_is_one_line():
    # meter_bin2bcd_loop is catalogued as correct (checked in Icarus by tests/designs).
    done = _run("designs/comb/meter_bin2bcd_loop.v", "--top", "meter_bin2bcd_loop", "--quiet")
    assert done.returncode == 0
    lines = done.stdout.splitlines()
    assert len(lines) == 1 and lines[0].startswith("proved: meter_bin2bcd_loop")
    assert done.stderr == ""        # not a terminal: no progress bar


def test_quiet_disproved_names_the_failing_input():
    # The catalogue (checked in Icarus) gives 10 as the smallest failing input of this bug.
    done = _run("designs/comb/meter_threshold6_bug.v", "--top", "meter_threshold6_bug", "-q")
    assert done.returncode == 1
    assert done.stdout.startswith("disproved: meter_threshold6_bug")
    assert "counterexample litres=" in done.stdout


def test_reports_are_whole_when_the_process_ends_without_teardown(tmp_path):
    # `python -m bcdprove` ends with os._exit after flushing (cli.console): every byte of
    # the JSON on a pipe and of the JUnit file must be there, with the verdict's exit code.
    import json
    import xml.etree.ElementTree as ElementTree

    junit = tmp_path / "report.xml"
    done = _run("designs/comb/meter_threshold6_bug.v", "--top", "meter_threshold6_bug",
                "--json", "--junit", str(junit))
    assert done.returncode == 1
    report = json.loads(done.stdout)
    # Catalogue (checked in Icarus): 10 is the smallest failing input of this design.
    assert report["verdict"] == "disproved"
    assert report["counterexample"]["inputs"] == {"litres": "10"}
    assert any(True for _ in ElementTree.parse(junit).getroot().iter("failure"))

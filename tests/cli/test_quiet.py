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

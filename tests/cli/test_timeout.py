"""`--timeout`: running out is `unknown` (exit 3) with the reason, never a guess."""
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def test_smt_past_its_limit_is_unknown_with_the_reason():
    # A 24-bit shift-and-add-3 miter is far beyond a few seconds of z3 (ENGINE.md: 24 bits
    # gave up after 120 s); the design is correct (catalogue, checked in Icarus), so the only
    # honest answers in 3 s are unknown or proved, and the solver cannot prove it that fast.
    done = subprocess.run(
        [sys.executable, "-m", "bcdprove", "check", "designs/wide/meter_wide_loop.v", "--top",
         "meter_wide_loop", "--param", "W=24", "--engine", "smt", "--timeout", "3", "--quiet"],
        cwd=ROOT, capture_output=True, text=True, timeout=120)
    assert done.returncode == 3, done.stdout + done.stderr
    assert done.stdout.startswith("unknown: meter_wide_loop")
    assert "time limit" in done.stdout

"""Running Icarus Verilog, the independent simulator the tests use as referee.

Tests that need it call :func:`require_icarus` first: without Icarus a test is skipped on
a developer's machine but fails in CI (``CI`` set), because a skipped referee would let a
wrong model land.
"""
from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
from pathlib import Path
from typing import Sequence

import pytest


def have_icarus() -> bool:
    return shutil.which("iverilog") is not None and shutil.which("vvp") is not None


def require_icarus() -> None:
    if have_icarus():
        return
    message = "Icarus Verilog (iverilog, vvp) is not on PATH; install Debian's package iverilog"
    if os.environ.get("CI"):
        pytest.fail(message)
    pytest.skip(message)


def run_icarus(sources: Sequence[str | os.PathLike], top: str, extra_text: str = "",
               include_dirs: Sequence[str | os.PathLike] = (), defines: dict[str, str] | None = None,
               timeout: float = 300.0) -> str:
    """Compile ``sources`` (plus ``extra_text``, e.g. a test bench) with top ``top``; return vvp's stdout.

    Raises AssertionError with the compiler's message when compilation fails.
    """
    require_icarus()
    with tempfile.TemporaryDirectory(prefix="bcdprove-icarus-") as tmp:
        files = [str(s) for s in sources]
        if extra_text:
            bench = Path(tmp) / "bench.v"
            bench.write_text(extra_text)
            files.append(str(bench))
        out = Path(tmp) / "sim.vvp"
        cmd = ["iverilog", "-g2005-sv", "-o", str(out), "-s", top]
        for d in include_dirs:
            cmd.append(f"-I{d}")
        for name, value in (defines or {}).items():
            cmd.append(f"-D{name}={value}")
        cmd.extend(files)
        compiled = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout)
        if compiled.returncode != 0:
            raise AssertionError(f"iverilog failed:\n{compiled.stderr}{compiled.stdout}")
        ran = subprocess.run(["vvp", "-n", str(out)], capture_output=True, text=True, timeout=timeout)
        if ran.returncode != 0:
            raise AssertionError(f"vvp failed:\n{ran.stderr}{ran.stdout}")
        return ran.stdout


def icarus_bcd_digits(source: str | os.PathLike, top: str, width: int, x: int, digit_count: int,
                      parameters: dict[str, int] | None = None) -> list[int]:
    """The digits Icarus shows for input ``x`` on a converter with ports ``count`` and
    ``bcd`` (printed in hex: one nibble a digit), least significant first; -1 for a nibble
    with x or z bits."""
    overrides = ", ".join(f".{name}({value})" for name, value in (parameters or {}).items())
    bench = f"""
module bench;
    reg  [{width - 1}:0] count;
    wire [{4 * digit_count - 1}:0] bcd;
    {top} {f"#({overrides}) " if overrides else ""}dut (.count(count), .bcd(bcd));
    initial begin
        count = {width}'d{x};
        #1 $display("%h", bcd);
    end
endmodule
"""
    text = run_icarus([source], "bench", extra_text=bench).split()[-1]
    return [int(c, 16) if c in "0123456789abcdef" else -1 for c in reversed(text)]

"""Helpers shared by the elaborator tests (this module holds no tests itself)."""
from __future__ import annotations

import random
import re
from pathlib import Path
from typing import Mapping, Optional

from bcdprove.model import Model, Op, evaluate, leaves
from bcdprove.verilog import read_design

CASES = Path(__file__).resolve().parent / "verilog_cases"


def elaborate_text(tmp_path: Path, text: str, top: str = "dut",
                   parameters: Optional[Mapping[str, int]] = None, name: str = "case.v") -> Model:
    path = tmp_path / name
    path.write_text(text)
    return read_design([str(path)], top, parameters)


def outputs(model: Model, free: int = 0, **inputs: int) -> dict[str, int]:
    """Every output's value for the given inputs; free (x) values are set to ``free``."""
    roots = [p.node for p in model.outputs]
    return dict(zip([p.name for p in model.outputs], values(model, roots, free, **inputs)))


def values(model: Model, roots, free: int = 0, **inputs: int) -> list[int]:
    env = {}
    for port in model.inputs:
        env[port.node.id] = inputs.get(port.name, 0)
    for leaf in leaves(roots):
        if leaf.id not in env:
            env[leaf.id] = free if leaf.op == Op.FREE else 0
    return evaluate(roots, env)


def signal(model: Model, name: str, free: int = 0, **inputs: int) -> int:
    return values(model, [model.signals[name].node], free, **inputs)[0]


def depends_on_unknown(model: Model, name: str) -> bool:
    """Whether output ``name`` depends on a free (x) value."""
    return any(leaf.op == Op.FREE for leaf in leaves([model.port(name).node]))


def icarus_outputs(source: Path, top: str, model: Model, vectors: list[dict[str, int]]) -> list[dict[str, Optional[str]]]:
    """Run ``vectors`` through Icarus; per vector, each output's hex text as printed by
    ``%h`` (x digits included)."""
    from tests.support.icarus import run_icarus
    lines = ["module bench;"]
    for port in model.inputs:
        lines.append(f"  reg [{port.width - 1}:0] {port.name};")
    for port in model.outputs:
        lines.append(f"  wire [{port.width - 1}:0] {port.name};")
    connections = ", ".join(f".{p.name}({p.name})" for p in model.ports)
    lines.append(f"  {top} u ({connections});")
    lines.append("  initial begin")
    for vector in vectors:
        for port in model.inputs:
            lines.append(f"    {port.name} = {port.width}'d{vector.get(port.name, 0)};")
        formats = " ".join("%h" for _ in model.outputs)
        names = ", ".join(p.name for p in model.outputs)
        lines.append(f"    #1 $display(\"{formats}\", {names});")
    lines.append("  end")
    lines.append("endmodule")
    text = run_icarus([source], "bench", "\n".join(lines) + "\n")
    results = []
    for line in text.strip().splitlines():
        results.append(dict(zip([p.name for p in model.outputs], line.split())))
    return results


def agrees(printed: str, value: int, width: int) -> bool:
    """Whether Icarus' ``%h`` text matches ``value`` on every fully known hex digit."""
    digits = (width + 3) // 4
    expected = f"{value:0{digits}x}"
    printed = printed.lower().rjust(digits, "0")
    return all(p == e or not re.match(r"[0-9a-f]", p) for p, e in zip(printed, expected))


def random_vectors(model: Model, count: int, seed: int = 1) -> list[dict[str, int]]:
    rng = random.Random(seed)
    vectors = []
    for n in range(count):
        vector = {}
        for port in model.inputs:
            top = (1 << port.width) - 1
            vector[port.name] = [0, top, 1, top >> 1][n] if n < 4 else rng.getrandbits(port.width)
        vectors.append(vector)
    return vectors

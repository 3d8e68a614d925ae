"""The ``--testbench`` writer of ``bcdprove equiv``: one Verilog-2005 test bench, both designs.

Contract: the text defines module ``bcdprove_equiv_tb``, which instantiates the design as
``dut_a`` and the other design as ``dut_b`` (with the parameters the user set), drives both
from the same input registers (named after the design's ports), and after each vector fails
when an output pair differs (``!==``) or holds an ``x``/``z`` bit (under the conservative
reading an unknown output agrees with nothing).  It prints exactly one line,
``bcdprove testbench: PASS N vectors`` or ``bcdprove testbench: FAIL at vector ...``, then
calls ``$finish``.  Vectors: the counterexample first, then corner values at which the models
agree with every unknown value unresolved (so a test bench of equivalent designs passes and
one of different designs fails at the counterexample).  Compile it together with both
designs' files; the command refuses to write it when the two define a module of one name.
"""
from __future__ import annotations

from ..engines.difference_hunt import corner_vectors
from ..model.simulate import Simulator, pack
from .testbench import failure_lines, vector_loop_closing, vector_loop_opening

TESTBENCH_MODULE = "bcdprove_equiv_tb"


def _agreeing(problem, candidates: list[dict[int, int]]) -> list[dict[int, int]]:
    """The candidates at which every output pair is known (unknowns unresolved) and equal."""
    if not candidates:
        return []
    simulator = Simulator(problem.roots)
    lanes = len(candidates)
    values = {leaf.id: pack([v.get(leaf.id, 0) for v in candidates], leaf.width)
              for leaf in simulator.leaves if leaf.op != "free"}
    results = simulator.run(lanes, values)
    half = len(problem.outputs)
    bad = 0
    for out_a, out_b in zip(results[:half], results[half:]):
        for va, ua, vb, ub in zip(out_a.value, out_a.unknown, out_b.value, out_b.unknown):
            bad |= ua | ub | (va ^ vb)
    return [vector for lane, vector in enumerate(candidates) if not bad >> lane & 1]


def _instance(model, overrides: dict, name: str, connect) -> str:
    params = ""
    if overrides:
        params = " #(" + ", ".join(f".{k}({v})" for k, v in sorted(overrides.items())) + ")"
    connections = ", ".join(f".{p.name}({connect(p)})" for p in model.ports)
    return f"  {model.top}{params} {name} ({connections});"


def write_equiv_testbench(result, limit: int = 64) -> str:
    """The test bench text (see the module docstring)."""
    import random

    problem = result.problem
    inputs = {p.name_a: p for p in problem.inputs}
    outputs_b = {o.name_b: o for o in problem.outputs}
    lines = [f"// Self-checking test bench: `{result.model_a.top}` against "
             f"`{result.model_b.top}`, written by bcdprove equiv.",
             "// Fails when an output pair differs or holds an x or z bit.",
             "`timescale 1ns/1ps",
             f"module {TESTBENCH_MODULE};"]
    for pair in problem.inputs:
        lines.append(f"  reg [{pair.width - 1}:0] {pair.name_a};")
    for out in problem.outputs:
        lines.append(f"  wire [{out.width - 1}:0] bcdprove_a_{out.name_a};")
        lines.append(f"  wire [{out.width - 1}:0] bcdprove_b_{out.name_a};")
    lines.append(_instance(result.model_a, result.overrides_a, "dut_a",
                           lambda p: p.name if p.name in inputs else f"bcdprove_a_{p.name}"))
    name_of_b = {p.name_b: p.name_a for p in problem.inputs}
    lines.append(_instance(result.model_b, result.overrides_b, "dut_b",
                           lambda p: name_of_b[p.name] if p.name in name_of_b
                           else f"bcdprove_b_{outputs_b[p.name].name_a}"))
    lines.extend(vector_loop_opening())
    vectors = []
    found = result.verdict.counterexample
    if found is not None:
        vectors.append({p.leaf.id: found.inputs[p.name_a] for p in problem.inputs})
    corners = corner_vectors(problem.input_leaves(), random.Random(1))
    vectors += _agreeing(problem, corners)[:limit]
    for index, vector in enumerate(vectors, start=1):
        described = []
        for pair in problem.inputs:
            value = vector.get(pair.leaf.id, 0)
            lines.append(f"    {pair.name_a} = {pair.width}'d{value};")
            described.append(f"{pair.name_a}={value}")
        lines.append("    #1;")
        for out in problem.outputs:
            a, b = f"bcdprove_a_{out.name_a}", f"bcdprove_b_{out.name_a}"
            lines.extend(failure_lines(f"({a} !== {b}) || (^{a} === 1'bx) || (^{b} === 1'bx)",
                                       f'"bcdprove testbench: FAIL at vector {index} '
                                       f'({", ".join(described)}): {out.label} %h against %h", '
                                       f'{a}, {b}'))
        lines.append("    bcdprove_vectors = bcdprove_vectors + 1;")
    lines.extend(vector_loop_closing())
    return "\n".join(lines) + "\n"

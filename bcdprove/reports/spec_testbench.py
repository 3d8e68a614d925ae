"""The ``--testbench`` writer for the bcd2bin and signed checks (bin2bcd: testbench.py).

Same contract as :func:`~bcdprove.reports.testbench.write_testbench`: module ``bcdprove_tb``
instantiates the top module, drives each vector, compares every checked output with ``!==``
against the expected constant (an ``x`` or ``z`` fails too; an output that does not matter
for a vector, such as the binary value next to a raised invalid-digit flag, is not
compared), and prints exactly one line, ``bcdprove testbench: PASS N vectors`` or
``bcdprove testbench: FAIL at input ...``.  Vectors: the counterexample(s) first, then
corner values the model shows right with every free input at 0.
"""
from __future__ import annotations

from .testbench import (TESTBENCH_MODULE, dut_lines, failure_lines, vector_loop_closing,
                        vector_loop_opening)


def _vectors(result, limit: int) -> list[tuple[int, dict[str, int]]]:
    problem = result.problem
    free_inputs = [leaf for leaf in problem.free_leaves() if leaf.op == "input"]
    vectors: list[tuple[int, dict[str, int]]] = []
    for verdict in (result.verdict, result.digits_check):
        found = verdict.counterexample if verdict is not None else None
        if found is not None:
            others = {k: v for k, v in found.inputs.items() if k not in problem.input_ports}
            vectors.append((problem.input_value(found), others))
    zeros = {leaf.id: 0 for leaf in free_inputs}
    for x in problem.corner_inputs():
        if len(vectors) >= limit:
            break
        if problem.replay(x, zeros) is None:
            vectors.append((x, {leaf.params[0]: 0 for leaf in free_inputs}))
    return vectors


def _constant(value: int, width: int) -> str:
    return f"{max(width, value.bit_length(), 1)}'d{value}"


def write_spec_testbench(result, limit: int = 64) -> str:
    """The test bench text (see the module docstring)."""
    problem, model = result.problem, result.model
    lines = [f"// Self-checking test bench for `{model.top}` (--spec {problem.spec}), written by "
             "bcdprove check.",
             "`timescale 1ns/1ps",
             f"module {TESTBENCH_MODULE};"]
    lines.extend(dut_lines(model, result.overrides))
    lines.extend(vector_loop_opening(problem.ties, model))
    for x, others in _vectors(result, limit):
        for name, value in problem.input_fields(x).items():
            lines.append(f"    {name} = {model.port(name).width}'d{value};")
        for name, value in others.items():
            lines.append(f"    {name} = {model.port(name).width}'d{value};")
        lines.append("    #1;")
        expectation = problem.expectation(x)
        checks = []
        for source, want, node in zip(problem.checked_names, expectation.values, problem.checked):
            if want is None:
                continue
            width = node.width
            checks.append(f"{source} !== {_constant(want, width)}")
        described = problem.describe_input(x).replace('"', "'")
        shown = ", ".join(f"{name} = %0d" for name in problem.checked_names)
        lines.extend(failure_lines(' || '.join(checks) or '1 == 0',
                                   f'"bcdprove testbench: FAIL at input {described}: {shown}", '
                                   f'{", ".join(problem.checked_names)}'))
        lines.append("    bcdprove_vectors = bcdprove_vectors + 1;")
    lines.extend(vector_loop_closing())
    return "\n".join(lines) + "\n"

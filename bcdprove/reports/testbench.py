"""The ``--testbench`` writer: a self-checking Verilog-2005 test bench for the checked design.

Contract: the text defines module ``bcdprove_tb`` that instantiates the top module (with the
parameters of the check), drives each vector, waits, compares every digit slice with ``!==``
against the expected constant (so an ``x`` or ``z`` output fails too), and prints exactly one
line: ``bcdprove testbench: PASS N vectors`` or ``bcdprove testbench: FAIL at input ...``,
then calls ``$finish``.  Vectors: the counterexample(s) first, then corner values the model
itself shows right (so a test bench of a proved design passes, one of a disproved design
fails at its counterexample).
"""
from __future__ import annotations

from ..spec.inputs import corner_values

TESTBENCH_MODULE = "bcdprove_tb"


def _vectors(result, limit: int) -> list[tuple[int, dict[str, int]]]:
    """(x, other input values) pairs: counterexamples the digits can show, corners that
    replay right, and last a value too large for the digits (it fails whatever the design
    does, so it goes after every vector that tests the design)."""
    problem = result.problem
    port = problem.input_ports[0]
    free_inputs = [leaf for leaf in problem.free_leaves() if leaf.op == "input"]
    vectors: list[tuple[int, dict[str, int]]] = []
    too_large: list[tuple[int, dict[str, int]]] = []
    for verdict in (result.verdict, result.digits_check):
        found = verdict.counterexample if verdict is not None else None
        if found is not None:
            x = found.inputs[port]
            others = {k: v for k, v in found.inputs.items() if k != port}
            (too_large if x >= problem.capacity() else vectors).append((x, others))
    # Untied inputs need some value for the passing vectors: all zeros, else all ones.
    choices = [{leaf.id: 0 for leaf in free_inputs},
               {leaf.id: (1 << leaf.width) - 1 for leaf in free_inputs}]
    corners = [x for x in corner_values(problem.width, problem.top_value)
               if x < problem.capacity()]
    verdicts = [problem.shows_right(corners, choice) for choice in choices]
    for index, x in enumerate(corners):
        if len(vectors) >= limit:
            break
        for choice, right in zip(choices, verdicts):
            if right[index]:
                vectors.append((x, {leaf.params[0]: choice[leaf.id] for leaf in free_inputs}))
                break
    return vectors + too_large


def _digit_check(problem, index: int, expected: int) -> str:
    """``slice !== 4'dE``, with a trimmed slice zero-extended to 4 bits first."""
    source = problem.digit_sources[index]
    name, _, bits = source.partition("[")
    if bits:
        hi, _, lo = bits.rstrip("]").partition(":")
        width = int(hi) - int(lo) + 1
    else:
        width = problem.model.port(name).width
    if width < 4:
        source = f"{{{4 - width}'b0, {source}}}"
    return f"{source} !== 4'd{expected}"


def dut_lines(model, overrides) -> list[str]:
    """Declarations of a reg per input and a wire per output, and the instance ``dut``."""
    lines = []
    for p in model.ports:
        if p.direction == "input":
            lines.append(f"  reg [{p.width - 1}:0] {p.name};")
        elif p.direction == "output":
            lines.append(f"  wire [{p.width - 1}:0] {p.name};")
    params = ""
    if overrides:
        # Only what the user overrode: the model's other parameters may be local ones.
        params = " #(" + ", ".join(f".{k}({v})" for k, v in sorted(overrides.items())) + ")"
    connections = ", ".join(f".{p.name}({p.name})" for p in model.ports
                            if p.direction in ("input", "output"))
    lines.append(f"  {model.top}{params} dut ({connections});")
    return lines


def vector_loop_opening(ties: dict[str, int] | None = None, model=None) -> list[str]:
    """The vector counter and the start of the initial block, with tied inputs set."""
    lines = ["  integer bcdprove_vectors;   // prefixed: a design port may be called vectors",
             "  initial begin",
             "    bcdprove_vectors = 0;"]
    for name, value in (ties or {}).items():
        lines.append(f"    {name} = {model.port(name).width}'d{value};")
    return lines


def failure_lines(condition: str, message: str) -> list[str]:
    """Stop with ``message`` (a $display argument list) when ``condition`` holds; else count."""
    return [f"    if ({condition}) begin",
            f"      $display({message});",
            "      $finish;",
            "    end"]


def vector_loop_closing() -> list[str]:
    """The PASS line and the end of the test bench module."""
    return ['    $display("bcdprove testbench: PASS %0d vectors", bcdprove_vectors);',
            "    $finish;",
            "  end",
            "endmodule"]


def write_testbench(result, limit: int = 64) -> str:
    """The test bench text (see the module docstring); for a bcd2bin or signed check the
    one of :mod:`.spec_testbench`."""
    if result.problem.spec != "bin2bcd":
        from .spec_testbench import write_spec_testbench
        return write_spec_testbench(result, limit)
    problem, model = result.problem, result.model
    port = problem.input_ports[0]
    lines = [f"// Self-checking test bench for `{model.top}`, written by bcdprove check.",
             "// Expected digits are the decimal digits of each input (least significant digit",
             f"// in {'the low nibble (--msd-first reversed)' if problem.msd_first else 'the low bits'}).",
             "`timescale 1ns/1ps",
             f"module {TESTBENCH_MODULE};"]
    lines.extend(dut_lines(model, result.overrides))
    lines.extend(vector_loop_opening(problem.ties, model))
    for x, others in _vectors(result, limit):
        lines.append(f"    {port} = {problem.width}'d{x};")
        for name, value in others.items():
            lines.append(f"    {name} = {model.port(name).width}'d{value};")
        lines.append("    #1;")
        expected = problem.expected_digits(x)
        checks = [_digit_check(problem, i, e) for i, e in enumerate(expected)]
        if x >= problem.capacity():
            # No output holds the top digit of this value, so it fails whatever the design does.
            lines.append(f'    $display("bcdprove testbench: FAIL at input {x}: it needs '
                         f'{len(str(x))} digits, the design shows {problem.digit_count}");')
            lines.append("    $finish;")
            continue
        shown = " ".join("%0d" for _ in problem.digits)
        actual = ", ".join(problem.digit_sources[i] for i in reversed(range(problem.digit_count)))
        want = " ".join(str(d) for d in reversed(expected))
        lines.extend(failure_lines(' || '.join(checks),
                                   f'"bcdprove testbench: FAIL at input {x}: expected digits '
                                   f'{want}, got {shown}", {actual}'))
        lines.append("    bcdprove_vectors = bcdprove_vectors + 1;")
    lines.extend(vector_loop_closing())
    return "\n".join(lines) + "\n"


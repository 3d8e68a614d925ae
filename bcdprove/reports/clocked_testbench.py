"""The ``--testbench`` writer for clocked checks: replay runs cycle by cycle in any simulator.

Contract: the text defines module ``bcdprove_tb``, instantiates the top module (with the
parameters the user overrode), and plays *runs*: the failing run first (when there is one),
then runs the model shows right.  A run sets every register to its power-up value of the
run (hierarchical assignments, so the simulator starts where the model started), then
drives each cycle's inputs as in the run and checks the protocol itself:

- handshake: after the start cycle, the first cycle whose ``done`` is 1 (``=== 1``) within
  the window must show the decimal digits of the presented value; no ``done`` in the
  window fails with "done never rose";
- pipeline: the outputs of the read cycle must show them; free-running: every cycle from
  the read cycle through the last one checked.

Every comparison is ``!==`` against a constant, so x or z outputs fail too.  Exactly one
line is printed: ``bcdprove testbench: PASS N runs`` or ``bcdprove testbench: FAIL run K
...``, then ``$finish``.  Cycle timing (1 ns units): inputs change 1 ns into a cycle,
outputs are checked at 8 ns, the active edge comes at 9 ns for a design on one edge (10 ns
for one on both, whose falling edge then comes at 5 ns), as in :mod:`bcdprove.model.unroll`.
"""
from __future__ import annotations

from typing import Optional

from ..spec.inputs import corner_values
from ..model.node import Op
from ..spec.bin2bcd import decimal_digits
from .testbench import TESTBENCH_MODULE, dut_lines


def _clock_plan(unrolled) -> tuple[int, list[tuple[int, int]]]:
    """The clock's level at a run's start and its (time in cycle, level) changes."""
    edges = {r.edge for r in unrolled.source.registers}
    if edges == {"posedge", "negedge"}:
        return 1, [(5, 0), (10, 1)]
    if edges == {"negedge"}:
        return 1, [(9, 0), (10, 1)]
    return 0, [(9, 1), (10, 0)]


def _digit_slice(problem, source_model, index: int) -> str:
    """The bench expression of digit ``index``: a slice of an output, zero-extended to 4 bits."""
    source = problem.digit_sources[index]
    name, _, bits = source.partition("[")
    if bits:
        hi, _, lo = bits.rstrip("]").partition(":")
        width = int(hi) - int(lo) + 1
    else:
        width = source_model.port(name).width
    if width < 4:
        return f"{{{4 - width}'b0, {source}}}"
    return source


def _runs(result, limit: int) -> list[tuple[object, dict[int, int], str]]:
    """(clocked problem, leaf values, label) per run: the failing one, then right ones."""
    runs = []
    failing = result.failing
    if failing is not None:
        runs.append((failing.clocked, failing.leaf_values, "the counterexample"))
    for obligation in result.obligations:
        if len(runs) >= limit:
            break
        clocked = obligation.main
        problem = clocked.problem
        corners = [x for x in corner_values(problem.width, problem.top_value)
                   if x < problem.capacity()]
        picked = 0
        for x in corners:
            if picked >= 3 or len(runs) >= limit:
                break
            values = {problem.x.id: x}
            if problem.replay(x, {leaf.id: 0 for leaf in problem.free_leaves()}) is None:
                runs.append((clocked, values, f"{obligation.title}, value {x}"))
                picked += 1
    return runs


def write_clocked_testbench(result, limit: int = 8) -> str:
    """The test bench text (see the module docstring)."""
    model = result.model
    unrolled_any = result.obligations[0].main.unrolled
    clock = unrolled_any.clock
    lines = [f"// Self-checking clocked test bench for `{model.top}`, written by bcdprove check.",
             "// Each run: power-up register values, then one clock cycle per block; the",
             "// expected digits are the decimal digits of the value presented.",
             "`timescale 1ns/1ns",
             f"module {TESTBENCH_MODULE};"]
    lines.extend(dut_lines(model, result.overrides))
    lines.append("  integer bcdprove_runs;   // prefixed: a design port may be called runs")
    lines.append("  reg bcdprove_read;")
    start_level, changes = _clock_plan(unrolled_any)
    lines.append("  initial begin")
    lines.append("    bcdprove_runs = 0;")
    if clock is not None:
        lines.append(f"    {clock} = 1'b{start_level};")
    lines.append("    #2;")
    for number, (clocked, values, label) in enumerate(_runs(result, limit), start=1):
        lines += _run_lines(clocked, values, number, label, changes, clock)
    lines.append('    $display("bcdprove testbench: PASS %0d runs", bcdprove_runs);')
    lines.append("    $finish;")
    lines.append("  end")
    lines.append("endmodule")
    return "\n".join(lines) + "\n"


def _check_lines(clocked, x: int, number: int, cycle: int, indent: str) -> list[str]:
    problem = clocked.problem
    expected = decimal_digits(x, problem.digit_count)
    if x >= problem.capacity():
        return [f'{indent}$display("bcdprove testbench: FAIL run {number}: {x} needs '
                f'{len(str(x))} digits, the design shows {problem.digit_count}");',
                f"{indent}$finish;"]
    source_model = clocked.unrolled.source
    checks = [f"{_digit_slice(problem, source_model, i)} !== 4'd{e}"
              for i, e in enumerate(expected)]
    shown = " ".join("%0d" for _ in expected)
    actual = ", ".join(_digit_slice(problem, source_model, i)
                       for i in reversed(range(len(expected))))
    want = " ".join(str(d) for d in reversed(expected))
    return [f"{indent}if ({' || '.join(checks)}) begin",
            f'{indent}  $display("bcdprove testbench: FAIL run {number}: {clocked.data_input} '
            f'= {x}, cycle {cycle}: expected digits {want}, got {shown}", {actual});',
            f"{indent}  $finish;",
            f"{indent}end"]


def _run_lines(clocked, values: dict[int, int], number: int, label: str,
               changes: list[tuple[int, int]], clock: Optional[str]) -> list[str]:
    unrolled = clocked.unrolled
    problem = clocked.problem
    trace = unrolled.trace(values)
    x = values.get(problem.x.id, 0)
    present = clocked.present_cycle(_with_defaults(clocked, values))
    protocol = clocked.protocol
    widths = {p.name: p.width for p in unrolled.source.ports}
    lines = [f"    // run {number}: {label}"]
    for name, value in unrolled.initial_values(values).items():
        width = next(r.width for r in unrolled.source.registers if r.name == name)
        lines.append(f"    dut.{name} = {width}'d{value};")
    lines.append("    bcdprove_read = 1'b0;")
    handshake = protocol.done is not None
    window = None
    if handshake and present is not None:
        window = range(present + 1, present + 1 + (protocol.max_cycles or 2 * problem.width + 8))
    reads = set()
    if not handshake:
        first = clocked.read[0].cycle
        reads = set(range(first, (clocked.stable_until or first) + 1))
    for cycle in trace:
        t = cycle.cycle
        lines.append(f"    // cycle {t}")
        events = [(1, "inputs", None), (8, "check", None)] + [(at, "clock", level)
                                                            for at, level in changes]
        elapsed = 0
        for at, kind, level in sorted(events, key=lambda e: e[0]):
            if at > elapsed:
                lines.append(f"    #{at - elapsed};")
                elapsed = at
            if kind == "inputs":
                for name, value in cycle.inputs.items():
                    lines.append(f"    {name} = {widths[name]}'d{value};")
            elif kind == "clock" and clock is not None:
                lines.append(f"    {clock} = 1'b{level};")
            elif kind == "check":
                if window is not None and t in window:
                    lines.append(f"    if (!bcdprove_read && {protocol.done} === 1'b1) begin")
                    lines.append("      bcdprove_read = 1'b1;")
                    lines += _check_lines(clocked, x, number, t, "      ")
                    lines.append("    end")
                elif t in reads:
                    lines += _check_lines(clocked, x, number, t, "    ")
        if elapsed < 10:
            lines.append(f"    #{10 - elapsed};")
        if window is not None and t == window.stop - 1:
            break
    if window is not None:
        lines.append("    if (!bcdprove_read) begin")
        lines.append(f'      $display("bcdprove testbench: FAIL run {number}: {protocol.done} '
                     f'never rose within {len(window)} cycles of the start in cycle {present}");')
        lines.append("      $finish;")
        lines.append("    end")
    lines.append("    bcdprove_runs = bcdprove_runs + 1;")
    return lines


def _with_defaults(clocked, values: dict[int, int]) -> dict[int, int]:
    full = dict(values)
    for point in clocked.present:
        for leaf in _leaves(point.condition):
            full.setdefault(leaf.id, 0)
    return full


def _leaves(node):
    from ..model.node import leaves

    return [n for n in leaves([node]) if n.op in (Op.INPUT, Op.FREE, Op.STATE)]

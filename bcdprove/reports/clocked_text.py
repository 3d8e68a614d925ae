"""The plain-text report of a clocked check, with the failing run as a cycle-by-cycle table.

Contract: :func:`clocked_report` takes a :class:`~bcdprove.clocked.ClockedResult` and returns
lines without colour or terminal control codes.  :func:`cycle_table` shows one row per
cycle and one column per port (the clock excluded: every row is one clock period, the
active edge at its end); one-bit ports in binary, wider ones in hex, so a packed BCD output
reads as its decimal digits.
"""
from __future__ import annotations

from typing import Mapping, Optional, Sequence

from .text import VERDICT_WORDS, verdict_lines
from ..model.unroll import CycleValues, UnrolledModel



def port_text(value: int, width: int) -> str:
    """``1`` for a one-bit port, ``0x0f3`` (one digit per 4 bits) for a wider one."""
    if width == 1:
        return str(value)
    return f"0x{value:0{-(-width // 4)}x}"


def cycle_table(unrolled: UnrolledModel, trace: Sequence[CycleValues],
                marks: Mapping[int, str] | None = None, registers: bool = False) -> list[str]:
    """Rows ``cycle | inputs | outputs | note``; ``marks`` adds a note per cycle.

    With ``registers`` every register gets a column too (wide tables: use a VCD instead).
    """
    source = unrolled.source
    inputs = unrolled.input_names
    outputs = unrolled.output_names
    regs = [r.name for r in source.registers] if registers else []
    header = ["cycle"] + inputs + outputs + regs + [""]
    rows = [header]
    widths = {p.name: p.width for p in source.ports}
    widths.update({r.name: r.width for r in source.registers})
    for values in trace:
        row = [str(values.cycle)]
        row += [port_text(values.inputs[n], widths[n]) for n in inputs]
        row += [port_text(values.outputs[n], widths[n]) for n in outputs]
        row += [port_text(values.registers[n], widths[n]) for n in regs]
        row.append((marks or {}).get(values.cycle, ""))
        rows.append(row)
    sizes = [max(len(r[c]) for r in rows) for c in range(len(header))]
    lines = []
    for k, row in enumerate(rows):
        cells = [cell.rjust(size) if c < len(row) - 1 else cell
                 for c, (cell, size) in enumerate(zip(row, sizes))]
        lines.append("  " + "  ".join(cells).rstrip())
        if k == 0:
            lines.append("  " + "  ".join("-" * s for s in sizes[:-1]))
    return lines


def run_marks(obligation) -> dict[int, str]:
    """Notes for the cycle table: reset, start and read cycles of a failing run."""
    protocol = obligation.clocked.protocol
    marks: dict[int, list[str]] = {}
    if protocol.reset is not None:
        marks.setdefault(0, []).append("reset")
    if protocol.start is not None and obligation.trace:
        for values in obligation.trace:
            if values.inputs.get(protocol.start):
                marks.setdefault(values.cycle, []).append("start")
    if obligation.present_cycle is not None:
        marks.setdefault(obligation.present_cycle, []).append("value presented")
    if obligation.read_cycle is not None:
        marks.setdefault(obligation.read_cycle, []).append("result read")
    return {t: ", ".join(words) for t, words in marks.items()}


def _shown_cycles(obligation, context: int = 2) -> Optional[range]:
    """Cycles worth showing: from 0 to a little after the read (or the whole window)."""
    trace = obligation.trace
    if not trace:
        return None
    last = obligation.read_cycle if obligation.read_cycle is not None else len(trace) - 1
    return range(0, min(len(trace), last + 1 + context))


def failure_lines(obligation) -> list[str]:
    """The counterexample of a disproved obligation: value, digits, then the run."""
    found = obligation.verdict.counterexample
    problem = obligation.clocked.problem
    port = obligation.clocked.data_input
    x = found.inputs[problem.input_ports[0]]
    hex_digits = max(1, -(-problem.width // 4))
    when = f" in cycle {obligation.present_cycle}" if obligation.present_cycle is not None else ""
    lines = [f"counterexample: {port} = {x} (0x{x:0{hex_digits}x}) presented{when}"]
    if obligation.read_cycle is not None:
        lines.append(f"  result read in cycle {obligation.read_cycle}")
    if found.note:
        lines.append(f"  {found.note}")
    if found.free_values:
        lines.append(f"  with {len(found.free_values)} unknown value(s) (power-up state or x) "
                     f"chosen to make the output wrong")
    rows = [("digit", "output bits", "expected", "actual", "")]
    for i in reversed(range(len(found.expected))):
        actual = found.actual[i] if i < len(found.actual) else None
        source = problem.digit_sources[i] if i < len(problem.digit_sources) else "(no output)"
        shown = "(no such digit)" if actual is None else (
            str(actual) if actual <= 9 else f"{actual} (not a digit)")
        rows.append((str(i), source, str(found.expected[i]), shown,
                     "<- wrong" if i in found.wrong else ""))
    sizes = [max(len(r[c]) for r in rows) for c in range(5)]
    for row in rows:
        lines.append("  " + "  ".join(c.ljust(s) for c, s in zip(row, sizes)).rstrip())
    cycles = _shown_cycles(obligation)
    if cycles is not None:
        lines.append("")
        lines.append("  the failing run, one row per clock cycle (active edge at the end of "
                     "each row):")
        trace = [obligation.trace[t] for t in cycles]
        lines += ["  " + line for line in cycle_table(obligation.clocked.unrolled, trace,
                                                      run_marks(obligation))]
        if len(cycles) < len(obligation.trace):
            lines.append(f"    ... {len(obligation.trace) - len(cycles)} more cycles unrolled")
    return lines


def clocked_report(result) -> str:
    """The whole report as one string (no trailing newline)."""
    model, protocol = result.model, result.protocol
    lines = [f"bcdprove check: module `{model.top}` (clocked, {protocol.kind})"]
    lines.append(f"{'files':<12}{', '.join(model.files)}")
    if model.parameters:
        lines.append(f"{'parameters':<12}"
                     + ", ".join(f"{k}={v}" for k, v in sorted(model.parameters.items())))
    first = result.obligations[0].main.problem if result.obligations else None
    if first is not None:
        for reason in first.reasons:
            lines.append(f"{'protocol':<12}{reason}")
        top = first.top_value
        lines.append(f"{'widths':<12}{first.width}-bit input, {first.digit_count} digits shown, "
                     f"{first.needed_digits()} needed for {top:,}")
    if result.timeout is not None:
        lines.append(f"{'time limit':<12}{result.timeout:g} s")
    lines.append(f"{'engine':<12}{result.engine}")
    for obligation in result.obligations:
        main = obligation.main
        lines.append("")
        lines.append(f"{main.title}:")
        if obligation.main is not result.obligations[0].main:
            for reason in main.problem.reasons[len(first.reasons) - 1:]:
                lines.append(f"{'':<12}{reason}")
        lines.extend(verdict_lines("verdict", obligation.verdict))
    lines.append("")
    lines.append(f"{'overall':<12}{VERDICT_WORDS[result.status]} "
                 f"({result.seconds:.2f} s)")
    for note in result.notes:
        lines.append(f"{'note':<12}{note}")
    failing = result.failing
    if failing is not None:
        lines.append("")
        lines.append(f"{failing.title}:")
        lines.extend(failure_lines(failing))
    return "\n".join(lines)


def evaluation_table(results, registers: bool = False) -> str:
    """``bcdprove eval --cycles``: one row per cycle, one column per input and output port
    (and register with ``registers``); one-bit values as 0/1/x, wider ones in hex with x for
    unknown digits (IEEE 1364-2005 clause 17.1.1.3 style)."""
    from .values import hexadecimal

    if not results:
        return ""
    first = results[0]
    groups = [first.inputs, first.outputs] + ([first.registers] if registers else [])
    names = [(k, n) for k, group in enumerate(groups) for n in group]
    header = ["cycle"] + [n for _, n in names]
    rows = [header]
    for result in results:
        values = [result.inputs, result.outputs] + ([result.registers] if registers else [])
        row = [str(result.cycle)]
        for k, name in names:
            v = values[k][name]
            if v.width == 1:
                row.append("x" if v.unknown else str(v.value))
            else:
                row.append(hexadecimal(v.value, v.unknown, v.width))
        rows.append(row)
    sizes = [max(len(r[c]) for r in rows) for c in range(len(header))]
    lines = []
    for k, row in enumerate(rows):
        lines.append("  ".join(cell.rjust(size) for cell, size in zip(row, sizes)).rstrip())
        if k == 0:
            lines.append("  ".join("-" * s for s in sizes))
    return "\n".join(lines)

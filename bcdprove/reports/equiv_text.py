"""The default report of ``bcdprove equiv``: plain text, both designs' outputs side by side.

Contract: :func:`equiv_report` takes an EquivalenceResult and returns lines without colour
or terminal control codes.  A counterexample shows every input, then for each output pair
both designs' values in decimal and hex, and, when the width is a multiple of 4, the nibbles
(most significant first) with ``^`` under each nibble that differs.
"""
from __future__ import annotations

from .text import verdict_lines
from .values import hexadecimal

_GLOSS = {"proved": "the outputs agree for every input",
          "disproved": "the outputs differ at the input below",
          "unknown": "not decided"}


def _design_lines(label: str, model, overrides: dict) -> list[str]:
    lines = [f"{label:<12}`{model.top}` from {', '.join(model.files)}"]
    if model.parameters:
        shown = ", ".join(f"{k}={v}" for k, v in sorted(model.parameters.items()))
        lines.append(f"{'':<12}parameters {shown}")
    return lines


def _stats_lines(stats: dict) -> list[str]:
    lines = []
    sweep = stats.get("sweep")
    if sweep:
        lines.append(f"{'sweeping':<12}{sweep['candidates']:,} nodes, {sweep['proposed']:,} pairs "
                     f"proposed: {sweep['proved']:,} proved ({sweep['constants']:,} constants), "
                     f"{sweep['refuted']:,} refuted, {sweep['undecided']:,} undecided; "
                     f"{sweep['structural']:,} merged structurally")
    if "z3_queries" in stats:
        slowest = stats.get("slowest_query", {})
        lines.append(f"{'solver':<12}{stats['z3_queries']:,} z3 queries, "
                     f"{stats.get('z3_seconds', 0):.2f} s, slowest {slowest.get('seconds', 0):.2f} s")
    return lines


def _value_cells(value: int, width: int) -> tuple[str, str, list[str]]:
    nibbles = [str(value >> (4 * i) & 0xF) for i in reversed(range(width // 4))] \
        if width % 4 == 0 else []
    return str(value), hexadecimal(value, 0, width), nibbles


def output_rows(result, found) -> list[str]:
    """The side-by-side table of one counterexample's outputs."""
    name_a, name_b = result.model_a.top, result.model_b.top
    if name_a == name_b:
        name_a, name_b = f"{name_a} (design)", f"{name_b} (against)"
    lines = []
    for out in found.outputs:
        dec_a, hex_a, nib_a = _value_cells(out.value_a, out.width)
        dec_b, hex_b, nib_b = _value_cells(out.value_b, out.width)
        mark = "DIFFERS" if out.differs else "agrees"
        lines.append(f"  output {out.label} ({out.width} bits): {mark}")
        label_width = max(len(name_a), len(name_b))
        dec_width = max(len(dec_a), len(dec_b))
        hex_width = max(len(hex_a), len(hex_b))
        cell = max([len(n) for n in nib_a + nib_b] + [1])
        for name, dec, hx, nib in ((name_a, dec_a, hex_a, nib_a), (name_b, dec_b, hex_b, nib_b)):
            row = f"    {name:<{label_width}}  {dec:>{dec_width}}  {hx:<{hex_width}}"
            if nib:
                row += "  nibbles " + " ".join(n.rjust(cell) for n in nib)
            lines.append(row.rstrip())
        if out.differs:
            if nib_a:
                marks = " ".join(("^" if a != b else " ").rjust(cell) for a, b in zip(nib_a, nib_b))
                lines.append(f"    {'':<{label_width}}  {'':>{dec_width}}  {'':<{hex_width}}"
                             f"          {marks}".rstrip())
            diff = out.value_a ^ out.value_b
            bits = [str(i) for i in range(out.width) if diff >> i & 1]
            shown = ", ".join(bits[:16]) + (" ..." if len(bits) > 16 else "")
            lines.append(f"    differing bits: {shown}")
    return lines


def counterexample_lines(result, found) -> list[str]:
    problem = result.problem
    lines = ["counterexample:"]
    for pair in problem.inputs:
        value = found.inputs[pair.name_a]
        label = pair.name_a if pair.name_a == pair.name_b else f"{pair.name_a} (= {pair.name_b})"
        digits = max(1, -(-pair.width // 4))
        lines.append(f"  input {label} = {value} (0x{value:0{digits}x})")
    if found.uses_unknowns:
        lines.append(f"  with unknown values chosen: {len(found.free_values_a)} in "
                     f"`{result.model_a.top}`, {len(found.free_values_b)} in "
                     f"`{result.model_b.top}` (x resolved as shown; nonzero choices: "
                     f"{sum(1 for v in found.free_values_a.values() if v)} and "
                     f"{sum(1 for v in found.free_values_b.values() if v)})")
    if found.note:
        lines.append(f"  {found.note}")
    lines.extend(output_rows(result, found))
    return lines


def equiv_report(result) -> str:
    """The whole report as one string (no trailing newline)."""
    problem, verdict = result.problem, result.verdict
    lines = [f"bcdprove equiv: `{result.model_a.top}` against `{result.model_b.top}`"]
    lines.extend(_design_lines("design", result.model_a, result.overrides_a))
    lines.extend(_design_lines("against", result.model_b, result.overrides_b))
    for reason in problem.reasons:
        lines.append(f"{'ports':<12}{reason}")
    if result.timeout is not None:
        lines.append(f"{'time limit':<12}{result.timeout:g} s")
    lines.append(f"{'engine':<12}{result.engine}")
    lines.extend(verdict_lines("verdict", verdict))
    lines.append(f"{'':<12}{_GLOSS.get(verdict.status, '')}")
    lines.extend(_stats_lines(verdict.stats))
    lines.append(f"{'time':<12}{result.seconds:.2f} s in all")
    for note in result.notes:
        lines.append(f"{'note':<12}{note}")
    if verdict.counterexample is not None:
        lines.append("")
        lines.extend(counterexample_lines(result, verdict.counterexample))
    return "\n".join(lines)

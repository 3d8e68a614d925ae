"""Writing values a user reads: decimal, hex and nibbles, with unknown bits shown as x."""
from __future__ import annotations

from typing import Sequence


def decimal(value: int, unknown: int = 0) -> str:
    return "x" if unknown else str(value)


def hexadecimal(value: int, unknown: int, width: int) -> str:
    """``0x`` and one digit per 4 bits; ``x`` for a digit all unknown, ``X`` for partly unknown
    (the convention of Verilog's %h, IEEE 1364-2005 clause 17.1.1.3)."""
    digits = []
    for i in reversed(range((width + 3) // 4)):
        bits = min(4, width - 4 * i)
        u = unknown >> (4 * i) & ((1 << bits) - 1)
        if u == (1 << bits) - 1:
            digits.append("x")
        elif u:
            digits.append("X")
        else:
            digits.append(format(value >> (4 * i) & 0xF, "x"))
    return "0x" + "".join(digits)


def nibbles(value: int, unknown: int, width: int) -> str:
    """The 4-bit groups as decimal numbers, most significant first: ``2 2 5``; 10-15 are shown
    as they are, so a reader sees a nibble that is not a decimal digit."""
    parts = []
    for i in reversed(range(width // 4)):
        u = unknown >> (4 * i) & 0xF
        parts.append("x" if u else str(value >> (4 * i) & 0xF))
    return " ".join(parts)


def vector_table(model, results: Sequence) -> str:
    """A plain-text table: one block per vector, one row per port."""
    rows = [("vector", "port", "dir", "width", "decimal", "hex", "nibbles")]
    for index, result in enumerate(results, start=1):
        for direction, ports in (("in", result.inputs), ("out", result.outputs)):
            for name, v in ports.items():
                as_digits = direction == "out" and v.width % 4 == 0 and v.width > 4
                nib = nibbles(v.value, v.unknown, v.width) if as_digits else ""
                rows.append((str(index), name, direction, str(v.width), decimal(v.value, v.unknown),
                             hexadecimal(v.value, v.unknown, v.width), nib))
    widths = [max(len(r[c]) for r in rows) for c in range(len(rows[0]))]
    lines = []
    previous = None
    for row in rows:
        if previous is not None and row[0] != previous and previous != "vector":
            lines.append("")
        lines.append("  ".join(cell.ljust(w) for cell, w in zip(row, widths)).rstrip())
        previous = row[0]
    return "\n".join(lines)

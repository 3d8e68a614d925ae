"""Icarus test benches for the bcd2bin and signed catalogue entries (bin2bcd: catalog.py).

Each bench reads input values from a hex file, applies them one by one and prints every
output port in hex, one line per vector, after a ``widths`` line; the tests compare the
lines with Python's ``int`` (BCD to binary) and ``str``/``abs`` (signed magnitude digits).
"""
from __future__ import annotations

from pathlib import Path

from tests.designs.catalog import Entry, bench_body


def input_ports(entry: Entry) -> list[str]:
    return list(entry.inputs)


def output_ports(entry: Entry) -> list[str]:
    if entry.spec == "bcd2bin":
        flag = entry.raw.get("invalid_flag")
        return list(entry.outputs) + ([flag] if flag else [])
    return [entry.raw["sign"]] + list(entry.outputs)


def input_width(entry: Entry) -> int:
    return 4 * entry.raw["digits"] if entry.spec == "bcd2bin" else entry.width


def spec_bench(entry: Entry, vector_file: Path, count: int, port_widths: dict[str, int]) -> str:
    """Bench text: the packed input value of each vector is split over the input ports in
    catalogue order (least significant port lowest), outputs printed in hex."""
    total = input_width(entry)
    lines = ["module bcdprove_bench;",
             f"    reg [{total - 1}:0] stimulus [0:{count - 1}];",
             f"    reg [{total - 1}:0] value;",
             "    integer i;"]
    connections, offset = [], 0
    for port in input_ports(entry):
        width = port_widths[port]
        connections.append(f".{port}(value[{offset + width - 1}:{offset}])")
        offset += width
    outputs = output_ports(entry)
    for port in outputs:
        lines.append(f"    wire [1023:0] seen_{port};")
        connections.append(f".{port}(seen_{port})")
    return bench_body(entry, lines, connections, outputs, vector_file, count)


def parse_rows(text: str, count: int) -> tuple[list[int], list[list[int | None]]]:
    """The output ports' widths, and per vector the value of each output port (None where a
    bit is x or z)."""
    lines = [line.split() for line in text.splitlines() if line.strip()]
    header = next(i for i, words in enumerate(lines) if words and words[0] == "widths")
    widths = [int(w) for w in lines[header][1:]]
    rows = lines[header + 1:header + 1 + count]
    if len(rows) != count:
        raise AssertionError(f"bench printed {len(rows)} rows, expected {count}")
    return widths, [[None if any(c in "xXzZ" for c in w) else int(w, 16) for w in row]
                    for row in rows]

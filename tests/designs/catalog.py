"""Reading designs/catalog.json and turning its entries into Icarus test benches.

The catalogue is the contract between the shipped designs and everything that checks them:
each entry names a file, its top module, the parameters it is checked at, the binary input,
the output ports (least significant digit first), the inputs that must be held, and the
expected verdict with, for a buggy design, the smallest input it gets wrong.
"""
from __future__ import annotations

import json
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

REPOSITORY = Path(__file__).resolve().parents[2]
DESIGNS = REPOSITORY / "designs"
CATALOG = DESIGNS / "catalog.json"


@dataclass(frozen=True)
class Entry:
    """One catalogue entry; ``raw`` keeps every field, including ones not modelled here."""

    file: str
    top: str
    width: int
    parameters: dict[str, int]
    inputs: list[str]
    outputs: list[str]
    clocked: bool
    expected: str
    bug: str | None
    first_failing_input: int | None
    max_input: int | None
    ties: dict[str, int]
    raw: dict[str, Any] = field(repr=False)

    @property
    def path(self) -> Path:
        return DESIGNS / self.file

    @property
    def include_dirs(self) -> list[Path]:
        return [DESIGNS / d for d in self.raw.get("include_dirs", [])]

    @property
    def spec(self) -> str:
        """The specification the entry is checked against (bin2bcd when the field is absent)."""
        return self.raw.get("spec", "bin2bcd")

    @property
    def slow(self) -> bool:
        """Entries marked slow are simulated only in the long run (``-m slow``)."""
        return bool(self.raw.get("slow", False))

    @property
    def name(self) -> str:
        params = ",".join(f"{k}={v}" for k, v in sorted(self.parameters.items()))
        return f"{self.file}[{params}]" if params else self.file


def load_catalog(path: Path = CATALOG, spec: str | None = "bin2bcd") -> list[Entry]:
    """The entries checked against ``spec`` (every entry for None), in file order; a missing
    required field raises KeyError."""
    data = json.loads(path.read_text())
    entries = []
    for item in data["designs"]:
        if spec is not None and item.get("spec", "bin2bcd") != spec:
            continue
        entries.append(Entry(
            file=item["file"], top=item["top"], width=int(item["width"]),
            parameters=dict(item.get("parameters", {})), inputs=list(item["in"]),
            outputs=list(item["out"]), clocked=bool(item["clocked"]),
            expected=item["expected"], bug=item["bug"],
            first_failing_input=item["first_failing_input"], max_input=item["max_input"],
            ties=dict(item.get("ties", {})), raw=item))
    return entries


def reference_bcd(value: int) -> int:
    """Packed BCD of ``value``, one nibble per decimal digit (Python str(int) as reference code)."""
    return int(str(value), 16)


def expected_display(entry: Entry, value: int) -> int:
    """What the outputs of a correct design show for ``value``, read as one packed word.

    A design with ``"saturates_at_max": true`` shows ``max_input`` for every larger input.
    """
    if entry.max_input is not None and value > entry.max_input and entry.raw.get("saturates_at_max"):
        value = entry.max_input
    return reference_bcd(value)


def combinational_bench(entry: Entry, vector_file: Path, count: int) -> str:
    """Test bench text: read ``count`` input values from ``vector_file`` and print the outputs.

    The first line printed is ``widths`` and the bit width of each output port, then one line per
    vector with each output port in hex, in catalogue order. Ports are printed through the
    instance so that their own widths, not the bench's wires, decide the digits.
    """
    (data_input,) = entry.inputs
    bus = max(entry.width, 1) + 8
    lines = ["module bcdprove_bench;",
             f"    reg [{bus - 1}:0] stimulus [0:{count - 1}];",
             f"    reg [{bus - 1}:0] value;",
             "    integer i;"]
    for port in entry.outputs:
        lines.append(f"    wire [1023:0] seen_{port};")
    connections = [f".{data_input}(value[{entry.width - 1}:0])"]
    connections += [f".{port}({value})" for port, value in entry.ties.items()]
    connections += [f".{port}(seen_{port})" for port in entry.outputs]
    return bench_body(entry, lines, connections, entry.outputs, vector_file, count)


def bench_body(entry: Entry, lines: list[str], connections: list[str], outputs,
               vector_file: Path, count: int) -> str:
    """The rest of a bench after its declarations: the instance, the ``widths`` line and one
    line per vector with each of ``outputs`` in hex (shared with tests/designs/spec_benches.py)."""
    overrides = ", ".join(f".{k}({v})" for k, v in entry.parameters.items())
    header = f"{entry.top} #({overrides})" if overrides else entry.top
    lines.append(f"    {header} dut ({', '.join(connections)});")
    widths = " ".join("%0d" for _ in outputs)
    width_args = ", ".join(f"$bits(dut.{port})" for port in outputs)
    shown = " ".join("%h" for _ in outputs)
    shown_args = ", ".join(f"dut.{port}" for port in outputs)
    lines += ["    initial begin",
              f"        $readmemh(\"{vector_file}\", stimulus);",
              f"        $display(\"widths {widths}\", {width_args});",
              f"        for (i = 0; i < {count}; i = i + 1) begin",
              "            value = stimulus[i];",
              "            #1;",
              f"            $display(\"{shown}\", {shown_args});",
              "        end",
              "        $finish;",
              "    end",
              "endmodule", ""]
    return "\n".join(lines)


def parse_bench_output(text: str, count: int) -> list[int | None]:
    """Packed display word per vector (least significant port lowest); None where any bit is x or z."""
    lines = [line.split() for line in text.splitlines() if line.strip()]
    header = next(i for i, words in enumerate(lines) if words and words[0] == "widths")
    widths = [int(w) for w in lines[header][1:]]
    rows = lines[header + 1:header + 1 + count]
    if len(rows) != count:
        raise AssertionError(f"bench printed {len(rows)} rows, expected {count}")
    return [_packed(words, widths) for words in rows]


def _clocked_ports(entry: Entry, bus: int) -> tuple[list[str], list[str]]:
    """Declarations and port connections shared by the clocked benches."""
    (data_input,) = entry.inputs
    raw = entry.raw
    declarations = [f"    reg [{bus - 1}:0] value;", "    reg clk;"]
    connections = [f".{raw['clock']}(clk)", f".{data_input}(value[{entry.width - 1}:0])"]
    if raw.get("reset"):
        declarations.append("    reg reset_level;")
        connections.append(f".{raw['reset']}(reset_level)")
    if raw.get("start"):
        declarations.append("    reg start;")
        connections.append(f".{raw['start']}(start)")
    if raw.get("done"):
        connections.append(f".{raw['done']}()")
    connections += [f".{port}({value})" for port, value in entry.ties.items()]
    connections += [f".{port}()" for port in entry.outputs]
    overrides = ", ".join(f".{k}({v})" for k, v in entry.parameters.items())
    header = f"{entry.top} #({overrides})" if overrides else entry.top
    declarations.append(f"    {header} dut ({', '.join(connections)});")
    declarations.append("    initial clk = 1'b0;")
    declarations.append("    always #5 clk = ~clk;")
    return declarations, connections


def _reset_lines(entry: Entry) -> list[str]:
    raw = entry.raw
    if not raw.get("reset"):
        return ["        repeat (2) @(negedge clk);"]
    active, inactive = ("1'b0", "1'b1") if raw.get("reset_active_low") else ("1'b1", "1'b0")
    return [f"        reset_level = {active};",
            "        repeat (2) @(negedge clk);",
            f"        reset_level = {inactive};",
            "        @(negedge clk);"]


def _shown(entry: Entry) -> tuple[str, str, str, str]:
    widths = " ".join("%0d" for _ in entry.outputs)
    width_args = ", ".join(f"$bits(dut.{port})" for port in entry.outputs)
    shown = " ".join("%h" for _ in entry.outputs)
    shown_args = ", ".join(f"dut.{port}" for port in entry.outputs)
    return widths, width_args, shown, shown_args


def handshake_bench(entry: Entry, vector_file: Path, count: int) -> str:
    """Bench for a start/done converter: one transaction per vector, in file order.

    Reset is applied once at the beginning. Each transaction raises start for one rising edge
    with the value on the input, then drives the complement of the value (the design must have
    latched it), waits for done and prints the number of rising edges after the start edge
    followed by the outputs in hex; then it leaves one idle clock before the next start. A
    design that does not raise done within W + 8 edges prints ``timeout`` instead.
    """
    bus = entry.width + 8
    declarations, _ = _clocked_ports(entry, bus)
    done = f"dut.{entry.raw['done']}"
    limit = entry.width + 8
    widths, width_args, shown, shown_args = _shown(entry)
    lines = ["module bcdprove_bench;",
             f"    reg [{bus - 1}:0] stimulus [0:{count - 1}];",
             "    integer i, edges;"] + declarations + [
             "    initial begin",
             f"        $readmemh(\"{vector_file}\", stimulus);",
             "        start = 1'b0;",
             "        value = 0;"] + _reset_lines(entry) + [
             f"        $display(\"widths {widths}\", {width_args});",
             f"        for (i = 0; i < {count}; i = i + 1) begin",
             "            value = stimulus[i];",
             "            start = 1'b1;",
             "            @(negedge clk);",
             "            start = 1'b0;",
             "            value = ~stimulus[i];",
             "            edges = 0;",
             f"            while ({done} !== 1'b1 && edges < {limit}) begin",
             "                @(negedge clk);",
             "                edges = edges + 1;",
             "            end",
             f"            if ({done} === 1'b1)",
             f"                $display(\"%0d {shown}\", edges, {shown_args});",
             "            else",
             "                $display(\"timeout\");",
             "            @(negedge clk);",
             "        end",
             "        $finish;",
             "    end",
             "endmodule", ""]
    return "\n".join(lines)


def pipeline_bench(entry: Entry, vector_file: Path, count: int) -> str:
    """Bench for a pipelined converter: a new vector before every rising edge, outputs after each.

    After the last vector the input holds it. One line per rising edge (``count`` plus the
    catalogued latency lines) with the outputs in hex; line ``n`` (from 0) is taken after edge
    ``n + 1`` and so shows the vector ``n + 1 - latency`` of a correct design.
    """
    bus = entry.width + 8
    declarations, _ = _clocked_ports(entry, bus)
    latency = int(entry.raw["latency"])
    widths, width_args, shown, shown_args = _shown(entry)
    lines = ["module bcdprove_bench;",
             f"    reg [{bus - 1}:0] stimulus [0:{count - 1}];",
             "    integer i;"] + declarations + [
             "    initial begin",
             f"        $readmemh(\"{vector_file}\", stimulus);",
             "        value = 0;"] + _reset_lines(entry) + [
             f"        $display(\"widths {widths}\", {width_args});",
             f"        for (i = 0; i < {count + latency}; i = i + 1) begin",
             f"            value = (i < {count}) ? stimulus[i] : stimulus[{count - 1}];",
             "            @(negedge clk);",
             f"            $display(\"{shown}\", {shown_args});",
             "        end",
             "        $finish;",
             "    end",
             "endmodule", ""]
    return "\n".join(lines)


def parse_handshake_output(text: str, count: int) -> list[tuple[int | None, int | None]]:
    """(edges from start to done, packed display word) per transaction; None for timeout or x/z."""
    lines = [line.split() for line in text.splitlines() if line.strip()]
    header = next(i for i, words in enumerate(lines) if words and words[0] == "widths")
    widths = [int(w) for w in lines[header][1:]]
    rows = lines[header + 1:header + 1 + count]
    if len(rows) != count:
        raise AssertionError(f"bench printed {len(rows)} transactions, expected {count}")
    results: list[tuple[int | None, int | None]] = []
    for words in rows:
        if words == ["timeout"]:
            results.append((None, None))
            continue
        results.append((int(words[0]), _packed(words[1:], widths)))
    return results


def _packed(words: list[str], widths: list[int]) -> int | None:
    packed, offset = 0, 0
    for word, width in zip(words, widths):
        if any(c in "xXzZ" for c in word):
            return None
        packed |= int(word, 16) << offset
        offset += width
    return packed

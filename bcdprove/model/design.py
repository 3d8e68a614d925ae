"""A design model: the flattened result of elaboration, the only thing later stages see."""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Optional

from .node import Graph, Node


@dataclass(frozen=True)
class SourceLocation:
    """Where something was written: the original file and line (before preprocessing)."""

    file: str
    line: int

    def __str__(self) -> str:
        return f"{self.file}:{self.line}"


@dataclass
class Port:
    """A top-level port.  ``node`` is the INPUT leaf of an input, the driver of an output."""

    name: str
    direction: str            # "input" | "output" | "inout"
    width: int
    signed: bool
    node: Node
    loc: Optional[SourceLocation] = None
    msb: int = 0              # the declared range, for reports: [msb:lsb]
    lsb: int = 0


@dataclass
class Signal:
    """A named value inside the design, kept for reports and for stage mining.

    ``kind`` is one of "net", "variable", "port", "probe" (a procedural variable's value at
    a point of a block, e.g. ``dut.work@i=3`` at the end of loop iteration 3), "instance
    port" (``stage[3].dig[1].q``).
    """

    name: str
    node: Node
    kind: str
    signed: bool = False
    loc: Optional[SourceLocation] = None


@dataclass
class Reset:
    """An asynchronous reset of a register: when ``signal`` is at level ``active_high``."""

    signal: str               # the input port (or net) name
    active_high: bool
    value: Node


@dataclass
class Register:
    """A clocked variable.  ``state`` is its current value (an Op.STATE leaf)."""

    name: str
    width: int
    state: Node
    next: Node                # value after the active clock edge, in terms of current values
    clock: str                # the name of the input that clocks it
    edge: str                 # "posedge" | "negedge"
    reset: Optional[Reset] = None
    init: Optional[Node] = None   # a declaration initialiser (constant), if any
    loc: Optional[SourceLocation] = None


@dataclass
class Model:
    """Everything known about one elaborated top module."""

    graph: Graph
    top: str
    files: list[str]
    parameters: dict[str, int] = field(default_factory=dict)
    ports: list[Port] = field(default_factory=list)
    signals: dict[str, Signal] = field(default_factory=dict)
    registers: list[Register] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)       # warnings and ignored constructs

    def port(self, name: str) -> Port:
        for p in self.ports:
            if p.name == name:
                return p
        raise KeyError(name)

    @property
    def inputs(self) -> list[Port]:
        return [p for p in self.ports if p.direction == "input"]

    @property
    def outputs(self) -> list[Port]:
        return [p for p in self.ports if p.direction == "output"]

    @property
    def is_clocked(self) -> bool:
        return bool(self.registers)

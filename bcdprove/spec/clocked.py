"""Clocked converters: the protocols under which a design must show the digits of its input.

Every protocol unrolls the design (:mod:`bcdprove.model.unroll`, whose timing contract this
module uses: cycle ``t`` is one clock period, the active edge at its end) and builds a
:class:`~bcdprove.spec.bin2bcd.Bin2BcdProblem` whose ``x`` is the data input at the cycle the
value is presented and whose digits are the outputs at the cycle the result is read.  Every
other leaf stays free: inputs at other cycles, power-up register values, unknown values.

- handshake: the reset is active in cycle 0 and inactive after; ``start`` is high in cycle 1
  only, with the value on the data input; the result is read in the first cycle after cycle
  1 in which ``done`` is high, which must come within ``max_cycles`` cycles (cycles 2 ..
  ``max_cycles + 1``).  When it does not, the digits read are ``4'hF`` each, which no
  engine accepts as a digit, so "done never rose" is a counterexample like any other.  The
  data input is free after cycle 1 unless ``hold_input``.  A second problem checks the
  next transaction, started (without a reset) in the cycle after the first ``done``: its x
  is a leaf of its own, ``PORT@start2``, and the first transaction's input is free.
- pipeline (``latency`` L): the value presented in cycle ``p`` must show on the outputs in
  cycle ``p + L`` whatever came before or after; registers start free, so ``p = 0`` covers
  every state the pipeline can be in (``p = 1`` when a reset is given: reset in cycle 0).
- free-running (``latency`` L and ``hold_input``): the input is held from cycle 0 on; the
  outputs must be right in cycle L and stay the same through cycle 2L (at least L + 1).

Each obligation may carry *hunts*: the same obligation with the data input of every other
cycle tied to the complement of the value (what a careful test bench drives to show that the
design latched it) and, for a second conversion, the first value fixed.  A hunt's digits
depend on few free leaves, so simulation settles it without a solver call per input; it
can only disprove, and its counterexample replays like any other.

The second conversion starts at a constant cycle when a three-valued simulation shows that
the first ``done`` comes in the same cycle for every input and power-up state (a bit
counter decides it, the usual case); otherwise the start cycle is symbolic, encoded cycle by
cycle from the first ``done``, which is sound but much harder for the engines.

Port names not given are inferred from common names (see :func:`infer_protocol`); every
inference comes with a sentence for the report.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Mapping, Optional

from ..errors import BcdproveError
from ..model.design import Model
from ..model.node import Node, mask
from ..model.unroll import UnrolledModel, model_clock, unroll
from .bin2bcd import Bin2BcdProblem
from .ports import choose_input, choose_outputs

HANDSHAKE, PIPELINE, FREE_RUNNING = "handshake", "pipeline", "free-running"

# Common practice in converter designs (no standard names them).
_RESET_NAMES = ("rst", "reset", "rst_n", "reset_n", "arst_n", "rstn", "resetn", "nrst", "areset")
_START_NAMES = ("start", "go", "en", "load", "convert", "begin_conv")
_DONE_NAMES = ("done", "ready", "fin", "done_tick", "valid", "busy_n")
NEVER = 0xF        # the nibble shown when no result was read: not a decimal digit
_FILL_NOTE = "the data input carries the complement of the value in every other cycle"


@dataclass
class Protocol:
    """How a clocked converter is driven and read; ``reasons`` say what was inferred."""

    kind: str
    clock: str
    reset: Optional[str] = None
    reset_active_low: bool = False
    start: Optional[str] = None
    done: Optional[str] = None
    latency: Optional[int] = None
    hold_input: bool = False
    max_cycles: Optional[int] = None
    reasons: list[str] = field(default_factory=list)

    def reset_level(self, active: bool) -> int:
        return int(active) ^ int(self.reset_active_low)


@dataclass
class ReadPoint:
    """The result is read in ``cycle`` when ``condition`` is 1 there (first such point wins)."""

    condition: Node
    cycle: int


@dataclass
class ClockedProblem:
    """One protocol obligation: the combinational problem and how it came from cycles."""

    title: str
    problem: Bin2BcdProblem
    unrolled: UnrolledModel
    protocol: Protocol
    data_input: str
    present: list[ReadPoint]          # where x is presented (first true point)
    read: list[ReadPoint]             # where the digits are read (first true point)
    window: str                       # the read window in words, for "never rose"
    stable_until: Optional[int] = None    # free-running: outputs must stay through this cycle
    hunts: list["ClockedProblem"] = field(default_factory=list)
    hunt_note: str = ""               # for a hunt: which inputs it fixed

    def leaf_values(self, found) -> dict[int, int]:
        """Leaf id -> value for a counterexample of ``problem`` (x, free inputs, unknowns)."""
        problem = self.problem
        values = dict(found.free_values)
        by_name = {leaf.params[0]: leaf for leaf in problem.free_leaves() if leaf.op == "input"}
        for name, value in found.inputs.items():
            leaf = problem.x if name == problem.input_ports[0] else by_name.get(name)
            if leaf is not None:
                values[leaf.id] = value
        return values

    def first_point(self, points: list[ReadPoint], values: Mapping[int, int]) -> Optional[int]:
        from ..model.node import evaluate

        conditions = evaluate([p.condition for p in points], _defaulted(points, values))
        return next((p.cycle for p, c in zip(points, conditions) if c), None)

    def read_cycle(self, values: Mapping[int, int]) -> Optional[int]:
        """The cycle the digits were read in for these leaf values; None if never."""
        return self.first_point(self.read, values)

    def present_cycle(self, values: Mapping[int, int]) -> Optional[int]:
        return self.first_point(self.present, values)


def _defaulted(points: list[ReadPoint], values: Mapping[int, int]) -> dict[int, int]:
    from ..model.node import leaves

    full = dict(values)
    for leaf in leaves([p.condition for p in points]):
        full.setdefault(leaf.id, 0)
    return full


def _find_named(ports, names: tuple[str, ...]) -> list[str]:
    lowered = {p.name.lower(): p.name for p in ports}
    return [lowered[n] for n in names if n in lowered]


def _port(model: Model, name: str, direction: str, option: str) -> str:
    for port in model.ports:
        if port.name == name:
            if port.direction != direction:
                raise BcdproveError(f"{option} {name}: port `{name}` of `{model.top}` is an "
                                    f"{port.direction}, not an {direction}")
            return name
    known = ", ".join(p.name for p in model.ports if p.direction == direction) or "none"
    raise BcdproveError(f"{option} {name}: `{model.top}` has no {direction} port `{name}` "
                        f"({direction}s: {known})")


def infer_protocol(model: Model, *, clock: Optional[str] = None, reset: Optional[str] = None,
                   reset_low: Optional[bool] = None, start: Optional[str] = None,
                   done: Optional[str] = None, latency: Optional[int] = None,
                   hold_input: bool = False, max_cycles: Optional[int] = None) -> Protocol:
    """The protocol of ``model``: given names checked, missing ones inferred from common names
    (clk/clock; rst/reset/rst_n/reset_n/arst_n; start/go/en/load; done/ready/fin/done_tick/
    valid) or from the registers (their clock, their asynchronous reset).

    ``latency`` given: pipeline (free-running with ``hold_input``); otherwise a handshake,
    which needs a start input and a done output.  Raises BcdproveError when a name is wrong
    or the protocol cannot be told.
    """
    reasons: list[str] = []
    if not model.registers:
        model_clock(model)               # says there is nothing to clock
    if clock is not None:
        _port(model, clock, "input", "--clock")
    chosen_clock = model_clock(model, clock)
    reasons.append(f"clock `{chosen_clock}`: " + ("named with --clock" if clock else
                                                  "the clock of every register"))
    asynchronous = {r.reset.signal: r.reset.active_high for r in model.registers
                    if r.reset is not None}
    inputs = [p for p in model.inputs if p.name != chosen_clock]
    if reset is not None:
        _port(model, reset, "input", "--reset")
        reasons.append(f"reset `{reset}`: named with --reset")
    else:
        found = [n for n in asynchronous if any(p.name == n for p in inputs)]
        found = found or _find_named(inputs, _RESET_NAMES)
        if len(found) > 1:
            raise BcdproveError(f"several inputs look like a reset ({', '.join(found)}); name "
                                f"it with --reset PORT")
        if found:
            reset = found[0]
            why = "the asynchronous reset of the registers" if reset in asynchronous \
                else "a common reset name"
            reasons.append(f"reset `{reset}`: inferred ({why}); give --reset to change it")
    low = False
    if reset is not None:
        if reset_low is not None:
            low = reset_low
            reasons.append(f"reset active {'low' if low else 'high'}: from the command line")
        elif reset in asynchronous:
            low = not asynchronous[reset]
            reasons.append(f"reset active {'low' if low else 'high'}: its edge in the "
                           f"sensitivity list")
        else:
            lowered = reset.lower()
            low = lowered.endswith("_n") or lowered in ("rstn", "resetn", "nrst", "nreset")
            reasons.append(f"reset active {'low' if low else 'high'}: inferred from the name "
                           f"(give --reset-{'high' if low else 'low'} to say otherwise)")
    if latency is not None:
        if latency < 0:
            raise BcdproveError(f"--latency {latency}: give a number of cycles, 0 or more")
        kind = FREE_RUNNING if hold_input else PIPELINE
        if start is not None or done is not None:
            raise BcdproveError("--latency describes a pipeline; --start/--done a handshake: "
                                "give one of them")
        return Protocol(kind, chosen_clock, reset, low, None, None, latency, hold_input,
                        max_cycles, reasons)
    if start is not None:
        _port(model, start, "input", "--start")
        reasons.append(f"start `{start}`: named with --start")
    else:
        found = [n for n in _find_named(inputs, _START_NAMES) if n != reset]
        if len(found) == 1:
            start = found[0]
            reasons.append(f"start `{start}`: inferred from a common name; give --start to "
                           f"change it")
    if done is not None:
        _port(model, done, "output", "--done")
        reasons.append(f"done `{done}`: named with --done")
    else:
        found = _find_named(model.outputs, _DONE_NAMES)
        if len(found) == 1:
            done = found[0]
            reasons.append(f"done `{done}`: inferred from a common name; give --done to "
                           f"change it")
    if start is None or done is None:
        missing = " and ".join(w for w, v in (("a start input", start), ("a done output", done))
                               if v is None)
        raise BcdproveError(f"module `{model.top}` is clocked, but {missing} could not be "
                            f"found; give --start PORT --done PORT for a handshake, or "
                            f"--latency CYCLES for a pipeline")
    if max_cycles is not None and max_cycles < 1:
        raise BcdproveError(f"--max-cycles {max_cycles}: give at least 1")
    return Protocol(HANDSHAKE, chosen_clock, reset, low, start, done, None, hold_input,
                    max_cycles, reasons)


def _data_ports(model: Model, protocol: Protocol, inputs: Optional[list[str]],
                outputs: Optional[list[str]], msd_first: bool,
                ties: Mapping[str, int]) -> tuple[str, list[str], list[str]]:
    """The data input and digit outputs, chosen among the ports the protocol leaves."""
    control_in = {protocol.clock, protocol.reset, protocol.start}
    control_out = {protocol.done}
    view = Model(graph=model.graph, top=model.top, files=model.files,
                 ports=[p for p in model.ports
                        if not (p.direction == "input" and p.name in control_in)
                        and not (p.direction == "output" and p.name in control_out)])
    for name in ties:
        if name in control_in:
            raise BcdproveError(f"--tie {name}: `{name}` is a protocol port, driven by the check")
    data, data_reason = choose_input(view, inputs, dict(ties))
    names, out_reason, _ = choose_outputs(view, outputs, msd_first)
    return data, names, [data_reason, out_reason]


def _digits(model: Model, values: Mapping[str, Node], names: list[str],
            msd_first: bool) -> tuple[list[Node], list[str]]:
    """4-bit digit nodes of output values, least significant first, with their bit names."""
    graph = model.graph
    digits, sources = [], []
    for position, name in enumerate(names):
        node = values[name]
        if node.width <= 4:
            digits.append(graph.zext(node, 4))
            sources.append(name)
            continue
        if msd_first and node.width % 4:
            raise BcdproveError(f"output `{name}` is {node.width} bits, not whole nibbles; with "
                                f"--msd-first every digit must be 4 bits")
        if node.width % 4 and position != len(names) - 1:
            raise BcdproveError(f"output `{name}` is {node.width} bits: only the most "
                                f"significant digit port may hold a trimmed digit")
        parts = []
        for k in range(-(-node.width // 4)):
            hi = min(4 * k + 3, node.width - 1)
            parts.append((graph.zext(graph.extract(node, hi, 4 * k), 4), f"{name}[{hi}:{4 * k}]"))
        if msd_first:
            parts.reverse()
        digits += [p for p, _ in parts]
        sources += [s for _, s in parts]
    return digits, sources


def _high(graph, node: Node) -> Node:
    return node if node.width == 1 else graph.reduce_or(node)


class _Builder:
    """Shared state of one protocol: ports, ties, the data input, the digit outputs."""

    def __init__(self, model: Model, protocol: Protocol, data: str, outputs: list[str],
                 reasons: list[str], msd_first: bool, max_input: Optional[int],
                 ties: Mapping[str, int]):
        self.model = model
        self.graph = model.graph
        self.protocol = protocol
        self.data = data
        self.outputs = outputs
        self.reasons = reasons
        self.msd_first = msd_first
        self.ties = dict(ties)
        self.width = model.port(data).width
        self.max_input = max_input
        for name, value in self.ties.items():
            port = model.port(name)
            if not 0 <= value <= mask(port.width):
                raise BcdproveError(f"--tie {name}={value}: does not fit the {port.width}-bit "
                                    f"input")

    def constant_inputs(self, t: int) -> dict[str, Node]:
        """Reset (active in cycle 0 only) and tied inputs for cycle ``t``."""
        g = self.graph
        driven = {name: g.const(v, self.model.port(name).width) for name, v in self.ties.items()}
        if self.protocol.reset is not None:
            width = self.model.port(self.protocol.reset).width
            driven[self.protocol.reset] = g.const(self.protocol.reset_level(t == 0), width) \
                if width == 1 else g.const(mask(width) if self.protocol.reset_level(t == 0)
                                           else 0, width)
        return driven

    def digits_at(self, unrolled: UnrolledModel, cycle: int) -> tuple[list[Node], list[str]]:
        return _digits(self.model, unrolled.outputs[cycle], self.outputs, self.msd_first)

    def problem(self, unrolled: UnrolledModel, x: Node, digits: list[Node], sources: list[str],
                extra: list[str]) -> Bin2BcdProblem:
        return Bin2BcdProblem(model=unrolled.model, input_ports=[x.params[0]],
                              output_ports=list(self.outputs),
                              reasons=self.protocol.reasons + self.reasons + extra, x=x,
                              width=self.width, digits=digits, max_input=self.max_input,
                              ties=dict(self.ties), msd_first=self.msd_first,
                              digit_sources=sources)

    def chain(self, unrolled: UnrolledModel, points: list[ReadPoint]) -> tuple[list[Node], list[str]]:
        """Digits read at the first true point; ``4'hF`` each when none is true."""
        g = self.graph
        count = len(self.digits_at(unrolled, points[0].cycle)[0]) if points else \
            len(self.digits_at(unrolled, unrolled.cycles - 1)[0])
        result = [g.const(NEVER, 4)] * count
        sources: list[str] = []
        for point in reversed(points):
            digits, sources = self.digits_at(unrolled, point.cycle)
            result = [g.ite(point.condition, d, r) for d, r in zip(digits, result)]
        return result, sources

    # handshake ----------------------------------------------------------------------------
    def handshake(self) -> list[ClockedProblem]:
        protocol = self.protocol
        n = protocol.max_cycles or 2 * self.width + 8
        first = self._first_transaction(n)
        if not protocol.hold_input:
            first.hunts.append(self._first_transaction(n, fill=True))
        return [first, self._second_transaction(n, first.unrolled)]

    def _done(self, unrolled: UnrolledModel, t: int) -> Node:
        return _high(self.graph, unrolled.outputs[t][self.protocol.done])

    def _start(self, value: int) -> Node:
        return self.graph.const(value, self.model.port(self.protocol.start).width)

    def _first_transaction(self, n: int, fill: bool = False,
                           first_value: Optional[int] = None) -> ClockedProblem:
        g, protocol, data = self.graph, self.protocol, self.data

        def drive(t: int, partial: UnrolledModel) -> dict[str, Node]:
            driven = self.constant_inputs(t)
            driven[protocol.start] = self._start(int(t == 1))
            if t == 1 and first_value is not None:
                driven[data] = g.const(first_value, self.width)
            elif protocol.hold_input and t >= 2:
                driven[data] = partial.leaf(data, 1) if first_value is None \
                    else g.const(first_value, self.width)
            elif fill and t != 1:
                driven[data] = g.not_(partial.leaf(data, 1))
            return driven

        unrolled = unroll(self.model, n + 2, protocol.clock, drive)
        x = unrolled.leaf(data, 1)
        read = [ReadPoint(self._done(unrolled, t), t) for t in range(2, n + 2)]
        digits, sources = self.chain(unrolled, read)
        held = "held" if protocol.hold_input else "free"
        extra = [f"handshake: reset in cycle 0, `{protocol.start}` high in cycle 1 with `{data}`; "
                 f"result read in the first cycle `{protocol.done}` is high, within {n} cycles "
                 f"(cycles 2 .. {n + 1}); `{data}` {held} after cycle 1"]
        return ClockedProblem("first conversion after reset", self.problem(
            unrolled, x, digits, sources, extra), unrolled, protocol, data,
            [ReadPoint(g.const(1, 1), 1)], read, f"within {n} cycles of the start (cycle 1)",
            hunt_note=_FILL_NOTE if fill else "")

    def _first_done(self, unrolled: UnrolledModel, n: int) -> tuple[bool, Optional[int]]:
        """(known, cycle): whether the cycle of the first ``done`` is the same for every
        input and power-up state (three-valued simulation, sound), and that cycle (None:
        never within the window)."""
        from ..model.simulate import Simulator

        nodes = [self._done(unrolled, t) for t in range(2, n + 2)]
        simulator = Simulator(nodes)
        given, unknown = {}, {}
        for leaf in simulator.leaves:
            if leaf.op != "free":
                given[leaf.id] = [0] * leaf.width
                unknown[leaf.id] = [1] * leaf.width
        for t, planes in zip(range(2, n + 2), simulator.run(1, given, unknown)):
            if planes.unknown[0]:
                return False, None
            if planes.value[0]:
                return True, t
        return True, None

    def _second_transaction(self, n: int, first: UnrolledModel) -> ClockedProblem:
        """The next conversion, started in the cycle after the first ``done``.

        When the first ``done`` comes in the same cycle whatever the input (a bit counter
        decides it, the usual case) that start cycle is a constant; otherwise it is encoded
        symbolically, cycle by cycle, which solvers find much harder."""
        known, done_at = self._first_done(first, n)
        if known and done_at is not None:
            second = self._second_at(n, done_at + 1)
            # With the first input free, a design whose second result depends on it leaves
            # every lane to the solver; fixed first inputs find such bugs by simulation.
            for value in sorted({1, mask(self.width)}):
                second.hunts.append(self._second_at(n, done_at + 1, value,
                                                    fill=not self.protocol.hold_input))
            return second
        second = self._second_symbolic(n)
        for value in sorted({1, mask(self.width)}):
            # A fixed first value often fixes the first done cycle: then a quick hunt.
            known, done_at = self._first_done(
                self._first_transaction(n, first_value=value).unrolled, n)
            if known and done_at is not None:
                second.hunts.append(self._second_at(n, done_at + 1, value,
                                                    fill=not self.protocol.hold_input))
        return second

    def _second_at(self, n: int, begin: int, first_value: Optional[int] = None,
                   fill: bool = False) -> ClockedProblem:
        g, protocol, data = self.graph, self.protocol, self.data
        x1 = g.const(first_value, self.width) if first_value is not None else None

        def drive(t: int, partial: UnrolledModel) -> dict[str, Node]:
            driven = self.constant_inputs(t)
            driven[protocol.start] = self._start(int(t in (1, begin)))
            if t == 1 and x1 is not None:
                driven[data] = x1
            elif protocol.hold_input and t >= 2 and t != begin:
                driven[data] = (x1 or partial.leaf(data, 1)) if t < begin \
                    else partial.leaf(data, begin)
            elif fill and t != 1 and t != begin:
                driven[data] = g.not_(partial.leaf(data, begin))
            return driven

        unrolled = unroll(self.model, begin + n + 1, protocol.clock, drive)
        x = unrolled.leaf(data, begin)
        read = [ReadPoint(self._done(unrolled, t), t) for t in range(begin + 1, begin + n + 1)]
        digits, sources = self.chain(unrolled, read)
        extra = [f"second conversion: the first `{protocol.done}` comes in cycle {begin - 1} "
                 f"for every input, so `{protocol.start}` is high again in cycle {begin} with "
                 f"`{data}`, no reset between; the first conversion's input free"]
        note = ""
        if first_value is not None:
            note = f"first conversion of {first_value}" + (f"; {_FILL_NOTE}" if fill else "")
        return ClockedProblem("second conversion, no reset between", self.problem(
            unrolled, x, digits, sources, extra), unrolled, protocol, data,
            [ReadPoint(g.const(1, 1), begin)], read, f"within {n} cycles of the second start "
                                                     f"(cycle {begin})", hunt_note=note)

    def _second_symbolic(self, n: int) -> ClockedProblem:
        g, protocol, data = self.graph, self.protocol, self.data
        width = self.width
        x2 = g.input(f"{data}@start2", width)
        first_seen: list[Node] = []      # [t]: done seen in some cycle 2 .. t (first window)
        start2: dict[int, Node] = {}     # [t]: the second start is in cycle t
        started: dict[int, Node] = {}    # [t]: the second start is in some cycle <= t
        zero = g.const(0, 1)

        def seen_by(t: int, partial: UnrolledModel) -> Node:
            while len(first_seen) <= t:
                k = len(first_seen)
                if 2 <= k <= n + 1:
                    previous = first_seen[k - 1]
                    first_seen.append(g.or_(previous, self._done(partial, k)))
                else:
                    first_seen.append(first_seen[k - 1] if k else zero)
            return first_seen[t]

        def drive(t: int, partial: UnrolledModel) -> dict[str, Node]:
            driven = self.constant_inputs(t)
            if t < 2:
                driven[protocol.start] = self._start(int(t == 1))
                start2[t] = started[t] = zero
                return driven
            begin = g.and_(seen_by(t - 1, partial), g.not_(seen_by(t - 2, partial)))
            start2[t] = begin
            started[t] = g.or_(started[t - 1], begin)
            width_start = self.model.port(protocol.start).width
            driven[protocol.start] = g.zext(begin, width_start) if width_start > 1 else begin
            if protocol.hold_input:
                driven[data] = g.ite(started[t], x2, partial.leaf(data, 1))
            else:
                driven[data] = g.ite(begin, x2, partial.leaf(data, t))
            return driven

        cycles = 2 * n + 3
        unrolled = unroll(self.model, cycles, protocol.clock, drive)
        read = []
        for t in range(3, cycles):
            in_window = started[t - 1]
            if t - 1 - n >= 0:
                in_window = g.and_(in_window, g.not_(started[t - 1 - n]))
            condition = g.and_(in_window, self._done(unrolled, t))
            if condition.op != "const" or condition.value:
                read.append(ReadPoint(condition, t))
        digits, sources = self.chain(unrolled, read)
        present = [ReadPoint(start2[t], t) for t in range(2, cycles) if start2[t] is not zero]
        extra = [f"second conversion: `{protocol.start}` high again in the cycle after the "
                 f"first `{protocol.done}`, no reset between; its value `{data}@start2`; the "
                 f"first conversion's input free"]
        return ClockedProblem("second conversion, no reset between", self.problem(
            unrolled, x2, digits, sources, extra), unrolled, protocol, data, present, read,
            f"within {n} cycles of the second start")

    # pipelines ----------------------------------------------------------------------------
    def pipeline(self) -> list[ClockedProblem]:
        main = self._pipeline()
        if self.protocol.kind == PIPELINE:
            main.hunts.append(self._filled(main))
        return [main]

    def _filled(self, main: ClockedProblem) -> ClockedProblem:
        """``main`` with the data input at every other cycle tied to the complement of x, by
        substitution (a wide pipeline is not unrolled twice)."""
        from dataclasses import replace

        from ..model.node import substitute

        g, unrolled, x = self.graph, main.unrolled, main.problem.x
        present = main.present[0].cycle
        complement = g.not_(x)
        mapping = {unrolled.leaf(self.data, t).id: complement
                   for t in range(unrolled.cycles) if t != present}
        digits = substitute(g, main.problem.digits, mapping)
        inputs = [dict(cycle) for cycle in unrolled.inputs]
        for t, cycle in enumerate(inputs):
            if t != present:
                cycle[self.data] = complement
        # Registers and outputs are left to the trace's cycle-by-cycle run.
        shown = replace(unrolled, inputs=inputs, registers=[{} for _ in inputs],
                        outputs=[{} for _ in inputs])
        problem = replace(main.problem, digits=digits, _ok_node=None, _simulator=None,
                          _encoder=None, _free=None, _order=None)
        return replace(main, problem=problem, unrolled=shown, hunts=[], hunt_note=_FILL_NOTE)

    def _pipeline(self) -> ClockedProblem:
        g, protocol, data = self.graph, self.protocol, self.data
        latency = protocol.latency
        begin = 1 if protocol.reset is not None else 0
        free_running = protocol.kind == FREE_RUNNING
        last = begin + latency + (max(latency, 1) if free_running else 0)

        def drive(t: int, partial: UnrolledModel) -> dict[str, Node]:
            driven = self.constant_inputs(t)
            if free_running and t > 0:
                driven[data] = partial.leaf(data, 0)
            return driven

        read_cycles = range(latency, (2 * latency if latency else 1) + 1) if free_running \
            else [begin + latency]
        wanted = {t: set(self.outputs) for t in read_cycles}
        unrolled = unroll(self.model, last + 1, protocol.clock, drive, outputs=wanted)
        present_at = 0 if free_running else begin
        x = unrolled.leaf(data, present_at)
        read_at = begin + latency if not free_running else latency
        digits, sources = self.digits_at(unrolled, read_at)
        stable_until = None
        if free_running:
            stable_until = 2 * latency if latency else 1
            same = g.const(1, 1)
            for t in range(read_at + 1, stable_until + 1):
                for name in self.outputs:
                    same = g.and_(same, g.eq(unrolled.outputs[t][name],
                                             unrolled.outputs[read_at][name]))
            digits = [g.ite(same, d, g.const(NEVER, 4)) for d in digits]
            extra = [f"free-running: `{data}` held from cycle 0; outputs read in cycle {read_at} "
                     f"and must stay the same through cycle {stable_until}"]
            title = "free-running conversion of a held input"
        else:
            reset_text = "reset in cycle 0, " if protocol.reset is not None else ""
            extra = [f"pipeline: {reset_text}`{data}` presented in cycle {present_at}, outputs "
                     f"read in cycle {read_at} (latency {latency}); every other input and the "
                     f"power-up state free"]
            title = f"pipeline, latency {latency}"
        problem = self.problem(unrolled, x, digits, sources, extra)
        one = g.const(1, 1)
        return ClockedProblem(title, problem, unrolled, protocol, data,
                              [ReadPoint(one, present_at)], [ReadPoint(one, read_at)],
                              f"in cycle {read_at}", stable_until)


def build_clocked_problems(model: Model, protocol: Protocol, *, inputs: Optional[list[str]] = None,
                           outputs: Optional[list[str]] = None, msd_first: bool = False,
                           max_input: Optional[int] = None,
                           ties: Optional[Mapping[str, int]] = None) -> list[ClockedProblem]:
    """The obligations of ``protocol`` on ``model``, in the order they should be reported:
    a handshake gives the first conversion after reset, then the second one; a pipeline or
    free-running converter gives one.  ``inputs``/``outputs`` name the data ports (else
    inferred among the ports the protocol does not use)."""
    ties = dict(ties or {})
    data, names, reasons = _data_ports(model, protocol, inputs, outputs, msd_first, ties)
    width = model.port(data).width
    if max_input is not None and not 0 <= max_input <= mask(width):
        raise BcdproveError(f"--max-input {max_input} is outside the {width}-bit input `{data}` "
                            f"(0 .. {mask(width)})")
    builder = _Builder(model, protocol, data, names, reasons, msd_first, max_input, ties)
    if protocol.kind == HANDSHAKE:
        return builder.handshake()
    return builder.pipeline()

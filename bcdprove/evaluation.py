"""Evaluating a model on concrete input vectors (the engine behind ``bcdprove eval``)."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Optional, Sequence

from .errors import BcdproveError
from .model import Model, Op, mask


@dataclass
class PortValue:
    value: int          # known bits (unknown bits read as 0 here)
    unknown: int        # mask of bits whose value the model leaves open (x)
    width: int


@dataclass
class VectorResult:
    inputs: dict[str, PortValue]
    outputs: dict[str, PortValue]

    def as_json(self) -> dict:
        def text(v: PortValue) -> str:
            if not v.unknown:
                return str(v.value)
            bits = "".join("x" if v.unknown >> i & 1 else str(v.value >> i & 1)
                           for i in reversed(range(v.width)))
            return "0b" + bits
        record = {"inputs": {n: text(v) for n, v in self.inputs.items()},
                  "outputs": {n: text(v) for n, v in self.outputs.items()}}
        unknown = {n: str(v.unknown) for n, v in self.outputs.items() if v.unknown}
        if unknown:
            record["unknown_bits"] = unknown
        return record


def evaluate_vectors(model: Model, vectors: Sequence[dict[str, int]],
                     where: Optional[Sequence[tuple[Optional[str], Optional[int]]]] = None) -> list[VectorResult]:
    """Outputs of ``model`` for each vector (input port name -> value), all lanes at once.

    Every input port must be given; a value that does not fit the port is an error (negative
    values are taken as two's complement when they fit).  Register states and free values are
    unknown, so outputs that depend on them come back with unknown bits.
    """
    from .model.simulate import Simulator, pack, unpack

    where = list(where) if where is not None else [(None, None)] * len(vectors)
    inputs = {p.name: p for p in model.inputs}
    checked: list[dict[str, int]] = []
    for vector, (file, line) in zip(vectors, where):
        label = "" if file else f"vector {len(checked) + 1}: "
        for name in vector:
            if name not in inputs:
                known = ", ".join(inputs) or "none"
                raise BcdproveError(f"{label}`{name}` is not an input port of `{model.top}` "
                                    f"(inputs: {known})", file, line)
        values = {}
        for name, port in inputs.items():
            if name not in vector:
                raise BcdproveError(f"{label}no value for input `{name}`", file, line)
            value = vector[name]
            if not -(1 << (port.width - 1)) <= value < (1 << port.width):
                raise BcdproveError(f"{label}{value} does not fit the {port.width}-bit input `{name}`",
                                    file, line)
            values[name] = value & mask(port.width)
        checked.append(values)

    outputs = model.outputs
    simulator = Simulator([p.node for p in outputs])
    lanes = len(checked)
    given, unknown = {}, {}
    for leaf in simulator.leaves:
        if leaf.op == Op.INPUT:
            given[leaf.id] = pack([v[leaf.params[0]] for v in checked], leaf.width)
        elif leaf.op == Op.STATE:
            given[leaf.id] = [0] * leaf.width
            unknown[leaf.id] = [mask(lanes)] * leaf.width
    planes = simulator.run(lanes, given, unknown)
    # Transpose each output's planes back to lane values once, not bit by bit per lane.
    lane_values = [(unpack(result.value, lanes), unpack(result.unknown, lanes))
                   for result in planes]
    results = []
    for lane, values in enumerate(checked):
        ins = {n: PortValue(values[n], 0, inputs[n].width) for n in inputs}
        outs = {}
        for port, (value, unk) in zip(outputs, lane_values):
            outs[port.name] = PortValue(value[lane] & ~unk[lane], unk[lane], port.width)
        results.append(VectorResult(ins, outs))
    return results


@dataclass
class CycleResult:
    """Port and register values of one cycle of a clocked evaluation (unknown bits as x)."""

    cycle: int
    inputs: dict[str, PortValue]
    outputs: dict[str, PortValue]
    registers: dict[str, PortValue]

    def as_json(self) -> dict:
        record = {"cycle": self.cycle,
                  "inputs": {n: _text(v) for n, v in self.inputs.items()},
                  "outputs": {n: _text(v) for n, v in self.outputs.items()},
                  "registers": {n: _text(v) for n, v in self.registers.items()}}
        return record


def _text(v: PortValue) -> str:
    """Decimal when every bit is known, else ``0b`` with x for the unknown bits."""
    if not v.unknown:
        return str(v.value)
    return "0b" + "".join("x" if v.unknown >> i & 1 else str(v.value >> i & 1)
                          for i in reversed(range(v.width)))


def evaluate_cycles(model: Model, cycles: int, settings: dict[int, dict[str, int]],
                    clock: Optional[str] = None,
                    where: Optional[dict[int, tuple[Optional[str], Optional[int]]]] = None
                    ) -> list[CycleResult]:
    """Run the clocked ``model`` for ``cycles`` cycles (timing of :mod:`bcdprove.model.unroll`).

    ``settings[t]`` gives input values from cycle ``t`` on: an input keeps its last value until
    it is set again, like a test bench's ``reg``.  An input not set yet, a register's power-up
    value and every x of the design are unknown, and outputs that depend on them have
    unknown bits.  ``where[t]`` names the file and line of cycle ``t``'s setting, for errors.
    """
    from .model.simulate import Simulator
    from .model.unroll import model_clock, unroll

    if cycles < 1:
        raise BcdproveError(f"--cycles {cycles}: give at least 1")
    clock = model_clock(model, clock)
    inputs = {p.name: p for p in model.inputs if p.name != clock}
    held: dict[str, int] = {}
    given_at: list[dict[str, int]] = []
    for t in range(cycles):
        file, line = (where or {}).get(t, (None, None))
        for name, value in settings.get(t, {}).items():
            if name == clock:
                raise BcdproveError(f"cycle {t}: `{name}` is the clock; each cycle is one clock "
                                    f"period, so it takes no values", file, line)
            port = inputs.get(name)
            if port is None:
                known = ", ".join(inputs) or "none"
                raise BcdproveError(f"cycle {t}: `{name}` is not an input port of `{model.top}` "
                                    f"(inputs: {known})", file, line)
            if not -(1 << (port.width - 1)) <= value < (1 << port.width):
                raise BcdproveError(f"cycle {t}: {value} does not fit the {port.width}-bit input "
                                    f"`{name}`", file, line)
            held[name] = value & mask(port.width)
        given_at.append(dict(held))
    late = sorted(t for t in settings if t >= cycles)
    if late:
        raise BcdproveError(f"values are given for cycle {late[0]}, but only cycles 0 .. "
                            f"{cycles - 1} are run (raise --cycles)")
    unrolled = unroll(model, cycles, clock)
    roots: list = []
    for t in range(cycles):
        roots += list(unrolled.inputs[t].values()) + list(unrolled.outputs[t].values())
        roots += list(unrolled.registers[t].values())
    simulator = Simulator(roots)
    values, unknown = {}, {}
    for leaf in simulator.leaves:
        if leaf.op != Op.INPUT:
            continue                      # power-up values and x: unknown
        name, _, cycle = leaf.params[0].rpartition("@")
        known = given_at[int(cycle)].get(name)
        if known is None:
            values[leaf.id] = [0] * leaf.width
            unknown[leaf.id] = [1] * leaf.width
        else:
            values[leaf.id] = [known >> i & 1 for i in range(leaf.width)]
    planes = iter(simulator.run(1, values, unknown))
    results = []
    widths = {p.name: p.width for p in model.ports}
    widths.update({r.name: r.width for r in model.registers})

    def take(names) -> dict[str, PortValue]:
        taken = {}
        for name in names:
            result = next(planes)
            value = sum((bit & 1) << i for i, bit in enumerate(result.value))
            unk = sum((bit & 1) << i for i, bit in enumerate(result.unknown))
            taken[name] = PortValue(value & ~unk, unk, widths[name])
        return taken

    for t in range(cycles):
        ins = take(unrolled.inputs[t])
        outs = take(unrolled.outputs[t])
        regs = take(unrolled.registers[t])
        results.append(CycleResult(t, ins, outs, regs))
    return results

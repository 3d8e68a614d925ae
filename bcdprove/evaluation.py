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
    from .model.simulate import Simulator, pack

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
    results = []
    for lane, values in enumerate(checked):
        ins = {n: PortValue(values[n], 0, inputs[n].width) for n in inputs}
        outs = {}
        for port, result in zip(outputs, planes):
            value = sum(((plane >> lane) & 1) << i for i, plane in enumerate(result.value))
            unk = sum(((plane >> lane) & 1) << i for i, plane in enumerate(result.unknown))
            outs[port.name] = PortValue(value & ~unk, unk, port.width)
        results.append(VectorResult(ins, outs))
    return results

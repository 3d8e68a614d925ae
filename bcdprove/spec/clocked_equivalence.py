"""Design against design for pipelines: both unrolled, the outputs compared at the read cycle.

Supported protocol: a pipeline of latency ``L`` (``--latency``), optionally with a reset.
Both designs are unrolled (``model.unroll``, its timing contract) over the same cycles with
the same inputs: without a reset, cycles ``0 .. L``, read in cycle ``L``; with a reset
(active in cycle 0 only), cycles ``0 .. L + 1``, read in cycle ``L + 1``.  Every input of
every cycle is shared and free, and every power-up register value and unknown value of
either design is free and independent.  The two designs are equivalent under this reading
when the outputs read agree for every such choice, which for two pipelines of latency ``L``
means: whatever came before, the value presented ``L`` cycles earlier gives the same outputs.

Handshake pairs (no ``--latency``; ``start``/``done`` given or inferred as for ``check``):
the protocol of ``spec/clocked.py``'s handshake.  Both designs are unrolled over cycles
``0 .. n + 1`` (``n`` = ``max_cycles``, default ``2W + 8`` for a W-bit data input) with the
same inputs: reset active in cycle 0 only, start high in cycle 1 only, every data input shared
and free in every cycle (held at its cycle-1 value from cycle 2 on with ``hold_input``).  Each
design's outputs (done excepted) are read in its own first cycle after 1 in which its done is
high (a mux over the cycles of "first done here").  The pair is equivalent when, for every
choice of inputs, power-up values and unknowns (each design's independent), both dones rise
within the window and the values read agree; a done that never rose in either design is a
difference, shown by the 2-bit output ``done_rose`` (design's bit, against's bit; the other
design's bit is a constant 1).  Only the first transaction after reset is compared.
"""
from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Mapping, Optional

from ..errors import BcdproveError
from ..model.design import Model, Port
from ..model.node import Node, mask
from ..model.unroll import UnrolledModel, cycle_name, unroll
from .clocked import Protocol, ReadPoint, _high, infer_protocol
from .equivalence import EquivalenceProblem, _pair_ports, build_equivalence


def _unrolled(model: Model, which: str, latency: int, clock: Optional[str],
              reset: Optional[str], reset_low: Optional[bool]):
    protocol = infer_protocol(model, clock=clock, reset=reset, reset_low=reset_low,
                              latency=latency)
    cycles = latency + 1 + (1 if protocol.reset else 0)

    def drive(t: int, _partial) -> dict[str, Node]:
        if protocol.reset is None:
            return {}
        port = model.port(protocol.reset)
        return {protocol.reset: model.graph.const(protocol.reset_level(t == 0), port.width)}

    unrolled = unroll(model, cycles, protocol.clock, drive=drive)
    reasons = [f"{which} `{model.top}`: {reason}" for reason in protocol.reasons]
    return unrolled, protocol, cycles - 1, reasons


def build_clocked_equivalence(model_a: Model, model_b: Model, *, latency: Optional[int],
                              mapping: Mapping[str, str] | None = None,
                              clock: Optional[str] = None, reset: Optional[str] = None,
                              reset_low: Optional[bool] = None,
                              start: Optional[str] = None, done: Optional[str] = None,
                              hold_input: bool = False,
                              max_cycles: Optional[int] = None) -> EquivalenceProblem:
    """The pipeline equivalence of two clocked models (see the module docstring).

    ``clock`` and ``reset`` name ports of ``model_a``; ``mapping`` gives their names in
    ``model_b`` when they differ.  Raises BcdproveError when only one design is clocked, when
    no latency is given, for handshake options, or for anything ``infer_protocol`` refuses.
    """
    mapping = dict(mapping or {})
    if model_a.is_clocked != model_b.is_clocked:
        clocked, plain = (model_a, model_b) if model_a.is_clocked else (model_b, model_a)
        raise BcdproveError(f"`{clocked.top}` is clocked but `{plain.top}` is combinational; "
                            f"equiv compares two designs of one kind")
    if latency is not None and (start or done or max_cycles is not None):
        raise BcdproveError("--latency describes a pipeline; --start/--done/--max-cycles a "
                            "handshake: give one of them")
    if latency is not None and hold_input:
        raise BcdproveError("equiv of free-running designs (--latency with --hold-input) is "
                            "not supported yet")
    if latency is None:
        return build_handshake_equivalence(model_a, model_b, mapping=mapping, clock=clock,
                                           reset=reset, reset_low=reset_low, start=start,
                                           done=done, hold_input=hold_input,
                                           max_cycles=max_cycles)
    if latency < 0:
        raise BcdproveError(f"--latency {latency}: give zero or more cycles")

    def other(name: Optional[str]) -> Optional[str]:
        return None if name is None else mapping.get(name, name)

    unrolled_a, protocol_a, read, reasons = _unrolled(model_a, "design", latency, clock,
                                                      reset, reset_low)
    unrolled_b, protocol_b, read_b, reasons_b = _unrolled(model_b, "against", latency,
                                                          other(clock), other(reset), reset_low)
    if read != read_b:
        with_reset, without = ((model_a, protocol_a), model_b) if protocol_a.reset \
            else ((model_b, protocol_b), model_a)
        raise BcdproveError(f"`{with_reset[0].top}` has a reset (`{with_reset[1].reset}`) but "
                            f"`{without.top}` has none; the two are driven by one protocol")
    cycles = read + 1
    unrolled_mapping: dict[str, str] = {}
    skip = {protocol_a.clock, protocol_a.reset}
    for port in model_a.ports:
        if port.name in skip:
            continue
        partner = mapping.get(port.name, port.name)
        for t in range(cycles):
            unrolled_mapping[cycle_name(port.name, t)] = cycle_name(partner, t)
    compared = [cycle_name(p.name, read) for p in model_a.outputs]
    problem = build_equivalence(unrolled_a.model, unrolled_b.model, unrolled_mapping,
                                compared=compared)
    data = [p.name for p in model_a.inputs if p.name not in skip]
    per_port = [r for r in problem.reasons if r.startswith(("input ", "output "))]
    problem.reasons = reasons + reasons_b + [
        f"pipeline of latency {latency}: both designs unrolled over cycles 0 .. {read} with "
        f"the same inputs ({', '.join(data)} in every cycle), outputs "
        f"{', '.join(p.name for p in model_a.outputs)} compared in cycle {read}; power-up "
        f"values free"] + [r for r in problem.reasons if r not in per_port]
    return problem


# handshake pairs ----------------------------------------------------------------------------
_ROSE = "done_rose"


@dataclass
class _HandshakeSide:
    """One design of a handshake pair: its unrolling and its combinational read view."""

    which: str
    protocol: Protocol
    unrolled: UnrolledModel
    view: Model                       # inputs p@t, outputs o@done and done_rose
    seen: Node                        # 1 when done rose in cycles 2 .. n+1
    read: list[ReadPoint]             # first true point: the read cycle


def _handshake_side(model: Model, which: str, n: int, other_rose: bool, *,
                    clock, reset, reset_low, start, done, hold_input) -> _HandshakeSide:
    protocol = infer_protocol(model, clock=clock, reset=reset, reset_low=reset_low, start=start,
                              done=done, hold_input=hold_input, max_cycles=n)
    g = model.graph
    control = {protocol.clock, protocol.reset, protocol.start}
    data = [p.name for p in model.inputs if p.name not in control]

    def drive(t: int, partial: UnrolledModel) -> dict[str, Node]:
        driven: dict[str, Node] = {}
        if protocol.reset is not None:
            width = model.port(protocol.reset).width
            driven[protocol.reset] = g.const(
                mask(width) if protocol.reset_level(t == 0) else 0, width)
        driven[protocol.start] = g.const(int(t == 1), model.port(protocol.start).width)
        if hold_input and t >= 2:
            for name in data:
                driven[name] = partial.leaf(name, 1)
        return driven

    unrolled = unroll(model, n + 2, protocol.clock, drive)
    read = [ReadPoint(_high(g, unrolled.outputs[t][protocol.done]), t) for t in range(2, n + 2)]
    seen = g.const(0, 1)
    for point in read:
        seen = g.or_(seen, point.condition)
    ports = [p for p in unrolled.model.ports if p.direction == "input"]
    for port in model.outputs:
        if port.name == protocol.done:
            continue
        value = g.const(0, port.width)     # never read: done_rose tells the difference
        for point in reversed(read):
            value = g.ite(point.condition, unrolled.outputs[point.cycle][port.name], value)
        ports.append(Port(f"{port.name}@done", "output", port.width, port.signed, value,
                          port.loc, port.msb, port.lsb))
    # Two bits, (design's done rose, against's done rose), the other design's bit a constant
    # 1: the pair agrees only when both rose, so "never rose" in either is a difference.
    one = g.const(1, 1)
    rose = g.concat(seen, one) if not other_rose else g.concat(one, seen)
    ports.append(Port(_ROSE, "output", 2, False, rose))
    view = Model(graph=g, top=model.top, files=model.files, parameters=model.parameters,
                 ports=ports, notes=list(model.notes))
    return _HandshakeSide(which, protocol, unrolled, view, seen, read)


class HandshakeEquivalenceProblem(EquivalenceProblem):
    """A handshake pair: the read views compared; a counterexample is also run cycle by
    cycle on both source models (``UnrolledModel.trace``), which must read the same values
    in the same cycles, and the cycle each design's done rose is shown in its note."""

    sides: tuple = ()

    def replay(self, values):
        found = super().replay(values)
        if found is None:
            return None
        cycles = []
        for side, model, free in ((self.sides[0], self.model_a, found.free_values_a),
                                  (self.sides[1], self.model_b, found.free_values_b)):
            leaf_values = dict(free)
            for port in side.view.inputs:
                name = port.name if model is self.model_a else next(
                    (a for a, b in found.input_names_b.items() if b == port.name), port.name)
                leaf_values[port.node.id] = found.inputs.get(name, 0)
            run = side.unrolled.trace(leaf_values)
            done = side.protocol.done
            rose = next((c.cycle for c in run[2:] if c.outputs[done]), None)
            values_read = {o.name: run[rose].outputs[o.name.rsplit("@", 1)[0]]
                           for o in side.view.outputs
                           if o.name != _ROSE} if rose is not None else None
            for pair in found.outputs:
                name = pair.name_a if model is self.model_a else pair.name_b
                if name == _ROSE or values_read is None:
                    continue
                if values_read[name] != (
                        pair.value_a if model is self.model_a else pair.value_b):
                    raise AssertionError(f"{side.which} `{model.top}`: the cycle-by-cycle run "
                                         f"reads {name} differently from the unrolled model")
            cycles.append(f"`{side.protocol.done}` of {side.which} `{model.top}` "
                          + (f"rose in cycle {rose}" if rose is not None else
                             f"never rose in cycles 2 .. {side.unrolled.cycles - 1}"))
        found.note = "; ".join(cycles) + " (replayed cycle by cycle on both designs)"
        return found


def build_handshake_equivalence(model_a: Model, model_b: Model, *,
                                mapping: Mapping[str, str] | None = None,
                                clock: Optional[str] = None, reset: Optional[str] = None,
                                reset_low: Optional[bool] = None, start: Optional[str] = None,
                                done: Optional[str] = None, hold_input: bool = False,
                                max_cycles: Optional[int] = None) -> EquivalenceProblem:
    """The handshake equivalence of two clocked models (see the module docstring).

    Port options name ports of ``model_a``; ``mapping`` gives their names in ``model_b``.
    Raises BcdproveError for anything ``infer_protocol`` refuses, a ``max_cycles`` below 1,
    or ports that do not pair."""
    mapping = dict(mapping or {})
    if max_cycles is not None and max_cycles < 1:
        raise BcdproveError(f"--max-cycles {max_cycles}: give at least 1")

    def other(name: Optional[str]) -> Optional[str]:
        return None if name is None else mapping.get(name, name)

    # Pair the source ports first, so a missing or mismatched port is named as the user
    # wrote it (not as one of its per-cycle copies); clock, reset, start and done included.
    _pair_ports(model_a, model_b, mapping)
    probe = infer_protocol(model_a, clock=clock, reset=reset, reset_low=reset_low, start=start,
                           done=done, hold_input=hold_input)
    control = {probe.clock, probe.reset, probe.start}
    widths = [p.width for p in model_a.inputs if p.name not in control] or [1]
    n = max_cycles or 2 * max(widths) + 8
    options = dict(reset_low=reset_low, hold_input=hold_input)
    side_a = _handshake_side(model_a, "design", n, False, clock=clock, reset=reset,
                             start=start, done=done, **options)
    side_b = _handshake_side(model_b, "against", n, True, clock=other(clock),
                             reset=other(reset), start=other(start), done=other(done),
                             **options)
    pa, pb = side_a.protocol, side_b.protocol
    if (pa.reset is None) != (pb.reset is None):
        with_reset, without = (side_a, side_b) if pa.reset else (side_b, side_a)
        raise BcdproveError(f"`{with_reset.view.top}` has a reset (`{with_reset.protocol.reset}`)"
                            f" but `{without.view.top}` has none; the two are driven by one "
                            f"protocol")
    view_mapping: dict[str, str] = {}
    skip = {pa.clock, pa.reset, pa.start}
    for port in model_a.inputs:
        if port.name not in skip:
            for t in range(n + 2):
                view_mapping[cycle_name(port.name, t)] = cycle_name(mapping.get(port.name,
                                                                                port.name), t)
    for port in model_a.outputs:
        if port.name != pa.done:
            view_mapping[f"{port.name}@done"] = f"{mapping.get(port.name, port.name)}@done"
    if pb.done != mapping.get(pa.done, pa.done):
        raise BcdproveError(f"done `{pa.done}` of `{model_a.top}` pairs with `{pb.done}` of "
                            f"`{model_b.top}`; give --map {pa.done}={pb.done} or --done")
    present = {p.name for p in side_a.view.ports}
    view_mapping = {a: b for a, b in view_mapping.items() if a in present}
    base = build_equivalence(side_a.view, side_b.view, view_mapping)
    problem = HandshakeEquivalenceProblem(**{f.name: getattr(base, f.name)
                                             for f in fields(base)})
    problem.model_a, problem.model_b = side_a.view, side_b.view
    problem.sides = (side_a, side_b)
    data = [p.name for p in model_a.inputs if p.name not in skip]
    held = "held from cycle 2 on" if hold_input else "free in every other cycle"
    per_port = [r for r in base.reasons if r.startswith(("input ", "output "))]
    problem.reasons = [f"design `{model_a.top}`: {r}" for r in pa.reasons] + [
        f"against `{model_b.top}`: {r}" for r in pb.reasons] + [
        f"handshake: both designs unrolled over cycles 0 .. {n + 1} with the same inputs: "
        f"reset in cycle 0, start in cycle 1 with {', '.join(data)} ({held}); each design's "
        f"outputs read in its own first cycle after 1 with done high, within {n} cycles; "
        f"done never rising in either is a difference (output {_ROSE}); power-up values "
        f"free; only the first transaction after reset is compared"] + [
        r for r in base.reasons if r not in per_port]
    return problem

"""Design against design for pipelines: both unrolled, the outputs compared at the read cycle.

Supported protocol: a pipeline of latency ``L`` (``--latency``), optionally with a reset.
Both designs are unrolled (``model.unroll``, its timing contract) over the same cycles with
the same inputs: without a reset, cycles ``0 .. L``, read in cycle ``L``; with a reset
(active in cycle 0 only), cycles ``0 .. L + 1``, read in cycle ``L + 1``.  Every input of
every cycle is shared and free, and every power-up register value and unknown value of
either design is free and independent.  The two designs are equivalent under this reading
when the outputs read agree for every such choice, which for two pipelines of latency ``L``
means: whatever came before, the value presented ``L`` cycles earlier gives the same outputs.

Handshake pairs (start/done) are not supported yet; they are refused with a clear error.
"""
from __future__ import annotations

from typing import Mapping, Optional

from ..errors import BcdproveError
from ..model.design import Model
from ..model.node import Node
from ..model.unroll import cycle_name, unroll
from .clocked import infer_protocol
from .equivalence import EquivalenceProblem, build_equivalence


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
                              hold_input: bool = False) -> EquivalenceProblem:
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
    if start or done or hold_input:
        raise BcdproveError("equiv of clocked designs supports pipelines (--latency) only; "
                            "--start, --done and --hold-input are not supported yet")
    if latency is None:
        raise BcdproveError(f"`{model_a.top}` and `{model_b.top}` are clocked: give --latency "
                            f"(pipelines); handshake pairs (start/done) are not supported yet")
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

"""The ``--vcd`` writer: a failing run as a Value Change Dump (IEEE 1364-2005 clause 18).

Contract: :func:`write_vcd` writes, with pyvcd, one scope named after the top module with
every port (the clock included) and a nested scope ``registers`` with every register.
Timescale 1 ns, one clock cycle every :data:`PERIOD` ns: cycle ``t`` spans
``[PERIOD*t, PERIOD*(t+1))`` and its active edge is at ``PERIOD*(t+1)``; the clock is at the
inactive level during the second half of each cycle, so the active edge is the one that
ends it (for a design on both edges the falling edge falls in the middle).  Register values
change at the edge that starts their cycle, inputs and outputs one nanosecond later (the
values of the second half for a design on both edges, see :mod:`bcdprove.model.unroll`).
"""
from __future__ import annotations

from typing import Sequence, TextIO

from ..model.unroll import CycleValues, UnrolledModel

PERIOD = 10


def _edge_ends_low(unrolled: UnrolledModel) -> bool:
    """Whether the active edge is a falling one (registers on negedge only)."""
    edges = {r.edge for r in unrolled.source.registers}
    return edges == {"negedge"}


def write_vcd(stream: TextIO, unrolled: UnrolledModel, trace: Sequence[CycleValues],
              comment: str = "") -> None:
    """Write the run ``trace`` of ``unrolled`` to ``stream`` (see the module docstring)."""
    from vcd import VCDWriter

    source = unrolled.source
    top = source.top
    falling = _edge_ends_low(unrolled)
    with VCDWriter(stream, timescale="1 ns", date="", comment=comment or "bcdprove run",
                   version="bcdprove") as writer:
        clock = None
        if unrolled.clock is not None:
            clock = writer.register_var(top, unrolled.clock, "wire", size=1,
                                        init=0 if falling else 1)
        first = trace[0] if trace else None
        ports = {}
        for port in source.ports:
            if port.name == unrolled.clock:
                continue
            init = None
            if first is not None:
                init = first.inputs.get(port.name, first.outputs.get(port.name))
            ports[port.name] = writer.register_var(top, port.name, "wire", size=port.width,
                                                   init=init)
        registers = {r.name: writer.register_var(f"{top}.registers", r.name, "reg", size=r.width,
                                                 init=first.registers[r.name] if first else None)
                     for r in source.registers}
        for values in trace:
            start = PERIOD * values.cycle
            # pyvcd wants the changes in time order.
            if clock is not None:
                writer.change(clock, start, 0 if falling else 1)
            for name, value in values.registers.items():
                writer.change(registers[name], start, value)
            for name, value in values.inputs.items():
                writer.change(ports[name], start + 1, value)
            for name, value in values.outputs.items():
                writer.change(ports[name], start + 1, value)
            if clock is not None:
                writer.change(clock, start + PERIOD // 2, 1 if falling else 0)
        end = PERIOD * len(trace)
        if clock is not None:
            writer.change(clock, end, 0 if falling else 1)


def vcd_text(unrolled: UnrolledModel, trace: Sequence[CycleValues], comment: str = "") -> str:
    """The VCD as a string."""
    import io

    buffer = io.StringIO()
    write_vcd(buffer, unrolled, trace, comment)
    return buffer.getvalue()

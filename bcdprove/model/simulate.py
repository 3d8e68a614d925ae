"""Bit-parallel ("lanes") simulation of a cone of the model, two- or three-valued.

A *plane* is a Python int whose bit ``j`` is one bit of a signal for input vector (lane)
``j``; a word of width ``w`` is ``w`` planes, least significant first.  A
:class:`Simulator` lowers the cone of its roots once to bit gates (see ``_lowering``) and
generates straight-line Python for it, so one run costs one big-int operation per gate,
whatever the number of lanes.

Three-valued runs carry an *unknown* plane beside every value plane.  FREE leaves that are
not given are unknown.  The result is sound: a bit reported known has that value for
every choice of the unknown leaf bits (it may be reported unknown although it is in fact
determined).  Value bits under an unknown bit are 0.  When nothing is unknown the
two-valued program runs and no ternary work is done at all.
"""
from __future__ import annotations

import gc
from contextlib import contextmanager
from dataclasses import dataclass
from typing import Mapping, Sequence

from ._bitnet import BitNetlist, Program
from ._lowering import lower
from .node import Node, Op, mask, topological

__all__ = ["Planes", "Simulator", "pack", "unpack", "counting_planes", "simulate"]


@dataclass
class Planes:
    """Value and unknown planes of one word, least significant bit first, both ``width`` long."""

    value: list[int]
    unknown: list[int]


def pack(values: Sequence[int], width: int) -> list[int]:
    """Planes of ``width`` bits holding ``values[j]`` (taken modulo ``2**width``) in lane ``j``."""
    if not values:
        return [0] * width
    m = mask(width)
    form = f"0{width}b"
    # One binary string, last lane first; bit i of every lane is then an evenly strided
    # slice, which the C string code gathers without a Python loop over lanes.
    text = "".join([format(v & m, form) for v in reversed(values)])
    return [int(text[width - 1 - i::width], 2) for i in range(width)]


def unpack(planes: Sequence[int], lanes: int) -> list[int]:
    """Lane values of ``planes`` (least significant first) for lanes ``0 .. lanes-1``."""
    width = len(planes)
    if width == 0 or lanes == 0:
        return [0] * lanes
    m = mask(lanes)
    form = f"0{lanes}b"
    text = bytearray(lanes * width)
    for i, plane in enumerate(planes):
        # Lane lanes-1 first, so lane j's bits end up in chunk lanes-1-j.
        text[width - 1 - i::width] = format(plane & m, form).encode()
    values = [int(text[k:k + width], 2) for k in range(0, lanes * width, width)]
    values.reverse()
    return values


def counting_planes(start: int, lanes: int, width: int) -> list[int]:
    """Planes of the consecutive values ``start, start+1, ...`` (modulo ``2**width``) in lanes.

    The quick way to feed an exhaustive run: no per-lane work, only per-plane patterns.
    """
    planes = []
    for i in range(width):
        half = 1 << i
        period = half << 1
        phase = start % period
        if period <= 8 * lanes + 8:
            planes.append((_periodic(i, lanes + period) >> phase) & mask(lanes))
            continue
        # Long period: the plane has at most two runs of ones inside the lanes.
        plane = 0
        lane = 0
        while lane < lanes:
            position = (phase + lane) % period
            run = min((period if position >= half else half) - position, lanes - lane)
            if position >= half:
                plane |= mask(run) << lane
            lane += run
        planes.append(plane)
    return planes


def _periodic(bit: int, length: int) -> int:
    """At least ``length`` bits whose bit ``j`` is bit ``bit`` of ``j``."""
    if bit < 3:
        byte = (0xAA, 0xCC, 0xF0)[bit]
        return int.from_bytes(bytes([byte]) * (length // 8 + 1), "little")
    half = (1 << bit) // 8
    block = b"\x00" * half + b"\xff" * half
    return int.from_bytes(block * (length // (16 * half) + 1), "little")


class Simulator:
    """Compiled lane simulation of the cone of ``roots`` (see the module docstring).

    ``leaves`` lists the INPUT, STATE and FREE leaves of the cone; :meth:`run` wants value
    planes for every INPUT and STATE leaf and optionally for FREE ones.
    """

    def __init__(self, roots: Sequence[Node], extend: "Simulator | None" = None,
                 shareable: bool = False):
        """``extend``: a shareable simulator whose lowering this one reuses (its gates and
        leaves come first; only nodes it did not lower are lowered), so ``leaves`` may then
        hold leaves outside this cone, which :meth:`run` still wants planes for.
        ``shareable``: keep the lowering so that later simulators can extend it."""
        self.roots = list(roots)
        with _collector_paused():
            order = topological(self.roots)
            fresh = [n for n in order if n.op in (Op.INPUT, Op.STATE, Op.FREE)]
            if extend is None or extend._bits is None:
                self.leaves: list[Node] = fresh
                self._net = BitNetlist()
                bits: dict = {}
            else:
                known = extend._leaf_index
                self.leaves = list(extend.leaves) + [n for n in fresh if n.id not in known]
                self._net = extend._net
                bits = extend._bits
                order = [n for n in order if n.id not in bits]
            self._leaf_index = {leaf.id: k for k, leaf in enumerate(self.leaves)}
            bits = lower(self._net, order, self._leaf_index, bits)
            self._outputs = [b for root in self.roots for b in bits[root.id]]
            self._bits = bits if shareable else None
        # Scheduled on first use: a cone with unknown values may only ever run ternary.
        self._two_valued: Program | None = None
        self._ternary: dict[tuple, Program] = {}

    @property
    def _program(self) -> Program:
        if self._two_valued is None:
            with _collector_paused():
                self._two_valued = self._net.compile(self._outputs, "two_valued")
        return self._two_valued

    @property
    def gate_count(self) -> int:
        """Number of bit gates (loads included) the two-valued program evaluates per run."""
        return len(self._program)

    def run(self, lanes: int, values: Mapping[int, Sequence[int]],
            unknown: Mapping[int, Sequence[int]] | None = None) -> list[Planes]:
        """Simulate ``lanes`` input vectors; one :class:`Planes` per root, in order.

        ``values`` maps leaf node ids to value planes (as many as the leaf is wide); every
        INPUT and STATE leaf of the cone must be there (KeyError naming the leaf).  FREE
        leaves not in ``values`` are unknown.  ``unknown`` optionally maps leaf ids to
        planes marking given bits unknown.
        """
        m = mask(lanes)
        planes: list[Sequence[int]] = []
        unknown_planes: list[Sequence[int]] = []
        modes: list[str] = []
        for leaf in self.leaves:
            given = values.get(leaf.id)
            if given is None:
                if leaf.op != Op.FREE:
                    raise KeyError(f"no value planes for leaf {leaf!r}")
                planes.append(())
                unknown_planes.append(())
                modes.append("unknown")
                continue
            planes.append(_checked(given, leaf, lanes, m, "value"))
            marks = unknown.get(leaf.id) if unknown else None
            if marks is not None and any(marks):
                unknown_planes.append(_checked(marks, leaf, lanes, m, "unknown"))
                modes.append("masked")
            else:
                unknown_planes.append(())
                modes.append("known")
        widths = [root.width for root in self.roots]
        if all(mode == "known" for mode in modes):
            with _collector_paused():       # a result can hold 10**5 roots' planes
                flat = self._program(m, planes, unknown_planes)
                return _split(flat, [0] * len(flat), widths)
        key = tuple(modes)
        program = self._ternary.get(key)
        if program is None:
            with _collector_paused():
                net, value_bits, unknown_bits = self._net.ternary(self._outputs, modes)
                program = net.compile(value_bits + unknown_bits, "three_valued")
            self._ternary[key] = program
        with _collector_paused():
            flat = program(m, planes, unknown_planes)
            half = len(flat) // 2
            return _split(flat[:half], flat[half:], widths)


@contextmanager
def _collector_paused():
    """Pause the cycle collector while building netlists.

    Building makes millions of small tuples and lists, none of them in cycles; the collector
    would scan them over and over, which (measured) doubles the build time.
    """
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()


def _checked(given: Sequence[int], leaf: Node, lanes: int, m: int, what: str) -> list[int]:
    if len(given) != leaf.width:
        raise ValueError(f"{len(given)} {what} planes for the {leaf.width}-bit leaf {leaf!r}")
    # Bits above the lanes would leak through NOT (x ^ M keeps them); clear them.
    return [p if 0 <= p and p.bit_length() <= lanes else p & m for p in given]


def _split(value: list[int], unknown: list[int], widths: Sequence[int]) -> list[Planes]:
    out = []
    start = 0
    for width in widths:
        out.append(Planes(value[start:start + width], unknown[start:start + width]))
        start += width
    return out


def simulate(roots: Sequence[Node], vectors: Mapping[int, Sequence[int]],
             free: Mapping[int, Sequence[int]] | None = None) -> list[list[tuple[int, int]]]:
    """Per-lane convenience wrapper around :class:`Simulator`.

    ``vectors`` (and ``free`` for FREE leaves) map leaf ids to one int per lane; all lists
    have the same length (1 lane if there are none).  Returns, for each root, a list over
    lanes of ``(value, unknown_mask)``; value bits under the unknown mask are 0.
    """
    given = dict(vectors)
    if free:
        given.update(free)
    lengths = {len(v) for v in given.values()}
    if len(lengths) > 1:
        raise ValueError(f"lane lists of different lengths: {sorted(lengths)}")
    lanes = lengths.pop() if lengths else 1
    simulator = Simulator(roots)
    values = {leaf.id: pack(given[leaf.id], leaf.width)
              for leaf in simulator.leaves if leaf.id in given}
    results = simulator.run(lanes, values)
    return [list(zip(unpack(r.value, lanes), unpack(r.unknown, lanes))) for r in results]

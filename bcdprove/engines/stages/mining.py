"""Mining: proposing, by simulation, which design signals hold the digits of each stage.

The model and the reference (:func:`reference.step_planes`) run on the same lanes; a 4-bit
slice of a design node whose value equals reference digit ``j`` of stage ``s`` on every lane
is a *candidate* for that digit.  Candidates only propose; the solver decides.

Where to look, in order (tier 0 first): 4-bit slices of the model's named signals (nets,
variables, per-iteration probes, instance ports), then every 4..8-bit node in the cone of
the outputs, then the complements of those nodes.  Stimuli: random inputs, inputs whose top
``k`` bits are all ones (every stage then sees its largest prefix) and inputs whose prefixes
sit just under and over powers of ten, so that sparse top digits still get a signature.
"""
from __future__ import annotations

import random
from dataclasses import dataclass, field
from typing import Optional

from ...model.node import Node, Op, mask, topological
from ...model.simulate import Simulator, pack
from .bit_mining import assemble, bit_level_nodes, lowest_input_bits, named_bits
from .cuts import ConstBit, Fact, InputBit
from .reference import digit_count, step_planes

_NARROW = range(4, 9)          # widths of the unnamed nodes searched (digit-sized cells)
_KEEP = 40                     # candidates kept per digit of a stage


@dataclass(frozen=True)
class Candidate:
    """A 4-bit slice ``node[low+3:low]`` proposed for one digit of one stage."""

    node: Node
    low: int
    name: str
    tier: int                  # 0 named signal, 1 unnamed node, 2 complement of an unnamed
                               # node, 3 assembled from 1-bit signals (see bit_mining)
    complemented: bool = False

    def describe(self) -> str:
        return f"{self.name}[{self.low + 3}:{self.low}]"


@dataclass
class Mining:
    """What simulation proposed: digit candidates per stage and bit facts per node."""

    width: int
    lanes: int
    inputs: list[int]
    candidates: list[list[list[Candidate]]]       # [stage][digit] -> candidates, best first
    wrong_inputs: list[int] = field(default_factory=list)        # lanes whose outputs were wrong
    simulator: Optional[Simulator] = None                         # the mining run, for screening
    _coverage: dict = field(default_factory=dict)
    planes: dict[int, list[int]] = field(default_factory=dict)    # node id -> value planes
    unknown: dict[int, list[int]] = field(default_factory=dict)   # node id -> unknown planes
    input_planes: dict[int, int] = field(default_factory=dict)    # x bit plane -> bit index
    synthetic: set[int] = field(default_factory=set)   # ids of nodes made by bit-level mining
    bit_options: dict = field(default_factory=dict)    # (stage, digit) -> per bit, matching nets

    def coverage(self, stage: int, node_id: int) -> int:
        """How many digits of ``stage`` have a candidate in node ``node_id``."""
        counts = self._coverage.get(stage)
        if counts is None:
            counts = {}
            for options in self.candidates[stage]:
                for seen in {c.node.id for c in options}:
                    counts[seen] = counts.get(seen, 0) + 1
            self._coverage[stage] = counts
        return counts.get(node_id, 0)

    def matched(self, stage: int) -> bool:
        """Every digit that can be non-zero at ``stage`` has at least one candidate."""
        return all(self.candidates[stage][j] for j in range(digit_count(stage)))

    def bit_fact(self, node: Node, bit: int) -> Fact:
        """What bit ``bit`` of ``node`` looked like on every lane: a constant, an input bit, or None."""
        planes = self.planes.get(node.id)
        blind = self.unknown.get(node.id)          # (no default list: nodes are W + 4D wide)
        if planes is None or (blind is not None and blind[bit]):
            return None
        plane = planes[bit]
        if plane == 0:
            return ConstBit(0)
        if plane == mask(self.lanes):
            return ConstBit(1)
        index = self.input_planes.get(plane)
        return None if index is None else InputBit(index)


def nesting(name: str) -> int:
    """How deep inside loops a probe was taken (``work@step=3,digit=1`` is 1 deeper than
    ``work@step=3``): the end of an outer iteration is where a stage is complete."""
    return name.count(",") + name.count("#")


def stimuli(width: int, seed: int = 2026, random_count: int = 64, boundary_count: int = 128) -> list[int]:
    """Input values for mining (see the module docstring); deterministic for a seed."""
    rng = random.Random(seed)
    top = mask(width)
    values = [0, top]
    values += [rng.getrandbits(width) for _ in range(random_count)]
    # Top k bits ones: stage k sees 2**k - 1, its largest prefix.
    for k in range(1, width + 1):
        low = width - k
        values.append((mask(k) << low) | (rng.getrandbits(low) if low else 0))
    # At every stage, the prefixes just under and at its top digit's power of ten and five
    # times it: a net that merely agrees with a sparse top-digit bit on random lanes (a
    # gate-level netlist has many) disagrees on one of these.
    for stage in range(1, width + 1):
        power = 10 ** (digit_count(stage) - 1)
        low = width - stage
        for prefix in (power - 1, power, 5 * power - 1, 5 * power):
            if 0 < prefix <= mask(stage):
                values.append((prefix << low) | (rng.getrandbits(low) if low else 0))
    # Prefixes just under and over powers of ten, at random stages.
    for _ in range(boundary_count):
        stage = rng.randint(1, width)
        count = digit_count(stage)
        power = 10 ** (count - 1)
        prefix = rng.choice([power - 1, power, power + 1, 2 * power - 1, 5 * power - 1,
                             5 * power, mask(stage), mask(stage) - 1])
        prefix = max(0, min(prefix, mask(stage)))
        low = width - stage
        values.append((prefix << low) | (rng.getrandbits(low) if low else 0))
    return values


def reference_planes(x_planes: list[int], width: int, lanes: int) -> list[list[tuple]]:
    """Reference digits of every stage 0..W as 4-tuples of planes (digit 0 first)."""
    full = mask(lanes)
    stages: list[list[tuple]] = [[]]
    digits: list[tuple] = []
    zero = (0, 0, 0, 0)
    for s in range(width):
        count = digit_count(s + 1)
        padded = digits + [zero] * (count - len(digits))
        digits = step_planes(padded, x_planes[width - s - 1], full)[:count]
        stages.append(digits)
    return stages


def _named_roots(problem) -> list[tuple[str, Node]]:
    """One (name, node) per named node of 4 bits or more, under its outermost name."""
    best: dict[int, tuple[str, Node]] = {}
    for name, signal in problem.model.signals.items():
        node = signal.node
        if node.width < 4 or node.op == Op.CONST:
            continue
        known = best.get(node.id)
        if known is None or nesting(name) < nesting(known[0]):
            best[node.id] = (name, node)
    return list(best.values())


def mine(problem, lanes_seed: int = 2026) -> Mining:
    """Simulate the model on the stimuli and collect digit candidates for every stage."""
    width = problem.width
    values = stimuli(width, lanes_seed)
    lanes = len(values)
    named = _named_roots(problem)
    named_ids = {node.id for _, node in named}
    cone = topological(problem.digits)
    unnamed = [n for n in cone if n.width in _NARROW and n.op not in Op.LEAVES
               and n.op != Op.CONST and n.id not in named_ids]
    # Wide probes from inside inner loops (a whole register after each digit's update: W x D
    # of them, each W + 4D bits) are only simulated when the others leave a digit without a
    # candidate; their planes alone grew with the cube of the width.
    late = [node for name, node in named if nesting(name) > 0 and node.width > _NARROW[-1]]
    late_ids = {node.id for node in late}
    early = [node for _, node in named if node.id not in late_ids]
    roots = early + unnamed + list(problem.digits)
    # Extends the random hunt's lowering when auto ran one (same problem, same design).
    simulator = Simulator(roots, extend=getattr(problem, "lane_simulator", None))
    noise = random.Random(lanes_seed + 1)
    given: dict[int, list[int]] = {}
    planes: dict[int, list[int]] = {}
    unknown: dict[int, list[int]] = {}

    def run(simulator: Simulator, roots: list[Node]) -> list:
        for leaf in simulator.leaves:
            if leaf.id in given:
                continue
            if leaf is problem.x:
                given[leaf.id] = pack(values, width)
            elif leaf.op == Op.FREE:
                # Unknown values at random (a two-valued run is the fast one): a node that
                # depends on them then rarely looks constant.
                given[leaf.id] = [noise.getrandbits(lanes) for _ in range(leaf.width)]
            else:
                given[leaf.id] = [0] * leaf.width      # other inputs: a proposal needs one choice
        results = simulator.run(lanes, {leaf.id: given[leaf.id] for leaf in simulator.leaves})
        for node, result in zip(roots, results):
            planes[node.id] = result.value
            unknown[node.id] = result.unknown
        return results

    results = run(simulator, roots)
    x_planes = pack(values, width)
    reference = reference_planes(x_planes, width, lanes)

    wanted: dict[tuple, list[tuple[int, int]]] = {}
    for s, digits in enumerate(reference):
        for j, key in enumerate(digits):
            wanted.setdefault(key, []).append((s, j))
    candidates = [[[] for _ in digits] for digits in reference]
    first_planes = {key[0] for key in wanted}
    full = mask(lanes)

    def offer(node: Node, name: str, tier: int, complemented: bool = False) -> None:
        value = planes[node.id]
        if complemented:
            value = [~p & full for p in value]
        blind = unknown[node.id]
        for low in range(node.width - 3):
            if value[low] not in first_planes:
                continue
            key = tuple(value[low:low + 4])
            hits = wanted.get(key)
            if hits is None or any(blind[low:low + 4]):
                continue
            for s, j in hits:
                slot = (node.id, low, complemented)
                known = offered.get((s, j, slot))
                if known is not None and nesting(known.name) <= nesting(name):
                    continue
                offered[(s, j, slot)] = Candidate(node, low, name, tier, complemented)

    offered: dict[tuple, Candidate] = {}     # one candidate per slice, under its outermost name

    def unmatched() -> list[tuple[int, int, tuple]]:
        """``(stage, digit, reference planes)`` of every digit with no candidate yet."""
        found = {(s, j) for s, j, _ in offered}
        return [(s, j, key) for s, digits in enumerate(reference)
                for j, key in enumerate(digits) if (s, j) not in found]

    # Outer names and digit-sized nodes first; probes from inside inner loops (many, and
    # rarely a complete stage) and complements only while some digit has no candidate.
    outer = [(name, node) for name, node in named if nesting(name) == 0]
    inner = [(name, node) for name, node in named if nesting(name) > 0]
    for name, node in outer:
        offer(node, name, 0)
    for node in unnamed:
        offer(node, f"n{node.id}", 1)
    if unmatched():
        if late:
            run(Simulator(late), late)
        for name, node in inner:
            offer(node, name, 0)
    if unmatched():
        for node in unnamed:
            offer(node, f"~n{node.id}", 2, complemented=True)
    synthetic: set[int] = set()
    bit_options: dict = {}
    missing = unmatched()
    if missing:
        # A gate-level netlist: no word holds a digit, so assemble digits from 1-bit nets.
        bits = bit_level_nodes(cone)
        fresh = [node for node in bits if node.id not in planes]
        if fresh:
            run(Simulator(fresh), fresh)
        for s, j, node, label in assemble(problem.model.graph, missing, bits, planes, unknown,
                                          lanes, named_bits(problem.model.signals, nesting),
                                          bit_options, lowest_input_bits(cone, problem.x),
                                          width):
            offered[(s, j, (node.id, 0, False))] = Candidate(node, 0, label, 3)
            synthetic.add(node.id)
    for (s, j, _), candidate in offered.items():
        candidates[s][j].append(candidate)
    for digits in candidates:
        _rank(digits)
    input_planes = {plane: k for k, plane in enumerate(x_planes)}
    shown = results[len(roots) - len(problem.digits):]
    wrong = _wrong_lanes(problem, values, shown, reference[width])
    return Mining(width=width, lanes=lanes, inputs=values, candidates=candidates, planes=planes,
                  unknown=unknown, input_planes=input_planes, wrong_inputs=wrong,
                  simulator=simulator, synthetic=synthetic, bit_options=bit_options)


def screen(mining: Mining, problem, inputs: list[int]) -> list[int]:
    """The inputs whose outputs may be wrong by a quick lane simulation (unknowns count as
    wrong); the rest are certainly right, so only these need the full replay."""
    if not inputs or mining.simulator is None:
        return list(inputs)
    simulator = mining.simulator
    lanes = len(inputs)
    given = {}
    for leaf in simulator.leaves:
        if leaf is problem.x:
            given[leaf.id] = pack(inputs, problem.width)
        elif leaf.op != Op.FREE:
            given[leaf.id] = [0] * leaf.width
    if len(given) != sum(1 for leaf in simulator.leaves if leaf.op != Op.FREE):
        return list(inputs)
    results = simulator.run(lanes, given)
    shown = results[len(results) - len(problem.digits):]
    final = reference_planes(pack(inputs, problem.width), problem.width, lanes)[problem.width]
    if any(leaf.op == Op.INPUT and leaf is not problem.x for leaf in simulator.leaves):
        return list(inputs)                     # other inputs were pinned at zero: no proof of right
    suspects = set(_wrong_lanes(problem, inputs, shown, final, limit=lanes))
    return [x for x in inputs if x in suspects]


def _wrong_lanes(problem, values: list[int], shown, final: list[tuple], limit: int = 8) -> list[int]:
    """Inputs among the stimuli whose simulated outputs differ from the reference digits.

    Only a hint (unknown values were left open): the engine replays each before believing it.
    """
    lanes = len(values)
    bad = 0
    for i, result in enumerate(shown):
        expected = final[i] if i < len(final) else (0, 0, 0, 0)
        for got, want, blind in zip(result.value, expected, result.unknown):
            bad |= (got ^ want) | blind
    for key in final[len(shown):]:            # digits the design does not show must be zero
        for plane in key:
            bad |= plane
    return [values[k] for k in range(lanes) if bad >> k & 1][:limit]


def _rank(digits: list[list[Candidate]]) -> None:
    """Order each digit's candidates: named first, then nodes holding more digits of the
    stage (the digits of one stage usually sit in one register), then earlier nodes (a
    sparse early digit can collide with a late node whose cone reaches back to the input)."""
    coverage: dict[int, int] = {}
    for options in digits:
        for node_id in {c.node.id for c in options}:
            coverage[node_id] = coverage.get(node_id, 0) + 1
    for options in digits:
        options.sort(key=lambda c: (c.tier, nesting(c.name), -coverage[c.node.id], c.node.id, c.low))
        del options[_KEEP:]

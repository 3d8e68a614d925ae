"""SAT sweeping for design-against-design checks: merge proved-equal nodes, then the outputs.

The engine works on an :class:`~bcdprove.spec.equivalence.EquivalenceProblem`, whose graph
holds both designs' output cones over shared inputs.

1. A difference hunt (``difference_hunt``) simulates both designs on corner and random
   vectors; a difference found there is replayed and returned.
2. Every operator node of both cones is simulated on the same vectors; its *signature* is its
   values on all lanes, taken up to complement (a node and its bitwise complement share a
   signature with opposite phase).  Nodes with equal signatures and equal phase are proposed
   as equal when one serves design A and the other design B; a node whose signature is
   constant is proposed equal to that constant first.
3. Nodes are visited in topological order and rebuilt, in bit form (``model.bit_form``), over
   the nodes already merged; the graph's hash-consing then merges structurally equal nodes
   without any query.  A proposed pair that is still different is given to the
   :class:`PairProver` (small z3 queries with cut points).  Proved: the later node takes the
   bits of the earlier one (or of the constant) from then on.
   Refuted by a real input (no cut point involved): that input splits the signatures of every
   node, and it is replayed on the designs in case the outputs differ there too.  A failed
   internal pair is never by itself a counterexample of the designs.
4. Each output pair, rebuilt over every merge, is proved equal (often it is the same node by
   now) with the same prover, whose last step is a query down to the leaves: the miter.

Soundness: a node is replaced only by a node proved equal to it for every leaf value, so the
rebuilt outputs mean what the originals mean; "proved" needs every output pair proved;
"disproved" needs a difference replayed on both models; anything else is "unknown" with the
counts of pairs and the outputs proved.
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field

from ..model.node import Node, Op, evaluate, mask, topological
from ..model.simulate import Simulator, pack
from ..model.bit_form import BitForm
from .base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict
from .difference_hunt import DifferenceHunt, corner_vectors
from .pair_prover import PROVED as PAIR_PROVED, REFUTED, PairProver

SIGNATURE_LANES = 1024
# Pairs of one design, and pairs of a node with the complement of another (a digit's carry
# bit with "not (digit < 5)"), are equal only thanks to a range argument (every digit is at
# most 9) far more often than they help: merged, they pull one design's structure away from
# the other's, and every later pair then needs a query down to the inputs.  Measured on the
# 32-bit loop against the digit-array converter: 22 s with them, 6 s without (wall clock,
# measured before constants were proved down to the inputs; not measured again since).
COMPLEMENTS = False
# A node constant on every lane gets the same escalation as a pair, down to the inputs: most
# are bits that are zero only because of the input's range (the digits above the highest one
# 2^s - 1 has at stage s, an add-3 that can never fire there), and once merged into the
# constant they fold the cells above them, so the designs then meet by hash-consing.  The
# cells repeat, so most of these are proved by the shape of an earlier query.  Measured at 64
# bits, loop against add-3 triangle: with a local query only (meet 16), 276 z3 queries and
# 9.4 s CPU (the range facts were paid for again in each later pair's query to the inputs);
# with the escalation, 25 queries and 2.5 s.
LOCAL_LIMITS = None


@dataclass
class SweepStats:
    candidates: int = 0          # operator nodes of both cones
    proposed: int = 0            # pairs given to the solver
    proved: int = 0
    refuted: int = 0             # split by a real input
    undecided: int = 0           # spurious under cut points, or no answer in time
    structural: int = 0          # merged by hash-consing after rebuilding, no query
    constants: int = 0           # merged into a constant
    refinements: int = 0
    visited: int = 0
    complement_skipped: int = 0
    same_design: int = 0         # proposals skipped: both nodes serve one design only

    def as_dict(self) -> dict:
        return dict(self.__dict__)


@dataclass
class _Classes:
    """Signature classes of the original nodes, refined by counterexamples."""

    keys: dict[int, tuple] = field(default_factory=dict)
    phase: dict[int, int] = field(default_factory=dict)
    constant: dict[int, int | None] = field(default_factory=dict)

    def add(self, node: Node, planes: list[int], lanes: int) -> None:
        full = mask(lanes)
        flip = planes[0] & 1
        canonical = tuple((p ^ full) if flip else p for p in planes)
        self.keys[node.id] = (node.width, canonical)
        self.phase[node.id] = flip
        if all(p in (0, full) for p in planes):
            self.constant[node.id] = sum(1 << i for i, p in enumerate(planes) if p)
        else:
            self.constant[node.id] = None

    def refine(self, node: Node, value: int) -> None:
        canonical = value ^ mask(node.width) if self.phase[node.id] else value
        self.keys[node.id] = self.keys[node.id] + (canonical,)
        if self.constant.get(node.id) is not None and self.constant[node.id] != value:
            self.constant[node.id] = None


class Sweeper:
    """One sweep over a problem's combined graph (see the module docstring, steps 2-4)."""

    def __init__(self, problem, prover: PairProver, hunt: DifferenceHunt, seed_vectors: list):
        self.problem = problem
        self.graph = problem.graph
        self.prover = prover
        self.order = topological(problem.roots)
        self.candidates = [n for n in self.order if n.op not in Op.LEAVES]
        # Which design each node serves: 1 design A, 2 design B, 3 both (shared structure).
        self.side: dict[int, int] = {}
        for mark, roots in ((1, [o.node_a for o in problem.outputs]),
                            (2, [o.node_b for o in problem.outputs])):
            for node in topological(roots):
                self.side[node.id] = self.side.get(node.id, 0) | mark
        self.stats = SweepStats(candidates=len(self.candidates))
        self.classes = _Classes()
        self.bits: dict[int, list[Node]] = {}      # original node id -> its bits, rebuilt
        # Original node id -> its word, rebuilt: made only when a query or an output needs
        # it (concatenating every wide word's bits was most of a 128-bit run).
        self.rebuilt: dict[int, Node] = {}
        self.form = BitForm(self.graph)
        self.found = None               # a replayed difference met while refining
        self._signatures(hunt, seed_vectors)

    def _signatures(self, hunt: DifferenceHunt, seed_vectors: list) -> None:
        vectors = list(seed_vectors)[:SIGNATURE_LANES // 2]
        vectors += hunt.random_vectors(SIGNATURE_LANES - len(vectors))
        lanes = len(vectors)
        simulator = Simulator(self.candidates)
        planes = {leaf.id: pack([v.get(leaf.id, 0) for v in vectors], leaf.width)
                  for leaf in simulator.leaves}
        for node, result in zip(self.candidates, simulator.run(lanes, planes)):
            self.classes.add(node, result.value, lanes)

    def _rebuild(self, node: Node) -> list[Node]:
        """Rebuild ``node`` over the merged forms of its arguments (in bit form, see
        ``model.bit_form``); records and returns the bits."""
        if node.op in Op.LEAVES:
            bits = self.form.leaf(node)
        else:
            bits = self.form.apply(node, [self.bits[a.id] for a in node.args])
        return self._set(node, bits)

    def _set(self, node: Node, bits: list[Node]) -> list[Node]:
        self.bits[node.id] = bits
        self.rebuilt.pop(node.id, None)
        return bits

    def _word(self, node: Node) -> Node:
        """The word of ``node``'s current bits."""
        word = self.rebuilt.get(node.id)
        if word is None:
            word = self.rebuilt[node.id] = self.form.word(self.bits[node.id])
        return word

    def run(self, budget: Budget) -> None:
        """Visit every node in topological order, merging what can be proved equal."""
        representatives: dict[tuple, Node] = {}    # signature -> first original node of it
        kept: list[Node] = []            # visited original nodes that stayed their own class
        # Signature -> its members' bits (as id tuples: one word has one tuple of bits).
        members: dict[tuple, set[tuple]] = {}
        for node in self.order:
            current = self._rebuild(node)
            if node.op in Op.LEAVES:
                continue
            self.stats.visited += 1
            if (all(b.op == Op.CONST for b in current) or budget.expired()
                    or self.found is not None):
                continue
            current_ids = tuple(b.id for b in current)
            constant = self.classes.constant[node.id]
            if constant is not None:
                target = self.graph.const(constant, node.width)
                if self._try(node, self.form.leaf(target), budget, limits=LOCAL_LIMITS):
                    self.stats.constants += 1
                    continue
            key = self.classes.keys[node.id]
            words = members.setdefault(key, set())
            if current_ids in words:
                # Already the very node of an earlier member (hash-consing met it): merging it
                # into the class representative instead would pull it away from that member.
                self.stats.structural += 1
                continue
            words.add(current_ids)
            rep = representatives.get(key)
            if rep is None:
                representatives[key] = node
                kept.append(node)
                continue
            if self.side[rep.id] | self.side[node.id] != 3:
                # Both in one design: merging them helps that design only and may pull its
                # structure away from the other's (a node replaced by an equal one that only
                # a range argument shows equal); the aim is to meet the other design.
                self.stats.same_design += 1
                continue
            bits = self.bits[rep.id]
            if self.classes.phase[rep.id] != self.classes.phase[node.id]:
                if not COMPLEMENTS:
                    self.stats.complement_skipped += 1
                    continue
                bits = [self.graph.not_(b) for b in bits]
            if tuple(b.id for b in bits) == current_ids:
                self.stats.structural += 1
                continue
            if self._try(node, bits, budget):
                words.add(tuple(b.id for b in bits))
                continue
            kept.append(node)
            if self.classes.keys[node.id] != key:          # refined: rebuild the classes
                representatives = {}
                for old in kept:
                    representatives.setdefault(self.classes.keys[old.id], old)

    def _try(self, node: Node, bits: list[Node], budget: Budget, limits=None) -> bool:
        """Prove ``node``'s current word equal to the word of ``bits``; on success ``node``
        takes ``bits``."""
        self.stats.proposed += 1
        outcome = self.prover.prove_equal(self._word(node), self.form.word(bits), budget,
                                          label=f"n{node.id}", limits=limits)
        if outcome.status == PAIR_PROVED:
            self.stats.proved += 1
            self._set(node, list(bits))
            return True
        if outcome.status == REFUTED:
            self.stats.refuted += 1
            self._refine(outcome.values)
        else:
            self.stats.undecided += 1
        return False

    def _refine(self, values: dict[int, int]) -> None:
        """Split every class with one more input vector (a real one: no cut point)."""
        self.stats.refinements += 1
        full = {leaf.id: values.get(leaf.id, 0) for leaf in self.order if leaf.op in Op.LEAVES
                and leaf.op != Op.CONST}
        results = evaluate(self.candidates, full, self.order)
        for node, value in zip(self.candidates, results):
            self.classes.refine(node, value)
        self.found = self.problem.replay(full)

    def reduced_outputs(self) -> list[tuple[Node, Node]]:
        return [(self._word(o.node_a), self._word(o.node_b))
                for o in self.problem.outputs]


class SweepingEngine:
    """The ``sweep`` engine: hunt, sweep, then the output miter on the reduced graph."""

    name = "sweep"

    def __init__(self, hunt_vectors: int = 1 << 13, seed: int = 1, query_seconds: float = 5.0,
                 sweep: bool = True):
        self.hunt_vectors = hunt_vectors
        self.seed = seed
        self.query_seconds = query_seconds
        self.sweep = sweep

    def _prover(self) -> PairProver:
        if self.sweep:
            return PairProver(self.query_seconds)
        # Without sweeping there is nothing to cut at: one query per output, to the leaves.
        return PairProver(self.query_seconds, limits=(None,), full_cone_limit=10 ** 9)

    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        stats: dict = {}
        hunt = DifferenceHunt(problem, self.seed)
        hunted = hunt.run(self.hunt_vectors, budget)
        stats["hunt_vectors"] = hunted.vectors
        if hunted.counterexample is not None:
            if hunted.shrunk_from:
                stats["shrunk_from"] = {k: str(v) for k, v in hunted.shrunk_from.items()}
            return Verdict(DISPROVED, self.name, time.monotonic() - started,
                           counterexample=hunted.counterexample,
                           covered=f"{hunted.vectors:,} vectors agreed before the differing one",
                           stats=stats)
        prover = self._prover()
        pairs: list[tuple[Node, Node]]
        sweeper = None
        if self.sweep and not budget.expired():
            sweeper = Sweeper(problem, prover, hunt, corner_vectors(hunt.inputs, hunt.rng))
            sweeper.run(budget)
            stats["sweep"] = sweeper.stats.as_dict()
            if sweeper.found is not None:
                self._prover_stats(stats, prover)
                return Verdict(DISPROVED, self.name, time.monotonic() - started,
                               counterexample=sweeper.found,
                               covered="an internal pair's counterexample also makes the "
                                       "outputs differ", stats=stats)
            pairs = sweeper.reduced_outputs()
        else:
            pairs = [(o.node_a, o.node_b) for o in problem.outputs]
        proved, open_outputs, reasons = [], [], []
        for output, (node_a, node_b) in zip(problem.outputs, pairs):
            outcome = prover.prove_equal(node_a, node_b, budget, label=f"output {output.label}")
            if outcome.status == PAIR_PROVED:
                proved.append(output.label)
                continue
            if outcome.status == REFUTED:
                found = problem.replay(outcome.values)
                if found is None:
                    raise AssertionError(f"z3 found output {output.label} different but the "
                                         f"replay on the models agrees; model and z3 disagree")
                self._prover_stats(stats, prover)
                return Verdict(DISPROVED, self.name, time.monotonic() - started,
                               counterexample=found,
                               covered=f"found by the output miter of {output.label}",
                               stats=stats)
            open_outputs.append(output.label)
            reasons.append(f"{output.label}: {outcome.reason}")
        self._prover_stats(stats, prover)
        stats["outputs_proved"] = proved
        summary = self._summary(sweeper, proved, hunted.vectors)
        if not open_outputs:
            return Verdict(PROVED, self.name, time.monotonic() - started, covered=summary,
                           stats=stats)
        return Verdict(UNKNOWN, self.name, time.monotonic() - started,
                       covered=f"{summary}; not proved: {', '.join(open_outputs)}",
                       reason="; ".join(reasons), stats=stats)

    @staticmethod
    def _summary(sweeper, proved: list[str], vectors: int) -> str:
        parts = [f"{vectors:,} simulated vectors agreed"]
        if sweeper is not None:
            s = sweeper.stats
            parts.append(f"{s.proved:,} of {s.proposed:,} proposed internal pairs proved equal "
                         f"({s.constants:,} of them constants), {s.structural:,} merged "
                         f"structurally")
        if proved:
            parts.append(f"outputs proved: {', '.join(proved)}")
        return "; ".join(parts)

    @staticmethod
    def _prover_stats(stats: dict, prover: PairProver) -> None:
        p = prover.stats
        stats["z3_queries"] = p.queries
        stats["z3_seconds"] = round(p.seconds, 3)
        stats["slowest_query"] = {"seconds": round(p.slowest, 3), "pair": p.slowest_pair}
        stats["spurious_under_cuts"] = p.spurious
        stats["proved_by_shape"] = p.shape_hits
        stats["spurious_by_shape"] = p.spurious_shape_hits
        stats["timeouts"] = p.timeouts
        stats["largest_cone"] = p.largest_cone
        stats["queries_by_cone_limit"] = dict(p.limits)


class HuntEngine:
    """The ``random`` engine: the difference hunt alone; it can only disprove."""

    name = "random"

    def __init__(self, vectors: int = 1 << 16, seed: int = 1):
        self.vectors = vectors
        self.seed = seed

    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        hunted = DifferenceHunt(problem, self.seed).run(self.vectors, budget)
        stats = {"hunt_vectors": hunted.vectors}
        if hunted.counterexample is not None:
            return Verdict(DISPROVED, self.name, time.monotonic() - started,
                           counterexample=hunted.counterexample,
                           covered=f"{hunted.vectors:,} vectors agreed before the differing one",
                           stats=stats)
        return Verdict(UNKNOWN, self.name, time.monotonic() - started,
                       covered=f"{hunted.vectors:,} simulated vectors agreed (corners first)",
                       reason="random simulation can only disprove", stats=stats)


ENGINES = ("auto", "sweep", "miter", "random")


def make_equivalence_engine(name: str, vectors: int = 1 << 13, seed: int = 1,
                            query_seconds: float = 5.0):
    """The engine called ``name``: auto and sweep sweep, miter skips sweeping (the outputs'
    miter straight after the hunt), random only hunts."""
    from ..errors import BcdproveError

    if name in ("auto", "sweep"):
        return SweepingEngine(vectors, seed, query_seconds)
    if name == "miter":
        engine = SweepingEngine(vectors, seed, query_seconds=10.0 ** 6, sweep=False)
        engine.name = "miter"
        return engine
    if name == "random":
        return HuntEngine(vectors, seed)
    raise BcdproveError(f"--engine {name}: choose one of {', '.join(ENGINES)}")

"""Proving two nodes of one graph equal with small z3 queries over a bounded cone (cut points).

To prove ``a == b`` the prover takes the cone of both nodes only down to a limited number of
nodes, expanding the newest (highest id, hence topologically latest) node first, so the two
cones grow towards the logic they share.  Nodes where the expansion stops become cut points:
free bit-vector constants.  Because a cut point may take any value, an unsatisfiable query
proves the equality for the values the cut nodes really take too.  A satisfiable query with
cut points may be spurious, so the limit grows (and, when the limit is off, the cone reaches
the leaves); only a satisfiable query without cut points is a real difference, returned as
leaf values.

Answers are remembered by the query's shape (its formula up to the names of its variables,
``cone_shape``): an unsatisfiable shape proves every later query of that shape, and a shape
satisfiable with cut points sends a later query of that shape with cut points on to the next
limit without asking.  A query without cut points is always asked: its model is the input.
"""
from __future__ import annotations

import heapq
from collections import deque
import time
from dataclasses import dataclass, field

from ..model.node import Node, Op
from ..model.smt import Z3Encoder, check_within
from .base import Budget

PROVED = "proved"
REFUTED = "refuted"
UNDECIDED = "undecided"

# Cones tried in turn (see bounded_cone); None: down to the leaves (if the cone is at most
# FULL_CONE_LIMIT nodes).
CONE_LIMITS = (("meet", 16), ("meet", 120), 600, None)
FULL_CONE_LIMIT = 20_000
# Queries over more nodes than this skip the shape cache: their shapes are costly to build
# (about 2 s of a 64-bit run) and never repeat there (a cone down to the inputs is unique).
SHAPE_LIMIT = 1000


@dataclass
class Outcome:
    status: str                                   # PROVED | REFUTED | UNDECIDED
    values: dict[int, int] | None = None          # leaf id -> value, for REFUTED
    reason: str = ""


@dataclass
class ProverStats:
    queries: int = 0
    seconds: float = 0.0
    slowest: float = 0.0
    spurious: int = 0                             # satisfiable only thanks to a cut point
    shape_hits: int = 0                           # proved by a query of the same shape
    spurious_shape_hits: int = 0                  # known satisfiable from a query's shape
    timeouts: int = 0
    largest_cone: int = 0
    slowest_pair: str = ""
    limits: dict = field(default_factory=dict)    # cone limit -> queries answered there

    def record(self, seconds: float, cone: int, label: str) -> None:
        self.queries += 1
        self.seconds += seconds
        self.largest_cone = max(self.largest_cone, cone)
        if seconds > self.slowest:
            self.slowest = seconds
            self.slowest_pair = label


def _breadth_first(root: Node, limit: int) -> list[Node]:
    """Up to ``limit`` operator nodes of the cone of ``root``, nearest first."""
    found: list[Node] = []
    seen = {root.id}
    queue = deque([root])
    while queue and len(found) < limit:
        node = queue.popleft()
        if node.op in Op.LEAVES:
            continue
        found.append(node)
        for arg in node.args:
            if arg.id not in seen:
                seen.add(arg.id)
                queue.append(arg)
    return found


def bounded_cone(roots: list[Node], limit: int | None) -> tuple[list[Node], list[Node]]:
    """(expanded operator nodes, cut nodes) of the cone of ``roots``.

    ``limit`` None: the whole cone down to the leaves, no cut.  ``("meet", k)``: each root's
    nearest ``k`` nodes, where a node that both roots reach is a cut (the two sides meet
    there; the usual place a proof needs nothing below).  An int ``k``: the ``k`` newest
    (highest id) nodes of the joint cone.  Leaves and constants are never cut points.
    """
    allowed: set[int] | None = None
    shared: set[int] = set()
    if isinstance(limit, tuple):
        per_side = [{n.id for n in _breadth_first(r, limit[1])} for r in roots]
        allowed = set().union(*per_side)
        shared = set.intersection(*per_side) - {r.id for r in roots}
        limit = None
    expanded: list[Node] = []
    cuts: list[Node] = []
    seen = {r.id for r in roots}
    heap = [(-r.id, r) for r in roots]
    heapq.heapify(heap)
    while heap:
        _, node = heapq.heappop(heap)
        if node.op in Op.LEAVES:
            continue
        if ((limit is not None and len(expanded) >= limit) or node.id in shared
                or (allowed is not None and node.id not in allowed)):
            cuts.append(node)
            continue
        expanded.append(node)
        for arg in node.args:
            if arg.id not in seen:
                seen.add(arg.id)
                heapq.heappush(heap, (-arg.id, arg))
    return expanded, cuts


class PairProver:
    """Asks z3 whether two nodes can differ, with the escalation described in the module doc."""

    def __init__(self, query_seconds: float = 5.0, limits=CONE_LIMITS,
                 full_cone_limit: int = FULL_CONE_LIMIT):
        import z3

        self.ctx = z3.Context()
        self.query_seconds = query_seconds
        self.limits = limits
        self.full_cone_limit = full_cone_limit
        self.stats = ProverStats()
        self._proved_shapes: set[tuple] = set()
        self._spurious_shapes: set[tuple] = set()     # satisfiable, with cut points
        # Queries without a cut point share one encoder: a node's term does not depend on the
        # query then, and translating the full cones again for every query took about a fifth
        # of a 64-bit run.  (One shared solver, each query under its own assumption literal,
        # was measured too: z3's incremental mode made the same queries about 8x slower.)
        self._uncut_encoder = Z3Encoder(self.ctx)

    def prove_equal(self, a: Node, b: Node, budget: Budget, label: str = "",
                    limits=None) -> Outcome:
        """Whether ``a`` and ``b`` (same width) are equal for every value of their leaves.

        ``limits``: the cone limits to try, in order, instead of the prover's own.
        """
        import z3

        if a is b:
            return Outcome(PROVED)
        last_cone = -1
        for limit in (self.limits if limits is None else limits):
            expanded, cuts = bounded_cone([a, b], limit)
            if limit is None and len(expanded) > self.full_cone_limit:
                return Outcome(UNDECIDED, reason=f"the full cone has {len(expanded):,} nodes, "
                                                 f"over the limit of {self.full_cone_limit:,}")
            if len(expanded) == last_cone:
                continue                      # the smaller limit already held the whole cone
            last_cone = len(expanded)
            left = budget.remaining()
            seconds = self.query_seconds if left is None else min(self.query_seconds, left)
            if seconds <= 0:
                return Outcome(UNDECIDED, reason="the time limit was reached")
            shape = cone_shape([a, b], expanded) if len(expanded) <= SHAPE_LIMIT else None
            if shape is not None and shape in self._proved_shapes:
                self.stats.shape_hits += 1
                return Outcome(PROVED)
            if cuts and shape is not None and shape in self._spurious_shapes:
                # The same formula up to names was satisfiable: so is this one, and with cut
                # points that only sends the pair on to the next limit.
                self.stats.spurious += 1
                self.stats.spurious_shape_hits += 1
                continue
            encoder = self._uncut_encoder
            if cuts:
                encoder = Z3Encoder(self.ctx)
                for cut in cuts:
                    encoder.cut(cut)
            solver = z3.Solver(ctx=self.ctx)
            started = time.monotonic()
            answer = check_within(solver, seconds, [encoder.term(a) != encoder.term(b)])
            took = time.monotonic() - started
            self.stats.record(took, len(expanded), label)
            key = "full" if limit is None else (f"meet {limit[1]}" if isinstance(limit, tuple)
                                                else str(limit))
            self.stats.limits[key] = self.stats.limits.get(key, 0) + 1
            if answer == z3.unsat:
                if shape is not None:
                    self._proved_shapes.add(shape)
                return Outcome(PROVED)
            if answer != z3.sat:
                self.stats.timeouts += 1
                return Outcome(UNDECIDED, reason=f"z3 gave no answer within {seconds:.1f} s")
            if not cuts:
                model = solver.model()
                leaves = expanded_leaves(expanded, [a, b])
                return Outcome(REFUTED, encoder.leaf_values(model, leaves))
            self.stats.spurious += 1
            if shape is not None:
                self._spurious_shapes.add(shape)
        return Outcome(UNDECIDED, reason="different only where the cone was cut")


def cone_shape(roots: list[Node], expanded: list[Node]) -> tuple:
    """The query's formula up to the names of its variables (cut points and leaves).

    Two queries with one shape ask the same question of renamed variables, so they have the
    same answer: the cells of a digit array, one per stage and digit, are proved once.
    """
    inside = {n.id for n in expanded}
    index: dict[int, int] = {}
    items: list[tuple] = []
    for root in roots:
        stack = [(root, False)]
        while stack:
            node, ready = stack.pop()
            if node.id in index:
                continue
            if node.id in inside and not ready:
                stack.append((node, True))
                stack.extend((arg, False) for arg in reversed(node.args) if arg.id not in index)
                continue
            if node.id in inside:
                items.append((node.op, node.width, node.params,
                              tuple(index[arg.id] for arg in node.args)))
            elif node.op == Op.CONST:
                items.append((Op.CONST, node.width, node.params))
            else:                                  # a cut point or a leaf: a variable
                items.append(("variable", node.width))
            index[node.id] = len(items) - 1
    return tuple(items), tuple(index[r.id] for r in roots)


def expanded_leaves(expanded: list[Node], roots: list[Node]) -> list[Node]:
    """The INPUT, STATE and FREE leaves that the expanded nodes read (or that are roots)."""
    found: dict[int, Node] = {r.id: r for r in roots if r.op in (Op.INPUT, Op.STATE, Op.FREE)}
    for node in expanded:
        for arg in node.args:
            if arg.op in (Op.INPUT, Op.STATE, Op.FREE):
                found[arg.id] = arg
    return list(found.values())

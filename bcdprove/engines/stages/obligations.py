"""Solver obligations over cone-graph nodes: shape hashing and z3 checks.

An obligation is one 1-bit cone-graph node ``bad`` (the assumptions hold and a checked value
differs from its reference); it is discharged when z3 finds ``bad == 1`` unsatisfiable.  Two
obligations whose cones are equal up to a renaming of their leaves (same operators, widths,
constants, sharing) are the same question, so each *shape* goes to the solver once.
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Optional

import z3

from ...model.node import Node, Op, topological
from ...model.smt import Z3Encoder, check_within

PROVED = "unsat"
FAILED = "sat"
UNDECIDED = "unknown"


@dataclass
class Outcome:
    status: str                                   # PROVED | FAILED | UNDECIDED
    seconds: float = 0.0
    values: dict[str, int] = field(default_factory=dict)   # leaf name -> value, when FAILED
    reason: str = ""


def shape_key(root: Node, interned: dict) -> tuple:
    """A key equal for two roots exactly when their cones match up to renaming leaves.

    Leaves are numbered in the order a deterministic traversal first meets them; ``interned``
    (shared by all calls of one run) turns each node's structure into a small integer.
    """
    numbers: dict[int, int] = {}
    leaf_count = 0
    for node in topological([root]):
        if node.op == Op.CONST:
            shape = ("const", node.width, node.value)
        elif node.op in Op.LEAVES:
            shape = ("leaf", node.width, leaf_count)
            leaf_count += 1
        else:
            shape = (node.op, node.width, node.params, tuple(numbers[a.id] for a in node.args))
        numbers[node.id] = interned.setdefault(shape, len(interned))
    return (numbers[root.id], leaf_count)


class ObligationSolver:
    """Discharges obligations, each distinct shape once; counts what it did."""

    def __init__(self) -> None:
        self.ctx = z3.Context()
        self._encoder = Z3Encoder(self.ctx)
        self._solver = z3.Solver(ctx=self.ctx)
        self._by_node: dict[int, Outcome] = {}
        self._by_shape: dict[tuple, Outcome] = {}
        self._interned: dict = {}
        self.posed = 0            # obligations that were not trivially constant
        self.solved = 0           # distinct shapes sent to z3
        self.slowest = 0.0
        self.slowest_description = ""

    def check(self, bad: Node, description: str, timeout: Optional[float] = None) -> Outcome:
        """Is ``bad`` (1 bit) unsatisfiable?  A FAILED outcome carries the solver's leaf values."""
        if bad.op == Op.CONST:
            if bad.value == 0:
                return Outcome(PROVED)
            return Outcome(FAILED, values={})
        self.posed += 1
        found = self._by_node.get(bad.id)
        if found is not None and found.status == PROVED:
            return found
        key = shape_key(bad, self._interned)
        found = self._by_shape.get(key)
        if found is not None and found.status == PROVED:
            self._by_node[bad.id] = found
            return found
        outcome = self._solve(bad, timeout)
        self.solved += 1
        if outcome.seconds > self.slowest:
            self.slowest = outcome.seconds
            self.slowest_description = description
        if outcome.status == PROVED:
            self._by_node[bad.id] = outcome
            self._by_shape[key] = outcome
        return outcome

    def _solve(self, bad: Node, timeout: Optional[float]) -> Outcome:
        solver = self._solver
        started = time.monotonic()
        solver.push()
        try:
            solver.add(self._encoder.term(bad) == z3.BitVecVal(1, 1, self.ctx))
            answer = check_within(solver, timeout)
            seconds = time.monotonic() - started
            if answer == z3.unsat:
                return Outcome(PROVED, seconds)
            if answer == z3.sat:
                model = solver.model()
                values = {}
                for decl in model.decls():
                    value = model[decl]
                    if z3.is_bv_value(value):
                        values[decl.name()] = value.as_long()
                return Outcome(FAILED, seconds, values)
            return Outcome(UNDECIDED, seconds, reason=str(solver.reason_unknown()))
        finally:
            solver.pop()

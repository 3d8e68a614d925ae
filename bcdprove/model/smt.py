"""Translation of model nodes to z3 bit-vector terms, operator for operator as ``apply_op``.

Leaves become z3 constants named ``in:NAME`` (INPUT), ``state:NAME`` (STATE) and
``free:SERIAL`` (FREE).  Width-1 results of EQ, ULT and SLT are 1-bit bit-vectors, and an
ITE condition is read as "equals 1".  Shift amounts of any width are translated exactly:
value and amount are brought to a common width first, so an amount of ``width`` or more
gives 0 (sign copies for ASHR) as in the model.  Division and remainder use the SMT-LIB
operators, whose zero-divisor results are the model's.
"""
from __future__ import annotations

import time

from typing import Sequence

import z3

from .node import Node, Op

__all__ = ["Z3Encoder"]


class Z3Encoder:
    """Memoised translator of the nodes of one graph (keyed by node id) into one z3 context."""

    def __init__(self, ctx: z3.Context | None = None):
        self.ctx = ctx if ctx is not None else z3.main_ctx()
        self._terms: dict[int, z3.BitVecRef] = {}
        self._one = z3.BitVecVal(1, 1, self.ctx)
        self._zero = z3.BitVecVal(0, 1, self.ctx)

    def term(self, node: Node) -> z3.BitVecRef:
        """The z3 term of ``node``; each node is translated once, without recursion."""
        terms = self._terms
        done = terms.get(node.id)
        if done is not None:
            return done
        stack = [(node, False)]
        while stack:
            current, expanded = stack.pop()
            if current.id in terms:
                continue
            if not expanded:
                stack.append((current, True))
                stack.extend((a, False) for a in current.args if a.id not in terms)
                continue
            terms[current.id] = self._translate(current, [terms[a.id] for a in current.args])
        return terms[node.id]

    def leaf(self, node: Node) -> z3.BitVecRef:
        """The z3 constant of an INPUT, STATE or FREE leaf."""
        if node.op == Op.INPUT:
            name = f"in:{node.params[0]}"
        elif node.op == Op.STATE:
            name = f"state:{node.params[0]}"
        elif node.op == Op.FREE:
            name = f"free:{node.params[0]}"
        else:
            raise ValueError(f"{node!r} is not a leaf")
        return z3.BitVec(name, node.width, self.ctx)

    def cut(self, node: Node) -> z3.BitVecRef:
        """Translate ``node`` from now on as a free constant ``cut:ID`` (a cut point): its
        arguments are not translated, so a query over it holds for every value it might take."""
        term = z3.BitVec(f"cut:{node.id}", node.width, self.ctx)
        self._terms[node.id] = term
        return term

    def leaf_values(self, model: z3.ModelRef, leaves: Sequence[Node]) -> dict[int, int]:
        """Node id -> value of each leaf in ``model``; a leaf the model leaves open is 0."""
        out = {}
        for node in leaves:
            constant = self.term(node)
            assigned = model[constant.decl()]
            out[node.id] = assigned.as_long() if assigned is not None else 0
        return out

    def _translate(self, node: Node, args: list) -> z3.BitVecRef:
        op = node.op
        if op == Op.CONST:
            return z3.BitVecVal(node.value, node.width, self.ctx)
        if op in (Op.INPUT, Op.STATE, Op.FREE):
            return self.leaf(node)
        if op == Op.NOT:
            return ~args[0]
        if op == Op.AND:
            return args[0] & args[1]
        if op == Op.OR:
            return args[0] | args[1]
        if op == Op.XOR:
            return args[0] ^ args[1]
        if op == Op.NEG:
            return -args[0]
        if op == Op.ADD:
            return args[0] + args[1]
        if op == Op.SUB:
            return args[0] - args[1]
        if op == Op.MUL:
            return args[0] * args[1]
        if op == Op.UDIV:
            return z3.UDiv(args[0], args[1])
        if op == Op.UREM:
            return z3.URem(args[0], args[1])
        if op == Op.SDIV:
            return args[0] / args[1]     # z3's / on bit-vectors is bvsdiv
        if op == Op.SREM:
            return z3.SRem(args[0], args[1])
        if op in Op.SHIFTS:
            return self._shift(op, node.width, args[0], args[1])
        if op == Op.EQ:
            return z3.If(args[0] == args[1], self._one, self._zero)
        if op == Op.ULT:
            return z3.If(z3.ULT(args[0], args[1]), self._one, self._zero)
        if op == Op.SLT:
            return z3.If(args[0] < args[1], self._one, self._zero)
        if op == Op.CONCAT:
            return z3.Concat(*args) if len(args) > 1 else args[0]
        if op == Op.EXTRACT:
            hi, lo = node.params
            return z3.Extract(hi, lo, args[0])
        if op == Op.ZEXT:
            return z3.ZeroExt(node.width - node.args[0].width, args[0])
        if op == Op.SEXT:
            return z3.SignExt(node.width - node.args[0].width, args[0])
        if op == Op.ITE:
            return z3.If(args[0] == self._one, args[1], args[2])
        raise ValueError(f"operator {op!r} has no z3 translation")

    @staticmethod
    def _shift(op: str, width: int, value, amount):
        amount_width = amount.size()
        if amount_width <= width:
            if amount_width < width:
                amount = z3.ZeroExt(width - amount_width, amount)
            return _SHIFT[op](value, amount)
        # A wide amount: shift a value widened to the amount's width, keep the low bits.
        grow = amount_width - width
        wide = z3.SignExt(grow, value) if op == Op.ASHR else z3.ZeroExt(grow, value)
        return z3.Extract(width - 1, 0, _SHIFT[op](wide, amount))


_SHIFT = {
    Op.SHL: lambda v, s: v << s,
    Op.LSHR: z3.LShR,
    Op.ASHR: lambda v, s: v >> s,   # z3's >> on bit-vectors is the arithmetic shift
}


def check_within(solver, seconds: float | None, assertions: Sequence = ()):
    """Add ``assertions`` to ``solver`` and check, coming back within about ``seconds``.

    z3's ``timeout`` parameter is not looked at in every phase: seen here, adding a 24-bit
    division miter ran for minutes in its assertion simplifier, where no timeout applies.  So
    a timer interrupts the solver's context at the deadline, during the adding and during
    the check; an interrupted or timed-out check answers ``unknown``.  ``seconds=None``: no
    limit.
    """
    import threading

    import z3

    if seconds is None:
        for assertion in assertions:
            solver.add(assertion)
        return solver.check()
    deadline = time.monotonic() + seconds

    def guarded(step):
        left = deadline - time.monotonic()
        if left <= 0:
            return None
        timer = threading.Timer(left + 0.5, solver.ctx.interrupt)
        timer.daemon = True
        timer.start()
        try:
            return step(left)
        except z3.Z3Exception:
            return None
        finally:
            timer.cancel()

    def add_all(_left):
        for assertion in assertions:
            solver.add(assertion)
        return True

    def check(left):
        solver.set("timeout", max(1, int(left * 1000)))
        return solver.check()

    if assertions and guarded(add_all) is None:
        return z3.unknown
    if deadline - time.monotonic() <= 0:
        return z3.unknown
    answer = guarded(check)
    return z3.unknown if answer is None else answer

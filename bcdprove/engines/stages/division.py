"""The division-by-ten family: digits by repeated ``q_{i+1} = q_i div 10``, ``d_i = q_i mod 10``.

Canonical intermediates are ``q_i = x div 10**i``.  Mining proposes, for each ``i``, a design
node of the input's width equal to ``q_i`` on every lane; each step is then stated
multiplicatively over a fresh ``q`` in place of the design's ``q_i`` (solvers handle
multiplication by a constant far better than division):

    step i < L-1:  10 * q_{i+1} + d_i == q   and   d_i <= 9      (in W + 4 bits, no wrap)
    last i = L-1:  q <= 9  implies  d_i == q

where ``d_i`` is the design's output digit ``i`` and ``L >= digits(2**W - 1)`` the number of
digits shown.  Why this proves the specification: the steps give, by induction over the
integers, ``x = sum(d_i 10**i, i < k) + 10**k q_k``; at ``k = L-1`` this bounds
``q_{L-1} <= x div 10**(L-1) <= 9`` (as ``x < 2**W <= 10**L``), which is the assumption of the
last step; so ``x = sum(d_i 10**i)`` with every ``d_i <= 9``: the digits of ``x``.
"""
from __future__ import annotations

from typing import Optional

from ...model.node import Graph, Node, Op, mask, topological
from ...model.simulate import Simulator, pack
from . import obligations as outcomes
from .cuts import ConeBuilder, Cut, NotACut
from .obligations import ObligationSolver


def prove_by_division(problem, solver: ObligationSolver, budget, timeout: float
                      ) -> tuple[Optional[str], str, object]:
    """``(PROVED | DISPROVED | None, words, counterexample)`` for the division family."""
    width = problem.width
    shown = len(problem.digits)
    needed = len(str(mask(width)))
    if shown < needed:
        return None, f"{shown} digits cannot show every {width}-bit input", None
    chain = _mine(problem, shown)
    if chain is None:
        return None, "no signal holds x div 10**i for every i", None
    cone = Graph()
    wide = width + 4
    for i in range(shown):
        if budget.expired():
            return None, f"time limit reached at division step {i}", None
        builder = ConeBuilder(cone, problem.x, width, Cut.empty())
        q = cone.input("q", width)
        builder.replace(chain[i], q)        # q_0 is the input leaf itself
        try:
            digit = builder.slice(problem.digits[i], 3, 0)
            if i < shown - 1:
                following = builder.whole(chain[i + 1])
                total = cone.add(cone.mul(cone.zext(following, wide), cone.const(10, wide)),
                                 cone.zext(digit, wide))
                good = cone.and_(cone.eq(total, cone.zext(q, wide)),
                                 cone.ule(digit, cone.const(9, 4)))
                bad = cone.not_(good)
            else:
                small = cone.ule(q, cone.const(9, width)) if width >= 4 else cone.const(1, 1)
                bad = cone.and_(small, cone.ne(cone.zext(digit, max(width, 4)),
                                               cone.zext(q, max(width, 4))))
        except NotACut as error:
            return None, f"division step {i} is not a cut ({error})", None
        outcome = solver.check(bad, f"division step {i}", timeout)
        if outcome.status == outcomes.PROVED:
            continue
        found = _lift(problem, outcome.values, i)
        if found is not None:
            return "disproved", f"division step {i}", found
        if outcome.status == outcomes.UNDECIDED:
            return None, f"division step {i}: the solver gave up ({outcome.reason})", None
        return None, f"division step {i} fails on a value of q that replays right", None
    return "proved", f"all {shown} division steps", None


def _mine(problem, shown: int) -> Optional[list[Node]]:
    """Design nodes holding ``x div 10**i`` for i = 0 .. shown-1 (q_0 is the input itself)."""
    width = problem.width
    names = {s.node.id: n for n, s in problem.model.signals.items()}
    nodes = [n for n in topological(problem.digits)
             if n.width == width and n.op not in Op.LEAVES]
    if not nodes:
        return None if shown > 1 else [problem.x]
    from .mining import stimuli
    values = stimuli(width, 11, random_count=48, boundary_count=32)
    simulator = Simulator(nodes)
    given = {leaf.id: (pack(values, width) if leaf is problem.x else [0] * leaf.width)
             for leaf in simulator.leaves}
    results = simulator.run(len(values), given)
    by_planes: dict[tuple, list[Node]] = {}
    for node, result in zip(nodes, results):
        by_planes.setdefault(tuple(result.value), []).append(node)
    chain = [problem.x]
    for i in range(1, shown):
        key = tuple(pack([v // 10 ** i for v in values], width))
        options = [n for n in by_planes.get(key, []) if n.id > chain[-1].id or chain[-1] is problem.x]
        if not options:
            return None
        # the named one made first after the previous step
        options.sort(key=lambda n: (n.id not in names, n.id))
        chain.append(options[0])
    return chain


def _lift(problem, values: dict[str, int], step: int):
    """Inputs reaching a failed step: ``x = q * 10**step + r``; replayed, never trusted."""
    q = values.get("in:q")
    if q is None:
        return None
    for rest in (0, 10 ** step - 1):
        x = q * 10 ** step + rest
        if x > mask(problem.width) or (problem.max_input is not None and x > problem.max_input):
            continue
        found = problem.replay(x)
        if found is not None and found.replayed:
            return found
    return None

"""Wide signed converters: reduce to a binary-to-BCD check of the magnitude, then stages.

A signed readout usually takes the magnitude ``|x|`` first and feeds it to an ordinary
binary-to-BCD converter.  When it does, the check splits soundly into

1. a node ``M`` of the design (mined by simulation: equal to ``|x|`` on every lane) that
   cuts the digits off the input: with ``M`` replaced by a fresh value ``m`` the digit
   outputs no longer read ``x``;
2. z3: ``M(x) == |x|`` for every input of the contract (a small word-level query);
3. z3: the sign output equals the top bit of ``x``;
4. the binary-to-BCD stage engine on the digits as a function of ``m``, for every
   ``m <= 2**(W-1)`` (or the contract's largest magnitude).

Together: digits(x) = G(M(x)) = G(|x|) = the decimal digits of ``|x|``.  A counterexample of
step 4 at ``m`` is lifted to ``x = m`` (or ``-m`` when ``m`` is only reachable negative) and
replayed on the signed problem; one of step 2 or 3 is replayed as it is.  A design that
does not take the magnitude first (no such cut), or anything undecided, is ``unknown`` with
the reason: the caller (auto) then falls back to the smt miter.
"""
from __future__ import annotations

import random
import time

from ..model.design import Model, Port, Signal
from ..model.node import Node, Op, leaves, mask, substitute, topological
from .base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict

MINING_LANES = 256
_QUERY_SECONDS = 60.0


class SignedStageEngine:
    """``--engine stages`` for ``--spec signed`` (see the module docstring)."""

    name = "stages"

    def __init__(self, bin2bcd_engine, seed: int = 11) -> None:
        self.inner = bin2bcd_engine
        self.seed = seed

    def _candidates(self, problem) -> list[Node]:
        """Design nodes equal to ``|x|`` on every simulated lane; failing those, nodes equal
        to ``x`` on the non-negative lanes (a magnitude gone wrong for negative inputs, which
        the side query then shows).  The ``W``-bit ones first (a wider node holding the same
        value is usually the converter's working register), then the narrowest, newest."""
        from ..model.simulate import Simulator, pack, unpack

        rng = random.Random(self.seed)
        stimuli = problem.corner_inputs() + problem.random_inputs(MINING_LANES, rng)
        named = [s.node for s in problem.model.signals.values()
                 if s.node.op not in Op.LEAVES and s.node.op != Op.CONST]
        if problem.substitution:
            named = substitute(problem.model.graph, named, problem.substitution)
        unique = list({n.id: n for n in named if n.op not in Op.LEAVES}.values())
        if not unique:
            return []
        simulator = Simulator(unique)
        lanes = len(stimuli)
        values = {problem.x.id: pack(stimuli, problem.width)}
        unknown = {}
        for leaf in simulator.leaves:
            if leaf is not problem.x and leaf.op != Op.FREE:
                values[leaf.id] = [0] * leaf.width
                unknown[leaf.id] = [mask(lanes)] * leaf.width
        wanted = [problem.magnitude(x) for x in stimuli]
        positive = [lane for lane, x in enumerate(stimuli) if not x >> (problem.width - 1)]
        exact, partial = [], []
        for node, plane in zip(unique, simulator.run(lanes, values, unknown)):
            if any(plane.unknown):
                continue
            shown = unpack(plane.value, lanes)
            if shown == wanted:
                exact.append(node)
            elif node.width >= problem.width - 1 and all(shown[k] == wanted[k] for k in positive):
                partial.append(node)
        order = lambda n: (n.width != problem.width, n.width, -n.id)   # noqa: E731
        return sorted(exact, key=order) + sorted(partial, key=order)

    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        stats: dict = {"reduction": "magnitude cut"}
        if problem.spec != "signed":
            return Verdict(UNKNOWN, self.name, 0.0, covered="nothing proved",
                           reason=f"the signed reduction is for --spec signed, not {problem.spec}")
        for node in self._candidates(problem)[:4]:
            cut = self._cut(problem, node)
            if cut is None:
                continue
            magnitude_leaf, digits = cut
            stats["magnitude_node_width"] = node.width
            for what, status, found, why in self._side_queries(problem, node, budget):
                if status == DISPROVED:
                    return Verdict(DISPROVED, self.name, time.monotonic() - started,
                                   counterexample=found, stats=stats,
                                   covered=f"the reduction's {what} fails")
                if status == UNKNOWN:
                    return Verdict(UNKNOWN, self.name, time.monotonic() - started, stats=stats,
                                   covered="the magnitude cut was found", reason=why)
            inner_problem = self._magnitude_problem(problem, node, magnitude_leaf, digits)
            verdict = self.inner.run(inner_problem, budget)
            stats["magnitude_stages"] = dict(verdict.stats)
            if verdict.status == PROVED:
                return Verdict(PROVED, self.name, time.monotonic() - started, stats=stats,
                               covered=f"{problem.contract_words()}: the sign and the magnitude "
                                       f"node proved equal to the sign and |x| (z3, unsat); the "
                                       f"digits of the magnitude by stages: {verdict.covered}")
            if verdict.status == DISPROVED:
                m = inner_problem.input_value(verdict.counterexample)
                x = m if m <= problem.largest_positive else problem.raw(-m)
                found = problem.replay(x)
                if found is not None:
                    return Verdict(DISPROVED, self.name, time.monotonic() - started,
                                   counterexample=found, stats=stats,
                                   covered=f"the digits of the magnitude fail at {m:,}")
                return Verdict(UNKNOWN, self.name, time.monotonic() - started, stats=stats,
                               covered="sign and magnitude node proved",
                               reason=f"the magnitude stages fail at {m:,}, but the input "
                                      f"{problem.describe_input(x)} replays right")
            return Verdict(UNKNOWN, self.name, time.monotonic() - started, stats=stats,
                           covered="sign and magnitude node proved; digits of the magnitude "
                                   "not decided", reason=f"magnitude stages: {verdict.reason}")
        return Verdict(UNKNOWN, self.name, time.monotonic() - started, stats=stats,
                       covered="nothing proved",
                       reason="no design signal holds |x| and cuts the digits off the input "
                              "(the design does not take the magnitude first); the smt "
                              "miter is the fallback")

    def _cut(self, problem, node: Node):
        graph = problem.model.graph
        leaf = graph.input("bcdprove$magnitude", node.width)
        digits = substitute(graph, problem.checked[1:], {node.id: leaf})
        if any(l is problem.x for l in leaves(digits)):
            return None
        return leaf, digits

    def _side_queries(self, problem, node: Node, budget: Budget):
        """(what, status, counterexample, reason) for the magnitude node and the sign."""
        import z3

        from ..model.smt import Z3Encoder, check_within

        encoder = Z3Encoder(z3.Context())
        ctx = encoder.ctx
        width = problem.width
        x = encoder.term(problem.x)
        negative = z3.Extract(width - 1, width - 1, x) == 1
        wide = max(width, node.width) + 1
        absolute = z3.ZeroExt(wide - width, z3.If(negative, -x, x))
        contract = []
        if problem.max_magnitude is not None:
            contract.append(z3.ULE(absolute, z3.BitVecVal(problem.max_magnitude, wide, ctx)))
        sign = problem.checked[0]
        one = z3.BitVecVal(1, sign.width, ctx)
        zero = z3.BitVecVal(0, sign.width, ctx)
        queries = [("magnitude node", z3.ZeroExt(wide - node.width, encoder.term(node)) != absolute),
                   ("sign output", encoder.term(sign) != z3.If(negative, one, zero))]
        for what, wrong in queries:
            solver = z3.Solver(ctx=ctx)
            left = budget.remaining()
            seconds = _QUERY_SECONDS if left is None else min(left, _QUERY_SECONDS)
            answer = check_within(solver, seconds, contract + [wrong])
            if answer == z3.unsat:
                continue
            if answer != z3.sat:
                yield what, UNKNOWN, None, f"the solver did not settle the {what}"
                return
            value = encoder.leaf_values(solver.model(), [problem.x])[problem.x.id]
            found = problem.replay(value)
            if found is None:
                # The magnitude node is wrong where the digits do not show it: not a cut to
                # build on, but not a counterexample either.
                yield what, UNKNOWN, None, (f"the {what} differs from the reference at input "
                                            f"{problem.describe_input(value)}, which replays "
                                            f"right; the smt miter is the fallback")
                return
            from .replay import LaneChecker, shrink
            yield what, DISPROVED, shrink(LaneChecker(problem), found, budget), ""
            return

    def _magnitude_problem(self, problem, magnitude_node: Node, leaf: Node, digits: list[Node]):
        """The binary-to-BCD problem of the digits as a function of the magnitude."""
        from ..spec.bin2bcd import Bin2BcdProblem

        graph = problem.model.graph
        mapping = dict(problem.substitution)
        # Signals of the digit logic, rebuilt over the magnitude, for the stage mining.
        names = list(problem.model.signals)
        nodes = [problem.model.signals[n].node for n in names]
        rebuilt = substitute(graph, nodes, mapping) if mapping else nodes
        rebuilt = substitute(graph, rebuilt, {magnitude_node.id: leaf})
        # Which rebuilt nodes still read x: one pass over them all (a cone walk per signal
        # was quadratic, minutes at 96 bits).
        reads_x: set[int] = set()
        for node in topological(rebuilt):
            if node is problem.x or any(a.id in reads_x for a in node.args):
                reads_x.add(node.id)
        signals = {}
        for name, node in zip(names, rebuilt):
            if node.id not in reads_x:
                old = problem.model.signals[name]
                signals[name] = Signal(name, node, old.kind, old.signed, old.loc)
        model = Model(graph=graph, top=problem.model.top, files=list(problem.model.files),
                      parameters=dict(problem.model.parameters),
                      ports=[Port(leaf.params[0], "input", leaf.width, False, leaf)],
                      signals=signals)
        top = min(problem.top_magnitude, mask(leaf.width))
        return Bin2BcdProblem(model=model, input_ports=[leaf.params[0]],
                              output_ports=list(problem.output_ports), reasons=[], x=leaf,
                              width=leaf.width, digits=digits,
                              max_input=None if top == mask(leaf.width) else top,
                              digit_sources=list(problem.digit_sources))

"""The stage-induction engine: prove a shift-and-correct converter one stage at a time.

The chain: stage 0 (no digits) -> each matched stage in turn -> the outputs.  Each link is a
set of obligations over a cone cut at the previous stage (:mod:`.cuts`), each checked by z3
once per shape (:mod:`.obligations`).  A failed obligation is lifted to real inputs and
replayed (:mod:`.lifting`); only a replay that shows a wrong output disproves.  Anything that
cannot be cut or decided ends the chain with UNKNOWN and the reason.
"""
from __future__ import annotations

import sys
import time
from typing import Callable, Optional

from ..base import DISPROVED, PROVED, UNKNOWN, Budget, Counterexample, Verdict
from ...model.node import Graph, Node, Op, leaves
from . import obligations as outcomes
from .division import prove_by_division
from .cuts import ConeBuilder, ConstBit, Cut, DigitBit, NotACut, digit_leaf, input_bit_leaf
from .lifting import confirm, split_values
from .mining import Candidate, Mining, mine, nesting, screen
from .obligations import ObligationSolver, Outcome
from .reference import digit_count, step_nodes, top_pair_bound
from .side_conditions import fold_input_tests

Progress = Callable[[int, int], None]
_REFINEMENTS = 64        # answers excluded one by one before a linked query is given up
_ZERO_SECONDS = 2.0      # a zero proof that is not quick is a cone that the cut does not bound


def _spread(facts: dict[int, list], nodes: dict[int, Node], floor: int = -1,
            depth: int = 1000) -> None:
    """Give the parts of a cut node its facts: the bits of ``concat(a, b)`` are the bits of
    ``a`` and ``b``, those of ``extract(m)`` bits of ``m``, the low bits of ``zext(a)`` those
    of ``a``, and ``not(a)`` the complements of those of ``a``.  Hash-consing folds a slice
    of a concatenation to the part itself, so the next stage usually reads the parts, not
    the node the mining named.  Leaves get no facts (the input's bits must stay input
    bits), nor nodes made before ``floor`` (the previous stage's; an earlier stage's nodes
    already hold facts of their own)."""
    frontier = list(nodes.values())
    for _ in range(depth):
        following = []
        for node in frontier:
            bits = facts[node.id]
            pieces = []
            if node.op == Op.CONCAT:
                offset = node.width
                for part in node.args:
                    offset -= part.width
                    pieces.append((part, offset))
            elif node.op == Op.EXTRACT:
                pieces.append((node.args[0], -node.params[1]))
            elif node.op == Op.ZEXT:
                pieces.append((node.args[0], 0))
            elif node.op == Op.NOT:
                bits = [_negated(fact) for fact in bits]
                pieces.append((node.args[0], 0))
            for part, offset in pieces:
                if part.op in Op.LEAVES or part.id <= floor:
                    continue
                known = facts.get(part.id)
                fresh = known is None
                if fresh:
                    known = [None] * part.width
                changed = False
                for i in range(part.width):
                    position = i + offset
                    if known[i] is None and 0 <= position < node.width and bits[position] is not None:
                        known[i] = bits[position]
                        changed = True
                if changed:
                    facts[part.id] = known
                    nodes[part.id] = part
                    following.append(part)
        frontier = following


def _unpack(graph: Graph, facts: dict[int, list], nodes: dict[int, Node], node: Node) -> None:
    """Give the nets that bit-level mining grouped into ``node`` (a concatenation of nets and
    complements of nets) its facts, however old the nets are: unlike the parts that
    :func:`_spread` reaches, they are this stage's digits themselves (a net that carries a
    digit bit unchanged through several stages is each stage's in turn).  Hash-consing
    joins neighbouring input bits into one slice; the design reads them one by one, so
    each bit's own slice (``graph`` returns the existing node) gets its fact."""
    offset = node.width
    for part in node.args:
        offset -= part.width
        bits = facts[node.id][offset:offset + part.width]
        if part.op == Op.NOT:
            part, bits = part.args[0], [_negated(fact) for fact in bits]
        if part.op in Op.LEAVES:
            continue
        pieces = [(part, bits)]
        if part.op == Op.EXTRACT and part.width > 1:
            base = part.params[1]
            pieces += [(graph.extract(part.args[0], base + i, base + i), [bits[i]])
                       for i in range(part.width)]
        for piece, known in pieces:
            held = facts.setdefault(piece.id, [None] * piece.width)
            for i, fact in enumerate(known):
                if held[i] is None:
                    held[i] = fact
            nodes[piece.id] = piece


def _reads_held_bits(found: list[Node], cut: Cut) -> bool:
    """Whether cone leaves ``found`` include input bits the stage digits of ``cut`` already
    hold (``b-1``, ``b-2`` ...: see cuts.input_bit_leaf)."""
    return cut.digits > 0 and any(leaf.op == Op.INPUT and leaf.params[0].startswith("b-")
                                  for leaf in found)


def _negated(fact):
    """The fact of a bit's complement (None where it cannot be said: an input bit's)."""
    if isinstance(fact, DigitBit):
        return DigitBit(fact.digit, fact.bit, not fact.negated)
    if isinstance(fact, ConstBit):
        return ConstBit(1 - fact.value)
    return None


def _runs(facts: list) -> list[tuple[int, int]]:
    """Maximal runs ``(low, high)`` of consecutive bits that have a fact."""
    runs = []
    start = None
    for i, fact in enumerate(facts + [None]):
        if fact is not None and start is None:
            start = i
        elif fact is None and start is not None:
            runs.append((start, i - 1))
            start = None
    return runs


class _Disproved(Exception):
    def __init__(self, counterexample: Counterexample, where: str):
        super().__init__(where)
        self.counterexample = counterexample
        self.where = where


class StageEngine:
    """Stage induction for wide binary-to-BCD converters (see the module docstring).

    ``progress(done, total)`` is called with the stage reached after each link of the chain
    (``total`` is the input width).  ``max_span`` bounds how many stages one link may skip
    when a stage cannot be cut; ``tries`` bounds the candidates tried per digit;
    ``obligation_seconds`` caps one solver call.
    """

    name = "stages"

    def __init__(self, progress: Optional[Progress] = None, max_span: int = 8, tries: int = 6,
                 obligation_seconds: float = 60.0, seed: int = 2026):
        self.progress = progress
        self.max_span = max_span
        self.tries = tries
        self.obligation_seconds = obligation_seconds
        self.seed = seed

    def run(self, problem, budget: Budget) -> Verdict:
        """Decide ``problem`` (a Bin2BcdProblem); proved only along a chain of unsat obligations."""
        started = time.monotonic()
        run = _Run(self, problem, budget)
        old_limit = sys.getrecursionlimit()
        sys.setrecursionlimit(max(old_limit, 30_000))
        try:
            verdict = run.execute()
            if verdict.status == UNKNOWN and run.few_stages():
                verdict = self._try_division(problem, budget, run, verdict)
        except _Disproved as found:
            verdict = Verdict(DISPROVED, self.name, counterexample=found.counterexample,
                              covered=f"counterexample found at {found.where}, replayed on the model")
        finally:
            sys.setrecursionlimit(old_limit)
        verdict.seconds = time.monotonic() - started
        verdict.stats.update(run.stats())
        return verdict


    def _try_division(self, problem, budget: Budget, run: "_Run", verdict: Verdict) -> Verdict:
        """Few shift-and-correct stages: try the division-by-ten family instead."""
        status, words, found = prove_by_division(problem, run.solver, budget,
                                                 self.obligation_seconds)
        if status == "proved":
            return Verdict(PROVED, self.name,
                           covered=f"every {problem.width}-bit input: {words} "
                                   f"(q_i == 10*q_(i+1) + d_i, d_i <= 9), "
                                   f"{run.solver.posed} obligations")
        if status == "disproved":
            return Verdict(DISPROVED, self.name, counterexample=found,
                           covered=f"counterexample found at {words}, replayed on the model")
        verdict.reason += f"; division by ten: {words}"
        return verdict


class _Run:
    """One run of the engine on one problem."""

    def __init__(self, engine: StageEngine, problem, budget: Budget):
        self.engine = engine
        self.problem = problem
        self.budget = budget
        self.width = problem.width
        self.cone = Graph()
        self.solver = ObligationSolver()
        self.mining: Optional[Mining] = None
        self.mining_seconds = 0.0
        self.proved_stage = 0
        self.failures: list[str] = []
        self.cuts: list[Cut] = [Cut.empty()]
        self.owners: dict[int, Cut] = {}          # node id -> newest proved cut holding it
        self.zeros: set[int] = set()               # nodes proved to be zero for every input
        self._zero_tried: dict[int, int] = {}      # node id -> stage of a failed zero proof
        self._references: dict[tuple[int, int], list[Node]] = {}
        self._learned: dict[int, list[Node]] = {}  # stage -> exclusions (see _check_refined)

    # the chain ---------------------------------------------------------------------------------
    def execute(self) -> Verdict:
        problem, width = self.problem, self.width
        if problem.x.op != Op.INPUT:
            return self._unknown("the binary input is not a plain input port")
        started = time.monotonic()
        self.mining = mine(problem, self.engine.seed)
        self.mining_seconds = time.monotonic() - started
        self._replay_hints()
        cut = Cut.empty()
        self._report(0)
        while cut.stage < width:
            if self.budget.expired():
                return self._unknown(f"time limit reached after stage {cut.stage}")
            following = None
            last = min(width, cut.stage + self.engine.max_span)
            for stage in range(cut.stage + 1, last + 1):
                if self.mining.matched(stage):
                    following = self._advance(cut, stage)
                    if following is not None:
                        break
            if following is None:
                if not any(self.mining.matched(s) for s in range(cut.stage + 1, last + 1)):
                    self.failures.append(f"stages {cut.stage + 1} to {last}: no design signal "
                                         f"matches their digits in simulation")
                if width - cut.stage > self.engine.max_span:
                    return self._unknown(self._stuck_reason(
                        cut, f"no stage from {cut.stage + 1} to {last} could be proved"))
                break
            cut = following
            self.cuts.append(cut)
            for node_id in cut.facts:
                self.owners[node_id] = cut
            self.proved_stage = cut.stage
            self._report(cut.stage)
        # The outputs may read an earlier stage's signals than the ones chosen for the last
        # stage; every proved stage is a sound starting point, so try the latest few.
        earlier = [c for c in self.cuts if c is not cut][::-1][:self.engine.max_span]
        first = self._final(cut)
        for start in earlier:
            if first.status != UNKNOWN:
                break
            verdict = self._final(start)
            if verdict.status != UNKNOWN:
                return verdict
        return first

    def _replay_hints(self) -> None:
        """Replay the stimuli whose simulated outputs looked wrong; a real bug ends the run."""
        for x in self.mining.wrong_inputs:
            if self.problem.max_input is not None and x > self.problem.max_input:
                continue
            found = self.problem.replay(x)
            if found is not None and found.replayed:
                raise _Disproved(found, f"mining stimulus x = {x}")

    def _advance(self, cut: Cut, stage: int) -> Optional[Cut]:
        """Prove stage ``stage`` from ``cut``; the new cut, or None (reason in self.failures)."""
        mining = self.mining
        builder = self._builder(cut)
        reference = self._reference(cut.stage, stage)
        chosen: list[Candidate] = []
        # Sparse digits collide with unrelated nodes: prefer nodes made just after the
        # previous stage's (the graph numbers nodes in the order elaboration made them).
        anchor = self._newest(cut)
        try:
            for j in range(digit_count(stage)):
                picked = None
                ranked = sorted(mining.candidates[stage][j], key=lambda c: (
                    c.tier, nesting(c.name), -mining.coverage(stage, c.node.id), c.node.id <= anchor,
                    abs(c.node.id - anchor), c.low))
                for candidate in ranked[:self.engine.tries]:
                    rebuilt = builder.slice(candidate.node, candidate.low + 3, candidate.low)
                    if candidate.complemented:
                        rebuilt = self.cone.not_(rebuilt)
                    where = f"stage {cut.stage} -> {stage}, digit {j} as {candidate.describe()}"
                    outcome = self._check(rebuilt, reference[j], cut, where)
                    if outcome.status == outcomes.PROVED:
                        picked = candidate
                        break
                    self._failed(outcome, cut, where)
                if picked is None:
                    if not mining.candidates[stage][j]:
                        self.failures.append(f"stage {stage}: no signal holds digit {j}")
                    return None
                chosen.append(picked)
        except (NotACut, RecursionError) as error:
            self.failures.append(f"stage {cut.stage} -> {stage}: not a cut ({error or 'too deep'})")
            return None
        return self._next_cut(builder, cut, stage, chosen)

    def _next_cut(self, builder: ConeBuilder, cut: Cut, stage: int, chosen: list[Candidate]) -> Optional[Cut]:
        """The facts of stage ``stage``: its proved digits and the other bits of their nodes."""
        facts: dict[int, list] = {}
        nodes: dict[int, Node] = {}
        for j, candidate in enumerate(chosen):
            node = candidate.node
            bits = facts.setdefault(node.id, [None] * node.width)
            nodes[node.id] = node
            for b in range(4):
                if bits[candidate.low + b] is not None:
                    self.failures.append(f"stage {stage}: two digits proposed in the same bits "
                                         f"of {candidate.describe()}")
                    return None
                bits[candidate.low + b] = DigitBit(j, b, candidate.complemented)
        for node_id, bits in facts.items():
            node = nodes[node_id]
            proposed = [None if known is not None else self.mining.bit_fact(node, i)
                        for i, known in enumerate(bits)]
            for low, high in _runs(proposed):
                for i, fact in self._prove_bits(builder, cut, stage, node, low, high, proposed):
                    bits[i] = fact
        for j, candidate in enumerate(chosen):
            if candidate.node.id in self.mining.synthetic:
                _unpack(self.problem.model.graph, facts, nodes, candidate.node)
                self._equal_nets(builder, cut, stage, j, facts, nodes)
        _spread(facts, nodes, floor=self._newest(cut))
        return Cut(stage=stage, digits=digit_count(stage), facts=facts)

    def _equal_nets(self, builder: ConeBuilder, cut: Cut, stage: int, j: int,
                    facts: dict[int, list], nodes: dict[int, Node]) -> None:
        """Facts for every other net that simulation found equal to a bit of digit ``j``
        (a cell's "5 or more" net and its carry out, say): each is proved equal to the
        reference bit from the previous cut, so whichever of them the next stage reads
        stops its cone there."""
        digit = self._reference(cut.stage, stage)[j]
        for b, nets in enumerate(self.mining.bit_options.get((stage, j), ())):
            expected = self.cone.extract(digit, b, b)
            for net, negated in nets:
                if net.id in facts or net.op in Op.LEAVES:
                    continue
                try:
                    rebuilt = builder.slice(net, 0, 0)
                except (NotACut, RecursionError):
                    continue
                if negated:
                    rebuilt = self.cone.not_(rebuilt)
                where = f"stage {cut.stage} -> {stage}, {net!r} as bit {b} of digit {j}"
                if self._check(rebuilt, expected, cut, where).status == outcomes.PROVED:
                    facts[net.id] = [DigitBit(j, b, negated)]
                    nodes[net.id] = net

    def _newest(self, cut: Cut) -> int:
        """The newest design node holding a fact of ``cut`` (nodes that bit-level mining
        made after elaboration do not count: their parts hold the same facts)."""
        synthetic = self.mining.synthetic
        return max((i for i in cut.facts if i not in synthetic), default=-1)

    def _prove_bits(self, builder: ConeBuilder, cut: Cut, stage: int, node: Node, low: int,
                    high: int, proposed: list) -> list[tuple[int, object]]:
        """Prove the proposed constant and input-bit facts of ``node[high:low]``: the whole run
        at once (one slice through the cone), bit by bit only where the run fails."""
        def expected_bit(fact) -> Node:
            if isinstance(fact, ConstBit):
                return self.cone.const(fact.value, 1)
            return input_bit_leaf(self.cone, self.width, cut.stage, fact.index)

        where = f"stage {cut.stage} -> {stage}, bits {high}:{low} of {node!r}"
        try:
            rebuilt = builder.slice(node, high, low)
            expected = self.cone.concat(*[expected_bit(proposed[i]) for i in range(high, low - 1, -1)])
            if self._check(rebuilt, expected, cut, where).status == outcomes.PROVED:
                return [(i, proposed[i]) for i in range(low, high + 1)]
        except (NotACut, RecursionError):
            return []
        proved = []
        for i in range(low, high + 1):
            try:
                rebuilt = builder.slice(node, i, i)
            except (NotACut, RecursionError):
                continue
            if self._check(rebuilt, expected_bit(proposed[i]), cut,
                           f"stage {cut.stage} -> {stage}, bit {i} of {node!r}").status == outcomes.PROVED:
                proved.append((i, proposed[i]))
        return proved

    def _final(self, cut: Cut) -> Verdict:
        """Outputs from the last proved stage: each equals the reference digit (zero above)."""
        problem, width, cone = self.problem, self.width, self.cone
        total = digit_count(width)
        shown = len(problem.digits)
        try:
            builder = self._builder(cut)
            reference = self._reference(cut.stage, width)
            bound = self._value_bound(reference) if problem.max_input is not None else None
            for i in range(max(shown, total)):
                expected = reference[i] if i < total else cone.zero(4)
                if i < shown:
                    rebuilt = builder.slice(problem.digits[i], 3, 0)
                    where = f"stage {cut.stage} -> outputs, digit {i} ({self._source(i)})"
                else:
                    rebuilt, expected = expected, cone.zero(4)
                    where = f"stage {cut.stage} -> outputs, digit {i} (not shown by the design)"
                outcome = self._check(rebuilt, expected, cut, where, extra=bound)
                if outcome.status != outcomes.PROVED:
                    self._failed(outcome, cut, where)
                    return self._unknown(self._stuck_reason(cut, f"the step to the outputs failed "
                                                                 f"at {where}"))
        except (NotACut, RecursionError) as error:
            return self._unknown(self._stuck_reason(
                cut, f"the outputs are not cut by stage {cut.stage} ({error or 'too deep'})"))
        self.proved_stage = width
        self._report(width)
        scope = (f"every input up to {problem.max_input}" if problem.max_input is not None
                 else f"every {width}-bit input")
        return Verdict(PROVED, self.engine.name,
                       covered=f"{scope}: stage chain 0 -> {cut.stage}, then the outputs; "
                               f"{self.solver.posed} obligations")

    # pieces ------------------------------------------------------------------------------------
    def _builder(self, cut: Cut) -> ConeBuilder:
        limit = 20000 + 60 * digit_count(self.width) ** 2
        return ConeBuilder(self.cone, self.problem.x, self.width, cut, owners=self.owners,
                           zero_test=self._zero_test, limit=limit)

    def _zero_test(self, builder: ConeBuilder, node: Node) -> bool:
        """Is ``node`` zero for every input?  Proposed by simulation, proved from the cut.

        Digits above a stage's top digit are zero but match no reference digit; without this
        the cone of a new top digit would run back through every earlier stage.  The proof
        uses only proved facts of strictly smaller cones, so it is well founded.
        """
        if node.id in self.zeros:
            return True
        planes = self.mining.planes.get(node.id)
        if planes is None or any(planes) or any(self.mining.unknown.get(node.id, ())):
            return False
        stage = builder.cut.stage
        if self._zero_tried.get(node.id) == stage:
            return False
        self._zero_tried[node.id] = stage        # also guards against re-entering this proof
        try:
            whole = builder.build_plain(node)
        except NotACut:
            return False
        outcome = self._check(whole, self.cone.zero(node.width), builder.cut,
                              f"stage {stage}: {node!r} is zero", cap=_ZERO_SECONDS)
        if outcome.status == outcomes.PROVED:
            self.zeros.add(node.id)
            return True
        return False

    def _reference(self, start: int, stop: int) -> list[Node]:
        """R^(stop - start) of the stage-``start`` digit leaves, as ``digit_count(stop)`` nodes."""
        key = (start, stop)
        found = self._references.get(key)
        if found is None:
            cone = self.cone
            digits = [digit_leaf(cone, j) for j in range(digit_count(start))]
            for step in range(start, stop):
                count = digit_count(step + 1)
                padded = digits + [cone.zero(4)] * (count - len(digits))
                bit = input_bit_leaf(cone, self.width, start, self.width - step - 1)
                digits = step_nodes(cone, padded, bit)[:count]
            found = self._references[key] = digits
        return found

    def _assumptions(self, nodes: list[Node], cut: Cut) -> tuple[Node, bool]:
        """Valid digits (each <= 9) and each stage's range, for the digit leaves ``nodes`` use;
        and whether ``nodes`` also read input bits that the stage digits already hold."""
        cone = self.cone
        used: dict[int, set[int]] = {}            # distance back -> digit indices
        found = leaves(nodes)
        for leaf in found:
            name = leaf.params[0]
            if leaf.width != 4:
                continue
            if name.startswith("d") and name[1:].isdigit():
                used.setdefault(0, set()).add(int(name[1:]))
            elif name.startswith("e") and "_" in name:
                distance, digit = name[1:].split("_")
                used.setdefault(int(distance), set()).add(int(digit))
        condition = cone.const(1, 1)
        nine = cone.const(9, 4)
        for distance, digits in sorted(used.items()):
            stage = cut.stage - distance
            for j in sorted(digits):
                condition = cone.and_(condition, cone.ule(digit_leaf(cone, j, distance), nine))
            top = digit_count(stage) - 1
            if top in digits:
                condition = cone.and_(condition, self._top_pair(stage, distance))
        return condition, _reads_held_bits(found, cut)

    def _top_pair(self, stage: int, distance: int) -> Node:
        """The top two digits of stage ``stage`` read as a number are at most its bound."""
        cone = self.cone
        top = digit_count(stage) - 1
        bound = top_pair_bound(stage)
        if top == 0:
            return cone.ule(digit_leaf(cone, 0, distance), cone.const(bound, 4))
        ten = cone.const(10, 8)
        value = cone.add(cone.mul(cone.zext(digit_leaf(cone, top, distance), 8), ten),
                         cone.zext(digit_leaf(cone, top - 1, distance), 8))
        return cone.ule(value, cone.const(bound, 8))

    def _value_bound(self, reference: list[Node]) -> Node:
        """``x <= max_input``, read on the reference digits of ``x`` (most significant first,
        digit by digit): in every reachable state they are the digits of ``x``, and digit
        comparisons stay small where a sum of digit multiples would not."""
        cone = self.cone
        limit = [int(c) for c in str(self.problem.max_input)[::-1]]
        if len(limit) > len(reference):
            return cone.const(1, 1)              # every value of the digits is below it
        limit += [0] * (len(reference) - len(limit))
        at_most = cone.const(1, 1)               # the digits below j are <= the limit's
        for j in range(len(reference)):
            digit, bound = reference[j], cone.const(limit[j], 4)
            at_most = cone.or_(cone.ult(digit, bound), cone.and_(cone.eq(digit, bound), at_most))
        return at_most

    def _check(self, rebuilt: Node, expected: Node, cut: Cut, where: str,
               extra: Optional[Node] = None, cap: Optional[float] = None) -> Outcome:
        cone = self.cone
        assume, linked = self._assumptions([rebuilt, expected], cut)
        if extra is not None:
            assume = cone.and_(assume, extra)
        bad = cone.and_(assume, cone.ne(rebuilt, expected))
        timeout = self.engine.obligation_seconds if cap is None else cap
        left = self.budget.remaining()
        if left is not None:
            timeout = min(timeout, max(left, 0.001))
        if linked and extra is not None and self.problem.max_input is not None:
            # The step to the outputs, restricted to x <= max_input: a saturation or
            # short-path test on the input alone may be constant over that range.
            bad = fold_input_tests(cone, bad, self.width, cut.stage, self.problem.max_input,
                                   self.solver, timeout)
            linked = _reads_held_bits(leaves([bad]), cut)
        if linked:
            return self._check_refined(bad, cut, where, timeout)
        return self.solver.check(bad, where, timeout)

    def _check_refined(self, bad: Node, cut: Cut, where: str, timeout: float) -> Outcome:
        """An obligation that reads both the stage digits and the input bits they hold (a
        short path for small inputs beside the converter, say).

        Stating "the digits are the decimal digits of those bits" outright is the whole
        conversion again, too hard for the solver at width.  Instead each answer whose
        digits disagree with its bits ``p`` is excluded by the fact "bits == p implies digits
        == digits of p", true in every reachable state, and the query is asked again; an
        answer that agrees is a reachable state (lifted and replayed as usual)."""
        cone = self.cone
        bits = cone.concat(*[input_bit_leaf(cone, self.width, cut.stage, self.width - 1 - k)
                             for k in range(cut.stage)])
        # The exclusions learned for other obligations at this stage hold in every reachable
        # state too: start from them (the digits of one output each needed the same ten or
        # so, one solver call apiece).
        learned = self._learned.setdefault(cut.stage, [])
        query = bad
        for fact in learned:
            query = cone.and_(query, fact)
        for _ in range(_REFINEMENTS):
            outcome = self.solver.check(query, where, timeout)
            if outcome.status != outcomes.FAILED:
                return outcome
            digits, offsets, _ = split_values(outcome.values)
            prefix = 0
            for k in range(cut.stage):
                prefix |= offsets.get(-cut.stage + k, 0) << (cut.stage - 1 - k)
            wanted = [int(c) for c in str(prefix)[::-1]] + [0] * cut.digits
            if all(digits.get(j, 0) == wanted[j] for j in range(cut.digits)):
                return outcome
            same = cone.const(1, 1)
            for j in range(cut.digits):
                same = cone.and_(same, cone.eq(digit_leaf(cone, j), cone.const(wanted[j], 4)))
            fact = cone.or_(cone.ne(bits, cone.const(prefix, cut.stage)), same)
            learned.append(fact)
            query = cone.and_(query, fact)
        return Outcome(outcomes.UNDECIDED, reason=f"{_REFINEMENTS} refinements of the stage "
                                                  f"value did not settle it")

    def _failed(self, outcome: Outcome, cut: Cut, where: str) -> None:
        """Record a failed obligation; raise _Disproved when its state replays as a real bug."""
        if outcome.status == outcomes.UNDECIDED:
            self.failures.append(f"{where}: the solver gave up ({outcome.reason})")
            return
        found = confirm(self.problem, outcome.values, cut.stage, cut.digits,
                        screen=lambda inputs: screen(self.mining, self.problem, inputs))
        if found is not None:
            raise _Disproved(found, where)
        self.failures.append(f"{where}: fails on a state that no input reaches or that the "
                             f"design corrects later")

    def _source(self, i: int) -> str:
        sources = getattr(self.problem, "digit_sources", None) or []
        return sources[i] if i < len(sources) else f"output digit {i}"

    def _stuck_reason(self, cut: Cut, what: str) -> str:
        reason = f"stages 0 to {cut.stage} of {self.width} proved; {what}"
        if self.failures:
            reason += "; last problem: " + self.failures[-1]
        if self.problem.max_input is not None:
            reason += ("; note: stages are proved for every input, only the step to the "
                       "outputs is restricted to x <= max_input")
        if self.few_stages():
            reason += "; no shift-and-correct stages were found in the design"
        return reason

    def few_stages(self) -> bool:
        """Under half of the stages matched: not a shift-and-correct design, it seems."""
        return self.mining is not None and 2 * sum(
            self.mining.matched(s) for s in range(self.width + 1)) < self.width

    def _unknown(self, reason: str) -> Verdict:
        covered = (f"stages 0 to {self.proved_stage} of {self.width} proved for every input"
                   if self.proved_stage else "nothing proved")
        return Verdict(UNKNOWN, self.engine.name, covered=covered, reason=reason)

    def _report(self, stage: int) -> None:
        if self.engine.progress is not None:
            self.engine.progress(stage, self.width)

    def stats(self) -> dict:
        mining = self.mining
        matched = sum(mining.matched(s) for s in range(self.width + 1)) if mining else 0
        return {
            "stages_matched": matched,
            "stages_total": self.width + 1,
            "stages_proved": self.proved_stage,
            "obligations": self.solver.posed,
            "distinct_obligations": self.solver.solved,
            "slowest_obligation_seconds": round(self.solver.slowest, 4),
            "slowest_obligation": self.solver.slowest_description,
            "mining_seconds": round(self.mining_seconds, 3),
            "lanes": mining.lanes if mining else 0,
        }

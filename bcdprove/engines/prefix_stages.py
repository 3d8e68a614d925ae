"""Stage induction for BCD-to-binary converters: prove the value of the top digits, step by step.

The canonical intermediates of a BCD-to-binary converter are the prefix values
``P_k = the top k digits read as a number`` (``P_0 = 0``, ``P_D`` the output): a
multiply-by-ten loop or a chain of ``10*v + d`` cells holds them, however its multiply is
built (a constant multiply, shifts and adds, a table).  The engine

1. mines design signals equal to ``P_k`` on every lane of a bit-parallel simulation (valid
   digit vectors, many with their top digits all 9 so each prefix reaches its largest value);
2. proves each step ``s -> t`` between mined stages: the stage-``t`` node, with the stage-``s``
   node cut out and replaced by a fresh value ``p`` and the input replaced by fresh digits,
   must depend only on ``p``, the digits ``D-t .. D-s-1`` and free values, and must equal
   ``p * 10**(t-s) + those digits`` for every ``p`` in range and digits at most 9 (stated
   multiplicatively, over bit-vectors);
3. ends the chain at the output node (``t = D``), so together the steps reach from the input
   to the output: for every valid input ``S_t = P_t`` by induction, hence output ``= P_D``.

Steps are first asked with the loosest range for ``p`` that cannot overflow the
reference (the same for every step of a loop, so one z3 query serves them all: obligations
are hashed by their shape with the fresh values renamed canonically); a step that fails there
is asked again with the exact range ``p <= 10**s - 1``.  A step that still fails is lifted
to an input (the digits of ``p`` on top, the step's digits below, zeros after) and replayed
on the whole model: only a replay that shows a wrong output disproves.  A step that cannot be
cut, a lifted input that replays right, or a limit reached is ``unknown``.  An invalid-digit
flag is checked by one z3 query over its own (small) cone.

Designs that accumulate from the ones digit up (``v += d_i * weight_i``) hold the other
family of canonical values, the suffixes ``Q_k = (sum of the low k digits as a number)``,
with steps ``Q_t = Q_s + sum(d_i * 10**i, s <= i < t)`` and ``Q_s <= 10**s - 1``.  Both
families are mined; the one the design holds more of runs first, the other when the first
does not decide.
"""
from __future__ import annotations

import random
import time
from typing import Callable, Optional

from ..model.node import Node, Op, leaves, substitute, topological
from .base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict

MINING_LANES = 512
_STEP_SECONDS = 30.0          # a z3 step past this is not a small obligation: give up on it


FAMILIES = ("prefix", "suffix")


def _family_value(family: str, value: int, k: int, digits: int) -> int:
    """The canonical value after ``k`` steps: the top ``k`` digits (prefix) or the low ``k``
    digits (suffix) of ``value``, read as a number (Python int)."""
    if family == "prefix":
        return value // 10 ** (digits - k)
    return value % 10 ** k


def _positions(family: str, s: int, t: int, digits: int) -> list[int]:
    """Digit positions a step from ``s`` to ``t`` digits reads, lowest first."""
    if family == "prefix":
        return list(range(digits - t, digits - s))
    return list(range(s, t))


def _smaller(problem, found, budget):
    """A lifted input is any state the solver picked; a nearby smaller one reads better."""
    from .replay import LaneChecker, shrink

    return shrink(LaneChecker(problem), found, budget)


class NotACut(Exception):
    """The stage-``t`` node reads digits above the step, so the stage-``s`` node does not cut it."""


class PrefixStageEngine:
    """Stage induction over prefix values for ``--spec bcd2bin`` problems."""

    name = "stages"

    def __init__(self, progress: Optional[Callable[[int, int], None]] = None,
                 lanes: int = MINING_LANES, seed: int = 7) -> None:
        self.progress = progress
        self.lanes = lanes
        self.seed = seed

    # mining --------------------------------------------------------------------------
    def mine(self, problem, family: str = "prefix") -> dict[int, list[Node]]:
        """Stage k -> design nodes equal to the family's value on every simulated lane
        (newest first): ``P_k`` (prefix) or ``Q_k`` (suffix)."""
        from ..model.simulate import Simulator, pack, unpack
        from ..spec.bcd2bin import bcd_value

        rng = random.Random(self.seed)
        stimuli = [x for x in problem.corner_inputs() + problem.random_inputs(self.lanes, rng)
                   if bcd_value(x, problem.digit_count) is not None and problem.in_domain(x)]
        named = [s.node for s in problem.model.signals.values() if s.node.op not in Op.LEAVES
                 and s.node.op != Op.CONST]
        if problem.substitution:
            named = substitute(problem.model.graph, named, problem.substitution)
        seen: set[int] = set()
        candidates = []
        for node in named:
            if node.id not in seen and node.op not in Op.LEAVES and node.op != Op.CONST:
                seen.add(node.id)
                candidates.append(node)
        if not candidates:
            return {}
        simulator = Simulator(candidates)
        lanes = len(stimuli)
        values = {problem.x.id: pack(stimuli, problem.width)}
        unknown = {}
        everyone = (1 << lanes) - 1
        for leaf in simulator.leaves:
            if leaf is not problem.x and leaf.op != Op.FREE:
                values[leaf.id] = [0] * leaf.width
                unknown[leaf.id] = [everyone] * leaf.width
        planes = simulator.run(lanes, values, unknown)
        by_signature: dict[tuple, list[Node]] = {}
        for node, plane in zip(candidates, planes):
            if any(plane.unknown):
                continue
            by_signature.setdefault(tuple(unpack(plane.value, lanes)), []).append(node)
        digits = problem.digit_count
        numbers = [bcd_value(x, digits) for x in stimuli]
        stages: dict[int, list[Node]] = {}
        for k in range(1, digits):
            signature = tuple(_family_value(family, v, k, digits) for v in numbers)
            found = by_signature.get(signature)
            if found:
                stages[k] = sorted(found, key=lambda n: -n.id)
        return stages

    # obligations -------------------------------------------------------------------------
    def run(self, problem, budget: Budget) -> Verdict:
        started = time.monotonic()
        if problem.spec != "bcd2bin":
            return Verdict(UNKNOWN, self.name, 0.0, covered="nothing proved",
                           reason=f"prefix stages are for --spec bcd2bin, not {problem.spec}")
        reasons = []
        verdict = None
        mined = {family: self.mine(problem, family) for family in FAMILIES}
        # The family the design holds more of first; a family without any stage is one
        # monolithic step, tried once at most (as the last resort).
        order = sorted(FAMILIES, key=lambda f: -len(mined[f]))
        order = [f for f in order if mined[f]] or [FAMILIES[0]]
        for family in order:
            stages = mined[family]
            verdict = self._chain(problem, budget, family, stages, started)
            if verdict.status != UNKNOWN:
                return verdict
            reasons.append(f"{family} stages: {verdict.reason}")
        verdict.reason = "; ".join(reasons)
        return verdict

    def _chain(self, problem, budget: Budget, family: str, stages: dict,
               started: float) -> Verdict:
        stats: dict = {"family": family, "obligations": 0, "shapes": 0, "solver_calls": 0,
                       "stages_mined": len(stages)}
        digits = problem.digit_count
        chain = Chain(problem, budget, stats, family)
        position, current = 0, None
        steps_done = 0
        while position < digits:
            if budget.expired():
                return self._unknown(started, stats, position, "the time limit was reached")
            outcome = None
            for target in range(position + 1, digits + 1):
                nodes = stages.get(target, []) if target < digits else [problem.checked[0]]
                for node in nodes[:4]:
                    try:
                        outcome = chain.step(position, current, target, node)
                    except NotACut:
                        continue
                    break
                if outcome is not None:
                    break
            if outcome is None:
                return self._unknown(started, stats, position,
                                     f"no mined stage after {position} digits cuts the design "
                                     f"(the next stages read digits outside their step)")
            status, target, node, found, why = outcome
            if status == DISPROVED:
                found = _smaller(problem, found, budget)
                return Verdict(DISPROVED, self.name, time.monotonic() - started,
                               counterexample=found, stats=stats,
                               covered=f"{family} stages 0 .. {position} proved; the step to "
                                       f"{target} fails")
            if status == UNKNOWN:
                return self._unknown(started, stats, position, why)
            position, current = target, node
            steps_done += 1
            if self.progress is not None:
                self.progress(position, digits)
        stats["steps"] = steps_done
        if problem.flag_port is not None:
            status, found, why = chain.flag()
            if status == DISPROVED:
                found = _smaller(problem, found, budget)
                return Verdict(DISPROVED, self.name, time.monotonic() - started,
                               counterexample=found, stats=stats,
                               covered=f"binary output proved by {family} stages; the flag fails")
            if status == UNKNOWN:
                return Verdict(UNKNOWN, self.name, time.monotonic() - started, stats=stats,
                               covered=f"binary output proved by {family} stages for every "
                                       f"valid input; the flag not decided", reason=why)
        return Verdict(PROVED, self.name, time.monotonic() - started, stats=stats,
                       covered=f"{problem.contract_words()}, by {steps_done} {family}-stage "
                               f"steps ({stats['obligations']} obligations, "
                               f"{stats['shapes']} distinct shapes), all unsat")

    def _unknown(self, started: float, stats: dict, position: int, why: str) -> Verdict:
        return Verdict(UNKNOWN, self.name, time.monotonic() - started, stats=stats,
                       covered=f"{stats['family']} stages 0 .. {position} digits proved",
                       reason=why)


class Chain:
    """The obligations of one problem, with the shape cache shared by all its steps."""

    def __init__(self, problem, budget: Budget, stats: dict, family: str = "prefix") -> None:
        import z3

        from ..model.smt import Z3Encoder

        self.family = family
        self.problem = problem
        self.budget = budget
        self.stats = stats
        self.graph = problem.model.graph
        self.digit_leaves = [self.graph.input(f"bcdprove$digit{i}", 4)
                             for i in range(problem.digit_count)]
        self.x_fresh = self.graph.concat(*reversed(self.digit_leaves))
        self.proved: set = set()
        self.encoder = Z3Encoder(z3.Context())

    # one step ------------------------------------------------------------------------------
    def step(self, s: int, node_s: Node | None, t: int, node_t: Node):
        """Prove the step (prefix: ``S_t = 10**(t-s) * S_s + digits``; suffix: ``S_t = S_s +
        sum(d_i * 10**i)``); raises NotACut."""
        problem = self.problem
        digits = problem.digit_count
        positions = _positions(self.family, s, t, digits)
        step_digits = [self.digit_leaves[i] for i in positions]
        prefix = None
        mapping = {problem.x.id: self.x_fresh}
        if node_s is not None:
            prefix = self.graph.input(f"bcdprove$prefix{s}", node_s.width)
            mapping[node_s.id] = prefix
        (cone,) = substitute(self.graph, [node_t], mapping)
        allowed = {leaf.id for leaf in step_digits}
        if prefix is not None:
            allowed.add(prefix.id)
        fresh_names = {leaf.id for leaf in self.digit_leaves}
        for leaf in leaves([cone]):
            if leaf.id in allowed or leaf.op == Op.FREE:
                continue
            if leaf.op == Op.INPUT and leaf.id not in fresh_names and \
                    not leaf.params[0].startswith("bcdprove$"):
                continue          # an untied input: any value, as a free one
            raise NotACut(f"stage {t} reads {leaf!r}")
        self.stats["obligations"] += 1
        exact = 10 ** s - 1
        if problem.limit is not None:
            exact = min(exact, self._cap(s))
        loose = exact
        if prefix is not None and self.family == "prefix":
            # The widest range in which the reference cannot overflow the stage node: shared
            # by every step of a loop, so one query serves them all.
            loose = max(exact, ((1 << node_t.width) - 1 - (10 ** (t - s) - 1)) // 10 ** (t - s))
            loose = min(loose, (1 << prefix.width) - 1)
        # Inputs beyond a --max-input style limit are outside the contract: so are states
        # whose prefix value at stage t exceeds what the limit allows there.
        cap = None if problem.limit is None else self._cap(t)
        for bound in ([loose, exact] if loose != exact else [exact]):
            answer = self._ask(cone, prefix, positions, step_digits, bound, cap)
            if answer is None:
                return (PROVED, t, node_t, None, "")
            if answer == "unknown":
                return (UNKNOWN, t, node_t, None,
                        f"the solver did not settle the step from {s} to {t} digits")
        # The exact range failed: lift the state to an input and replay.
        values = answer
        p = values.get(prefix.id, 0) if prefix is not None else 0
        x = self._lift(s, p, positions, [values.get(d.id, 0) for d in step_digits])
        if x is None or not problem.in_domain(x):
            return (UNKNOWN, t, node_t, None,
                    f"the step from {s} to {t} digits fails at a state no input reaches")
        found = problem.replay(x)
        if found is None:
            return (UNKNOWN, t, node_t, None,
                    f"the step from {s} to {t} digits fails at prefix {p}, but the input "
                    f"{problem.describe_input(x)} replays right (the design corrects itself "
                    f"later); a monolithic query (--engine smt) may settle it")
        return (DISPROVED, t, node_t, found, "")

    def _cap(self, k: int) -> int:
        """The largest canonical value after ``k`` steps of an input within the limit: the
        prefix of the limit, or the limit itself (a suffix is at most the whole value)."""
        limit = self.problem.limit
        if self.family == "prefix":
            return limit // 10 ** (self.problem.digit_count - k)
        return limit

    def _lift(self, s: int, p: int, positions: list[int], step_values: list[int]) -> int | None:
        """The input whose state after ``s`` steps is ``p`` and whose step digits are
        ``step_values`` (other digits 0); None when ``p`` has more than ``s`` digits."""
        digits = self.problem.digit_count
        if p >= 10 ** s or any(v > 9 for v in step_values):
            return None
        x = 0
        for position, v in zip(positions, step_values):
            x |= v << 4 * position
        low = digits - s if self.family == "prefix" else 0
        for i, ch in enumerate(reversed(str(p).zfill(s) if s else "")):
            x |= int(ch) << 4 * (low + i)
        return x

    def _shape(self, cone: Node, prefix: Node | None, step_digits: list[Node], n: tuple,
               bound: int, cap: int | None) -> tuple:
        """The obligation up to the names of its fresh values (hash-consed nodes differ by
        id only; leaves are renamed by their role)."""
        roles = {d.id: ("digit", k) for k, d in enumerate(step_digits)}
        if prefix is not None:
            roles[prefix.id] = ("prefix", prefix.width)
        index: dict[int, int] = {}
        rows = []
        for node in topological([cone]):
            index[node.id] = len(index)
            if node.id in roles:
                rows.append(roles[node.id])
            elif node.op in Op.LEAVES:
                rows.append((node.op, node.width, "leaf", len(rows)))
            else:
                rows.append((node.op, node.width, node.params,
                             tuple(index[a.id] for a in node.args)))
        return (n, bound, cap, tuple(rows))

    def _ask(self, cone: Node, prefix: Node | None, positions: list[int],
             step_digits: list[Node], bound: int, cap: int | None):
        """None when the step holds for every ``p <= bound`` and digits <= 9; "unknown"; or
        the values (leaf id -> value) of a failing state."""
        import z3

        from ..model.smt import check_within

        # The reference's weights: relative for a prefix step (the same for every step of a
        # loop), absolute for a suffix step.
        if self.family == "prefix":
            weights = tuple(10 ** j for j in range(len(step_digits)))
            scale = 10 ** len(step_digits)
        else:
            weights = tuple(10 ** i for i in positions)
            scale = 1
        key = self._shape(cone, prefix, step_digits, (self.family, weights, scale), bound, cap)
        if key in self.proved:
            return None
        self.stats["shapes"] += 1
        encoder = self.encoder
        ctx = encoder.ctx
        # Wide enough that the reference never wraps: a bound on p * scale + every digit.
        largest = 10 * max(weights) + ((1 << prefix.width) * scale if prefix is not None else 0)
        wide = max(cone.width, largest.bit_length()) + 1
        constraints = []
        reference = z3.BitVecVal(0, wide, ctx)
        if prefix is not None:
            p = encoder.term(prefix)
            constraints.append(z3.ULE(p, z3.BitVecVal(bound, prefix.width, ctx)))
            reference = z3.ZeroExt(wide - prefix.width, p) * scale
        for d, weight in zip(step_digits, weights):
            term = encoder.term(d)
            constraints.append(z3.ULE(term, z3.BitVecVal(9, 4, ctx)))
            reference = reference + z3.ZeroExt(wide - 4, term) * weight
        if cap is not None:
            wide_cap = max(wide, cap.bit_length() + 1)
            constraints.append(z3.ULE(z3.ZeroExt(wide_cap - wide, reference),
                                      z3.BitVecVal(cap, wide_cap, ctx)))
        differs = z3.ZeroExt(wide - cone.width, encoder.term(cone)) != reference
        solver = z3.Solver(ctx=ctx)
        left = self.budget.remaining()
        seconds = _STEP_SECONDS if left is None else min(left, _STEP_SECONDS)
        self.stats["solver_calls"] += 1
        answer = check_within(solver, seconds, constraints + [differs])
        if answer == z3.unsat:
            self.proved.add(key)
            return None
        if answer != z3.sat:
            return "unknown"
        wanted = list(step_digits) + ([prefix] if prefix is not None else [])
        return encoder.leaf_values(solver.model(), wanted)

    # the invalid-digit flag ----------------------------------------------------------------
    def flag(self):
        """One query over the flag's cone: 1 exactly for digits above 9 (0 for valid inputs
        in the contract)."""
        import z3

        from ..model.smt import Z3Encoder, check_within

        problem = self.problem
        encoder = Z3Encoder(z3.Context())
        # Only the flag's part of the problem's miter: the stages proved the binary output.
        flag = problem.checked[1]
        ctx = encoder.ctx
        x = encoder.term(problem.x)
        valid = z3.And(*[z3.ULE(z3.Extract(4 * i + 3, 4 * i, x), z3.BitVecVal(9, 4, ctx))
                         for i in range(problem.digit_count)])
        f = encoder.term(flag)
        one, zero = z3.BitVecVal(1, flag.width, ctx), z3.BitVecVal(0, flag.width, ctx)
        in_contract = valid
        if problem.limit is not None:
            wide = problem.check_width()
            value = z3.BitVecVal(0, wide, ctx)
            for i in reversed(range(problem.digit_count)):
                value = value * 10 + z3.ZeroExt(wide - 4, z3.Extract(4 * i + 3, 4 * i, x))
            in_contract = z3.And(valid, z3.ULE(value, z3.BitVecVal(problem.limit, wide, ctx)))
        wrong = z3.Or(z3.And(in_contract, f != zero), z3.And(z3.Not(valid), f != one))
        solver = z3.Solver(ctx=ctx)
        left = self.budget.remaining()
        answer = check_within(solver, left, [wrong])
        self.stats["obligations"] += 1
        if answer == z3.unsat:
            return PROVED, None, ""
        if answer != z3.sat:
            return UNKNOWN, None, "the solver did not settle the invalid-digit flag"
        value = encoder.leaf_values(solver.model(), [problem.x])[problem.x.id]
        found = problem.replay(value)
        if found is None:
            return UNKNOWN, None, (f"the solver's flag counterexample {value:#x} did not replay "
                                   f"as wrong; please report this")
        return DISPROVED, found, ""

"""Checking many inputs at once, bit-parallel, and confirming the failures by replay.

The simulation engines (random, exhaustive) hand a batch of inputs to :class:`LaneChecker`,
which simulates the problem's ``digits_ok`` node for every lane in one pass (one machine
word per bit holds one bit of every lane).  A lane whose result is a known 0 is wrong for
every choice of the free leaves; a lane whose result is unknown (it depends on an untied
input or an unknown value) is settled by :meth:`Bin2BcdProblem.replay`, which asks z3 with
that input fixed.  Whatever is reported comes out of ``replay``, never out of the batch.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Sequence

from ..model.node import Op, mask
from ..spec.replaying import ReplayUndecided
from .base import Counterexample

# Unknown lanes cost one z3 query each; past this many in one check, stop and say so.
UNKNOWN_LANE_LIMIT = 256


@dataclass
class BatchResult:
    """What one batch showed: a confirmed counterexample, or how many lanes passed."""

    passed: int = 0
    counterexample: Counterexample | None = None
    settled_unknown: int = 0              # lanes with unknown results settled right by z3
    gave_up: bool = False                 # stopped before the end of the batch: see stop_reason
    stop_reason: str = ""


@dataclass
class LaneChecker:
    """Bit-parallel check of one problem's digits on batches of inputs."""

    problem: object
    # A hunt (it can only disprove) may run the unknown values (FREE leaves) fixed at 0: the
    # two-valued program is several times smaller than the ternary one.  Every lane is then
    # only as good as that one choice, so a passing lane proves nothing (never use this
    # where a pass counts, as in exhaustive simulation) and a failing lane is a suspect
    # for replay, not a known failure.
    fix_unknown_values: bool = False
    settled_total: int = 0
    _simulator: object = field(default=None, repr=False)
    _others: list = field(default_factory=list, repr=False)

    def __post_init__(self) -> None:
        from ..model.simulate import Simulator

        shared = self.fix_unknown_values and hasattr(self.problem, "lane_simulator")
        self._simulator = Simulator([self.problem.digits_ok()], shareable=shared)
        if shared:
            # The stage engine's mining extends this lowering instead of lowering the
            # design again (it runs after auto's hunt on the same problem).
            self.problem.lane_simulator = self._simulator
        # Untied inputs and unknown values stay unknown: the simulator is ternary and sound.
        self._others = [leaf for leaf in self._simulator.leaves if leaf is not self.problem.x]

    def check_values(self, values: Sequence[int]) -> BatchResult:
        """Check the inputs ``values`` (each within the input's width), in that lane order."""
        from ..model.simulate import pack

        if not values:
            return BatchResult()
        planes = pack(list(values), self.problem.width)
        return self._check(len(values), planes, lambda lane: values[lane])

    def check_range(self, low: int, count: int) -> BatchResult:
        """Check the contract's inputs number ``low .. low + count - 1`` (lane j holds
        ``problem.domain_value(low + j)``; for bin2bcd that is ``low + j``)."""
        problem = self.problem
        return self._check(count, problem.domain_planes(low, count),
                           lambda lane: problem.domain_value(low + lane))

    def _check(self, lanes: int, x_planes: list[int], value_of) -> BatchResult:
        all_lanes = mask(lanes)
        given = {self.problem.x.id: x_planes}
        unknown = {}
        for leaf in self._others:
            if leaf.op != Op.FREE:          # an untied input: any value, so unknown
                given[leaf.id] = [0] * leaf.width
                unknown[leaf.id] = [all_lanes] * leaf.width
            elif self.fix_unknown_values:
                given[leaf.id] = [0] * leaf.width
        result = self._simulator.run(lanes, given, unknown)[0]
        known_bad = ~result.value[0] & ~result.unknown[0] & all_lanes
        unknown = result.unknown[0] & all_lanes
        if self.fix_unknown_values and any(leaf.op == Op.FREE for leaf in self._others):
            # Wrong for the one choice simulated, maybe right for the others: replay decides.
            unknown |= known_bad
            known_bad = 0
        suspects = known_bad | unknown
        batch = BatchResult()
        while suspects:
            lane = (suspects & -suspects).bit_length() - 1
            suspects &= suspects - 1
            if not known_bad >> lane & 1:
                if self.settled_total >= UNKNOWN_LANE_LIMIT:
                    batch.gave_up = True
                    batch.passed = lane
                    batch.stop_reason = (
                        f"more than {UNKNOWN_LANE_LIMIT} inputs give outputs that depend on "
                        f"unknown values (untied inputs or x); tie the inputs with --tie or use "
                        f"--engine smt")
                    return batch
                self.settled_total += 1
                batch.settled_unknown += 1
            try:
                found = self.problem.replay(value_of(lane))
            except ReplayUndecided as undecided:
                batch.gave_up = True
                batch.passed = lane
                batch.stop_reason = str(undecided)
                return batch
            if found is not None:
                batch.counterexample = found
                batch.passed = lane
                return batch
            if known_bad >> lane & 1:
                raise AssertionError(f"the bit-parallel simulator and the scalar model disagree "
                                     f"at input {value_of(lane)}")
        batch.passed = lanes
        return batch



def shrink(checker: LaneChecker, found: Counterexample, budget=None,
           rounds: int = 64) -> Counterexample:
    """A smaller failing input than ``found``'s, when one is near: a user reads 10 better
    than 0x07ffffffffffffff.

    Each round simulates, in one batch, the input with one of its set bits cleared and with
    its low bits cleared, and keeps the smallest that still fails (confirmed by replay).
    Stops when no candidate fails, after ``rounds`` rounds, or when ``budget`` runs out.
    """
    problem = checker.problem
    best = found
    for _ in range(rounds):
        if budget is not None and budget.expired():
            break
        x = problem.input_value(best)
        candidates = {x & ~(1 << bit) for bit in range(problem.width) if x >> bit & 1}
        candidates |= {x & ~mask(bit) for bit in range(1, problem.width + 1)}
        smaller = sorted(c for c in candidates if c < x and problem.in_domain(c))
        if not smaller:
            break
        result = checker.check_values(smaller)
        if result.counterexample is None:
            break
        best = result.counterexample
    return best

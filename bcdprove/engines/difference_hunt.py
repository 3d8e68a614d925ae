"""Looking for a difference between two designs by bit-parallel simulation.

Both designs' outputs are simulated on the same vectors in one pass over the combined graph:
corner values of every input first (0, all ones, powers of two and of ten and their
neighbours), then random values (half of them with the top bits forced to one, so the high
digits see large values).  Unknown values (``x`` in either design) get values too: zero in
the corner vectors, random ones afterwards, since a difference for any choice of them is a
difference.  A lane where some output pair differs is shrunk (bits cleared while a difference
remains) and replayed on both models before it is returned; the hunt alone never proves.
"""
from __future__ import annotations

import random
import time
from dataclasses import dataclass
from typing import Sequence

from ..model.node import Node, mask
from ..model.simulate import Simulator, pack
from .base import Budget
from ..spec.inputs import corner_values, random_values

CHUNK = 1 << 12
SHRINK_SECONDS = 2.0


@dataclass
class HuntResult:
    vectors: int                              # vectors simulated without a difference
    counterexample: object = None             # an EquivalenceCounterexample, replayed
    shrunk_from: dict | None = None           # the inputs first found, before shrinking


def corner_vectors(leaves: Sequence[Node], rng: random.Random) -> list[dict[int, int]]:
    """Corner values of every input, as many vectors as the input with the most corners has.

    A single input walks through its corners in order; with several inputs each walks its own
    list, and a shuffled copy of each is added so the corners also meet in other combinations.
    """
    lists = [corner_values(leaf.width, mask(leaf.width)) for leaf in leaves]
    if not lists:
        return [{}]
    count = max(len(values) for values in lists)
    vectors = [{leaf.id: values[k % len(values)] for leaf, values in zip(leaves, lists)}
               for k in range(count)]
    if len(leaves) > 1:
        shuffled = [rng.sample(values, len(values)) for values in lists]
        vectors += [{leaf.id: values[k % len(values)] for leaf, values in zip(leaves, shuffled)}
                    for k in range(count)]
    return vectors


class DifferenceHunt:
    """Simulates the outputs of both designs of ``problem`` side by side (see the module doc)."""

    def __init__(self, problem, seed: int = 1):
        self.problem = problem
        self.rng = random.Random(seed)
        self.simulator = Simulator(problem.roots)
        self.inputs = problem.input_leaves()
        self.frees = problem.free_leaves()

    # vectors -------------------------------------------------------------------------------
    def random_vectors(self, count: int) -> list[dict[int, int]]:
        columns = {leaf.id: random_values(leaf.width, mask(leaf.width), count, self.rng)
                   for leaf in self.inputs}
        columns.update({leaf.id: [self.rng.getrandbits(leaf.width) for _ in range(count)]
                        for leaf in self.frees})
        return [{leaf_id: column[k] for leaf_id, column in columns.items()} for k in range(count)]

    def differing_lanes(self, vectors: Sequence[dict[int, int]]) -> list[int]:
        """Indexes of the vectors at which some output pair differs (simulation only)."""
        lanes = len(vectors)
        if lanes == 0:
            return []
        planes = {leaf.id: pack([v.get(leaf.id, 0) for v in vectors], leaf.width)
                  for leaf in self.simulator.leaves}
        results = self.simulator.run(lanes, planes)
        half = len(self.problem.outputs)
        differ = 0
        for out_a, out_b in zip(results[:half], results[half:]):
            for plane_a, plane_b in zip(out_a.value, out_b.value):
                differ |= plane_a ^ plane_b
        differ &= mask(lanes)
        found = []
        while differ:
            low = differ & -differ
            found.append(low.bit_length() - 1)
            differ ^= low
        return found

    # the hunt ---------------------------------------------------------------------------------
    def run(self, count: int, budget: Budget) -> HuntResult:
        """Corners, then ``count`` random vectors in chunks, until a replayed difference."""
        checked = 0
        batches = [corner_vectors(self.inputs, self.rng)]
        left = count
        while batches or left > 0:
            if budget.expired():
                break
            if batches:
                batch = batches.pop()
            else:
                size = min(CHUNK, left)
                left -= size
                batch = self.random_vectors(size)
            lanes = self.differing_lanes(batch)
            if lanes:
                return self.confirm([batch[k] for k in lanes], checked, budget)
            checked += len(batch)
        return HuntResult(checked)

    def confirm(self, candidates: Sequence[dict[int, int]], checked: int,
                budget: Budget) -> HuntResult:
        """Shrink the smallest candidate and replay it on both models."""
        first = min(candidates, key=self._size)
        smallest = self.shrink(first, budget)
        found = self.problem.replay(smallest)
        if found is None:
            raise AssertionError("the simulated difference did not replay on the models; the "
                                 "simulator and the scalar evaluation disagree")
        shrunk_from = None
        if smallest != first:
            shrunk_from = {pair.name_a: first.get(pair.leaf.id, 0) for pair in self.problem.inputs}
        return HuntResult(checked, found, shrunk_from)

    def _size(self, vector: dict[int, int]) -> tuple:
        """Smaller reads better: the input values first, then the unknown values chosen."""
        return (sum(vector.get(leaf.id, 0) for leaf in self.inputs),
                [vector.get(leaf.id, 0) for leaf in self.inputs],
                sum(vector.get(leaf.id, 0).bit_count() for leaf in self.frees))

    def shrink(self, vector: dict[int, int], budget: Budget) -> dict[int, int]:
        """A vector with fewer bits set at which the outputs still differ (greedy, bounded)."""
        started = time.monotonic()
        current = dict(vector)
        while time.monotonic() - started < SHRINK_SECONDS and not budget.expired():
            trials = []
            for leaf in self.inputs + self.frees:
                value = current.get(leaf.id, 0)
                if not value:
                    continue
                trials.append({**current, leaf.id: 0})
                for k in range(leaf.width):
                    if value >> k & 1:
                        trials.append({**current, leaf.id: value & ~(1 << k)})
                    if k and value >> k:     # a right shift keeps the pattern, smaller
                        trials.append({**current, leaf.id: value >> k})
            if not trials:
                break
            lanes = self.differing_lanes(trials)
            if not lanes:
                break
            best = min((trials[k] for k in lanes), key=self._size)
            if self._size(best) >= self._size(current):
                break
            current = best
        return current


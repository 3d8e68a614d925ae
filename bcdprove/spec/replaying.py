"""The replay every specification shares: confirm a counterexample on the model itself.

A problem mixes in :class:`ReplaysOnModel` and supplies ``x``, ``width``, the caches ``_free``,
``_simulator`` and ``_encoder`` (None at first), ``_replayed_nodes()`` (the output nodes a replay reads), ``_compare(x, values)`` (a replayed
Counterexample when the outputs are wrong with every leaf given, else None) and
``_wrong_terms(encoder, x)`` (z3 terms, one of which holds when an output is wrong at ``x``).
"""
from __future__ import annotations

from typing import Mapping

from ..engines.base import Counterexample
from ..model.node import Node, Op, leaves, mask


class ReplayUndecided(Exception):
    """z3 could not say whether some choice of unknown values makes the outputs wrong at an
    input; the caller must not count that input as right (engines turn this into unknown)."""


REPLAY_SOLVER_SECONDS = 60


class ReplaysOnModel:
    """``replay`` and the three-valued and z3 helpers behind it (see the module docstring)."""

    def free_leaves(self) -> list[Node]:
        """Leaves besides ``x`` the replayed outputs depend on: untied inputs, unknown values."""
        if self._free is None:
            self._free = [n for n in leaves(self._replayed_nodes()) if n is not self.x]
        return list(self._free)

    def port_of(self, leaf: Node) -> str | None:
        """The input port an INPUT leaf stands for (None for unknown values)."""
        return leaf.params[0] if leaf.op == Op.INPUT else None

    def replay(self, x: int, free_values: Mapping[int, int] | None = None) -> Counterexample | None:
        """Simulate the model at ``x``; a replayed Counterexample when an output is wrong, else None.

        Free leaves missing from ``free_values`` are unknown: a three-valued simulation shows
        whether the outputs depend on them at ``x``.  When they do not, the outputs are
        compared as they are, and the counterexample names no unknown value as chosen (none
        matters there); when they do, zero is tried for each, and if that gives right outputs
        z3 looks (with ``x`` fixed) for a choice that makes one wrong.  None therefore means
        right for every choice.  Raises ReplayUndecided when z3 cannot settle it.
        """
        if not 0 <= x <= mask(self.width):
            raise ValueError(f"input {x} does not fit in {self.width} bits")
        given = dict(free_values or {})
        unchosen = [leaf for leaf in self.free_leaves() if leaf.id not in given]
        trial = dict(given)
        trial.update({leaf.id: 0 for leaf in unchosen})
        found = self._compare(x, trial)
        depends = bool(unchosen) and self._depends_on_unknowns(x, given)
        if found is not None and unchosen and not depends:
            for leaf in unchosen:
                found.free_values.pop(leaf.id, None)
        if found is None and depends:
            choice = self._solve_free(x, given, unchosen)
            if choice is not None:
                found = self._compare(x, choice)
                if found is None:
                    raise AssertionError("z3 choice of free values did not replay as wrong; "
                                         "the model and its z3 translation disagree")
        return found

    def _run_ternary(self, lanes: int, x_planes: list[int], given: Mapping[int, int]):
        """Three-valued simulation of the replayed nodes: ``x`` on its planes, the leaves in
        ``given`` at their values, every other input unknown, unknown values as they are."""
        from ..model.simulate import Simulator, pack

        if self._simulator is None:
            self._simulator = Simulator(self._replayed_nodes())
        everyone = mask(lanes)
        values, unknown = {self.x.id: x_planes}, {}
        for leaf in self._simulator.leaves:
            if leaf is self.x:
                continue
            if leaf.id in given:
                values[leaf.id] = pack([given[leaf.id]] * lanes, leaf.width)
            elif leaf.op != Op.FREE:       # an input must be given: mark it unknown instead
                values[leaf.id] = [0] * leaf.width
                unknown[leaf.id] = [everyone] * leaf.width
        return self._simulator.run(lanes, values, unknown)

    def _depends_on_unknowns(self, x: int, given: Mapping[int, int]) -> bool:
        """Whether some output bit at ``x`` is unknown with the unchosen free leaves unknown."""
        from ..model.simulate import pack

        planes = self._run_ternary(1, pack([x], self.width), given)
        return any(any(p.unknown) for p in planes)

    def _solve_free(self, x: int, given: dict[int, int],
                    unchosen: list[Node]) -> dict[int, int] | None:
        import z3

        from ..model.smt import Z3Encoder, check_within

        if self._encoder is None:
            self._encoder = Z3Encoder()
        encoder = self._encoder
        differs = self._wrong_terms(encoder, x)
        if not differs:
            return None
        solver = z3.Solver(ctx=encoder.ctx)
        solver.add(encoder.term(self.x) == x)
        by_id = {leaf.id: leaf for leaf in self.free_leaves()}
        for leaf_id, value in given.items():
            if leaf_id in by_id:
                solver.add(encoder.term(by_id[leaf_id]) == value)
        solver.add(z3.Or(*differs))
        # Bounded so a replay can never hang a check; past it the replay is undecided and
        # the engine's answer becomes unknown, never a guess.
        answer = check_within(solver, REPLAY_SOLVER_SECONDS)
        if answer == z3.unknown:
            raise ReplayUndecided(f"the solver could not settle input {x} with its unknown "
                                  f"values: {solver.reason_unknown()}")
        if answer != z3.sat:
            return None
        values = dict(given)
        values.update(encoder.leaf_values(solver.model(), unchosen))
        return values

"""The part every specification besides binary-to-BCD shares: one input leaf, checked outputs.

A specification built on :class:`CheckedOutputsProblem` says, for each input value ``x`` of
its input leaf, which value every checked output node must have (or that the output does
not matter there).  From that alone this module gives the engines what they need of any
problem: a scalar replay that confirms a counterexample (with unknown values settled by z3
with ``x`` fixed), the free leaves, and the port values of a counterexample.  The subclass
supplies the contract (which ``x`` are checked, in which order an exhaustive run visits
them), the 1-bit "right" node the bit-parallel engines simulate, and the z3 miter.

The engine-facing interface (shared with :class:`~bcdprove.spec.bin2bcd.Bin2BcdProblem`):
``spec``, ``x``, ``width``, ``input_ports``, ``free_leaves()``, ``digits_ok()``,
``replay(x, free)``, ``input_value(found)``, ``domain_size()``, ``domain_value(i)``,
``domain_planes(low, count)``, ``in_domain(x)``, ``corner_inputs()``,
``random_inputs(count, rng)``, ``contract_words()``, ``span_words(low, high)``,
``miter(encoder, form)``.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Mapping, Optional

from ..engines.base import Counterexample
from ..model.design import Model
from ..model.node import Node, Op, evaluate, leaves, mask, topological
from .bin2bcd import REPLAY_SOLVER_SECONDS, ReplayUndecided


@dataclass
class Expectation:
    """What the outputs must show at one input.

    ``values[i]`` is the value checked output ``i`` must have, None where it does not
    matter; ``impossible`` (a sentence) when no output value can be right, e.g. a value too
    large for the output.
    """

    values: list[Optional[int]]
    impossible: str = ""


@dataclass
class CheckedOutputsProblem:
    """Base of the bcd2bin and signed problems; see the module docstring."""

    model: Model
    input_ports: list[str]
    output_ports: list[str]
    reasons: list[str]
    x: Node
    width: int
    checked: list[Node]                       # output nodes, in the order of Expectation.values
    checked_names: list[str]                  # a label per checked node, for reports
    ties: dict[str, int] = field(default_factory=dict)
    _free: list | None = field(default=None, repr=False, compare=False)
    _order: list | None = field(default=None, repr=False, compare=False)
    _simulator: object = field(default=None, repr=False, compare=False)
    _encoder: object = field(default=None, repr=False, compare=False)

    spec = "checked outputs"
    max_input = None           # bin2bcd's --max-input; the contracts here are their own
    msd_first = False

    # to be supplied -----------------------------------------------------------------
    def expectation(self, x: int) -> Expectation:
        raise NotImplementedError

    def input_fields(self, x: int) -> dict[str, int]:
        """The value of every data input port at ``x``."""
        return {self.input_ports[0]: x}

    # shared --------------------------------------------------------------------------
    def free_leaves(self) -> list[Node]:
        """Leaves besides ``x`` the checked outputs depend on: untied inputs, unknown values."""
        if self._free is None:
            self._free = [n for n in leaves(self.checked) if n is not self.x]
        return list(self._free)

    def port_of(self, leaf: Node) -> str | None:
        return leaf.params[0] if leaf.op == Op.INPUT else None

    def input_value(self, found: Counterexample) -> int:
        """The value of ``x`` a counterexample of this problem was found at."""
        fields = self.input_fields(0)
        value = 0
        offset = 0
        for name in fields:
            value |= found.inputs[name] << offset
            offset += self.model.port(name).width
        return value

    def evaluate(self, x: int, free_values: Mapping[int, int] | None = None) -> list[int]:
        """The checked outputs at ``x`` with every free leaf given (scalar, ``apply_op``)."""
        if self._order is None:
            self._order = topological(self.checked)
        values = dict(free_values or {})
        values[self.x.id] = x
        return evaluate(self.checked, values, self._order)

    def replay(self, x: int, free_values: Mapping[int, int] | None = None) -> Counterexample | None:
        """A replayed Counterexample when the outputs are wrong at ``x``, else None.

        Free leaves missing from ``free_values`` are unknown: when a three-valued simulation
        shows the outputs depend on them at ``x`` and zeros give right outputs, z3 looks
        (with ``x`` fixed) for a choice that makes an output wrong.  None therefore means
        right for every choice.  Raises ReplayUndecided when z3 cannot settle it.
        """
        if not 0 <= x <= mask(self.width):
            raise ValueError(f"input {x} does not fit in {self.width} bits")
        given = dict(free_values or {})
        unchosen = [leaf for leaf in self.free_leaves() if leaf.id not in given]
        trial = dict(given)
        trial.update({leaf.id: 0 for leaf in unchosen})
        found = self._compare(x, trial)
        if found is None and unchosen and self._depends_on_unknowns(x, given):
            choice = self._solve_free(x, given, unchosen)
            if choice is not None:
                found = self._compare(x, choice)
                if found is None:
                    raise AssertionError("z3 choice of free values did not replay as wrong; "
                                         "the model and its z3 translation disagree")
        return found

    def note_for(self, x: int, expectation: Expectation) -> str:
        """A sentence for the report about input ``x`` (the subclass may say more)."""
        return expectation.impossible

    def _compare(self, x: int, values: dict[int, int]) -> Counterexample | None:
        expectation = self.expectation(x)
        actual = self.evaluate(x, values)
        wrong = [i for i, (want, got) in enumerate(zip(expectation.values, actual))
                 if want is not None and want != got]
        if not wrong and not expectation.impossible:
            return None
        if not wrong:
            wrong = [i for i, want in enumerate(expectation.values) if want is not None][:1]
        inputs = dict(self.input_fields(x))
        free: dict[int, int] = {}
        for leaf in self.free_leaves():
            value = values.get(leaf.id, 0)
            port = self.port_of(leaf)
            if port is not None:
                inputs[port] = value
            else:
                free[leaf.id] = value
        expected = [got if want is None else want
                    for want, got in zip(expectation.values, actual)]
        return Counterexample(inputs=inputs, expected=expected, actual=actual, wrong=wrong,
                              free_values=free, replayed=True, note=self.note_for(x, expectation))

    def _depends_on_unknowns(self, x: int, given: Mapping[int, int]) -> bool:
        from ..model.simulate import Simulator, pack

        if self._simulator is None:
            self._simulator = Simulator(self.checked)
        values, unknown = {self.x.id: pack([x], self.width)}, {}
        for leaf in self._simulator.leaves:
            if leaf is self.x:
                continue
            if leaf.id in given:
                values[leaf.id] = pack([given[leaf.id]], leaf.width)
            elif leaf.op != Op.FREE:
                values[leaf.id] = [0] * leaf.width
                unknown[leaf.id] = [1] * leaf.width
        planes = self._simulator.run(1, values, unknown)
        return any(any(p.unknown) for p in planes)

    def _solve_free(self, x: int, given: dict[int, int],
                    unchosen: list[Node]) -> dict[int, int] | None:
        import z3

        from ..model.smt import Z3Encoder, check_within

        expectation = self.expectation(x)
        if self._encoder is None:
            self._encoder = Z3Encoder()
        encoder = self._encoder
        solver = z3.Solver(ctx=encoder.ctx)
        solver.add(encoder.term(self.x) == x)
        by_id = {leaf.id: leaf for leaf in self.free_leaves()}
        for leaf_id, value in given.items():
            if leaf_id in by_id:
                solver.add(encoder.term(by_id[leaf_id]) == value)
        differs = [encoder.term(node) != want
                   for node, want in zip(self.checked, expectation.values)
                   if want is not None and want <= mask(node.width)]
        if not differs:
            return None
        solver.add(z3.Or(*differs))
        # Bounded so a replay never hangs a check; past it the engine's answer is unknown.
        answer = check_within(solver, REPLAY_SOLVER_SECONDS)
        if answer == z3.unknown:
            raise ReplayUndecided(f"the solver could not settle input {x} with its unknown "
                                  f"values: {solver.reason_unknown()}")
        if answer != z3.sat:
            return None
        values = dict(given)
        values.update(encoder.leaf_values(solver.model(), unchosen))
        return values


def repeated_planes(pattern: int, period: int, phase: int, lanes: int) -> int:
    """Lanes ``0 .. lanes-1`` of the periodic bit string whose bit ``j`` is bit
    ``(phase + j) % period`` of ``pattern``: built by doubling, no per-lane work."""
    length = period
    word = pattern
    while length < phase + lanes:
        word |= word << length
        length *= 2
    return (word >> phase) & mask(lanes)


def concat_planes(first: list[int], count: int, second: list[int]) -> list[int]:
    """Planes of ``count`` lanes of ``first`` followed by the lanes of ``second``."""
    return [a | (b << count) for a, b in zip(first, second)]

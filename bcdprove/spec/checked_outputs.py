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
from ..model.node import Node, evaluate, mask, topological
from .replaying import ReplaysOnModel


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
class CheckedOutputsProblem(ReplaysOnModel):
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

    def _replayed_nodes(self) -> list[Node]:
        return self.checked

    def _wrong_terms(self, encoder, x: int) -> list:
        return [encoder.term(node) != want
                for node, want in zip(self.checked, self.expectation(x).values)
                if want is not None and want <= mask(node.width)]


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

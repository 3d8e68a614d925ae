"""The binary-to-BCD specification: every output nibble is the matching decimal digit of the input.

:func:`build_problem` turns a combinational :class:`~bcdprove.model.design.Model` into a
:class:`Bin2BcdProblem`: the binary input ``x`` (W bits), the digit nodes (4 bits each,
least significant first, a trimmed top digit zero-extended, tied inputs substituted away),
and the reference the engines compare against (Python's ``int``/``str``).  Every engine
decides the same question: is there an ``x`` in the contract (``x <= max_input``), and a
choice of every free leaf (untied inputs, unknown values), for which some digit differs
from the decimal digit of ``x``?
"""
from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Mapping

from ..engines.base import Counterexample
from ..errors import BcdproveError
from ..model.design import Model
from ..model.node import Node, evaluate, mask, substitute, topological
from .replaying import ReplaysOnModel
from .ports import choose_input, choose_outputs


def decimal_digits(value: int, count: int) -> list[int]:
    """The ``count`` lowest decimal digits of ``value``, least significant first (from ``str``)."""
    text = str(value)[::-1]
    return [int(text[i]) if i < len(text) else 0 for i in range(count)]


def digits_needed(value: int) -> int:
    """How many decimal digits ``value`` has (at least one, for zero)."""
    return len(str(value))


@dataclass
class Bin2BcdProblem(ReplaysOnModel):
    """One binary-to-BCD check, ready for any engine (see the module docstring)."""

    model: Model
    input_ports: list[str]
    output_ports: list[str]
    reasons: list[str]
    x: Node
    width: int
    digits: list[Node]
    max_input: int | None = None
    ties: dict[str, int] = field(default_factory=dict)
    msd_first: bool = False
    digit_sources: list[str] = field(default_factory=list)   # "bcd[7:4]" per digit, for reports
    _ok_node: Node | None = field(default=None, repr=False, compare=False)
    # The random hunt's lane simulator of digits_ok, kept shareable so that the stage
    # engine's mining extends its lowering rather than lowering the design a second time.
    lane_simulator: object = field(default=None, repr=False, compare=False)
    _simulator: object = field(default=None, repr=False, compare=False)
    _encoder: object = field(default=None, repr=False, compare=False)
    _free: list | None = field(default=None, repr=False, compare=False)
    _order: list | None = field(default=None, repr=False, compare=False)

    spec = "bin2bcd"

    # reference -------------------------------------------------------------------------
    @property
    def digit_count(self) -> int:
        """D, the number of digits the design shows."""
        return len(self.digits)

    @property
    def top_value(self) -> int:
        """The largest input in the contract."""
        return mask(self.width) if self.max_input is None else self.max_input

    def expected_digits(self, x: int) -> list[int]:
        """The D lowest decimal digits of ``x``, least significant first (Python ``str``)."""
        return decimal_digits(x, self.digit_count)

    def needed_digits(self) -> int:
        """Digits the largest input in the contract needs (for 2**W - 1: OEIS A034887)."""
        return digits_needed(self.top_value)

    def capacity(self) -> int:
        """10**D: the smallest value D digits cannot show."""
        return 10 ** self.digit_count

    def fits(self) -> bool:
        """Whether D digits can show every input in the contract."""
        return self.top_value < self.capacity()

    def below_capacity(self) -> "Bin2BcdProblem":
        """The same problem restricted to inputs below 10**D (the check of the digits present)."""
        return replace(self, max_input=min(self.top_value, self.capacity() - 1))

    def check_width(self) -> int:
        """Bits enough for both ``x`` and any D-digit value, plus one so nothing wraps."""
        return max(self.width, (self.capacity() - 1).bit_length()) + 1

    def digits_ok(self) -> Node:
        """A 1-bit node, 1 exactly when the digits are right for ``x``.

        Right means every digit is at most 9 and ``sum(d_i * 10**i) == x`` at
        :meth:`check_width` bits; a digit vector with every digit at most 9 is a unique
        representation, so this is digit-for-digit equality with the decimal digits of ``x``
        (and it is 0 for every ``x`` of 10**D or more).  Built from shifts and adds only, so a
        bit-parallel simulator evaluates it cheaply.
        """
        if self._ok_node is None:
            graph = self.model.graph
            wide = self.check_width()
            three, one = graph.const(3, wide), graph.const(1, wide)
            value = graph.zero(wide)
            ok = graph.const(1, 1)
            for digit in reversed(self.digits):
                ok = graph.and_(ok, graph.ult(digit, graph.const(10, 4)))
                # 10 * v == 8 * v + 2 * v
                value = graph.add(graph.add(graph.shl(value, three), graph.shl(value, one)),
                                  graph.zext(digit, wide))
            self._ok_node = graph.and_(ok, graph.eq(value, graph.zext(self.x, wide)))
        return self._ok_node

    # the contract as the engines walk it (see spec/checked_outputs.py for the interface) ----
    def input_value(self, found: Counterexample) -> int:
        """The binary input a counterexample was found at."""
        return found.inputs[self.input_ports[0]]

    def in_domain(self, x: int) -> bool:
        return 0 <= x <= self.top_value

    def domain_size(self) -> int:
        """How many inputs the contract holds: 0 .. top_value."""
        return self.top_value + 1

    def domain_value(self, index: int) -> int:
        return index

    def domain_planes(self, low: int, count: int) -> list[int]:
        """Planes of the inputs ``low .. low + count - 1``, one per lane."""
        from ..model.simulate import counting_planes

        return counting_planes(low, count, self.width)

    def span_words(self, low: int, high: int) -> str:
        return f"{low:,} .. {high:,}"

    def contract_words(self) -> str:
        return (f"every input 0 .. {self.top_value:,}" if self.max_input is not None
                else f"every {self.width}-bit input")

    def corner_inputs(self) -> list[int]:
        from .inputs import corner_values

        return corner_values(self.width, self.top_value)

    def random_inputs(self, count: int, rng) -> list[int]:
        from .inputs import random_values

        return random_values(self.width, self.top_value, count, rng)

    # replay --------------------------------------------------------------------------------
    def evaluate(self, x: int, free_values: Mapping[int, int] | None = None) -> list[int]:
        """The digits the model shows at ``x`` with every free leaf given in ``free_values``.

        Scalar evaluation with the operator semantics of ``apply_op``, independent of the
        bit-parallel simulator, so a replay also cross-checks the engines' simulation.
        """
        if self._order is None:
            self._order = topological(self.digits)
        values = dict(free_values or {})
        values[self.x.id] = x
        return evaluate(self.digits, values, self._order)

    def shows_right(self, xs: list[int], free_values: Mapping[int, int] | None = None) -> list[bool]:
        """Per input in ``xs``: whether the digits are right for every choice of the free leaves
        not in ``free_values`` (three-valued bit-parallel simulation; sound, may say False for
        a right input whose digits the simulation cannot pin down)."""
        from ..model.simulate import pack

        if not xs:
            return []
        lanes = len(xs)
        planes = self._run_ternary(lanes, pack(xs, self.width), dict(free_values or {}))
        result = []
        for lane, x in enumerate(xs):
            if x >= self.capacity():
                result.append(False)
                continue
            right = True
            for digit, expected in zip(planes, self.expected_digits(x)):
                if any(u >> lane & 1 for u in digit.unknown):
                    right = False
                    break
                if sum((v >> lane & 1) << i for i, v in enumerate(digit.value)) != expected:
                    right = False
                    break
            result.append(right)
        return result

    def _replayed_nodes(self) -> list[Node]:
        return self.digits

    def _wrong_terms(self, encoder, x: int) -> list:
        return [encoder.term(d) != e for d, e in zip(self.digits, self.expected_digits(x))]

    def _compare(self, x: int, values: dict[int, int]) -> Counterexample | None:
        actual = self.evaluate(x, values)
        shown = max(self.digit_count, digits_needed(x))
        expected = decimal_digits(x, shown)
        wrong = [i for i in range(shown)
                 if (actual[i] if i < self.digit_count else 0) != expected[i]]
        if not wrong:
            return None
        inputs = {self.input_ports[0]: x}
        free: dict[int, int] = {}
        for leaf in self.free_leaves():
            value = values.get(leaf.id, 0)
            port = self.port_of(leaf)
            if port is not None:
                inputs[port] = value
            else:
                free[leaf.id] = value
        note = ""
        if x >= self.capacity():
            note = (f"{x} needs {digits_needed(x)} digits; the design shows "
                    f"{self.digit_count}")
        return Counterexample(inputs=inputs, expected=expected, actual=actual, wrong=wrong,
                              free_values=free, replayed=True, note=note)


def _parse_ties(model: Model, ties: Mapping[str, int] | None) -> dict[str, int]:
    result: dict[str, int] = {}
    for name, value in (ties or {}).items():
        port = next((p for p in model.ports if p.name == name), None)
        if port is None or port.direction != "input":
            raise BcdproveError(f"--tie {name}={value}: `{model.top}` has no input port `{name}`")
        if not 0 <= int(value) <= mask(port.width):
            raise BcdproveError(f"--tie {name}={value}: does not fit the {port.width}-bit input")
        result[name] = int(value)
    return result


def _split_digits(model: Model, output_ports: list[str],
                  msd_first: bool) -> tuple[list[Node], list[str]]:
    """Cut the output ports into 4-bit digit nodes, least significant first."""
    graph = model.graph
    digits: list[Node] = []
    sources: list[str] = []
    for position, name in enumerate(output_ports):
        port = model.port(name)
        last = position == len(output_ports) - 1
        if port.width % 4 and not last and port.width > 4:
            raise BcdproveError(f"output `{name}` is {port.width} bits: only the most significant "
                                f"digit port may hold a trimmed digit", *_where(port))
        if port.width <= 4:
            if port.width < 4 and not last:
                raise BcdproveError(f"output `{name}` is {port.width} bits: only the most "
                                    f"significant digit may be narrower than 4 bits", *_where(port))
            digits.append(graph.zext(port.node, 4))
            sources.append(name if port.width == 1 else f"{name}[{port.width - 1}:0]")
            continue
        count = -(-port.width // 4)
        if msd_first and port.width % 4:
            raise BcdproveError(f"output `{name}` is {port.width} bits, not whole nibbles; "
                                f"with --msd-first every digit must be 4 bits", *_where(port))
        nibbles = []
        for k in range(count):
            hi = min(4 * k + 3, port.width - 1)
            nibbles.append((graph.zext(graph.extract(port.node, hi, 4 * k), 4),
                            f"{name}[{hi}:{4 * k}]"))
        if msd_first:
            nibbles.reverse()
        digits.extend(n for n, _ in nibbles)
        sources.extend(s for _, s in nibbles)
    return digits, sources


def _where(port) -> tuple:
    return (port.loc.file, port.loc.line) if port.loc else ()


def build_problem(model: Model, inputs: list[str] | None = None, outputs: list[str] | None = None,
                  msd_first: bool = False, max_input: int | None = None,
                  ties: Mapping[str, int] | None = None) -> Bin2BcdProblem:
    """The check of ``model`` against the binary-to-BCD specification.

    ``inputs``/``outputs`` name ports (outputs least significant digit first); missing ones
    are inferred.  ``msd_first``: the low nibble of a packed output (and index 0 of numbered
    digit ports) is the most significant digit.  ``ties`` holds inputs at constants, which are
    substituted away.  Raises BcdproveError for a clocked model, an ambiguous or unknown port,
    a bad tie or a ``max_input`` outside the input's range.
    """
    if model.is_clocked:
        names = ", ".join(r.name for r in model.registers[:4])
        first = model.registers[0].loc
        raise BcdproveError(f"module `{model.top}` has registers ({names}); checking clocked "
                            f"converters is not supported yet, only combinational ones",
                            *((first.file, first.line) if first else ()))
    tie_values = _parse_ties(model, ties)
    input_name, input_reason = choose_input(model, inputs, tie_values)
    output_names, output_reason, _ = choose_outputs(model, outputs, msd_first)
    in_port = model.port(input_name)
    width = in_port.width
    if max_input is not None and not 0 <= max_input <= mask(width):
        raise BcdproveError(f"--max-input {max_input} is outside the {width}-bit input "
                            f"`{input_name}` (0 .. {mask(width)})")
    digits, sources = _split_digits(model, output_names, msd_first)
    reasons = [input_reason, output_reason]
    if tie_values:
        mapping = {}
        for name, value in tie_values.items():
            port = model.port(name)
            mapping[port.node.id] = model.graph.const(value, port.width)
        digits = substitute(model.graph, digits, mapping)
        reasons.append("tied: " + ", ".join(f"`{n}` = {v}" for n, v in tie_values.items()))
    if in_port.signed:
        reasons.append(f"input `{input_name}` is declared signed; its bits are read as an "
                       f"unsigned value")
    return Bin2BcdProblem(model=model, input_ports=[input_name], output_ports=output_names,
                          reasons=reasons, x=in_port.node, width=width, digits=digits,
                          max_input=max_input, ties=tie_values, msd_first=msd_first,
                          digit_sources=sources)

"""The signed specification: a two's-complement input shown as a sign and magnitude digits.

:func:`build_problem` turns a combinational model into a :class:`SignedProblem`: the input
``x`` (``W`` bits, two's complement), a sign output that must be 1 exactly for a negative
``x``, and ``D`` digit outputs (4 bits each, least significant first, cut as for bin2bcd)
that must be the decimal digits of ``|x|`` (Python ``int``/``str`` as reference).

The magnitude of the most negative value, ``-2**(W-1)``, is ``2**(W-1)``, one more than the
largest positive value, so it sets the digit count the width needs.  (A power of two above 1
is never a power of ten, so in fact ``2**(W-1)`` never needs more digits than
``2**(W-1) - 1``; the report still names both, since a design that computes the magnitude at
``W - 1`` bits gets exactly this one value wrong.)
"""
from __future__ import annotations

import random as _random
from dataclasses import dataclass, field, replace
from typing import Mapping, Optional

from ..errors import BcdproveError
from ..model.design import Model
from ..model.node import Node, mask, substitute, to_signed
from .bin2bcd import _parse_ties, _split_digits, _where, decimal_digits, digits_needed
from .checked_outputs import CheckedOutputsProblem, Expectation, concat_planes
from .ports import choose_input, choose_outputs, refuse_clocked

_SIGN_WORDS = ("sign", "neg", "minus")


@dataclass
class SignedProblem(CheckedOutputsProblem):
    """One signed check: ``checked`` is ``[sign, digit 0, digit 1, ...]``.  ``max_magnitude``:
    only inputs with ``|x|`` at most this are checked (None: every ``W``-bit input)."""

    digit_count: int = 0
    digit_sources: list[str] = field(default_factory=list)
    sign_port: str = ""
    max_magnitude: Optional[int] = None
    substitution: dict = field(default_factory=dict)   # tied port node id -> its constant
    _ok_node: Node | None = field(default=None, repr=False, compare=False)

    spec = "signed"

    # values ------------------------------------------------------------------------------
    def signed_value(self, x: int) -> int:
        return to_signed(x, self.width)

    def magnitude(self, x: int) -> int:
        return abs(self.signed_value(x))

    def raw(self, value: int) -> int:
        """The ``W``-bit pattern of the integer ``value``."""
        return value & mask(self.width)

    @property
    def most_negative(self) -> int:
        return -(1 << (self.width - 1))

    @property
    def largest_positive(self) -> int:
        return (1 << (self.width - 1)) - 1

    @property
    def top_magnitude(self) -> int:
        top = 1 << (self.width - 1)
        return top if self.max_magnitude is None else min(top, self.max_magnitude)

    # contract ------------------------------------------------------------------------------
    def capacity(self) -> int:
        """10**D, the smallest magnitude D digits cannot show."""
        return 10 ** self.digit_count

    def needed_digits(self) -> int:
        """Digits the magnitude of ``-2**(W-1)`` needs (the largest magnitude)."""
        return digits_needed(1 << (self.width - 1))

    def needed_digits_positive(self) -> int:
        return digits_needed(self.largest_positive)

    def fits(self) -> bool:
        return self.top_magnitude < self.capacity()

    def below_capacity(self) -> "SignedProblem":
        return replace(self, max_magnitude=min(self.top_magnitude, self.capacity() - 1),
                       _ok_node=None, _simulator=None, _encoder=None)

    def too_large_witness(self) -> int:
        """The input of smallest magnitude D digits cannot show (positive when it exists)."""
        if self.capacity() <= self.largest_positive:
            return self.capacity()
        return self.raw(self.most_negative)

    def too_small_note(self) -> str:
        witness = self.signed_value(self.too_large_witness())
        return (f"{witness:,} is the value of smallest magnitude {self.digit_count} digits "
                f"cannot show; {self.width} bits need {self.needed_digits()} digits "
                f"(for {self.most_negative:,})")

    def too_small_words(self) -> str:
        return (f"too few digits: magnitudes {self.capacity():,} .. {self.top_magnitude:,} "
                f"cannot be shown")

    def expectation(self, x: int) -> Expectation:
        negative = x >> (self.width - 1) & 1
        magnitude = self.magnitude(x)
        values: list[Optional[int]] = [negative] + decimal_digits(magnitude, self.digit_count)
        if magnitude >= self.capacity():
            return Expectation(values, impossible=(
                f"magnitude {magnitude:,} needs {digits_needed(magnitude)} digits; the design "
                f"shows {self.digit_count}"))
        return Expectation(values)

    def describe_input(self, x: int) -> str:
        return f"{self.signed_value(x):,}"

    # domain ----------------------------------------------------------------------------------
    def _positive_count(self) -> int:
        if self.max_magnitude is None:
            return self.largest_positive + 1
        return min(self.top_magnitude, self.largest_positive) + 1

    def in_domain(self, x: int) -> bool:
        return 0 <= x <= mask(self.width) and self.magnitude(x) <= self.top_magnitude

    def domain_size(self) -> int:
        """Every ``W``-bit input, or those with ``|x| <= max_magnitude``: 0, 1, .. first,
        then the negative ones from the most negative up to -1 (the order of their bits)."""
        if self.max_magnitude is None:
            return 1 << self.width
        return self._positive_count() + self.top_magnitude

    def domain_value(self, index: int) -> int:
        if self.max_magnitude is None:
            return index
        positives = self._positive_count()
        if index < positives:
            return index
        return (1 << self.width) - self.top_magnitude + (index - positives)

    def domain_planes(self, low: int, count: int) -> list[int]:
        from ..model.simulate import counting_planes

        if self.max_magnitude is None:
            return counting_planes(low, count, self.width)
        positives = self._positive_count()
        first = max(0, min(count, positives - low))
        head = counting_planes(low, first, self.width) if first else [0] * self.width
        if first == count:
            return head
        tail = counting_planes(self.domain_value(low + first), count - first, self.width)
        return concat_planes(head, first, tail)

    def span_words(self, low: int, high: int) -> str:
        """Indices ``low .. high`` of the contract's order (0, 1, ..., then the negative
        values from the most negative up) as ranges of signed values."""
        positives = self._positive_count()
        parts = []
        if low < positives:
            parts.append(f"{low:,} .. {min(high, positives - 1):,}")
        if high >= positives:
            first = self.signed_value(self.domain_value(max(low, positives)))
            parts.append(f"{first:,} .. {self.signed_value(self.domain_value(high)):,}")
        return " and ".join(parts)

    def contract_words(self) -> str:
        if self.max_magnitude is None:
            return f"every {self.width}-bit two's-complement input"
        return f"every {self.width}-bit input with magnitude at most {self.top_magnitude:,}"

    def corner_inputs(self) -> list[int]:
        """0, +-1, +-2, the extremes, +-(10**k - 1, 10**k, 10**k + 1), +-(2**k - 1, 2**k)."""
        picks = [0, 1, -1, 2, -2, self.largest_positive, self.most_negative,
                 self.most_negative + 1]
        power = 10
        while power <= 1 << self.width:
            picks += [power - 1, power, power + 1, -power + 1, -power, -power - 1]
            power *= 10
        for k in range(1, self.width):
            picks += [(1 << k) - 1, 1 << k, -(1 << k) + 1, -(1 << k)]
        seen: set[int] = set()
        result = []
        for value in picks:
            if not self.most_negative <= value <= self.largest_positive:
                continue
            raw = self.raw(value)
            if self.in_domain(raw) and raw not in seen:
                seen.add(raw)
                result.append(raw)
        return result

    def random_inputs(self, count: int, rng: _random.Random) -> list[int]:
        """Uniform inputs, and every other one near an extreme (large magnitudes)."""
        values = []
        for i in range(count):
            raw = rng.getrandbits(self.width)
            if i % 2:
                near = rng.getrandbits(rng.randint(1, self.width - 1))
                raw = self.raw(self.most_negative + near) if i % 4 == 1 else self.largest_positive - near
            if not self.in_domain(raw):
                raw = self.domain_value(rng.randrange(self.domain_size()))
            values.append(raw)
        return values

    # nodes -------------------------------------------------------------------------------
    def check_width(self) -> int:
        return max(self.width, (self.capacity() - 1).bit_length()) + 1

    def digits_ok(self) -> Node:
        """1 exactly when sign and digits are right at ``x``, or ``x`` is outside the contract."""
        if self._ok_node is None:
            graph = self.model.graph
            wide = self.check_width()
            negative = graph.extract(self.x, self.width - 1, self.width - 1)
            magnitude = graph.ite(negative, graph.neg(self.x), self.x)
            sign = self.checked[0]
            ok = graph.eq(sign, graph.zext(negative, sign.width))
            three, one = graph.const(3, wide), graph.const(1, wide)
            value = graph.zero(wide)
            for digit in reversed(self.checked[1:]):
                ok = graph.and_(ok, graph.ult(digit, graph.const(10, 4)))
                value = graph.add(graph.add(graph.shl(value, three), graph.shl(value, one)),
                                  graph.zext(digit, wide))
            ok = graph.and_(ok, graph.eq(value, graph.zext(magnitude, wide)))
            if self.max_magnitude is not None:
                inside = graph.ule(graph.zext(magnitude, wide),
                                   graph.const(self.max_magnitude, wide))
                ok = graph.or_(graph.not_(inside), ok)
            self._ok_node = ok
        return self._ok_node

    def miter(self, encoder, form: str = "") -> list:
        """z3 assertions: ``x`` in the contract and the sign or some digit wrong
        (multiplicative form: not every digit <= 9 with ``sum(d_i 10**i) == |x|``)."""
        import z3

        ctx = encoder.ctx
        wide = self.check_width()
        x = encoder.term(self.x)
        negative = z3.Extract(self.width - 1, self.width - 1, x) == 1
        magnitude = z3.ZeroExt(wide - self.width, z3.If(negative, -x, x))
        sign = encoder.term(self.checked[0])
        expected_sign = z3.If(negative, z3.BitVecVal(1, self.checked[0].width, ctx),
                              z3.BitVecVal(0, self.checked[0].width, ctx))
        value = z3.BitVecVal(0, wide, ctx)
        in_range = []
        for digit in reversed(self.checked[1:]):
            d = encoder.term(digit)
            in_range.append(z3.ULE(d, z3.BitVecVal(9, 4, ctx)))
            value = value * 10 + z3.ZeroExt(wide - 4, d)
        wrong = z3.Or(sign != expected_sign, z3.Not(z3.And(*in_range, value == magnitude)))
        if self.max_magnitude is None:
            return [wrong]
        return [wrong, z3.ULE(magnitude, z3.BitVecVal(self.max_magnitude, wide, ctx))]


def _choose_sign(model: Model, sign: str | None) -> tuple[str, str]:
    if sign is not None:
        port = next((p for p in model.ports if p.name == sign), None)
        if port is None or port.direction != "output":
            known = ", ".join(p.name for p in model.outputs) or "none"
            raise BcdproveError(f"--sign {sign}: `{model.top}` has no output port `{sign}` "
                                f"(outputs: {known})")
        if port.width != 1:
            raise BcdproveError(f"--sign {sign}: the sign output must be 1 bit, `{sign}` is "
                                f"{port.width} bits", *_where(port))
        return port.name, f"output `{port.name}`: the sign, named with --sign"
    named = [p for p in model.outputs if p.width == 1
             and any(word in p.name.lower() for word in _SIGN_WORDS)]
    if len(named) == 1:
        return named[0].name, (f"output `{named[0].name}`: the sign, the only 1-bit output "
                               f"named like one (sign, neg, minus)")
    raise BcdproveError("--spec signed needs the sign output: name it with --sign PORT "
                        "(the output that is 1 for a negative input)")


def build_problem(model: Model, inputs: list[str] | None = None, outputs: list[str] | None = None,
                  ties: Mapping[str, int] | None = None, sign: str | None = None) -> SignedProblem:
    """The check of ``model`` against the signed specification (see the module docstring).

    Raises BcdproveError for a clocked model, a missing or ambiguous sign, data input or
    digit output, a sign port among the digit ports, or a bad tie.
    """
    refuse_clocked(model, "signed")
    tie_values = _parse_ties(model, ties)
    input_name, input_reason = choose_input(model, inputs, tie_values)
    sign_name, sign_reason = _choose_sign(model, sign)
    if outputs and sign_name in outputs:
        raise BcdproveError(f"--out {','.join(outputs)}: `{sign_name}` is the sign output, "
                            f"not a digit")
    output_names, output_reason, _ = choose_outputs(model, outputs, False, exclude=(sign_name,))
    in_port = model.port(input_name)
    width = in_port.width
    if width < 2:
        raise BcdproveError(f"input `{input_name}` is 1 bit: a two's-complement input needs "
                            f"at least 2", *_where(in_port))
    digits, sources = _split_digits(model, output_names, False)
    checked = [model.port(sign_name).node] + digits
    reasons = [input_reason + " (two's complement)", sign_reason, output_reason]
    mapping = {model.port(n).node.id: model.graph.const(v, model.port(n).width)
               for n, v in tie_values.items()}
    if tie_values:
        checked = substitute(model.graph, checked, mapping)
        reasons.append("tied: " + ", ".join(f"`{n}` = {v}" for n, v in tie_values.items()))
    return SignedProblem(model=model, input_ports=[input_name], output_ports=output_names,
                         reasons=reasons, x=in_port.node, width=width, checked=checked,
                         checked_names=[sign_name] + sources, ties=tie_values,
                         digit_count=len(digits), digit_sources=sources, sign_port=sign_name,
                         substitution=mapping)

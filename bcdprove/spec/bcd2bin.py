"""The BCD-to-binary specification: the output is the number the input digits spell.

:func:`build_problem` turns a combinational model into a :class:`Bcd2BinProblem`.  The
input is ``D`` decimal digits, 4 bits each, least significant first, packed in one port or
split over several (``tens``/``ones``, ``bcd3``..``bcd0``); they are joined into one input
leaf ``x`` (digit ``i`` in bits ``4i+3 .. 4i``) so every engine sees one input.  The output
is a ``W``-bit binary port.

Contract (Python ``int`` is the reference):

- for every input whose digits are all at most 9, the output equals ``sum(d_i * 10**i)``;
- inputs with a digit above 9 are outside the contract, unless ``invalid_flag`` names an
  output: then that output must be 1 exactly for them and 0 for every valid input.  For an
  invalid input the binary output is *not* checked (a design may show anything there, the
  flag tells the reader to ignore it).
- An output too narrow for ``10**D - 1`` is reported by the caller (:func:`fits`) with the
  smallest value it cannot hold, ``2**W``; ``below_capacity`` restricts the check to
  values below it.
"""
from __future__ import annotations

import random as _random
from dataclasses import dataclass, field, replace
from typing import Mapping, Optional

from ..errors import BcdproveError
from ..model.design import Model
from ..model.node import Node, mask, substitute
from .bin2bcd import _parse_ties, _where
from .checked_outputs import CheckedOutputsProblem, Expectation, repeated_planes
from .ports import choose_digit_inputs, choose_value_output, refuse_clocked


def to_bcd(value: int) -> int:
    """Packed BCD of ``value``: one nibble per decimal digit (Python ``str`` as reference)."""
    return int(str(value), 16)


def digits_of(packed: int, count: int) -> list[int]:
    """The ``count`` nibbles of ``packed``, least significant first (may be above 9)."""
    return [packed >> (4 * i) & 0xF for i in range(count)]


def bcd_value(packed: int, count: int) -> Optional[int]:
    """``sum(d_i * 10**i)`` of the nibbles, or None when some nibble is above 9."""
    nibbles = digits_of(packed, count)
    if any(d > 9 for d in nibbles):
        return None
    return sum(d * 10 ** i for i, d in enumerate(nibbles))


@dataclass
class Bcd2BinProblem(CheckedOutputsProblem):
    """One BCD-to-binary check (see the module docstring).

    ``checked`` is ``[binary output]`` or ``[binary output, invalid flag]``.  ``limit``:
    only valid inputs whose value is at most ``limit`` are checked (None: all).
    """

    digit_count: int = 0
    out_width: int = 0
    flag_port: Optional[str] = None
    limit: Optional[int] = None
    substitution: dict = field(default_factory=dict)   # port node id -> its node in terms of x
    _ok_node: Node | None = field(default=None, repr=False, compare=False)

    spec = "bcd2bin"

    # contract ---------------------------------------------------------------------------
    @property
    def top_value(self) -> int:
        """The largest value of the valid inputs in the contract."""
        top = 10 ** self.digit_count - 1
        return top if self.limit is None else min(top, self.limit)

    def capacity(self) -> int:
        """2**W: the smallest value the output cannot hold."""
        return 1 << self.out_width

    def needed_bits(self) -> int:
        """Bits the output needs for ``10**D - 1``."""
        return max(1, (10 ** self.digit_count - 1).bit_length())

    def fits(self) -> bool:
        return self.top_value < self.capacity()

    def below_capacity(self) -> "Bcd2BinProblem":
        """The same check for valid inputs below 2**W only (what the output can hold)."""
        return replace(self, limit=min(self.top_value, self.capacity() - 1), _ok_node=None,
                       _simulator=None, _encoder=None)

    def too_small_note(self) -> str:
        return (f"{self.capacity():,} is the smallest value the {self.out_width}-bit output "
                f"`{self.output_ports[0]}` cannot hold; {self.digit_count} digits reach "
                f"{10 ** self.digit_count - 1:,}, which needs {self.needed_bits()} bits")

    def too_small_words(self) -> str:
        return (f"output too narrow: values {self.capacity():,} .. {self.top_value:,} cannot "
                f"be shown")

    def too_large_witness(self) -> int:
        """The input spelling 2**W, the smallest value the output cannot hold."""
        return to_bcd(self.capacity())

    def expectation(self, x: int) -> Expectation:
        value = bcd_value(x, self.digit_count)
        if value is None:
            return Expectation([None, 1] if self.flag_port else [None])
        values: list[Optional[int]] = [value] + ([0] if self.flag_port else [])
        if value > mask(self.out_width):
            return Expectation(values, impossible=(
                f"{value} needs {value.bit_length()} bits; the output `{self.output_ports[0]}` "
                f"has {self.out_width}"))
        return Expectation(values)

    def note_for(self, x: int, expectation: Expectation) -> str:
        if expectation.values[0] is None:
            return (f"digit above 9 (nibbles {self.nibble_text(x)}): the flag "
                    f"`{self.flag_port}` must be 1; the binary output is not checked")
        return expectation.impossible

    def input_fields(self, x: int) -> dict[str, int]:
        fields, offset = {}, 0
        for name in self.input_ports:
            width = self.model.port(name).width
            fields[name] = x >> offset & mask(width)
            offset += width
        return fields

    def nibble_text(self, x: int) -> str:
        """The input digits most significant first, e.g. ``9 9`` or ``0 A``."""
        return " ".join(format(d, "X") for d in reversed(digits_of(x, self.digit_count)))

    def in_domain(self, x: int) -> bool:
        value = bcd_value(x, self.digit_count)
        if value is None:
            return self.flag_port is not None
        return value <= self.top_value

    def domain_size(self) -> int:
        """Valid inputs up to the limit; with a flag every nibble pattern (16**D)."""
        if self.flag_port is not None:
            return 1 << self.width
        return self.top_value + 1

    def domain_value(self, index: int) -> int:
        return index if self.flag_port is not None else to_bcd(index)

    def domain_planes(self, low: int, count: int) -> list[int]:
        """Planes of ``domain_value(low) ..`` for ``count`` lanes, built per plane."""
        if self.flag_port is not None:
            from ..model.simulate import counting_planes
            return counting_planes(low, count, self.width)
        planes = []
        for i in range(self.digit_count):
            run = 10 ** i
            period = 10 * run
            for bit in range(4):
                pattern = 0
                for digit in range(10):
                    if digit >> bit & 1:
                        pattern |= mask(run) << (digit * run)
                planes.append(repeated_planes(pattern, period, low % period, count))
        return planes

    def span_words(self, low: int, high: int) -> str:
        if self.flag_port is not None:
            return f"0x{low:x} .. 0x{high:x} as nibble patterns"
        return f"{low:,} .. {high:,} as decimal numbers"

    def contract_words(self) -> str:
        if self.flag_port is not None:
            return (f"every {self.digit_count}-digit input, all 16**{self.digit_count} nibble "
                    f"patterns (digits above 9 must raise `{self.flag_port}`)")
        limit = "" if self.limit is None else f" up to {self.top_value:,}"
        return f"every input of {self.digit_count} valid digits{limit}"

    # inputs for the simulation engines -----------------------------------------------------
    def corner_inputs(self) -> list[int]:
        """Values where converters break (0, 1, powers of ten and two and their neighbours,
        the largest), then with a flag nibbles 10 and 15 at every position."""
        top = self.top_value
        picks = [0, 1, 2, 9, top, top - 1]
        power = 10
        while power <= top + 1:
            picks += [power - 1, power, power + 1]
            power *= 10
        for k in range(1, top.bit_length() + 1):
            picks += [(1 << k) - 1, 1 << k, (1 << k) + 1]
        seen: set[int] = set()
        result = []
        for value in picks:
            if 0 <= value <= top and value not in seen:
                seen.add(value)
                result.append(to_bcd(value))
        if self.flag_port is not None:
            for i in range(self.digit_count):
                result += [0xA << (4 * i), 0xF << (4 * i)]
            result.append(mask(self.width))
        return result

    def random_inputs(self, count: int, rng: _random.Random) -> list[int]:
        """Half uniform valid digits, half with the top digits all 9 (every partial value
        then reaches its largest); with a flag every other one has a nibble above 9."""
        values = []
        top = self.top_value
        for i in range(count):
            digits = [rng.randint(0, 9) for _ in range(self.digit_count)]
            if i % 2:
                for k in range(rng.randint(1, self.digit_count)):
                    digits[-1 - k] = 9
            value = sum(d * 10 ** j for j, d in enumerate(digits))
            if value > top:
                value = rng.randint(0, top)
            packed = to_bcd(value)
            if self.flag_port is not None and i % 4 >= 2:
                position = rng.randrange(self.digit_count)
                packed = packed & ~(0xF << 4 * position) | rng.randint(10, 15) << 4 * position
            values.append(packed)
        return values

    # the 1-bit node and the miter -----------------------------------------------------------
    def check_width(self) -> int:
        return max(self.out_width, (10 ** self.digit_count - 1).bit_length()) + 1

    def _value_nodes(self):
        graph = self.model.graph
        wide = self.check_width()
        three, one = graph.const(3, wide), graph.const(1, wide)
        value = graph.zero(wide)
        valid = graph.const(1, 1)
        for i in reversed(range(self.digit_count)):
            digit = graph.extract(self.x, 4 * i + 3, 4 * i)
            valid = graph.and_(valid, graph.ult(digit, graph.const(10, 4)))
            value = graph.add(graph.add(graph.shl(value, three), graph.shl(value, one)),
                              graph.zext(digit, wide))
        return valid, value

    def digits_ok(self) -> Node:
        """1 exactly when the outputs are right at ``x`` or ``x`` is outside the contract."""
        if self._ok_node is None:
            graph = self.model.graph
            wide = self.check_width()
            valid, value = self._value_nodes()
            out = graph.zext(self.checked[0], wide)
            right = graph.eq(out, value)
            in_contract = valid
            if self.limit is not None:
                in_contract = graph.and_(valid, graph.ule(value, graph.const(self.limit, wide)))
            if self.flag_port is not None:
                flag = self.checked[1]
                flag_low = graph.eq(flag, graph.zero(flag.width))
                flag_one = graph.eq(flag, graph.const(1, flag.width))
                checked_valid = graph.ite(in_contract, graph.and_(right, flag_low),
                                          graph.const(1, 1))
                self._ok_node = graph.ite(valid, checked_valid, flag_one)
            else:
                self._ok_node = graph.or_(graph.not_(in_contract), right)
        return self._ok_node

    def miter(self, encoder, form: str = "") -> list:
        """z3 assertions: ``x`` in the contract and some checked output wrong.  ``form`` is
        the bin2bcd miter choice and has no meaning here (one multiplicative form)."""
        import z3

        wide = self.check_width()
        value = z3.BitVecVal(0, wide, encoder.ctx)
        valid = []
        x = encoder.term(self.x)
        for i in reversed(range(self.digit_count)):
            digit = z3.Extract(4 * i + 3, 4 * i, x)
            valid.append(z3.ULE(digit, z3.BitVecVal(9, 4, encoder.ctx)))
            value = value * 10 + z3.ZeroExt(wide - 4, digit)
        all_valid = z3.And(*valid)
        out = z3.ZeroExt(wide - self.out_width, encoder.term(self.checked[0]))
        in_contract = all_valid
        if self.limit is not None:
            in_contract = z3.And(all_valid, z3.ULE(value, z3.BitVecVal(self.limit, wide, encoder.ctx)))
        wrong_value = z3.And(in_contract, out != value)
        if self.flag_port is None:
            return [wrong_value]
        flag = encoder.term(self.checked[1])
        width = self.checked[1].width
        one = z3.BitVecVal(1, width, encoder.ctx)
        zero = z3.BitVecVal(0, width, encoder.ctx)
        return [z3.Or(wrong_value, z3.And(in_contract, flag != zero),
                      z3.And(z3.Not(all_valid), flag != one))]

    # counterexamples for reports --------------------------------------------------------
    def describe_input(self, x: int) -> str:
        value = bcd_value(x, self.digit_count)
        spelled = "digit above 9" if value is None else f"= {value:,}"
        return f"digits {self.nibble_text(x)} ({spelled})"


def _split_inputs(model: Model, names: list[str]) -> int:
    total = 0
    for position, name in enumerate(names):
        port = model.port(name)
        if port.width % 4:
            raise BcdproveError(f"input `{name}` is {port.width} bits: every BCD input digit "
                                f"must be 4 bits (a port holds whole digits)", *_where(port))
        total += port.width
    return total


def build_problem(model: Model, inputs: list[str] | None = None, outputs: list[str] | None = None,
                  ties: Mapping[str, int] | None = None,
                  invalid_flag: str | None = None) -> Bcd2BinProblem:
    """The check of ``model`` against the BCD-to-binary specification.

    ``inputs``: digit input ports, least significant digit first (inferred when missing,
    e.g. ``ones``/``tens``, ``bcd0``..``bcd3``, or the only input); ``outputs``: the one
    binary output (inferred when missing); ``invalid_flag``: the output that must be 1
    exactly when a digit is above 9.  Raises BcdproveError for a clocked model, ports that
    do not exist, are ambiguous or are not whole digits, or a bad tie.
    """
    refuse_clocked(model, "bcd2bin")
    tie_values = _parse_ties(model, ties)
    input_names, input_reason = choose_digit_inputs(model, inputs, tie_values)
    if invalid_flag is not None:
        flag = next((p for p in model.ports if p.name == invalid_flag), None)
        if flag is None or flag.direction != "output":
            known = ", ".join(p.name for p in model.outputs) or "none"
            raise BcdproveError(f"--invalid-flag {invalid_flag}: `{model.top}` has no output "
                                f"port `{invalid_flag}` (outputs: {known})")
    output_name, output_reason = choose_value_output(model, outputs,
                                                     exclude=[invalid_flag] if invalid_flag else [])
    if output_name == invalid_flag:
        raise BcdproveError(f"--invalid-flag {invalid_flag} is also the binary output")
    width = _split_inputs(model, input_names)
    graph = model.graph
    out_port = model.port(output_name)
    checked = [out_port.node]
    names = [output_name]
    if invalid_flag is not None:
        checked.append(model.port(invalid_flag).node)
        names.append(invalid_flag)
    if len(input_names) == 1:
        x = model.port(input_names[0]).node
        mapping = {}
    else:
        # One leaf for all digit ports, so the engines see one input.
        x = graph.input("{" + ",".join(reversed(input_names)) + "}", width)
        mapping, offset = {}, 0
        for name in input_names:
            port = model.port(name)
            mapping[port.node.id] = graph.extract(x, offset + port.width - 1, offset)
            offset += port.width
    reasons = [input_reason, output_reason]
    if invalid_flag is not None:
        reasons.append(f"output `{invalid_flag}`: must be 1 exactly when a digit is above 9 "
                       f"(--invalid-flag); there the binary output is not checked")
    for name, value in tie_values.items():
        port = model.port(name)
        mapping[port.node.id] = graph.const(value, port.width)
    if tie_values:
        reasons.append("tied: " + ", ".join(f"`{n}` = {v}" for n, v in tie_values.items()))
    if mapping:
        checked = substitute(graph, checked, mapping)
    return Bcd2BinProblem(model=model, input_ports=input_names, output_ports=[output_name],
                          reasons=reasons, x=x, width=width, checked=checked,
                          checked_names=names, ties=tie_values, digit_count=width // 4,
                          out_width=out_port.width, flag_port=invalid_flag,
                          substitution=mapping)

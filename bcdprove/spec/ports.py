"""Port inference: which input holds the binary value and which outputs hold the digits.

The contract: the data input and the digit outputs are taken from the user's ``--in`` /
``--out`` when given; otherwise they are inferred only when the choice is unambiguous, and
every choice comes with a sentence saying why (for the report).  Anything ambiguous is a
:class:`~bcdprove.errors.BcdproveError` that asks for ``--in PORT`` or ``--out PORT``.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from ..errors import BcdproveError
from ..model.design import Model, Port

# Digit names by place value; an output set named with these is read least significant first.
_PLACE_WORDS: dict[str, int] = {
    "ones": 0, "units": 0, "unit": 0, "one": 0,
    "tens": 1, "ten": 1,
    "hundreds": 2, "hundred": 2,
    "thousands": 3, "thousand": 3,
    "ten_thousands": 4, "tenthousands": 4, "ten_thousand": 4,
    "hundred_thousands": 5, "hundredthousands": 5, "hundred_thousand": 5,
    "millions": 6, "million": 6,
    "ten_millions": 7, "tenmillions": 7, "ten_million": 7,
    "hundred_millions": 8, "hundredmillions": 8, "hundred_million": 8,
    "billions": 9, "billion": 9,
}
# Longest first, so "ten_thousands" is not read as "thousands" with prefix "ten_".
_PLACE_ORDER = sorted(_PLACE_WORDS, key=len, reverse=True)
_NUMBERED = re.compile(r"^(?P<stem>.*?)(?P<index>\d+)(?P<tail>_?[a-z]?)$", re.IGNORECASE)


@dataclass
class PortChoice:
    """The ports taken: one data input, digit outputs least significant digit first."""

    input_port: str
    output_ports: list[str]
    reasons: list[str]
    msd_first_ports: bool = False    # True when numbered ports were read most significant first


def _names(ports: list[Port]) -> str:
    return ", ".join(f"`{p.name}`" for p in ports) or "none"


def choose_input(model: Model, named: list[str] | None, ties: dict[str, int]) -> tuple[str, str]:
    """The data input port and the reason it was taken.

    Raises BcdproveError when a named port is not an input or when the choice is ambiguous.
    """
    if named:
        if len(named) != 1:
            raise BcdproveError(f"--in takes one data input port, got {len(named)}: "
                                f"{', '.join(named)}")
        name = named[0]
        port = _find(model, name, "input")
        if name in ties:
            raise BcdproveError(f"input `{name}` is both the data input and tied with --tie")
        return port.name, f"input `{port.name}`: named with --in"
    candidates = [p for p in model.inputs if p.name not in ties]
    if len(candidates) == 1:
        why = "the only input" if not ties else "the only input not tied"
        return candidates[0].name, f"input `{candidates[0].name}`: {why}"
    wide = [p for p in candidates if p.width > 1]
    if len(wide) == 1:
        narrow = [p for p in candidates if p.width == 1]
        return wide[0].name, (f"input `{wide[0].name}`: the only input wider than one bit "
                              f"({_names(narrow)} left free: tie them with --tie PORT=VALUE)")
    if not candidates and ties:
        raise BcdproveError(f"every input of `{model.top}` is tied ({', '.join(ties)}); the "
                            f"binary input cannot be tied: drop it from --tie")
    if not candidates:
        raise BcdproveError(f"module `{model.top}` has no input port to read the binary value from")
    raise BcdproveError(f"module `{model.top}` has several data inputs ({_names(candidates)}); "
                        f"name the binary input with --in PORT")


def _find(model: Model, name: str, direction: str) -> Port:
    for p in model.ports:
        if p.name == name:
            if p.direction != direction:
                raise BcdproveError(f"port `{name}` of `{model.top}` is an {p.direction}, "
                                    f"not an {direction}")
            return p
    known = ", ".join(p.name for p in model.ports if p.direction == direction)
    raise BcdproveError(f"module `{model.top}` has no {direction} port `{name}` "
                        f"({direction}s: {known or 'none'})")


def choose_outputs(model: Model, named: list[str] | None,
                   msd_first: bool, exclude: tuple[str, ...] = ()) -> tuple[list[str], str, bool]:
    """The digit output ports (least significant first), the reason, and whether numbered
    ports were read most significant first.  Ports in ``exclude`` (a sign output) are
    never inferred as digits.

    Raises BcdproveError when a named port is not an output or the choice is ambiguous.
    """
    if named:
        ports = [_find(model, n, "output") for n in named]
        if len({p.name for p in ports}) != len(ports):
            raise BcdproveError(f"--out names a port twice: {', '.join(named)}")
        if len(ports) == 1:
            return [ports[0].name], f"output `{ports[0].name}`: named with --out", False
        return ([p.name for p in ports],
                f"outputs {_names(ports)}: named with --out, least significant digit first", False)
    outputs = [p for p in model.outputs if p.name not in exclude]
    if not outputs:
        raise BcdproveError(f"module `{model.top}` has no output port to read digits from")
    if len(outputs) == 1:
        why = "the only output" if not exclude else "the only other output"
        return [outputs[0].name], f"output `{outputs[0].name}`: {why}", False
    groups = _digit_groups(outputs, msd_first)
    if len(groups) == 1:
        ordered, pattern = groups[0]
        rest = [p for p in outputs if p.name not in ordered]
        ignored = f"; {_names(rest)} ignored" if rest else ""
        return ordered, (f"outputs {', '.join(f'`{n}`' for n in ordered)}: inferred from the "
                         f"{pattern}, least significant digit first{ignored}"), msd_first
    wide = [p for p in outputs if p.width >= 4]
    if not groups and len(wide) == 1:
        rest = [p for p in outputs if p is not wide[0]]
        return [wide[0].name], (f"output `{wide[0].name}`: the only output at least 4 bits wide "
                                f"({_names(rest)} ignored)"), False
    raise BcdproveError(f"module `{model.top}` has several outputs ({_names(outputs)}) and no "
                        f"single digit naming pattern; name the digit ports with --out PORT "
                        f"(a comma-separated list, least significant digit first)")


def _digit_groups(outputs: list[Port], msd_first: bool) -> list[tuple[list[str], str]]:
    """Sets of outputs (each at most 4 bits) named as a run of digits, least significant first.

    Two naming families are recognised: place words (``ones``, ``tens``, ``hundreds`` ...,
    with any common prefix and suffix) and numbered names (``bcd0``, ``digit_1``, ``d2`` ...),
    whose indices must run 0, 1, 2 ... without gaps.  Only runs of two or more count.
    """
    small = [p for p in outputs if p.width <= 4]
    found: list[tuple[list[str], str]] = []
    by_affix: dict[tuple[str, str], dict[int, str]] = {}
    for p in small:
        lowered = p.name.lower()
        for word in _PLACE_ORDER:
            at = lowered.find(word)
            if at < 0:
                continue
            key = (lowered[:at], lowered[at + len(word):])
            by_affix.setdefault(key, {}).setdefault(_PLACE_WORDS[word], p.name)
            break
    for places in by_affix.values():
        run = _run_from_zero(places)
        if run:
            found.append((run, "place names (ones, tens, hundreds, ...)"))
    by_stem: dict[tuple[str, str], dict[int, str]] = {}
    for p in small:
        match = _NUMBERED.match(p.name)
        if match:
            key = (match.group("stem"), match.group("tail"))
            by_stem.setdefault(key, {})[int(match.group("index"))] = p.name
    for (stem, tail), places in by_stem.items():
        run = _run_from_zero(places)
        if run:
            if msd_first:
                run = run[::-1]
            order = "most significant first (--msd-first)" if msd_first else "index 0 least significant"
            found.append((run, f"numbered names `{stem}0{tail}`.. ({order})"))
    return found


def _run_from_zero(places: dict[int, str]) -> list[str] | None:
    if len(places) < 2 or sorted(places) != list(range(len(places))):
        return None
    return [places[i] for i in range(len(places))]


def choose_digit_inputs(model: Model, named: list[str] | None,
                        ties: dict[str, int]) -> tuple[list[str], str]:
    """The BCD digit input ports (least significant digit first) and the reason.

    Named ports are taken in the order given; otherwise the only untied input, a run of
    inputs named as digits (``ones``/``tens``, ``bcd0``..), or the only input wider than one
    bit.  Raises BcdproveError when a named port is not an input, is tied, or the choice is
    ambiguous.
    """
    if named:
        ports = [_find(model, n, "input") for n in named]
        if len({p.name for p in ports}) != len(ports):
            raise BcdproveError(f"--in names a port twice: {', '.join(named)}")
        tied = [p.name for p in ports if p.name in ties]
        if tied:
            raise BcdproveError(f"input `{tied[0]}` is both a digit input and tied with --tie")
        if len(ports) == 1:
            return [ports[0].name], f"input `{ports[0].name}`: named with --in"
        return ([p.name for p in ports],
                f"inputs {_names(ports)}: named with --in, least significant digit first")
    candidates = [p for p in model.inputs if p.name not in ties]
    if not candidates:
        raise BcdproveError(f"module `{model.top}` has no untied input port to read digits from")
    if len(candidates) == 1:
        why = "the only input" if not ties else "the only input not tied"
        return [candidates[0].name], f"input `{candidates[0].name}`: {why}"
    groups = _digit_groups(candidates, False)
    if len(groups) == 1:
        ordered, pattern = groups[0]
        rest = [p for p in candidates if p.name not in ordered]
        free = f"; {_names(rest)} left free: tie them with --tie PORT=VALUE" if rest else ""
        return ordered, (f"inputs {', '.join(f'`{n}`' for n in ordered)}: inferred from the "
                         f"{pattern}, least significant digit first{free}")
    wide = [p for p in candidates if p.width > 1]
    if not groups and len(wide) == 1:
        narrow = [p for p in candidates if p.width == 1]
        return [wide[0].name], (f"input `{wide[0].name}`: the only input wider than one bit "
                                f"({_names(narrow)} left free: tie them with --tie PORT=VALUE)")
    raise BcdproveError(f"module `{model.top}` has several inputs ({_names(candidates)}) and no "
                        f"single digit naming pattern; name the digit inputs with --in PORT "
                        f"(a comma-separated list, least significant digit first)")


def choose_value_output(model: Model, named: list[str] | None,
                        exclude: list[str]) -> tuple[str, str]:
    """The one output holding a binary value (BCD-to-binary), and the reason.

    ``exclude``: outputs with another role (the invalid-digit flag).  Raises BcdproveError
    for a port that is not an output, several named ports, or an ambiguous choice.
    """
    if named:
        if len(named) != 1:
            raise BcdproveError(f"--out takes one binary output port for --spec bcd2bin, got "
                                f"{len(named)}: {', '.join(named)}")
        port = _find(model, named[0], "output")
        return port.name, f"output `{port.name}`: named with --out"
    outputs = [p for p in model.outputs if p.name not in exclude]
    if not outputs:
        raise BcdproveError(f"module `{model.top}` has no output port for the binary value")
    if len(outputs) == 1:
        why = "the only output" if not exclude else "the only output besides the flag"
        return outputs[0].name, f"output `{outputs[0].name}`: {why}"
    wide = [p for p in outputs if p.width > 1]
    if len(wide) == 1:
        rest = [p for p in outputs if p is not wide[0]]
        return wide[0].name, (f"output `{wide[0].name}`: the only output wider than one bit "
                              f"({_names(rest)} ignored)")
    raise BcdproveError(f"module `{model.top}` has several outputs ({_names(outputs)}); name "
                        f"the binary output with --out PORT")


def refuse_clocked(model, spec: str) -> None:
    """BcdproveError at the first register when ``model`` is clocked: a ``spec`` problem is
    built on a combinational model (clocked ones are unrolled first, bin2bcd only)."""
    if not model.is_clocked:
        return
    names = ", ".join(r.name for r in model.registers[:4])
    first = model.registers[0].loc
    raise BcdproveError(f"module `{model.top}` has registers ({names}); --spec {spec} checks "
                        f"combinational converters only, clocked ones are not supported yet",
                        *((first.file, first.line) if first else ()))

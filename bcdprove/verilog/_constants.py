"""Constants of Verilog source: number literals, real values and the constant math functions.

Contracts:
- :func:`parse_literal` reads the text of a pyverilog ``IntConst`` (IEEE 1364-2005 clause
  3.5.1: sized, unsized, based, signed, with x/z/? digits and ``_``) into a :class:`Literal`.
- :func:`real_to_integer` converts a real to an integer rounding half away from zero
  (clause 4.8.2 / 3.9.2).
- :data:`REAL_FUNCTIONS` maps the names of clause 17.11.2's real math functions (without the
  ``$``) to Python functions of floats.
"""
from __future__ import annotations

import functools
import math
from dataclasses import dataclass
from typing import Callable, Optional


@dataclass(frozen=True)
class Literal:
    """An integer literal: ``value`` holds the known bits, ``unknown`` marks x and z bits.

    ``high_impedance`` marks the z (and ``?``) bits among ``unknown``; ``fill`` is set for the
    SystemVerilog fill literals ``'0 '1 'x 'z``, which take the width of their context.
    """

    width: int
    signed: bool
    value: int
    unknown: int = 0
    high_impedance: int = 0
    sized: bool = True
    fill: Optional[str] = None


_BASES = {"b": 2, "o": 8, "d": 10, "h": 16}
_BITS_PER_DIGIT = {2: 1, 8: 3, 16: 4}


@functools.lru_cache(maxsize=4096)
def parse_literal(text: str) -> Literal:
    """Read a literal's text; raise ValueError (with a message naming it) when malformed."""
    raw = text.replace("_", "").replace(" ", "").replace("\t", "")
    lowered = raw.lower()
    if lowered in ("'0", "'1", "'x", "'z"):
        # The fill literals (IEEE 1800 5.7.1): every bit of the context gets the digit.
        return Literal(1, False, 1 if lowered == "'1" else 0,
                       1 if lowered in ("'x", "'z") else 0, 1 if lowered == "'z" else 0,
                       sized=False, fill=lowered[1])
    if "'" not in lowered:
        if not lowered.isdigit():
            raise ValueError(f"malformed number `{text}`")
        value = int(lowered)
        # Clause 3.5.1: an unsized decimal literal is a 32-bit signed integer (at least).
        return Literal(max(32, value.bit_length() + 1), True, value, sized=False)
    size_text, _, rest = lowered.partition("'")
    signed = rest.startswith("s")
    if signed:
        rest = rest[1:]
    if not rest or rest[0] not in _BASES:
        raise ValueError(f"malformed number `{text}`")
    base = _BASES[rest[0]]
    digits = rest[1:]
    if not digits:
        raise ValueError(f"malformed number `{text}`")
    sized = bool(size_text)
    if sized:
        if not size_text.isdigit() or int(size_text) == 0:
            raise ValueError(f"malformed size in number `{text}`")
        width = int(size_text)
    else:
        width = 32
    value = unknown = high = 0
    if base == 10:
        if digits in ("x", "z", "?"):
            unknown = (1 << width) - 1
            high = unknown if digits != "x" else 0
            natural = width
        elif digits.isdigit():
            value = int(digits)
            natural = max(1, value.bit_length())
        else:
            raise ValueError(f"malformed decimal number `{text}`")
    else:
        step = _BITS_PER_DIGIT[base]
        natural = step * len(digits)
        for char in digits:
            value <<= step
            unknown <<= step
            high <<= step
            if char in "xz?":
                unknown |= (1 << step) - 1
                if char != "x":
                    high |= (1 << step) - 1
            else:
                try:
                    digit = int(char, base)
                except ValueError:
                    raise ValueError(f"malformed digit `{char}` in number `{text}`") from None
                value |= digit
        if not sized:
            width = max(32, natural)
        # Clause 3.5.1: a literal shorter than its size is extended with x or z when its
        # leftmost digit is x or z, otherwise with zeros.
        if natural < width and unknown >> (natural - 1) & 1:
            extension = ((1 << width) - 1) ^ ((1 << natural) - 1)
            unknown |= extension
            if high >> (natural - 1) & 1:
                high |= extension
    keep = (1 << width) - 1
    return Literal(width, signed, value & keep & ~unknown, unknown & keep, high & keep, sized)


def real_to_integer(value: float) -> int:
    """Clause 4.8.2: a real becomes an integer by rounding to nearest, halves away from zero."""
    if math.isnan(value) or math.isinf(value):
        raise ValueError(f"the real value {value} has no integer equivalent")
    magnitude = math.floor(abs(value) + 0.5)
    return int(magnitude) if value >= 0 else -int(magnitude)


def _pow(a: float, b: float) -> float:
    try:
        return math.pow(a, b)
    except (ValueError, ZeroDivisionError):
        return math.nan


def _safe(function: Callable[..., float]) -> Callable[..., float]:
    def run(*args: float) -> float:
        try:
            return function(*args)
        except (ValueError, ZeroDivisionError, OverflowError):
            return math.nan
    return run


REAL_FUNCTIONS: dict[str, tuple[int, Callable[..., float]]] = {
    # name: (number of arguments, function) -- IEEE 1364-2005 clause 17.11.2, Table 17-11
    "ln": (1, _safe(math.log)), "log10": (1, _safe(math.log10)), "exp": (1, _safe(math.exp)),
    "sqrt": (1, _safe(math.sqrt)), "pow": (2, _pow), "floor": (1, _safe(math.floor)),
    "ceil": (1, _safe(math.ceil)), "sin": (1, _safe(math.sin)), "cos": (1, _safe(math.cos)),
    "tan": (1, _safe(math.tan)), "asin": (1, _safe(math.asin)), "acos": (1, _safe(math.acos)),
    "atan": (1, _safe(math.atan)), "atan2": (2, _safe(math.atan2)),
    "hypot": (2, _safe(math.hypot)), "sinh": (1, _safe(math.sinh)),
    "cosh": (1, _safe(math.cosh)), "tanh": (1, _safe(math.tanh)),
    "asinh": (1, _safe(math.asinh)), "acosh": (1, _safe(math.acosh)),
    "atanh": (1, _safe(math.atanh)),
}


def clog2(value: int) -> int:
    """Clause 17.11.1: ceiling of log2, with ``$clog2(0) == 0``."""
    if value <= 1:
        return 0
    return (value - 1).bit_length()

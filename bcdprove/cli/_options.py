"""Parsing the small value languages of the command line: NAME=VALUE pairs and vector files."""
from __future__ import annotations

from typing import Iterable, Optional

from ..errors import BcdproveError


def parse_number(text: str, what: str, file: Optional[str] = None, line: Optional[int] = None) -> int:
    """A decimal, ``0x`` hexadecimal or ``0b`` binary integer (``_`` separators allowed)."""
    cleaned = text.strip().replace("_", "")
    negative = cleaned.startswith("-")
    digits = cleaned[1:] if negative else cleaned
    try:
        if digits[:2].lower() == "0x":
            value = int(digits[2:], 16)
        elif digits[:2].lower() == "0b":
            value = int(digits[2:], 2)
        else:
            if not digits.isdigit():
                raise ValueError
            value = int(digits, 10)
    except (ValueError, IndexError):
        raise BcdproveError(f"{what}: `{text}` is not a number (decimal, 0x... or 0b...)", file, line) from None
    return -value if negative else value


def parse_assignments(items: Iterable[str], what: str, file: Optional[str] = None,
                      line: Optional[int] = None) -> dict[str, int]:
    """``["W=64", "N=0x10"]`` -> ``{"W": 64, "N": 16}``; a name given twice is an error."""
    result: dict[str, int] = {}
    for item in items:
        name, sep, value = item.partition("=")
        name = name.strip()
        if not sep or not name:
            raise BcdproveError(f"{what}: expected NAME=VALUE, got `{item}`", file, line)
        if name in result:
            raise BcdproveError(f"{what}: `{name}` is given twice", file, line)
        result[name] = parse_number(value, f"{what} {name}", file, line)
    return result


def read_vector_file(path: str) -> list[tuple[int, dict[str, int]]]:
    """Vectors from a text file: one per line, ``port=value`` pairs separated by spaces.

    Blank lines and lines starting with ``#`` are skipped.  Returns (line number, vector) pairs.
    """
    try:
        with open(path, encoding="utf-8") as handle:
            lines = handle.read().splitlines()
    except OSError as error:
        raise BcdproveError(f"cannot read vector file: {error.strerror}", path) from None
    except UnicodeDecodeError:
        raise BcdproveError("vector file is not UTF-8 text", path) from None
    vectors = []
    for number, text in enumerate(lines, start=1):
        text = text.strip()
        if not text or text.startswith("#"):
            continue
        vectors.append((number, parse_assignments(text.split(), "vector", path, number)))
    if not vectors:
        raise BcdproveError("vector file holds no vectors", path)
    return vectors


def write_text_file(path: str, text: str, what: str) -> None:
    """Write a report file; a failure is an error naming the file, not a traceback."""
    try:
        with open(path, "w", encoding="utf-8") as handle:
            handle.write(text)
    except OSError as error:
        raise BcdproveError(f"cannot write the {what}: {error.strerror}", path) from None

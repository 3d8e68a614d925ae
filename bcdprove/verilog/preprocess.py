"""The Verilog preprocessor (IEEE 1364-2005 clause 19), keeping a map back to every source line.

Provisional version: concatenates the files and blanks comments; directives follow.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Mapping, Sequence

from ..errors import BcdproveError


@dataclass
class Preprocessed:
    """One source text made from all input files, with the origin of every line.

    ``text`` line n (1-based) came from ``origin(n)`` = (original file, line in that file).
    """

    text: str
    line_map: list[tuple[str, int]] = field(default_factory=list)
    default_nettype: list[tuple[int, str]] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)

    def origin(self, line: int) -> tuple[str, int]:
        """The original (file, line) of 1-based ``line`` of ``text``; clamped into range."""
        if not self.line_map:
            return ("<input>", max(line, 1))
        index = min(max(line, 1), len(self.line_map)) - 1
        return self.line_map[index]


def preprocess(files: Sequence[str], include_dirs: Sequence[str] = (),
               defines: Mapping[str, str] | None = None) -> Preprocessed:
    """Read ``files`` in order and return one preprocessed text (provisional: no directives)."""
    lines: list[str] = []
    line_map: list[tuple[str, int]] = []
    for path in files:
        try:
            with open(path, encoding="utf-8") as handle:
                source = handle.read()
        except (OSError, UnicodeDecodeError) as error:
            raise BcdproveError(f"cannot read file: {error}", path) from None
        for number, line in enumerate(source.split("\n"), start=1):
            lines.append(line)
            line_map.append((path, number))
    return Preprocessed("\n".join(lines) + "\n", line_map)

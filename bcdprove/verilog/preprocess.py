"""The Verilog preprocessor (IEEE 1364-2005 clause 19), keeping a map back to every source line.

Supported: `define (with and without formal arguments, multi-line bodies), `undef,
`ifdef / `ifndef / `elsif / `else / `endif, `include "file", `timescale, `default_nettype,
`resetall, `celldefine / `endcelldefine, `pragma, `begin_keywords / `end_keywords.
Comments become spaces (newlines kept) so that every line of the result maps to exactly one
original line; an expanded macro stays on the line where it was used.
"""
from __future__ import annotations

import os
import re
from dataclasses import dataclass, field
from typing import Mapping, Optional, Sequence

from ..errors import BcdproveError, UnsupportedConstruct

__all__ = ["Preprocessed", "preprocess"]

MAX_INCLUDE_DEPTH = 50
_MAX_EXPANSION_DEPTH = 64
_MAX_EXPANSION_CHARS = 1_000_000   # stops macros that double at every level

_IDENTIFIER = re.compile(r"[A-Za-z_][A-Za-z0-9_$]*")
_NUMBER = re.compile(r"[0-9_]*(\s*'[sS]?[bBoOdDhH]\s*[0-9a-fA-FxXzZ?_]+)?")
_INCLUDE_NAME = re.compile(r'"([^"\n]+)"')

# 1364-2005 clause 19.2: the net types `default_nettype accepts (and "none").
_NET_TYPES = frozenset({"wire", "tri", "tri0", "tri1", "wand", "triand", "wor", "trior",
                        "trireg", "uwire", "none"})

_CONDITIONALS = frozenset({"ifdef", "ifndef", "elsif", "else", "endif"})
# Directives that would change what the design means and that the reader does not model.
_UNSUPPORTED = {
    "line": "`line (it would change the line map)",
    "unconnected_drive": "`unconnected_drive (it changes unconnected input ports)",
    "nounconnected_drive": "`nounconnected_drive",
}
_DIRECTIVES = frozenset({"define", "undef", "include", "timescale", "default_nettype",
                         "resetall", "celldefine", "endcelldefine", "pragma",
                         "begin_keywords", "end_keywords"}) | _CONDITIONALS | set(_UNSUPPORTED)


@dataclass
class Preprocessed:
    """One source text made from all input files, with the origin of every line.

    ``text`` line n (1-based) came from ``origin(n)`` = (original file, line in that file).
    ``default_nettype`` lists (text line, value) for every `default_nettype, in order; a
    `resetall is recorded as (line, "wire") because it restores the default (clause 19.6).
    ``notes`` are remarks for the user about directives that were accepted but ignored.
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
    """Read ``files`` in order and return one preprocessed text.

    ``defines`` are object-like macros defined before the first file (like a command-line
    define).  Macro definitions carry over from one file to the next, as for one compilation
    unit.  Any problem (unreadable file, unknown directive, undefined macro, unterminated
    `ifdef or comment, missing or cyclic include) raises BcdproveError with file and line.
    """
    state = _State(list(include_dirs))
    for name, body in (defines or {}).items():
        if not _IDENTIFIER.fullmatch(name) or name in _DIRECTIVES:
            raise BcdproveError(f"cannot define macro {name!r}: not a valid macro name")
        state.macros[name] = _Macro(name, None, str(body).replace("\n", " "), "<command line>", 0)
    for path in files:
        _Scanner(state, path, _read_source(path, None, 0), depth=0, chain=()).run()
    return Preprocessed("".join(line + "\n" for line in state.lines), state.line_map,
                        state.default_nettype, state.notes)


@dataclass
class _Macro:
    name: str
    formals: Optional[list[str]]     # None: object-like (no parentheses)
    body: str                        # newlines of continued lines kept as "\n"
    file: str
    line: int


@dataclass
class _Branch:
    """One open `ifdef: whether the enclosing text is active, and where it opened."""

    parent_active: bool
    active: bool
    taken: bool                      # some branch of this `ifdef was already chosen
    seen_else: bool
    file: str
    line: int


class _State:
    """What the whole compilation unit shares: macros and the output being built."""

    def __init__(self, include_dirs: list[str]):
        self.include_dirs = include_dirs
        self.macros: dict[str, _Macro] = {}
        self.lines: list[str] = []
        self.line_map: list[tuple[str, int]] = []
        self.default_nettype: list[tuple[int, str]] = []
        self.notes: list[str] = []

    def note(self, message: str) -> None:
        if message not in self.notes:
            self.notes.append(message)


def _read_source(path: str, including: Optional[tuple[str, int]], depth: int) -> str:
    """Read a file as UTF-8 with normalised line ends; errors name the file (and includer)."""
    try:
        with open(path, "rb") as handle:
            raw = handle.read()
    except OSError as error:
        reason = error.strerror or str(error)
        if including:
            raise BcdproveError(f"cannot read included file {path!r}: {reason}",
                                *including) from None
        raise BcdproveError(f"cannot read file: {reason}", path) from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as error:
        line = raw.count(b"\n", 0, error.start) + 1
        raise BcdproveError(f"file is not valid UTF-8 (byte 0x{raw[error.start]:02x})",
                            path, line) from None
    if text.startswith("\ufeff"):
        text = text[1:]
    # Form feed and vertical tab are white space (clause 3.2) but pyverilog's lexer only
    # skips blanks and tabs; a lone carriage return is treated as a blank.
    text = text.replace("\r\n", "\n")
    return text.translate({0x0D: 0x20, 0x0C: 0x20, 0x0B: 0x20})


def _strip_comments(text: str, path: str) -> str:
    """Replace // and /* */ comments by spaces, keeping newlines and string literals."""
    out: list[str] = []
    i, n, line = 0, len(text), 1
    while i < n:
        c = text[i]
        if c == '"':
            j = _string_end(text, i)
            out.append(text[i:j])
            line += text.count("\n", i, j)
            i = j
        elif c == "\\":
            j = _escaped_identifier_end(text, i)
            out.append(text[i:j])
            i = j
        elif text.startswith("//", i):
            j = text.find("\n", i)
            j = n if j < 0 else j
            out.append(" " * (j - i))
            i = j
        elif text.startswith("/*", i):
            j = text.find("*/", i + 2)
            if j < 0:
                raise BcdproveError("unterminated /* comment", path, line)
            chunk = text[i:j + 2]
            out.append("".join("\n" if ch == "\n" else " " for ch in chunk))
            line += chunk.count("\n")
            i = j + 2
        else:
            # Copy up to the next character that may open a string, an escaped name or a
            # comment in one piece (a character loop took 0.2 s on a 0.9 MB netlist).
            found = _PLAIN_RUN_END.search(text, i + 1)
            j = n if found is None else found.start()
            line += text.count("\n", i, j)
            out.append(text[i:j])
            i = j
    return "".join(out)


_PLAIN_RUN_END = re.compile(r'["\\/]')
_SCANNER_STOP = re.compile(r'[\n`"\\]')


def _string_end(text: str, start: int) -> int:
    """Index just past the string literal opening at ``start`` (or at the end of its line)."""
    i, n = start + 1, len(text)
    while i < n:
        c = text[i]
        if c == "\\" and i + 1 < n and text[i + 1] != "\n":
            i += 2
            continue
        if c == '"':
            return i + 1
        if c == "\n":
            return i          # unterminated: the parser reports it
        i += 1
    return n


def _escaped_identifier_end(text: str, start: int) -> int:
    """Index just past an escaped identifier (clause 3.7.1: backslash up to white space)."""
    i, n = start + 1, len(text)
    while i < n and not text[i].isspace():
        i += 1
    return i


class _Scanner:
    """Preprocesses one file's text into the shared output, line by line of the original."""

    def __init__(self, state: _State, path: str, source: str, depth: int,
                 chain: tuple[str, ...]):
        self.state = state
        self.path = path
        self.text = _strip_comments(source, path)
        self.pos = 0
        self.line = 1
        self.current: list[str] = []
        self.branches: list[_Branch] = []
        self.depth = depth
        self.chain = chain + (os.path.realpath(path),)

    # -- output -------------------------------------------------------------------------
    def _flush_line(self) -> None:
        self.state.lines.append("".join(self.current))
        self.state.line_map.append((self.path, self.line))
        self.current = []

    def _newline(self) -> None:
        self._flush_line()
        self.line += 1

    def _error(self, message: str, line: Optional[int] = None) -> BcdproveError:
        return BcdproveError(message, self.path, line or self.line)

    @property
    def _active(self) -> bool:
        return not self.branches or self.branches[-1].active

    # -- main loop ----------------------------------------------------------------------
    def run(self) -> None:
        text, n = self.text, len(self.text)
        while self.pos < n:
            c = text[self.pos]
            if c == "\n":
                self.pos += 1
                self._newline()
            elif c == "`":
                self._backtick()
            elif c == '"':
                # Strings are copied whole, so nothing in them is taken for a directive.
                end = _string_end(text, self.pos)
                if self._active:
                    self.current.append(text[self.pos:end])
                self.pos = end
            elif not self._active:
                self.pos += 1
            elif c == "\\":
                end = _escaped_identifier_end(text, self.pos)
                self.current.append(text[self.pos:end])
                self.pos = end
            else:
                # Plain text up to the next newline, directive, string or escaped name is
                # copied in one piece (no identifier holds any of those characters).
                found = _SCANNER_STOP.search(text, self.pos + 1)
                end = n if found is None else found.start()
                self.current.append(text[self.pos:end])
                self.pos = end
        if self.current or not self.text.endswith("\n"):
            self._flush_line()
        if self.branches:
            opened = self.branches[-1]
            raise BcdproveError("unterminated `ifdef/`ifndef: no `endif before end of file",
                                opened.file, opened.line)

    def _backtick(self) -> None:
        start_line = self.line
        match = _IDENTIFIER.match(self.text, self.pos + 1)
        if not match:
            if not self._active:
                self.pos += 1
                return
            raise self._error("stray ` (expected a compiler directive or macro name)")
        name = match.group()
        self.pos = match.end()
        if name in _CONDITIONALS:
            self._conditional(name, start_line)
        elif not self._active:
            return
        elif name in _UNSUPPORTED:
            raise UnsupportedConstruct(f"unsupported compiler directive {_UNSUPPORTED[name]}",
                                       self.path, start_line)
        elif name in _DIRECTIVES:
            getattr(self, "_directive_" + name)(start_line)
        elif name in self.state.macros:
            self._use_macro(name, start_line)
        elif name == "__LINE__":          # IEEE 1800: the line of the original source
            self.current.append(str(start_line))
        elif name == "__FILE__":
            self.current.append('"' + self.path.replace("\\", "/") + '"')
        else:
            raise self._error(f"undefined macro or unknown compiler directive `{name}",
                              start_line)

    # -- helpers reading the directive's operands ------------------------------------------
    def _skip_blanks(self) -> None:
        while self.pos < len(self.text) and self.text[self.pos] in " \t":
            self.pos += 1

    def _identifier_operand(self, directive: str) -> str:
        self._skip_blanks()
        match = _IDENTIFIER.match(self.text, self.pos)
        if not match:
            raise self._error(f"`{directive} needs a macro name")
        self.pos = match.end()
        return match.group()

    def _rest_of_line(self) -> str:
        end = self.text.find("\n", self.pos)
        end = len(self.text) if end < 0 else end
        rest = self.text[self.pos:end]
        self.pos = end
        return rest.strip()

    # -- conditionals (clause 19.4) -----------------------------------------------------
    def _conditional(self, name: str, line: int) -> None:
        if name in ("ifdef", "ifndef"):
            macro = self._identifier_operand(name)
            defined = macro in self.state.macros
            chosen = self._active and (defined if name == "ifdef" else not defined)
            self.branches.append(_Branch(self._active, chosen, chosen, False, self.path, line))
            return
        if not self.branches:
            raise self._error(f"`{name} without a matching `ifdef or `ifndef", line)
        branch = self.branches[-1]
        if name == "endif":
            self.branches.pop()
            return
        if branch.seen_else:
            raise self._error(f"`{name} after `else in the same `ifdef", line)
        if name == "elsif":
            macro = self._identifier_operand(name)
            chosen = branch.parent_active and not branch.taken and macro in self.state.macros
        else:
            branch.seen_else = True
            chosen = branch.parent_active and not branch.taken
        branch.active = chosen
        branch.taken = branch.taken or chosen

    # -- definitions (clause 19.3) ------------------------------------------------------
    def _directive_define(self, line: int) -> None:
        name = self._identifier_operand("define")
        if name in _DIRECTIVES:
            raise self._error(f"cannot define a macro named like the directive `{name}", line)
        formals: Optional[list[str]] = None
        if self.pos < len(self.text) and self.text[self.pos] == "(":
            close = self.text.find(")", self.pos)
            newline = self.text.find("\n", self.pos)
            if close < 0 or (0 <= newline < close):
                raise self._error(f"`define {name}: unterminated formal argument list", line)
            inside = self.text[self.pos + 1:close]
            formals = [part.strip() for part in inside.split(",")] if inside.strip() else []
            for formal in formals:
                if not _IDENTIFIER.fullmatch(formal):
                    raise self._error(f"`define {name}: bad formal argument {formal!r}", line)
            if len(set(formals)) != len(formals):
                raise self._error(f"`define {name}: formal argument named twice", line)
            self.pos = close + 1
        self.state.macros[name] = _Macro(name, formals, self._macro_body(), self.path, line)

    def _macro_body(self) -> str:
        """Read the macro text up to the first newline not preceded by a backslash."""
        parts: list[str] = []
        while True:
            end = self.text.find("\n", self.pos)
            end = len(self.text) if end < 0 else end
            segment = self.text[self.pos:end]
            self.pos = end
            # A comment after the continuing backslash has become blanks; still a continuation.
            stripped = segment.rstrip(" \t")
            if stripped.endswith("\\") and end < len(self.text):
                parts.append(stripped[:-1])
                self.pos += 1          # the newline is part of the definition
                self._newline()
                continue
            parts.append(segment)
            return "\n".join(parts).strip()

    def _directive_undef(self, line: int) -> None:
        self.state.macros.pop(self._identifier_operand("undef"), None)

    # -- file inclusion (clause 19.5) ---------------------------------------------------
    def _directive_include(self, line: int) -> None:
        self._skip_blanks()
        match = _INCLUDE_NAME.match(self.text, self.pos)
        if not match:
            raise self._error('`include needs a file name in double quotes', line)
        self.pos = match.end()
        name = match.group(1)
        found = self._find_include(name)
        if found is None:
            raise self._error(f"included file {name!r} not found (searched the including "
                              f"file's folder and {len(self.state.include_dirs)} include "
                              f"folder(s))", line)
        if os.path.realpath(found) in self.chain:
            raise self._error(f"include cycle: {name!r} is already being included", line)
        if self.depth + 1 > MAX_INCLUDE_DEPTH:
            raise self._error(f"includes nested deeper than {MAX_INCLUDE_DEPTH}", line)
        # The text before the `include keeps this line; the included file's lines follow,
        # then the rest of this line continues on a fresh text line mapped here again.
        self._flush_line()
        source = _read_source(found, (self.path, line), self.depth + 1)
        _Scanner(self.state, found, source, self.depth + 1, self.chain).run()

    def _find_include(self, name: str) -> Optional[str]:
        if os.path.isabs(name):
            return name if os.path.isfile(name) else None
        folders = [os.path.dirname(self.path)] + list(self.state.include_dirs)
        for folder in folders:
            candidate = os.path.join(folder, name) if folder else name
            if os.path.isfile(candidate):
                return candidate
        return None

    # -- directives recorded or ignored ---------------------------------------------------
    def _directive_timescale(self, line: int) -> None:
        self._rest_of_line()
        self.state.note("`timescale ignored (no delays are modelled)")

    def _directive_default_nettype(self, line: int) -> None:
        self._skip_blanks()
        match = _IDENTIFIER.match(self.text, self.pos)
        value = match.group() if match else ""
        if value not in _NET_TYPES:
            raise self._error(f"`default_nettype needs a net type or none, not {value!r}",
                              line)
        self.pos = match.end()
        self.state.default_nettype.append((len(self.state.lines) + 1, value))

    def _directive_resetall(self, line: int) -> None:
        self.state.default_nettype.append((len(self.state.lines) + 1, "wire"))
        self.state.note("`resetall: `default_nettype reset to wire")

    def _directive_celldefine(self, line: int) -> None:
        self.state.note("`celldefine/`endcelldefine ignored (they only tag modules)")

    _directive_endcelldefine = _directive_celldefine

    def _directive_pragma(self, line: int) -> None:
        self._rest_of_line()
        self.state.note("`pragma ignored")

    def _directive_begin_keywords(self, line: int) -> None:
        self._rest_of_line()
        self.state.note("`begin_keywords/`end_keywords ignored (one keyword set is used)")

    def _directive_end_keywords(self, line: int) -> None:
        self.state.note("`begin_keywords/`end_keywords ignored (one keyword set is used)")

    # -- macro use (clause 19.3.1) ------------------------------------------------------
    def _use_macro(self, name: str, line: int) -> None:
        macro = self.state.macros[name]
        actuals: Optional[list[str]] = None
        newlines = 0
        if macro.formals is not None:
            actuals, end = _macro_arguments(self.text, self.pos, name, self._error)
            newlines = self.text.count("\n", self.pos, end)
            self.pos = end
        try:
            expansion = _expand(self.state.macros, macro, actuals, 0)
        except _ExpansionError as problem:
            raise self._error(problem.message, line) from None
        except BcdproveError as problem:
            if problem.file is not None:
                raise
            raise type(problem)(problem.message, self.path, line) from None
        # Pasted without padding, as text: `WIDTH'd0 must stay one number.
        self.current.append(expansion.replace("\n", " "))
        # Arguments spread over several lines: the expansion stays on the line of use and
        # the lines it swallowed are kept empty, so later lines still map exactly.
        for _ in range(newlines):
            self._newline()


class _ExpansionError(Exception):
    def __init__(self, message: str):
        super().__init__(message)
        self.message = message


def _macro_arguments(text: str, pos: int, name: str, fail) -> tuple[list[str], int]:
    """Split the actual arguments ``( a, b )`` starting at ``pos``; return them and the end.

    Commas inside (), [], {} or strings do not separate arguments.
    """
    i, n = pos, len(text)
    while i < n and text[i] in " \t\n":
        i += 1
    if i >= n or text[i] != "(":
        raise fail(f"macro `{name} needs arguments in parentheses")
    i += 1
    depth = 0
    arguments: list[str] = []
    start = i
    while i < n:
        c = text[i]
        if c == '"':
            i = _string_end(text, i)
            continue
        if c in "([{":
            depth += 1
        elif c in ")]}":
            if depth == 0:
                if c != ")":
                    raise fail(f"macro `{name}: unbalanced {c!r} in its arguments")
                arguments.append(text[start:i].strip())
                return arguments, i + 1
            depth -= 1
        elif c == "," and depth == 0:
            arguments.append(text[start:i].strip())
            start = i + 1
        i += 1
    raise fail(f"macro `{name}: argument list not closed")


def _expand(macros: Mapping[str, _Macro], macro: _Macro, actuals: Optional[list[str]],
            depth: int) -> str:
    """The text of one macro use: formals replaced by actuals, nested macro uses expanded."""
    if depth > _MAX_EXPANSION_DEPTH:
        raise _ExpansionError(f"macro `{macro.name} expands too deeply (does it use itself?)")
    body = macro.body
    if macro.formals is not None:
        assert actuals is not None
        if not macro.formals and actuals == [""]:
            actuals = []          # `M() for a macro declared with no formals
        if len(actuals) != len(macro.formals):
            raise _ExpansionError(f"macro `{macro.name} takes {len(macro.formals)} "
                                  f"argument(s), {len(actuals)} given")
        body = _substitute(body, dict(zip(macro.formals, actuals)))
    text = _expand_text(macros, body, depth + 1)
    if len(text) > _MAX_EXPANSION_CHARS:
        raise _ExpansionError(f"macro `{macro.name} expands to more than "
                              f"{_MAX_EXPANSION_CHARS} characters")
    return text


def _substitute(body: str, values: Mapping[str, str]) -> str:
    """Replace whole identifiers that name formals; not inside strings or after a backtick."""
    out: list[str] = []
    i, n = 0, len(body)
    while i < n:
        c = body[i]
        if c == '"':
            end = _string_end(body, i)
            out.append(body[i:end])
            i = end
        elif c == "\\":
            end = _escaped_identifier_end(body, i)
            out.append(body[i:end])
            i = end
        elif c == "`":
            match = _IDENTIFIER.match(body, i + 1)
            end = match.end() if match else i + 1
            out.append(body[i:end])
            i = end
        elif c.isdigit() or c == "'":
            # A number such as 4'b1010 or 'hFF: its letters are not identifiers.
            match = _NUMBER.match(body, i)
            end = max(match.end(), i + 1)
            out.append(body[i:end])
            i = end
        else:
            match = _IDENTIFIER.match(body, i)
            if match:
                word = match.group()
                out.append(values.get(word, word))
                i = match.end()
            else:
                out.append(c)
                i += 1
    return "".join(out)


def _expand_text(macros: Mapping[str, _Macro], text: str, depth: int) -> str:
    """Expand every macro use in ``text`` (a macro body after argument substitution)."""
    out: list[str] = []
    i, n = 0, len(text)
    while i < n:
        c = text[i]
        if c == '"':
            end = _string_end(text, i)
            out.append(text[i:end])
            i = end
        elif c == "\\":
            end = _escaped_identifier_end(text, i)
            out.append(text[i:end])
            i = end
        elif c == "`":
            match = _IDENTIFIER.match(text, i + 1)
            if not match:
                raise _ExpansionError("stray ` in a macro body")
            name = match.group()
            i = match.end()
            if name in _DIRECTIVES:
                raise UnsupportedConstruct(f"compiler directive `{name} inside a macro body "
                                           "is not supported")
            if name not in macros:
                raise _ExpansionError(f"undefined macro `{name} (used in a macro body)")
            inner = macros[name]
            actuals = None
            if inner.formals is not None:
                def fail(message: str) -> _ExpansionError:
                    return _ExpansionError(message)
                actuals, i = _macro_arguments(text, i, name, fail)
            out.append(_expand(macros, inner, actuals, depth))
        else:
            out.append(c)
            i += 1
    return "".join(out)

"""Parsing preprocessed Verilog into a pyverilog syntax tree.

The grammar is pyverilog 1.3.0's ply grammar, extended in ``_grammar`` with the productions
real converter files need.  ply's LALR tables are cached per user (never in the current
directory or the installed package); when no cache is writable they are built in memory.

Shapes of the added constructs (all other nodes are pyverilog's own):

* ``'0 '1 'x 'z``: ``FillConst(IntConst)`` with ``value`` "'0", "'1", "'x" or "'z".
* ``logic x``: ``Logic(Reg)``; ``output logic y``: Ioport(Output, Logic); ``input logic a``:
  Ioport(Input, None).  ``int n``: ``Int(Integer)``, width 31:0, signed.
* ``for (int i = 0; ...)`` / ``for (integer i ...)`` / ``for (genvar g = 0; ...)``: the
  ForStatement's ``pre`` is ``LoopDeclaration(BlockingSubstitution)`` with ``kind`` ("int",
  "integer", "genvar") and ``variable`` (Int / Integer / Genvar node, width 31:0).
* ``i++``, ``--i``, ``a op= e`` (op in + - * & | ^ << >>): BlockingSubstitution(Lvalue(a),
  Rvalue(Op(copy of a, e))) with e = IntConst("1") for ++/--; as statements and as for steps.
* ``localparam`` inside ``#( ... )``: Paramlist.params holds Decl((Localparam, ...)).
  ``parameter integer P`` / ``localparam int P``: width 31:0, signed True.
* Functions: Function(name, retwidth, statement) where ``statement`` = one Decl((Input,))
  per ANSI port, then the body declarations, then one statement (several become a Block);
  extra attributes ``automatic``, ``signed`` and ``return_type`` ("implicit", "integer",
  "int", "reg", "logic").  Integer inputs are Input(width 31:0, signed).
* ``output reg [3:0] y = 0`` (ANSI): Ioport(Output, Reg) with the Reg's ``value`` an Rvalue.
  ``reg r = e;`` in the body keeps pyverilog's [Reg, Assign] (the Assign is the initial
  value); ``wire w = e, v = f;`` gives [Wire, Assign, Wire, Assign].
* ``end : label`` / ``endmodule : name`` / ``endfunction : name``: checked, then dropped.
* generate ``case``: CaseStatement(comp, (Case(conditions or None, item), ...)); ``for`` /
  ``if`` / ``case`` outside a generate region: wrapped in GenerateStatement((item,)).
* A lone ``;``: Block(()).  ``default`` without a colon: Case(None, statement).
* ``always_comb`` / ``always_latch``: AlwaysComb / AlwaysLatch with SensList((Sens(None,
  "all"),)).  A plain ``always`` without ``@`` is rejected.
* ``v[b +: w]`` keeps pyverilog's Partselect(v, b, Plus(b, w)) (``-:`` uses Minus), ``b``
  shared by identity.
"""
from __future__ import annotations

import hashlib
import os
import tempfile
from pathlib import Path
from typing import Optional

import ply
import ply.yacc
import pyverilog
from pyverilog.vparser import ast as vast

from ..errors import BcdproveError, UnsupportedConstruct
from ..model.design import SourceLocation
from .preprocess import Preprocessed
from . import _grammar, _grammar_functions, _grammar_lists, _lexer
from ._grammar import FillConst, Int, Logic, LoopDeclaration

__all__ = ["parse", "location", "FillConst", "Int", "Logic", "LoopDeclaration"]

_PARSER: Optional["_grammar.ExtendedParser"] = None


def parse(pre: Preprocessed) -> vast.Source:
    """Parse ``pre.text`` into a ``pyverilog.vparser.ast.Source``.

    Every node's ``lineno`` is a line of ``pre.text`` (map it with ``location``); each
    ModuleDef's ``default_nettype`` is the one in force where it starts.  A syntax
    error, or a construct the reader rejects outright (``typedef``, ``struct``, ...), raises
    BcdproveError carrying the original file and line.
    """
    parser = _parser()
    try:
        source = parser.parse_text(pre.text)
    except _grammar.SyntaxProblem as problem:
        file, line = pre.origin(problem.line)
        kind = UnsupportedConstruct if problem.unsupported else BcdproveError
        raise kind(problem.message, file, line) from None
    except RecursionError:
        raise BcdproveError("syntax error: nesting too deep to parse", pre.origin(1)[0]) from None
    _fill_line_numbers(source, pre.text.count("\n"))
    _apply_default_nettype(source, pre)
    return source


def _fill_line_numbers(source: vast.Source, last_line: int) -> None:
    """Give every node a line of the text: a node pyverilog left at 0 (an empty parameter
    list, the implicit sensitivity of always_comb, ...) takes its parent's line.

    Iterative, because a long expression chain nests deeper than Python's recursion limit.
    """
    pending = [(source, 1)]
    while pending:
        node, parent_line = pending.pop()
        line = getattr(node, "lineno", 0)
        if not isinstance(line, int) or not 1 <= line <= last_line:
            node.lineno = line = parent_line
        pending.extend((child, line) for child in node.children() if child is not None)


def _apply_default_nettype(source: vast.Source, pre: Preprocessed) -> None:
    """Set each ModuleDef's ``default_nettype`` to the last `default_nettype before it.

    IEEE 1364-2005 clause 19.2: the directive applies to the modules that follow it, and
    "wire" holds before any (pyverilog's lexer never sees the directives, they are gone).
    """
    for module in source.description.definitions:
        if isinstance(module, vast.ModuleDef):
            value = "wire"
            for line, setting in pre.default_nettype:
                if line <= module.lineno:
                    value = setting
            module.default_nettype = value


def location(pre: Preprocessed, node: vast.Node) -> SourceLocation:
    """The original file and line of an AST node produced by ``parse(pre)``."""
    line = getattr(node, "lineno", None) or 1
    file, original = pre.origin(int(line))
    return SourceLocation(file, original)


def _parser() -> "_grammar.ExtendedParser":
    """The process-wide parser, built (or loaded from the table cache) on first use."""
    global _PARSER
    if _PARSER is None:
        _PARSER = _grammar.ExtendedParser(_load_tables)
    return _PARSER


def _cache_directory() -> Path:
    """Per-user cache folder for the tables, keyed by the grammar's sources and versions.

    Raises OSError when there is no absolute cache root (a relative one would land in the
    current directory), so the caller builds the tables in memory.
    """
    root = os.environ.get("XDG_CACHE_HOME", "")
    if not os.path.isabs(root):          # the XDG rule: relative values are ignored
        root = os.path.join(os.path.expanduser("~"), ".cache")
    if not os.path.isabs(root):
        raise OSError("no absolute cache folder")
    digest = hashlib.sha256()
    digest.update(f"{pyverilog.__version__}|{ply.__version__}|".encode())
    for source in (_grammar.__file__, _grammar_functions.__file__, _grammar_lists.__file__,
                   _lexer.__file__,
                   _grammar.base_grammar_file()):
        try:
            digest.update(Path(source).read_bytes())
        except OSError:
            digest.update(source.encode())
    return Path(root) / "bcdprove" / digest.hexdigest()[:16]


def _load_tables(build) -> object:
    """Return a ply parser, reusing cached tables when possible.

    ``build(picklefile)`` runs ply's yacc with the given pickle path (or None: in memory).
    Tables are written to a private temporary name and renamed into place, so a reader never
    sees a half-written file; any problem with the cache falls back to building in memory.
    """
    try:
        folder = _cache_directory()
        target = folder / "parser-tables.pickle"
        if target.is_file():
            try:
                return build(str(target))
            except Exception:  # a damaged cache file: rebuild below
                pass
        folder.mkdir(parents=True, exist_ok=True)
        handle, temporary = tempfile.mkstemp(prefix="tables-", suffix=".tmp", dir=folder)
        os.close(handle)
        os.unlink(temporary)  # ply must see no file here, or it would try to read it
        try:
            parser = build(temporary)
            if os.path.isfile(temporary):
                os.replace(temporary, target)
            return parser
        finally:
            if os.path.exists(temporary):
                os.unlink(temporary)
    except OSError:
        return build(None)

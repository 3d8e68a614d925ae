"""pyverilog's grammar, extended with the constructs real converter files use.

ply builds an LALR grammar from every ``p_*`` method of the parser object (their docstrings
are the productions), so a subclass adds productions simply by defining more methods.
"""
from __future__ import annotations

import ply.lex
import ply.yacc
from pyverilog.vparser import parser as _base
from pyverilog.vparser.ast import *  # noqa: F401,F403  (the productions build these nodes)
from pyverilog.vparser.lexer import VerilogLexer


class SyntaxProblem(Exception):
    """A syntax error at ``line`` of the preprocessed text (mapped back by the caller)."""

    def __init__(self, message: str, line: int):
        super().__init__(message)
        self.message = message
        self.line = line


def base_grammar_file() -> str:
    """The file holding pyverilog's grammar (part of the table cache key)."""
    return _base.__file__


class ExtendedLexer(VerilogLexer):
    """pyverilog's lexer; built without writing any file and without warnings."""

    def build(self, **kwargs):
        self.lexer = ply.lex.lex(object=self, errorlog=ply.lex.NullLogger(), **kwargs)


class ExtendedParser(_base.VerilogParser):
    """pyverilog's parser with extra productions; tables come from ``load_tables``."""

    def __init__(self, load_tables):
        self.lexer = ExtendedLexer(error_func=self._lexer_error_func)
        self.lexer.build()
        self.tokens = self.lexer.tokens
        self.parser = load_tables(self._build_tables)

    def _build_tables(self, picklefile):
        # write_tables=False: ply would otherwise write parsetab.py beside the package.
        return ply.yacc.yacc(module=self, method="LALR", debug=False, write_tables=False,
                             tabmodule="_bcdprove_no_parsetab", picklefile=picklefile,
                             errorlog=ply.yacc.NullLogger())

    def parse_text(self, text: str):
        """Parse one preprocessed text; raise SyntaxProblem on the first error."""
        self.lexer.reset_lineno()
        self.lexer.directives = []
        return self.parser.parse(text, lexer=self.lexer)

    def _lexer_error_func(self, msg, line, column):
        raise SyntaxProblem(f"syntax error: {msg.lower()}", line)

    def _raise_error(self, p):
        if p is None:
            raise SyntaxProblem("syntax error: unexpected end of input", _last_line(self))
        raise SyntaxProblem(f"syntax error near {p.value!r}", p.lineno)


def _last_line(parser: ExtendedParser) -> int:
    return max(1, parser.lexer.lexer.lineno)

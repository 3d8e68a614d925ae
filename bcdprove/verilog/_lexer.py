"""Tokens: pyverilog's lexer plus the few SystemVerilog tokens real converter files use.

ply orders a lexer's function rules by their line numbers, so every function rule is
(re)defined here, in the order they must be tried, rather than mixing line numbers of two
files.  Added: the keywords ``int`` and ``automatic``; ``++``, ``--`` and the compound
assignments ``+= -= *= &= |= ^= <<= >>=``; the fill literals ``'0 '1 'x 'z``; white space
between a literal's size, base and digits (IEEE 1364-2005 clause 3.5.1).
"""
from __future__ import annotations

import collections
import re

import ply.lex
from ply.lex import TOKEN
from pyverilog.vparser.lexer import VerilogLexer

__all__ = ["ExtendedLexer"]

# Words of SystemVerilog constructs the reader does not model.  They are not keywords of
# 1364-2005, so they stay identifiers; a syntax error just after one names the construct.
# The construct words count anywhere; the type words only where an item or statement starts
# (a net may well be called `bit`).
SYSTEMVERILOG_CONSTRUCTS = frozenset({
    "typedef", "struct", "union", "enum", "interface", "endinterface", "modport", "package",
    "endpackage", "import", "class", "endclass", "virtual", "program", "endprogram",
    "return", "break", "continue", "foreach", "inside",
})
SYSTEMVERILOG_TYPES = frozenset({"bit", "byte", "shortint", "longint", "priority"})
_ITEM_STARTS = frozenset({None, "SEMICOLON", "BEGIN", "END", "ENDMODULE", "ENDFUNCTION",
                          "ENDGENERATE", "GENERATE", "ENDCASE"})

_EXTRA_KEYWORDS = {"int": "INT", "automatic": "AUTOMATIC"}

_COMPOUND_ASSIGNMENTS = ("PLUSEQUALS", "MINUSEQUALS", "TIMESEQUALS", "ANDEQUALS",
                         "OREQUALS", "XOREQUALS", "LSHIFTEQUALS", "RSHIFTEQUALS")

_BLANKS = "[ \t]*"


def _based(base_letters: str, digits: str, signed: bool) -> str:
    """Regex of a based literal: optional size, apostrophe, [s]base, digits (clause 3.5.1)."""
    sign = "[sS]" if signed else ""
    return (f"([0-9][0-9_]*{_BLANKS})?'{sign}[{base_letters}]{_BLANKS}"
            f"[{digits}xXzZ?][{digits}xXzZ?_]*")


class ExtendedLexer(VerilogLexer):
    """pyverilog's lexer with extra tokens; built without writing files or warnings.

    ``recent`` holds the last few tokens, so a syntax error can name a SystemVerilog word
    that came just before it (see ``systemverilog_word``).
    """

    reserved = dict(VerilogLexer.reserved, **_EXTRA_KEYWORDS)
    tokens = (VerilogLexer.tokens + tuple(_EXTRA_KEYWORDS.values())
              + ("PLUSPLUS", "MINUSMINUS", "FILL_LITERAL") + _COMPOUND_ASSIGNMENTS)

    t_PLUSPLUS = r"\+\+"
    t_MINUSMINUS = r"--"
    t_PLUSEQUALS = r"\+="
    t_MINUSEQUALS = r"-="
    t_TIMESEQUALS = r"\*="
    t_ANDEQUALS = r"&="
    t_OREQUALS = r"\|="
    t_XOREQUALS = r"\^="
    t_LSHIFTEQUALS = r"<<="
    t_RSHIFTEQUALS = r">>="
    # Both spellings of XNOR are one operator (IEEE 1364-2005 clause 5.1 operator table);
    # pyverilog knows only `~^`, and read `^~a` as `^(~a)`, wrong for even widths.
    t_XNOR = r"~\^|\^~"

    def __init__(self, error_func):
        super().__init__(error_func)
        self.recent: collections.deque = collections.deque(maxlen=4)
        self._previous_type = None

    def build(self, **kwargs):
        self.lexer = ply.lex.lex(object=self, errorlog=ply.lex.NullLogger(), **kwargs)

    def reset(self) -> None:
        """Forget the previous text: line 1, no recent tokens."""
        self.lexer.lineno = 1
        self.recent.clear()
        self._previous_type = None

    def token(self):
        token = self.lexer.token()
        if token is not None:
            self.recent.append((token, self._previous_type))
            self._previous_type = token.type
        return token

    def systemverilog_word(self):
        """The earliest recent token that starts an unsupported SystemVerilog construct."""
        for token, previous in self.recent:
            if token.type != "ID":
                continue
            if token.value in SYSTEMVERILOG_CONSTRUCTS or (
                    token.value in SYSTEMVERILOG_TYPES and previous in _ITEM_STARTS):
                return token
        return None

    # Function rules, in the order they are tried.  Comments are normally gone already
    # (the preprocessor blanks them) but are still skipped for text that was not.
    def t_DIRECTIVE(self, t):
        r"`"
        # pyverilog skips directives silently; here every one must have been handled.
        self._error("compiler directive or macro left after preprocessing", t)

    @TOKEN(VerilogLexer.linecomment)
    def t_LINECOMMENT(self, t):
        t.lexer.lineno += t.value.count("\n")

    @TOKEN(VerilogLexer.commentout)
    def t_COMMENTOUT(self, t):
        t.lexer.lineno += t.value.count("\n")

    @TOKEN(VerilogLexer.string_literal)
    def t_STRING_LITERAL(self, t):
        return t

    @TOKEN(VerilogLexer.float_number)
    def t_FLOATNUMBER(self, t):
        return t

    @TOKEN(_based("bB", "01", True))
    def t_SIGNED_INTNUMBER_BIN(self, t):
        return _compact(t)

    @TOKEN(_based("bB", "01", False))
    def t_INTNUMBER_BIN(self, t):
        return _compact(t)

    @TOKEN(_based("oO", "0-7", True))
    def t_SIGNED_INTNUMBER_OCT(self, t):
        return _compact(t)

    @TOKEN(_based("oO", "0-7", False))
    def t_INTNUMBER_OCT(self, t):
        return _compact(t)

    @TOKEN(_based("hH", "0-9a-fA-F", True))
    def t_SIGNED_INTNUMBER_HEX(self, t):
        return _compact(t)

    @TOKEN(_based("hH", "0-9a-fA-F", False))
    def t_INTNUMBER_HEX(self, t):
        return _compact(t)

    @TOKEN(_based("dD", "0-9", True))
    def t_SIGNED_INTNUMBER_DEC(self, t):
        return _compact(t)

    @TOKEN("(" + _based("dD", "0-9", False) + ")|([0-9][0-9_]*)")
    def t_INTNUMBER_DEC(self, t):
        return _compact(t)

    @TOKEN(r"'[01xXzZ](?![0-9A-Za-z_$])")
    def t_FILL_LITERAL(self, t):
        t.value = t.value.lower()
        return t

    @TOKEN(VerilogLexer.identifier)
    def t_ID(self, t):
        t.type = self.reserved.get(t.value, "ID")
        return t

    def t_NEWLINE(self, t):
        r"\n+"
        t.lexer.lineno += t.value.count("\n")

    def t_error(self, t):
        character = t.value[0]
        if character == "'":
            message = "unexpected ' (SystemVerilog assignment patterns and casts are not supported)"
        else:
            message = f"illegal character {character!r}"
        self._error(message, t)


def _compact(token):
    """Drop the white space clause 3.5.1 allows inside a literal: ``8 'h FF`` -> ``8'hFF``."""
    if " " in token.value or "\t" in token.value:
        token.value = re.sub(r"[ \t]+", "", token.value)
    return token

"""pyverilog's grammar, extended with the constructs real converter files use.

ply builds an LALR grammar from every ``p_*`` method of the parser object (their docstrings
are the productions), so a subclass adds productions by defining more methods, replaces a
production by redefining the method of the same name, and removes one by setting the name
to None.  The syntax tree is pyverilog's (``pyverilog.vparser.ast``) plus the four node
classes below, each a subclass of the pyverilog class it refines.
"""
from __future__ import annotations

import copy

import ply.yacc
from pyverilog.vparser import ast as vast
from pyverilog.vparser import parser as _base

from ._grammar_functions import FunctionGrammar
from ._grammar_functions import word as _word
from ._grammar_lists import ListGrammar
from ._lexer import ExtendedLexer

__all__ = ["ExtendedParser", "SyntaxProblem", "FillConst", "Logic", "Int", "LoopDeclaration",
           "base_grammar_file"]


class FillConst(vast.IntConst):
    """A SystemVerilog fill literal.  ``value`` is exactly one of "'0", "'1", "'x", "'z".

    Every bit of the context-determined width takes that digit (an unsized, self-extending
    literal); it is not an ordinary number, so it is a class of its own.
    """


class Logic(vast.Reg):
    """A variable declared with SystemVerilog ``logic``: a Reg for every modelling purpose."""


class Int(vast.Integer):
    """A SystemVerilog ``int``: 32-bit signed like ``integer`` (width 31:0, signed True)."""


class LoopDeclaration(vast.BlockingSubstitution):
    """The first clause of ``for (int i = 0; ...)`` / ``for (genvar g = 0; ...)``.

    A BlockingSubstitution (``left`` = Lvalue(Identifier), ``right`` = Rvalue) that also
    declares its loop variable, local to the loop: ``kind`` is "int", "integer" or "genvar"
    and ``variable`` is the matching Int, Integer or Genvar node (width 31:0).
    """

    def __init__(self, left, right, kind, variable, lineno=0):
        super().__init__(left, right, lineno=lineno)
        self.kind = kind
        self.variable = variable


class SyntaxProblem(Exception):
    """A syntax error at ``line`` of the preprocessed text (mapped back by the caller)."""

    def __init__(self, message: str, line: int, unsupported: bool = False):
        super().__init__(message)
        self.message = message
        self.line = line
        self.unsupported = unsupported


def base_grammar_file() -> str:
    """The file holding pyverilog's grammar (part of the table cache key)."""
    return _base.__file__


def _as_expression(lvalue: vast.Lvalue):
    """The value an assignment target has before the assignment (for ``i++``, ``a += b``)."""
    target = copy.deepcopy(lvalue.var)
    if isinstance(target, vast.LConcat):
        return vast.Concat(target.list, lineno=target.lineno)
    return target


# The binary operator each compound assignment applies (SystemVerilog: a op= b is a = a op b).
_COMPOUND_OPERATORS = {
    "+=": vast.Plus, "-=": vast.Minus, "*=": vast.Times, "&=": vast.And, "|=": vast.Or,
    "^=": vast.Xor, "<<=": vast.Sll, ">>=": vast.Srl,
}

_VARIABLE_CLASSES = {"wire": vast.Wire, "reg": vast.Reg, "logic": Logic, "tri": vast.Tri}


class ExtendedParser(FunctionGrammar, ListGrammar, _base.VerilogParser):
    """pyverilog's parser with extra productions; tables come from ``load_tables``."""

    def __init__(self, load_tables):
        self.lexer = ExtendedLexer(error_func=self._lexer_error_func)
        self.lexer.build()
        self.tokens = self.lexer.tokens
        self.parser = load_tables(self._build_tables)

    def _build_tables(self, picklefile):
        # write_tables=False: ply would otherwise write parsetab.py beside the package.
        # start is explicit: ply would otherwise take the rule with the lowest line number,
        # and rules come from two files.
        return ply.yacc.yacc(module=self, method="LALR", debug=False, write_tables=False,
                             start="source_text", tabmodule="_bcdprove_no_parsetab",
                             picklefile=picklefile, errorlog=ply.yacc.NullLogger())

    def parse_text(self, text: str):
        """Parse one preprocessed text; raise SyntaxProblem on the first error."""
        self.lexer.reset()
        self.lexer.directives = []
        try:
            return self.parser.parse(text, lexer=self.lexer)
        except _base.ParseError:
            # Only pyverilog's task-declaration check still raises this (without a line).
            raise SyntaxProblem("syntax error: declaration not allowed here",
                                self._current_line()) from None

    # -- errors ---------------------------------------------------------------------------
    def _current_line(self) -> int:
        return max(1, self.lexer.lexer.lineno)

    def _lexer_error_func(self, msg, line, column):
        raise SyntaxProblem(f"syntax error: {msg}", line)

    def _raise_error(self, p):
        word = self.lexer.systemverilog_word()
        if word is not None:
            raise SyntaxProblem(f"unsupported SystemVerilog construct `{word.value}`",
                                word.lineno, unsupported=True)
        if p is None:
            raise SyntaxProblem("syntax error: unexpected end of input", self._current_line())
        raise SyntaxProblem(f"syntax error near {p.value!r}", p.lineno)

    def _problem(self, message: str, lineno: int):
        raise SyntaxProblem(message, lineno or self._current_line())

    # -- module header: `endmodule : name`, localparam in #( ... ) ----------------------------
    def p_moduledef_label(self, p):
        'moduledef : MODULE modulename paramlist portlist items ENDMODULE COLON ID'
        if p[8] != p[2]:
            self._problem(f"endmodule label {p[8]!r} does not match module {p[2]!r}",
                          p.lineno(8))
        p[0] = vast.ModuleDef(name=p[2], paramlist=p[3], portlist=p[4], items=p[5],
                              default_nettype=self.get_default_nettype(), lineno=p.lineno(1))
        p[0].end_lineno = p.lineno(6)
        p.set_lineno(0, p.lineno(1))

    def p_param(self, p):
        'param : param_head param_substitution_list COMMA'
        p[0] = self._parameters(p[1], p[2])
        p.set_lineno(0, p.lineno(1))

    def p_param_end(self, p):
        'param_end : param_head param_substitution_list'
        p[0] = self._parameters(p[1], p[2])
        p.set_lineno(0, p.lineno(1))

    def p_parameterdecl(self, p):
        'parameterdecl : param_head param_substitution_list SEMICOLON'
        p[0] = self._parameters(p[1], p[2])
        p.set_lineno(0, p.lineno(1))

    # One head for `parameter` and `localparam`, in the port list and in the body alike.
    p_param_signed = p_param_width = p_param_signed_width = p_param_integer = None
    p_param_end_signed = p_param_end_width = p_param_end_signed_width = None
    p_param_end_integer = None
    p_parameterdecl_signed = p_parameterdecl_width = p_parameterdecl_signed_width = None
    p_parameterdecl_integer = None
    p_localparamdecl = p_localparamdecl_signed = p_localparamdecl_width = None
    p_localparamdecl_signed_width = p_localparamdecl_integer = None

    def p_param_head(self, p):
        """param_head : PARAMETER data_type
        | LOCALPARAM data_type
        """
        kind = vast.Parameter if p[1] == "parameter" else vast.Localparam
        p[0] = (kind, p[2], p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def _parameters(self, head, substitutions):
        kind, (width, signed, _), lineno = head
        listed = [kind(name, value, width, signed, lineno=lineno)
                  for name, value in substitutions]
        return vast.Decl(tuple(listed), lineno=lineno)

    # -- data types shared by parameters, function results and function ports ---------------
    def p_data_type_implicit(self, p):
        'data_type : empty'
        p[0] = (None, False, "implicit")

    def p_data_type_width(self, p):
        'data_type : width'
        p[0] = (p[1], False, "implicit")
        p.set_lineno(0, p.lineno(1))

    def p_data_type_signed(self, p):
        'data_type : SIGNED'
        p[0] = (None, True, "implicit")
        p.set_lineno(0, p.lineno(1))

    def p_data_type_signed_width(self, p):
        'data_type : SIGNED width'
        p[0] = (p[2], True, "implicit")
        p.set_lineno(0, p.lineno(1))

    def p_data_type_integer(self, p):
        """data_type : INTEGER
        | INT
        """
        p[0] = (_word(p.lineno(1), 31), True, p[1])
        p.set_lineno(0, p.lineno(1))

    def p_data_type_variable(self, p):
        """data_type : REG data_type_tail
        | LOGIC data_type_tail
        """
        width, signed = p[2]
        p[0] = (width, signed, p[1])
        p.set_lineno(0, p.lineno(1))

    def p_data_type_tail(self, p):
        """data_type_tail : empty
        | width
        | SIGNED
        | SIGNED width
        """
        if len(p) == 3:
            p[0] = (p[2], True)
        elif p[1] == "signed":
            p[0] = (None, True)
        else:
            p[0] = (p[1], False)

    # -- ANSI ports: initial values, faithful continuation, logic ---------------------------
    def p_ioports(self, p):
        'ioports : ioports COMMA ioport'
        if isinstance(p[3], str):
            # `input signed [3:0] a, b`: b repeats a's direction, kind, range and sign.
            previous = p[1][-1]
            p[0] = p[1] + (self._repeat_port(previous, p[3], p.lineno(3)),)
        else:
            p[0] = p[1] + (p[3],)
        p.set_lineno(0, p.lineno(1))

    @staticmethod
    def _repeat_port(previous: vast.Ioport, name: str, lineno: int) -> vast.Ioport:
        def like(node):
            if node is None:
                return None
            return type(node)(name=name, width=copy.deepcopy(node.width), signed=node.signed,
                              lineno=lineno)
        return vast.Ioport(like(previous.first), like(previous.second), lineno=lineno)

    def p_ioport_initial(self, p):
        """ioport : sigtypes portname EQUALS rvalue
        | sigtypes width portname EQUALS rvalue
        """
        p[0] = self._initialised_port(p)
        p.set_lineno(0, p.lineno(1))

    def p_ioport_head_initial(self, p):
        """ioport_head : sigtypes portname EQUALS rvalue
        | sigtypes width portname EQUALS rvalue
        """
        p[0] = self._initialised_port(p)
        p.set_lineno(0, p.lineno(1))

    def _initialised_port(self, p):
        """``output reg [3:0] y = 0``: the value is the Reg's (Ioport.second) ``value``."""
        width = p[2] if len(p) == 6 else None
        name, value = (p[3], p[5]) if len(p) == 6 else (p[2], p[4])
        lineno = p.lineno(len(p) - 3)
        port = self.create_ioport(p[1], name, width=width, lineno=lineno)
        if not isinstance(port.first, vast.Output) or not isinstance(port.second, vast.Reg):
            self._problem(f"port {name!r}: only an output reg/logic port may have an "
                          "initial value", lineno)
        port.second.value = value
        return port

    def create_ioport(self, sigtypes, name, width=None, dimensions=None, lineno=0):
        self.typecheck_ioport(sigtypes, name, lineno)
        signed = "signed" in sigtypes
        first = second = None
        for direction, cls in (("input", vast.Input), ("output", vast.Output),
                               ("inout", vast.Inout)):
            if direction in sigtypes:
                first = cls(name=name, width=width, signed=signed, dimensions=dimensions,
                            lineno=lineno)
        for kind, cls in _VARIABLE_CLASSES.items():
            # `input logic a` is a net in SystemVerilog: nothing beyond the Input.
            if kind in sigtypes and not (kind == "logic" and "input" in sigtypes):
                second = cls(name=name, width=width, signed=signed, dimensions=dimensions,
                             lineno=lineno)
        return vast.Ioport(first, second, lineno=lineno)

    def typecheck_ioport(self, sigtypes, name="", lineno=0):
        directions = [d for d in ("input", "output", "inout") if d in sigtypes]
        if len(directions) != 1:
            self._problem(f"port {name!r} needs exactly one of input, output, inout", lineno)
        if directions[0] != "output" and "reg" in sigtypes:
            self._problem(f"port {name!r}: only an output may be declared reg", lineno)
        kinds = [k for k in ("wire", "reg", "logic", "tri", "supply0", "supply1")
                 if k in sigtypes]
        if len(kinds) > 1:
            self._problem(f"port {name!r} declared as both {kinds[0]} and {kinds[1]}", lineno)

    # -- declarations: logic, int -----------------------------------------------------------
    def create_decl(self, sigtypes, name, width=None, dimensions=None, lineno=0):
        self.typecheck_decl(sigtypes, dimensions, name, lineno)
        signed = "signed" in sigtypes
        made = []
        for kind, cls in (("input", vast.Input), ("output", vast.Output),
                          ("inout", vast.Inout), ("wire", vast.Wire), ("reg", vast.Reg),
                          ("logic", Logic), ("tri", vast.Tri)):
            if kind in sigtypes:
                made.append(cls(name=name, width=width, signed=signed, lineno=lineno,
                                dimensions=dimensions))
        for kind, bit in (("supply0", "0"), ("supply1", "1")):
            if kind in sigtypes:
                made.append(vast.Supply(name=name, value=vast.IntConst(bit, lineno=lineno),
                                        width=width, signed=signed, lineno=lineno))
        return made

    def typecheck_decl(self, sigtypes, dimensions=None, name="", lineno=0):
        if set(sigtypes) <= {"signed"}:
            self._problem(f"declaration of {name!r} needs a kind (wire, reg, ...)", lineno)
        directions = [d for d in ("input", "output", "inout") if d in sigtypes]
        if len(directions) > 1:
            self._problem(f"{name!r} declared as both {directions[0]} and {directions[1]}",
                          lineno)
        if directions and directions[0] != "output" and "reg" in sigtypes:
            self._problem(f"{name!r}: only an output may be declared reg", lineno)
        if ("supply0" in sigtypes or "supply1" in sigtypes) and dimensions is not None:
            self._problem(f"supply net {name!r} cannot be an array", lineno)

    def create_declassign(self, sigtypes, name, assign, width=None, lineno=0):
        """[declared nodes..., Assign], as pyverilog does.  For ``wire w = e`` the Assign is
        a net declaration assignment (continuous, clause 6.1.1); after a Reg or Logic
        (``reg r = e``) it is the variable's initial value (clause 6.2.1), not a driver.
        """
        if not {"wire", "reg", "logic", "tri"} & set(sigtypes):
            self._problem(f"declaration of {name!r} with a value needs wire, reg or logic",
                          lineno)
        made = self.create_decl(sigtypes, name, width=width, lineno=lineno)
        made.append(assign)
        return made

    def p_declassign(self, p):
        'declassign : sigtypes declassign_elements SEMICOLON'
        p[0] = self._declassigns(p[1], None, p[2], p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_declassign_width(self, p):
        'declassign : sigtypes width declassign_elements SEMICOLON'
        p[0] = self._declassigns(p[1], p[2], p[3], p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def _declassigns(self, sigtypes, width, elements, lineno):
        made = []
        for index, (name, assign) in enumerate(elements):
            made.extend(self.create_declassign(sigtypes, name, assign,
                                               width=copy.deepcopy(width) if index else width,
                                               lineno=assign.lineno))
        return vast.Decl(tuple(made), lineno=lineno)

    def p_declassign_elements(self, p):
        """declassign_elements : declassign_elements COMMA declassign_element
        | declassign_element
        """
        p[0] = p[1] + (p[3],) if len(p) == 4 else (p[1],)
        p.set_lineno(0, p.lineno(1))

    def p_declassign_element_delay(self, p):
        'declassign_element : delays ID EQUALS delays rvalue'
        target = vast.Lvalue(vast.Identifier(p[2], lineno=p.lineno(2)), lineno=p.lineno(2))
        p[0] = (p[2], vast.Assign(target, p[5], p[1], p[4], lineno=p.lineno(2)))
        p.set_lineno(0, p.lineno(2))

    def p_intdecl(self, p):
        'intdecl : INT integernamelist SEMICOLON'
        listed = [Int(name, _word(p.lineno(1), 31), signed=True, value=value,
                      lineno=p.lineno(1)) for name, value in p[2]]
        p[0] = vast.Decl(tuple(listed), lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    # -- module items: int, generate constructs outside generate ... endgenerate ---------------
    def p_standard_item(self, p):
        """standard_item : decl
        | integerdecl
        | intdecl
        | realdecl
        | declassign
        | parameterdecl
        | genvardecl
        | assignment
        | always
        | always_ff
        | always_comb
        | always_latch
        | initial
        | instance
        | function
        | task
        | pragma
        """
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    def p_item_generate_construct(self, p):
        """item : generate_for
        | generate_if
        | generate_case
        """
        # Verilog-2005 (clause 12.4) makes the generate ... endgenerate region optional.
        p[0] = vast.GenerateStatement((p[1],), lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_generate_item(self, p):
        """generate_item : standard_item
        | generate_if
        | generate_for
        | generate_case
        """
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    def p_generate_case(self, p):
        'generate_case : CASE LPAREN case_comp RPAREN generate_case_items ENDCASE'
        p[0] = vast.CaseStatement(p[3], p[5], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_generate_case_items(self, p):
        """generate_case_items : generate_case_items generate_case_item
        | generate_case_item
        """
        p[0] = p[1] + (p[2],) if len(p) == 3 else (p[1],)
        p.set_lineno(0, p.lineno(1))

    def p_generate_case_item(self, p):
        'generate_case_item : casecontent_condition COLON gif_true_item'
        p[0] = vast.Case(p[1], p[3], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_generate_case_default(self, p):
        """generate_case_item : DEFAULT COLON gif_true_item
        | DEFAULT gif_true_item
        """
        p[0] = vast.Case(None, p[len(p) - 1], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_generate_named_block_label(self, p):
        'generate_block : BEGIN COLON ID generate_items END COLON ID'
        self._check_label(p[3], p[7], p.lineno(7))
        p[0] = vast.Block(p[4], p[3], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    # -- statements: end labels, declarations in named blocks, i++ / a += b -----------------
    def p_namedblock_label(self, p):
        'namedblock : BEGIN COLON ID namedblock_statements END COLON ID'
        self._check_label(p[3], p[7], p.lineno(7))
        p[0] = vast.Block(p[4], p[3], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_namedblock_empty_label(self, p):
        'namedblock : BEGIN COLON ID END COLON ID'
        self._check_label(p[3], p[6], p.lineno(6))
        p[0] = vast.Block((), p[3], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def _check_label(self, opened: str, closed: str, lineno: int) -> None:
        if opened != closed:
            self._problem(f"end label {closed!r} does not match begin label {opened!r}",
                          lineno)

    def p_block_statement_declaration(self, p):
        """block_statement : decl
        | integerdecl
        | intdecl
        | parameterdecl
        """
        # IEEE 1800 allows declarations in an unnamed begin ... end too.
        self.p_namedblock_statement(p)

    def p_namedblock_statement(self, p):
        """namedblock_statement : basic_statement
        | decl
        | integerdecl
        | intdecl
        | realdecl
        | parameterdecl
        """
        if isinstance(p[1], vast.Decl):
            for declared in p[1].list:
                if not isinstance(declared, (vast.Reg, vast.Wire, vast.Integer, vast.Real,
                                             vast.Parameter)):
                    self._problem(f"{type(declared).__name__.lower()} {declared.name!r} "
                                  "cannot be declared in a block", p.lineno(1))
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    def p_basic_statement(self, p):
        """basic_statement : if_statement
        | case_statement
        | casex_statement
        | casez_statement
        | unique_case_statement
        | for_statement
        | while_statement
        | event_statement
        | wait_statement
        | forever_statement
        | block
        | namedblock
        | parallelblock
        | blocking_substitution
        | nonblocking_substitution
        | single_statement
        | step_statement
        """
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    def p_step_statement(self, p):
        'step_statement : step SEMICOLON'
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    def p_step_postfix(self, p):
        """step : delays lvalue PLUSPLUS
        | delays lvalue MINUSMINUS
        """
        p[0] = self._step(p[2], "+=" if p[3] == "++" else "-=", None, p[1], p.lineno(3))
        p.set_lineno(0, p.lineno(3))

    def p_step_prefix(self, p):
        """step : PLUSPLUS lvalue
        | MINUSMINUS lvalue
        """
        p[0] = self._step(p[2], "+=" if p[1] == "++" else "-=", None, None, p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_step_compound(self, p):
        """step : delays lvalue PLUSEQUALS rvalue
        | delays lvalue MINUSEQUALS rvalue
        | delays lvalue TIMESEQUALS rvalue
        | delays lvalue ANDEQUALS rvalue
        | delays lvalue OREQUALS rvalue
        | delays lvalue XOREQUALS rvalue
        | delays lvalue LSHIFTEQUALS rvalue
        | delays lvalue RSHIFTEQUALS rvalue
        """
        p[0] = self._step(p[2], p[3], p[4].var, p[1], p.lineno(3))
        p.set_lineno(0, p.lineno(3))

    @staticmethod
    def _step(lvalue, operator, amount, delay, lineno):
        """``i++`` / ``i += e`` as the ordinary assignment ``i = i + 1`` / ``i = i + e``.

        The 1 of ``++``/``--`` is the unsized (32-bit signed) literal, as SystemVerilog
        defines ``i++`` to be ``i += 1``.
        """
        if amount is None:
            amount = vast.IntConst("1", lineno=lineno)
        value = _COMPOUND_OPERATORS[operator](_as_expression(lvalue), amount, lineno=lineno)
        return vast.BlockingSubstitution(lvalue, vast.Rvalue(value, lineno=lineno), delay,
                                         None, lineno=lineno)

    # -- for loops: declared loop variables, i++ steps --------------------------------------
    def p_forpre_declaration(self, p):
        """forpre : INT ID EQUALS rvalue SEMICOLON
        | INTEGER ID EQUALS rvalue SEMICOLON
        | GENVAR ID EQUALS rvalue SEMICOLON
        """
        lineno = p.lineno(1)
        kind = p[1]
        cls = {"int": Int, "integer": vast.Integer, "genvar": vast.Genvar}[kind]
        variable = cls(p[2], _word(lineno, 31), signed=kind != "genvar", lineno=lineno)
        target = vast.Lvalue(vast.Identifier(p[2], lineno=lineno), lineno=lineno)
        p[0] = LoopDeclaration(target, p[4], kind, variable, lineno=lineno)
        p.set_lineno(0, lineno)

    def p_forpost_step(self, p):
        'forpost : step'
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    # -- expressions: fill literals ----------------------------------------------------------
    def p_const_expression_fill(self, p):
        'const_expression : FILL_LITERAL'
        p[0] = FillConst(p[1], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    # -- null statements, `default` without a colon --------------------------------------------
    def p_event_statement(self, p):
        'event_statement : senslist SEMICOLON'
        if getattr(p[1], "implicit", False):
            # A lone `;` is the null statement (clause 9.1), not a wait for an event.
            p[0] = vast.Block((), lineno=p.lineno(2))
            p.set_lineno(0, p.lineno(2))
            return
        p[0] = vast.EventStatement(p[1], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_casecontent_statement_default_bare(self, p):
        'casecontent_statement : DEFAULT basic_statement'
        # Clause 9.5: the colon after `default` is optional.
        p[0] = vast.Case(None, p[2], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    # -- always without an event control ---------------------------------------------------
    def p_always(self, p):
        'always : ALWAYS senslist always_statement'
        if getattr(p[2], "implicit", False):
            self._problem("always without an event control (@) is not supported", p.lineno(1))
        p[0] = vast.Always(p[2], p[3], lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_sens_empty(self, p):
        'senslist : empty'
        # always_comb / always_latch: sensitive to everything they read (like @*).
        p[0] = vast.SensList((vast.Sens(None, "all", lineno=p.lineno(1)),), lineno=p.lineno(1))
        p[0].implicit = True
        p.set_lineno(0, p.lineno(1))

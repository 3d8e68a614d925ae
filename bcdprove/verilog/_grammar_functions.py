"""The function productions of the extended grammar: ``automatic``, typed results
(``integer``, ``int``, ``reg``, ``logic``, signed and ranged), ANSI port lists, several
statements without ``begin ... end`` and ``endfunction : name`` labels.

A mixin of :class:`~bcdprove.verilog._grammar.ExtendedParser`: ply collects the ``p_*``
methods of the whole class, so where they are written does not change the grammar (the start
symbol is given explicitly).
"""
from __future__ import annotations

import copy

from pyverilog.vparser import ast as vast



def word(lineno: int, value: int) -> vast.Width:
    """The range ``[value:0]`` (``[31:0]`` is the range of ``integer`` and ``int``)."""
    return vast.Width(vast.IntConst(str(value), lineno=lineno), vast.IntConst("0", lineno=lineno),
                      lineno=lineno)


class FunctionGrammar:
    """Productions for ``function ... endfunction``; pyverilog's own ones are removed."""

    # -- functions: automatic, typed results, ANSI ports, end labels -------------------------
    p_function_nowidth = p_function_integer = None
    p_function_statement = p_funcvardecls = p_funcvardecls_one = None
    p_funcvardecl = p_function_calc = None

    def p_function(self, p):
        'function : FUNCTION lifetime data_type ID SEMICOLON function_items function_body ENDFUNCTION function_label'
        p[0] = self._function(p, p[4], p[3], p[2], (), p[6], p[7], p[9])

    def p_function_ansi(self, p):
        'function : FUNCTION lifetime data_type ID LPAREN function_ports RPAREN SEMICOLON function_items function_body ENDFUNCTION function_label'
        p[0] = self._function(p, p[4], p[3], p[2], p[6], p[9], p[10], p[12])

    def p_function_ansi_empty(self, p):
        'function : FUNCTION lifetime data_type ID LPAREN RPAREN SEMICOLON function_items function_body ENDFUNCTION function_label'
        p[0] = self._function(p, p[4], p[3], p[2], (), p[8], p[9], p[11])

    def _function(self, p, name, result, automatic, ports, items, body, label):
        """A Function whose ``statement`` is: one Decl(Input) per port, the body's
        declarations, then the body (several statements become one Block) -- the same
        shape pyverilog gives a function with old-style ``input`` declarations.

        Extra attributes: ``automatic`` (bool), ``signed`` (bool: the result is signed),
        ``return_type`` ("implicit" for [msb:lsb] or none, "integer", "int", "reg", "logic").
        """
        lineno = p.lineno(1)
        if label is not None and label != name:
            self._problem(f"endfunction label {label!r} does not match function {name!r}",
                          lineno)
        width, signed, kind = result
        if width is None:
            width = word(lineno, 0)
        function = vast.Function(name, width, tuple(ports) + tuple(items) + (body,),
                                 lineno=lineno)
        function.automatic = automatic
        function.signed = signed
        function.return_type = kind
        p.set_lineno(0, lineno)
        return function

    def p_lifetime(self, p):
        """lifetime : AUTOMATIC
        | empty
        """
        p[0] = p[1] == "automatic"

    def p_function_label(self, p):
        """function_label : COLON ID
        | empty
        """
        p[0] = p[2] if len(p) == 3 else None

    def p_function_items(self, p):
        """function_items : function_items function_item
        | empty
        """
        p[0] = p[1] + (p[2],) if len(p) == 3 else ()

    def p_function_item(self, p):
        """function_item : decl
        | integerdecl
        | intdecl
        | parameterdecl
        """
        for declared in p[1].list:
            if not isinstance(declared, (vast.Input, vast.Reg, vast.Integer, vast.Parameter)):
                self._problem(f"{type(declared).__name__.lower()} {declared.name!r} cannot "
                              "be declared in a function", p.lineno(1))
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    def p_function_item_integer_input(self, p):
        """function_item : INPUT INTEGER declnamelist SEMICOLON
        | INPUT INT declnamelist SEMICOLON
        """
        lineno = p.lineno(1)
        inputs = []
        for name, dimensions in p[3]:
            if dimensions is not None:
                self._problem(f"function input {name!r} cannot be an array", lineno)
            inputs.append(vast.Input(name, word(lineno, 31), True, lineno=lineno))
        p[0] = vast.Decl(tuple(inputs), lineno=lineno)
        p.set_lineno(0, lineno)

    def p_function_body(self, p):
        'function_body : function_statements'
        statements = p[1]
        # SystemVerilog allows several statements without begin ... end.
        p[0] = statements[0] if len(statements) == 1 else vast.Block(
            statements, lineno=statements[0].lineno)
        p.set_lineno(0, p.lineno(1))

    def p_function_statements(self, p):
        """function_statements : function_statements basic_statement
        | basic_statement
        """
        p[0] = p[1] + (p[2],) if len(p) == 3 else (p[1],)
        p.set_lineno(0, p.lineno(1))

    def p_function_ports(self, p):
        """function_ports : function_ports COMMA function_port
        | function_port
        """
        if len(p) == 2:
            if isinstance(p[1], str):
                self._problem(f"function port {p[1]!r} needs a direction (input)",
                              p.lineno(1))
            p[0] = (p[1],)
        elif isinstance(p[3], str):
            previous = p[1][-1].list[0]
            repeated = vast.Input(p[3], copy.deepcopy(previous.width), previous.signed,
                                  lineno=p.lineno(3))
            p[0] = p[1] + (vast.Decl((repeated,), lineno=p.lineno(3)),)
        else:
            p[0] = p[1] + (p[3],)
        p.set_lineno(0, p.lineno(1))

    def p_function_port(self, p):
        'function_port : INPUT data_type ID'
        width, signed, _ = p[2]
        port = vast.Input(p[3], width, signed, lineno=p.lineno(1))
        p[0] = vast.Decl((port,), lineno=p.lineno(1))
        p.set_lineno(0, p.lineno(1))

    def p_function_port_repeat(self, p):
        'function_port : ID'
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))


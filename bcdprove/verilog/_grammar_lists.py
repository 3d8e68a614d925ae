"""Module items collected in linear time.

pyverilog grows the item list of a module by tuple concatenation, one copy per item, so
reading a module took time quadratic in its items: a 128-bit gate-level netlist (80,000
wire declarations and gate instances) spent 3.8 of its 18 s of parsing there.  These
productions have the same right-hand sides and append to one list instead; the elaborator
only iterates over ``ModuleDef.items``, so a list serves as well as a tuple.

A mixin of :class:`~bcdprove.verilog._grammar.ExtendedParser` (see _grammar_functions.py
for why where a production is written does not change the grammar).
"""
from __future__ import annotations


class ListGrammar:
    """``items`` as a growing list."""

    def p_items(self, p):
        'items : items item'
        p[1].append(p[2])
        p[0] = p[1]
        p.set_lineno(0, p.lineno(1))

    def p_items_one(self, p):
        'items : item'
        p[0] = [p[1]]
        p.set_lineno(0, p.lineno(1))

    def p_items_empty(self, p):
        'items : empty'
        p[0] = []

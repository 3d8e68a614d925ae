"""Constant expressions of generate loops, evaluated once per set of parameter values.

A wide generate array evaluates the same few index expressions (``4*j``, ``j+1``, ``s < W``)
in every iteration, each time through the full width and signedness machinery, and so does
an unrolled procedural loop (``k < D``, ``k - 1``).  An expression built only from literals,
parameters, genvars and procedural variables holding constants, with operators that cannot
make an unknown value, has a value fixed by what those names denote, so
:func:`constant_key` names it by (syntax node, the Parameter or the (variable, constant)
each identifier denotes) and the elaborator keeps the first result under that key.  Evaluating it again would make exactly the same constant
nodes (the graph makes each node once), so remembering it changes nothing in the model.

Anything else (a variable, a function or system call, a select, division or power, which
may make a free value, a literal with x or z bits, a real) is not memoised.
"""
from __future__ import annotations

from typing import Any, Optional

from pyverilog.vparser import ast as vast

from ..model.node import Op
from ._constants import parse_literal
from ._scope import Parameter, Var

_OPERATORS = (vast.Plus, vast.Minus, vast.Times, vast.And, vast.Or, vast.Xor, vast.Xnor,
              vast.Sll, vast.Srl, vast.Sla, vast.Sra,
              vast.LessThan, vast.GreaterThan, vast.LessEq, vast.GreaterEq, vast.Eq, vast.NotEq,
              vast.Land, vast.Lor,
              vast.Uplus, vast.Uminus, vast.Unot, vast.Ulnot,
              vast.Uand, vast.Unand, vast.Uor, vast.Unor, vast.Uxor, vast.Uxnor,
              vast.Cond, vast.Rvalue)


def constant_key(expressions: Any, e: Any) -> Optional[tuple]:
    """A key fixing the value of ``e`` in ``expressions``' scope, or None when ``e`` is not
    memoised (see the module docstring)."""
    shapes = expressions.design.constant_shapes
    entry = shapes.get(id(e))
    if entry is None:
        # The entry keeps ``e`` alive so that its id is not reused for another node.
        entry = shapes[id(e)] = (e, _names(e))
    names = entry[1]
    if names is None:
        return None
    key: list[Any] = [id(e)]
    frame = expressions.frame
    lookup = expressions.scope.lookup
    for name in names:
        found = frame.lookup(name) if frame is not None else None
        if found is None:
            found = lookup(name)
        if type(found) is Parameter and found.real is None:
            key.append(found)
        elif frame is not None and type(found) is Var and frame.owns(found):
            # A loop counter of procedural code: its value so far, when it is a constant
            # (reading it then has no side effect; otherwise the expression is not memoised).
            value = frame.value_so_far(found)
            if value is None or value.op != Op.CONST:
                return None
            key.append((found, value))
        else:
            return None
    return tuple(key)


def _names(e: Any) -> Optional[tuple[str, ...]]:
    """The identifiers ``e`` reads, in first-use order, or None when ``e`` has a part that is
    not memoised."""
    names: list[str] = []
    stack = [e]
    while stack:
        item = stack.pop()
        if isinstance(item, vast.Identifier):
            if item.scope is not None:
                return None
            if item.name not in names:
                names.append(item.name)
        elif isinstance(item, vast.IntConst):
            try:
                literal = parse_literal(str(item.value))
            except ValueError:
                return None
            if literal.unknown or literal.fill is not None:
                return None
        elif type(item) in _OPERATOR_TYPES:
            stack.extend(reversed(item.children()))
        else:
            return None
    return tuple(names)


_OPERATOR_TYPES = frozenset(_OPERATORS)

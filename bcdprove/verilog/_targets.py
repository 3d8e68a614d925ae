"""Left-hand sides of assignments, split into the pieces of variables they write.

:func:`lvalue_parts` turns an assignment target (identifier, bit/part select, indexed part
select, memory element, concatenation of these) into :class:`Target` pieces, most
significant first, whose widths add up to the target's width (clause 9.2.1, 6.1).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Optional

from pyverilog.vparser import ast as vast

from ..errors import UnsupportedConstruct
from ..model.node import Node, Op
from ._expressions import Expressions, indexed_select
from ._scope import Memory, Parameter, Var


@dataclass
class Target:
    """``width`` bits of ``var`` from model bit ``lo`` (static), or from the variable bit
    ``offset`` when ``fits`` (dynamic), or one of ``elements`` (address hit, element var)."""

    width: int
    var: Optional[Var] = None
    lo: int = 0
    offset: Optional[Node] = None
    fits: Optional[Node] = None
    elements: list = field(default_factory=list)


def lvalue_parts(design: Any, expressions: Expressions, e: Any, procedural: bool) -> list[Target]:
    if isinstance(e, vast.Lvalue):
        return lvalue_parts(design, expressions, e.var, procedural)
    if isinstance(e, vast.Concat):
        parts: list[Target] = []
        for item in e.list:
            parts.extend(lvalue_parts(design, expressions, item, procedural))
        return parts
    if isinstance(e, vast.Identifier):
        var = _target_var(design, expressions, e, procedural)
        return [Target(var.width, var, 0)]
    if isinstance(e, vast.Pointer):
        if isinstance(e.var, vast.Identifier):
            found = _resolve_target(design, expressions, e.var, procedural)
            if isinstance(found, Memory):
                return [_memory_target(design, expressions, found, e, procedural)]
            var = _as_var(design, found, e.var)
        else:
            parts = lvalue_parts(design, expressions, e.var, procedural)
            if len(parts) != 1 or parts[0].var is None or parts[0].lo != 0 \
                    or parts[0].width != parts[0].var.width:
                raise design.error("unsupported construct: select of a selected target", e,
                                   UnsupportedConstruct)
            var = parts[0].var
        return [_select_target(design, expressions, var, e, e.ptr, 1, True, procedural)]
    if isinstance(e, vast.Partselect):
        found = _resolve_target(design, expressions, e.var, procedural) \
            if isinstance(e.var, vast.Identifier) else None
        if found is None:
            parts = lvalue_parts(design, expressions, e.var, procedural)
            if len(parts) != 1 or parts[0].var is None:
                raise design.error("unsupported construct: part-select of this target", e,
                                   UnsupportedConstruct)
            found = parts[0].var
        var = _as_var(design, found, e.var)
        indexed = indexed_select(e)
        if indexed is not None:
            start, width_expr, up = indexed
            count = expressions.const_int(width_expr)
            if count < 1:
                raise design.error(f"part-select width must be positive, got {count}", e)
            return [_select_target(design, expressions, var, e, start, count, up, procedural)]
        left, right = expressions.const_int(e.msb), expressions.const_int(e.lsb)
        low = min(left, right)
        return [_static(design, var, e, low, abs(left - right) + 1)]
    raise design.error(f"unsupported construct `{type(e).__name__}` as an assignment target", e,
                       UnsupportedConstruct)


def _resolve_target(design: Any, expressions: Expressions, ident: vast.Identifier,
                    procedural: bool) -> Any:
    if ident.scope is None and not procedural:
        found = expressions.scope.lookup(ident.name)
        if found is None:
            return design.implicit_net(expressions.scope, ident.name, ident)
        return found
    return expressions.resolve(ident)


def _target_var(design: Any, expressions: Expressions, ident: vast.Identifier,
                procedural: bool) -> Var:
    return _as_var(design, _resolve_target(design, expressions, ident, procedural), ident)


def _as_var(design: Any, found: Any, node: Any) -> Var:
    if isinstance(found, Var):
        return found
    name = getattr(node, "name", "?")
    if isinstance(found, Parameter):
        raise design.error(f"cannot assign to parameter `{name}`", node)
    if isinstance(found, Memory):
        raise design.error(f"memory `{name}` assigned without an index", node)
    raise design.error(f"`{name}` cannot be assigned", node)


def _static(design: Any, var: Var, e: Any, low_index: int, count: int) -> Target:
    bits = [var.model_bit(low_index), var.model_bit(low_index + count - 1)]
    lo, hi = min(bits), max(bits)
    if lo < 0 or hi >= var.width:
        raise design.error(f"select [{low_index + count - 1}:{low_index}] is outside the "
                           f"declared range [{var.msb}:{var.lsb}] of `{var.name}`", e)
    return Target(count, var, lo)


def _select_target(design: Any, expressions: Expressions, var: Var, e: Any, start: Any,
                   count: int, up: bool, procedural: bool) -> Target:
    position = expressions.const_int_or_none(start)
    if position is not None:
        return _static(design, var, e, position if up else position - count + 1, count)
    if not procedural:
        raise design.error("unsupported construct: continuous assignment to a select with a "
                           "variable index", e, UnsupportedConstruct)
    index, index_type = expressions.self_value(start)
    offset, fits = expressions.dynamic_offset(index, index_type.signed, count, up, var.width,
                                              var.msb, var.lsb)
    if design.has_unknown(index):
        fits = design.graph.and_(fits, design.graph.free(1, "write at an unknown index"))
    return Target(count, var, 0, offset, fits)


def _memory_target(design: Any, expressions: Expressions, memory: Memory, e: vast.Pointer,
                   procedural: bool) -> Target:
    position = expressions.const_int_or_none(e.ptr)
    if position is not None:
        k = position - memory.first
        if not 0 <= k < len(memory.elements):
            if not procedural:
                raise design.error(f"address {position} is outside memory `{memory.name}`", e)
            return Target(memory.element_width, None, elements=[])  # clause 9.2.1: no effect
        element = memory.elements[k]
        return Target(element.width, element, 0)
    if not procedural:
        raise design.error("unsupported construct: continuous assignment to a memory element "
                           "with a variable address", e, UnsupportedConstruct)
    index, index_type = expressions.self_value(e.ptr)
    unknown = design.has_unknown(index)
    elements = []
    for k, element in enumerate(memory.elements):
        hit = expressions.address_match(index, index_type.signed, memory.first + k)
        if unknown:
            hit = design.graph.and_(hit, design.graph.free(1, "write at an unknown address"))
        if hit.op == Op.CONST and not hit.value:
            continue
        elements.append((hit, element))
    return Target(memory.element_width, None, elements=elements)

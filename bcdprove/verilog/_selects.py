"""Bit selects, part selects, indexed part selects and memory reads (IEEE 1364-2005 5.2).

A mixin of :class:`~._expressions.Expressions`: declared indices map to model bits through
the declared range (either direction, negative indices allowed); a constant select outside
the range reads x per bit, a variable one is guarded by a range test with an x otherwise.
"""
from __future__ import annotations

from typing import Any, Optional

from pyverilog.vparser import ast as vast

from ..errors import UnsupportedConstruct
from ..model.node import Node, Op, to_signed
from ._scope import Memory, Parameter, Var


def indexed_select(select: vast.Partselect) -> Optional[tuple[Any, Any, bool]]:
    """``(base, width expression, ascending)`` when ``select`` is ``v[base +: w]`` / ``-:``.

    pyverilog writes ``v[b +: w]`` as ``Partselect(v, b, Plus(b, w))`` sharing the very
    object ``b``; a written ``v[b : b + w]`` parses ``b`` twice, so identity tells them apart.
    """
    lsb = select.lsb
    if isinstance(lsb, (vast.Plus, vast.Minus)) and lsb.left is select.msb:
        return select.msb, lsb.right, isinstance(lsb, vast.Plus)
    return None



class Selects:
    """Select handling shared by expression building (see module docstring)."""

    # ------------------------------------------------------------------ selects
    def base_of(self, e: Any) -> tuple[Any, Optional[Var], int, int, int]:
        """The selectable value under a select: (ast, var or None, width, msb, lsb)."""
        if isinstance(e, vast.Identifier):
            found = self.resolve(e)
            if isinstance(found, Var):
                return e, found, found.width, found.msb, found.lsb
            if isinstance(found, Parameter) and found.real is None:
                return e, None, found.width, found.width - 1, 0
            raise self.error(f"`{e.name}` cannot be selected from", e)
        if isinstance(e, vast.Pointer):
            memory = self._memory_of(e.var)
            if memory is not None:
                index = self.const_int_or_none(e.ptr)
                if index is not None and 0 <= index - memory.first < len(memory.elements):
                    var = memory.elements[index - memory.first]
                    return e, var, var.width, var.msb, var.lsb
                return e, None, memory.element_width, memory.element_width - 1, 0
        raise self.error(f"unsupported construct: select of `{type(e).__name__}`", e,
                         UnsupportedConstruct)

    def const_int_or_none(self, e: Any) -> Optional[int]:
        """The value of ``e`` if it folds to a constant here, else None."""
        node, t = self.self_value(e)
        if node.op != Op.CONST:
            return None
        return to_signed(node.value, node.width) if t.signed else node.value

    def _base_bits(self, base: Any, var: Optional[Var], lo: int, hi: int) -> Node:
        if var is not None:
            return self._read_var(var, base, lo, hi)
        return self.graph.extract(self.self_value(base)[0], hi, lo)

    def _bit_select(self, e: vast.Pointer) -> Node:
        memory = self._memory_of(e.var)
        if memory is not None:
            return self._memory_read(memory, e)
        base, var, width, msb, lsb = self.base_of(e.var)
        return self._select(e, base, var, width, msb, lsb, e.ptr, 1, True)

    def _part_select(self, e: vast.Partselect) -> Node:
        base, var, width, msb, lsb = self.base_of(e.var)
        indexed = indexed_select(e)
        if indexed is not None:
            start, width_expr, up = indexed
            count = self._select_width(width_expr)
            return self._select(e, base, var, width, msb, lsb, start, count, up)
        left, right = self.const_int(e.msb), self.const_int(e.lsb)
        ascending = msb < lsb
        if (left > right) == ascending and left != right:
            raise self.error(f"part-select [{left}:{right}] runs against the declared range "
                             f"[{msb}:{lsb}]", e)
        return self._select_constant(e, base, var, width, msb, lsb, min(left, right),
                                     abs(left - right) + 1)

    def _select_constant(self, e: Any, base: Any, var: Optional[Var], width: int, msb: int,
                         lsb: int, low_index: int, count: int) -> Node:
        """Indices ``low_index .. low_index + count - 1`` of the base; out of range is x."""
        bits = []
        for index in (low_index, low_index + count - 1):
            bits.append(index - lsb if msb >= lsb else lsb - index)
        lo, hi = min(bits), max(bits)
        if lo >= 0 and hi < width:
            return self._base_bits(base, var, lo, hi)
        if self.constant and self.frame is None:
            raise self.error(f"select [{low_index + count - 1}:{low_index}] is outside the "
                             f"declared range [{msb}:{lsb}]", e)
        # Clause 5.2.1: bits outside the declared range read as x.
        g = self.graph
        parts = []
        for bit in range(hi, lo - 1, -1):
            if 0 <= bit < width:
                parts.append(self._base_bits(base, var, bit, bit))
            else:
                parts.append(g.free(1, "x: select outside the declared range"))
        return g.concat(*parts)

    def _select(self, e: Any, base: Any, var: Optional[Var], width: int, msb: int, lsb: int,
                start: Any, count: int, up: bool) -> Node:
        """``count`` bits at declared indices from ``start`` upward (``up``) or downward."""
        g = self.graph
        position = self.const_int_or_none(start)
        if position is not None:
            low_index = position if up else position - count + 1
            return self._select_constant(e, base, var, width, msb, lsb, low_index, count)
        index, index_type = self.self_value(start)
        if self.design.has_unknown(index):
            return g.free(count, "select with an unknown index")
        offset, fits = self.dynamic_offset(index, index_type.signed, count, up, width, msb, lsb)
        full = self._base_bits(base, var, 0, width - 1)
        shifted = g.extract(g.lshr(g.zext(full, width + count), offset), count - 1, 0) \
            if count <= width else g.free(count, "select wider than its base")
        if fits.op == Op.CONST:
            return shifted if fits.value else g.free(count, "x: select outside the declared range")
        return g.ite(fits, shifted, g.free(count, "select outside the declared range"))

    def dynamic_offset(self, index: Node, signed: bool, count: int, up: bool, width: int,
                       msb: int, lsb: int) -> tuple[Node, Node]:
        """Model bit of the lowest of ``count`` selected bits starting at declared index
        ``index`` (upward when ``up``), and a 1-bit node telling whether all are in range."""
        g = self.graph
        offset_width = max(index.width, (abs(msb) + abs(lsb) + width + count).bit_length()) + 2
        wide = g.resize(index, offset_width, signed)
        low_index = wide if up else g.sub(wide, g.const(count - 1, offset_width))
        if msb >= lsb:
            offset = g.sub(low_index, g.const(lsb, offset_width))
        else:
            offset = g.sub(g.const(lsb - count + 1, offset_width), low_index)
        fits = g.and_(g.sle(g.zero(offset_width), offset),
                      g.sle(offset, g.const(width - count, offset_width)))
        return offset, fits

    def _memory_read(self, memory: Memory, e: vast.Pointer) -> Node:
        g = self.graph
        position = self.const_int_or_none(e.ptr)
        if position is not None:
            k = position - memory.first
            if 0 <= k < len(memory.elements):
                return self._read_var(memory.elements[k], e)
            return g.free(memory.element_width, "x: memory address out of range")
        index, index_type = self.self_value(e.ptr)
        if self.design.has_unknown(index):
            return g.free(memory.element_width, "memory read at an unknown address")
        result = g.free(memory.element_width, "memory address out of range")
        for k in range(len(memory.elements) - 1, -1, -1):
            hit = self.address_match(index, index_type.signed, memory.first + k)
            if hit.op == Op.CONST and not hit.value:
                continue
            result = g.ite(hit, self._read_var(memory.elements[k], e), result)
        return result

    def address_match(self, index: Node, signed: bool, address: int) -> Node:
        """1 when ``index`` (read with its signedness) equals the integer ``address``."""
        g = self.graph
        width = max(index.width, address.bit_length() + 1) + 1
        return g.eq(g.resize(index, width, signed), g.const(address, width))

"""Expressions to nodes, with the widths and signedness of IEEE 1364-2005 clauses 5.4 and 5.5.

Every expression is handled in two steps: :meth:`Expressions.type_of` gives its
self-determined width and signedness (clause 5.4.1, Table 5-22; clause 5.5.1), then
:meth:`Expressions.value` builds it in a context of at least that width, passing the
context down to context-determined operands and extending each self-determined operand
(sign-extended only when the whole expression is signed, clause 5.5.2).

x, z, out-of-range selects and division by zero become fresh free values, never 0.
Reals exist only in constant expressions (parameters, sizes), evaluated with Python floats.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Optional

from pyverilog.vparser import ast as vast

from ..errors import BcdproveError, UnsupportedConstruct
from ..model.node import Node, Op, mask, to_signed
from ._constants import REAL_FUNCTIONS, Literal, clog2, parse_literal, real_to_integer
from ._constant_memo import constant_key
from ._scope import FunctionDef, Memory, Parameter, Scope, Var
from ._selects import Selects, indexed_select


@dataclass(frozen=True)
class Type:
    """Self-determined type of an expression: ``width`` may be 0 (a zero replication)."""

    width: int
    signed: bool
    real: bool = False


_REAL = Type(64, True, True)
_BIT = Type(1, False)
_INTEGER = Type(32, True)

_CONTEXT_BINARY = (vast.Plus, vast.Minus, vast.Times, vast.Divide, vast.Mod, vast.And, vast.Or,
                   vast.Xor, vast.Xnor)
_COMPARISONS = (vast.LessThan, vast.GreaterThan, vast.LessEq, vast.GreaterEq, vast.Eq,
                vast.NotEq, vast.Eql, vast.NotEql)
_REDUCTIONS = (vast.Uand, vast.Unand, vast.Uor, vast.Unor, vast.Uxor, vast.Uxnor)
_SHIFTS = (vast.Sll, vast.Srl, vast.Sla, vast.Sra)


class Expressions(Selects):
    """Builds expression nodes in one scope; ``frame`` (a procedural execution) may own
    variables, and ``constant`` forbids reading anything but parameters and genvars."""

    def __init__(self, design: Any, scope: Scope, frame: Any = None, constant: bool = False):
        self.design = design
        self.graph = design.graph
        self.scope = scope
        self.frame = frame
        self.constant = constant
        # id -> (node, type): keeping the node alive keeps its id from being reused
        self._types: dict[int, tuple[Any, Type]] = {}

    # ------------------------------------------------------------------ errors
    def error(self, message: str, node: Any, kind: type = BcdproveError) -> BcdproveError:
        return self.design.error(message, node, kind)

    # ------------------------------------------------------------------ names
    def resolve(self, ident: vast.Identifier) -> Any:
        """What an identifier denotes: Var, Memory, Parameter, FunctionDef (or raise)."""
        if ident.scope is not None and ident.scope.labellist:
            scope: Optional[Scope] = None
            for number, label in enumerate(ident.scope.labellist):
                name = label.name
                if label.loop is not None:
                    name = f"{name}[{self.const_int(label.loop)}]"
                scope = self.scope.child(name) if number == 0 else scope.children.get(name)
                if scope is None:
                    raise self.error(f"undeclared identifier `{name}` in hierarchical name "
                                     f"`{name}.{ident.name}`", ident)
            found = scope.names.get(ident.name)
            if found is None:
                raise self.error(f"undeclared identifier `{ident.name}` in scope "
                                 f"`{scope.prefix.rstrip('.')}`", ident)
            return found
        if self.frame is not None:
            found = self.frame.lookup(ident.name)
            if found is not None:
                return found
        found = self.scope.lookup(ident.name)
        if found is None:
            found = self.design.implicit_or_none(self.scope, ident.name)
        if found is None:
            raise self.error(f"undeclared identifier `{ident.name}`", ident)
        return found

    def _read_var(self, var: Var, node: Any, lo: int = 0, hi: Optional[int] = None) -> Node:
        if hi is None:
            hi = var.width - 1
        if self.frame is not None and self.frame.owns(var):
            full = self.frame.read(var, node)
            return self.graph.extract(full, hi, lo)
        if self.constant:
            raise self.error(f"`{var.name}` is not a constant (a parameter or genvar was "
                             f"expected in a constant expression)", node)
        return self.design.read_bits(var, lo, hi, node)

    # ------------------------------------------------------------------ types
    def type_of(self, e: Any) -> Type:
        """Self-determined width and signedness of ``e`` (memoised per syntax node)."""
        known = self._types.get(id(e))
        if known is not None:
            return known[1]
        found = self._type_of(e)
        self._types[id(e)] = (e, found)
        return found

    def _type_of(self, e: Any) -> Type:
        if isinstance(e, (vast.Rvalue, vast.Lvalue)):
            return self.type_of(e.var)
        if isinstance(e, vast.IntConst):
            lit = self._literal(e)
            return Type(lit.width, lit.signed)
        if isinstance(e, vast.FloatConst):
            return _REAL
        if isinstance(e, vast.StringConst):
            return Type(max(8, 8 * len(e.value)), False)
        if isinstance(e, vast.Identifier):
            found = self.resolve(e)
            if isinstance(found, Var):
                return Type(found.width, found.signed)
            if isinstance(found, Parameter):
                return _REAL if found.real is not None else Type(found.width, found.signed)
            if isinstance(found, Memory):
                raise self.error(f"memory `{e.name}` used without an index", e)
            raise self.error(f"`{e.name}` is not a value", e)
        if isinstance(e, vast.Pointer):
            memory = self._memory_of(e.var)
            if memory is not None:
                return Type(memory.element_width, memory.signed)
            return _BIT
        if isinstance(e, vast.Partselect):
            indexed = indexed_select(e)
            if indexed is not None:
                return Type(self._select_width(indexed[1]), False)
            return Type(abs(self.const_int(e.msb) - self.const_int(e.lsb)) + 1, False)
        if isinstance(e, vast.Repeat):
            return Type(self.const_int(e.times) * self.type_of(e.value).width, False)
        if isinstance(e, vast.Concat):
            return Type(sum(self.type_of(p).width for p in e.list), False)
        if isinstance(e, (vast.Uplus, vast.Uminus, vast.Unot)):
            return self.type_of(e.right)
        if isinstance(e, (vast.Ulnot,) + _REDUCTIONS):
            return _BIT
        if isinstance(e, _CONTEXT_BINARY):
            a, b = self.type_of(e.left), self.type_of(e.right)
            if a.real or b.real:
                return _REAL
            return Type(max(a.width, b.width), a.signed and b.signed)
        if isinstance(e, vast.Power):
            a, b = self.type_of(e.left), self.type_of(e.right)
            # Icarus Verilog 11 (checked by hand): the base alone decides the signedness.
            return _REAL if a.real or b.real else a
        if isinstance(e, _SHIFTS):
            return self.type_of(e.left)
        if isinstance(e, _COMPARISONS + (vast.Land, vast.Lor)):
            return _BIT
        if isinstance(e, vast.Cond):
            a, b = self.type_of(e.true_value), self.type_of(e.false_value)
            if a.real or b.real:
                return _REAL
            return Type(max(a.width, b.width), a.signed and b.signed)
        if isinstance(e, vast.SystemCall):
            return self._system_type(e)
        if isinstance(e, vast.FunctionCall):
            function = self._function(e)
            return self.design.function_type(function)
        raise self.error(f"unsupported construct `{type(e).__name__}` in an expression", e,
                         UnsupportedConstruct)

    def _system_type(self, e: vast.SystemCall) -> Type:
        name = e.syscall
        if name in ("signed", "unsigned"):
            inner = self.type_of(self._one_argument(e))
            return Type(inner.width, name == "signed")
        if name in ("clog2", "rtoi", "bits"):
            return _INTEGER
        if name == "itor" or name in REAL_FUNCTIONS:
            return _REAL
        raise self.error(f"unsupported construct `${name}` in an expression", e,
                         UnsupportedConstruct)

    def _one_argument(self, e: vast.SystemCall) -> Any:
        if len(e.args) != 1:
            raise self.error(f"`${e.syscall}` takes one argument, got {len(e.args)}", e)
        return e.args[0]

    def _literal(self, e: vast.IntConst) -> Literal:
        try:
            return parse_literal(str(e.value))
        except ValueError as problem:
            raise self.error(str(problem), e) from None

    def _function(self, e: vast.FunctionCall) -> FunctionDef:
        found = self.scope.lookup(e.name.name)
        if not isinstance(found, FunctionDef):
            raise self.error(f"undeclared function `{e.name.name}`", e)
        return found

    def _memory_of(self, e: Any) -> Optional[Memory]:
        if isinstance(e, vast.Identifier):
            found = self.resolve(e)
            return found if isinstance(found, Memory) else None
        return None

    def _select_width(self, e: Any) -> int:
        width = self.const_int(e)
        if width < 1:
            raise self.error(f"part-select width must be positive, got {width}", e)
        return width

    # ------------------------------------------------------------------ constants
    def const_int(self, e: Any) -> int:
        """The value of a constant integer expression (signed if its type is signed)."""
        key = constant_key(self, e)
        if key is not None:
            node, t = self.self_value(e, key)
            if node.op == Op.CONST:
                return to_signed(node.value, t.width) if t.signed else node.value
        t = self.type_of(e)
        if t.real:
            try:
                return real_to_integer(self.real_value(e))
            except ValueError as problem:
                raise self.error(str(problem), e) from None
        if t.width == 0:
            raise self.error("a zero replication is not a value", e)
        node = self.value(e, t.width, t.signed)
        if node.op != Op.CONST:
            raise self.error("expression is not constant here (its value must be known "
                             "during elaboration)", e)
        return to_signed(node.value, t.width) if t.signed else node.value

    def const_parameter(self, e: Any) -> Parameter:
        """A constant expression as a parameter value keeping its own type (clause 12.2)."""
        t = self.type_of(e)
        if t.real:
            return Parameter(64, True, 0, self.real_value(e))
        node = self.value(e, t.width, t.signed)
        if node.op != Op.CONST:
            raise self.error("parameter value is not constant", e)
        return Parameter(t.width, t.signed, node.value)

    def real_value(self, e: Any) -> float:
        """The value of a constant expression as a real (integers convert exactly)."""
        if isinstance(e, vast.Rvalue):
            return self.real_value(e.var)
        t = self.type_of(e)
        if not t.real:
            return float(self.const_int(e))
        if isinstance(e, vast.FloatConst):
            return float(str(e.value).replace("_", ""))
        if isinstance(e, vast.Identifier):
            found = self.resolve(e)
            assert isinstance(found, Parameter) and found.real is not None
            return found.real
        if isinstance(e, vast.Uplus):
            return self.real_value(e.right)
        if isinstance(e, vast.Uminus):
            return -self.real_value(e.right)
        if isinstance(e, (vast.Plus, vast.Minus, vast.Times, vast.Divide, vast.Power)):
            a, b = self.real_value(e.left), self.real_value(e.right)
            try:
                if isinstance(e, vast.Plus):
                    return a + b
                if isinstance(e, vast.Minus):
                    return a - b
                if isinstance(e, vast.Times):
                    return a * b
                if isinstance(e, vast.Divide):
                    return a / b
                return a ** b
            except (ZeroDivisionError, OverflowError, ValueError):
                raise self.error("real arithmetic has no value here (division by zero or "
                                 "overflow)", e) from None
        if isinstance(e, vast.Cond):
            chosen = e.true_value if self.const_int(e.cond) else e.false_value
            return self.real_value(chosen)
        if isinstance(e, vast.SystemCall):
            if e.syscall == "itor":
                return float(self.const_int(self._one_argument(e)))
            count, function = REAL_FUNCTIONS[e.syscall]
            if len(e.args) != count:
                raise self.error(f"`${e.syscall}` takes {count} argument(s)", e)
            result = float(function(*[self.real_value(a) for a in e.args]))
            return result
        raise self.error(f"unsupported construct `{type(e).__name__}` with real operands", e,
                         UnsupportedConstruct)

    # ------------------------------------------------------------------ values
    def self_value(self, e: Any, key: Optional[tuple] = None) -> tuple[Node, Type]:
        """``e`` at its own width and signedness; ``key`` is ``constant_key(self, e)`` when
        the caller has it already."""
        if key is None:
            key = constant_key(self, e)
        if key is not None:
            found = self.design.constants.get(key)
            if found is not None:
                return found
        t = self.type_of(e)
        if t.width == 0:
            raise self.error("a zero replication is only allowed inside a concatenation", e)
        node = self.value(e, t.width, t.signed)
        if key is not None and node.op == Op.CONST:
            self.design.constants[key] = (node, t)
        return node, t

    def condition(self, e: Any) -> Node:
        """A 1-bit truth value: the expression is non-zero (clause 9.4)."""
        t = self.type_of(e)
        if t.real:
            return self.graph.const(int(self.real_value(e) != 0.0), 1)
        node, _ = self.self_value(e)
        return self.graph.reduce_or(node) if node.width > 1 else node

    def value(self, e: Any, width: int, signed: bool) -> Node:
        """``e`` evaluated in a context of ``width`` bits (at least its own), ``signed`` when
        the enclosing expression is signed."""
        g = self.graph
        if isinstance(e, (vast.Rvalue, vast.Lvalue)):
            return self.value(e.var, width, signed)
        t = self.type_of(e)
        if t.real:
            try:
                return g.const(real_to_integer(self.real_value(e)), width)
            except ValueError as problem:
                raise self.error(str(problem), e) from None
        if isinstance(e, vast.IntConst):
            lit = self._literal(e)
            if lit.fill is not None:
                if lit.unknown:
                    return g.free(width, f"`{e.value}` literal")
                return g.const(mask(width) if lit.value else 0, width)
            return self._extend(self._literal_node(lit, e), width, signed)
        if isinstance(e, _CONTEXT_BINARY):
            a = self.value(e.left, width, signed)
            b = self.value(e.right, width, signed)
            return self._binary(e, a, b, signed)
        if isinstance(e, vast.Uminus):
            return g.neg(self.value(e.right, width, signed))
        if isinstance(e, vast.Uplus):
            return self.value(e.right, width, signed)
        if isinstance(e, vast.Unot):
            return g.not_(self.value(e.right, width, signed))
        if isinstance(e, vast.Power):
            return self._power(e, width, signed)
        if isinstance(e, _SHIFTS):
            a = self.value(e.left, width, signed)
            amount, amount_type = self.self_value(e.right)
            if self.design.has_unknown(amount):
                return g.free(width, "shift by an unknown amount")
            if isinstance(e, (vast.Sll, vast.Sla)):
                return g.shl(a, amount)
            if isinstance(e, vast.Sra) and signed:
                return g.ashr(a, amount)
            return g.lshr(a, amount)
        if isinstance(e, vast.Cond):
            choose = self.condition(e.cond)
            a = self.value(e.true_value, width, signed)
            b = self.value(e.false_value, width, signed)
            if choose.op != Op.CONST and self.design.has_unknown(choose):
                # Clause 5.1.13: an unknown condition merges the arms bit by bit; bits that
                # differ are unknown.  A free value covers every outcome.
                same = g.not_(g.xor(a, b))
                unknown = g.free(width, "conditional with an unknown condition")
                return g.or_(g.and_(a, same), g.and_(unknown, g.not_(same)))
            return g.ite(choose, a, b)
        # self-determined results, extended to the context
        return self._extend(self._self_determined(e, t), width, signed)

    def _extend(self, node: Node, width: int, signed: bool) -> Node:
        if node.width > width:
            return self.graph.extract(node, width - 1, 0)
        return self.graph.resize(node, width, signed)

    def _literal_node(self, lit: Literal, e: vast.IntConst) -> Node:
        g = self.graph
        text = str(e.value)
        if not lit.unknown:
            return g.const(lit.value, lit.width)
        if self.constant and self.frame is None:
            raise self.error(f"x or z bits in the constant `{text}`", e)
        parts: list[Node] = []
        bit = lit.width - 1
        while bit >= 0:
            unknown = lit.unknown >> bit & 1
            top = bit
            while bit >= 0 and (lit.unknown >> bit & 1) == unknown:
                bit -= 1
            width = top - bit
            if unknown:
                parts.append(g.free(width, f"x/z bits of `{text}`"))
            else:
                parts.append(g.const(lit.value >> (bit + 1), width))
        return g.concat(*parts)

    def _binary(self, e: Any, a: Node, b: Node, signed: bool) -> Node:
        g = self.graph
        if isinstance(e, vast.Plus):
            return g.add(a, b)
        if isinstance(e, vast.Minus):
            return g.sub(a, b)
        if isinstance(e, vast.Times):
            return g.mul(a, b)
        if isinstance(e, (vast.Divide, vast.Mod)):
            # Clause 5.1.5: division or modulus by zero gives x.
            if isinstance(e, vast.Divide):
                result = g.sdiv(a, b) if signed else g.udiv(a, b)
            else:
                result = g.srem(a, b) if signed else g.urem(a, b)
            zero = g.eq(b, g.zero(b.width))
            if zero.op == Op.CONST and not zero.value:
                return result
            return g.ite(zero, g.free(a.width, "division by zero"), result)
        if isinstance(e, vast.And):
            return g.and_(a, b)
        if isinstance(e, vast.Or):
            return g.or_(a, b)
        if isinstance(e, vast.Xor):
            return g.xor(a, b)
        return g.not_(g.xor(a, b))    # Xnor

    def _power(self, e: vast.Power, width: int, signed: bool) -> Node:
        """Clause 5.1.5, Table 5-6: integer power, including negative bases and exponents."""
        g = self.graph
        base = self.value(e.left, width, signed)
        exponent, exponent_type = self.self_value(e.right)
        # Clause 5.1.5: the exponent keeps its own signedness (it is self-determined).
        # Icarus 11 differs when an unsigned base is all ones and at most 64 bits wide: it
        # then reads the base as -1; the standard's table reads it as a large positive value.
        exponent_signed = exponent_type.signed
        one = g.const(1, width)
        if exponent.op == Op.CONST and base.op == Op.CONST:
            b = to_signed(base.value, width) if signed else base.value
            x = to_signed(exponent.value, exponent.width) if exponent_signed else exponent.value
            if x >= 0:
                return g.const(pow(b, x, 1 << width), width)
            if b == 0:
                return g.free(width, "x: zero to a negative power")
            if b == 1:
                return one
            if b == -1:
                return g.const(-1 if x % 2 else 1, width)
            return g.zero(width)
        # square and multiply over the exponent's bits (positive part)
        result = one
        square = base
        bits = exponent.width - (1 if exponent_signed else 0)
        for i in range(max(bits, 0)):
            bit = g.extract(exponent, i, i)
            result = g.ite(bit, g.mul(result, square), result)
            if i + 1 < bits:
                square = g.mul(square, square)
        if not exponent_signed:
            return result
        negative = g.extract(exponent, exponent.width - 1, exponent.width - 1)
        odd = g.extract(exponent, 0, 0)
        minus_one = g.ones(width)
        is_one = g.eq(base, one)
        is_zero = g.eq(base, g.zero(width))
        below = g.ite(is_one, one, g.ite(is_zero, g.free(width, "zero to a negative power"),
                                         g.zero(width)))
        if signed:
            below = g.ite(g.eq(base, minus_one), g.ite(odd, minus_one, one), below)
        return g.ite(negative, below, result)

    def _self_determined(self, e: Any, t: Type) -> Node:
        g = self.graph
        if isinstance(e, vast.StringConst):
            data = str(e.value).encode("latin-1", "replace")
            return g.const(int.from_bytes(data, "big") if data else 0, t.width)
        if isinstance(e, vast.Identifier):
            found = self.resolve(e)
            if isinstance(found, Parameter):
                return g.const(found.value, found.width)
            return self._read_var(found, e)
        if isinstance(e, vast.Pointer):
            return self._bit_select(e)
        if isinstance(e, vast.Partselect):
            return self._part_select(e)
        if isinstance(e, (vast.Concat, vast.Repeat)):
            node = self._concatenation(e)
            if node is None:
                raise self.error("a zero replication is only allowed inside a concatenation "
                                 "with another operand", e)
            return node
        if isinstance(e, vast.Ulnot):
            return g.not_(self.condition(e.right))
        if isinstance(e, _REDUCTIONS):
            operand, _ = self.self_value(e.right)
            if isinstance(e, (vast.Uand, vast.Unand)):
                bit = g.reduce_and(operand)
            elif isinstance(e, (vast.Uor, vast.Unor)):
                bit = g.reduce_or(operand)
            else:
                bit = g.reduce_xor(operand)
            return bit if isinstance(e, (vast.Uand, vast.Uor, vast.Uxor)) else g.not_(bit)
        if isinstance(e, (vast.Land, vast.Lor)):
            a, b = self.condition(e.left), self.condition(e.right)
            return g.and_(a, b) if isinstance(e, vast.Land) else g.or_(a, b)
        if isinstance(e, _COMPARISONS):
            return self._comparison(e)
        if isinstance(e, vast.SystemCall):
            return self._system_call(e, t)
        if isinstance(e, vast.FunctionCall):
            return self.design.call_function(self, self._function(e), e)
        raise self.error(f"unsupported construct `{type(e).__name__}` in an expression", e,
                         UnsupportedConstruct)

    def _comparison(self, e: Any) -> Node:
        g = self.graph
        a_type, b_type = self.type_of(e.left), self.type_of(e.right)
        if a_type.real or b_type.real:
            a, b = self.real_value(e.left), self.real_value(e.right)
            result = {vast.LessThan: a < b, vast.GreaterThan: a > b, vast.LessEq: a <= b,
                      vast.GreaterEq: a >= b, vast.Eq: a == b, vast.NotEq: a != b,
                      vast.Eql: a == b, vast.NotEql: a != b}[type(e)]
            return g.const(int(result), 1)
        if isinstance(e, (vast.Eql, vast.NotEql)):
            exact = self._case_equality_with_x(e)
            if exact is not None:
                return exact
        # Clause 5.4.1: comparison operands are sized to each other; signed only if both are.
        width = max(a_type.width, b_type.width)
        signed = a_type.signed and b_type.signed
        a = self.value(e.left, width, signed)
        b = self.value(e.right, width, signed)
        less = g.slt if signed else g.ult
        if isinstance(e, vast.LessThan):
            return less(a, b)
        if isinstance(e, vast.GreaterThan):
            return less(b, a)
        if isinstance(e, vast.LessEq):
            return g.not_(less(b, a))
        if isinstance(e, vast.GreaterEq):
            return g.not_(less(a, b))
        if isinstance(e, (vast.Eq, vast.Eql)):
            return g.eq(a, b)
        return g.ne(a, b)

    def _case_equality_with_x(self, e: Any) -> Optional[Node]:
        """Clause 5.1.8: ``===`` compares x and z bits literally.  A literal with x/z bits
        therefore never equals a two-valued operand (a signal or a literal without x/z)."""
        def x_literal(side: Any) -> bool:
            return isinstance(side, vast.IntConst) and self._literal(side).unknown != 0
        left, right = x_literal(e.left), x_literal(e.right)
        if left == right:
            return None      # both known (ordinary ==) or both x literals (rare: plain ==)
        other, _ = self.self_value(e.right if left else e.left)
        if self.design.has_unknown(other):
            return None      # it may hold x itself: the model cannot tell, plain == it is
        return self.graph.const(0 if isinstance(e, vast.Eql) else 1, 1)

    def _system_call(self, e: vast.SystemCall, t: Type) -> Node:
        g = self.graph
        name = e.syscall
        if name in ("signed", "unsigned"):
            node, _ = self.self_value(self._one_argument(e))
            return node
        if name == "clog2":
            argument = self._one_argument(e)
            node, arg_type = self.self_value(argument)
            if node.op != Op.CONST:
                raise self.error("`$clog2` needs a constant argument here", e)
            value = to_signed(node.value, node.width) if arg_type.signed else node.value
            return g.const(clog2(value), 32)
        if name == "bits":
            return g.const(self.type_of(self._one_argument(e)).width, 32)
        if name == "rtoi":
            value = self.real_value(self._one_argument(e))
            return g.const(int(value), 32)    # clause 17.8: $rtoi truncates toward zero
        raise self.error(f"unsupported construct `${name}`", e, UnsupportedConstruct)

    def _concatenation(self, e: Any) -> Optional[Node]:
        """A concatenation or replication; None when it has zero width (clause 5.1.14)."""
        if isinstance(e, vast.Repeat):
            count = self.const_int(e.times)
            if count < 0:
                raise self.error(f"replication count must not be negative, got {count}", e)
            inner = self._concatenation(e.value) if isinstance(e.value, (vast.Concat, vast.Repeat)) \
                else self.self_value(e.value)[0]
            if count == 0 or inner is None:
                return None
            return self.graph.concat(*([inner] * count))
        parts: list[Node] = []
        for part in e.list:
            if isinstance(part, (vast.Concat, vast.Repeat)):
                node = self._concatenation(part)
                if node is not None:
                    parts.append(node)
            else:
                parts.append(self.self_value(part)[0])
        return self.graph.concat(*parts) if parts else None

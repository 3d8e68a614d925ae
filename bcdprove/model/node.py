"""The word-level DAG: hash-consed fixed-width bit-vector operations.

Every value in a design model is a :class:`Node` made by one :class:`Graph`.  A graph
hands out each distinct ``(op, width, args, params)`` once, so structurally equal
sub-terms are the same Python object and can be compared with ``is``.

Semantics of every operator on unsigned integers modulo ``2**width`` are fixed by
:func:`apply_op`; the simulator and the z3 translation must agree with it.  Division by
zero follows SMT-LIB (the elaborator guards Verilog division with a fresh unknown value,
so that choice is never visible in a Verilog result).
"""
from __future__ import annotations

import itertools
from typing import Iterable, Optional, Sequence


class Op:
    """Operator names. Leaves first, then word operators."""

    CONST = "const"      # params: (value,)
    INPUT = "input"      # params: (port name,)
    STATE = "state"      # params: (register name,)  current value of a register
    FREE = "free"        # params: (serial, reason)  an unknown value: x, z, out of range, ...

    NOT = "not"
    AND = "and"
    OR = "or"
    XOR = "xor"
    NEG = "neg"
    ADD = "add"
    SUB = "sub"
    MUL = "mul"
    UDIV = "udiv"        # b == 0 -> all ones (SMT-LIB)
    UREM = "urem"        # b == 0 -> a
    SDIV = "sdiv"        # two's complement, truncating; b == 0 -> -1 if a >= 0 else 1
    SREM = "srem"        # sign of the dividend; b == 0 -> a
    SHL = "shl"          # amount of any width, unsigned; amount >= width -> 0
    LSHR = "lshr"
    ASHR = "ashr"        # amount >= width -> every bit a copy of the sign
    EQ = "eq"            # width 1
    ULT = "ult"          # width 1
    SLT = "slt"          # width 1
    CONCAT = "concat"    # args most significant first
    EXTRACT = "extract"  # params: (hi, lo)
    ZEXT = "zext"        # width is the new width
    SEXT = "sext"
    ITE = "ite"          # args: (condition of width 1, then, else)

    LEAVES = frozenset({CONST, INPUT, STATE, FREE})
    BINARY_SAME_WIDTH = frozenset({AND, OR, XOR, ADD, SUB, MUL, UDIV, UREM, SDIV, SREM})
    COMPARE = frozenset({EQ, ULT, SLT})
    SHIFTS = frozenset({SHL, LSHR, ASHR})


class Node:
    """One operation of the DAG.  Made only by :class:`Graph`; never mutated."""

    __slots__ = ("op", "width", "args", "params", "id", "__weakref__")

    def __init__(self, op: str, width: int, args: tuple, params: tuple, ident: int):
        self.op = op
        self.width = width
        self.args = args
        self.params = params
        self.id = ident

    @property
    def is_const(self) -> bool:
        return self.op == Op.CONST

    @property
    def value(self) -> int:
        """The value of a constant node."""
        assert self.op == Op.CONST, self.op
        return self.params[0]

    def __repr__(self) -> str:
        if self.op == Op.CONST:
            return f"{self.width}'d{self.params[0]}"
        if self.op in (Op.INPUT, Op.STATE):
            return f"{self.op}:{self.params[0]}[{self.width}]"
        if self.op == Op.FREE:
            return f"free#{self.params[0]}[{self.width}]"
        inner = ", ".join(f"n{a.id}" for a in self.args)
        extra = f" {self.params}" if self.params else ""
        return f"n{self.id}={self.op}[{self.width}]({inner}){extra}"


def mask(width: int) -> int:
    return (1 << width) - 1


def to_signed(value: int, width: int) -> int:
    return value - (1 << width) if width and value >> (width - 1) & 1 else value


def apply_op(op: str, width: int, params: tuple, args: Sequence[int], arg_widths: Sequence[int]) -> int:
    """The value of operator ``op`` on argument values (unsigned ints), as an unsigned int."""
    m = mask(width)
    if op == Op.CONST:
        return params[0]
    if op == Op.NOT:
        return ~args[0] & m
    if op == Op.AND:
        return args[0] & args[1]
    if op == Op.OR:
        return args[0] | args[1]
    if op == Op.XOR:
        return args[0] ^ args[1]
    if op == Op.NEG:
        return -args[0] & m
    if op == Op.ADD:
        return (args[0] + args[1]) & m
    if op == Op.SUB:
        return (args[0] - args[1]) & m
    if op == Op.MUL:
        return (args[0] * args[1]) & m
    if op == Op.UDIV:
        return m if args[1] == 0 else args[0] // args[1]
    if op == Op.UREM:
        return args[0] if args[1] == 0 else args[0] % args[1]
    if op in (Op.SDIV, Op.SREM):
        a, b = to_signed(args[0], width), to_signed(args[1], width)
        if b == 0:
            if op == Op.SREM:
                return args[0]
            return m if a >= 0 else 1
        q = abs(a) // abs(b)
        if (a < 0) != (b < 0):
            q = -q
        if op == Op.SDIV:
            return q & m
        return (a - q * b) & m
    if op == Op.SHL:
        return 0 if args[1] >= width else (args[0] << args[1]) & m
    if op == Op.LSHR:
        return 0 if args[1] >= width else args[0] >> args[1]
    if op == Op.ASHR:
        shift = min(args[1], width)
        return (to_signed(args[0], width) >> shift) & m
    if op == Op.EQ:
        return int(args[0] == args[1])
    if op == Op.ULT:
        return int(args[0] < args[1])
    if op == Op.SLT:
        return int(to_signed(args[0], arg_widths[0]) < to_signed(args[1], arg_widths[1]))
    if op == Op.CONCAT:
        value = 0
        for a, w in zip(args, arg_widths):
            value = (value << w) | a
        return value
    if op == Op.EXTRACT:
        hi, lo = params
        return (args[0] >> lo) & mask(hi - lo + 1)
    if op == Op.ZEXT:
        return args[0]
    if op == Op.SEXT:
        return to_signed(args[0], arg_widths[0]) & m
    if op == Op.ITE:
        return args[1] if args[0] else args[2]
    raise ValueError(f"operator {op!r} has no value semantics")


class Graph:
    """Makes nodes, each distinct one once (hash-consing), with light local rewriting.

    Rewrites are only identities that hold for every value of every leaf (including
    free ones), so a rewritten graph means exactly what the unrewritten one meant.
    """

    def __init__(self) -> None:
        self._table: dict[tuple, Node] = {}
        self._serial = itertools.count()
        self._free_serial = itertools.count()

    def __len__(self) -> int:
        return len(self._table)

    def _make(self, op: str, width: int, args: tuple = (), params: tuple = ()) -> Node:
        if width < 1:
            raise ValueError(f"{op}: width must be at least 1, got {width}")
        # Nodes hash and compare by identity, and a key keeps its arguments alive, so the
        # argument nodes themselves name them (cheaper than a tuple of their ids).
        key = (op, width, args, params)
        node = self._table.get(key)
        if node is None:
            node = Node(op, width, args, params, next(self._serial))
            self._table[key] = node
        return node

    # leaves ---------------------------------------------------------------
    def const(self, value: int, width: int) -> Node:
        return self._make(Op.CONST, width, (), (value & mask(width),))

    def input(self, name: str, width: int) -> Node:
        return self._make(Op.INPUT, width, (), (name,))

    def state(self, name: str, width: int) -> Node:
        return self._make(Op.STATE, width, (), (name,))

    def free(self, width: int, reason: str) -> Node:
        """A fresh unknown value; every call gives a distinct node."""
        return self._make(Op.FREE, width, (), (next(self._free_serial), reason))

    def ones(self, width: int) -> Node:
        return self.const(mask(width), width)

    def zero(self, width: int) -> Node:
        return self.const(0, width)

    # generic --------------------------------------------------------------
    def op(self, op: str, *args: Node, params: tuple = ()) -> Node:
        """Build any non-leaf operator by name (dispatches to the named builders)."""
        if op == Op.EXTRACT:
            return self.extract(args[0], *params)
        if op in (Op.ZEXT, Op.SEXT):
            return getattr(self, op)(args[0], params[0])
        if op == Op.CONCAT:
            return self.concat(*args)
        return getattr(self, {"not": "not_", "and": "and_", "or": "or_"}.get(op, op))(*args)

    def _fold(self, op: str, width: int, args: tuple, params: tuple = ()) -> Node | None:
        for a in args:               # a loop, not all(...): this runs for most nodes made
            if a.op != Op.CONST:
                return None
        value = apply_op(op, width, params, [a.value for a in args], [a.width for a in args])
        return self.const(value, width)

    def _binary(self, op: str, a: Node, b: Node) -> Node:
        if a.width != b.width:
            raise ValueError(f"{op}: widths differ ({a.width} and {b.width})")
        return self._fold(op, a.width, (a, b)) or self._make(op, a.width, (a, b))

    # bitwise ----------------------------------------------------------------
    def not_(self, a: Node) -> Node:
        if a.op == Op.NOT:
            return a.args[0]
        return self._fold(Op.NOT, a.width, (a,)) or self._make(Op.NOT, a.width, (a,))

    def and_(self, a: Node, b: Node) -> Node:
        for x, y in ((a, b), (b, a)):
            if x.op == Op.CONST:
                if x.value == 0:
                    return x
                if x.value == mask(x.width) and y.width == x.width:
                    return y
        if a is b:
            return a
        if a.id > b.id:
            a, b = b, a
        return self._binary(Op.AND, a, b)

    def or_(self, a: Node, b: Node) -> Node:
        for x, y in ((a, b), (b, a)):
            if x.op == Op.CONST:
                if x.value == 0 and y.width == x.width:
                    return y
                if x.value == mask(x.width):
                    return x
        if a is b:
            return a
        if a.id > b.id:
            a, b = b, a
        return self._binary(Op.OR, a, b)

    def xor(self, a: Node, b: Node) -> Node:
        for x, y in ((a, b), (b, a)):
            if x.op == Op.CONST and x.value == 0 and y.width == x.width:
                return y
        if a is b:
            return self.zero(a.width)
        if a.id > b.id:
            a, b = b, a
        return self._binary(Op.XOR, a, b)

    # arithmetic -------------------------------------------------------------
    def neg(self, a: Node) -> Node:
        return self._fold(Op.NEG, a.width, (a,)) or self._make(Op.NEG, a.width, (a,))

    def add(self, a: Node, b: Node) -> Node:
        for x, y in ((a, b), (b, a)):
            if x.op == Op.CONST and x.value == 0 and x.width == y.width:
                return y
        if a.op != Op.CONST and (b.op == Op.CONST or a.id > b.id):
            a, b = b, a
        return self._binary(Op.ADD, a, b)

    def sub(self, a: Node, b: Node) -> Node:
        if b.op == Op.CONST and b.value == 0 and a.width == b.width:
            return a
        return self._binary(Op.SUB, a, b)

    def mul(self, a: Node, b: Node) -> Node:
        return self._binary(Op.MUL, a, b)

    def udiv(self, a: Node, b: Node) -> Node:
        return self._binary(Op.UDIV, a, b)

    def urem(self, a: Node, b: Node) -> Node:
        return self._binary(Op.UREM, a, b)

    def sdiv(self, a: Node, b: Node) -> Node:
        return self._binary(Op.SDIV, a, b)

    def srem(self, a: Node, b: Node) -> Node:
        return self._binary(Op.SREM, a, b)

    # shifts (amount of any width, read unsigned) ---------------------------------
    def _shift(self, op: str, a: Node, amount: Node) -> Node:
        if amount.op == Op.CONST and amount.value == 0:
            return a
        return self._fold(op, a.width, (a, amount)) or self._make(op, a.width, (a, amount))

    def shl(self, a: Node, amount: Node) -> Node:
        return self._shift(Op.SHL, a, amount)

    def lshr(self, a: Node, amount: Node) -> Node:
        return self._shift(Op.LSHR, a, amount)

    def ashr(self, a: Node, amount: Node) -> Node:
        return self._shift(Op.ASHR, a, amount)

    # comparisons (width 1) -------------------------------------------------------
    def eq(self, a: Node, b: Node) -> Node:
        if a.width != b.width:
            raise ValueError(f"eq: widths differ ({a.width} and {b.width})")
        if a is b:
            return self.const(1, 1)
        if a.id > b.id:
            a, b = b, a
        return self._fold(Op.EQ, 1, (a, b)) or self._make(Op.EQ, 1, (a, b))

    def ne(self, a: Node, b: Node) -> Node:
        return self.not_(self.eq(a, b))

    def ult(self, a: Node, b: Node) -> Node:
        if a.width != b.width:
            raise ValueError(f"ult: widths differ ({a.width} and {b.width})")
        return self._fold(Op.ULT, 1, (a, b)) or self._make(Op.ULT, 1, (a, b))

    def slt(self, a: Node, b: Node) -> Node:
        if a.width != b.width:
            raise ValueError(f"slt: widths differ ({a.width} and {b.width})")
        return self._fold(Op.SLT, 1, (a, b)) or self._make(Op.SLT, 1, (a, b))

    def ule(self, a: Node, b: Node) -> Node:
        return self.not_(self.ult(b, a))

    def sle(self, a: Node, b: Node) -> Node:
        return self.not_(self.slt(b, a))

    # structure ---------------------------------------------------------------
    def concat(self, *parts: Node) -> Node:
        """Concatenate, most significant part first."""
        if len(parts) == 2:
            # The common case, spared the general loops below: two parts that neither
            # flatten nor merge (what those loops would make of them).
            a, b = parts
            if a.op != Op.CONCAT and b.op != Op.CONCAT and a.op != b.op:
                return self._make(Op.CONCAT, a.width + b.width, parts)
        flat: list[Node] = []
        for p in parts:
            flat.extend(p.args if p.op == Op.CONCAT else (p,))
        merged: list[Node] = []
        for p in flat:
            if merged and p.op == Op.CONST and merged[-1].op == Op.CONST:
                prev = merged.pop()
                merged.append(self.const((prev.value << p.width) | p.value, prev.width + p.width))
            elif (merged and p.op == Op.EXTRACT and merged[-1].op == Op.EXTRACT
                  and merged[-1].args[0] is p.args[0] and merged[-1].params[1] == p.params[0] + 1):
                prev = merged.pop()
                merged.append(self.extract(p.args[0], prev.params[0], p.params[1]))
            else:
                merged.append(p)
        if len(merged) == 1:
            return merged[0]
        return self._make(Op.CONCAT, sum(p.width for p in merged), tuple(merged))

    def extract(self, a: Node, hi: int, lo: int) -> Node:
        if not 0 <= lo <= hi < a.width:
            raise ValueError(f"extract [{hi}:{lo}] out of a {a.width}-bit value")
        if lo == 0 and hi == a.width - 1:
            return a
        if a.op == Op.CONST:
            return self.const(a.value >> lo, hi - lo + 1)
        if a.op == Op.EXTRACT:
            return self.extract(a.args[0], a.params[1] + hi, a.params[1] + lo)
        if a.op == Op.CONCAT:
            offset = a.width
            for part in a.args:
                offset -= part.width
                if lo >= offset and hi < offset + part.width:
                    return self.extract(part, hi - offset, lo - offset)
        if a.op in (Op.ZEXT, Op.SEXT) and hi < a.args[0].width:
            return self.extract(a.args[0], hi, lo)
        if a.op == Op.ZEXT and lo >= a.args[0].width:
            return self.zero(hi - lo + 1)
        return self._make(Op.EXTRACT, hi - lo + 1, (a,), (hi, lo))

    def zext(self, a: Node, width: int) -> Node:
        if width < a.width:
            raise ValueError(f"zext to {width} bits of a {a.width}-bit value")
        if width == a.width:
            return a
        if a.op == Op.CONST:
            return self.const(a.value, width)
        return self._make(Op.ZEXT, width, (a,))

    def sext(self, a: Node, width: int) -> Node:
        if width < a.width:
            raise ValueError(f"sext to {width} bits of a {a.width}-bit value")
        if width == a.width:
            return a
        return self._fold(Op.SEXT, width, (a,)) or self._make(Op.SEXT, width, (a,))

    def resize(self, a: Node, width: int, signed: bool = False) -> Node:
        """Truncate or extend (sign- or zero-) to ``width`` bits."""
        if width < a.width:
            return self.extract(a, width - 1, 0)
        return self.sext(a, width) if signed else self.zext(a, width)

    def ite(self, cond: Node, then: Node, other: Node) -> Node:
        if cond.width != 1:
            raise ValueError(f"ite: condition has width {cond.width}")
        if then.width != other.width:
            raise ValueError(f"ite: widths differ ({then.width} and {other.width})")
        if cond.op == Op.CONST:
            return then if cond.value else other
        if then is other:
            return then
        if cond.op == Op.NOT:
            return self.ite(cond.args[0], other, then)
        return self._make(Op.ITE, then.width, (cond, then, other))

    # reductions, built from the operators above --------------------------------------
    def reduce_or(self, a: Node) -> Node:
        return self.ne(a, self.zero(a.width))

    def reduce_and(self, a: Node) -> Node:
        return self.eq(a, self.ones(a.width))

    def reduce_xor(self, a: Node) -> Node:
        bit = self.extract(a, 0, 0)
        for i in range(1, a.width):
            bit = self.xor(bit, self.extract(a, i, i))
        return bit


def topological(roots: Iterable[Node]) -> list[Node]:
    """Every node reachable from ``roots``, each after all of its arguments."""
    order: list[Node] = []
    seen: set[int] = set()
    for root in roots:
        if root.id in seen:
            continue
        stack = [(root, False)]
        while stack:
            node, expanded = stack.pop()
            if expanded:
                order.append(node)
                continue
            if node.id in seen:
                continue
            seen.add(node.id)
            stack.append((node, True))
            for arg in reversed(node.args):
                if arg.id not in seen:
                    stack.append((arg, False))
    return order


def leaves(roots: Iterable[Node]) -> list[Node]:
    """The leaves (inputs, register states, free values) that ``roots`` depend on."""
    return [n for n in topological(roots) if n.op in (Op.INPUT, Op.STATE, Op.FREE)]


def evaluate(roots: Sequence[Node], values: dict[int, int],
             order: Optional[Sequence[Node]] = None) -> list[int]:
    """Scalar evaluation: ``values`` maps leaf node ids to unsigned ints.

    ``order``, if given, is ``topological(roots)`` computed once by a caller that evaluates
    the same roots many times.
    """
    env: dict[int, int] = {}
    for node in (topological(roots) if order is None else order):
        if node.op == Op.CONST:
            env[node.id] = node.value
        elif node.op in Op.LEAVES:
            if node.id not in values:
                raise KeyError(f"no value for leaf {node!r}")
            env[node.id] = values[node.id] & mask(node.width)
        else:
            env[node.id] = apply_op(node.op, node.width, node.params,
                                    [env[a.id] for a in node.args], [a.width for a in node.args])
    return [env[r.id] for r in roots]


def substitute(graph: Graph, roots: Sequence[Node], mapping: dict[int, Node]) -> list[Node]:
    """Rebuild ``roots`` with the nodes whose ids are keys of ``mapping`` replaced.

    Replacement nodes must have the width of the node they replace.  The rebuilt nodes go
    through the graph's rewriting, so tying an input to a constant folds what it can.
    """
    env: dict[int, Node] = {}
    for node in topological(roots):
        if node.id in mapping:
            new = mapping[node.id]
            if new.width != node.width:
                raise ValueError(f"substitute: {node!r} has width {node.width}, replacement {new.width}")
            env[node.id] = new
        elif node.op in Op.LEAVES:
            env[node.id] = node
        else:
            args = tuple(env[a.id] for a in node.args)
            if all(new is old for new, old in zip(args, node.args)):
                env[node.id] = node
            elif node.op in (Op.ZEXT, Op.SEXT):
                env[node.id] = graph.op(node.op, *args, params=(node.width,))
            else:
                env[node.id] = graph.op(node.op, *args, params=node.params)
    return [env[r.id] for r in roots]

"""Values of nets and variables on demand: drivers, procedural blocks, function calls.

:class:`Resolver` holds what elaboration found (drivers per bit range of each var, always
blocks, functions) and computes each var's node when first read, memoised per driver, with a
"being computed" stack that turns a combinational cycle into a DesignError naming the
signals on it.  :class:`ProceduralBlock` is one always block, executed once on demand.
"""
from __future__ import annotations

import bisect
from typing import Any, Optional

from pyverilog.vparser import ast as vast

from ..errors import BcdproveError, DesignError, UnsupportedConstruct
from ..model.design import Model, Signal, SourceLocation
from ..model.node import Graph, Node, Op, topological
from ._constant_memo import constant_key
from ._expressions import Expressions, Type
from ._scope import Driver, FunctionDef, Scope, Var
from ._statements import Frame
from ._targets import lvalue_parts

_CALL_DEPTH_LIMIT = 200

# Reasons of free values that stand for a guarded case only (see Resolver.has_unknown).
GUARD_REASONS = frozenset({"division by zero", "zero to a negative power",
                           "select outside the declared range", "memory address out of range",
                           "select wider than its base"})


class ProceduralBlock:
    """An always block: the vars it drives (with the bits it may drive) and its results."""

    def __init__(self, resolver: "Resolver", ast: Any, scope: Scope, clocked: bool,
                 driven: dict[Var, int]):
        self.resolver = resolver
        self.ast = ast
        self.scope = scope
        self.clocked = clocked
        self.driven = driven
        self.loc = resolver.location(ast)
        self.results: Optional[dict[Var, Node]] = None
        self.computing = False

    def describe(self) -> str:
        return f"the always block at {self.loc}"

    def result(self, var: Var) -> Node:
        if self.results is None:
            if self.computing:
                raise self.resolver.loop_error(self)
            self.computing = True
            self.resolver.stack.append(self.describe())
            try:
                self.results = self.resolver.run_combinational(self)
            finally:
                self.resolver.stack.pop()
                self.computing = False
        return self.results[var]


class Resolver:
    """Shared state of one elaboration (see module docstring)."""

    def __init__(self, graph: Graph, pre: Any, model: Model):
        self.graph = graph
        self.pre = pre
        self.model = model
        self.stack: list[str] = []
        self._unknown: dict[int, bool] = {}
        self._notes_seen: set[str] = set()
        self._call_depth = 0
        self._call_counts: dict[str, int] = {}
        self.probes_enabled = True
        # A location depends only on the syntax node's line; wide generate loops ask for the
        # same few lines tens of thousands of times (every driver records where it was made).
        self._locations: dict[Any, SourceLocation] = {}
        # Constant expressions by _constant_memo.constant_key, and the syntax nodes' shapes.
        self.constants: dict[tuple, tuple[Node, Type]] = {}
        self.constant_shapes: dict[int, tuple] = {}
        self.constant_calls: dict[tuple, tuple[Node, dict[str, int]]] = {}
        self._keep_alive: list[Any] = []

    # --------------------------------------------------------------- diagnostics
    def location(self, node: Any) -> SourceLocation:
        line = getattr(node, "lineno", None)
        found = self._locations.get(line)
        if found is None:
            from .parser import location
            found = self._locations[line] = location(self.pre, node)
        return found

    def error(self, message: str, node: Any, kind: type = BcdproveError) -> BcdproveError:
        if node is None:
            return kind(message)
        loc = self.location(node)
        return kind(message, loc.file, loc.line)

    def note(self, message: str, node: Any = None) -> None:
        text = f"{self.location(node)}: {message}" if node is not None else message
        if text not in self._notes_seen:
            self._notes_seen.add(text)
            self.model.notes.append(text)

    note_once = note

    def loop_error(self, again: Any) -> DesignError:
        description = again.describe() if isinstance(again, ProceduralBlock) else again.what
        start = 0
        for index, entry in enumerate(self.stack):
            if entry == description:
                start = index
        cycle = self.stack[start:] + [description]
        loc = again.loc
        return DesignError("combinational loop: " + " -> ".join(cycle),
                           loc.file if loc else None, loc.line if loc else None)

    # --------------------------------------------------------------- node facts
    def has_unknown(self, node: Node) -> bool:
        """Whether ``node`` depends on an x source: an x/z literal, an undriven net, an
        unconnected input, ...  The free values that only stand for what an impossible or
        guarded case gives (division by zero, a select out of range) do not count: they sit
        under an ``ite`` whose condition the structure cannot see is never true, and counting
        them would turn known values into unknown ones."""
        known = self._unknown
        if node.id in known:
            return known[node.id]
        for item in topological([node]):
            if item.id not in known:
                if item.op == Op.FREE:
                    known[item.id] = item.params[1] not in GUARD_REASONS
                else:
                    known[item.id] = any(known[a.id] for a in item.args)
        return known[node.id]

    # --------------------------------------------------------------- drivers
    def add_driver(self, var: Var, lo: int, hi: int, produce: Any, node: Any, what: str) -> None:
        loc = self.location(node) if node is not None else None
        # A wide generate array gives one net a driver per digit or bit; the index finds
        # the overlapping ones without looking at all of them, while there are none yet.
        crowded = var.shared is not None or bool(_overlapping(var, lo, hi))
        for other in (var.drivers if crowded else ()):
            if other.lo <= hi and lo <= other.hi:
                bit = max(lo, other.lo)
                index = var.lsb + bit if var.msb >= var.lsb else var.lsb - bit
                label = var.name if var.width == 1 else f"{var.name}[{index}]"
                blocks = ("always block", "clocked always block")
                if var.is_variable and what in blocks and other.what in blocks:
                    # Several combinational blocks may use one variable as scratch (a shared
                    # `integer i` loop counter); only a read from outside them is ambiguous.
                    var.shared = DesignError(
                        f"`{label}` is driven twice: by the {other.what} at {other.loc} and by "
                        f"the {what} at {loc}, and read outside them",
                        loc.file if loc else None, loc.line if loc else None)
                    continue
                raise DesignError(f"`{label}` is driven twice: by the {other.what} at "
                                  f"{other.loc} and by the {what} here",
                                  loc.file if loc else None, loc.line if loc else None)
        description = f"`{var.name}`" if (lo, hi) == (0, var.width - 1) else \
            f"`{var.name}[{hi}:{lo}]`"
        driver = Driver(lo, hi, produce, loc, what, description=description)
        var.drivers.append(driver)
        if var.by_low is None:
            var.by_low = ([], [])
        at = bisect.bisect_right(var.by_low[1], lo)
        var.by_low[0].insert(at, driver)
        var.by_low[1].insert(at, lo)

    def _driver_node(self, driver: Driver) -> Node:
        if driver.node is None:
            name = driver.description
            if driver.computing:
                start = max((i for i, e in enumerate(self.stack) if e == name), default=0)
                cycle = self.stack[start:] + [name]
                loc = driver.loc
                raise DesignError("combinational loop: " + " -> ".join(cycle),
                                  loc.file if loc else None, loc.line if loc else None)
            driver.computing = True
            self.stack.append(name)
            try:
                node = driver.produce()
            finally:
                self.stack.pop()
                driver.computing = False
            if node.width != driver.hi - driver.lo + 1:
                raise AssertionError(f"driver of {name} made {node.width} bits")
            driver.node = node
        return driver.node

    def read(self, var: Var) -> Node:
        if var.node is None:
            var.node = self.read_bits(var, 0, var.width - 1, None)
        return var.node

    def read_bits(self, var: Var, lo: int, hi: int, node: Any) -> Node:
        """Bits ``lo..hi`` of ``var`` as seen by everything outside its drivers."""
        g = self.graph
        if var.node is not None:
            return g.extract(var.node, hi, lo)
        if var.fixed is not None:
            return g.extract(var.fixed, hi, lo)
        if var.shared is not None:
            raise var.shared
        if var.state is not None:
            return g.extract(var.state, hi, lo)
        pieces: list[Node] = []
        bit = hi
        ordered = _overlapping(var, lo, hi)
        for driver in ordered:
            if driver.hi < bit:
                pieces.append(self._undriven(var, bit, driver.hi + 1))
            top = min(bit, driver.hi)
            bottom = max(lo, driver.lo)
            pieces.append(g.extract(self._driver_node(driver), top - driver.lo,
                                    bottom - driver.lo))
            bit = bottom - 1
        if bit >= lo:
            pieces.append(self._undriven(var, bit, lo))
        return g.concat(*pieces)

    def _undriven(self, var: Var, hi: int, lo: int) -> Node:
        if var.undriven is None:
            if var.init_node is not None:
                var.undriven = var.init_node
            else:
                what = "net has no driver (z)" if not var.is_variable else \
                    "variable is never assigned (x)"
                var.undriven = self.graph.free(var.width, f"{var.name}: {what}")
                self.note(f"`{var.name}`: {what}; read as an unknown value")
        return self.graph.extract(var.undriven, hi, lo)

    def implicit_or_none(self, scope: Scope, name: str) -> Any:
        return None

    def lvalue_parts(self, expressions: Expressions, e: Any, procedural: bool) -> list:
        return lvalue_parts(self, expressions, e, procedural)

    # --------------------------------------------------------------- probes
    def add_probe(self, name: str, node: Node, var: Var) -> None:
        if not self.probes_enabled:
            return
        signals = self.model.signals
        if name in signals:
            serial = 2
            while f"{name}#{serial}" in signals:
                serial += 1
            name = f"{name}#{serial}"
        signals[name] = Signal(name, node, "probe", var.signed, var.loc)

    # --------------------------------------------------------------- blocks
    def run_combinational(self, block: ProceduralBlock) -> dict[Var, Node]:
        placeholders: dict[Var, Node] = {}

        def before(var: Var) -> Node:
            if var not in placeholders:
                placeholders[var] = self.graph.free(var.width, f"{var.name} before the block")
            return placeholders[var]

        frame = Frame(self, block.scope, set(block.driven), before, "")
        try:
            frame.run(block.ast.statement)
        except RecursionError:
            raise self.error("design too deeply nested to elaborate", block.ast) from None
        results: dict[Var, Node] = {}
        for var, bits in block.driven.items():
            state = frame.state
            final = state.nba.get(var, state.env.get(var))
            sure = state.assigned.get(var, 0) | state.nba_assigned.get(var, 0)
            if final is None or bits & ~sure:
                raise DesignError(f"latch: `{var.name}` is not assigned on every path of the "
                                  f"always block at {block.loc}", block.loc.file, block.loc.line)
            results[var] = final
        if frame.placeholder_reads:
            marks = {placeholders[v].id: v for v in frame.placeholder_reads if v in placeholders}
            for var, final in results.items():
                for leaf in topological([final]):
                    if leaf.id in marks:
                        read = marks[leaf.id]
                        raise DesignError(f"combinational loop: `{read.name}` is read before "
                                          f"it is assigned in the always block at {block.loc} "
                                          f"(its value feeds `{var.name}`)",
                                          block.loc.file, block.loc.line)
        return results

    # --------------------------------------------------------------- functions
    def function_type(self, function: FunctionDef) -> Type:
        width, signed, _, _ = self._function_shape(function)
        return Type(width, signed)

    def _function_shape(self, function: FunctionDef) -> tuple[int, bool, int, int]:
        ast = function.ast
        constant = Expressions(self, function.scope, constant=True)
        if getattr(ast, "return_type", None) in ("integer", "int"):
            return 32, True, 31, 0
        if ast.retwidth is None:
            return 1, bool(getattr(ast, "signed", False)), 0, 0
        msb, lsb = constant.const_int(ast.retwidth.msb), constant.const_int(ast.retwidth.lsb)
        return abs(msb - lsb) + 1, bool(getattr(ast, "signed", False)), msb, lsb

    def call_function(self, caller: Expressions, function: FunctionDef, call: Any) -> Node:
        """Inline one call: arguments are bound as assignments to the inputs (clause 10.4)."""
        if self._call_depth >= _CALL_DEPTH_LIMIT:
            raise self.error(f"function `{function.name}` calls itself too deeply", call)
        # A constant function called from a generate loop (`if (j < digits_for(s))`) gets
        # the same arguments again and again.  A constant call's value depends only on its
        # arguments, so one whose arguments are memoised constants is run once per their
        # values; a repeat only counts the calls it would have made (they number the local
        # names of later calls).  Only constant results are kept, and only from calls that
        # added no note; such a call may have made free values (a local read before it is
        # assigned), which a constant cannot contain: a repeat does not make them again.
        key = None
        if caller.constant and caller.frame is None:
            keys = [constant_key(caller, argument) for argument in call.args]
            if all(k is not None for k in keys):
                key = (id(function), *keys)
                found = self.constant_calls.get(key)
                if found is not None:
                    node, counts = found
                    for name, more in counts.items():
                        self._call_counts[name] = self._call_counts.get(name, 0) + more
                    return node
        calls, notes = dict(self._call_counts), len(self.model.notes)
        node = self._inline_call(caller, function, call)
        if key is not None and node.op == Op.CONST and len(self.model.notes) == notes:
            counts = {name: made - calls.get(name, 0)
                      for name, made in self._call_counts.items() if made != calls.get(name, 0)}
            self.constant_calls[key] = (node, counts)
            self._keep_alive.append(function)    # so that its id, in the key, is not reused
        return node

    def _inline_call(self, caller: Expressions, function: FunctionDef, call: Any) -> Node:
        width, signed, msb, lsb = self._function_shape(function)
        count = self._call_counts.get(function.scope.prefix + function.name, 0) + 1
        self._call_counts[function.scope.prefix + function.name] = count
        prefix = f"{function.scope.prefix}{function.name}"
        if count > 1:
            prefix += f"#{count}"
        prefix += "."
        g = self.graph

        def unknown(var: Var) -> Node:
            return g.free(var.width, f"{var.name} before assignment")

        constant = caller.constant
        frame = Frame(self, function.scope, set(), unknown, None if constant else "",
                      outer=caller.frame, name_prefix="")
        frame.expressions = Expressions(self, function.scope, frame, constant=constant)
        result = Var(f"{prefix}{function.name}", width, signed, msb, lsb, "variable",
                     self.location(function.ast), is_variable=True)
        frame.declare_local(result, function.name)
        inputs: list[Var] = []
        body: list[Any] = []
        for item in _function_items(function.ast):
            if isinstance(item, vast.Decl):
                for declared in item.list:
                    if isinstance(declared, vast.Input):
                        var = self.local_var(frame, declared, function.scope, prefix)
                        inputs.append(var)
                    elif isinstance(declared, (vast.Output, vast.Inout)):
                        raise self.error("unsupported construct: function output argument",
                                         declared, UnsupportedConstruct)
                    else:
                        body.append(vast.Decl([declared], lineno=item.lineno))
            else:
                body.append(item)
        if len(call.args) != len(inputs):
            raise self.error(f"function `{function.name}` takes {len(inputs)} argument(s), "
                             f"got {len(call.args)}", call)
        for var, argument in zip(inputs, call.args):
            arg_type = caller.type_of(argument)
            value = caller.value(argument, max(var.width, arg_type.width), arg_type.signed)
            frame.state.env[var] = g.extract(value, var.width - 1, 0)
        self._call_depth += 1
        try:
            for item in body:
                frame.run(item)
        finally:
            self._call_depth -= 1
        return frame.read(result)

    def local_var(self, frame: Frame, declared: Any, scope: Scope, prefix: str) -> Var:
        """A variable local to a function or named block."""
        constant = Expressions(self, scope, frame, constant=True)
        if isinstance(declared, vast.Integer):
            width, signed, msb, lsb = 32, True, 31, 0
        elif declared.width is not None:
            msb = constant.const_int(declared.width.msb)
            lsb = constant.const_int(declared.width.lsb)
            width, signed = abs(msb - lsb) + 1, bool(declared.signed)
        else:
            width, signed, msb, lsb = 1, bool(declared.signed), 0, 0
        if getattr(declared, "dimensions", None) is not None:
            raise self.error("unsupported construct: memory declared inside a function or "
                             "block", declared, UnsupportedConstruct)
        var = Var(f"{prefix}{declared.name}", width, signed, msb, lsb, "variable",
                  self.location(declared), is_variable=True)
        frame.declare_local(var, declared.name)
        return var

    def declare_locals(self, frame: Frame, decl: vast.Decl) -> None:
        for declared in decl.list:
            if isinstance(declared, vast.Assign):
                frame.run(vast.BlockingSubstitution(declared.left, declared.right,
                                                    lineno=declared.lineno))
            elif isinstance(declared, (vast.Reg, vast.Integer, vast.Wire)):
                self.local_var(frame, declared, frame.scope, frame.scope.prefix)
            elif isinstance(declared, (vast.Parameter,)):
                raise self.error("unsupported construct: parameter inside a block", declared,
                                 UnsupportedConstruct)
            else:
                raise self.error(f"unsupported construct `{type(declared).__name__}` "
                                 f"declared inside a block", declared, UnsupportedConstruct)


def _overlapping(var: Var, lo: int, hi: int) -> list:
    """The drivers of ``var`` that drive a bit of ``lo..hi``, highest first, when no two of
    its drivers overlap (``var.shared`` is None)."""
    index = var.by_low
    if index is None:
        return []
    drivers, lows = index
    found = []
    at = bisect.bisect_right(lows, hi) - 1       # the drivers from here down start at or below hi
    while at >= 0 and drivers[at].hi >= lo:      # without overlaps their tops fall as well
        found.append(drivers[at])
        at -= 1
    return found


def _function_items(ast: Any) -> list:
    statement = ast.statement
    if statement is None:
        return []
    if isinstance(statement, (list, tuple)):
        return list(statement)
    return [statement]

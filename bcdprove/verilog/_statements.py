"""Symbolic execution of procedural code: always blocks and function bodies.

A :class:`Frame` runs statements once over symbolic values: each variable the body assigns
holds a node; ``if`` and ``case`` run every branch from a copy of the state and merge the
results with ``ite`` (priority order for ``case``); loops are unrolled while their condition
folds to a constant.  Blocking assignments update the state at once; non-blocking ones go to
a second state applied at the end (IEEE 1364-2005 clause 9.2.2), whose reads never see it.

The frame also records *probes*: the value of every assigned variable at the end of each loop
iteration, named ``<var>@<loop variable>=<value>`` (nested loops joined by ``,``).
"""
from __future__ import annotations

from typing import Any, Callable, Optional

from pyverilog.vparser import ast as vast

from ..errors import UnsupportedConstruct
from ..model.node import Node, Op, mask, to_signed
from ._constants import parse_literal
from ._expressions import Expressions
from ._scope import Scope, Var

LOOP_LIMIT = 65536

_IGNORED_TASKS = {"display", "write", "monitor", "strobe", "finish", "stop", "error", "warning",
                  "info", "fatal", "displayb", "displayh", "writeb", "writeh", "fflush",
                  "dumpfile", "dumpvars", "timeformat", "printtimescale"}


class _State:
    """Values assigned so far; ``*_assigned`` are the bits assigned on every path."""

    __slots__ = ("env", "assigned", "nba", "nba_assigned")

    def __init__(self) -> None:
        self.env: dict[Var, Node] = {}
        self.assigned: dict[Var, int] = {}
        self.nba: dict[Var, Node] = {}
        self.nba_assigned: dict[Var, int] = {}

    def copy(self) -> "_State":
        other = _State()
        other.env = dict(self.env)
        other.assigned = dict(self.assigned)
        other.nba = dict(self.nba)
        other.nba_assigned = dict(self.nba_assigned)
        return other


class Frame:
    """One execution of a procedural body in ``scope``.

    ``owned`` are the module variables this body drives (reads of them see the body's own
    values); ``initial(var)`` is what such a variable holds before the body assigns it (its
    register state in a clocked block; a placeholder in a combinational one).  ``outer`` is
    the calling frame of a function body.
    """

    def __init__(self, design: Any, scope: Scope, owned: set, initial: Callable[[Var], Node],
                 probe_prefix: Optional[str], outer: Optional["Frame"] = None,
                 name_prefix: str = "") -> None:
        self.design = design
        self.graph = design.graph
        self.scope = scope
        self.owned = owned
        self.initial = initial
        self.probe_prefix = probe_prefix
        self.outer = outer
        self.name_prefix = name_prefix
        self.state = _State()
        self.locals: list[dict[str, Any]] = [{}]
        self.local_vars: set = set()
        self.loops: list[tuple[Var, str]] = []
        self.expressions = Expressions(design, scope, self)
        self.placeholder_reads: set = set()

    # --------------------------------------------------------------- variables
    def lookup(self, name: str) -> Any:
        for table in reversed(self.locals):
            if name in table:
                return table[name]
        if self.outer is not None:
            return self.outer.lookup(name)
        return None

    def owns(self, var: Var) -> bool:
        if var in self.local_vars or var in self.owned:
            return True
        return self.outer is not None and self.outer.owns(var)

    def _frame_of(self, var: Var) -> "Frame":
        if var in self.local_vars or var in self.owned or self.outer is None:
            return self
        return self.outer._frame_of(var)

    def value_so_far(self, var: Var) -> Optional[Node]:
        """What the body has assigned to ``var`` so far (None before its first assignment);
        unlike :meth:`read`, records nothing."""
        return self._frame_of(var).state.env.get(var)

    def read(self, var: Var, node: Any = None) -> Node:
        frame = self._frame_of(var)
        value = frame.state.env.get(var)
        if value is None:
            value = frame.initial(var)
            if var not in frame.local_vars:
                frame.placeholder_reads.add(var)
        return value

    def declare_local(self, var: Var, short: str) -> None:
        self.locals[-1][short] = var
        self.local_vars.add(var)

    # --------------------------------------------------------------- statements
    def run(self, stmt: Any) -> None:
        if stmt is None:
            return
        if isinstance(stmt, vast.Block):
            self.locals.append({})
            try:
                for item in stmt.statements or ():
                    self.run(item)
            finally:
                self.locals.pop()
        elif isinstance(stmt, vast.BlockingSubstitution):
            self._assign(stmt, nonblocking=False)
        elif isinstance(stmt, vast.NonblockingSubstitution):
            self._assign(stmt, nonblocking=True)
        elif isinstance(stmt, vast.IfStatement):
            self._if(stmt)
        elif isinstance(stmt, vast.CaseStatement):
            self._case(stmt)
        elif isinstance(stmt, vast.ForStatement):
            self._loop(stmt, stmt.pre, stmt.cond, stmt.post, stmt.statement)
        elif isinstance(stmt, vast.WhileStatement):
            self._loop(stmt, None, stmt.cond, None, stmt.statement)
        elif isinstance(stmt, vast.Decl):
            self.design.declare_locals(self, stmt)
        elif isinstance(stmt, vast.SingleStatement):
            self.run(stmt.statement)
        elif isinstance(stmt, vast.SystemCall):
            if stmt.syscall not in _IGNORED_TASKS:
                raise self.design.error(f"unsupported construct `${stmt.syscall}`", stmt,
                                        UnsupportedConstruct)
            self.design.note_once(f"`${stmt.syscall}` ignored (no effect on the logic)", stmt)
        elif isinstance(stmt, vast.DelayStatement):
            self.design.note_once("delay ignored: the model holds the settled values", stmt)
        elif isinstance(stmt, vast.Disable):
            raise self.design.error("unsupported construct `disable`", stmt, UnsupportedConstruct)
        elif isinstance(stmt, vast.TaskCall):
            raise self.design.error(f"unsupported construct: task call `{stmt.name.name}`",
                                    stmt, UnsupportedConstruct)
        else:
            construct = {vast.DelayStatement: "delay `#`", vast.EventStatement: "event control `@`",
                         vast.ForeverStatement: "forever", vast.WaitStatement: "wait",
                         vast.ParallelBlock: "fork"}.get(type(stmt), type(stmt).__name__)
            raise self.design.error(f"unsupported construct `{construct}`", stmt,
                                    UnsupportedConstruct)

    def _assign(self, stmt: Any, nonblocking: bool) -> None:
        if stmt.ldelay is not None or stmt.rdelay is not None:
            self.design.note_once("delay ignored: the model holds the settled values", stmt)
        expressions = self.expressions
        targets = self.design.lvalue_parts(expressions, stmt.left.var, procedural=True)
        width = sum(t.width for t in targets)
        right = stmt.right.var if isinstance(stmt.right, vast.Rvalue) else stmt.right
        rtype = expressions.type_of(right)
        # Clause 5.4.1 / 9.2: the right side is evaluated at max(target, own width), then
        # truncated to the target.
        value = expressions.value(right, max(width, 0 if rtype.real else rtype.width, 1),
                                  rtype.signed)
        value = self.graph.extract(value, width - 1, 0) if value.width > width else value
        offset = width
        for target in targets:
            offset -= target.width
            part = self.graph.extract(value, offset + target.width - 1, offset)
            self._write(target, part, nonblocking, stmt)

    def _write(self, target: Any, value: Node, nonblocking: bool, stmt: Any) -> None:
        g = self.graph
        if target.var is not None:
            var = target.var
            frame = self._frame_of(var)
            if not frame.owns(var):
                raise self.design.error(f"`{var.name}` cannot be assigned here", stmt)
            env = frame.state.nba if nonblocking else frame.state.env
            assigned = frame.state.nba_assigned if nonblocking else frame.state.assigned
            old = env.get(var)
            if old is None:
                old = frame.state.env.get(var) if nonblocking else None
                if old is None:
                    old = frame.initial(var)
            if target.offset is None:
                lo, hi = target.lo, target.lo + target.width - 1
                parts = []
                if hi < var.width - 1:
                    parts.append(g.extract(old, var.width - 1, hi + 1))
                parts.append(value)
                if lo > 0:
                    parts.append(g.extract(old, lo - 1, 0))
                env[var] = g.concat(*parts)
                assigned[var] = assigned.get(var, 0) | (mask(target.width) << lo)
            else:
                # a variable bit position: every bit may change, none is surely assigned
                wide = var.width + target.width
                field = g.shl(g.const(mask(target.width), wide), target.offset)
                shifted = g.shl(g.zext(value, wide), target.offset)
                merged = g.or_(g.and_(g.zext(old, wide), g.not_(field)), shifted)
                env[var] = g.ite(target.fits, g.extract(merged, var.width - 1, 0), old)
            return
        # a memory element at a variable address: each element under its own condition
        for hit, element in target.elements:
            frame = self._frame_of(element)
            env = frame.state.nba if nonblocking else frame.state.env
            old = env.get(element)
            if old is None:
                old = frame.state.env.get(element) if nonblocking else None
                if old is None:
                    old = frame.initial(element)
            env[element] = g.ite(hit, value, old)

    # --------------------------------------------------------------- control flow
    def _branch(self, stmt: Any) -> _State:
        saved = self.state
        self.state = saved.copy()
        try:
            self.run(stmt)
            return self.state
        finally:
            self.state = saved

    def _merge(self, condition: Node, then: _State, other: _State) -> _State:
        g = self.graph
        merged = _State()
        for name in ("env", "nba"):
            a_env, b_env = getattr(then, name), getattr(other, name)
            out = getattr(merged, name)
            # Both branches start from copies of one state: a variable neither branch
            # changed holds the same node in both (ite(c, a, a) is a), and only the others
            # need a merge.  Going through every variable made each `if` cost the whole
            # state (a digit array: digits**2 per stage).
            out.update(a_env)
            for var in {var for var, _ in a_env.items() ^ b_env.items()}:
                a = a_env.get(var)
                b = b_env.get(var)
                if a is None:
                    a = then.env.get(var) if name == "nba" else None
                    a = a if a is not None else self._frame_of(var).initial(var)
                if b is None:
                    b = other.env.get(var) if name == "nba" else None
                    b = b if b is not None else self._frame_of(var).initial(var)
                out[var] = g.ite(condition, a, b)
        for name in ("assigned", "nba_assigned"):
            a_bits, b_bits = getattr(then, name), getattr(other, name)
            out = getattr(merged, name)
            for var in set(a_bits) & set(b_bits):
                out[var] = a_bits[var] & b_bits[var]
        return merged

    def _if(self, stmt: vast.IfStatement) -> None:
        condition = self.expressions.condition(stmt.cond)
        if condition.op == Op.CONST:
            self.run(stmt.true_statement if condition.value else stmt.false_statement)
            return
        then = self._branch(stmt.true_statement)
        other = self._branch(stmt.false_statement)
        self.state = self._merge(condition, then, other)

    def _case(self, stmt: vast.CaseStatement) -> None:
        g = self.graph
        expressions = self.expressions
        wildcard = "z" if isinstance(stmt, vast.CasezStatement) else \
            "x" if isinstance(stmt, vast.CasexStatement) else None
        items = [c for c in stmt.caselist for c in (c.cond or ())]
        types = [expressions.type_of(stmt.comp)] + [expressions.type_of(c) for c in items]
        # Clause 9.5: the case expression and all items are sized to the largest of them.
        width = max(t.width for t in types)
        signed = all(t.signed for t in types)
        selector = expressions.value(stmt.comp, width, signed)
        branches: list[tuple[Node, Any]] = []
        default = None
        for case in stmt.caselist:
            if case.cond is None:
                default = case.statement
                continue
            hit = g.const(0, 1)
            for item in case.cond:
                hit = g.or_(hit, self._case_match(item, selector, width, signed, wildcard))
            branches.append((hit, case.statement))
        # constant selectors (constant functions, unrolled loops) pick one branch outright
        for hit, body in branches:
            if hit.op != Op.CONST:
                break
            if hit.value:
                self.run(body)
                return
        else:
            self.run(default)
            return
        result = self._branch(default)
        for hit, body in reversed(branches):
            if hit.op == Op.CONST and not hit.value:
                continue
            result = self._merge(hit, self._branch(body), result)
        self.state = result

    def _case_match(self, item: Any, selector: Node, width: int, signed: bool,
                    wildcard: Optional[str]) -> Node:
        g = self.graph
        if isinstance(item, vast.IntConst):
            lit = parse_literal(str(item.value)) if "'" in str(item.value) else None
            if lit is not None and lit.unknown and lit.fill is None:
                if wildcard == "x":
                    care = ~lit.unknown
                elif wildcard == "z":
                    if lit.unknown & ~lit.high_impedance:
                        return g.const(0, 1)   # an x bit in casez only matches x
                    care = ~lit.high_impedance
                else:
                    # Clause 9.5: case compares with ===, so an x/z item never matches a
                    # known value.
                    return g.const(0, 1)
                care &= mask(width)
                value = lit.value
                if lit.signed and signed and lit.width < width and lit.value >> (lit.width - 1) & 1:
                    value |= mask(width) ^ mask(lit.width)
                care_node = g.const(care, width)
                return g.eq(g.and_(selector, care_node), g.const(value & care, width))
        return g.eq(selector, self.expressions.value(item, width, signed))

    def _loop(self, stmt: Any, pre: Any, cond: Any, post: Any, body: Any) -> None:
        self.locals.append({})
        try:
            if pre is not None and hasattr(pre, "variable") and pre.variable is not None:
                # `for (int i = 0; ...)`: i is local to the loop
                self.design.local_var(self, pre.variable, self.scope, self.scope.prefix)
            self._unrolled(stmt, pre, cond, post, body)
        finally:
            self.locals.pop()

    def _unrolled(self, stmt: Any, pre: Any, cond: Any, post: Any, body: Any) -> None:
        self.run(pre)
        loop_var = self._loop_variable(pre, cond)
        count = 0
        while True:
            condition = self.expressions.condition(cond)
            if condition.op != Op.CONST:
                raise self.design.error("loop without constant bound: the condition does not "
                                        "fold to a constant after elaboration", stmt)
            if not condition.value:
                return
            count += 1
            if count > LOOP_LIMIT:
                raise self.design.error(f"loop without constant bound: more than {LOOP_LIMIT} "
                                        "iterations", stmt)
            label = self._loop_label(loop_var, count)
            self.loops.append((loop_var, label))
            before = dict(self.state.env) if self.probe_prefix is not None else None
            try:
                self.run(body)
                self._record_probes(before)
            finally:
                self.loops.pop()
            self.run(post)

    def _loop_variable(self, pre: Any, cond: Any) -> Optional[Var]:
        if isinstance(pre, vast.Substitution):
            target = pre.left.var
            if isinstance(target, vast.Identifier):
                found = self.expressions.resolve(target)
                return found if isinstance(found, Var) else None
        for ident in _identifiers(cond):
            found = self.lookup(ident.name) or self.scope.lookup(ident.name)
            if isinstance(found, Var) and self.owns(found):
                return found
        return None

    def _loop_label(self, var: Optional[Var], count: int) -> str:
        if var is None:
            return f"#={count - 1}"
        value = self.read(var)
        short = var.name.rsplit(".", 1)[-1]
        if value.op != Op.CONST:
            return f"{short}=?{count - 1}"
        number = to_signed(value.value, value.width) if var.signed else value.value
        return f"{short}={number}"

    def _record_probes(self, before: Optional[dict]) -> None:
        """Probe the variables this iteration changed (``before``: the values at its start).

        An unchanged variable's value already has a name (an earlier probe's, or none when
        it is the value from before the loop); probing every variable in every iteration
        made nested loops over a digit array record (digits)**2 probes per stage."""
        if self.probe_prefix is None:
            return
        suffix = "@" + ",".join(label for _, label in self.loops)
        loop_vars = {var for var, _ in self.loops}
        # Item sets compare nodes by identity; unchanged variables hold the very same node.
        changed = sorted(self.state.env.items() - before.items(), key=lambda item: item[0].name)
        for var, node in changed:
            if var in loop_vars:
                continue
            self.design.add_probe(f"{self.name_prefix}{var.name}{suffix}", node, var)


def _identifiers(e: Any):
    if isinstance(e, vast.Identifier):
        yield e
    elif isinstance(e, vast.Node):
        for child in e.children():
            yield from _identifiers(child)

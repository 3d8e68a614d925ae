"""Always blocks beyond the combinational core: which vars a block drives, clocked blocks
(registers with optional asynchronous reset), initial blocks and sensitivity lists.

- :func:`scan_driven` finds, before anything runs, the vars a procedural body may assign
  and which of their bits (constant selects give exact bits; anything else the whole var).
- :func:`run_clocked` executes a clocked block into :class:`Register` objects: the next
  state is the value at the end of the block given the current states; with
  ``posedge clk or negedge rst_n`` the first ``if`` on the reset is the reset branch.
- :func:`run_initial` keeps the constant values an initial block gives (initial values of
  registers and memories) and ignores the rest with a note.
"""
from __future__ import annotations

from typing import Any

from pyverilog.vparser import ast as vast

from ..errors import BcdproveError, UnsupportedConstruct
from ..model.design import Register, Reset
from ..model.node import Node, Op, mask
from ._expressions import Expressions, indexed_select
from ._scope import Memory, Scope, Var
from ._statements import Frame


def scan_driven(resolver: Any, scope: Scope, statement: Any) -> dict[Var, int]:
    """Vars assigned anywhere in ``statement`` with the bit mask they may receive."""
    driven: dict[Var, int] = {}
    locals_: set[str] = set()
    _collect_locals(statement, locals_)
    constant = Expressions(resolver, scope, constant=True)

    def whole(var: Var) -> None:
        driven[var] = mask(var.width)

    def constant_value(e: Any):
        try:
            return constant.const_int(e)
        except BcdproveError:
            return None

    def target(e: Any) -> None:
        if isinstance(e, vast.Lvalue):
            target(e.var)
        elif isinstance(e, vast.Concat):
            for item in e.list:
                target(item)
        elif isinstance(e, vast.Identifier):
            found = _resolve(scope, e, locals_)
            if isinstance(found, Var):
                whole(found)
            elif isinstance(found, Memory):
                for element in found.elements:
                    whole(element)
        elif isinstance(e, (vast.Pointer, vast.Partselect)):
            base = e.var
            if not isinstance(base, vast.Identifier):
                target(base)
                return
            found = _resolve(scope, base, locals_)
            if isinstance(found, Memory) and isinstance(e, vast.Pointer):
                address = constant_value(e.ptr)
                if address is not None and 0 <= address - found.first < len(found.elements):
                    whole(found.elements[address - found.first])
                elif address is None:
                    for element in found.elements:
                        whole(element)
                return
            if not isinstance(found, Var):
                return
            bits = _static_bits(found, e, constant_value)
            if bits is None:
                whole(found)
            else:
                driven[found] = driven.get(found, 0) | bits

    def walk(node: Any) -> None:
        if isinstance(node, vast.Substitution):
            target(node.left)
            return
        if isinstance(node, (vast.FunctionCall, vast.Decl)):
            return
        if isinstance(node, vast.Node):
            for child in node.children():
                walk(child)

    walk(statement)
    return driven


def _static_bits(var: Var, e: Any, constant_value) -> Any:
    if isinstance(e, vast.Pointer):
        index = constant_value(e.ptr)
        if index is None:
            return None
        return 1 << var.model_bit(index) if var.in_range(index) else 0
    indexed = indexed_select(e)
    if indexed is not None:
        start, width_expr, up = indexed
        base, count = constant_value(start), constant_value(width_expr)
        if base is None or count is None or count < 1:
            return None
        low = base if up else base - count + 1
        left, right = low + count - 1, low
    else:
        left, right = constant_value(e.msb), constant_value(e.lsb)
        if left is None or right is None:
            return None
    bits = 0
    for index in range(min(left, right), max(left, right) + 1):
        if var.in_range(index):
            bits |= 1 << var.model_bit(index)
    return bits


def _collect_locals(node: Any, names: set[str]) -> None:
    if isinstance(node, vast.Decl):
        for declared in node.list:
            if hasattr(declared, "name") and not isinstance(declared, vast.Assign):
                names.add(declared.name)
        return
    if isinstance(node, vast.Node):
        for child in node.children():
            _collect_locals(child, names)


def _resolve(scope: Scope, ident: vast.Identifier, locals_: set[str]) -> Any:
    if ident.scope is not None and ident.scope.labellist:
        return None
    if ident.name in locals_:
        return None
    return scope.lookup(ident.name)


def _unwrap(statement: Any) -> Any:
    while isinstance(statement, vast.Block) and len(statement.statements or ()) == 1 \
            and not isinstance(statement.statements[0], vast.Decl):
        statement = statement.statements[0]
    return statement


def _signal_name(resolver: Any, scope: Scope, expr: Any) -> str:
    node, _ = Expressions(resolver, scope).self_value(expr)
    if node.op == Op.INPUT:
        return node.params[0]
    if isinstance(expr, vast.Identifier):
        return scope.qualified(expr.name)
    return str(node)


def _names_in(e: Any) -> set[str]:
    if isinstance(e, vast.Identifier):
        return {e.name}
    found: set[str] = set()
    if isinstance(e, vast.Node):
        for child in e.children():
            found |= _names_in(child)
    return found


def run_clocked(resolver: Any, block: Any, edges: list) -> list[Register]:
    """Registers of a clocked always block (see module docstring)."""
    statement = _unwrap(block.ast.statement)
    reset_edge = None
    if len(edges) == 1:
        clock = edges[0]
        body, reset_body = block.ast.statement, None
    elif len(edges) == 2 and isinstance(statement, vast.IfStatement):
        tested = _names_in(statement.cond)
        candidates = [e for e in edges if _names_in(e.sig) & tested]
        if len(candidates) != 1:
            raise resolver.error("unsupported construct: clocked block with two edges whose "
                                 "first `if` does not test one of them as a reset", block.ast,
                                 UnsupportedConstruct)
        reset_edge = candidates[0]
        clock = edges[1] if edges[0] is reset_edge else edges[0]
        body, reset_body = statement.false_statement, statement.true_statement
    else:
        raise resolver.error("unsupported construct: clocked block with more than one "
                             "asynchronous reset", block.ast, UnsupportedConstruct)
    clock_name = _signal_name(resolver, block.scope, clock.sig)
    next_values = _execute(resolver, block, body, True)
    reset_values = _execute(resolver, block, reset_body, False) if reset_body is not None else {}
    registers = []
    for var in block.driven:
        reset = None
        if reset_edge is not None and var in reset_values:
            reset = Reset(_signal_name(resolver, block.scope, reset_edge.sig),
                          reset_edge.type == "posedge", reset_values[var])
        registers.append(Register(var.name, var.width, var.state, next_values[var], clock_name,
                                  clock.type, reset, var.init_node, var.loc))
    return registers


def _execute(resolver: Any, block: Any, statement: Any, keep_all: bool) -> dict[Var, Node]:
    """Values at the end of ``statement``; with ``keep_all`` a var not assigned keeps its
    state, otherwise it is left out."""
    frame = Frame(resolver, block.scope, set(block.driven), lambda var: var.state, "")
    frame.run(statement)
    values = {}
    for var in block.driven:
        final = frame.state.nba.get(var, frame.state.env.get(var))
        if final is not None:
            values[var] = final
        elif keep_all:
            values[var] = var.state
    return values


def run_initial(resolver: Any, scope: Scope, item: vast.Initial) -> None:
    """Keep constant initial values of variables; everything else is ignored with a note."""
    driven = scan_driven(resolver, scope, item.statement)
    g = resolver.graph
    frame = Frame(resolver, scope, set(driven),
                  lambda var: g.free(var.width, f"{var.name} before the initial block"), None)
    try:
        frame.run(item.statement)
    except BcdproveError as problem:
        resolver.note(f"initial block ignored ({problem.message})", item)
        return
    kept = []
    for var in driven:
        final = frame.state.nba.get(var, frame.state.env.get(var))
        if final is not None and final.op == Op.CONST:
            var.init_node = final
            kept.append(var.name)
    if kept:
        resolver.note(f"initial block: initial values kept for {', '.join(kept[:8])}"
                      f"{' ...' if len(kept) > 8 else ''}; otherwise ignored", item)
    else:
        resolver.note("initial block ignored (it does not describe logic)", item)


def sensitivity_note(resolver: Any, scope: Scope, item: Any, sens: list,
                     driven: dict[Var, int]) -> None:
    """A note when a level sensitivity list misses a variable the block reads."""
    listed: set[str] = set()
    for entry in sens:
        listed |= _names_in(entry.sig)
    locals_: set[str] = set()
    _collect_locals(item.statement, locals_)
    missing = []
    for name in sorted(_names_in(item.statement) - listed - locals_):
        found = scope.lookup(name)
        if isinstance(found, (Var, Memory)) and found not in driven:
            missing.append(name)
    if missing:
        resolver.note("incomplete sensitivity list (missing " + ", ".join(missing) +
                      "); the block is treated as combinational logic", item)

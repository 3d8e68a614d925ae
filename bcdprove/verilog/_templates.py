"""Elaborating a repeated combinational module once and stamping out its instances.

Wide converters instantiate one small cell thousands of times with the same parameters.
:class:`Template` elaborates the first such instance with its inputs held at placeholder
leaves and keeps every node it produced; each instance then gets its own port vars whose
drivers rebuild the template's nodes with the placeholders replaced by that instance's
inputs and every free (x) value of the template replaced by a fresh one, so unknown values of
different instances stay independent.  The template numbers its nodes once and remembers, per
output, the order of the rebuild, so an instance only runs the graph's builders (through its
rewriting: an input tied to a constant folds).  Only modules without clocked or initial
blocks (at any depth) are stamped; the rest are elaborated one by one.
"""
from __future__ import annotations

from typing import Any, Optional

from pyverilog.vparser import ast as vast

from ..model.design import Signal
from ..model.node import Node, Op, topological
from ._scope import Scope, Var


def stampable(modules: dict, module: vast.ModuleDef, seen: Optional[set] = None) -> bool:
    """Whether ``module`` and everything it instantiates is free of clocked and initial
    blocks (and so can be stamped)."""
    seen = set() if seen is None else seen
    if module.name in seen:
        return True
    seen.add(module.name)

    def walk(node: Any) -> bool:
        if isinstance(node, vast.Initial):
            return False
        if isinstance(node, vast.Always):
            sens = node.sens_list.list if node.sens_list is not None else ()
            if any(s.type in ("posedge", "negedge") for s in sens):
                return False
        if isinstance(node, vast.Instance) and node.module in modules:
            if not stampable(modules, modules[node.module], seen):
                return False
        if isinstance(node, vast.Node):
            return all(walk(child) for child in node.children())
        return True

    return walk(module)


class Template:
    """One elaborated instance of a module, with placeholders for its inputs."""

    def __init__(self, elaborator: Any, module: vast.ModuleDef, named: dict, positional: list,
                 prefix: str, node: Any):
        self.elaborator = elaborator
        self.prefix = prefix
        first_var = len(elaborator.all_vars)
        first_signal = len(elaborator.model.signals)
        self.instance = elaborator.instantiate(module, prefix, named, positional, False, node,
                                               placeholders=True)
        self.vars: list[Var] = elaborator.all_vars[first_var:]
        del elaborator.all_vars[first_var:]
        self.ports: dict[str, Var] = {name: self.instance.scope.names[name]
                                      for name in self.instance.port_names}
        self.placeholders: dict[int, str] = {}
        for name, var in self.ports.items():
            if self.instance.directions.get(name) == "input":
                self.placeholders[var.fixed.id] = name
        # Every node of the template, computed now so that errors point at the cell once.
        self.nodes: dict[Var, Node] = {}
        for var in self.vars:
            self.nodes[var] = elaborator.graph.free(var.width, f"{var.name}: assigned in several "
                                                    "blocks") if var.shared else elaborator.read(var)
        signals = elaborator.model.signals
        names = list(signals)[first_signal:]
        self.probes: list[Signal] = [signals.pop(name) for name in names]
        self._number_nodes()

    def _number_nodes(self) -> None:
        """Number the template's nodes densely and say how each instance rebuilds each one.

        A node with neither a placeholder nor a free value below it is the same in every
        instance (``fixed``); the others have a ``step``: the input port a placeholder
        stands for, a free value's (width, reason), or an operator's builder with the
        numbers of its arguments."""
        graph = self.elaborator.graph
        roots = list(self.nodes.values()) + [probe.node for probe in self.probes]
        self.index: dict[int, int] = {}
        self.fixed: list[Optional[Node]] = []
        self.steps: list[Any] = []
        for node in topological(roots):
            self.index[node.id] = len(self.fixed)
            if node.op in Op.LEAVES:
                if node.id in self.placeholders:
                    step: Any = (_PORT, self.placeholders[node.id])
                elif node.op == Op.FREE:
                    step = (_FREE, node.width, node.params[1])
                else:
                    step = None
            else:
                arguments = tuple(self.index[a.id] for a in node.args)
                if all(self.fixed[a] is not None for a in arguments):
                    step = None
                else:
                    step = _step(graph, node, arguments)
            self.fixed.append(node if step is None else None)
            self.steps.append(step)
        self.programs: dict[int, list[int]] = {}

    def program(self, first: int, values: Optional[list] = None) -> list[int]:
        """The order in which an instance rebuilds node number ``first`` and what it needs:
        a depth-first walk taking the last argument first, each node after its arguments
        (kept from the first implementation, so the graph numbers the nodes of each instance
        as it always did).  Without ``values`` the walk assumes nothing is rebuilt yet and
        is remembered for every instance; one that has some of the nodes already skips
        those: they are whole cones of earlier walks, so what is left keeps this order.
        With ``values`` (an instance's) the walk leaves out what they hold, for one use."""
        steps = self.steps
        done = self.fixed if values is None else values
        seen = set()
        order: list[int] = []
        stack = [first]
        while stack:
            item = stack.pop()
            if item < 0:
                order.append(~item)
                continue
            if item in seen:
                continue
            seen.add(item)
            step = steps[item]
            if step[0] in (_PORT, _FREE):
                order.append(item)
                continue
            stack.append(~item)
            for a in _arguments(step):
                if a not in seen and done[a] is None:
                    stack.append(a)
        if values is None:
            self.programs[first] = order
        return order


class _Stamp:
    """One stamped instance: its port vars and a way to rebuild any template node."""

    def __init__(self, template: Template, prefix: str):
        self.template = template
        self.prefix = prefix
        elaborator = template.elaborator
        self.scope = Scope(prefix, None, template.instance.module, template.instance)
        self.port_names = template.instance.port_names
        self.directions = template.instance.directions
        self.values: list[Optional[Node]] = list(template.fixed)
        self.inputs: dict[str, Var] = {}
        self.own: dict[Var, Var] = {}
        for var in template.vars:
            mine = Var(prefix + var.name[len(template.prefix):], var.width, var.signed, var.msb,
                       var.lsb, var.kind, var.loc, is_variable=var.is_variable)
            self.own[var] = mine
        for name, var in template.ports.items():
            mine = self.own[var]
            self.scope.names[name] = mine
            if self.directions.get(name) == "input":
                self.inputs[name] = mine
        for var, mine in self.own.items():
            if mine in self.inputs.values():
                elaborator.all_vars.append(mine)
                continue
            elaborator.all_vars.append(mine)
            elaborator.add_driver(mine, 0, mine.width - 1,
                                  lambda var=var: self.rebuild(template.nodes[var]), None,
                                  "instance of a repeated module")

    def rebuild(self, node: Node) -> Node:
        """``node`` of the template with this instance's inputs and fresh unknowns.

        Rebuilt nodes are remembered per instance, so the outputs of one instance share the
        work on their common logic.  Inputs are read only when a rebuilt node needs them.
        """
        template = self.template
        values = self.values
        first = template.index[node.id]
        if values[first] is None:
            program = template.programs.get(first)
            if program is None:
                program = template.program(first)
            self._run(program)
        return values[first]

    def _run(self, order: Any) -> None:
        """Rebuild the nodes numbered in ``order`` (each after its arguments) that are not
        rebuilt yet."""
        values = self.values
        steps = self.template.steps
        for item in order:
            if values[item] is not None:
                continue        # shared with an output rebuilt before, or read by an input
            step = steps[item]
            kind = step[0]
            if kind == _UNARY:
                values[item] = step[1](values[step[2]], *step[3])
            elif kind == _BINARY:
                values[item] = step[1](values[step[2]], values[step[3]])
            elif kind == _TERNARY:
                values[item] = step[1](values[step[2]], values[step[3]], values[step[4]])
            elif kind == _NARY:
                values[item] = step[1](*[values[a] for a in step[2]])
            elif kind == _PORT:
                values[item] = self.template.elaborator.read(self.inputs[step[1]])
            else:
                values[item] = self.template.elaborator.graph.free(step[1], step[2])

    def probes(self) -> list[Signal]:
        """The template's probes rebuilt for this instance (call once, at the end)."""
        found = []
        template = self.template
        for probe in template.probes:
            name = probe.name
            if name.startswith(template.prefix):
                name = self.prefix + name[len(template.prefix):]
            first = template.index[probe.node.id]
            if self.values[first] is None:
                # A probe is mostly inside an output's cone; one that is not gets a walk of
                # its own (remembering one per probe could cost the cone once per probe).
                self._run(template.program(first, self.values))
            found.append(Signal(name, self.values[first], "probe", probe.signed, probe.loc))
        return found


_PORT, _FREE, _UNARY, _BINARY, _TERNARY, _NARY = range(6)
_METHODS = {Op.NOT: "not_", Op.AND: "and_", Op.OR: "or_"}


def _step(graph: Any, node: Node, arguments: tuple[int, ...]) -> tuple:
    """How an instance rebuilds operator ``node`` from its rebuilt arguments (numbered
    ``arguments``): the graph method applying its operator, through the graph's rewriting."""
    op = node.op
    if op == Op.EXTRACT:
        return (_UNARY, graph.extract, arguments[0], node.params)
    if op in (Op.ZEXT, Op.SEXT):
        return (_UNARY, getattr(graph, op), arguments[0], (node.width,))
    method = graph.concat if op == Op.CONCAT else getattr(graph, _METHODS.get(op, op))
    if len(arguments) == 1:
        return (_UNARY, method, arguments[0], ())
    if len(arguments) == 2:
        return (_BINARY, method) + arguments
    if len(arguments) == 3:
        return (_TERNARY, method) + arguments
    return (_NARY, method, arguments)


def _arguments(step: tuple) -> tuple[int, ...]:
    kind = step[0]
    if kind == _UNARY:
        return (step[2],)
    if kind == _NARY:
        return step[2]
    return step[2:]

"""Elaborating a repeated combinational module once and stamping out its instances.

Wide converters instantiate one small cell thousands of times with the same parameters.
:class:`Template` elaborates the first such instance with its inputs held at placeholder
leaves and keeps every node it produced; each instance then gets its own port vars whose
drivers rebuild the template's nodes with the placeholders replaced by that instance's
inputs (``substitute``) and every free (x) value of the template replaced by a fresh one, so
unknown values of different instances stay independent.  Only modules without clocked or
initial blocks (at any depth) are stamped; the rest are elaborated one by one.
"""
from __future__ import annotations

from typing import Any, Optional

from pyverilog.vparser import ast as vast

from ..model.design import Signal
from ..model.node import Node, Op
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


class _Stamp:
    """One stamped instance: its port vars and a way to rebuild any template node."""

    def __init__(self, template: Template, prefix: str):
        self.template = template
        self.prefix = prefix
        elaborator = template.elaborator
        self.scope = Scope(prefix, None, template.instance.module, template.instance)
        self.port_names = template.instance.port_names
        self.directions = template.instance.directions
        self.env: dict[int, Node] = {}
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
        env = self.env
        done = env.get(node.id)
        if done is not None:
            return done
        graph = self.template.elaborator.graph
        placeholders = self.template.placeholders
        stack = [(node, False)]
        while stack:
            item, expanded = stack.pop()
            if item.id in env:
                continue
            if item.op in Op.LEAVES:
                if item.id in placeholders:
                    port = self.inputs[placeholders[item.id]]
                    env[item.id] = self.template.elaborator.read(port)
                elif item.op == Op.FREE:
                    env[item.id] = graph.free(item.width, item.params[1])
                else:
                    env[item.id] = item
                continue
            if not expanded:
                stack.append((item, True))
                for arg in item.args:
                    if arg.id not in env:
                        stack.append((arg, False))
                continue
            args = tuple(env[a.id] for a in item.args)
            if all(new is old for new, old in zip(args, item.args)):
                env[item.id] = item
            else:
                env[item.id] = _build(graph, item, args)
        return env[node.id]

    def probes(self) -> list[Signal]:
        """The template's probes rebuilt for this instance (call once, at the end)."""
        found = []
        template = self.template
        for probe in template.probes:
            name = probe.name
            if name.startswith(template.prefix):
                name = self.prefix + name[len(template.prefix):]
            found.append(Signal(name, self.rebuild(probe.node), "probe", probe.signed, probe.loc))
        return found


_METHODS = {Op.NOT: "not_", Op.AND: "and_", Op.OR: "or_"}


def _build(graph: Any, node: Node, args: tuple) -> Node:
    """``node``'s operator applied to new arguments, through the graph's rewriting."""
    op = node.op
    if op == Op.EXTRACT:
        return graph.extract(args[0], *node.params)
    if op in (Op.ZEXT, Op.SEXT):
        return getattr(graph, op)(args[0], node.width)
    if op == Op.CONCAT:
        return graph.concat(*args)
    return getattr(graph, _METHODS.get(op, op))(*args)

"""Flattening the module hierarchy: declarations, parameters, generate, instances, items.

Each module instance is elaborated in two passes over its items.  The first declares
parameters (clause 12.2), nets, variables, memories and functions, and expands generate
constructs into named scopes (clause 12.4, ``blk[3]``, ``genblk1``).  The second turns
continuous assignments, always blocks, gate primitives and instances into drivers, so that a
name may be used before the generate block or item declaring it has been reached.
"""
from __future__ import annotations

from typing import Any, Mapping, Optional

from pyverilog.vparser import ast as vast

from ..errors import BcdproveError, DesignError, UnsupportedConstruct
from ..model.design import Model, Port, Signal
from ..model.node import Graph, Node, Op
from ._clocked import run_clocked, run_initial, scan_driven, sensitivity_note
from ._constants import real_to_integer
from ._expressions import Expressions
from ._ports import Ports
from ._resolve import ProceduralBlock, Resolver
from ._scope import FunctionDef, Memory, Parameter, Scope, Var
from ._targets import lvalue_parts
from ._templates import Template, _Stamp, stampable

_GATES = {"and", "or", "nand", "nor", "xor", "xnor", "not", "buf"}
_GENERATE_LIMIT = 65536
_DEPTH_LIMIT = 64


class _Instance:
    """One module instance: its root scope and its ports in declaration order."""

    def __init__(self, module: vast.ModuleDef, prefix: str, is_top: bool):
        self.module = module
        self.is_top = is_top
        self.scope = Scope(prefix, None, module, self)
        self.port_names: list[str] = []
        self.directions: dict[str, str] = {}
        self.port_locations: dict[str, Any] = {}
        self.parameters: dict[str, Parameter] = {}


class Elaborator(Ports, Resolver):
    """Elaborates a top module and everything below it into ``model``."""

    def __init__(self, graph: Graph, pre: Any, model: Model, modules: dict[str, vast.ModuleDef]):
        super().__init__(graph, pre, model)
        self.modules = modules
        self.all_vars: list[Var] = []
        self.clocked: list[tuple[ProceduralBlock, list]] = []
        self.depth = 0
        self.templates: dict[tuple, Template] = {}
        self.stamps: list[Any] = []
        self._stampable: dict[str, bool] = {}

    # --------------------------------------------------------------- entry
    def elaborate(self, top: str, parameters: Mapping[str, int]) -> None:
        module = self.modules[top]
        overrides: dict[str, Parameter] = {}
        for name, value in parameters.items():
            overrides[name] = Parameter(max(32, int(value).bit_length() + 1), True,
                                        int(value) & ((1 << max(32, int(value).bit_length() + 1)) - 1))
        known = self._overridable(module)
        for name in overrides:
            if name not in known:
                listing = ", ".join(known) if known else "none"
                raise BcdproveError(f"unknown parameter `{name}` of module `{top}` "
                                    f"(its parameters: {listing})")
        instance = self.instantiate(module, "", overrides, [], True, None)
        for name, value in instance.parameters.items():
            self.model.parameters[name] = value.real if value.real is not None else value.integer
        for var in self.all_vars:
            if var.shared is not None:
                self.note(f"`{var.name}` is assigned in several always blocks; outside them "
                          "its value is unknown")
                node = self.graph.free(var.width, f"{var.name}: assigned in several blocks")
            else:
                node = self.read(var)
            self.model.signals[var.name] = self._signal(var, node)
        for stamp in self.stamps:
            for probe in stamp.probes():
                self.model.signals[probe.name] = probe
        for block, edges in self.clocked:
            self.model.registers.extend(run_clocked(self, block, edges))
        for name in instance.port_names:
            found = instance.scope.names.get(name)
            if not isinstance(found, Var):
                raise self.error(f"port `{name}` has no direction declaration", module)
            self.model.ports.append(Port(name, instance.directions[name], found.width,
                                         found.signed, self.read(found), found.loc,
                                         found.msb, found.lsb))

    def _signal(self, var: Var, node: Node) -> Signal:
        return Signal(var.name, node, var.kind, var.signed, var.loc)

    def _overridable(self, module: vast.ModuleDef) -> list[str]:
        names = []
        for decl in _paramlist(module):
            names.extend(p.name for p in decl.list if type(p) is vast.Parameter)
        for item in module.items or ():
            if isinstance(item, vast.Decl):
                names.extend(p.name for p in item.list if type(p) is vast.Parameter)
        return names

    # --------------------------------------------------------------- instances
    def instantiate(self, module: vast.ModuleDef, prefix: str, named: dict[str, Parameter],
                    positional: list[Parameter], is_top: bool, node: Any,
                    placeholders: bool = False) -> _Instance:
        """Elaborate one instance of ``module``; with ``placeholders`` its inputs are held at
        placeholder leaves (a template, see _templates)."""
        if self.depth >= _DEPTH_LIMIT:
            raise self.error(f"module `{module.name}` instantiates itself (hierarchy deeper "
                             f"than {_DEPTH_LIMIT})", node)
        self.depth += 1
        try:
            instance = _Instance(module, prefix, is_top)
            instance.placeholders = placeholders  # type: ignore[attr-defined]
            if positional:
                order = [p.name for d in _paramlist(module) for p in d.list
                         if type(p) is vast.Parameter] or self._overridable(module)
                if len(positional) > len(order):
                    raise self.error(f"module `{module.name}` has {len(order)} parameter(s), "
                                     f"{len(positional)} given", node)
                named = dict(zip(order, positional))
            else:
                known = self._overridable(module)
                for name in named:
                    if name not in known:
                        raise self.error(f"unknown parameter `{name}` of module "
                                         f"`{module.name}` (its parameters: "
                                         f"{', '.join(known) or 'none'})", node)
            instance.overrides = named  # type: ignore[attr-defined]
            pending: list[tuple[Scope, Any]] = []
            scope = instance.scope
            # functions may be called (to size ports, say) above their declaration
            for item in module.items or ():
                if isinstance(item, vast.Function):
                    scope.names[item.name] = FunctionDef(item.name, item, scope)
            for decl in _paramlist(module):
                self._item(scope, decl, pending)
            for port in (module.portlist.ports if module.portlist else ()):
                if isinstance(port, vast.Ioport):
                    self._port_declaration(scope, port.first, port.second)
                    instance.port_names.append(port.first.name)
                else:
                    instance.port_names.append(port.name)
            for item in module.items or ():
                self._item(scope, item, pending)
            for item_scope, item in pending:
                self._behaviour(item_scope, item)
            return instance
        finally:
            self.depth -= 1

    # --------------------------------------------------------------- pass 1
    def _item(self, scope: Scope, item: Any, pending: list) -> None:
        if isinstance(item, vast.Decl):
            self._declaration(scope, item, pending)
        elif isinstance(item, vast.Function):
            if not isinstance(scope.names.get(item.name), FunctionDef) or scope.parent is not None:
                scope.names[item.name] = FunctionDef(item.name, item, scope)
        elif isinstance(item, vast.Task):
            self.note(f"task `{item.name}` declared; calls to it are not supported", item)
        elif isinstance(item, vast.GenerateStatement):
            for sub in item.items or ():
                self._item(scope, sub, pending)
        elif isinstance(item, vast.ForStatement):
            self._generate_for(scope, item, pending)
        elif isinstance(item, (vast.IfStatement, vast.CaseStatement)):
            scope.genblock_count += 1
            self._generate_choice(scope, item, scope.genblock_count, pending)
        elif isinstance(item, vast.Block):
            number = scope.genblock_count = scope.genblock_count + 1
            self._generate_block(scope, item, item.scope or f"genblk{number}", pending)
        elif isinstance(item, (vast.Assign, vast.Always, vast.InstanceList, vast.Initial)):
            pending.append((scope, item))
        elif isinstance(item, vast.Pragma):
            pass
        else:
            raise self.error(f"unsupported construct `{type(item).__name__}` in a module", item,
                             UnsupportedConstruct)

    def _declaration(self, scope: Scope, decl: vast.Decl, pending: list) -> None:
        last: Optional[Any] = None
        for declared in decl.list:
            if isinstance(declared, vast.Parameter):
                self._parameter(scope, declared)
            elif isinstance(declared, (vast.Input, vast.Output, vast.Inout)):
                last = self._port_declaration(scope, declared, None)
            elif isinstance(declared, vast.Genvar):
                scope.names.setdefault(declared.name, Parameter(32, True, 0))
            elif isinstance(declared, vast.Assign):
                target = last
                if isinstance(target, Var) and target.is_variable:
                    # clause 6.2.1: a variable declaration assignment is an initial value
                    self._initial_value(scope, target, declared.right.var, declared)
                else:
                    pending.append((scope, declared))    # a net declaration assignment
            elif isinstance(declared, vast.Real):
                raise self.error(f"unsupported construct: real variable `{declared.name}`",
                                 declared, UnsupportedConstruct)
            elif isinstance(declared, vast.Variable):
                last = self._variable(scope, declared)
            else:
                raise self.error(f"unsupported construct `{type(declared).__name__}`",
                                 declared, UnsupportedConstruct)

    def _initial_value(self, scope: Scope, target: Var, expr: Any, node: Any) -> None:
        expressions = Expressions(self, scope, constant=True)
        rtype = expressions.type_of(expr)
        value = expressions.value(expr, max(target.width, rtype.width), rtype.signed)
        if value.op != Op.CONST:
            raise self.error("initial value is not constant", node)
        target.init_node = self.graph.extract(value, target.width - 1, 0)

    def _parameter(self, scope: Scope, declared: vast.Parameter) -> None:
        instance = scope.instance
        expressions = Expressions(self, scope, constant=True)
        overrides = getattr(instance, "overrides", {})
        local = type(declared) is not vast.Parameter or scope.parent is not None
        if not local and declared.name in overrides:
            value = overrides[declared.name]
        else:
            value = expressions.const_parameter(declared.value.var
                                                if isinstance(declared.value, vast.Rvalue)
                                                else declared.value)
        if declared.width is not None:
            msb = expressions.const_int(declared.width.msb)
            lsb = expressions.const_int(declared.width.lsb)
            value = _convert(value, abs(msb - lsb) + 1, bool(declared.signed))
        elif declared.signed and value.real is None:
            value = Parameter(value.width, True, value.value)
        scope.names[declared.name] = value
        if scope.parent is None:
            instance.parameters[declared.name] = value

    def _range(self, scope: Scope, width: Any) -> tuple[int, int]:
        if width is None:
            return 0, 0
        expressions = Expressions(self, scope, constant=True)
        return expressions.const_int(width.msb), expressions.const_int(width.lsb)

    def _port_declaration(self, scope: Scope, declared: Any, second: Any) -> Var:
        instance = scope.instance
        direction = {vast.Input: "input", vast.Output: "output", vast.Inout: "inout"}[type(declared)]
        if direction == "inout":
            raise self.error(f"unsupported construct: inout port `{declared.name}`", declared,
                             UnsupportedConstruct)
        instance.directions[declared.name] = direction
        var = self._variable(scope, declared, port=True)
        if second is not None:
            self._variable(scope, second)
            initial = getattr(second, "value", None)
            if initial is not None and var.is_variable:
                self._initial_value(scope, var, initial.var if isinstance(initial, vast.Rvalue)
                                    else initial, second)
        if instance.is_top and direction == "input":
            var.fixed = self.graph.input(var.name, var.width)
            var.direction = "input"
        elif getattr(instance, "placeholders", False) and direction == "input":
            var.fixed = self.graph.input(f"template input {var.name}", var.width)
        return var

    def _variable(self, scope: Scope, declared: Any, port: bool = False) -> Any:
        name = declared.name
        is_variable = isinstance(declared, (vast.Reg, vast.Integer))
        if isinstance(declared, (vast.Integer,)) or (isinstance(declared, vast.Genvar)):
            msb, lsb, signed = 31, 0, True
        else:
            msb, lsb = self._range(scope, declared.width)
            signed = bool(declared.signed)
        existing = scope.names.get(name)
        if isinstance(existing, Var):
            # `output [3:0] y; reg [3:0] y;` declares one thing in two steps (clause 12.3.3)
            if existing.kind in ("port", "instance port"):
                if declared.width is not None and (msb, lsb) != (existing.msb, existing.lsb) \
                        and not port:
                    raise self.error(f"`{name}` is declared with two different ranges", declared)
                if is_variable:
                    existing.is_variable = True
                if signed:
                    existing.signed = True
                if declared.width is not None and existing.width == 1 and \
                        (msb, lsb) != (0, 0):
                    existing.msb, existing.lsb = msb, lsb
                    existing.width = abs(msb - lsb) + 1
                    if existing.fixed is not None:
                        existing.fixed = self.graph.input(existing.fixed.params[0],
                                                          existing.width)
                return existing
            raise self.error(f"`{name}` is declared twice", declared)
        if existing is not None:
            raise self.error(f"`{name}` is declared twice", declared)
        width = abs(msb - lsb) + 1
        loc = self.location(declared)
        if port:
            kind = "port" if scope.instance.is_top else "instance port"
        else:
            kind = "variable" if is_variable else "net"
        dimensions = getattr(declared, "dimensions", None)
        if dimensions is not None and dimensions.lengths:
            if port or len(dimensions.lengths) != 1:
                raise self.error(f"unsupported construct: multi-dimensional array `{name}`",
                                 declared, UnsupportedConstruct)
            length = dimensions.lengths[0]
            first, last = self._range(scope, length)
            low, high = min(first, last), max(first, last)
            if high - low >= 1 << 20:
                raise self.error(f"memory `{name}` is too large", declared)
            elements = []
            for address in range(low, high + 1):
                element = Var(f"{scope.qualified(name)}[{address}]", width, signed, msb, lsb,
                              kind, loc, is_variable=is_variable)
                elements.append(element)
                self.all_vars.append(element)
            memory = Memory(scope.qualified(name), width, signed, low, elements, loc)
            scope.names[name] = memory
            return memory
        var = Var(scope.qualified(name), width, signed, msb, lsb, kind, loc,
                  is_variable=is_variable)
        scope.names[name] = var
        self.all_vars.append(var)
        return var

    # --------------------------------------------------------------- generate
    def _generate_for(self, scope: Scope, item: vast.ForStatement, pending: list) -> None:
        scope.genblock_count += 1
        number = scope.genblock_count
        if not isinstance(item.pre, vast.Substitution) or \
                not isinstance(item.pre.left.var, vast.Identifier):
            raise self.error("unsupported construct: generate loop without `genvar = value`",
                             item, UnsupportedConstruct)
        genvar = item.pre.left.var.name
        body = item.statement
        label = body.scope if isinstance(body, vast.Block) and body.scope else f"genblk{number}"
        value = Expressions(self, scope, constant=True).const_int(item.pre.right.var)
        count = 0
        while True:
            probe = Scope(scope.prefix, scope, scope.module, scope.instance)
            probe.names[genvar] = _genvar(value)
            condition = Expressions(self, probe, constant=True).condition(item.cond)
            if condition.op != Op.CONST:
                raise self.error("generate loop condition is not constant", item)
            if not condition.value:
                break
            count += 1
            if count > _GENERATE_LIMIT:
                raise self.error("loop without constant bound: generate loop runs more than "
                                 f"{_GENERATE_LIMIT} times", item)
            name = f"{label}[{value}]"
            child = Scope(f"{scope.prefix}{name}.", scope, scope.module, scope.instance)
            child.names[genvar] = _genvar(value)
            scope.children[name] = child
            self._block_items(child, body, pending)
            if not isinstance(item.post, vast.Substitution):
                raise self.error("unsupported construct: generate loop step", item,
                                 UnsupportedConstruct)
            value = Expressions(self, probe, constant=True).const_int(item.post.right.var)

    def _generate_choice(self, scope: Scope, item: Any, number: int, pending: list) -> None:
        expressions = Expressions(self, scope, constant=True)
        chosen = None
        if isinstance(item, vast.IfStatement):
            chosen = item.true_statement if expressions.const_int(item.cond) else \
                item.false_statement
            if isinstance(chosen, vast.IfStatement):      # else if: same construct
                self._generate_choice(scope, chosen, number, pending)
                return
        else:
            selector = expressions.const_int(item.comp)
            default = None
            for case in item.caselist:
                if case.cond is None:
                    default = case.statement
                elif any(expressions.const_int(c) == selector for c in case.cond):
                    chosen = case.statement
                    break
            else:
                chosen = default
        if chosen is None:
            return
        label = chosen.scope if isinstance(chosen, vast.Block) and chosen.scope else \
            f"genblk{number}"
        self._generate_block(scope, chosen, label, pending)

    def _generate_block(self, scope: Scope, body: Any, label: str, pending: list) -> None:
        child = Scope(f"{scope.prefix}{label}.", scope, scope.module, scope.instance)
        scope.children[label] = child
        self._block_items(child, body, pending)

    def _block_items(self, scope: Scope, body: Any, pending: list) -> None:
        if isinstance(body, vast.Block):
            for statement in body.statements or ():
                self._item(scope, statement, pending)
        elif body is not None:
            self._item(scope, body, pending)

    # --------------------------------------------------------------- pass 2
    def _behaviour(self, scope: Scope, item: Any) -> None:
        if isinstance(item, vast.Assign):
            self.continuous(scope, item.left, item.right.var if isinstance(item.right, vast.Rvalue)
                            else item.right, item, "continuous assignment")
        elif isinstance(item, vast.Always):
            self._always(scope, item)
        elif isinstance(item, vast.InstanceList):
            for instance in item.instances:
                self._instance(scope, instance)
        elif isinstance(item, vast.Initial):
            run_initial(self, scope, item)

    def continuous(self, scope: Scope, left: Any, right: Any, node: Any, what: str,
                   source: Optional[Any] = None, targets: Optional[list] = None) -> None:
        """Drivers for ``left = right`` (or for ``left = source()`` when given: a node
        producer with its signedness, for instance output ports); ``targets``, when given,
        are ``left``'s parts already found by ``lvalue_parts`` in ``scope``."""
        g = self.graph
        expressions = Expressions(self, scope)
        if targets is None:
            targets = lvalue_parts(self, expressions, left, procedural=False)
        width = sum(t.width for t in targets)
        memo: dict[str, Any] = {}

        def whole() -> Node:
            if "value" not in memo:
                if memo.get("computing"):
                    raise DesignError("combinational loop through the assignment at "
                                      f"{self.location(node)}", *_file_line(self, node))
                memo["computing"] = True
                if source is not None:
                    produced, signed = source()
                    value = g.resize(produced, max(width, produced.width), signed)
                else:
                    rtype = expressions.type_of(right)
                    value = expressions.value(right, max(width, 1 if rtype.real else rtype.width),
                                              rtype.signed)
                memo["value"] = g.extract(value, width - 1, 0) if value.width > width else value
            return memo["value"]

        offset = width
        for target in targets:
            offset -= target.width
            if target.var is None:
                continue
            low = offset

            def produce(low: int = low, count: int = target.width) -> Node:
                return g.extract(whole(), low + count - 1, low)
            self.add_driver(target.var, target.lo, target.lo + target.width - 1, produce, node,
                            what)

    def _always(self, scope: Scope, item: vast.Always) -> None:
        sens = list(item.sens_list.list) if item.sens_list is not None else []
        edges = [s for s in sens if s.type in ("posedge", "negedge")]
        if edges and len(edges) != len(sens):
            raise self.error("unsupported construct: sensitivity list mixing edges and levels",
                             item, UnsupportedConstruct)
        if not sens and not isinstance(item, vast.AlwaysComb):
            raise self.error("unsupported construct: always block without an event control",
                             item, UnsupportedConstruct)
        driven = scan_driven(self, scope, item.statement)
        block = ProceduralBlock(self, item, scope, bool(edges), driven)
        g = self.graph
        if edges:
            for var in driven:
                var.state = g.state(var.name, var.width)
                self.add_driver(var, 0, var.width - 1, lambda var=var: var.state, item,
                                "clocked always block")
            self.clocked.append((block, edges))
            return
        if any(s.type == "level" for s in sens):
            sensitivity_note(self, scope, item, sens, driven)
        for var, bits in driven.items():
            for lo, hi in _runs(bits, var.width):
                self.add_driver(var, lo, hi,
                                lambda var=var, lo=lo, hi=hi: g.extract(block.result(var), hi, lo),
                                item, "always block")

    def _instance(self, scope: Scope, inst: vast.Instance) -> None:
        if inst.array is not None:
            raise self.error("unsupported construct: array of instances", inst,
                             UnsupportedConstruct)
        if inst.module in _GATES:
            self._gate(scope, inst)
            return
        module = self.modules.get(inst.module)
        if module is None:
            raise self.error(f"unknown module `{inst.module}` instantiated", inst)
        constant = Expressions(self, scope, constant=True)
        named: dict[str, Parameter] = {}
        positional: list[Parameter] = []
        for argument in inst.parameterlist or ():
            value = constant.const_parameter(argument.argname)
            if argument.paramname is None:
                positional.append(value)
            else:
                named[argument.paramname] = value
        if named and positional:
            raise self.error("parameter overrides mix named and positional forms", inst)
        prefix = f"{scope.prefix}{inst.name}."
        if module.name not in self._stampable:
            self._stampable[module.name] = stampable(self.modules, module)
        if self._stampable[module.name]:
            key = (module.name, tuple(sorted(named.items())), tuple(positional))
            template = self.templates.get(key)
            if template is None:
                template = self.templates[key] = Template(self, module, named, positional,
                                                          prefix, inst)
            stamp = _Stamp(template, prefix)
            self.stamps.append(stamp)
            scope.children[inst.name] = stamp.scope
            self._connect(scope, inst, stamp)
            return
        child = self.instantiate(module, prefix, named, positional, False, inst)
        scope.children[inst.name] = child.scope
        self._connect(scope, inst, child)


def _genvar(value: int) -> Parameter:
    return Parameter(32, True, value & 0xFFFFFFFF)


def _convert(value: Parameter, width: int, signed: bool) -> Parameter:
    """A parameter value converted to a declared range (clause 12.2)."""
    if value.real is not None:
        number = real_to_integer(value.real)
    else:
        number = value.integer
    return Parameter(width, signed, number & ((1 << width) - 1))


def _paramlist(module: vast.ModuleDef) -> list:
    if module.paramlist is None:
        return []
    return [d for d in module.paramlist.params or () if isinstance(d, vast.Decl)]


def _runs(bits: int, width: int):
    """Contiguous runs of set bits of ``bits`` as (lo, hi)."""
    bit = 0
    while bit < width:
        if bits >> bit & 1:
            lo = bit
            while bit < width and bits >> bit & 1:
                bit += 1
            yield lo, bit - 1
        else:
            bit += 1


def _file_line(resolver: Resolver, node: Any) -> tuple:
    loc = resolver.location(node)
    return loc.file, loc.line

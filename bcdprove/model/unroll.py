"""Unrolling a clocked model over a number of clock cycles into one combinational model.

Timing contract (the one every clocked check, report and test bench of bcdprove uses):

- Cycle ``t`` is one clock period.  Input values are constant during a cycle; the active
  clock edge comes at the end of the cycle.  ``p@t`` is the value of input ``p`` during
  cycle ``t``, ``r@t`` the value of register ``r`` during cycle ``t``, ``o@t`` that of
  output ``o`` during cycle ``t``.  ``r@(t+1)`` is the register's next-state function of the
  values of cycle ``t``.  The clock port is not an input of the unrolled model.
- A register with neither a reset that acts in cycle 0 nor a declaration initialiser starts
  with a fresh unknown value (a FREE leaf): any value, so a proof covers every power-up state.
- An asynchronous reset (IEEE 1364-2005 clause 9.7: the block also wakes on the reset edge)
  acts at once: while it is active during cycle ``t`` the register shows its reset value
  during cycle ``t`` and, because the clocked block takes its reset branch at the edge too,
  during cycle ``t + 1``.
- Registers on one edge only (all posedge or all negedge): that edge ends the cycle.  A
  design with registers on both edges of its clock: each cycle is two half cycles, the
  falling edge in the middle and the rising edge at the end; ``r@t`` and ``o@t`` are the
  values during the second half (after the falling edge, just before the rising one).
- Every unknown value of the design (x, out-of-range reads) is a fresh FREE leaf in every
  cycle: an x in one cycle says nothing about the x of another.

``drive`` lets a protocol set some inputs of a cycle to nodes of its own (a constant reset,
a start pulse that depends on an earlier ``done``); inputs not driven become INPUT leaves
named ``p@t``.  The result keeps, per cycle, the node of every input, register and output,
so a counterexample can be shown cycle by cycle (:meth:`UnrolledModel.trace`).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Callable, Mapping, Optional

from ..errors import BcdproveError, UnsupportedConstruct
from .design import Model, Port, Register, Signal
from .node import Node, Op, apply_op, leaves, mask, substitute, topological

Drive = Callable[[int, "UnrolledModel"], Mapping[str, Node]]


def cycle_name(name: str, cycle: int) -> str:
    """The name of ``name`` during cycle ``cycle``: ``reading@3``."""
    return f"{name}@{cycle}"


@dataclass
class CycleValues:
    """Concrete values of one cycle: input, register and output port values by name."""

    cycle: int
    inputs: dict[str, int]
    registers: dict[str, int]
    outputs: dict[str, int]


@dataclass
class UnrolledModel:
    """A clocked model unrolled over ``cycles`` cycles (see the module docstring).

    ``model`` is the combinational model: input ports ``p@t`` (undriven inputs only), output
    ports ``o@t``, signals ``r@t`` of kind "register" and ``o@t`` of kind "port".
    ``inputs[t]``, ``registers[t]``, ``outputs[t]`` map port and register names to the node
    of that cycle; ``initial`` maps register names to their power-up value (before any reset).
    """

    model: Model
    source: Model
    cycles: int
    clock: Optional[str]
    half_cycles: bool
    inputs: list[dict[str, Node]] = field(default_factory=list)
    registers: list[dict[str, Node]] = field(default_factory=list)
    outputs: list[dict[str, Node]] = field(default_factory=list)
    initial: dict[str, Node] = field(default_factory=dict)
    fresh: dict[tuple[int, int, int], Node] = field(default_factory=dict)
    selective: bool = False    # only the cone of the outputs asked for was built

    @property
    def input_names(self) -> list[str]:
        """The source model's input ports, clock excluded, in declaration order."""
        return [p.name for p in self.source.inputs if p.name != self.clock]

    @property
    def output_names(self) -> list[str]:
        return [p.name for p in self.source.outputs]

    def leaf(self, port: str, cycle: int) -> Node:
        """The INPUT leaf ``port@cycle`` (whether or not a protocol drove that input)."""
        width = self.source.port(port).width
        return self.model.graph.input(cycle_name(port, cycle), width)

    def all_nodes(self) -> list[Node]:
        """Every per-cycle node kept, in a fixed order (inputs, registers, outputs per cycle)."""
        nodes = list(self.initial.values())
        for t in range(len(self.outputs)):
            nodes += list(self.inputs[t].values()) + list(self.registers[t].values())
            nodes += list(self.outputs[t].values())
        return nodes

    def node_trace(self, values: Mapping[int, int], default: int = 0) -> list[CycleValues]:
        """Values of the nodes built, per cycle, for leaf values ``values`` (leaf id -> int);
        leaves missing from ``values`` take ``default``.  A selective unrolling lacks the
        registers and outputs outside the cone it was asked for."""
        env: dict[int, int] = {}
        for node in topological(self.all_nodes()):
            if node.op == Op.CONST:
                env[node.id] = node.value
            elif node.op in Op.LEAVES:
                env[node.id] = values.get(node.id, default) & mask(node.width)
            else:
                env[node.id] = apply_op(node.op, node.width, node.params,
                                        [env[a.id] for a in node.args],
                                        [a.width for a in node.args])
        return [CycleValues(t, {n: env[v.id] for n, v in self.inputs[t].items()},
                            {n: env[v.id] for n, v in self.registers[t].items()},
                            {n: env[v.id] for n, v in self.outputs[t].items()})
                for t in range(len(self.outputs))]

    def trace(self, values: Mapping[int, int], default: int = 0) -> list[CycleValues]:
        """Every input, register and output of every cycle for leaf values ``values``.

        The inputs come from the nodes built (a protocol's drive included); registers and
        outputs from a cycle-by-cycle scalar run of the source model with the same timing,
        which also fills in what a selective unrolling did not build.  Every value the
        nodes do hold must agree with that run (AssertionError otherwise: the unrolling and
        the run disagree, a bug).
        """
        built = self.node_trace(values, default)
        inputs = [c.inputs for c in built]
        run = _concrete_run(self, inputs, values, default)
        for mine, theirs in zip(built, run):
            for name, value in list(mine.registers.items()) + list(mine.outputs.items()):
                other = theirs.registers.get(name) if name in mine.registers else None
                if name in mine.outputs:
                    other = theirs.outputs[name]
                if value != other:
                    raise AssertionError(f"cycle {mine.cycle}: {name} is {value} in the unrolled "
                                         f"model but {other} in the cycle-by-cycle run")
        return run

    def initial_values(self, values: Mapping[int, int], default: int = 0) -> dict[str, int]:
        """Power-up register values for leaf values ``values`` (for a test bench)."""
        env = {}
        for name, node in self.initial.items():
            if node.op == Op.CONST:
                env[name] = node.value
            else:
                env[name] = values.get(node.id, default) & mask(node.width)
        return env


def model_clock(model: Model, clock: Optional[str] = None) -> str:
    """The one clock of ``model``'s registers (``clock`` when given, after checking it).

    Raises BcdproveError when the model has no registers, when ``clock`` is not an input,
    and UnsupportedConstruct when registers use more than one clock.
    """
    if not model.registers:
        raise BcdproveError(f"module `{model.top}` has no registers: nothing to clock "
                            f"(check it as a combinational converter, without --clock)")
    clocks = sorted({r.clock for r in model.registers})
    if clock is None:
        if len(clocks) != 1:
            raise UnsupportedConstruct(f"module `{model.top}` has registers on several clocks "
                                       f"({', '.join(clocks)}); only one clock is supported")
        clock = clocks[0]
    inputs = {p.name for p in model.inputs}
    if clock not in inputs:
        raise BcdproveError(f"--clock {clock}: `{model.top}` has no input port `{clock}` "
                            f"(inputs: {', '.join(sorted(inputs)) or 'none'})")
    others = [r for r in model.registers if r.clock != clock]
    if others:
        where = (others[0].loc.file, others[0].loc.line) if others[0].loc else ()
        raise UnsupportedConstruct(f"register `{others[0].name}` is clocked by "
                                   f"`{others[0].clock}`, not `{clock}`; only one clock is "
                                   f"supported", *where)
    return clock


def _phases(registers: list[Register]) -> list[str]:
    """The edges of one cycle in time order; the last one ends the cycle."""
    edges = {r.edge for r in registers}
    if edges == {"posedge", "negedge"}:
        return ["negedge", "posedge"]
    return sorted(edges)


class _Unroller:
    """Builds the cycles one after another (the drive of a cycle may read earlier ones)."""

    def __init__(self, model: Model, clock: str, drive: Optional[Drive],
                 needed: Optional[Mapping[int, set[str]]] = None):
        self.needed = needed
        self.source = model
        self.graph = model.graph
        self.clock = clock
        self.drive = drive
        self.phases = _phases(model.registers)
        self.data_inputs = [p for p in model.inputs if p.name != clock]
        self.outputs = model.outputs
        self.resets = [r for r in model.registers if r.reset is not None]
        roots = [r.next for r in model.registers] + [p.node for p in self.outputs]
        roots += [r.reset.value for r in self.resets] + self._reset_nodes()
        cone = leaves(roots)
        clock_leaf = model.port(clock).node
        if any(leaf is clock_leaf for leaf in cone):
            raise UnsupportedConstruct(f"module `{model.top}` reads its clock `{clock}` as data "
                                       f"(outside an edge event); bcdprove models the clock only "
                                       f"as the edge that ends a cycle")
        self.free_leaves = [leaf for leaf in cone if leaf.op == Op.FREE]
        self.selective = needed is not None and len(self.phases) == 1

    def _registers_read(self, roots: list[Node]) -> set[str]:
        return {leaf.params[0] for leaf in leaves(roots) if leaf.op == Op.STATE}

    def _needs(self, cycles: int) -> list[set[str]]:
        """Registers to build in each cycle so that the outputs asked for can be built:
        backwards from the last cycle, each needed register needs what its next state reads
        (and what its asynchronous reset reads) one cycle earlier."""
        by_name = {r.name: r for r in self.source.registers}
        reads = {}
        for register in self.source.registers:
            roots = [register.next]
            if register.reset is not None:
                roots += [register.reset.value, self._reset_signal(register.reset.signal, register)]
            reads[register.name] = self._registers_read(roots)
        forcing = {r.name: self._registers_read([r.reset.value, self._reset_signal(
            r.reset.signal, r)]) for r in self.resets}
        outputs = {p.name: self._registers_read([p.node]) for p in self.outputs}
        need: list[set[str]] = [set() for _ in range(cycles + 1)]
        for t in reversed(range(cycles)):
            here: set[str] = set()
            for name in self.needed.get(t, ()):
                here |= outputs[name]
            for name in need[t + 1]:
                here |= reads[name]
            frontier = [n for n in here if n in forcing]
            while frontier:                 # a forced value reads its reset's registers now
                extra = forcing[frontier.pop()] - here
                here |= extra
                frontier += [n for n in extra if n in forcing]
            need[t] = {n for n in here if n in by_name}
        return need

    def _reset_nodes(self) -> list[Node]:
        nodes = []
        for register in self.resets:
            nodes.append(self._reset_signal(register.reset.signal, register))
        return nodes

    def _reset_signal(self, name: str, register: Register) -> Node:
        try:
            return self.source.port(name).node
        except KeyError:
            pass
        signal = self.source.signals.get(name)
        if signal is None or signal.node.width != 1:
            where = (register.loc.file, register.loc.line) if register.loc else ()
            raise UnsupportedConstruct(f"asynchronous reset `{name}` of register "
                                       f"`{register.name}` is neither an input port nor a "
                                       f"one-bit net of the design", *where)
        return signal.node

    def run(self, cycles: int) -> UnrolledModel:
        if cycles < 1:
            raise BcdproveError(f"unrolling needs at least one cycle, got {cycles}")
        graph = self.graph
        result = UnrolledModel(model=Model(graph=graph, top=self.source.top,
                                           files=list(self.source.files),
                                           parameters=dict(self.source.parameters),
                                           notes=list(self.source.notes)),
                               source=self.source, cycles=cycles, clock=self.clock,
                               half_cycles=len(self.phases) == 2, selective=self.selective)
        self.result = result
        self.need = self._needs(cycles) if self.selective else None
        state: dict[str, Node] = {}
        for register in self.source.registers:
            if register.init is not None:
                state[register.name] = register.init
            else:
                state[register.name] = graph.free(register.width,
                                                  f"power-up value of {register.name}")
        result.initial = dict(state)
        for t in range(cycles):
            driven = dict(self.drive(t, result)) if self.drive else {}
            unknown_ports = set(driven) - {p.name for p in self.data_inputs}
            if unknown_ports:
                raise BcdproveError(f"cycle {t}: no input port {', '.join(sorted(unknown_ports))} "
                                    f"to drive")
            inputs = {}
            for port in self.data_inputs:
                node = driven.get(port.name)
                if node is None:
                    node = graph.input(cycle_name(port.name, t), port.width)
                elif node.width != port.width:
                    raise ValueError(f"drive of {port.name}@{t}: {node.width} bits for a "
                                     f"{port.width}-bit port")
                inputs[port.name] = node
            result.inputs.append(inputs)
            if self.need is not None:
                state = {n: v for n, v in state.items() if n in self.need[t]}
            state, shown, outputs = self._cycle(t, state, inputs)
            result.registers.append(shown)
            result.outputs.append(outputs)
        self._fill_model(result)
        if self.selective:
            stray = [leaf for leaf in leaves(result.all_nodes()) if leaf.op == Op.STATE]
            if stray:
                raise AssertionError(f"selective unrolling left {stray[0]!r} unbuilt")
        return result

    def _mapping(self, t: int, phase: int, state: Mapping[str, Node],
                 inputs: Mapping[str, Node]) -> dict[int, Node]:
        mapping: dict[int, Node] = {}
        for register in self.source.registers:
            if register.name in state:
                mapping[register.state.id] = state[register.name]
        for port in self.data_inputs:
            mapping[port.node.id] = inputs[port.name]
        suffix = f"cycle {t}" + (f", half {phase + 1}" if len(self.phases) == 2 else "")
        fresh = self.result.fresh
        for leaf in self.free_leaves:
            key = (t, phase, leaf.id)
            if key not in fresh:
                fresh[key] = self.graph.free(leaf.width, f"{leaf.params[1]} ({suffix})")
            mapping[leaf.id] = fresh[key]
        return mapping

    def _with_resets(self, t: int, phase: int, state: dict[str, Node], inputs: Mapping[str, Node]
                     ) -> tuple[dict[str, Node], dict[str, tuple[Node, Node]]]:
        """Registers with an active asynchronous reset forced to their reset value; also, per
        reset register, (active condition, reset value) for the edge that ends the phase."""
        if not self.resets:
            return state, {}
        graph = self.graph
        mapping = self._mapping(t, phase, state, inputs)
        present = [r for r in self.resets if r.name in state]
        roots = []
        for register in present:
            roots += [self._reset_signal(register.reset.signal, register), register.reset.value]
        built = substitute(graph, roots, mapping)
        forced = dict(state)
        active: dict[str, tuple[Node, Node]] = {}
        for k, register in enumerate(present):
            level, value = built[2 * k], built[2 * k + 1]
            condition = level if register.reset.active_high else graph.not_(level)
            active[register.name] = (condition, value)
            forced[register.name] = graph.ite(condition, value, state[register.name])
        return forced, active

    def _cycle(self, t: int, state: dict[str, Node], inputs: Mapping[str, Node]):
        graph = self.graph
        for phase, edge in enumerate(self.phases):
            state, active = self._with_resets(t, phase, state, inputs)
            movers = [r for r in self.source.registers if r.edge == edge
                      and (self.need is None or r.name in self.need[t + 1])]
            last = phase == len(self.phases) - 1
            roots = [r.next for r in movers]
            shown_outputs = self.outputs
            if self.need is not None:
                shown_outputs = [p for p in self.outputs if p.name in self.needed.get(t, ())]
            if last:
                roots += [p.node for p in shown_outputs]
            built = substitute(graph, roots, self._mapping(t, phase, state, inputs))
            shown = dict(state)
            following = {} if self.need is not None else dict(state)
            for register, node in zip(movers, built):
                if register.name in active:
                    condition, value = active[register.name]
                    node = graph.ite(condition, value, node)
                following[register.name] = node
            if last:
                outputs = {p.name: n for p, n in zip(shown_outputs, built[len(movers):])}
                return following, shown, outputs
            state = following
        raise AssertionError("a clocked model without edges")

    def _fill_model(self, result: UnrolledModel) -> None:
        model = result.model
        seen: set[int] = set()
        for t in range(result.cycles):
            for port in self.data_inputs:
                node = result.inputs[t][port.name]
                if node.op == Op.INPUT and node.params[0] == cycle_name(port.name, t) \
                        and node.id not in seen:
                    seen.add(node.id)
                    model.ports.append(Port(cycle_name(port.name, t), "input", port.width,
                                            port.signed, node, port.loc, port.msb, port.lsb))
            for register in self.source.registers:
                if register.name not in result.registers[t]:
                    continue
                name = cycle_name(register.name, t)
                model.signals[name] = Signal(name, result.registers[t][register.name],
                                             "register", loc=register.loc)
            for port in self.outputs:
                if port.name not in result.outputs[t]:
                    continue
                name = cycle_name(port.name, t)
                node = result.outputs[t][port.name]
                model.ports.append(Port(name, "output", port.width, port.signed, node, port.loc,
                                        port.msb, port.lsb))
                model.signals[name] = Signal(name, node, "port", port.signed, port.loc)


def unroll(model: Model, cycles: int, clock: Optional[str] = None,
           drive: Optional[Drive] = None,
           outputs: Optional[Mapping[int, set[str]]] = None) -> UnrolledModel:
    """``model`` over cycles ``0 .. cycles-1`` in the same graph (see the module docstring).

    ``clock`` names the clock input (default: the one clock of the registers).  ``drive(t,
    partial)`` returns nodes for some inputs of cycle ``t``; ``partial`` holds cycles before
    ``t`` complete.  ``outputs`` (cycle -> output names) builds only what those outputs read
    (a selective unrolling: the other registers and outputs are left out, and a drive must
    then not read outputs); a design on both clock edges is always unrolled whole.  Raises
    BcdproveError / UnsupportedConstruct for a model without registers, several clocks, a
    clock read as data or an unusable reset.
    """
    clock = model_clock(model, clock)
    return _Unroller(model, clock, drive, outputs).run(cycles)


def _concrete_run(unrolled: UnrolledModel, inputs: list[dict[str, int]],
                  values: Mapping[int, int], default: int) -> list[CycleValues]:
    """The source model run cycle by cycle on concrete values, with the timing of the
    module docstring (an independent path from the unrolled nodes, for traces)."""
    from .node import evaluate

    source = unrolled.source
    phases = _phases(source.registers)
    state = {}
    for register in source.registers:
        node = unrolled.initial[register.name]
        state[register.name] = node.value if node.op == Op.CONST else \
            values.get(node.id, default) & mask(register.width)
    ports = {p.name: p for p in source.ports}
    resets = [r for r in source.registers if r.reset is not None]
    frees = [leaf for leaf in leaves([r.next for r in source.registers]
                                     + [p.node for p in source.outputs]
                                     + [r.reset.value for r in resets]
                                     + [ports[r.reset.signal].node if r.reset.signal in ports
                                        else source.signals[r.reset.signal].node
                                        for r in resets])
             if leaf.op == Op.FREE]
    run = []
    for t, given in enumerate(inputs):
        for phase, edge in enumerate(phases):
            env = {r.state.id: state[r.name] for r in source.registers}
            for name, value in given.items():
                env[ports[name].node.id] = value
            for leaf in frees:
                fresh = unrolled.fresh.get((t, phase, leaf.id))
                env[leaf.id] = values.get(fresh.id, default) if fresh is not None else default
            active = {}
            for register in resets:
                signal = (ports[register.reset.signal].node if register.reset.signal in ports
                          else source.signals[register.reset.signal].node)
                level, value = evaluate([signal, register.reset.value], env)
                if bool(level) == register.reset.active_high:
                    active[register.name] = value
                    state[register.name] = value
                    env[register.state.id] = value
            movers = [r for r in source.registers if r.edge == edge]
            last = phase == len(phases) - 1
            roots = [r.next for r in movers] + ([p.node for p in source.outputs] if last else [])
            computed = evaluate(roots, env)
            shown = dict(state)
            for register, value in zip(movers, computed):
                state[register.name] = active.get(register.name, value)
            if last:
                outputs = {p.name: v for p, v in zip(source.outputs, computed[len(movers):])}
                run.append(CycleValues(t, dict(given), shown, outputs))
    return run

"""Design against design: do two combinational models compute the same outputs?

:func:`build_equivalence` pairs the ports of two models (by name, or as the caller maps them),
copies both output cones into one fresh graph in which each pair of inputs is one shared leaf,
and returns an :class:`EquivalenceProblem`.  Every engine decides the same question: is there
a value of the shared inputs, and a choice of every unknown value (``x``, ``z``, out-of-range
selects: the leaves the reader makes FREE) of either design, for which some output pair
differs?  The unknowns of the two designs are independent, so "equivalent" means the outputs
agree for every input and every way both designs' unknowns may be resolved (the conservative
reading: a design whose output is ``x`` somewhere is not equivalent to anything there, itself
included).

Port pairing rules: every input and every output of each design must have a counterpart of the
same direction and the same width.  A narrower output is not zero-extended: a missing top
digit is exactly the kind of difference this check is for, so it is an error naming the port.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Mapping, Sequence

from ..errors import BcdproveError
from ..model.combine import transplant
from ..model.design import Model, Port
from ..model.node import Graph, Node, Op, evaluate, mask, topological


@dataclass
class InputPair:
    """One shared input: its name in each design, its width, and its leaves."""

    name_a: str
    name_b: str
    width: int
    leaf: Node                 # the INPUT leaf of the combined graph
    leaf_a: Node               # the INPUT leaf in design A's own graph
    leaf_b: Node


@dataclass
class OutputPair:
    """One compared output: its name in each design, its width, and both drivers."""

    name_a: str
    name_b: str
    width: int
    node_a: Node               # the copy of A's driver in the combined graph
    node_b: Node

    @property
    def label(self) -> str:
        return self.name_a if self.name_a == self.name_b else f"{self.name_a}/{self.name_b}"


@dataclass
class OutputValues:
    """Both designs' values of one output pair at a counterexample."""

    name_a: str
    name_b: str
    width: int
    value_a: int
    value_b: int

    @property
    def differs(self) -> bool:
        return self.value_a != self.value_b

    @property
    def label(self) -> str:
        return self.name_a if self.name_a == self.name_b else f"{self.name_a}/{self.name_b}"


@dataclass
class EquivalenceCounterexample:
    """Inputs (and chosen unknown values) at which the designs' outputs differ.

    ``inputs`` is keyed by design A's port names (``input_names_b`` gives B's name of each);
    ``free_values_a``/``_b`` map the ids of unknown-value leaves of each design's own model to
    the values chosen.  ``replayed`` is set only by :meth:`EquivalenceProblem.replay`.
    """

    inputs: dict[str, int]
    outputs: list[OutputValues]
    input_names_b: dict[str, str] = field(default_factory=dict)
    free_values_a: dict[int, int] = field(default_factory=dict)
    free_values_b: dict[int, int] = field(default_factory=dict)
    replayed: bool = False
    note: str = ""

    @property
    def differing(self) -> list[str]:
        return [o.label for o in self.outputs if o.differs]

    @property
    def uses_unknowns(self) -> bool:
        return bool(self.free_values_a or self.free_values_b)


@dataclass
class EquivalenceProblem:
    """Two models, their paired ports and both output cones in one graph (see the module doc)."""

    model_a: Model
    model_b: Model
    graph: Graph
    inputs: list[InputPair]
    outputs: list[OutputPair]
    free_a: list[tuple[Node, Node]]     # (leaf in A's graph, leaf in the combined graph)
    free_b: list[tuple[Node, Node]]
    reasons: list[str] = field(default_factory=list)
    _orders: dict = field(default_factory=dict, repr=False, compare=False)

    @property
    def roots(self) -> list[Node]:
        """The output drivers of both designs in the combined graph, A's first."""
        return [o.node_a for o in self.outputs] + [o.node_b for o in self.outputs]

    def input_leaves(self) -> list[Node]:
        return [pair.leaf for pair in self.inputs]

    def free_leaves(self) -> list[Node]:
        """The unknown values of both designs (combined graph), A's first."""
        return [copy for _, copy in self.free_a] + [copy for _, copy in self.free_b]

    def leaves(self) -> list[Node]:
        """Every leaf the outputs may depend on: the shared inputs, then the unknown values."""
        return self.input_leaves() + self.free_leaves()

    def _order(self, key: str, roots: Sequence[Node]) -> list[Node]:
        if key not in self._orders:
            self._orders[key] = topological(roots)
        return self._orders[key]

    def replay(self, values: Mapping[int, int]) -> EquivalenceCounterexample | None:
        """Evaluate both original models at the leaf values ``values`` (combined-graph leaf id
        -> value; a missing leaf is 0); a replayed counterexample when some output pair
        differs, else None.

        The evaluation runs on each design's own model (scalar, ``model.node.evaluate``), not
        on the combined graph the engines searched, so a replay also checks the copying.
        """
        inputs = {pair.name_a: values.get(pair.leaf.id, 0) & mask(pair.width)
                  for pair in self.inputs}
        free_a = {orig.id: values.get(copy.id, 0) & mask(orig.width) for orig, copy in self.free_a}
        free_b = {orig.id: values.get(copy.id, 0) & mask(orig.width) for orig, copy in self.free_b}
        outs_a = self._evaluate_model(self.model_a, "a", inputs, free_a,
                                      {p.name_a: p.leaf_a for p in self.inputs})
        outs_b = self._evaluate_model(self.model_b, "b", inputs, free_b,
                                      {p.name_a: p.leaf_b for p in self.inputs})
        shown = [OutputValues(o.name_a, o.name_b, o.width, a, b)
                 for o, a, b in zip(self.outputs, outs_a, outs_b)]
        if not any(o.differs for o in shown):
            return None
        return EquivalenceCounterexample(
            inputs=inputs, outputs=shown,
            input_names_b={p.name_a: p.name_b for p in self.inputs},
            free_values_a=free_a, free_values_b=free_b, replayed=True)

    def _evaluate_model(self, model: Model, key: str, inputs: Mapping[str, int],
                        free: Mapping[int, int], leaf_of: Mapping[str, Node]) -> list[int]:
        names = [o.name_a if key == "a" else o.name_b for o in self.outputs]
        roots = [model.port(name).node for name in names]
        order = self._order(key, roots)
        values = dict(free)
        for name, leaf in leaf_of.items():
            values[leaf.id] = inputs[name]
        for leaf in order:
            if leaf.op in Op.LEAVES and leaf.op != Op.CONST and leaf.id not in values:
                values[leaf.id] = 0     # a leaf outside every output cone of the copy
        return evaluate(roots, values, order)


def _where(port: Port) -> tuple:
    return (port.loc.file, port.loc.line) if port.loc else ()


def _pair_ports(model_a: Model, model_b: Model, mapping: Mapping[str, str],
                compared: Sequence[str] | None = None) -> tuple[list[tuple[Port, Port]], list[str]]:
    """Pairs (port of A, port of B) in A's declaration order; BcdproveError on any mismatch.

    ``compared``: only these outputs of A (and their partners) are paired; other outputs of
    either design are left out.
    """
    a_name, b_name = f"`{model_a.top}`", f"`{model_b.top}`"
    if model_a.top == model_b.top:
        a_name, b_name = f"`{model_a.top}` (design)", f"`{model_b.top}` (--against)"
    ports_a = {p.name: p for p in model_a.ports
               if compared is None or p.direction != "output" or p.name in compared}
    ports_b = {p.name: p for p in model_b.ports}
    if compared is not None:
        mapping = {a: b for a, b in mapping.items() if a in ports_a}
        partners = {mapping.get(name, name) for name in compared}
        ports_b = {n: p for n, p in ports_b.items() if p.direction != "output" or n in partners}
    taken_b: dict[str, str] = {}
    for name_a, name_b in mapping.items():
        if name_a not in ports_a:
            raise BcdproveError(f"--map {name_a}={name_b}: {a_name} has no port `{name_a}` "
                                f"(ports: {', '.join(ports_a)})")
        if name_b not in ports_b:
            raise BcdproveError(f"--map {name_a}={name_b}: {b_name} has no port `{name_b}` "
                                f"(ports: {', '.join(ports_b)})")
        if name_b in taken_b:
            raise BcdproveError(f"--map: port `{name_b}` of {b_name} is mapped twice "
                                f"(from `{taken_b[name_b]}` and `{name_a}`)")
        taken_b[name_b] = name_a
    pairs: list[tuple[Port, Port]] = []
    reasons: list[str] = []
    for port in ports_a.values():
        if port.name in mapping:
            other = ports_b[mapping[port.name]]
            how = "mapped"
        else:
            other = ports_b.get(port.name)
            if other is None or other.name in taken_b:
                raise BcdproveError(
                    f"{port.direction} `{port.name}` of {a_name} has no counterpart in {b_name} "
                    f"(its ports: {', '.join(ports_b)}); pair it with --map {port.name}=PORT",
                    *_where(port))
            how = "by name"
            taken_b[other.name] = port.name
        if port.direction not in ("input", "output"):
            raise BcdproveError(f"port `{port.name}` of {a_name} is an {port.direction}; only "
                                f"inputs and outputs can be compared", *_where(port))
        if other.direction != port.direction:
            raise BcdproveError(f"port `{port.name}` is an {port.direction} of {a_name} but "
                                f"`{other.name}` is an {other.direction} of {b_name}",
                                *_where(other))
        if other.width != port.width:
            raise BcdproveError(
                f"{port.direction} `{port.name}` is {port.width} bits in {a_name} but "
                f"`{other.name}` is {other.width} bits in {b_name}; widths must agree "
                f"(a narrower output is not zero-extended)", *_where(other))
        pairs.append((port, other))
        label = port.name if how == "by name" else f"{port.name}={other.name}"
        reasons.append(f"{port.direction} {label} ({port.width} bits, {how})")
    for port in ports_b.values():
        if port.name not in taken_b:
            raise BcdproveError(
                f"{port.direction} `{port.name}` of {b_name} has no counterpart in {a_name} "
                f"(its ports: {', '.join(ports_a)}); pair it with --map PORT={port.name}",
                *_where(port))
    return pairs, reasons


def _refuse_clocked(model: Model, which: str) -> None:
    if model.is_clocked:
        names = ", ".join(r.name for r in model.registers[:4])
        first = model.registers[0].loc
        raise BcdproveError(f"{which} `{model.top}` has registers ({names}); comparing clocked "
                            f"designs is not supported yet, only combinational ones",
                            *((first.file, first.line) if first else ()))


def build_equivalence(model_a: Model, model_b: Model,
                      mapping: Mapping[str, str] | None = None,
                      compared: Sequence[str] | None = None) -> EquivalenceProblem:
    """The check that ``model_a`` and ``model_b`` compute the same outputs.

    ``mapping`` pairs a port of A (key) with a port of B (value); other ports pair by name.
    ``compared`` (default: every output) names the outputs of A to compare; the others, and
    their partners, are left out (a clocked pair compares the outputs of one cycle).
    Raises BcdproveError for a clocked model, an unpaired port, or paired ports of different
    direction or width.  Neither model is changed: both cones are copied into a new graph.
    """
    _refuse_clocked(model_a, "design")
    _refuse_clocked(model_b, "--against design")
    pairs, reasons = _pair_ports(model_a, model_b, dict(mapping or {}), compared)
    if not any(a.direction == "output" for a, _ in pairs):
        raise BcdproveError(f"`{model_a.top}` has no outputs to compare")
    graph = Graph()
    inputs: list[InputPair] = []
    map_a: dict[int, Node] = {}
    map_b: dict[int, Node] = {}
    for port_a, port_b in pairs:
        if port_a.direction == "input":
            leaf = graph.input(port_a.name, port_a.width)
            map_a[port_a.node.id] = leaf
            map_b[port_b.node.id] = leaf
            inputs.append(InputPair(port_a.name, port_b.name, port_a.width, leaf,
                                    port_a.node, port_b.node))
    out_pairs = [(a, b) for a, b in pairs if a.direction == "output"]
    copy_a = transplant(graph, [a.node for a, _ in out_pairs], map_a)
    copy_b = transplant(graph, [b.node for _, b in out_pairs], map_b)
    outputs = [OutputPair(a.name, b.name, a.width, node_a, node_b)
               for (a, b), node_a, node_b in zip(out_pairs, copy_a.roots, copy_b.roots)]
    if copy_a.free_pairs or copy_b.free_pairs:
        reasons.append(f"unknown values (x, z, out-of-range selects): {len(copy_a.free_pairs)} in "
                       f"`{model_a.top}`, {len(copy_b.free_pairs)} in `{model_b.top}`, each free "
                       f"and independent")
    return EquivalenceProblem(model_a=model_a, model_b=model_b, graph=graph, inputs=inputs,
                              outputs=outputs, free_a=copy_a.free_pairs,
                              free_b=copy_b.free_pairs, reasons=reasons)

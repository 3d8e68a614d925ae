"""Random DAGs over every operator, with a record of how each was built.

The record (one :class:`Step` per node asked for) lets a test compute the meaning of the
DAG by its own reference code, independently of the graph's rewriting and of ``apply_op``.
"""
from __future__ import annotations

import random
from dataclasses import dataclass, field

from bcdprove.model.node import Graph, Node, Op

WORD_OPS = [Op.NOT, Op.AND, Op.OR, Op.XOR, Op.NEG, Op.ADD, Op.SUB, Op.MUL, Op.UDIV, Op.UREM,
            Op.SDIV, Op.SREM, Op.SHL, Op.LSHR, Op.ASHR, Op.EQ, Op.ULT, Op.SLT, Op.CONCAT,
            Op.EXTRACT, Op.ZEXT, Op.SEXT, Op.ITE]
HEAVY_OPS = frozenset({Op.MUL, Op.UDIV, Op.UREM, Op.SDIV, Op.SREM})


@dataclass
class Step:
    """Node ``index`` of the record: ``op`` applied to earlier steps ``args``."""

    op: str
    width: int
    args: tuple[int, ...] = ()
    params: tuple = ()


@dataclass
class RandomDag:
    graph: Graph
    steps: list[Step] = field(default_factory=list)
    nodes: list[Node] = field(default_factory=list)
    leaves: list[Node] = field(default_factory=list)   # INPUT and FREE leaves, in order made

    @property
    def free_leaves(self) -> list[Node]:
        return [n for n in self.leaves if n.op == Op.FREE]

    @property
    def input_leaves(self) -> list[Node]:
        return [n for n in self.leaves if n.op == Op.INPUT]


def random_dag(rng: random.Random, operations: int = 12, max_width: int = 130,
               heavy_width: int = 130, free_leaves: int = 0, leaf_count: int = 3) -> RandomDag:
    """A DAG of ``operations`` random operator applications over fresh leaves.

    Operands of multiply and divide are cut to ``heavy_width`` bits (their bit-level form
    grows with the square of the width).  Constants of random width and value are mixed
    in so that the graph's folding and rewriting rules get exercised.
    """
    dag = RandomDag(Graph())
    for k in range(leaf_count):
        _add_leaf(dag, Step(Op.INPUT, rng.randint(1, max_width), (), (f"in{k}",)))
    for _ in range(free_leaves):
        _add_leaf(dag, Step(Op.FREE, rng.randint(1, max_width), (), ("test",)))
    for _ in range(operations):
        op = rng.choice(WORD_OPS)
        _apply(dag, rng, op, max_width, heavy_width)
    return dag


def _add_leaf(dag: RandomDag, step: Step) -> int:
    g = dag.graph
    if step.op == Op.INPUT:
        node = g.input(step.params[0], step.width)
    elif step.op == Op.FREE:
        node = g.free(step.width, step.params[0])
    else:
        node = g.const(step.params[0], step.width)
    if step.op != Op.CONST:
        dag.leaves.append(node)
    return _record(dag, step, node)


def _record(dag: RandomDag, step: Step, node: Node) -> int:
    assert node.width == step.width, (step, node)
    dag.steps.append(step)
    dag.nodes.append(node)
    return len(dag.steps) - 1


def _pick(dag: RandomDag, rng: random.Random, max_width: int) -> int:
    # Now and then a constant, biased to the values that trigger rewrites.
    if rng.random() < 0.2:
        width = rng.randint(1, max_width)
        value = rng.choice([0, (1 << width) - 1, 1, rng.getrandbits(width)])
        return _add_leaf(dag, Step(Op.CONST, width, (), (value,)))
    # Recent nodes more often, so the DAG gets deep as well as wide.
    n = len(dag.steps)
    return max(0, n - 1 - int(rng.expovariate(0.3))) if rng.random() < 0.7 else rng.randrange(n)


def _resized(dag: RandomDag, rng: random.Random, index: int, width: int) -> int:
    """Step ``index`` brought to ``width`` bits by an extract, zext or sext step."""
    have = dag.steps[index].width
    g = dag.graph
    node = dag.nodes[index]
    if have == width:
        return index
    if have > width:
        lo = rng.randint(0, have - width)
        step = Step(Op.EXTRACT, width, (index,), (lo + width - 1, lo))
        return _record(dag, step, g.extract(node, lo + width - 1, lo))
    op = rng.choice([Op.ZEXT, Op.SEXT])
    return _record(dag, Step(op, width, (index,)), getattr(g, op)(node, width))


def _apply(dag: RandomDag, rng: random.Random, op: str, max_width: int, heavy_width: int) -> int:
    g = dag.graph
    a = _pick(dag, rng, max_width)
    width = dag.steps[a].width
    if op in HEAVY_OPS and width > heavy_width:
        width = rng.randint(1, heavy_width)
        a = _resized(dag, rng, a, width)
    if op == Op.NOT:
        return _record(dag, Step(op, width, (a,)), g.not_(dag.nodes[a]))
    if op == Op.NEG:
        return _record(dag, Step(op, width, (a,)), g.neg(dag.nodes[a]))
    if op in (Op.AND, Op.OR, Op.XOR, Op.ADD, Op.SUB, Op.MUL, Op.UDIV, Op.UREM, Op.SDIV,
              Op.SREM, Op.EQ, Op.ULT, Op.SLT):
        b = a if rng.random() < 0.1 else _resized(dag, rng, _pick(dag, rng, max_width), width)
        method = {Op.AND: "and_", Op.OR: "or_"}.get(op, op)
        node = getattr(g, method)(dag.nodes[a], dag.nodes[b])
        return _record(dag, Step(op, 1 if op in Op.COMPARE else width, (a, b)), node)
    if op in Op.SHIFTS:
        amount = _pick(dag, rng, max_width)
        if rng.random() < 0.5:
            # Small amounts matter most; make them likely.
            small = rng.randint(1, 8)
            amount = _resized(dag, rng, amount, small)
        return _record(dag, Step(op, width, (a, amount)),
                       getattr(g, op)(dag.nodes[a], dag.nodes[amount]))
    if op == Op.CONCAT:
        parts = [a] + [_pick(dag, rng, max_width) for _ in range(rng.randint(1, 3))]
        total = sum(dag.steps[p].width for p in parts)
        if total > 4 * max_width:
            parts = parts[:1]
            return a
        return _record(dag, Step(op, total, tuple(parts)), g.concat(*(dag.nodes[p] for p in parts)))
    if op == Op.EXTRACT:
        lo = rng.randint(0, width - 1)
        hi = rng.randint(lo, width - 1)
        return _record(dag, Step(op, hi - lo + 1, (a,), (hi, lo)), g.extract(dag.nodes[a], hi, lo))
    if op in (Op.ZEXT, Op.SEXT):
        new = rng.randint(width, width + 40)
        return _record(dag, Step(op, new, (a,)), getattr(g, op)(dag.nodes[a], new))
    if op == Op.ITE:
        condition = _resized(dag, rng, a, 1)
        then = _pick(dag, rng, max_width)
        other = _resized(dag, rng, _pick(dag, rng, max_width), dag.steps[then].width)
        return _record(dag, Step(op, dag.steps[then].width, (condition, then, other)),
                       g.ite(dag.nodes[condition], dag.nodes[then], dag.nodes[other]))
    raise AssertionError(op)


def reference_values(dag: RandomDag, leaf_values: dict[int, int]) -> list[int]:
    """Value of every step, from the record alone (``leaf_values``: leaf node id -> value).

    Written from the comments of :class:`Op` and from SMT-LIB, not from ``apply_op``.
    """
    out: list[int] = []
    for index, step in enumerate(dag.steps):
        w = step.width
        args = [out[i] for i in step.args]
        widths = [dag.steps[i].width for i in step.args]
        if step.op == Op.CONST:
            out.append(step.params[0])
        elif step.op in (Op.INPUT, Op.FREE):
            out.append(leaf_values[dag.nodes[index].id] % (1 << w))
        else:
            out.append(reference_op(step.op, w, step.params, args, widths))
    return out


def _signed(value: int, width: int) -> int:
    return value - (1 << width) if value >= 1 << (width - 1) else value


def reference_op(op: str, w: int, params: tuple, args: list[int], widths: list[int]) -> int:
    """One operator on unsigned ints, as the Op comments and SMT-LIB define it."""
    modulus = 1 << w
    if op == Op.NOT:
        return modulus - 1 - args[0]
    if op == Op.AND:
        return args[0] & args[1]
    if op == Op.OR:
        return args[0] | args[1]
    if op == Op.XOR:
        return args[0] ^ args[1]
    if op == Op.NEG:
        return (modulus - args[0]) % modulus
    if op == Op.ADD:
        return (args[0] + args[1]) % modulus
    if op == Op.SUB:
        return (args[0] + modulus - args[1]) % modulus
    if op == Op.MUL:
        return args[0] * args[1] % modulus
    a, b = args[0], args[1] if len(args) > 1 else None
    # Division by zero: SMT-LIB FixedSizeBitVectors theory (bvudiv gives all ones,
    # bvurem gives the dividend; bvsdiv/bvsrem are defined through them on magnitudes).
    if op == Op.UDIV:
        return modulus - 1 if b == 0 else a // b
    if op == Op.UREM:
        return a if b == 0 else a % b
    if op in (Op.SDIV, Op.SREM):
        sa, sb = _signed(a, w), _signed(b, w)
        if sb == 0:
            if op == Op.SREM:
                return a
            return modulus - 1 if sa >= 0 else 1
        # Truncating division: the quotient rounds toward zero.
        q = sa // sb if sa * sb >= 0 else -((-sa) // sb)
        if op == Op.SDIV:
            return q % modulus
        return (sa - sb * q) % modulus
    if op == Op.SHL:
        return a * 2 ** b % modulus if b < w else 0
    if op == Op.LSHR:
        return a // 2 ** b if b < w else 0
    if op == Op.ASHR:
        return (_signed(a, w) // 2 ** min(b, w)) % modulus
    if op == Op.EQ:
        return 1 if a == b else 0
    if op == Op.ULT:
        return 1 if a < b else 0
    if op == Op.SLT:
        return 1 if _signed(a, widths[0]) < _signed(b, widths[1]) else 0
    if op == Op.CONCAT:
        text = "".join(format(v, f"0{wd}b") for v, wd in zip(args, widths))
        return int(text, 2)
    if op == Op.EXTRACT:
        hi, lo = params
        text = format(a, f"0{widths[0]}b")[::-1]
        return int(text[lo:hi + 1][::-1], 2)
    if op == Op.ZEXT:
        return a
    if op == Op.SEXT:
        return _signed(a, widths[0]) % modulus
    if op == Op.ITE:
        return args[1] if a == 1 else args[2]
    raise AssertionError(op)

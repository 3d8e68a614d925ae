"""Mining at bit level: digits that no design word holds, assembled from single-bit signals.

A gate-level netlist keeps every digit of every stage in four separate 1-bit nets, so no
4-bit slice of any node matches a reference digit.  Here each bit of a still unmatched
reference digit is matched on its own against the 1-bit nodes of the output cone (or their
complements), and the four matches are joined into a new concatenation node of the model
graph.  The new node computes nothing new (it only groups existing signals), so the stage
engine's cut facts about it are facts about its bits; the cone builder and the fact
spreading follow concatenations and complements down to the nets themselves.

A reference bit that is 0 on every lane is taken as the constant 0 (the top digits of an
early stage are mostly small): a sparse plane would otherwise collide with every all-zero net.
The obligation over the candidate still has to prove that bit zero in every reachable
state, and a later stage that reads the real net proves it zero from the cut, so a wrong
guess costs a failed obligation, never a wrong proof.
"""
from __future__ import annotations

from typing import Callable

from ...model.node import Graph, Node, Op, mask

# Alternatives built per digit when a bit matches several nets (the rest are rarely needed).
_VARIANTS = 4
# Nets kept per bit (and as many complements): the newest, nearest the stage's output.
_NETS = 6


def bit_level_nodes(cone: list[Node]) -> list[Node]:
    """The 1-bit operator nodes of a cone (the nets of a gate-level netlist)."""
    return [n for n in cone if n.width == 1 and n.op not in Op.LEAVES]


def lowest_input_bits(cone: list[Node], x: Node) -> dict[int, int]:
    """Node id -> the lowest bit of ``x`` it reads (``x.width`` when none), for a cone in
    topological order.  A signal of stage ``s`` reads only the top ``s`` input bits, so a
    net that reads a lower one belongs to a later stage, whatever its value on the lanes
    (the top digit of a late stage can equal an early input bit on every stimulus)."""
    none = x.width
    lowest: dict[int, int] = {}
    for node in cone:
        if node is x:
            low = 0
        elif node.op == Op.EXTRACT and node.args[0] is x:
            low = node.params[1]
        elif node.op in Op.LEAVES:
            low = none
        else:
            low = min((lowest[a.id] for a in node.args), default=none)
        lowest[node.id] = low
    return lowest


def assemble(graph: Graph, wanted: list[tuple[int, int, tuple]], bits: list[Node],
             planes: dict[int, list[int]], unknown: dict[int, list[int]], lanes: int,
             names: dict[int, str], options: dict[tuple[int, int], list],
             lowest: dict[int, int], width: int) -> list[tuple[int, int, Node, str]]:
    """Candidates ``(stage, digit, node, name)`` for the reference digits ``wanted``
    (``(stage, digit, four planes)``), built from the simulated 1-bit ``bits``.

    New nodes get their value planes in ``planes`` (all known), so the engine's facts and
    zero tests read them like any simulated node; a net is only used for a stage whose
    input bits it reads (``lowest``: see :func:`lowest_input_bits`; ``width`` is the
    input's).  ``options[(stage, digit)]`` receives,
    per bit, every net ``(node, complemented)`` that matched it: the engine proves each
    one equal to the digit bit, so that whichever of them the next stage reads is cut."""
    full = mask(lanes)
    exact: dict[int, list[Node]] = {}
    for node in bits:
        if any(unknown.get(node.id, (1,))):
            continue
        exact.setdefault(planes[node.id][0], []).append(node)
    # Several nets can hold one bit's value (a cell's "5 or more" net and its carry out
    # agree on every valid digit).  The stage engine must pick the net the next stage reads,
    # or that stage's cone runs back past the cut.  Nodes are numbered as elaboration made
    # them, inputs before outputs, so the newest net is the one nearest the outputs: the
    # stage's own output, not a net of an earlier stage or inside a cell.
    for nets in exact.values():
        nets.sort(key=lambda n: (n.id not in names, -n.id))
    found = []
    for stage, digit, key in wanted:
        choices = []
        for plane in key:
            if plane == 0:
                choices.append([(graph.const(0, 1), "0")])
                continue
            floor = width - stage
            matches = [(n, names.get(n.id, f"n{n.id}")) for n in exact.get(plane, ())
                       if lowest[n.id] >= floor][:_NETS]
            matches += [(graph.not_(n), "~" + names.get(n.id, f"n{n.id}"))
                        for n in exact.get(~plane & full, ()) if lowest[n.id] >= floor][:_NETS]
            if not matches:
                break
            choices.append(matches)
        else:
            options[(stage, digit)] = [
                [(part.args[0], True) if part.op == Op.NOT else (part, False)
                 for part, _ in bit_options if part.op != Op.CONST]
                for bit_options in choices]
            for picks in _variants(choices):
                node = graph.concat(*[part for part, _ in reversed(picks)])
                if node.op == Op.CONST:
                    continue
                planes[node.id] = list(key)
                unknown[node.id] = [0, 0, 0, 0]
                label = "{" + ", ".join(name for _, name in reversed(picks)) + "}"
                found.append((stage, digit, node, label))
    return found


def _variants(choices: list[list]) -> list[list]:
    """The first option of every bit, then each bit's other options one at a time."""
    first = [options[0] for options in choices]
    variants = [first]
    for b, options in enumerate(choices):
        for other in options[1:]:
            if len(variants) >= _VARIANTS:
                return variants
            variants.append(first[:b] + [other] + first[b + 1:])
    return variants


def named_bits(signals, nesting: Callable[[str], int]) -> dict[int, str]:
    """Node id -> outermost name, for the model's 1-bit named signals."""
    best: dict[int, str] = {}
    for name, signal in signals.items():
        node = signal.node
        if node.width != 1 or node.op == Op.CONST:
            continue
        known = best.get(node.id)
        if known is None or nesting(name) < nesting(known):
            best[node.id] = name
    return best

"""The word-level model: a hash-consed DAG of bit-vector operations and the design around it."""
from .design import Model, Port, Register, Reset, Signal, SourceLocation
from .node import (Graph, Node, Op, apply_op, evaluate, leaves, mask, substitute, to_signed,
                   topological)

__all__ = [
    "Graph", "Node", "Op", "apply_op", "evaluate", "leaves", "mask", "substitute", "to_signed",
    "topological",
    "Model", "Port", "Register", "Reset", "Signal", "SourceLocation",
]

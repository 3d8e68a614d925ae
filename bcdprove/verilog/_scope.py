"""Names during elaboration: variables, nets, memories, parameters and the scopes holding them.

A :class:`Var` is one declared net or variable of one instance (or one element of a memory),
with its drivers.  A :class:`Scope` is a module instance or a generate block: it maps source
names to what they denote and knows its parent, so generate blocks see their module's names.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Callable, Optional

from ..model.design import SourceLocation
from ..model.node import Node


@dataclass
class Driver:
    """Bits ``lo..hi`` (model bit numbers) of a var, produced on demand by ``produce()``."""

    lo: int
    hi: int
    produce: Callable[[], Node]
    loc: Optional[SourceLocation]
    what: str                       # "continuous assignment", "always block", ...
    node: Optional[Node] = None
    computing: bool = False
    description: str = ""


@dataclass(eq=False)
class Var:
    """One net or variable (or memory element) of one instance, by hierarchical name."""

    name: str
    width: int
    signed: bool
    msb: int
    lsb: int
    kind: str                       # "net" | "variable" | "port" | "instance port"
    loc: Optional[SourceLocation]
    is_variable: bool = False       # reg/integer/logic assigned procedurally
    drivers: list[Driver] = field(default_factory=list)
    state: Optional[Node] = None    # set when the var is a register (assigned on a clock edge)
    fixed: Optional[Node] = None    # set for top-level inputs: the INPUT leaf
    init_node: Optional[Node] = None  # constant initial value (declaration or initial block)
    undriven: Optional[Node] = None
    node: Optional[Node] = None     # memoised full value
    direction: Optional[str] = None
    shared: Optional[Any] = None    # DesignError to raise if read outside its several blocks
    # drivers sorted by their lowest bit, with those bits (for bisection); see Resolver
    by_low: Optional[tuple[list, list]] = None

    def model_bit(self, index: int) -> int:
        """The model bit number (0 = least significant) of declared index ``index``."""
        return index - self.lsb if self.msb >= self.lsb else self.lsb - index

    def in_range(self, index: int) -> bool:
        return 0 <= self.model_bit(index) < self.width


@dataclass(eq=False)
class Memory:
    """An unpacked array: ``elements[k]`` is the element at address ``first + k``
    (``first`` is the lower address bound; clause 4.9 allows either order)."""

    name: str
    element_width: int
    signed: bool
    first: int
    elements: list[Var]
    loc: Optional[SourceLocation]


@dataclass(frozen=True)
class Parameter:
    """A parameter's final value: an integer (``value`` unsigned in ``width`` bits) or a real."""

    width: int
    signed: bool
    value: int = 0
    real: Optional[float] = None

    @property
    def integer(self) -> int:
        if self.signed and self.width and self.value >> (self.width - 1) & 1:
            return self.value - (1 << self.width)
        return self.value


@dataclass
class FunctionDef:
    """A function declaration and the scope it was declared in."""

    name: str
    ast: Any
    scope: "Scope"


class Scope:
    """A module instance or generate block; ``prefix`` starts every hierarchical name in it."""

    def __init__(self, prefix: str, parent: Optional["Scope"], module: Any, instance: "Any"):
        self.prefix = prefix
        self.parent = parent
        self.module = module            # the ModuleDef AST
        self.instance = instance        # the _Instance this scope belongs to
        self.names: dict[str, Any] = {}
        self.children: dict[str, "Scope"] = {}
        self.genblock_count = 0

    def lookup(self, name: str) -> Any:
        """What ``name`` denotes here or in an enclosing generate scope of the same module."""
        scope: Optional[Scope] = self
        while scope is not None:
            found = scope.names.get(name)
            if found is not None:
                return found
            scope = scope.parent
        return None

    def child(self, name: str) -> Optional["Scope"]:
        scope: Optional[Scope] = self
        while scope is not None:
            found = scope.children.get(name)
            if found is not None:
                return found
            scope = scope.parent
        return None

    def qualified(self, name: str) -> str:
        return f"{self.prefix}{name}"

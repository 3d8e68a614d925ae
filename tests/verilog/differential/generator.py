"""Random Verilog for differential testing of the reader against Icarus Verilog.

Everything is reproducible from a seed alone: :func:`generate_case` ``(seed, index, x_campaign)``
always gives the same :class:`Case`, and :func:`make_vectors` the same input vectors.

A case is one top module (plus the submodules it instantiates), kept as a *template* with
expression *sites*: the text of the case is the template with each site's expression tree
rendered into it.  Keeping the expressions as trees is what lets the harness shrink a failing
case (replace one subtree by one of its children) without knowing what the module does.

Main campaign cases never make Icarus print x: divisors are forced odd (``| 1``), selects stay
inside the declared range, a power with a possibly negative exponent has an odd base, and no
literal has x or z bits.  The x campaign drops those guards on purpose and adds x/z literals;
each case records whether it holds an x source (:attr:`Case.has_x_source`).
"""
from __future__ import annotations

import random
from dataclasses import dataclass, replace
from typing import Iterator, Sequence

MAX_WIDTH = 300          # wider intermediate results are cut back to a leaf
_MARK = "\x00"           # brackets a site number inside a template


# --------------------------------------------------------------------------- expressions
@dataclass(frozen=True)
class Expr:
    """An expression tree node.

    ``pieces`` interleave with ``children``: text is pieces[0] child0 pieces[1] child1 ...
    ``width``/``signed`` are the self-determined width and signedness (IEEE 1364-2005 clauses
    5.4.1 and 5.5.1) the generator tracks to pick in-range selects and shift amounts.
    ``frozen`` subtrees are never changed by shrinking (they guard a select index or an
    exponent).  ``unsized`` marks expressions Icarus calls "of indefinite width": an unsized
    number, or a context-determined operator over one (``a + 5``, ``c ? 5 : a``).  Clause
    5.1.14 forbids unsized numbers in a concatenation; Icarus extends that to such expressions,
    so they are kept out of concatenations.
    """

    pieces: tuple
    children: tuple = ()
    width: int = 1
    signed: bool = False
    kind: str = "op"             # "leaf", "op", "concat", "anchor" (see shrink_variants)
    frozen: bool = False
    x_source: bool = False
    unsized_rule: str = "any"    # leaf: "yes"/"no"; else "any" child, "first", "arms", "no"
    literal: bool = False        # a leaf that is a number
    # an operator whose result IEEE 1364-2005 makes wholly x when any operand bit is x
    # (arithmetic, relational, shift by a variable amount: clauses 5.1.5, 5.1.7, 5.1.12)
    word_x: bool = False

    @property
    def has_word_x(self) -> bool:
        return self.word_x or any(c.has_word_x for c in self.children)

    @property
    def constant(self) -> bool:
        """Built from numbers only (no identifier)."""
        return self.literal if not self.children else all(c.constant for c in self.children)

    @property
    def unsized(self) -> bool:
        rule = self.unsized_rule
        if rule in ("yes", "no"):
            return rule == "yes"
        if rule == "first":
            return self.children[0].unsized
        chosen = self.children[1:] if rule == "arms" else self.children
        return any(c.unsized for c in chosen)

    def render(self) -> str:
        out = [self.pieces[0]]
        for child, piece in zip(self.children, self.pieces[1:]):
            out.append(child.render())
            out.append(piece)
        return "".join(out)

    @property
    def size(self) -> int:
        return 1 + sum(c.size for c in self.children)

    @property
    def has_x(self) -> bool:
        return self.x_source or any(c.has_x for c in self.children)


def leaf(text: str, width: int, signed: bool = False, *, x_source: bool = False,
         unsized: bool = False, frozen: bool = False, literal: bool = False) -> Expr:
    return Expr((text,), (), width, signed, "leaf", frozen, x_source, "yes" if unsized else "no",
                literal)


def node(width: int, signed: bool, *parts, kind: str = "op", frozen: bool = False,
         x_source: bool = False, unsized: str = "any", word_x: bool = False) -> Expr:
    """Build a node from alternating text and Expr parts (text first and last).

    ``unsized`` is the rule of :attr:`Expr.unsized_rule`; "any" child suits context-determined
    operators.
    """
    pieces: list[str] = []
    children: list[Expr] = []
    pending = ""
    for part in parts:
        if isinstance(part, Expr):
            pieces.append(pending)
            children.append(part)
            pending = ""
        else:
            pending += part
    pieces.append(pending)
    return Expr(tuple(pieces), tuple(children), width, signed, kind, frozen, x_source, unsized,
                word_x=word_x)


def _valid(expr: Expr) -> bool:
    if expr.kind == "concat" and any(c.unsized for c in expr.children):
        return False
    return all(_valid(c) for c in expr.children)


_ZERO = leaf("1'b0", 1, literal=True)
_ONE = leaf("1'b1", 1, literal=True)


def shrink_variants(expr: Expr) -> Iterator[Expr]:
    """Every tree that differs from ``expr`` by replacing one unfrozen subtree.

    A subtree is replaced by one of its children or by a 1-bit literal; larger cuts come first.
    """
    if expr.frozen:
        return
    if expr.kind == "anchor":
        # an anchor keeps its last child (the signal that makes an always block run)
        for variant in shrink_variants(expr.children[0]):
            yield replace(expr, children=(variant,) + expr.children[1:])
        return
    for child in expr.children:
        yield child
    if expr.kind != "leaf" or expr.render() not in ("1'b0", "1'b1"):
        yield _ZERO
        yield _ONE
    for i, child in enumerate(expr.children):
        for variant in shrink_variants(child):
            children = expr.children[:i] + (variant,) + expr.children[i + 1:]
            candidate = replace(expr, children=children)
            if _valid(candidate):
                yield candidate


# --------------------------------------------------------------------------- operands
@dataclass(frozen=True)
class Operand:
    """A named value an expression may read: port, wire, reg, loop variable, parameter.

    ``msb``/``lsb`` are the declared range; ``selectable`` says whether selects may be taken.
    """

    name: str
    width: int
    signed: bool
    msb: int = 0
    lsb: int = 0
    selectable: bool = True
    unsized: bool = False

    @property
    def low(self) -> int:
        return min(self.msb, self.lsb)

    @property
    def high(self) -> int:
        return max(self.msb, self.lsb)

    @property
    def ascending(self) -> bool:
        return self.msb < self.lsb

    def declaration_range(self) -> str:
        return f"[{self.msb}:{self.lsb}]"


def declared(name: str, width: int, signed: bool, rng: random.Random, offset_ranges: bool) -> Operand:
    """An operand with a range [width-1:0], or (sometimes) shifted or ascending.

    A 1-bit operand is never signed: Icarus 11 reads a select of a 1-bit signed vector
    as signed when it is a procedural shift amount (regressions.py).
    """
    signed = signed and width > 1
    if offset_ranges and rng.random() < 0.35:
        lsb = rng.choice([1, 2, 3, 5, -2, -4])
        if rng.random() < 0.4:
            return Operand(name, width, signed, lsb, lsb + width - 1)
        return Operand(name, width, signed, lsb + width - 1, lsb)
    return Operand(name, width, signed, width - 1, 0)


# --------------------------------------------------------------------------- literals
def _literal(rng: random.Random, allow_x: bool) -> Expr:
    roll = rng.random()
    # Unsized numbers are written with their 32-bit size: Icarus 11 evaluates expressions
    # over unsized numbers without loss, wider than clause 5.4.1's 32 bits (regressions.py),
    # so it cannot referee them where a carry or a product passes bit 31
    if roll < 0.18:
        value = rng.choice([0, 1, 2, 3, 5, 7, 9, 10, 15, 16, 31, 100, 255, 1000, 65535, 2147483647])
        return leaf(f"32'sd{value}", 32, True, literal=True)
    if roll < 0.24:
        value = rng.randrange(1 << 32)
        base = rng.choice("hdob")
        return leaf(f"32'{base}{_digits(value, base)}", 32, False, literal=True)
    width = rng.choice([1, 2, 3, 4, 5, 7, 8, 9, 12, 16, 31, 32, 33, 63, 64, 65, 100, 128, 130])
    value = _interesting(rng, width)
    signed = rng.random() < 0.3
    base = rng.choice("hdob")
    if allow_x and rng.random() < 0.35 and base in "hob":
        text = _x_digits(rng, value, base, width)
        return leaf(f"{width}'{'s' if signed else ''}{base}{text}", width, signed, x_source=True,
                    literal=True)
    text = f"{width}'{'s' if signed else ''}{base}{_digits(value, base)}"
    if signed and base == "d" and rng.random() < 0.3:
        return node(width, True, "(-", leaf(text, width, True, literal=True), ")")
    return leaf(text, width, signed, literal=True)


def _digits(value: int, base: str) -> str:
    if base == "h":
        return format(value, "x")
    if base == "o":
        return format(value, "o")
    if base == "b":
        return format(value, "b")
    return str(value)


def _x_digits(rng: random.Random, value: int, base: str, width: int) -> str:
    digits = list(_digits(value, base))
    for i in range(len(digits)):
        if rng.random() < 0.3:
            digits[i] = rng.choice("xzXZ?") if base == "b" else rng.choice("xz")
    if "?" in digits or not any(d in "xzXZ?" for d in digits):
        digits[rng.randrange(len(digits))] = "x"
    return "".join(digits).replace("?", "z")


def _interesting(rng: random.Random, width: int) -> int:
    top = (1 << width) - 1
    roll = rng.random()
    if roll < 0.12:
        return 0
    if roll < 0.24:
        return top
    if roll < 0.34:
        return 1 << (width - 1)
    if roll < 0.42:
        return top >> 1
    if roll < 0.55:
        return rng.randrange(min(top, 16) + 1)
    return rng.randrange(top + 1)


# --------------------------------------------------------------------------- expression generator
_ARITH = ["+", "-", "*", "/", "%"]
_BITWISE = ["&", "|", "^", "~^", "^~"]
_COMPARE = ["<", "<=", ">", ">=", "==", "!=", "===", "!=="]
_LOGICAL = ["&&", "||"]
_SHIFTS = ["<<", ">>", "<<<", ">>>"]
_UNARY_SAME = ["-", "+", "~"]
_UNARY_BIT = ["!", "&", "~&", "|", "~|", "^", "~^", "^~"]


class ExpressionMaker:
    """Random expressions over a pool of operands.

    ``extras`` are leaves that may appear but not be selected from (a loop variable, a
    parameter).  With ``allow_x`` the guards that keep Icarus away from x are left off
    some of the time and x/z literals appear.  ``avoid`` holds tags of constructs to leave
    out (those that reach a known, open reader bug; see regressions.py):
    "unary-caret-tilde" (unary ``^~``), "free-in-amount" (``/``, ``%`` or a variable select inside
    a shift amount or a select index), "free-in-condition" (a ``?:`` condition holding a division
    or a variable select, which the reader models with a free value).
    """

    def __init__(self, rng: random.Random, operands: Sequence[Operand], allow_x: bool = False,
                 extras: Sequence[Expr] = (), narrow_division: bool = False,
                 avoid: frozenset = frozenset(), no_free: bool = False):
        self.rng = rng
        self.narrow_division = narrow_division
        self.avoid = avoid
        # no division, no variable select: nothing the reader guards with a free value
        self._no_free = no_free
        self.operands = list(operands)
        self.allow_x = allow_x
        self.extras = list(extras)

    # leaves ------------------------------------------------------------------
    def operand_leaf(self) -> Expr:
        rng = self.rng
        if self.extras and rng.random() < 0.2:
            return rng.choice(self.extras)
        if rng.random() < 0.15 or not self.operands:
            return _literal(rng, self.allow_x)
        op = rng.choice(self.operands)
        if not op.selectable or rng.random() < 0.55:
            return leaf(op.name, op.width, op.signed, unsized=op.unsized)
        return self.select(op)

    def select(self, op: Operand) -> Expr:
        """A bit, part or indexed part select of ``op``, in range unless x is allowed."""
        rng = self.rng
        roll = rng.random()
        if self.allow_x and rng.random() < 0.15:
            index = op.high + rng.randint(1, 4) if rng.random() < 0.7 else op.low - rng.randint(1, 3)
            return leaf(f"{op.name}[{index}]", 1, False, x_source=True)
        if roll < 0.3:
            return leaf(f"{op.name}[{rng.randint(op.low, op.high)}]", 1)
        if roll >= 0.75 and self._no_free:
            return leaf(op.name, op.width, op.signed)
        if roll < 0.55:
            a, b = sorted(rng.randint(op.low, op.high) for _ in range(2))
            text = f"{op.name}[{a}:{b}]" if op.ascending else f"{op.name}[{b}:{a}]"
            return leaf(text, b - a + 1)
        if roll < 0.75:
            width = rng.randint(1, op.width)
            if rng.random() < 0.5:
                base = rng.randint(op.low, op.high - width + 1)
                return leaf(f"{op.name}[{base} +: {width}]", width)
            base = rng.randint(op.low + width - 1, op.high)
            return leaf(f"{op.name}[{base} -: {width}]", width)
        return self.variable_select(op)

    def variable_select(self, op: Operand) -> Expr:
        rng = self.rng
        index_source = rng.choice(self.operands)
        source = leaf(index_source.name, index_source.width, index_source.signed)
        width = 1 if rng.random() < 0.5 else rng.randint(1, op.width)
        span = op.width - width + 1
        if self.allow_x and rng.random() < 0.4:
            index = node(32, False, "(", source, ")", frozen=True, x_source=True)
        elif "free-in-amount" in self.avoid or rng.random() < 0.3:
            # keep the low bits: the largest all-ones mask below span keeps the index in range
            keep = (1 << (span.bit_length() - 1)) - 1
            sign = "$signed" if op.low < 0 else ""
            index = node(32, op.low < 0, f"({sign}($unsigned(", source, f") & {keep}) + ({op.low}))",
                         frozen=True)
        elif op.low >= 0:
            index = node(32, False, "(($unsigned(", source, f") % {span}) + {op.low})", frozen=True)
        else:
            index = node(32, True, "($signed($unsigned(", source, f") % {span}) - {-op.low})",
                         frozen=True)
        if width == 1:
            return node(1, False, f"{op.name}[", index, "]", x_source=index.x_source)
        if rng.random() < 0.5:
            return node(width, False, f"{op.name}[", index, f" +: {width}]", x_source=index.x_source)
        # a -: select counts down from its base: move the index up by width-1
        shifted = replace(index, pieces=(index.pieces[0], index.pieces[1] + f" + {width - 1}"))
        return node(width, False, f"{op.name}[", shifted, f" -: {width}]", x_source=index.x_source)

    # composite ---------------------------------------------------------------------
    def expression(self, depth: int) -> Expr:
        expr = self._expression(depth)
        return expr if _valid(expr) else self.operand_leaf_sized()

    def operand_leaf_sized(self) -> Expr:
        for _ in range(20):
            e = self.operand_leaf()
            if not e.unsized:
                return e
        return leaf("1'b1", 1)

    def _expression(self, depth: int) -> Expr:
        rng = self.rng
        if depth <= 0 or rng.random() < 0.12:
            return self.operand_leaf()
        roll = rng.random()
        sub = lambda: self._expression(depth - 1)  # noqa: E731 - reads as "a subexpression"
        if roll < 0.30:
            return self._binary(rng.choice(_ARITH + _BITWISE), sub(), sub())
        if roll < 0.40:
            a, b = sub(), sub()
            op = rng.choice(_COMPARE + _LOGICAL)
            return node(1, False, "(", a, f" {op} ", b, ")", unsized="no", word_x=op[0] in "<>")
        if roll < 0.52:
            return self._shift(sub(), depth)
        if roll < 0.60:
            a = sub()
            op = rng.choice(_UNARY_SAME)
            if rng.random() < 0.5:
                return node(a.width, a.signed, f"({op}", a, ")", word_x=op == "-")
            choices = [u for u in _UNARY_BIT if not (u == "^~" and "unary-caret-tilde" in self.avoid)]
            return node(1, False, f"({rng.choice(choices)}", a, ")", unsized="no")
        if roll < 0.68:
            outer, self._no_free = self._no_free, self._no_free or "free-in-condition" in self.avoid
            try:
                c = sub()
            finally:
                self._no_free = outer
            a, b = sub(), sub()
            return node(max(a.width, b.width), a.signed and b.signed, "(", c, " ? ", a, " : ", b, ")",
                        unsized="arms")
        if roll < 0.78:
            parts = [self._sized(sub()) for _ in range(rng.randint(1, 3))]
            width = sum(p.width for p in parts)
            if rng.random() < 0.3:
                count = rng.randint(1, 4)
                return self._capped(node(width * count, False, f"{{{count}{{", *_join(parts), "}}",
                                         kind="concat", unsized="no"))
            return self._capped(node(width, False, "{", *_join(parts), "}", kind="concat", unsized="no"))
        if roll < 0.85:
            a = sub()
            if rng.random() < 0.5:
                return node(a.width, True, "$signed(", a, ")")
            return node(a.width, False, "$unsigned(", a, ")")
        if roll < 0.90:
            return self._power(sub())
        return self.operand_leaf()

    def _sized(self, expr: Expr) -> Expr:
        return self.operand_leaf_sized() if expr.unsized else expr

    def _capped(self, expr: Expr) -> Expr:
        return expr if expr.width <= MAX_WIDTH else self.operand_leaf_sized()

    def _binary(self, op: str, a: Expr, b: Expr) -> Expr:
        width, signed = max(a.width, b.width), a.signed and b.signed
        if op in ("/", "%") and self._no_free:
            op = "-"
        if op in ("/", "%") and self.narrow_division and width > 64:
            # Icarus 11's vvp can hang on some wide procedural divisions (e.g. a 130-bit
            # constant over a 74-bit all-ones value): keep them to the 64-bit code path
            op = "+"
        if op in ("/", "%"):
            if self.allow_x and self.rng.random() < 0.5:
                return node(width, signed, "(", a, f" {op} ", b, ")", x_source=True, word_x=True)
            # a divisor with bit 1 set is never zero, whatever width the context gives it, and
            # never 1: Icarus 11 divides a wide all-ones value by 1 wrongly (regressions.py)
            return node(width, signed, "(", a, f" {op} (", b, " | 2'b10))", word_x=True)
        return node(width, signed, "(", a, f" {op} ", b, ")", word_x=op in _ARITH)

    def _shift(self, a: Expr, depth: int) -> Expr:
        rng = self.rng
        op = rng.choice(_SHIFTS)
        if a.constant and a.unsized:
            # Icarus 11 evaluates unsized constant expressions without loss, wider than the
            # 32 bits of clause 5.4.1: 2147483647 <<< 225 is not 0 there (regressions.py)
            a = leaf(f"32'd{rng.randrange(1 << 32)}", 32, literal=True)
        if rng.random() < 0.5:
            amount = rng.choice([0, 1, 2, a.width - 1, a.width, a.width + 1, a.width + 7,
                                 rng.randint(0, a.width + 3), 64, 200])
            amount_text = str(max(amount, 0)) if rng.random() < 0.7 else f"{max(amount, 0).bit_length() + 1}'d{max(amount, 0)}"
            return node(a.width, a.signed, "(", a, f" {op} {amount_text})")
        outer, self._no_free = self._no_free, self._no_free or "free-in-amount" in self.avoid
        try:
            amount_expr = self._expression(min(depth - 1, 1))
        finally:
            self._no_free = outer
        if amount_expr.constant or amount_expr.unsized:
            # Icarus 11 shifts a bit at a time: a huge constant amount hangs it
            amount_expr = leaf(f"8'd{rng.randint(0, 255)}", 8, literal=True)
        # Braces change nothing for the standard (an amount is self-determined and read
        # unsigned, clause 5.1.12) but keep Icarus 11 from reading a select of a signed
        # vector as signed in a procedural shift (regressions.py)
        amount_expr = node(amount_expr.width, False, "{", amount_expr, "}", kind="concat",
                           unsized="no")
        return node(a.width, a.signed, "(", a, f" {op} ", amount_expr, ")", unsized="first",
                    word_x=True)

    def _power(self, base: Expr) -> Expr:
        rng = self.rng
        roll = rng.random()
        if roll < 0.4:
            exponent = leaf(str(rng.randint(0, 4)), 32, True, frozen=True, unsized=True)
            return node(base.width, base.signed, "(", base, " ** ", exponent, ")", unsized="first", word_x=True)
        narrow = [o for o in self.operands if o.selectable]
        if not narrow:
            exponent = leaf(f"2'd{rng.randint(0, 3)}", 2, False, frozen=True)
            return node(base.width, base.signed, "(", base, " ** ", exponent, ")", unsized="first", word_x=True)
        op = rng.choice(narrow)
        bits = min(op.width, 2)
        exponent = leaf(f"{op.name}[{op.low + bits - 1}:{op.low}]" if not op.ascending
                        else f"{op.name}[{op.low}:{op.low + bits - 1}]", bits, frozen=True)
        if True:
            # A signed exponent is left out: Icarus 11 reads $signed(2'b11) as -1 in some
            # contexts and as 3 in others (regressions.py), and a constant base with a
            # signed exponent crashes it (eval_tree.cc assertion)
            return node(base.width, base.signed, "(", base, " ** ", exponent, ")", unsized="first", word_x=True)
        signed_exponent = node(bits, True, "$signed(", exponent, ")", frozen=True)
        if self.allow_x and rng.random() < 0.5:
            # 0 ** negative is x (IEEE 1364-2005 table 5-6)
            return node(base.width, base.signed, "(", base, " ** ", signed_exponent, ")", x_source=True,
                        unsized="first", word_x=True)
        # a base with bit 1 set is neither 0 (0 ** -1 is x) nor 1: Icarus 11 gets 1 ** -1
        # wrong in contexts wider than 32 bits (regressions.py)
        return node(base.width, base.signed, "((", base, " | 2'b10) ** ", signed_exponent, ")",
                    unsized="first", word_x=True)


def _join(parts: Sequence[Expr]) -> list:
    out: list = []
    for i, p in enumerate(parts):
        if i:
            out.append(", ")
        out.append(p)
    return out


# --------------------------------------------------------------------------- cases
@dataclass(frozen=True)
class Port:
    name: str
    width: int
    signed: bool = False
    msb: int = 0
    lsb: int = 0

    def declaration(self, direction: str) -> str:
        kind = " signed" if self.signed else ""
        return f"{direction}{kind} [{self.msb}:{self.lsb}] {self.name}"


@dataclass(frozen=True)
class Case:
    """One generated top module (with its submodules) and how to drive it."""

    name: str
    template: str
    sites: tuple
    inputs: tuple
    outputs: tuple
    seed: str
    template_x: bool = False      # an x source written into the template itself
    template_word_x: bool = False  # arithmetic written into the template itself

    def text(self) -> str:
        pieces = self.template.split(_MARK)
        for i in range(1, len(pieces), 2):
            pieces[i] = self.sites[int(pieces[i])].render()
        return "".join(pieces)

    @property
    def has_x_source(self) -> bool:
        return self.template_x or any(s.has_x for s in self.sites)

    @property
    def has_word_x(self) -> bool:
        """Holds an operator whose result the standard makes wholly x on any x operand bit.

        Where such an operator meets an x, Icarus prints x for bits the model (x as an
        unknown 0/1 value) may know, e.g. the high bits of ``{4'b0, 4'bx} + 1``.
        """
        return self.template_word_x or any(s.has_word_x for s in self.sites)

    @property
    def size(self) -> int:
        return len(self.template) + sum(s.size for s in self.sites)

    def shrink_variants(self) -> Iterator["Case"]:
        for i, site in enumerate(self.sites):
            for variant in shrink_variants(site):
                yield replace(self, sites=self.sites[:i] + (variant,) + self.sites[i + 1:])

    def renamed(self, name: str) -> "Case":
        """The same case with its modules renamed (all names derive from the top's name)."""
        return replace(self, name=name, template=self.template.replace(self.name, name))


class _Builder:
    def __init__(self) -> None:
        self.lines: list[str] = []
        self.sites: list[Expr] = []
        self.template_x = False
        self.template_word_x = False

    def site(self, expr: Expr) -> str:
        self.sites.append(expr)
        return f"{_MARK}{len(self.sites) - 1}{_MARK}"

    def add(self, line: str) -> None:
        self.lines.append(line)


def generate_case(seed: int | str, index: int, x_campaign: bool = False,
                  avoid: frozenset = frozenset()) -> Case:
    """The ``index``-th case of campaign ``seed`` (a pure function of its arguments).

    ``avoid``: construct tags to leave out (see :class:`ExpressionMaker`).
    """
    case_seed = f"{seed}:{index}:{'x' if x_campaign else 'main'}"
    rng = random.Random(case_seed)
    # the trailing "c" keeps one case's name from being a prefix of another's (dut_m1c, dut_m10c)
    name = f"dut_{'x' if x_campaign else 'm'}{index}c"
    if rng.random() < 0.55:
        return _expression_case(rng, name, case_seed, x_campaign, avoid)
    from . import _modules
    return _modules.module_case(rng, name, case_seed, x_campaign, avoid)


def random_inputs(rng: random.Random, count: int, offset_ranges: bool = False) -> list[Operand]:
    widths = [1, 2, 3, 4, 5, 7, 8, 9, 13, 16, 17, 31, 32, 33, 48, 63, 64, 65, 100, 127, 128, 129, 130]
    return [declared(f"a{i}", rng.choice(widths) if rng.random() < 0.7 else rng.randint(1, 130),
                     rng.random() < 0.4, rng, offset_ranges) for i in range(count)]


def as_port(op: Operand) -> Port:
    return Port(op.name, op.width, op.signed, op.msb, op.lsb)


def target_width(rng: random.Random, self_width: int) -> int:
    """A target narrower or wider than the expression: where clause 5.4 context rules bite."""
    choice = rng.choice([1, self_width - 1, self_width, self_width + 1, self_width + rng.randint(2, 40),
                         rng.randint(1, 140), max(1, self_width // 2)])
    return max(1, min(choice, MAX_WIDTH + 40))


def _expression_case(rng: random.Random, name: str, case_seed: str, x_campaign: bool,
                     avoid: frozenset) -> Case:
    inputs = random_inputs(rng, rng.randint(1, 4))
    maker = ExpressionMaker(rng, inputs, allow_x=x_campaign, avoid=avoid)
    expr = maker.expression(rng.randint(2, 5))
    width = target_width(rng, expr.width)
    out = Port("y", width, rng.random() < 0.3, width - 1, 0)
    b = _Builder()
    ports = ", ".join([as_port(o).declaration("input") for o in inputs] + [out.declaration("output")])
    b.add(f"module {name}({ports});")
    b.add(f"  assign y = {b.site(expr)};")
    b.add("endmodule")
    return Case(name, "\n".join(b.lines) + "\n", tuple(b.sites), tuple(as_port(o) for o in inputs),
                (out,), case_seed)


# --------------------------------------------------------------------------- vectors
def make_vectors(case: Case, count: int) -> list[dict[str, int]]:
    """``count`` input vectors for ``case``: corner values (0, all ones, sign bit, ...) and random."""
    rng = random.Random(f"vectors:{case.seed}:{count}")
    vectors = []
    for i in range(count):
        vector = {}
        for port in case.inputs:
            if i == 0:
                vector[port.name] = 0
            elif i == 1:
                vector[port.name] = (1 << port.width) - 1
            else:
                vector[port.name] = _interesting(rng, port.width)
        vectors.append(vector)
    return vectors

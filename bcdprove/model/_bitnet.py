"""A bit-level netlist over lane planes, with folding, sharing and Python code generation.

A signal is a small int: :data:`FALSE` (0) and :data:`TRUE` (1) are the constant planes,
every other number names one gate.  The builder folds constants, shares structurally equal
gates and applies a few identities (``x & ~x == 0`` ...), each of which holds for every
value of its inputs, so a folded netlist computes exactly the function of the unfolded one.

:meth:`BitNetlist.compile` schedules the gates that some outputs need into a
:class:`Program` over reusable registers, interpreted at first and turned into one
straight-line Python function (exec'd once) when it is called often.
"""
from __future__ import annotations

import operator
from typing import Callable, Sequence

FALSE = 0
TRUE = 1

# Gate kinds.  Loads read plane ``bit`` of leaf ``leaf`` (value or unknown plane).
_LOAD = 0
_LOAD_UNKNOWN = 1
_NOT = 2
_AND = 3
_OR = 4
_XOR = 5
_MUX = 6


class BitNetlist:
    """Builder of bit gates; see the module docstring for the meaning of a signal."""

    def __init__(self) -> None:
        # Index = signal; entries 0 and 1 stand for the constants and are never emitted.
        self.kinds: list[int] = [-1, -1]
        self.first: list[int] = [0, 0]
        self.second: list[int] = [0, 0]
        self.third: list[int] = [0, 0]
        self._table: dict[tuple, int] = {}
        self._negation: dict[int, int] = {FALSE: TRUE, TRUE: FALSE}

    def __len__(self) -> int:
        return len(self.kinds) - 2

    def _gate(self, kind: int, a: int, b: int = 0, c: int = 0) -> int:
        key = (kind, a, b, c)
        signal = self._table.get(key)
        if signal is None:
            signal = len(self.kinds)
            self.kinds.append(kind)
            self.first.append(a)
            self.second.append(b)
            self.third.append(c)
            self._table[key] = signal
        return signal

    # leaves -----------------------------------------------------------------------
    def load(self, leaf: int, bit: int) -> int:
        """Value plane ``bit`` of leaf number ``leaf``."""
        return self._gate(_LOAD, leaf, bit)

    def load_unknown(self, leaf: int, bit: int) -> int:
        """Unknown plane ``bit`` of leaf number ``leaf`` (ternary programs only)."""
        return self._gate(_LOAD_UNKNOWN, leaf, bit)

    # gates ------------------------------------------------------------------------
    def not_(self, a: int) -> int:
        known = self._negation.get(a)
        if known is not None:
            return known
        signal = self._gate(_NOT, a)
        self._negation[a] = signal
        self._negation[signal] = a
        return signal

    def and_(self, a: int, b: int) -> int:
        if a == FALSE or b == FALSE:
            return FALSE
        if a == TRUE or a == b:
            return b
        if b == TRUE:
            return a
        if self._negation.get(a) == b:
            return FALSE
        if a > b:
            a, b = b, a
        return self._gate(_AND, a, b)

    def or_(self, a: int, b: int) -> int:
        if a == TRUE or b == TRUE:
            return TRUE
        if a == FALSE or a == b:
            return b
        if b == FALSE:
            return a
        if self._negation.get(a) == b:
            return TRUE
        if a > b:
            a, b = b, a
        return self._gate(_OR, a, b)

    def xor(self, a: int, b: int) -> int:
        if a == FALSE:
            return b
        if b == FALSE:
            return a
        if a == TRUE:
            return self.not_(b)
        if b == TRUE:
            return self.not_(a)
        if a == b:
            return FALSE
        if self._negation.get(a) == b:
            return TRUE
        # Pull inversions out so that x ^ ~y and ~x ^ y share one gate.
        if self.kinds[a] == _NOT:
            return self.not_(self.xor(self.first[a], b))
        if self.kinds[b] == _NOT:
            return self.not_(self.xor(a, self.first[b]))
        if a > b:
            a, b = b, a
        return self._gate(_XOR, a, b)

    def mux(self, condition: int, then: int, other: int) -> int:
        """``then`` where ``condition`` is 1, ``other`` where it is 0."""
        if condition == TRUE:
            return then
        if condition == FALSE or then == other:
            return other
        if self.kinds[condition] == _NOT:
            return self.mux(self.first[condition], other, then)
        if then == TRUE:
            return self.or_(condition, other)
        if then == FALSE:
            return self.and_(self.not_(condition), other)
        if other == FALSE:
            return self.and_(condition, then)
        if other == TRUE:
            return self.or_(self.not_(condition), then)
        if then == condition:
            return self.or_(condition, other)
        if other == condition:
            return self.and_(condition, then)
        if self._negation.get(then) == other:
            return self.xor(condition, other)
        return self._gate(_MUX, condition, then, other)

    def any_(self, bits: Sequence[int]) -> int:
        """OR of ``bits`` (FALSE for none), as a balanced tree."""
        bits = [b for b in bits if b != FALSE]
        if not bits:
            return FALSE
        while len(bits) > 1:
            paired = [self.or_(bits[i], bits[i + 1]) for i in range(0, len(bits) - 1, 2)]
            if len(bits) % 2:
                paired.append(bits[-1])
            bits = paired
        return bits[0]

    # ternary ------------------------------------------------------------------------
    def ternary(self, outputs: Sequence[int],
                leaf_modes: Sequence[str]) -> tuple["BitNetlist", list[int], list[int]]:
        """Dual-rail (value, unknown) form of this netlist for three-valued simulation.

        ``leaf_modes[k]`` says how leaf ``k`` is given: ``"known"`` (value planes only),
        ``"unknown"`` (not given: every bit unknown) or ``"masked"`` (value and unknown
        planes).  Returns the new netlist and, per output, its value and unknown signals.
        Every gate uses Kleene's three-valued rule, which never calls a bit known when
        some value of the unknown inputs changes it; value bits under unknown are 0.
        """
        net = BitNetlist()
        value: dict[int, int] = {FALSE: FALSE, TRUE: TRUE}
        unknown: dict[int, int] = {FALSE: FALSE, TRUE: FALSE}
        for signal in self._needed(outputs):
            kind, a = self.kinds[signal], self.first[signal]
            b, c = self.second[signal], self.third[signal]
            if kind >= _NOT and unknown[a] == FALSE and (
                    kind == _NOT or (unknown[b] == FALSE and (kind != _MUX or unknown[c] == FALSE))):
                # Every input known: the gate itself, known (what the rules below reduce to).
                if kind == _NOT:
                    v = net.not_(value[a])
                elif kind == _AND:
                    v = net.and_(value[a], value[b])
                elif kind == _OR:
                    v = net.or_(value[a], value[b])
                elif kind == _XOR:
                    v = net.xor(value[a], value[b])
                else:
                    v = net.mux(value[a], value[b], value[c])
                value[signal] = v
                unknown[signal] = FALSE
                continue
            if kind == _LOAD:
                mode = leaf_modes[a]
                if mode == "known":
                    v, u = net.load(a, b), FALSE
                elif mode == "unknown":
                    v, u = FALSE, TRUE
                else:
                    u = net.load_unknown(a, b)
                    v = net.and_(net.load(a, b), net.not_(u))
            elif kind == _NOT:
                u = unknown[a]
                v = net.not_(net.or_(value[a], u))
            elif kind == _AND:
                va, ua, vb, ub = value[a], unknown[a], value[b], unknown[b]
                v = net.and_(va, vb)
                u = net.and_(net.or_(ua, ub), net.and_(net.or_(va, ua), net.or_(vb, ub)))
            elif kind == _OR:
                va, ua, vb, ub = value[a], unknown[a], value[b], unknown[b]
                v = net.or_(va, vb)
                u = net.and_(net.or_(ua, ub), net.not_(v))
            elif kind == _XOR:
                u = net.or_(unknown[a], unknown[b])
                v = net.and_(net.xor(value[a], value[b]), net.not_(u))
            elif kind == _MUX:
                vc, uc = value[a], unknown[a]
                vt, ut, ve, ue = value[b], unknown[b], value[c], unknown[c]
                # Under an unknown condition the bit is known only if both arms agree.
                split = net.and_(uc, net.or_(net.or_(ut, ue), net.xor(vt, ve)))
                u = net.or_(split, net.mux(vc, ut, ue))
                v = net.and_(net.mux(vc, vt, ve), net.not_(split))
            else:
                raise AssertionError(f"gate kind {kind} in a two-valued netlist")
            value[signal] = v
            unknown[signal] = u
        return net, [value[o] for o in outputs], [unknown[o] for o in outputs]

    # code generation ---------------------------------------------------------------------
    def _needed(self, outputs: Sequence[int]) -> list[int]:
        """Gates in the cone of ``outputs``, in creation (hence topological) order."""
        mark = bytearray(len(self.kinds))
        stack = [o for o in outputs if o > TRUE]
        kinds, first, second, third = self.kinds, self.first, self.second, self.third
        while stack:
            signal = stack.pop()
            if mark[signal]:
                continue
            mark[signal] = 1
            kind = kinds[signal]
            if kind >= _NOT:
                stack.append(first[signal])
                if kind >= _AND:
                    stack.append(second[signal])
                    if kind == _MUX:
                        stack.append(third[signal])
        return [s for s in range(2, len(kinds)) if mark[s]]

    def compile(self, outputs: Sequence[int], name: str = "cone") -> "Program":
        """A :class:`Program` computing the planes of ``outputs``, in order."""
        return Program(self, outputs, name)


class Program:
    """The gates some outputs need, scheduled once; call it as ``program(M, P, U)``.

    ``M`` is the all-lanes mask, ``P[k][i]`` value plane ``i`` of leaf ``k`` and ``U[k][i]``
    its unknown plane (read by ternary programs only).  Input planes must have no bits
    above the lanes.  Returns the output planes as a list; constants come back as 0 or M.

    Values live in numbered registers (0 holds the zero plane, 1 the mask) that are reused
    as soon as a value is dead, so memory follows the widest live cut, not the gate count.
    The first calls interpret the schedule, which costs about a tenth of a microsecond
    per operation on top of the big-int work; a program called often is then turned into
    straight-line Python.  Its one-off compile costs about as much as 200 interpreted
    calls save (measured on a 7,000-gate converter), so compiling after that many calls
    never costs more than twice the better choice made in hindsight.
    """

    #: Calls interpreted before a program is compiled to Python source.
    COMPILE_AFTER = 200
    #: Larger programs are never compiled: one function that long takes seconds and much
    #: memory to compile, and their runs are dominated by big-int work anyway.
    COMPILE_LIMIT = 200_000

    def __init__(self, net: BitNetlist, outputs: Sequence[int], name: str):
        order = net._needed(outputs)
        kinds, first, second, third = net.kinds, net.first, net.second, net.third
        # Loads first: they only name planes that exist anyway, so holding them costs nothing.
        order = ([s for s in order if kinds[s] <= _LOAD_UNKNOWN]
                 + [s for s in order if kinds[s] > _LOAD_UNKNOWN])
        size = len(kinds)
        last = [-1] * size          # position of the last reader of each signal
        for index, signal in enumerate(order):
            kind = kinds[signal]
            if kind >= _NOT:
                last[first[signal]] = index
                if kind >= _AND:
                    last[second[signal]] = index
                    if kind == _MUX:
                        last[third[signal]] = index
        for o in outputs:
            last[o] = len(order)
        register = [0] * size
        register[TRUE] = 1
        free: list[int] = []
        count = 2
        self.loads: list[tuple[int, bool, int, int]] = []      # (register, unknown?, leaf, bit)
        self.steps: list[tuple[int, int, int, int, int]] = []  # (kind, register, a, b, c)
        for index, signal in enumerate(order):
            kind = kinds[signal]
            if kind <= _LOAD_UNKNOWN:
                target = free.pop() if free else count
                if target == count:
                    count += 1
                register[signal] = target
                self.loads.append((target, kind == _LOAD_UNKNOWN, first[signal], second[signal]))
                continue
            a = first[signal]
            b = second[signal] if kind >= _AND else FALSE
            c = third[signal] if kind == _MUX else FALSE
            ra, rb, rc = register[a], register[b], register[c]
            # Arguments read for the last time give their register back before the store.
            for arg in {a, b, c}:
                if arg > TRUE and last[arg] == index:
                    free.append(register[arg])
            target = free.pop() if free else count
            if target == count:
                count += 1
            register[signal] = target
            self.steps.append((kind, target, ra, rb, rc))
        self.registers = count
        self.outputs = [register[o] for o in outputs]
        self.name = name
        self.calls = 0
        self._compiled: Callable | None = None
        self._interpreted = self._interpreter_steps()

    def __len__(self) -> int:
        return len(self.loads) + len(self.steps)

    def __call__(self, M: int, P: Sequence[Sequence[int]], U: Sequence[Sequence[int]]) -> list[int]:
        if self._compiled is None:
            self.calls += 1
            if self.calls > self.COMPILE_AFTER and len(self) <= self.COMPILE_LIMIT:
                self._compiled = self._compile()
            else:
                return self._interpret(M, P, U)
        return self._compiled(M, P, U)

    def _interpreter_steps(self) -> list[tuple]:
        """The schedule as two-operand big-int operations; a mux uses scratch register."""
        xor, and_, or_ = operator.xor, operator.and_, operator.or_
        scratch = self.registers
        out = []
        for kind, target, a, b, c in self.steps:
            if kind == _NOT:
                out.append((xor, target, a, 1))
            elif kind == _AND:
                out.append((and_, target, a, b))
            elif kind == _OR:
                out.append((or_, target, a, b))
            elif kind == _XOR:
                out.append((xor, target, a, b))
            else:
                # else ^ (condition & (then ^ else)); every read precedes the store.
                out.append((xor, scratch, b, c))
                out.append((and_, scratch, a, scratch))
                out.append((xor, target, c, scratch))
        return out

    def _interpret(self, M: int, P, U) -> list[int]:
        registers = [0] * (self.registers + 1)
        registers[1] = M
        for target, unknown, leaf, bit in self.loads:
            registers[target] = (U if unknown else P)[leaf][bit]
        for operation, target, a, b in self._interpreted:
            registers[target] = operation(registers[a], registers[b])
        return [registers[r] for r in self.outputs]

    def _compile(self) -> Callable:
        def name(r: int) -> str:
            return "0" if r == 0 else "M" if r == 1 else f"r{r}"

        lines = [f"def {self.name}(M, P, U):"]
        for target, unknown, leaf, bit in self.loads:
            lines.append(f"    r{target} = {'U' if unknown else 'P'}[{leaf}][{bit}]")
        for kind, target, a, b, c in self.steps:
            if kind == _NOT:
                expression = f"{name(a)} ^ M"
            elif kind == _AND:
                expression = f"{name(a)} & {name(b)}"
            elif kind == _OR:
                expression = f"{name(a)} | {name(b)}"
            elif kind == _XOR:
                expression = f"{name(a)} ^ {name(b)}"
            else:
                expression = f"{name(c)} ^ ({name(a)} & ({name(b)} ^ {name(c)}))"
            lines.append(f"    r{target} = {expression}")
        lines.append("    return [" + ", ".join(name(r) for r in self.outputs) + "]")
        namespace: dict = {}
        exec(compile("\n".join(lines), f"<bcdprove {self.name}>", "exec"), namespace)
        return namespace[self.name]

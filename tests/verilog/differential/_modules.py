"""Random small modules: always blocks, loops, functions, generate, submodules.

Each module is made of *features*; each feature declares some internal values and drives
them, and every value ends up on an output port so the test bench sees it.  Every value
is assigned before it is read inside a block (no latches, no read of a stale value), loop
variables are private to one block (two blocks sharing one would retrigger each other),
and non-blocking assignments read only values from outside their block, so the settled
value a simulator shows is well defined.
"""
from __future__ import annotations

import random

from .generator import (Case, ExpressionMaker, Operand, Port, _Builder, as_port, declared, leaf,
                        node, random_inputs, target_width)

_FEATURES = ("always_if_case", "always_loop", "casez", "function", "generate_for",
             "generate_if", "submodule", "nonblocking", "concat_left", "wire_chain")


def module_case(rng: random.Random, name: str, case_seed: str, x_campaign: bool,
                avoid: frozenset = frozenset()) -> Case:
    inputs = random_inputs(rng, rng.randint(2, 4), offset_ranges=True)
    module = _Module(rng, name, inputs, x_campaign, avoid)
    for feature in rng.sample(_FEATURES, rng.randint(1, 3)):
        getattr(module, "_" + feature)()
    return module.finish(case_seed)


class _Module:
    def __init__(self, rng: random.Random, name: str, inputs: list[Operand], x_campaign: bool,
                 avoid: frozenset):
        self.rng = rng
        self.avoid = avoid
        # The open reader bugs with a free value in a shift amount, select index or ?:
        # condition also show when the value reaches there through a variable, which no
        # syntax rule can see: while they are open, module cases do without free values
        self._no_free = bool(avoid & {"free-in-amount", "free-in-condition"})
        self.name = name
        self.inputs = inputs
        self.x = x_campaign
        self.b = _Builder()
        self.pre: list[str] = []          # submodules, written before the top
        self.body: list[str] = []
        self.values: list[Operand] = []   # internal values, each becomes an output
        self.serial = 0

    # helpers -----------------------------------------------------------------------
    def fresh(self, stem: str) -> str:
        self.serial += 1
        return f"{stem}{self.serial}"

    def maker(self, pool=None, extras=()) -> ExpressionMaker:
        return ExpressionMaker(self.rng, pool if pool is not None else self.inputs + self.values,
                               allow_x=self.x, extras=extras, narrow_division=True,
                               avoid=self.avoid, no_free=self._no_free)

    def expr(self, depth=None, pool=None, extras=(), reads_signal=False) -> str:
        """A new expression site.

        ``reads_signal``: the expression must read a signal in a way no constant folding can
        remove, so that the ``always @*`` block it opens runs.  (Icarus 11 builds the implicit
        sensitivity list after folding: a block whose reads all fold away never runs and its
        variables stay x, although clause 9.7.5 puts every identifier read on the list.)
        """
        depth = self.rng.randint(1, 4) if depth is None else depth
        maker = self.maker(pool, extras)
        expr = maker.expression(depth)
        if reads_signal:
            signal = self.rng.choice(maker.operands)
            op = self.rng.choice("^+-")
            plain = leaf(signal.name, signal.width, signal.signed)
            expr = node(max(expr.width, plain.width), expr.signed and plain.signed,
                        "(", expr, f" {op} ", plain, ")", kind="anchor", word_x=op != "^")
        return self.b.site(expr)

    def port_argument(self) -> str:
        """A port connection in braces, so that it is self-determined and unsigned.

        Icarus 11 evaluates a port expression at its own width, not the port's as clause
        12.3.11 says, and ignores $unsigned there (regressions.py): only a connection whose
        meaning does not depend on either can be refereed by it.
        """
        maker = self.maker(self.inputs)
        expr = maker.expression(2)
        if expr.unsized:
            expr = maker.operand_leaf_sized()
        return self.b.site(node(expr.width, False, "{", expr, "}", kind="concat", unsized="no"))

    def new_value(self, stem: str, kind: str, width: int | None = None) -> Operand:
        rng = self.rng
        width = width or rng.choice([1, 3, 4, 7, 8, 12, 16, 33, 64, rng.randint(1, 100)])
        op = declared(self.fresh(stem), width, rng.random() < 0.3, rng, offset_ranges=True)
        sign = " signed" if op.signed else ""
        self.body.append(f"  {kind}{sign} {op.declaration_range()} {op.name};")
        return op

    def selector(self, bits: int) -> str:
        """A ``bits``-wide select of an input, for case selectors."""
        wide = [o for o in self.inputs if o.width >= bits]
        if not wide:
            return self.b.site(self.maker(self.inputs).operand_leaf_sized())
        op = self.rng.choice(wide)
        low = self.rng.randint(op.low, op.high - bits + 1)
        if op.ascending:
            return f"{op.name}[{low}:{low + bits - 1}]"
        return f"{op.name}[{low + bits - 1}:{low}]"

    # features ---------------------------------------------------------------------
    def _always_if_case(self) -> None:
        rng = self.rng
        regs = [self.new_value("r", "reg") for _ in range(rng.randint(1, 3))]
        lines = ["  always @* begin"]
        for r in regs:           # every reg gets a value first, read only inputs
            lines.append(f"    {r.name} = {self.expr(pool=self.inputs, reads_signal=True)};")
        pool = self.inputs + regs
        target = lambda: rng.choice(regs).name  # noqa: E731
        lines.append(f"    if ({self.expr(2, pool)}) {target()} = {self.expr(pool=pool)};")
        lines.append(f"    else begin {target()} = {self.expr(pool=pool)}; end")
        bits = rng.randint(1, 3)
        lines.append(f"    case ({self.selector(bits)})")
        for value in rng.sample(range(1 << bits), min(1 << bits, rng.randint(1, 3))):
            lines.append(f"      {bits}'d{value}: {target()} = {self.expr(pool=pool)};")
        if rng.random() < 0.6:
            if self.x and rng.random() < 0.5:
                r = rng.choice(regs)
                lines.append(f"      default: {r.name} = {r.width}'bx;")
                self.b.template_x = True
            else:
                lines.append(f"      default: {target()} = {self.expr(pool=pool)};")
        lines.append("    endcase")
        lines.append("  end")
        self.body.extend(lines)
        self.values.extend(regs)

    def _casez(self) -> None:
        rng = self.rng
        r = self.new_value("z", "reg")
        bits = rng.randint(2, 4)
        lines = ["  always @* begin", f"    {r.name} = {self.expr(pool=self.inputs, reads_signal=True)};",
                 f"    casez ({self.selector(bits)})"]
        for _ in range(rng.randint(1, 4)):
            pattern = "".join(rng.choice("01??") for _ in range(bits))
            lines.append(f"      {bits}'b{pattern}: {r.name} = {self.expr(pool=self.inputs + [r])};")
        lines += ["      default: ;", "    endcase", "  end"]
        self.body.extend(lines)
        self.values.append(r)

    def _always_loop(self) -> None:
        rng = self.rng
        acc = self.new_value("acc", "reg")
        loop = self.fresh("i")
        self.body.append(f"  integer {loop};")
        count = rng.randint(1, 9)
        extras = [leaf(loop, 32, True)]
        bit_sources = [o for o in self.inputs if o.low == 0 and not o.ascending and o.width >= count]
        if bit_sources:
            src = rng.choice(bit_sources)
            extras.append(leaf(f"{src.name}[{loop}]", 1))
        pool = self.inputs + [acc]
        lines = ["  always @* begin", f"    {acc.name} = {self.expr(pool=self.inputs, reads_signal=True)};",
                 f"    for ({loop} = 0; {loop} < {count}; {loop} = {loop} + 1) begin"]
        roll = rng.random()
        if roll < 0.4:
            lines.append(f"      {acc.name} = {acc.name} + {self.expr(2, pool, extras)};")
            self.b.template_word_x = True
        elif roll < 0.7 and acc.low == 0 and not acc.ascending and acc.width >= count:
            lines.append(f"      {acc.name}[{loop}] = {self.expr(2, pool, extras)};")
        else:
            lines.append(f"      if ({self.expr(2, pool, extras)}) {acc.name} = {self.expr(3, pool, extras)};")
        lines += ["    end", "  end"]
        self.body.extend(lines)
        self.values.append(acc)

    def _function(self) -> None:
        rng = self.rng
        fname = self.fresh("f")
        width = rng.choice([1, 4, 8, 13, 32, 40, rng.randint(1, 90)])
        params = [declared(self.fresh("p"), rng.choice([1, 3, 8, 16, 33, rng.randint(1, 70)]),
                           rng.random() < 0.4, rng, offset_ranges=False) for _ in range(rng.randint(1, 3))]
        sign = " signed" if rng.random() < 0.3 else ""
        loop = self.fresh("k")
        lines = [f"  function{sign} [{width - 1}:0] {fname};"]
        for p in params:
            lines.append(f"    input{' signed' if p.signed else ''} {p.declaration_range()} {p.name};")
        lines.append(f"    integer {loop};")
        lines.append("    begin")
        lines.append(f"      {fname} = {self.expr(3, params)};")
        if rng.random() < 0.5:
            extras = [leaf(loop, 32, True)]
            lines.append(f"      for ({loop} = 0; {loop} < {rng.randint(1, 5)}; {loop} = {loop} + 1)")
            lines.append(f"        {fname} = {fname} ^ {self.expr(2, params, extras)};")
        lines += ["    end", "  endfunction"]
        self.body.extend(lines)
        out = self.new_value("fo", "wire", target_width(rng, width))
        args = ", ".join(self.expr(2, self.inputs) for _ in params)
        self.body.append(f"  assign {out.name} = {fname}({args});")
        self.values.append(out)

    def _generate_for(self) -> None:
        rng = self.rng
        gen = self.fresh("g")
        count = rng.randint(1, 6)
        slice_width = rng.randint(1, 4)
        out = self.new_value("gw", "wire", count * slice_width)
        # the genvar itself is only used as an index: Icarus 11 widens arithmetic on it
        # without loss, past the 32 bits of an integer (regressions.py)
        extras = []
        sources = [o for o in self.inputs if o.low == 0 and not o.ascending and o.width >= count]
        if sources:
            extras.append(leaf(f"{rng.choice(sources).name}[{gen}]", 1))
        else:
            extras.append(leaf(f"{self.inputs[0].name}[{self.inputs[0].lsb}]", 1))
        base = f"{gen} * {slice_width}" if out.low == 0 else f"{gen} * {slice_width} + {out.low}"
        lines = [f"  genvar {gen};", "  generate",
                 f"    for ({gen} = 0; {gen} < {count}; {gen} = {gen} + 1) begin : blk{gen}"]
        if rng.random() < 0.4:
            lines.append(f"      if ({gen} % 2 == 0) begin : even")
            lines.append(f"        assign {out.name}[{base} +: {slice_width}] = {self.expr(2, self.inputs, extras)};")
            lines.append("      end else begin : odd")
            lines.append(f"        assign {out.name}[{base} +: {slice_width}] = {self.expr(2, self.inputs, extras)};")
            lines.append("      end")
        else:
            lines.append(f"      wire [{slice_width - 1}:0] t;")
            lines.append(f"      assign t = {self.expr(3, self.inputs, extras)};")
            lines.append(f"      assign {out.name}[{base} +: {slice_width}] = t;")
        lines += ["    end", "  endgenerate"]
        self.body.extend(lines)
        self.values.append(out)

    def _generate_if(self) -> None:
        rng = self.rng
        param = self.fresh("P")
        value = rng.randint(0, 7)
        self.body.append(f"  localparam {param} = {value};")
        out = self.new_value("gi", "wire")
        extras = [leaf(param, 32, True)]
        self.body += ["  generate", f"    if ({param} > 3) begin : big{param}",
                      f"      assign {out.name} = {self.expr(3, None, extras)};",
                      f"    end else begin : small{param}",
                      f"      assign {out.name} = {self.expr(3, None, extras)};",
                      "    end", "  endgenerate"]
        self.values.append(out)

    def _submodule(self) -> None:
        rng = self.rng
        sub = f"{self.name}_sub{self.serial}"
        self.serial += 1
        widths = [rng.randint(1, 40) for _ in range(2)]
        x_port = Operand("x", min(widths), False, selectable=False)
        z_port = Operand("z", 6, True, 5, 0)
        k = leaf("K", 32, True)
        self.pre += [f"module {sub} #(parameter W = 8, parameter K = 1) "
                     f"(input [W-1:0] x, input signed [5:0] z, output [W-1:0] q);",
                     f"  assign q = {self.expr(3, [x_port, z_port], [k])};",
                     "endmodule"]
        for n, w in enumerate(widths):
            out = self.new_value("sq", "wire", w)
            k_value = rng.choice(["0", "1", "3", "-2", "4'd9", "3'sd3", "7"])
            x_arg, z_arg = self.port_argument(), self.port_argument()
            inst = f"u{self.serial}_{n}"
            if rng.random() < 0.5:
                self.body.append(f"  {sub} #(.W({w}), .K({k_value})) {inst} (.x({x_arg}), .z({z_arg}), .q({out.name}));")
            else:
                self.body.append(f"  {sub} #({w}, {k_value}) {inst} ({x_arg}, {z_arg}, {out.name});")
            self.values.append(out)

    def _nonblocking(self) -> None:
        rng = self.rng
        regs = [self.new_value("n", "reg") for _ in range(rng.randint(1, 2))]
        outside = self.inputs + [v for v in self.values]
        lines = ["  always @* begin"]
        for r in regs:
            lines.append(f"    {r.name} <= {self.expr(pool=outside, reads_signal=True)};")
        if rng.random() < 0.5:
            r = rng.choice(regs)
            lines.append(f"    if ({self.expr(2, outside)}) {r.name} <= {self.expr(pool=outside)};")
        lines.append("  end")
        self.body.extend(lines)
        self.values.extend(regs)

    def _concat_left(self) -> None:
        rng = self.rng
        parts = [self.new_value("c", "wire", rng.randint(1, 20)) for _ in range(rng.randint(2, 3))]
        left = ", ".join(p.name for p in parts)
        self.body.append(f"  assign {{{left}}} = {self.expr()};")
        self.values.extend(parts)
        if rng.random() < 0.5:
            regs = [self.new_value("cr", "reg", rng.randint(1, 20)) for _ in range(2)]
            self.body += ["  always @* begin",
                          f"    {{{regs[0].name}, {regs[1].name}}} = {self.expr(pool=self.inputs, reads_signal=True)};",
                          f"    {regs[1].name} = {regs[1].name} ^ {self.expr(2, self.inputs + regs[:1])};",
                          "  end"]
            self.values.extend(regs)

    def _wire_chain(self) -> None:
        first = self.new_value("w", "wire")
        self.body.append(f"  assign {first.name} = {self.expr()};")
        self.values.append(first)
        second = self.new_value("w", "wire")
        self.body.append(f"  assign {second.name} = {self.expr()};")
        self.values.append(second)

    # assembly ---------------------------------------------------------------------
    def finish(self, case_seed: str) -> Case:
        outputs = []
        for value in self.values:
            port = Port("o_" + value.name, value.width, value.signed, value.width - 1, 0)
            outputs.append(port)
            self.body.append(f"  assign {port.name} = {value.name};")
        ports = [as_port(o).declaration("input") for o in self.inputs]
        ports += [p.declaration("output") for p in outputs]
        text = self.pre + [f"module {self.name}({', '.join(ports)});"] + self.body + ["endmodule"]
        if any(" if (" in line or " case" in line for line in self.body):
            # a simulator takes the else branch (or no case item) on an x condition, where
            # the model, reading x as some 0/1 value, may know which branch every value takes
            self.b.template_word_x = True
        return Case(self.name, "\n".join(text) + "\n", tuple(self.b.sites),
                    tuple(as_port(o) for o in self.inputs), tuple(outputs), case_seed,
                    self.b.template_x, self.b.template_word_x)

"""Converter models built by hand with Graph, so spec and engine tests need no Verilog reader.

Each builder returns a Model and, where the tests replay in Icarus, the matching Verilog text
(written here independently of the model, so Icarus is a real referee).
"""
from __future__ import annotations

from bcdprove.model.design import Model, Port
from bcdprove.model.node import Graph, Node


def shift_add3_digits(graph: Graph, x: Node, digit_count: int, threshold: int = 5,
                      correction: int = 3) -> list[Node]:
    """Shift-and-add-3 over ``x``; digits least significant first.

    The correct converter adds 3 to a digit of at least 5 before every shift (common
    practice); other ``threshold``/``correction`` values make deliberately wrong converters.
    """
    digits = [graph.zero(4) for _ in range(digit_count)]
    for bit in range(x.width - 1, -1, -1):
        fixed = []
        for d in digits:
            big = graph.not_(graph.ult(d, graph.const(threshold, 4)))
            fixed.append(graph.ite(big, graph.add(d, graph.const(correction, 4)), d))
        carry = graph.extract(x, bit, bit)
        shifted = []
        for d in fixed:
            shifted.append(graph.concat(graph.extract(d, 2, 0), carry))
            carry = graph.extract(d, 3, 3)
        digits = shifted
    return digits


def packed_converter(width: int, digit_count: int, out_width: int | None = None,
                     threshold: int = 5, enable: bool = False, free_default: bool = False,
                     top: str = "conv") -> Model:
    """``bin`` (width bits) -> ``bcd`` (out_width bits, default 4 * digit_count), LSD low.

    ``enable``: an extra 1-bit input ``en``; the output is zero when ``en`` is 0.
    ``free_default``: digit 0 is replaced by an unknown value when it would be 9 (a
    ``default: q = 4'bx`` style hole).
    """
    graph = Graph()
    x = graph.input("bin", width)
    digits = shift_add3_digits(graph, x, digit_count, threshold)
    ports = [Port("bin", "input", width, False, x, msb=width - 1)]
    if free_default:
        hole = graph.free(4, "x in a case default")
        digits[0] = graph.ite(graph.eq(digits[0], graph.const(9, 4)), hole, digits[0])
    word = graph.concat(*reversed(digits))
    out_width = out_width or 4 * digit_count
    word = graph.resize(word, out_width)
    if enable:
        en = graph.input("en", 1)
        ports.append(Port("en", "input", 1, False, en))
        word = graph.ite(en, word, graph.zero(out_width))
    ports.append(Port("bcd", "output", out_width, False, word, msb=out_width - 1))
    return Model(graph=graph, top=top, files=["<hand-built>"], ports=ports)


def split_converter(width: int, names: list[str], top_width: int = 4) -> Model:
    """``bin`` -> one output port per digit named ``names`` (least significant first)."""
    graph = Graph()
    x = graph.input("bin", width)
    digits = shift_add3_digits(graph, x, len(names))
    ports = [Port("bin", "input", width, False, x)]
    for i, (name, d) in enumerate(zip(names, digits)):
        w = top_width if i == len(names) - 1 else 4
        ports.append(Port(name, "output", w, False, graph.resize(d, w)))
    return Model(graph=graph, top="split", files=["<hand-built>"], ports=ports)


def packed_verilog(width: int, digit_count: int, out_width: int | None = None,
                   threshold: int = 5, enable: bool = False, free_default: bool = False,
                   top: str = "conv") -> str:
    """Verilog-2005 text of :func:`packed_converter`."""
    out_width = out_width or 4 * digit_count
    hole = ""
    if free_default:
        # an x where the ones digit would be 9, like a case table with a 4'bx default
        hole = "\n    if (work[3:0] == 4'd9) work[3:0] = 4'bxxxx;"
    en_port = ", input en" if enable else ""
    result = "en ? work[%d:0] : %d'd0" % (out_width - 1, out_width) if enable \
        else "work[%d:0]" % (out_width - 1)
    return f"""
module {top}(input [{width - 1}:0] bin{en_port}, output [{out_width - 1}:0] bcd);
  reg [{4 * digit_count - 1}:0] work;
  integer i, j;
  always @* begin
    work = 0;
    for (i = {width - 1}; i >= 0; i = i - 1) begin
      for (j = 0; j < {digit_count}; j = j + 1)
        if (work[4*j +: 4] >= {threshold}) work[4*j +: 4] = work[4*j +: 4] + 4'd3;
      work = {{work[{4 * digit_count - 2}:0], bin[i]}};
    end{hole}
  end
  assign bcd = {result};
endmodule
"""

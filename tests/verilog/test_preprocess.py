"""The preprocessor, directive by directive (IEEE Std 1364-2005 clause 19).

Clause numbers are those of IEEE 1364-2005 (recalled from memory: 19.1 `celldefine,
19.2 `default_nettype, 19.3 `define / `undef, 19.4 `ifdef family, 19.5 `include,
19.6 `resetall, 19.8 `timescale; 3.3 comments).  Where a behaviour can be observed in a
simulator, the last tests run Icarus Verilog on the original files and on our output and
compare what the designs print.
"""
from __future__ import annotations

import pytest

from bcdprove.errors import BcdproveError, UnsupportedConstruct
from bcdprove.verilog.preprocess import MAX_INCLUDE_DEPTH, preprocess
from tests.support.icarus import run_icarus


def _write(folder, name: str, text: str | bytes) -> str:
    path = folder / name
    path.parent.mkdir(parents=True, exist_ok=True)
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8")
    return str(path)


def _lines(pre) -> list[str]:
    return pre.text.split("\n")[:-1]


def _squash(text: str) -> str:
    return " ".join(text.split())


# -- comments (clause 3.3) -------------------------------------------------------------------
def test_comments_become_blanks_and_keep_every_newline(tmp_path):
    source = "a // line comment\nb /* block\n   comment */ c\nd\n"
    pre = preprocess([_write(tmp_path, "c.v", source)])
    lines = _lines(pre)
    assert len(lines) == 4                       # one text line per original line
    assert [_squash(line) for line in lines] == ["a", "b", "c", "d"]


def test_utf8_comments_are_read(tmp_path):
    source = "// Zählerstand → BCD, ½ Ω\nmodule m; endmodule\n"
    pre = preprocess([_write(tmp_path, "u.v", source)])
    assert _squash(pre.text) == "module m; endmodule"


def test_comment_markers_inside_strings_are_text(tmp_path):
    # Clause 3.3: comments do not start inside string literals (common practice too).
    source = 'initial $display("a // b /* c");\n'
    pre = preprocess([_write(tmp_path, "s.v", source)])
    assert '"a // b /* c"' in pre.text


def test_unterminated_block_comment_names_file_and_line(tmp_path):
    path = _write(tmp_path, "open.v", "module m;\n\n/* never closed\nendmodule\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert (caught.value.file, caught.value.line) == (path, 3)
    assert "comment" in caught.value.message


def test_invalid_utf8_is_an_error_with_its_line(tmp_path):
    path = _write(tmp_path, "bad.v", b"module m;\n// \xff\xfe\nendmodule\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert (caught.value.file, caught.value.line) == (path, 2)


def test_missing_top_file_is_an_error_naming_it(tmp_path):
    path = str(tmp_path / "absent.v")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert caught.value.file == path


def test_a_folder_given_as_top_file_is_an_error_naming_it(tmp_path):
    with pytest.raises(BcdproveError) as caught:
        preprocess([str(tmp_path)])
    assert caught.value.file == str(tmp_path)


# -- `define and macro use (clause 19.3.1) ----------------------------------------------------
def test_object_like_macro_is_replaced_by_its_text(tmp_path):
    pre = preprocess([_write(tmp_path, "d.v", "`define WIDTH 8\nwire [`WIDTH-1:0] w;\n")])
    assert _lines(pre)[1] == "wire [8-1:0] w;"
    assert _lines(pre)[0].strip() == ""          # the definition itself leaves a blank line


def test_macro_pasted_before_a_base_keeps_one_number(tmp_path):
    # `W'd5 must read as the sized literal 8'd5 (clause 3.5.1), so no blanks are added.
    pre = preprocess([_write(tmp_path, "n.v", "`define W 8\nx = `W'd5;\n")])
    assert "8'd5" in pre.text


def test_arguments_are_substituted_as_whole_identifiers(tmp_path):
    source = "`define ADD(a, b) (a + b + ab + a_1)\ny = `ADD(p, q);\n"
    pre = preprocess([_write(tmp_path, "a.v", source)])
    assert _squash(_lines(pre)[1]) == "y = (p + q + ab + a_1);"


def test_arguments_are_not_substituted_inside_strings(tmp_path):
    # Clause 19.3.1: macro text inside string literals is not substituted (recalled).
    source = '`define SHOW(v) $display("v=%d", v)\n`SHOW(count);\n'
    pre = preprocess([_write(tmp_path, "s.v", source)])
    assert '$display("v=%d", count)' in pre.text


def test_argument_with_commas_inside_parentheses_and_braces(tmp_path):
    source = "`define PICK(x, y) y\nz = `PICK(f(a, b), {c, d});\n"
    pre = preprocess([_write(tmp_path, "p.v", source)])
    assert _squash(_lines(pre)[1]) == "z = {c, d};"


def test_macros_are_not_expanded_inside_strings(tmp_path):
    source = '`define W 8\ninitial $display("`W wide");\n'
    pre = preprocess([_write(tmp_path, "q.v", source)])
    assert '"`W wide"' in pre.text


def test_multi_line_body_expands_on_the_line_of_use(tmp_path):
    source = ("`define SUM(a, b) ((a) + \\\n"
              "                   (b))\n"
              "assign y = `SUM(x, 1);\n"
              "assign z = 0;\n")
    path = _write(tmp_path, "m.v", source)
    pre = preprocess([path])
    lines = _lines(pre)
    assert _squash(lines[2]) == "assign y = ((x) + (1));"
    assert pre.origin(3) == (path, 3)
    assert pre.origin(4) == (path, 4) and lines[3] == "assign z = 0;"


def test_arguments_spread_over_lines_keep_the_line_map(tmp_path):
    source = "`define PAIR(a, b) {a, b}\nq = `PAIR(x,\n  y);\nlast;\n"
    path = _write(tmp_path, "l.v", source)
    pre = preprocess([path])
    lines = _lines(pre)
    assert _squash(lines[1]) == "q = {x, y}"
    assert _squash(lines[2]) == ";"
    assert pre.origin(4) == (path, 4) and lines[3] == "last;"


def test_macro_used_in_a_body_is_expanded_at_use(tmp_path):
    # Clause 19.3.1: macro text is rescanned when used, so a later definition counts.
    source = ("`define OUTER (`INNER + 1)\n"
              "`define INNER 2\n"
              "a = `OUTER;\n"
              "`undef INNER\n"
              "`define INNER 5\n"
              "b = `OUTER;\n")
    pre = preprocess([_write(tmp_path, "n.v", source)])
    lines = _lines(pre)
    assert _squash(lines[2]) == "a = (2 + 1);"
    assert _squash(lines[5]) == "b = (5 + 1);"


def test_macro_used_with_the_wrong_number_of_arguments(tmp_path):
    path = _write(tmp_path, "w.v", "`define TWO(a, b) a\n\nx = `TWO(1);\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert (caught.value.file, caught.value.line) == (path, 3)
    assert "TWO" in caught.value.message


def test_self_referencing_macro_is_an_error_not_a_hang(tmp_path):
    path = _write(tmp_path, "r.v", "`define LOOP (`LOOP)\nx = `LOOP;\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert caught.value.line == 2


def test_command_line_defines_act_as_object_like_macros(tmp_path):
    path = _write(tmp_path, "c.v", "x = `DIGITS;\n")
    assert _squash(preprocess([path], defines={"DIGITS": "4"}).text) == "x = 4;"


def test_definitions_carry_from_one_file_to_the_next(tmp_path):
    first = _write(tmp_path, "a.v", "`define LIMIT 9\n")
    second = _write(tmp_path, "b.v", "y = `LIMIT;\n")
    pre = preprocess([first, second])
    assert _squash(pre.text) == "y = 9;"
    assert pre.origin(2) == (second, 1)


def test_file_and_line_macros_name_the_original_place(tmp_path):
    # IEEE 1800 `__FILE__ / `__LINE__ (recalled): the file name string and the line number.
    _write(tmp_path, "h.vh", "\nx = `__LINE__;\n")
    top = _write(tmp_path, "t.v", 'f = `__FILE__;\n`include "h.vh"\n')
    pre = preprocess([top])
    assert f'f = "{top}";' in pre.text and "x = 2;" in pre.text


# -- `undef (clause 19.3.2), unknown names ------------------------------------------------------
def test_undef_removes_a_definition(tmp_path):
    path = _write(tmp_path, "u.v", "`define K 1\n`undef K\nx = `K;\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert (caught.value.file, caught.value.line) == (path, 3)
    assert "`K" in caught.value.message


def test_unknown_directive_names_itself_and_its_line(tmp_path):
    path = _write(tmp_path, "x.v", "module m;\n`frobnicate 3\nendmodule\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert (caught.value.file, caught.value.line) == (path, 2)
    assert "`frobnicate" in caught.value.message


def test_directives_that_change_meaning_are_rejected_by_name(tmp_path):
    path = _write(tmp_path, "d.v", "`unconnected_drive pull1\nmodule m; endmodule\n")
    with pytest.raises(UnsupportedConstruct) as caught:
        preprocess([path])
    assert caught.value.line == 1 and "unconnected_drive" in caught.value.message


# -- `ifdef, `ifndef, `elsif, `else, `endif (clause 19.4) ---------------------------------------
_CONDITIONAL = """`ifdef FAST
fast
`elsif SMALL
  `ifndef TINY
small
  `else
tiny
  `endif
`else
plain
`endif
"""


@pytest.mark.parametrize("defined, chosen", [
    ({}, "plain"),
    ({"FAST": ""}, "fast"),
    ({"FAST": "", "SMALL": ""}, "fast"),       # the first true branch wins (19.4)
    ({"SMALL": ""}, "small"),
    ({"SMALL": "", "TINY": ""}, "tiny"),
    ({"TINY": ""}, "plain"),                  # the nested `ifndef is never reached
])
def test_conditional_compilation_chooses_one_branch(tmp_path, defined, chosen):
    path = _write(tmp_path, "c.v", _CONDITIONAL)
    pre = preprocess([path], defines=defined)
    assert _squash(pre.text) == chosen
    assert len(_lines(pre)) == _CONDITIONAL.count("\n")   # skipped lines stay as blanks


def test_conditional_on_one_line(tmp_path):
    pre = preprocess([_write(tmp_path, "o.v", "`define A\nx `ifdef A yes `else no `endif y\n")])
    assert _squash(pre.text) == "x yes y"


def test_directive_words_inside_skipped_strings_are_text(tmp_path):
    source = '`ifdef NO\n$display("`endif");\n`endif\nok\n'
    pre = preprocess([_write(tmp_path, "q.v", source)])
    assert _squash(pre.text) == "ok"


def test_unterminated_ifdef_names_the_opening_line(tmp_path):
    path = _write(tmp_path, "u.v", "module m;\n`ifdef NEVER\nwire w;\nendmodule\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert (caught.value.file, caught.value.line) == (path, 2)


def test_else_without_ifdef_is_an_error(tmp_path):
    path = _write(tmp_path, "e.v", "\n`else\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert caught.value.line == 2


def test_elsif_after_else_is_an_error(tmp_path):
    path = _write(tmp_path, "e.v", "`ifdef A\n`else\n`elsif B\n`endif\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert caught.value.line == 3


def test_skipped_text_may_use_undefined_macros(tmp_path):
    pre = preprocess([_write(tmp_path, "s.v", "`ifdef NO\n`UNDEFINED `whatever\n`endif\nok\n")])
    assert _squash(pre.text) == "ok"


# -- `include (clause 19.5) and the line map ---------------------------------------------------
def test_included_lines_map_to_their_own_file(tmp_path):
    header = _write(tmp_path, "inc/digits.vh", "`define DIGITS 3\nwire from_header;\n")
    top = _write(tmp_path, "top.v", "first;\n`include \"inc/digits.vh\"\nx = `DIGITS;\n")
    pre = preprocess([top])
    lines = _lines(pre)
    origins = [pre.origin(n) for n in range(1, len(lines) + 1)]
    assert origins == [(top, 1), (top, 2), (header, 1), (header, 2), (top, 2), (top, 3)]
    assert lines[3] == "wire from_header;"
    assert _squash(lines[5]) == "x = 3;"


def test_include_searches_the_including_folder_then_include_dirs_in_order(tmp_path):
    _write(tmp_path, "src/defs.vh", "local\n")
    _write(tmp_path, "first/defs.vh", "first\n")
    _write(tmp_path, "first/only.vh", "first-only\n")
    _write(tmp_path, "second/only.vh", "second-only\n")
    top = _write(tmp_path, "src/top.v", '`include "defs.vh"\n`include "only.vh"\n')
    dirs = [str(tmp_path / "first"), str(tmp_path / "second")]
    assert _squash(preprocess([top], include_dirs=dirs).text) == "local first-only"


def test_missing_include_names_the_including_line(tmp_path):
    top = _write(tmp_path, "top.v", "\n\n`include \"nowhere.vh\"\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([top])
    assert (caught.value.file, caught.value.line) == (top, 3)
    assert "nowhere.vh" in caught.value.message


def test_include_cycle_is_an_error(tmp_path):
    _write(tmp_path, "a.vh", '`include "b.vh"\n')
    b = _write(tmp_path, "b.vh", 'x\n`include "a.vh"\n')
    top = _write(tmp_path, "top.v", '`include "a.vh"\n')
    with pytest.raises(BcdproveError) as caught:
        preprocess([top])
    assert (caught.value.file, caught.value.line) == (b, 2)
    assert "cycle" in caught.value.message


def _include_chain(folder, length: int) -> str:
    for index in range(length):
        _write(folder, f"h{index}.vh", f'`include "h{index + 1}.vh"\n')
    _write(folder, f"h{length}.vh", "deepest\n")
    return _write(folder, "top.v", '`include "h0.vh"\n')


def test_includes_nested_to_the_limit_are_read(tmp_path):
    top = _include_chain(tmp_path, MAX_INCLUDE_DEPTH - 1)    # top.v at depth 0
    assert _squash(preprocess([top]).text) == "deepest"


def test_includes_nested_past_the_limit_are_an_error(tmp_path):
    top = _include_chain(tmp_path, MAX_INCLUDE_DEPTH)
    with pytest.raises(BcdproveError) as caught:
        preprocess([top])
    assert "deeper" in caught.value.message and caught.value.line == 1


# -- directives that are recorded or ignored ---------------------------------------------------
def test_timescale_is_removed_and_noted(tmp_path):
    # Clause 19.8: `timescale only sets delay units; no delays are modelled.
    pre = preprocess([_write(tmp_path, "t.v", "`timescale 1ns / 1ps\nmodule m; endmodule\n")])
    assert _squash(pre.text) == "module m; endmodule"
    assert any("`timescale" in note for note in pre.notes)


def test_default_nettype_is_recorded_with_its_text_line(tmp_path):
    # Clause 19.2: the value applies to the modules that follow.
    source = "module a; endmodule\n`default_nettype none\nmodule b; endmodule\n"
    pre = preprocess([_write(tmp_path, "n.v", source)])
    assert pre.default_nettype == [(2, "none")]
    assert "default_nettype" not in pre.text


def test_default_nettype_line_counts_included_lines(tmp_path):
    _write(tmp_path, "h.vh", "one\ntwo\n")
    top = _write(tmp_path, "t.v", '`include "h.vh"\n`default_nettype wire\n')
    pre = preprocess([top])
    line, value = pre.default_nettype[0]
    assert value == "wire" and pre.origin(line) == (top, 2)


def test_default_nettype_rejects_a_value_that_is_no_net_type(tmp_path):
    path = _write(tmp_path, "n.v", "`default_nettype reg\n")
    with pytest.raises(BcdproveError) as caught:
        preprocess([path])
    assert caught.value.line == 1


def test_resetall_restores_default_nettype_wire(tmp_path):
    # Clause 19.6: `resetall resets directives to their defaults (`default_nettype wire).
    pre = preprocess([_write(tmp_path, "r.v", "`default_nettype none\n`resetall\n")])
    assert pre.default_nettype == [(1, "none"), (2, "wire")]


def test_celldefine_is_removed_and_noted(tmp_path):
    pre = preprocess([_write(tmp_path, "c.v", "`celldefine\nmodule m; endmodule\n`endcelldefine\n")])
    assert _squash(pre.text) == "module m; endmodule"
    assert any("celldefine" in note for note in pre.notes)


def test_pragma_and_keyword_sets_are_removed_and_noted(tmp_path):
    # Clauses 19.10 (`pragma) and 19.11 (`begin_keywords), recalled from memory.
    source = '`begin_keywords "1364-2005"\n`pragma protect\nmodule m; endmodule\n`end_keywords\n'
    pre = preprocess([_write(tmp_path, "k.v", source)])
    assert _squash(pre.text) == "module m; endmodule"
    assert len(pre.notes) == 2


# -- Icarus Verilog as referee ------------------------------------------------------------------
_BENCH_HEADER = """`define SCALE 10
`define MUL_ADD(a, b, c) ((a) * (b) + \\
                          (c))
`define TWICE(x) (`MUL_ADD(x, 2, 0))
"""

_BENCH = """`include "scale.vh"
`timescale 1ns/1ps
module readout_bench;
  localparam integer A = `MUL_ADD(3, `SCALE, 7);
`ifdef METER
  localparam integer B = 1;
`elsif BALANCE
  localparam integer B = `TWICE(21);
`else
  localparam integer B = 3;
`endif
  initial begin
    $display("A=%0d B=%0d", A, B);  // "`SCALE" stays text: %0d
    $display("`SCALE");
    $display("line %0d", `__LINE__);
  end
endmodule
"""


@pytest.mark.icarus
@pytest.mark.parametrize("defines", [{}, {"METER": "1"}, {"BALANCE": "1"}])
def test_our_output_simulates_like_the_original_in_icarus(tmp_path, defines):
    _write(tmp_path, "inc/scale.vh", _BENCH_HEADER)
    top = _write(tmp_path, "bench.v", _BENCH)
    include = [str(tmp_path / "inc")]
    expected = run_icarus([top], "readout_bench", include_dirs=include, defines=defines)
    pre = preprocess([top], include_dirs=include, defines=defines)
    ours = _write(tmp_path, "ours.v", pre.text)
    assert run_icarus([ours], "readout_bench") == expected
    assert "A=37" in expected          # 3*10+7, worked by hand from the macro text

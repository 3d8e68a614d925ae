"""bcdprove.equiv on the shipped designs.

Equal pairs: correct converters of the same ports and widths.  Their outputs are the decimal
digits of the input (Python's str(int) is the outside source, and tests/designs checks every
catalogue entry against it in Icarus), so any two of them are equal as functions.
Differing pairs: a correct design against a buggy twin; the counterexample is replayed in
Icarus Verilog (both designs simulated, outputs differ) and is at least the twin's first
failing input from designs/catalog.json (found by Icarus: nothing smaller fails).
"""
from __future__ import annotations

import pytest

from bcdprove import equiv
from bcdprove.engines.base import DISPROVED, PROVED
from tests.designs.catalog import DESIGNS, load_catalog, reference_bcd
from tests.support.icarus import run_icarus

CATALOG = {(e.file, tuple(sorted(e.parameters.items()))): e for e in load_catalog()}


def _entry(file, **parameters):
    return CATALOG[(file, tuple(sorted(parameters.items())))]


def _run(file_a, top_a, file_b, top_b, params_a=None, params_b=None, **options):
    return equiv([str(DESIGNS / file_a)], top_a, [str(DESIGNS / file_b)], top_b,
                 parameters=params_a or {}, against_parameters=params_b or {}, **options)


EQUAL_PAIRS = [
    ("comb/scale_add3_triangle8.v", "scale_add3_triangle8", {}, "comb/scale_gates8.v",
     "scale_gates8", {}),
    ("wide/meter_wide_loop.v", "meter_wide_loop", {"W": 16}, "wide/meter_wide_digit_array.v",
     "meter_wide_digit_array", {"W": 16}),
    ("wide/meter_wide_loop.v", "meter_wide_loop", {"W": 12}, "wide/meter_wide_add3_triangle.v",
     "meter_wide_add3_triangle", {"W": 12}),
    ("wide/meter_wide_add3_full.v", "meter_wide_add3_full", {"W": 12},
     "wide/meter_wide_divide.v", "meter_wide_divide", {"W": 12}),
]


@pytest.mark.parametrize("pair", EQUAL_PAIRS, ids=lambda p: f"{p[1]}-{p[4]}")
def test_correct_converters_are_equivalent(pair):
    file_a, top_a, params_a, file_b, top_b, params_b = pair
    result = _run(file_a, top_a, file_b, top_b, params_a, params_b)
    assert result.verdict.status == PROVED, result.verdict.reason
    assert result.exit_code == 0


BUGGY_TWINS = [
    ("comb/water_short_path.v", "water_short_path", {}, "comb/water_short_path_bug.v",
     "water_short_path_bug", {}),
    ("comb/water_short_path.v", "water_short_path", {}, "comb/meter_threshold6_bug.v",
     "meter_threshold6_bug", {"W": 12, "D": 4}),
    ("comb/scale_casez_cells.v", "scale_casez_cells", {"W": 12, "D": 4},
     "comb/scale_loop_bound_bug.v", "scale_loop_bound_bug", {"W": 12, "D": 4}),
    ("comb/meter_doubling_cells.v", "meter_doubling_cells", {"W": 16, "D": 5},
     "comb/meter_doubling_x_bug.v", "meter_doubling_x_bug", {"W": 16, "D": 5}),
]


def _icarus_outputs(file_a, top_a, params_a, file_b, top_b, params_b, port, width, value):
    def instance(top, params, name, out):
        overrides = ", ".join(f".{k}({v})" for k, v in params.items())
        return f"  {top}{' #(' + overrides + ')' if overrides else ''} {name} (.{port}(x), .bcd({out}));"

    bench = "\n".join([
        "module equiv_bench;",
        f"  reg [{width - 1}:0] x;",
        "  wire [127:0] ya, yb;",
        instance(top_a, params_a, "a", "ya"),
        instance(top_b, params_b, "b", "yb"),
        f"  initial begin x = {width}'d{value}; #1; $display(\"%h %h\", ya, yb); $finish; end",
        "endmodule", ""])
    text = run_icarus([DESIGNS / file_a, DESIGNS / file_b], "equiv_bench", bench)
    first, second = text.split()
    return first, second


@pytest.mark.parametrize("pair", BUGGY_TWINS, ids=lambda p: f"{p[1]}-{p[4]}")
def test_a_buggy_twin_differs_and_icarus_agrees(pair):
    file_a, top_a, params_a, file_b, top_b, params_b = pair
    twin = _entry(file_b, **params_b)
    result = _run(file_a, top_a, file_b, top_b, params_a, params_b)
    assert result.verdict.status == DISPROVED
    found = result.verdict.counterexample
    (port,) = twin.inputs
    value = found.inputs[port]
    assert value >= twin.first_failing_input
    out_a, out_b = _icarus_outputs(file_a, top_a, params_a, file_b, top_b, params_b, port,
                                   twin.width, value)
    assert out_a != out_b
    # The correct design shows the decimal digits (Python str), the model's value agrees.
    assert int(out_a, 16) == reference_bcd(value)
    (shown,) = found.outputs
    assert shown.value_a == int(out_a, 16)
    if "x" not in out_b.lower():
        assert shown.value_b == int(out_b, 16)


def test_a_missing_top_digit_is_a_width_error():
    # meter_wide_digit_count_bug at W=64 estimates 19 digits where 20 are needed
    # (designs/catalog.json): its output is 76 bits against 80.
    from bcdprove import BcdproveError

    with pytest.raises(BcdproveError, match="output `bcd` is 80 bits .* 76 bits"):
        _run("wide/meter_wide_loop.v", "meter_wide_loop", "wide/meter_wide_digit_count_bug.v",
             "meter_wide_digit_count_bug", {"W": 64}, {"W": 64})


PIPELINE = ("clocked/scale_pipeline_bcd.v", "scale_pipeline_bcd")
SKEWED = ("clocked/scale_pipeline_skew_bug.v", "scale_pipeline_skew_bug")
SIZES = {"W": 8, "D": 3}


def test_a_pipeline_is_equivalent_to_itself_at_its_latency():
    # Latency 9 from designs/catalog.json (checked there in Icarus).
    result = _run(*PIPELINE, *PIPELINE, SIZES, SIZES, latency=_entry(PIPELINE[0], **SIZES).raw["latency"])
    assert result.verdict.status == PROVED


def test_a_skewed_pipeline_differs_and_icarus_agrees():
    latency = _entry(PIPELINE[0], **SIZES).raw["latency"]
    result = _run(*PIPELINE, *SKEWED, SIZES, SIZES, latency=latency)
    assert result.verdict.status == DISPROVED
    found = result.verdict.counterexample
    values = [found.inputs[f"grams@{t}"] for t in range(latency + 1)]
    # Replay in Icarus: both pipelines clocked with the same values, outputs read in the
    # cycle of the latency (the timing contract of model/unroll.py: inputs change between
    # edges, outputs are sampled before the edge that ends the cycle).
    drive = "\n".join(f"    grams = 8'd{v}; #5 clk = 1; #5 clk = 0;" for v in values[:-1])
    bench = "\n".join([
        "module pipe_bench;",
        "  reg clk = 0; reg [7:0] grams;",
        "  wire [11:0] ya, yb;",
        f"  {PIPELINE[1]} #(.W(8), .D(3)) a (.clk(clk), .grams(grams), .bcd(ya));",
        f"  {SKEWED[1]} #(.W(8), .D(3)) b (.clk(clk), .grams(grams), .bcd(yb));",
        "  initial begin",
        drive,
        f"    grams = 8'd{values[-1]}; #1 $display(\"%h %h\", ya, yb); $finish;",
        "  end",
        "endmodule", ""])
    text = run_icarus([DESIGNS / PIPELINE[0], DESIGNS / SKEWED[0]], "pipe_bench", bench)
    out_a, out_b = text.split()
    assert out_a != out_b
    (shown,) = found.outputs
    assert (shown.value_a, shown.value_b) == (int(out_a, 16), int(out_b, 16))
    # The correct pipeline shows the value presented latency cycles earlier (Python str).
    assert int(out_a, 16) == reference_bcd(values[0])


SERIAL = ("clocked/meter_serial_bcd.v", "meter_serial_bcd")
SERIAL_SIZES = {"W": 12, "D": 4}


def test_a_handshake_converter_is_equivalent_to_itself():
    # designs/catalog.json: meter_serial_bcd, a proved handshake converter (done 12 edges
    # after start); the same design on both sides must agree for every input and power-up.
    result = _run(*SERIAL, *SERIAL, SERIAL_SIZES, SERIAL_SIZES)
    assert result.verdict.status == PROVED, result.verdict.reason
    assert result.exit_code == 0


def _serial_bench(top_b: str, values: list[int]) -> list[tuple[int, int, int, int, int]]:
    """Both converters clocked in Icarus with the counterexample's inputs (reset in cycle 0,
    start in cycle 1, ``reading`` per cycle); per cycle (t, done_a, done_b, bcd_a, bcd_b),
    sampled before the edge that ends the cycle (the timing contract of model/unroll.py)."""
    lines = []
    for t, value in enumerate(values):
        lines.append(f"    rst = {int(t == 0)}; start = {int(t == 1)}; reading = 12'd{value}; "
                     f"#1 $display(\"%0d %b %b %h %h\", {t}, da, db, ya, yb); "
                     f"#4 clk = 1; #5 clk = 0;")
    bench = "\n".join([
        "module serial_bench;",
        "  reg clk = 0, rst = 0, start = 0; reg [11:0] reading = 0;",
        "  wire da, db; wire [15:0] ya, yb;",
        f"  {SERIAL[1]} #(.W(12), .D(4)) a (.clk(clk), .rst(rst), .start(start), "
        f".reading(reading), .done(da), .bcd(ya));",
        f"  {top_b} #(.W(12), .D(4)) b (.clk(clk), .rst(rst), .start(start), "
        f".reading(reading), .done(db), .bcd(yb));",
        "  initial begin", *lines, "    $finish;", "  end", "endmodule", ""])
    text = run_icarus([DESIGNS / SERIAL[0], DESIGNS / f"clocked/{top_b}.v"], "serial_bench",
                      bench)
    rows = []
    for line in text.strip().splitlines():
        t, da, db, ya, yb = line.split()
        rows.append((int(t), int(da, 2) if da in "01" else -1, int(db, 2) if db in "01" else -1,
                     int(ya, 16) if "x" not in ya else -1, int(yb, 16) if "x" not in yb else -1))
    return rows


@pytest.mark.parametrize("twin", ["meter_serial_done_early_bug", "meter_serial_count_bug"])
def test_a_handshake_twin_differs_and_icarus_agrees(twin):
    # designs/catalog.json: both twins fail first at input 1 (Icarus-checked there).
    result = _run(*SERIAL, f"clocked/{twin}.v", twin, SERIAL_SIZES, SERIAL_SIZES)
    assert result.verdict.status == DISPROVED
    found = result.verdict.counterexample
    assert found.replayed and not found.uses_unknowns
    cycles = max(int(name.split("@")[1]) for name in found.inputs) + 1
    values = [found.inputs[f"reading@{t}"] for t in range(cycles)]
    rows = _serial_bench(twin, values)
    done_a = next(t for t, da, _, _, _ in rows if t >= 2 and da == 1)
    done_b = next(t for t, _, db, _, _ in rows if t >= 2 and db == 1)
    read_a, read_b = rows[done_a][3], rows[done_b][4]
    shown = {o.label: o for o in found.outputs}
    assert (shown["bcd@done"].value_a, shown["bcd@done"].value_b) == (read_a, read_b)
    assert read_a != read_b
    # The correct converter shows the digits of the value started in cycle 1 (Python str).
    assert read_a == reference_bcd(values[1])
    assert (f"rose in cycle {done_a}" in found.note and f"rose in cycle {done_b}" in found.note)
    assert done_a != done_b      # early: one edge early; count: one edge late (catalogue)


def test_a_done_that_never_rises_is_a_difference():
    # The catalogue's latency of meter_serial_bcd is 12 edges, so within 5 cycles of the
    # start its done cannot rise, in either copy.
    result = _run(*SERIAL, *SERIAL, SERIAL_SIZES, SERIAL_SIZES, max_cycles=5)
    assert result.verdict.status == DISPROVED
    found = result.verdict.counterexample
    assert found.differing == ["done_rose"]
    assert found.note.count("never rose") == 2


def test_handshake_options_are_checked():
    from bcdprove import BcdproveError

    with pytest.raises(BcdproveError, match="--max-cycles 0"):
        _run(*SERIAL, *SERIAL, SERIAL_SIZES, SERIAL_SIZES, max_cycles=0)
    with pytest.raises(BcdproveError, match="--latency describes a pipeline"):
        _run(*SERIAL, *SERIAL, SERIAL_SIZES, SERIAL_SIZES, latency=12, start="start")
    with pytest.raises(BcdproveError, match="--map level=reading: .* has no port `level`"):
        _run(*SERIAL, *SERIAL, SERIAL_SIZES, SERIAL_SIZES, mapping={"level": "reading"})


def test_handshakes_of_different_reset_and_port_names_are_equivalent():
    # pump_serial_bcd_async (catalogued proved at W=10: asynchronous active-low rst_n, input
    # total) against meter_serial_bcd at W=10 (synchronous active-high rst, input reading).
    pump, meter = ("clocked/pump_serial_bcd_async.v", "pump_serial_bcd_async"), SERIAL
    sizes = {"W": 10, "D": 4}
    result = _run(*pump, *meter, sizes, sizes, mapping={"rst_n": "rst", "total": "reading"})
    assert result.verdict.status == PROVED, result.verdict.reason
    # Outside evidence for a few values: both in Icarus, started in cycle 1 after a reset
    # in cycle 0, read at their first done, against Python's str (reference_bcd).
    values = [0, 1, 9, 10, 99, 512, 999, 1023]
    lines = []
    for value in values:
        lines += ["    rst = 1; rst_n = 0; start = 0; #5 clk = 1; #5 clk = 0;",
                  f"    rst = 0; rst_n = 1; start = 1; x = 10'd{value}; #5 clk = 1; #5 clk = 0;",
                  "    start = 0; x = 0;",
                  "    while (!(da && db)) begin #5 clk = 1; #5 clk = 0; end",
                  "    $display(\"%h %h\", ya, yb);"]
    bench = "\n".join([
        "module pair_bench;",
        "  reg clk = 0, rst = 0, rst_n = 1, start = 0; reg [9:0] x = 0;",
        "  wire da, db; wire [15:0] ya, yb;",
        f"  {pump[1]} #(.W(10), .D(4)) a (.clk(clk), .rst_n(rst_n), .start(start), "
        f".total(x), .done(da), .bcd(ya));",
        f"  {meter[1]} #(.W(10), .D(4)) b (.clk(clk), .rst(rst), .start(start), "
        f".reading(x), .done(db), .bcd(yb));",
        "  initial begin", *lines, "    $finish;", "  end", "endmodule", ""])
    text = run_icarus([DESIGNS / pump[0], DESIGNS / meter[0]], "pair_bench", bench)
    for value, line in zip(values, text.strip().splitlines(), strict=True):
        assert line.split() == [f"{reference_bcd(value):04x}"] * 2, (value, line)


def test_a_held_input_leaves_only_the_started_value_free():
    # --hold-input: reading keeps its cycle-1 value, so the only data inputs are cycles 0, 1;
    # the count bug still differs (designs/catalog.json: fails first at input 1).
    twin = "meter_serial_count_bug"
    result = _run(*SERIAL, f"clocked/{twin}.v", twin, SERIAL_SIZES, SERIAL_SIZES,
                  hold_input=True)
    assert result.verdict.status == DISPROVED
    assert sorted(result.verdict.counterexample.inputs) == ["reading@0", "reading@1"]


def test_a_clocked_design_against_a_combinational_one_is_refused():
    from bcdprove import BcdproveError

    with pytest.raises(BcdproveError, match="is clocked but .* is combinational"):
        _run(*PIPELINE, "comb/scale_add3_triangle8.v", "scale_add3_triangle8", SIZES, {},
             latency=9)


def test_a_64_bit_twin_wrong_in_one_corner_differs_and_icarus_agrees():
    # meter_wide_stage_bug: one cell of stage 40 corrects from 6 (designs/catalog.json);
    # the smallest failing input, from Icarus, is 838,860,800,000,000.
    file_b, top_b = "wide/meter_wide_stage_bug.v", "meter_wide_stage_bug"
    twin = _entry(file_b, W=64)
    result = _run("wide/meter_wide_add3_full.v", "meter_wide_add3_full", file_b, top_b,
                  {"W": 64}, {"W": 64})
    assert result.verdict.status == DISPROVED
    value = result.verdict.counterexample.inputs["count"]
    assert value >= twin.first_failing_input
    out_a, out_b = _icarus_outputs("wide/meter_wide_add3_full.v", "meter_wide_add3_full",
                                   {"W": 64}, file_b, top_b, {"W": 64}, "count", 64, value)
    assert out_a != out_b and int(out_a, 16) == reference_bcd(value)


@pytest.mark.slow
@pytest.mark.parametrize("other", ["meter_wide_digit_array", "meter_wide_add3_triangle"])
def test_64_bit_double_dabble_variants_are_equivalent(other):
    result = _run("wide/meter_wide_loop.v", "meter_wide_loop", f"wide/{other}.v", other,
                  {"W": 64}, {"W": 64})
    assert result.verdict.status == PROVED, result.verdict.reason
    assert result.verdict.stats["sweep"]["proved"] > 0


def test_range_constants_are_proved_so_the_sweep_leaves_no_pair_open():
    # The loop keeps an add-3 cell on digits that cannot reach 5 yet (above the highest digit
    # of 2^s - 1 at stage s); the triangle has none there.  Those cells' conditions are zero
    # only because of the input's range: proved down to the inputs, every pair the sweep
    # proposes is proved (with a local query only, 7 of 31 stayed open at 16 bits).  The pair
    # is equal: both are correct converters (Python's str(int), see the module docstring).
    result = _run("wide/meter_wide_loop.v", "meter_wide_loop", "wide/meter_wide_add3_triangle.v",
                  "meter_wide_add3_triangle", {"W": 16}, {"W": 16})
    assert result.verdict.status == PROVED, result.verdict.reason
    sweep = result.verdict.stats["sweep"]
    assert sweep["constants"] >= 1 and sweep["undecided"] == 0
    assert sweep["proved"] == sweep["proposed"]

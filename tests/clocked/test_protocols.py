"""Clocked checks of the shipped designs: verdicts, failing runs, protocol corner cases.

Expected verdicts, bugs and cycle counts come from designs/catalog.json, which
tests/designs holds to Icarus Verilog; expected digits come from Python's str(int).
"""
from __future__ import annotations

import pytest

from bcdprove.clocked import check_clocked_model
from bcdprove.errors import BcdproveError
from bcdprove.spec.clocked import NEVER
from tests.clocked.catalog_runs import CLOCKED, checked, model_of, protocol_options


def _digits(value: int, count: int) -> list[int]:
    """Decimal digits, least significant first (Python str as reference code)."""
    text = str(value)[::-1]
    return [int(text[i]) if i < len(text) else 0 for i in range(count)]


@pytest.mark.parametrize("top", sorted(CLOCKED))
def test_catalogue_verdict(top):
    result = checked(top)
    assert result.status == CLOCKED[top].expected, [o.verdict for o in result.obligations]


@pytest.mark.parametrize("top", sorted(t for t in CLOCKED if CLOCKED[t].expected == "disproved"))
def test_counterexample_digits_are_wrong_by_python(top):
    failing = checked(top).failing
    found = failing.verdict.counterexample
    x = found.inputs[failing.clocked.problem.input_ports[0]]
    assert found.replayed
    assert found.expected == _digits(x, len(found.expected))
    assert found.actual != found.expected


def test_done_early_is_read_one_cycle_before_a_correct_design():
    # Catalogue: latency 12 edges after the start edge (end of cycle 1) -> done in cycle 14;
    # the bug raises done one edge early.
    latency = CLOCKED["meter_serial_done_early_bug"].raw["latency"]
    correct_read = 1 + latency + 1
    failing = checked("meter_serial_done_early_bug").failing
    assert failing.title == "first conversion after reset"
    assert failing.read_cycle == correct_read - 1
    x = failing.verdict.counterexample.inputs[failing.clocked.problem.input_ports[0]]
    assert x == CLOCKED["meter_serial_done_early_bug"].first_failing_input


def test_bit_counter_off_by_one_is_read_one_cycle_late():
    latency = CLOCKED["meter_serial_count_bug"].raw["latency"]
    failing = checked("meter_serial_count_bug").failing
    assert failing.read_cycle == 1 + latency + 2


def test_uncleared_digits_fail_only_on_the_second_conversion():
    # Catalogue: "the first conversion after reset is always right".
    first, second = checked("meter_serial_not_cleared_bug").obligations
    assert first.verdict.status == "proved"
    assert second.verdict.status == "disproved"
    assert second.title.startswith("second conversion")
    assert second.present_cycle > first.main.read[0].cycle


def test_a_correct_serial_converter_proves_both_conversions():
    for top in ("meter_serial_bcd", "pump_serial_bcd_async"):
        result = checked(top)
        assert [o.verdict.status for o in result.obligations] == ["proved", "proved"]


def test_unlatched_input_passes_only_when_the_input_is_held():
    # Catalogue: "right whenever the input is held for the whole conversion".
    top = "meter_serial_unlatched_bug"
    held = check_clocked_model(model_of(top), hold_input=True, **protocol_options(top))
    assert held.status == "proved"
    assert checked(top).status == "disproved"


def test_skewed_pipeline_fails_when_consecutive_inputs_differ_in_bit_w_minus_5():
    failing = checked("scale_pipeline_skew_bug").failing
    width = CLOCKED["scale_pipeline_skew_bug"].width
    present = failing.present_cycle
    run = failing.trace
    first, following = run[present].inputs["grams"], run[present + 1].inputs["grams"]
    assert (first ^ following) >> (width - 5) & 1


def test_pipeline_read_one_cycle_early_is_disproved():
    top = "scale_pipeline_bcd"
    latency = CLOCKED[top].raw["latency"]
    result = check_clocked_model(model_of(top), latency=latency - 1)
    assert result.status == "disproved"


def test_done_that_never_rises_in_the_window_is_a_counterexample():
    top = "meter_serial_bcd"
    result = check_clocked_model(model_of(top), max_cycles=5, **protocol_options(top))
    failing = result.failing
    assert failing is not None and failing.read_cycle is None
    found = failing.verdict.counterexample
    assert found.actual == [NEVER] * len(found.actual)
    assert "never rose within 5 cycles" in found.note


def test_free_running_needs_the_output_to_settle_and_stay():
    top = "scale_pipeline_bcd"
    latency = CLOCKED[top].raw["latency"]
    held = check_clocked_model(model_of(top), latency=latency, hold_input=True)
    assert held.status == "proved"
    early = check_clocked_model(model_of(top), latency=latency - 1, hold_input=True)
    assert early.status == "disproved"
    assert "changed in cycle" in early.failing.verdict.counterexample.note


def test_inferred_asynchronous_reset_is_explained():
    result = check_clocked_model(model_of("pump_serial_bcd_async"), start="start")
    text = " | ".join(result.protocol.reasons)
    assert "reset `rst_n`: inferred (the asynchronous reset of the registers)" in text
    assert "reset active low: its edge in the sensitivity list" in text
    assert "start `start`: named with --start" in text
    assert result.protocol.reset_active_low is CLOCKED["pump_serial_bcd_async"].raw[
        "reset_active_low"]


def test_inference_without_options():
    result = check_clocked_model(model_of("meter_serial_bcd"))
    text = " | ".join(result.protocol.reasons)
    assert "reset `rst`: inferred (a common reset name)" in text
    assert "done `done`: inferred from a common name" in text
    assert result.status == "proved"


def test_a_pipeline_without_latency_asks_for_it():
    with pytest.raises(BcdproveError, match="--latency CYCLES"):
        check_clocked_model(model_of("scale_pipeline_bcd"))


def test_a_wrong_protocol_port_is_named():
    with pytest.raises(BcdproveError, match="no input port `begin`"):
        check_clocked_model(model_of("meter_serial_bcd"), start="begin")


def test_too_few_digits_is_disproved_with_the_capacity():
    # 12 bits need 4 digits (4095); at D = 3 the smallest value not shown is 10**3 = 1000.
    from bcdprove.verilog import read_design

    entry = CLOCKED["meter_serial_bcd"]
    model = read_design([str(entry.path)], entry.top, {"W": 12, "D": 3})
    result = check_clocked_model(model)
    failing = result.failing
    assert failing.too_few_digits
    assert failing.verdict.counterexample.inputs[failing.clocked.problem.input_ports[0]] == 1000


@pytest.mark.slow
@pytest.mark.parametrize("top,parameters,options", [
    ("meter_serial_bcd", {"W": 32, "D": 10}, {}),
    ("scale_pipeline_bcd", {"W": 64, "D": 20}, {"latency": 65}),   # latency W + 1 (design header)
])
def test_wide_clocked_converters_are_proved(top, parameters, options):
    from bcdprove.verilog import read_design

    model = read_design([str(CLOCKED[top].path)], top, parameters)
    assert check_clocked_model(model, timeout=300, **options).status == "proved"


# A converter whose done comes after a data-dependent number of cycles (it counts the value
# down, one BCD increment per cycle), so the second start cycle is not a constant.
TALLY = """
module tally_bcd #(parameter W = 4) (input clk, input rst, input start, input [W-1:0] value,
                                     output reg done, output reg [7:0] bcd);
    reg busy;
    reg [W-1:0] left;
    always @(posedge clk) begin
        if (rst) begin
            busy <= 1'b0; done <= 1'b0; left <= 0; bcd <= 8'd0;
        end else if (start && !busy) begin
            busy <= 1'b1; done <= 1'b0; left <= value; CLEAR
        end else if (busy) begin
            if (left == 0) begin
                busy <= 1'b0; done <= 1'b1;
            end else begin
                left <= left - 1'b1;
                bcd <= (bcd[3:0] == 4'd9) ? {bcd[7:4] + 4'd1, 4'd0} : {bcd[7:4], bcd[3:0] + 4'd1};
            end
        end
    end
endmodule
"""


def _tally(tmp_path, clear: bool, width: int):
    from bcdprove.verilog import read_design

    path = tmp_path / "tally_bcd.v"
    path.write_text(TALLY.replace("CLEAR", "bcd <= 8'd0;" if clear else ""))
    return read_design([str(path)], "tally_bcd", {"W": width})


def test_data_dependent_done_second_conversion_uses_a_symbolic_start(tmp_path):
    model = _tally(tmp_path, clear=False, width=4)
    result = check_clocked_model(model, max_cycles=20)
    first, second = result.obligations
    assert first.verdict.status == "proved"
    assert second.verdict.status == "disproved"
    assert "`value@start2`" in second.main.problem.reasons[-1]    # the symbolic encoding
    found = second.verdict.counterexample
    x = found.inputs[second.clocked.problem.input_ports[0]]
    assert found.expected == _digits(x, 2)
    # The hunt fixed the first value at 1: its count is left in the digits (1 + x shown).
    assert found.actual == _digits(1 + x, 2)


@pytest.mark.slow
def test_data_dependent_done_correct_converter_is_proved(tmp_path):
    model = _tally(tmp_path, clear=True, width=3)
    assert check_clocked_model(model, max_cycles=12).status == "proved"


RESET_PIPELINE = """
module level_pipe(input clk, input arst_n, input en, input [5:0] level, output reg [7:0] bcd);
    reg [5:0] held;
    always @(posedge clk or negedge arst_n)
        if (!arst_n) begin held <= 6'd0; bcd <= 8'd0; end
        else if (en) begin held <= level; bcd <= ((held / 10) << 4) | (held % 10); end
endmodule
"""


def test_pipeline_with_reset_and_a_tied_enable(tmp_path):
    from bcdprove.verilog import read_design

    path = tmp_path / "level_pipe.v"
    path.write_text(RESET_PIPELINE)
    model = read_design([str(path)], "level_pipe", {})
    result = check_clocked_model(model, latency=2, ties={"en": 1})
    assert result.status == "proved"
    reasons = " | ".join(result.obligations[0].main.problem.reasons)
    assert "reset `arst_n`: inferred (the asynchronous reset of the registers)" in reasons
    assert "presented in cycle 1, outputs read in cycle 3" in reasons   # reset in cycle 0
    # The enable left free can stall the pipeline: a counterexample, not a proof.
    assert check_clocked_model(model, latency=2, inputs=["level"]).status == "disproved"

"""The failing run as a VCD file (read back with pyvcd's tokenizer) and as a test bench
replayed in Icarus Verilog.

References: IEEE 1364-2005 clause 18 (the VCD format: $var declarations, #time, b<bits>
vector changes); Icarus Verilog runs each test bench; expected digits from Python str(int).
"""
from __future__ import annotations

import io

import pytest

from bcdprove.reports.clocked_testbench import write_clocked_testbench
from bcdprove.reports.vcd import PERIOD, vcd_text
from tests.clocked.catalog_runs import CLOCKED, checked
from tests.support.icarus import run_icarus


def _read_vcd(text: str) -> tuple[dict[str, tuple[str, int]], dict[str, list[tuple[int, int]]]]:
    """(identifier -> (scoped name, width), identifier -> [(time, value)]) via pyvcd."""
    from vcd.reader import TokenKind, tokenize

    variables: dict[str, tuple[str, int]] = {}
    changes: dict[str, list[tuple[int, int]]] = {}
    scopes: list[str] = []
    now = 0
    for token in tokenize(io.BytesIO(text.encode())):
        if token.kind is TokenKind.SCOPE:
            scopes.append(token.scope.ident)
        elif token.kind is TokenKind.UPSCOPE:
            scopes.pop()
        elif token.kind is TokenKind.VAR:
            variables[token.var.id_code] = (".".join(scopes + [token.var.reference]),
                                            token.var.size)
        elif token.kind is TokenKind.CHANGE_TIME:
            now = token.time_change
        elif token.kind is TokenKind.CHANGE_SCALAR:
            changes.setdefault(token.scalar_change.id_code, []).append(
                (now, int(token.scalar_change.value)))
        elif token.kind is TokenKind.CHANGE_VECTOR:
            changes.setdefault(token.vector_change.id_code, []).append(
                (now, int(token.vector_change.value)))
    return variables, changes


def _value_at(history: list[tuple[int, int]], time: int) -> int:
    value = None
    for when, v in history:
        if when <= time:
            value = v
    return value


def test_vcd_holds_every_port_and_register_and_the_failing_values():
    result = checked("meter_serial_count_bug")
    failing = result.failing
    text = vcd_text(failing.clocked.unrolled, failing.trace)
    variables, changes = _read_vcd(text)
    by_name = {name: ident for ident, (name, _) in variables.items()}
    top = "meter_serial_count_bug"
    model = failing.clocked.unrolled.source
    for port in model.ports:
        assert f"{top}.{port.name}" in by_name
        assert variables[by_name[f"{top}.{port.name}"]][1] == port.width
    for register in model.registers:
        assert f"{top}.registers.{register.name}" in by_name
    # In the read cycle, bcd shows the wrong digits of the counterexample.
    found = failing.verdict.counterexample
    read = failing.read_cycle
    bcd = _value_at(changes[by_name[f"{top}.bcd"]], PERIOD * read + 2)
    shown = [bcd >> (4 * i) & 0xF for i in range(len(found.actual))]
    assert shown == found.actual and shown != found.expected
    assert _value_at(changes[by_name[f"{top}.done"]], PERIOD * read + 2) == 1
    # One rising clock edge per cycle: at the end of each (IEEE 1364-2005 clause 18 times).
    rises = [t for (t, v) in changes[by_name[f"{top}.clk"]] if v == 1 and t > 0]
    assert rises[:3] == [PERIOD, 2 * PERIOD, 3 * PERIOD]


def _bench_output(top: str) -> str:
    entry = CLOCKED[top]
    text = write_clocked_testbench(checked(top))
    return run_icarus([entry.path], "bcdprove_tb", text)


@pytest.mark.parametrize("top", sorted(t for t in CLOCKED if CLOCKED[t].expected == "disproved"))
def test_testbench_of_a_buggy_design_fails_in_icarus(top):
    output = _bench_output(top)
    assert "bcdprove testbench: FAIL run 1" in output, output


@pytest.mark.parametrize("top", sorted(t for t in CLOCKED if CLOCKED[t].expected == "proved"))
def test_testbench_of_a_correct_design_passes_in_icarus(top):
    output = _bench_output(top)
    assert "bcdprove testbench: PASS" in output, output


def test_testbench_failure_shows_the_digits_python_expects():
    failing = checked("meter_serial_not_cleared_bug").failing
    x = failing.verdict.counterexample.inputs[failing.clocked.problem.input_ports[0]]
    want = " ".join(str(x).rjust(4, "0"))       # Python str: 4 digits, most significant first
    output = _bench_output("meter_serial_not_cleared_bug")
    assert f"expected digits {want}" in output, output


def test_testbench_reports_a_done_that_never_rises():
    from bcdprove.clocked import check_clocked_model
    from tests.clocked.catalog_runs import model_of, protocol_options

    top = "meter_serial_bcd"
    result = check_clocked_model(model_of(top), max_cycles=5, **protocol_options(top))
    result.overrides = dict(CLOCKED[top].parameters)
    output = run_icarus([CLOCKED[top].path], "bcdprove_tb", write_clocked_testbench(result))
    assert "done never rose within 5 cycles" in output, output


# A one-stage registered converter with one port per digit, on either clock edge.
REGISTERED = """
module register_digits(input clk, input [5:0] level, output reg [3:0] ones, output reg [3:0] tens);
    always @(EDGE clk) begin
        ones <= level % 10;
        tens <= level / TENS;
    end
endmodule
"""


@pytest.mark.parametrize("edge", ["posedge", "negedge"])
@pytest.mark.parametrize("tens,verdict", [("10", "proved"), ("9", "disproved")])
def test_digit_port_bench_on_either_edge_agrees_with_the_verdict(tmp_path, edge, tens, verdict):
    from bcdprove.clocked import check_clocked_model
    from bcdprove.verilog import read_design

    path = tmp_path / "register_digits.v"
    path.write_text(REGISTERED.replace("EDGE", edge).replace("TENS", tens))
    model = read_design([str(path)], "register_digits", {})
    result = check_clocked_model(model, latency=1, outputs=["ones", "tens"])
    assert result.status == verdict
    output = run_icarus([path], "bcdprove_tb", write_clocked_testbench(result))
    assert ("PASS" if verdict == "proved" else "FAIL run 1") in output, output

"""The clocked command-line pieces: the options and run_clocked_check in a typer app of our
own (the way check_cmd calls them), and ``bcdprove eval --cycles``.

Expected verdicts from designs/catalog.json; expected digits from Python str(int);
eval values checked against Icarus Verilog where they depend on the design.
"""
from __future__ import annotations

import json
import sys
from typing import List, Optional

import typer
from typer.testing import CliRunner

from bcdprove.cli import _clocked_options as clocked
from bcdprove.cli import _design_options as opt
from bcdprove.cli import main
from tests.clocked.catalog_runs import CLOCKED
from tests.support.icarus import run_icarus

app = typer.Typer()


@app.command()
def _check(files: List[str] = opt.FILES, top: str = opt.TOP,
           param: Optional[List[str]] = opt.PARAM, clock: Optional[str] = clocked.CLOCK,
           reset: Optional[str] = clocked.RESET, reset_low: Optional[bool] = clocked.RESET_LOW,
           start: Optional[str] = clocked.START, done: Optional[str] = clocked.DONE,
           latency: Optional[int] = clocked.LATENCY, hold_input: bool = clocked.HOLD_INPUT,
           max_cycles: Optional[int] = clocked.MAX_CYCLES, vcd: Optional[str] = clocked.VCD,
           testbench: Optional[str] = typer.Option(None, "--testbench"),
           as_json: bool = typer.Option(False, "--json")) -> None:
    model = opt.read(files, top, param, None, None)
    args = clocked.ClockedArgs(clock=clock, reset=reset, reset_low=reset_low, start=start,
                               done=done, latency=latency, hold_input=hold_input,
                               max_cycles=max_cycles, vcd=vcd)
    assert clocked.wants_clocked(model, args)
    raise SystemExit(clocked.run_clocked_check(model, args, as_json=as_json,
                                               testbench_path=testbench))


def _invoke(*arguments):
    return CliRunner().invoke(app, [str(a) for a in arguments])


def test_proved_handshake_exits_0():
    entry = CLOCKED["meter_serial_bcd"]
    run = _invoke(entry.path, "--top", entry.top, "--clock", "clk", "--reset", "rst",
                  "--reset-high", "--start", "start", "--done", "done")
    assert run.exit_code == 0, run.output
    assert "overall     PROVED" in run.output


def test_disproved_pipeline_exits_1_and_writes_the_vcd(tmp_path):
    entry = CLOCKED["scale_pipeline_skew_bug"]
    path = tmp_path / "run.vcd"
    run = _invoke(entry.path, "--top", entry.top, "--latency", entry.raw["latency"],
                  "--vcd", path)
    assert run.exit_code == 1, run.output
    assert "the failing run, one row per clock cycle" in run.output
    text = path.read_text()
    assert "$var wire 8" in text and "grams" in text and "$enddefinitions" in text


def test_json_has_one_entry_per_cycle_of_the_failing_run():
    entry = CLOCKED["meter_serial_done_early_bug"]
    run = _invoke(entry.path, "--top", entry.top, "--json")
    assert run.exit_code == 1
    record = json.loads(run.output)
    failing = next(o for o in record["obligations"] if o["status"] == "disproved")
    found = failing["counterexample"]
    # Catalogue: smallest failing input 1; Python str gives its digits.
    assert found["value"] == entry.first_failing_input
    assert found["expected"] == [1, 0, 0, 0]
    cycles = [c["cycle"] for c in failing["run"]]
    assert cycles == list(range(len(cycles)))
    assert failing["run"][found["read_cycle"]]["outputs"]["done"] == 1


def test_testbench_option_writes_a_bench_that_fails_in_icarus(tmp_path):
    entry = CLOCKED["meter_serial_count_bug"]
    bench = tmp_path / "bench.v"
    run = _invoke(entry.path, "--top", entry.top, "--testbench", bench)
    assert run.exit_code == 1
    output = run_icarus([entry.path], "bcdprove_tb", bench.read_text())
    assert "bcdprove testbench: FAIL run 1" in output


def test_clocked_options_on_a_combinational_design_are_an_error():
    run = _invoke("designs/comb/scale_gates8.v", "--top", "scale_gates8", "--clock", "clk")
    assert run.exit_code != 0
    assert "has no registers" in str(run.exception)


# bcdprove eval --cycles -------------------------------------------------------------------
def _eval(monkeypatch, capsys, *arguments):
    monkeypatch.setattr(sys, "argv", ["bcdprove", "eval", *[str(a) for a in arguments]])
    try:
        main()
        code = 0
    except SystemExit as done:
        code = done.code
    out, err = capsys.readouterr()
    return code, out, err


def _icarus_conversion(entry, value: int, cycles: int) -> list[tuple]:
    """(done, bcd) per cycle from Icarus: reset in cycle 0, start with ``value`` in cycle 1."""
    bench = f"""
`timescale 1ns/1ns
module bench;
  reg clk, rst, start; reg [11:0] reading; wire done; wire [15:0] bcd;
  {entry.top} dut (.clk(clk), .rst(rst), .start(start), .reading(reading), .done(done), .bcd(bcd));
  integer t;
  initial begin
    clk = 0; #2;
    for (t = 0; t < {cycles}; t = t + 1) begin
      #1; rst = (t == 0); start = (t == 1); reading = {value};
      #7; $display("%0d %0d", done, bcd);
      #1; clk = 1; #1; clk = 0;
    end
    $finish;
  end
endmodule
"""
    text = run_icarus([entry.path], "bench", bench)
    rows = [line.split() for line in text.splitlines() if line.strip()]
    assert len(rows) == cycles, text
    # Cycle 0 shows the power-up x of the registers; the others are numbers.
    return [(None, None)] + [(int(done), int(bcd)) for done, bcd in rows[1:]]


def test_eval_cycles_matches_icarus_and_python(monkeypatch, capsys, tmp_path):
    entry = CLOCKED["meter_serial_bcd"]
    vectors = tmp_path / "run.txt"
    vectors.write_text("# reset, then convert 907\nrst=1 start=0 reading=907\n"
                       "rst=0 start=1\nstart=0\n")
    code, out, _ = _eval(monkeypatch, capsys, entry.path, "--top", entry.top, "--cycles", 16,
                         "--vectors", vectors, "--json")
    assert code == 0
    rows = [json.loads(line) for line in out.splitlines()]
    assert [r["cycle"] for r in rows] == list(range(16))
    reference = _icarus_conversion(entry, 907, 16)
    for row, (done, bcd) in zip(rows[1:], reference[1:]):     # cycle 0: power-up x
        assert (int(row["outputs"]["done"]), int(row["outputs"]["bcd"])) == (done, bcd)
    assert int(rows[14]["outputs"]["bcd"]) == int(str(907), 16)   # Python str: packed BCD


def test_eval_cycles_with_at_lines_and_per_cycle_settings(monkeypatch, capsys, tmp_path):
    entry = CLOCKED["meter_serial_bcd"]
    vectors = tmp_path / "run.txt"
    vectors.write_text("@0 rst=1 start=0 reading=0\n@1 rst=0 start=1 reading=42 start@2=0\n")
    code, out, _ = _eval(monkeypatch, capsys, entry.path, "--top", entry.top, "--cycles", 15,
                         "--vectors", vectors)
    assert code == 0
    last = out.splitlines()[-1].split()
    assert last[0] == "14" and last[-1] == "0x0042"      # 42 in BCD (Python str)


def test_eval_cycles_shows_power_up_values_as_x(monkeypatch, capsys):
    entry = CLOCKED["meter_serial_bcd"]
    code, out, _ = _eval(monkeypatch, capsys, entry.path, "--top", entry.top, "--cycles", 1,
                         "--set", "rst=0", "--set", "start=0", "--set", "reading=1")
    assert code == 0
    assert out.splitlines()[-1].split()[-1] == "0xxxxx"


def test_eval_rejects_values_for_the_clock(monkeypatch, capsys):
    entry = CLOCKED["meter_serial_bcd"]
    code, _, err = _eval(monkeypatch, capsys, entry.path, "--top", entry.top, "--cycles", 2,
                         "--set", "clk@1=1")
    assert code == 2 and "is the clock" in err


def test_eval_without_cycles_keeps_its_one_vector_form(monkeypatch, capsys):
    code, out, _ = _eval(monkeypatch, capsys, "designs/comb/scale_gates8.v", "--top",
                         "scale_gates8", "--set", f"{_only_input('scale_gates8')}=255", "--json")
    assert code == 0
    record = json.loads(out)
    packed = sum(int(v) for v in record["outputs"].values())
    assert packed == int(str(255), 16)                 # Python str: 255 in BCD


def _only_input(top: str) -> str:
    from tests.designs.catalog import load_catalog
    return next(e for e in load_catalog() if e.top == top).inputs[0]

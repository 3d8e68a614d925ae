"""Clocked designs: the registers' next-state functions step like the hardware does.

The shipped serial converter is run cycle by cycle on its Register.next functions; the digits
it shows when done must be Python's str(int) digits of the input.
"""
from __future__ import annotations

from pathlib import Path

from bcdprove.model import Op, evaluate, leaves
from bcdprove.verilog import read_design

DESIGNS = Path(__file__).resolve().parents[2] / "designs"


def _step(model, state: dict[str, int], inputs: dict[str, int]) -> dict[str, int]:
    env = {}
    for port in model.inputs:
        env[port.node.id] = inputs.get(port.name, 0)
    for register in model.registers:
        env[register.state.id] = state[register.name]
    roots = [r.next for r in model.registers]
    for leaf in leaves(roots):
        env.setdefault(leaf.id, 0)
    return dict(zip([r.name for r in model.registers], evaluate(roots, env)))


def _outputs(model, state, inputs):
    env = {p.node.id: inputs.get(p.name, 0) for p in model.inputs}
    for register in model.registers:
        env[register.state.id] = state[register.name]
    roots = [p.node for p in model.outputs]
    for leaf in leaves(roots):
        env.setdefault(leaf.id, 0)
    return dict(zip([p.name for p in model.outputs], evaluate(roots, env)))


def test_serial_converter_steps_to_the_decimal_digits():
    path = DESIGNS / "clocked" / "meter_serial_bcd.v"
    model = read_design([str(path)], "meter_serial_bcd")
    assert {r.name for r in model.registers} == {"pending", "digits", "remaining", "busy", "done"}
    assert all(r.clock == "clk" and r.edge == "posedge" and r.reset is None
               for r in model.registers)
    for reading in (0, 7, 1234, 4095, 999):
        state = {r.name: 0 for r in model.registers}
        state = _step(model, state, {"rst": 1})
        state = _step(model, state, {"start": 1, "reading": reading})
        for _ in range(12):
            state = _step(model, state, {"reading": reading})
        shown = _outputs(model, state, {})
        assert shown["done"] == 1
        digits = [(shown["bcd"] >> (4 * k)) & 15 for k in range(4)]
        assert digits == [int(c) for c in reversed(f"{reading:04d}")]   # Python reference


def test_asynchronous_reset_register():
    path = DESIGNS / "clocked" / "pump_serial_bcd_async.v"
    model = read_design([str(path)], "pump_serial_bcd_async")
    resets = [r.reset for r in model.registers if r.reset is not None]
    assert resets, "the async design has registers with a reset"
    assert all(reset.value.op == Op.CONST for reset in resets)

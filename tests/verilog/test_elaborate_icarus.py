"""The model against Icarus Verilog on small designs mixing many constructs.

Each fixture in verilog_cases/ is elaborated and run in Icarus on the same input vectors;
every output digit Icarus prints as known must equal the model's value (digits Icarus shows
as x are unknown in Verilog, which the model holds as free values).
"""
from __future__ import annotations

import pytest

from bcdprove.verilog import read_design
from tests.verilog.test_elaborate_helpers import (CASES, agrees, icarus_outputs, outputs,
                                                  random_vectors)

FIXTURES = ["mixed_widths", "procedural_mix", "hierarchy_mix"]


@pytest.mark.parametrize("name", FIXTURES)
def test_model_agrees_with_icarus(name):
    source = CASES / f"{name}.v"
    model = read_design([str(source)], name)
    vectors = random_vectors(model, 60)
    printed = icarus_outputs(source, name, model, vectors)
    assert len(printed) == len(vectors)
    for vector, line in zip(vectors, printed):
        got = outputs(model, **vector)
        for port in model.outputs:
            assert agrees(line[port.name], got[port.name], port.width), \
                (name, vector, port.name, line[port.name], hex(got[port.name]))

"""Port inference: the data input and the digit outputs, with the reason for each choice."""
from __future__ import annotations

import pytest

from bcdprove.errors import BcdproveError
from bcdprove.model.design import Model, Port
from bcdprove.model.node import Graph
from bcdprove.spec.bin2bcd import build_problem
from tests.spec.hand_models import packed_converter, split_converter


def _model(inputs: dict[str, int], outputs: dict[str, int]) -> Model:
    """A model whose outputs are slices of the first input (only the ports matter here)."""
    graph = Graph()
    ports = []
    first = None
    for name, width in inputs.items():
        node = graph.input(name, width)
        first = first or node
        ports.append(Port(name, "input", width, False, node))
    for name, width in outputs.items():
        ports.append(Port(name, "output", width, False, graph.resize(first, width)))
    return Model(graph=graph, top="t", files=["<hand-built>"], ports=ports)


def test_only_input_and_only_output():
    problem = build_problem(packed_converter(8, 3))
    assert problem.input_ports == ["bin"] and problem.output_ports == ["bcd"]
    assert problem.reasons[:2] == ["input `bin`: the only input", "output `bcd`: the only output"]


def test_one_bit_controls_are_not_the_data_input():
    problem = build_problem(packed_converter(8, 3, enable=True))
    assert problem.input_ports == ["bin"]
    assert "only input wider than one bit" in problem.reasons[0]
    assert "`en`" in problem.reasons[0]


def test_ambiguous_inputs_ask_for_in():
    with pytest.raises(BcdproveError, match="--in PORT"):
        build_problem(_model({"a": 8, "b": 8}, {"y": 12}))
    problem = build_problem(_model({"a": 8, "b": 8}, {"y": 12}), inputs=["b"])
    assert problem.input_ports == ["b"] and "named with --in" in problem.reasons[0]


def test_place_word_outputs_in_any_declaration_order():
    model = split_converter(8, ["ones", "tens", "hundreds"])
    model.ports.reverse()
    problem = build_problem(model)
    assert problem.output_ports == ["ones", "tens", "hundreds"]
    assert "place names" in problem.reasons[1]


@pytest.mark.parametrize("names", [
    ["bcd0", "bcd1", "bcd2"], ["digit_0", "digit_1", "digit_2"], ["d0", "d1", "d2"],
    ["dig0", "dig1", "dig2"], ["bcd_ones", "bcd_tens", "bcd_hundreds"],
    ["ones", "tens", "hundreds", "thousands", "ten_thousands"],
])
def test_common_digit_naming_patterns(names):
    problem = build_problem(split_converter(16 if len(names) == 5 else 8, names))
    assert problem.output_ports == names


def test_other_outputs_are_ignored_and_said_so():
    model = _model({"bin": 8}, {"d0": 4, "d1": 4, "d2": 2, "overflow": 1})
    problem = build_problem(model)
    assert problem.output_ports == ["d0", "d1", "d2"]
    assert "`overflow` ignored" in problem.reasons[1]


def test_numbered_ports_with_gap_are_not_inferred():
    with pytest.raises(BcdproveError, match="--out PORT"):
        build_problem(_model({"bin": 8}, {"d0": 4, "d2": 4}))


def test_out_list_is_least_significant_first():
    model = _model({"bin": 8}, {"lo": 4, "mid": 4, "hi": 4})
    problem = build_problem(model, outputs=["lo", "mid", "hi"])
    assert problem.output_ports == ["lo", "mid", "hi"]
    assert problem.digit_sources == ["lo[3:0]", "mid[3:0]", "hi[3:0]"]


def test_out_errors():
    model = _model({"bin": 8}, {"lo": 2, "hi": 4})
    with pytest.raises(BcdproveError, match="only the most significant digit"):
        build_problem(model, outputs=["lo", "hi"])
    with pytest.raises(BcdproveError, match="no output port `nope`"):
        build_problem(model, outputs=["nope"])
    with pytest.raises(BcdproveError, match="is an input"):
        build_problem(model, outputs=["bin"])


def test_wide_output_beside_flags():
    problem = build_problem(_model({"bin": 8}, {"bcd": 12, "valid": 1}))
    assert problem.output_ports == ["bcd"]
    assert "at least 4 bits wide" in problem.reasons[1]


def test_clocked_model_is_refused():
    from bcdprove.model.design import Register
    model = packed_converter(8, 3)
    state = model.graph.state("r", 4)
    model.registers.append(Register("r", 4, state, state, "clk", "posedge"))
    with pytest.raises(BcdproveError, match="clocked"):
        build_problem(model)


def test_tying_the_only_input_is_refused():
    with pytest.raises(BcdproveError, match="cannot be tied"):
        build_problem(packed_converter(8, 3), ties={"bin": 1})
    with pytest.raises(BcdproveError, match="both the data input and tied"):
        build_problem(packed_converter(8, 3), inputs=["bin"], ties={"bin": 1})

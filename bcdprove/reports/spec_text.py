"""The text report of the bcd2bin and signed checks (binary-to-BCD has its own, text.py).

Same contract as :func:`~bcdprove.reports.text.check_report`: plain lines, no terminal
codes.  A counterexample shows the input as the user wrote it (digits, or a signed
number), then each checked output with its expected and actual value.
"""
from __future__ import annotations

from ..engines.base import DISPROVED, PROVED, Counterexample
from .text import header_lines, outcome_lines


def _rows(rows: list[tuple[str, ...]]) -> list[str]:
    widths = [max(len(r[c]) for r in rows) for c in range(len(rows[0]))]
    return ["  " + "  ".join(cell.ljust(w) for cell, w in zip(row, widths)).rstrip()
            for row in rows]


def _setting_lines(found: Counterexample, data_ports: list[str]) -> list[str]:
    """What else the counterexample sets: free inputs, unknown values, and its note."""
    lines = []
    others = {k: v for k, v in found.inputs.items() if k not in data_ports}
    if others:
        lines.append("  it also sets the free inputs "
                     + ", ".join(f"{k} = {v}" for k, v in others.items()))
    if found.free_values:
        lines.append(f"  with {len(found.free_values)} unknown value(s) (x in the design) "
                     f"chosen to make the output wrong")
    if found.note:
        lines.append(f"  {found.note}")
    return lines


def _bcd2bin_counterexample(problem, found: Counterexample, heading: str) -> list[str]:
    x = problem.input_value(found)
    ports = ", ".join(f"{name} = 0x{found.inputs[name]:x}" for name in problem.input_ports)
    lines = [f"{heading}: {problem.describe_input(x)}; {ports}"]
    lines.extend(_setting_lines(found, problem.input_ports))
    expectation = problem.expectation(x)
    rows = [("output", "expected", "actual", "")]
    for i, name in enumerate(problem.checked_names):
        want = expectation.values[i]
        mark = "<- wrong" if i in found.wrong else ""
        rows.append((name, "(not checked)" if want is None else f"{want:,}",
                     f"{found.actual[i]:,}", mark))
    return lines + _rows(rows)


def _signed_counterexample(problem, found: Counterexample, heading: str) -> list[str]:
    port = problem.input_ports[0]
    x = found.inputs[port]
    hex_digits = max(1, -(-problem.width // 4))
    lines = [f"{heading}: {port} = {problem.signed_value(x):,} (0x{x:0{hex_digits}x})"]
    lines.extend(_setting_lines(found, [port]))
    rows = [("output", "bits", "expected", "actual", "")]
    labels = ["sign"] + [f"digit {i}" for i in range(problem.digit_count)]
    order = [0] + list(reversed(range(1, len(found.actual))))
    for i in order:
        mark = "<- wrong" if i in found.wrong else ""
        actual = found.actual[i]
        shown = str(actual) if i == 0 or actual <= 9 else f"{actual} (not a digit)"
        rows.append((labels[i], problem.checked_names[i], str(found.expected[i]), shown, mark))
    return lines + _rows(rows)


def counterexample_lines(result, found: Counterexample, heading: str = "counterexample") -> list[str]:
    problem = result.problem
    if problem.spec == "bcd2bin":
        return _bcd2bin_counterexample(problem, found, heading)
    return _signed_counterexample(problem, found, heading)


def _width_lines(problem) -> list[str]:
    if problem.spec == "bcd2bin":
        lines = [f"{'widths':<12}{problem.digit_count} digits in ({problem.width} bits), "
                 f"{problem.out_width}-bit output; {10 ** problem.digit_count - 1:,} needs "
                 f"{problem.needed_bits()} bits"]
        if not problem.fits():
            lines.append(f"{'output':<12}TOO NARROW: {problem.out_width} bits hold at most "
                         f"{problem.capacity() - 1:,}; {problem.digit_count} digits need "
                         f"{problem.needed_bits()} (smallest value that does not fit: "
                         f"{problem.capacity():,})")
        contract = ("digits above 9 must raise the flag" if problem.flag_port
                    else "inputs with a digit above 9 are outside the contract")
        lines.append(f"{'contract':<12}{contract}")
        return lines
    lines = [f"{'widths':<12}{problem.width}-bit two's-complement input "
             f"({problem.most_negative:,} .. {problem.largest_positive:,}), "
             f"{problem.digit_count} digits shown"]
    lines.append(f"{'digits':<12}{problem.most_negative:,} needs "
                 f"{problem.needed_digits()} for its magnitude, "
                 f"{problem.largest_positive:,} needs {problem.needed_digits_positive()}; "
                 + ("the design has them" if problem.fits() else
                    f"TOO FEW: {problem.digit_count} digits show magnitudes up to "
                    f"{problem.capacity() - 1:,}"))
    return lines


def spec_report(result) -> str:
    """The whole report of a bcd2bin or signed check (no trailing newline)."""
    problem = result.problem
    lines = header_lines(result, f"bcdprove check: module `{result.model.top}`, "
                                 f"--spec {problem.spec}")
    lines.extend(_width_lines(problem))
    below = problem.capacity()
    what = "the output" if problem.spec == "bcd2bin" else "the digits present"
    lines.extend(outcome_lines(result, counterexample_lines, {
        PROVED: f"{what} is right for every value below {below:,}",
        DISPROVED: f"{what} is also wrong below {below:,}",
        "": f"{what} was not decided below {below:,}"}))
    return "\n".join(lines)

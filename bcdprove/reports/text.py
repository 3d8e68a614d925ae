"""The default report of ``bcdprove check``: short, plain text a user reads top to bottom.

Contract: :func:`check_report` takes a CheckResult and returns lines without colour or
terminal control codes (it is the same on a terminal, in a pipe and in a log file).
"""
from __future__ import annotations

from ..engines.base import DISPROVED, PROVED, Counterexample, Verdict

VERDICT_WORDS = {PROVED: "PROVED", DISPROVED: "DISPROVED", "unknown": "UNKNOWN"}


def _digit_text(value: int | None) -> str:
    if value is None:
        return "(no such digit)"
    return str(value) if value <= 9 else f"{value} (not a digit)"


def counterexample_lines(result, found: Counterexample, heading: str = "counterexample") -> list[str]:
    """The failing input in decimal and hex, then expected against actual digit by digit."""
    problem = result.problem
    port = problem.input_ports[0]
    x = found.inputs[port]
    hex_digits = max(1, -(-problem.width // 4))
    lines = [f"{heading}: {port} = {x} (0x{x:0{hex_digits}x})"]
    others = {name: value for name, value in found.inputs.items() if name != port}
    if others:
        setting = ", ".join(f"{name} = {value}" for name, value in others.items())
        ties = " ".join(f"--tie {name}=VALUE" for name in others)
        lines.append(f"  it also sets the free inputs {setting}; if they are controls such as an "
                     f"enable, hold them with {ties}")
    if found.free_values:
        lines.append(f"  with {len(found.free_values)} unknown value(s) (x in the design) chosen "
                     f"to make the output wrong")
    if found.note:
        lines.append(f"  {found.note}")
    rows = [("digit", "output bits", "expected", "actual", "")]
    count = len(found.expected)
    first = min(found.wrong) if found.wrong else None
    for i in reversed(range(count)):
        actual = found.actual[i] if i < len(found.actual) else None
        source = problem.digit_sources[i] if i < len(problem.digit_sources) else "(no output)"
        mark = ""
        if i in found.wrong:
            mark = "<- wrong, first" if i == first else "<- wrong"
        rows.append((str(i), source, str(found.expected[i]), _digit_text(actual), mark))
    widths = [max(len(r[c]) for r in rows) for c in range(5)]
    for row in rows:
        lines.append("  " + "  ".join(cell.ljust(w) for cell, w in zip(row, widths)).rstrip())
    if first is not None:
        lines.append(f"  first wrong digit: digit {first} ({_place(first)})")
    return lines


def _place(position: int) -> str:
    names = ["ones", "tens", "hundreds", "thousands", "ten thousands", "hundred thousands",
             "millions", "ten millions", "hundred millions", "billions"]
    return names[position] if position < len(names) else f"10^{position}"


def verdict_lines(label: str, verdict: Verdict) -> list[str]:
    lines = [f"{label:<11} {VERDICT_WORDS.get(verdict.status, verdict.status)} "
             f"({verdict.engine}, {verdict.seconds:.2f} s)"]
    if verdict.covered:
        lines.append(f"{'covered':<12}{verdict.covered}")
    if verdict.reason:
        lines.append(f"{'reason':<12}{verdict.reason}")
    return lines


def header_lines(result, title: str) -> list[str]:
    """The first lines of every check report: what was read and which ports were taken."""
    model, problem = result.model, result.problem
    lines = [title, f"{'files':<12}{', '.join(model.files)}"]
    if model.parameters:
        lines.append(f"{'parameters':<12}"
                     + ", ".join(f"{k}={v}" for k, v in sorted(model.parameters.items())))
    for reason in problem.reasons:
        lines.append(f"{'ports':<12}{reason}")
    return lines


def outcome_lines(result, counterexample, below_words: dict[str, str]) -> list[str]:
    """The last lines of every check report: engine, verdicts, time, notes, counterexamples.

    ``counterexample(result, found, heading)`` writes one counterexample; ``below_words``
    gives the sentence under the second verdict (values below the capacity) for proved,
    disproved and anything else (key "").
    """
    problem, verdict = result.problem, result.verdict
    lines = []
    if result.timeout is not None:
        lines.append(f"{'time limit':<12}{result.timeout:g} s")
    lines.append(f"{'engine':<12}{result.engine}")
    lines.extend(verdict_lines("verdict", verdict))
    below = problem.capacity()
    if result.digits_check is not None:
        check = result.digits_check
        lines.extend(verdict_lines(f"below {below:,}", check))
        lines.append(f"{'':<12}{below_words.get(check.status, below_words[''])}")
    lines.append(f"{'time':<12}{result.seconds:.2f} s in all")
    for note in result.notes:
        lines.append(f"{'note':<12}{note}")
    if verdict.counterexample is not None:
        lines.append("")
        lines.extend(counterexample(result, verdict.counterexample))
    if result.digits_check is not None and result.digits_check.counterexample is not None:
        lines.append("")
        lines.extend(counterexample(result, result.digits_check.counterexample,
                                    heading=f"counterexample below {below:,}"))
    return lines


def check_report(result) -> str:
    """The whole report as one string (no trailing newline)."""
    if result.problem.spec != "bin2bcd":
        from .spec_text import spec_report
        return spec_report(result)
    model, problem = result.model, result.problem
    lines = header_lines(result, f"bcdprove check: module `{model.top}`")
    top = problem.top_value
    range_text = (f"inputs 0 .. {top:,} (--max-input)" if problem.max_input is not None
                  else f"all {problem.width}-bit inputs, 0 .. {top:,}")
    lines.append(f"{'widths':<12}{problem.width}-bit input, {problem.digit_count} digits shown, "
                 f"{problem.needed_digits()} needed for {top:,}; {range_text}")
    if problem.msd_first:
        lines.append(f"{'order':<12}most significant digit in the low nibble (--msd-first)")
    if not problem.fits():
        lines.append(f"{'digits':<12}TOO FEW: {problem.digit_count} digits show at most "
                     f"{problem.capacity() - 1:,}; {problem.width} bits need "
                     f"{problem.needed_digits()} (smallest value that does not fit: "
                     f"{problem.capacity():,})")
    below = problem.capacity()
    lines.extend(outcome_lines(result, counterexample_lines, {
        PROVED: f"the digits present are right for every input below {below:,}",
        DISPROVED: f"the digits present are also wrong below {below:,}",
        "": "the digits present were not decided"}))
    return "\n".join(lines)

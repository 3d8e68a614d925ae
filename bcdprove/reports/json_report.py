"""The ``--json`` report: exactly one JSON object describing one check.

Numbers that can exceed what JSON readers hold exactly (inputs, digit values) are decimal
strings; counts and seconds are plain numbers.
"""
from __future__ import annotations

import json

from ..engines.base import Counterexample, Verdict


def counterexample_record(found: Counterexample) -> dict:
    """inputs {PORT: "DECIMAL"}, expected and actual digits (decimal strings, least significant
    first), wrong_digits (positions), free_values (unknown values chosen), note."""
    return {
        "inputs": {name: str(value) for name, value in found.inputs.items()},
        "expected": [str(d) for d in found.expected],
        "actual": [str(d) for d in found.actual],
        "wrong_digits": list(found.wrong),
        "free_values": {str(k): str(v) for k, v in found.free_values.items()},
        "replayed": found.replayed,
        "note": found.note,
    }


def _verdict_record(verdict: Verdict) -> dict:
    record = {"verdict": verdict.status, "engine": verdict.engine,
              "seconds": round(verdict.seconds, 6), "covered": verdict.covered,
              "reason": verdict.reason, "stats": _plain(verdict.stats)}
    if verdict.counterexample is not None:
        record["counterexample"] = counterexample_record(verdict.counterexample)
    return record


def _plain(value):
    """Stats as JSON-safe values (anything unusual becomes its text)."""
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, (bool, int, float, str)) or value is None:
        return value
    return str(value)


def check_record(result) -> dict:
    """The report as a dict (see the module docstring for the number convention)."""
    model, problem = result.model, result.problem
    record = _verdict_record(result.verdict)
    record["engine_requested"] = result.engine
    record["seconds"] = round(result.seconds, 6)
    if problem.spec != "bin2bcd":
        return _spec_record(result, record)
    record["design"] = {
        "files": list(model.files),
        "top": model.top,
        "parameters": {k: str(v) for k, v in model.parameters.items()},
        "ports": {"input": problem.input_ports[0], "outputs": list(problem.output_ports),
                  "digit_bits": list(problem.digit_sources), "reasons": list(problem.reasons),
                  "ties": {k: str(v) for k, v in problem.ties.items()},
                  "msd_first": problem.msd_first},
        "widths": {"input": problem.width, "digits": problem.digit_count,
                   "digits_needed": problem.needed_digits()},
        "max_input": None if problem.max_input is None else str(problem.max_input),
    }
    if result.digits_check is not None:
        record["digits_check"] = {"below": str(problem.capacity()),
                                  **_verdict_record(result.digits_check)}
    record["notes"] = list(result.notes)
    return record


def _spec_record(result, record: dict) -> dict:
    """The bcd2bin and signed reports: ``spec``, the ports by role, the widths, and with a
    counterexample ``input_value`` (the digits' number, or the signed input) beside the
    port values, and ``not_checked`` (outputs that do not matter at that input)."""
    model, problem = result.model, result.problem
    record["spec"] = problem.spec
    ports = {"inputs": list(problem.input_ports), "outputs": list(problem.output_ports),
             "checked": list(problem.checked_names), "reasons": list(problem.reasons),
             "ties": {k: str(v) for k, v in problem.ties.items()}}
    if problem.spec == "bcd2bin":
        ports["invalid_flag"] = problem.flag_port
        widths = {"digits": problem.digit_count, "output": problem.out_width,
                  "output_needed": problem.needed_bits()}
    else:
        ports["sign"] = problem.sign_port
        widths = {"input": problem.width, "digits": problem.digit_count,
                  "digits_needed": problem.needed_digits(),
                  "digits_needed_positive": problem.needed_digits_positive()}
    record["design"] = {"files": list(model.files), "top": model.top,
                        "parameters": {k: str(v) for k, v in model.parameters.items()},
                        "ports": ports, "widths": widths}
    for verdict, key in ((result.verdict, None), (result.digits_check, "digits_check")):
        if verdict is None:
            continue
        target = record if key is None else record.setdefault(key, {})
        if key is not None:
            target.update({"below": str(problem.capacity()), **_verdict_record(verdict)})
        if verdict.counterexample is not None:
            x = problem.input_value(verdict.counterexample)
            value = (problem.signed_value(x) if problem.spec == "signed"
                     else _digits_number(problem, x))
            target["counterexample"]["input_value"] = None if value is None else str(value)
            # Positions of checked outputs that do not matter at this input (the binary value
            # next to a raised invalid-digit flag): their "expected" is the actual value.
            target["counterexample"]["not_checked"] = [
                i for i, want in enumerate(problem.expectation(x).values) if want is None]
    record["notes"] = list(result.notes)
    return record


def _digits_number(problem, x: int):
    from ..spec.bcd2bin import bcd_value
    return bcd_value(x, problem.digit_count)


def check_json(result) -> str:
    """The report as one line of JSON text."""
    return json.dumps(check_record(result), sort_keys=False)


def equiv_record(result) -> dict:
    """The report of ``bcdprove equiv`` as a dict: verdict, engine, seconds, both designs, the
    port pairs, the counterexample (inputs and both designs' outputs, decimal strings) and
    the engine's stats (pairs proposed/proved/refuted, z3 queries, the slowest)."""
    problem, verdict = result.problem, result.verdict
    record = {"verdict": verdict.status, "engine": verdict.engine,
              "seconds": round(verdict.seconds, 6), "covered": verdict.covered,
              "reason": verdict.reason, "stats": _plain(verdict.stats)}
    record["engine_requested"] = result.engine
    record["seconds"] = round(result.seconds, 6)
    record["designs"] = {
        label: {"files": list(model.files), "top": model.top,
                "parameters": {k: str(v) for k, v in model.parameters.items()}}
        for label, model in (("design", result.model_a), ("against", result.model_b))}
    record["ports"] = {
        "inputs": [{"design": p.name_a, "against": p.name_b, "width": p.width}
                   for p in problem.inputs],
        "outputs": [{"design": o.name_a, "against": o.name_b, "width": o.width}
                    for o in problem.outputs],
        "reasons": list(problem.reasons)}
    found = verdict.counterexample
    if found is not None:
        record["counterexample"] = {
            "inputs": {name: str(value) for name, value in found.inputs.items()},
            "outputs": [{"design": o.name_a, "against": o.name_b, "width": o.width,
                         "design_value": str(o.value_a), "against_value": str(o.value_b),
                         "differs": o.differs, "differing_bits": hex(o.value_a ^ o.value_b)}
                        for o in found.outputs],
            "differing": found.differing,
            "unknown_values": {"design": {str(k): str(v) for k, v in found.free_values_a.items()},
                               "against": {str(k): str(v) for k, v in found.free_values_b.items()}},
            "replayed": found.replayed,
        }
    record["notes"] = list(result.notes)
    return record


def equiv_json(result) -> str:
    """The report of ``bcdprove equiv`` as one line of JSON text."""
    return json.dumps(equiv_record(result), sort_keys=False)

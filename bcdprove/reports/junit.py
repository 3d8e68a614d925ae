"""The ``--junit`` report: JUnit XML with one testsuite and one testcase per check.

Mapping: proved passes; disproved is a ``failure``; unknown is an ``error`` (not
``skipped``), because CI tools usually count skipped tests as green and an undecided check
must not look like a pass.  When the design shows too few digits there are two testcases:
the whole contract, and the digits present below 10**D.
"""
from __future__ import annotations

import xml.etree.ElementTree as ElementTree

from ..engines.base import DISPROVED, UNKNOWN, Verdict


def _case(suite, name: str, classname: str, verdict: Verdict, detail: str) -> None:
    case = ElementTree.SubElement(suite, "testcase", name=name, classname=classname,
                                  time=f"{verdict.seconds:.3f}")
    if verdict.status == DISPROVED:
        found = verdict.counterexample
        message = "counterexample: " + ", ".join(f"{k}={v}" for k, v in found.inputs.items())
        element = ElementTree.SubElement(case, "failure", message=message, type="disproved")
        element.text = detail
    elif verdict.status == UNKNOWN:
        element = ElementTree.SubElement(case, "error", message=verdict.reason or "not decided",
                                         type="unknown")
        element.text = detail
    else:
        out = ElementTree.SubElement(case, "system-out")
        out.text = verdict.covered


def _document(checks: list[tuple[str, Verdict]], classname: str, seconds: float,
              detail: str) -> str:
    suite = ElementTree.Element(
        "testsuite", name="bcdprove", tests=str(len(checks)),
        failures=str(sum(v.status == DISPROVED for _, v in checks)),
        errors=str(sum(v.status == UNKNOWN for _, v in checks)), skipped="0",
        time=f"{seconds:.3f}")
    for name, verdict in checks:
        _case(suite, name, classname, verdict, detail)
    ElementTree.indent(suite)
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + ElementTree.tostring(
        suite, encoding="unicode") + "\n"


def check_junit(result) -> str:
    """The XML document as text (with an XML declaration)."""
    from .text import check_report

    problem = result.problem
    checks = [(f"{result.model.top}: {problem.spec}", result.verdict)]
    if result.digits_check is not None:
        checks.append((f"{result.model.top}: {problem.spec} below {problem.capacity()}",
                       result.digits_check))
    return _document(checks, f"bcdprove.{result.model.top}", result.seconds, check_report(result))


def clocked_junit(result) -> str:
    """The XML document of a clocked check: one testcase per protocol obligation (the first
    conversion after reset, the second without a reset, a pipeline's latency, ...)."""
    from .clocked_text import clocked_report

    checks = [(f"{result.model.top}: bin2bcd, {o.main.title}", o.verdict)
              for o in result.obligations]
    return _document(checks, f"bcdprove.{result.model.top}", result.seconds,
                     clocked_report(result))


def equiv_junit(result) -> str:
    """The XML document of ``bcdprove equiv``: one testcase, the equivalence of the two tops."""
    from .equiv_text import equiv_report

    name = f"{result.model_a.top} against {result.model_b.top}: equivalence"
    return _document([(name, result.verdict)], f"bcdprove.{result.model_a.top}", result.seconds,
                     equiv_report(result))

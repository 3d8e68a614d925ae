"""Text, JSON and JUnit reports of a check, read back and checked field by field."""
from __future__ import annotations

import json
import xml.etree.ElementTree as ElementTree

from bcdprove.checking import check_model
from bcdprove.reports.json_report import check_json
from bcdprove.reports.junit import check_junit
from bcdprove.reports.text import check_report
from tests.spec.hand_models import packed_converter


def _check(**kwargs):
    options = {"random_vectors": 1 << 10}
    options.update(kwargs.pop("options", {}))
    return check_model(packed_converter(8, kwargs.pop("digits", 3), **kwargs), **options)


def test_text_report_of_a_proof_names_ports_widths_engine():
    text = check_report(_check())
    assert "module `conv`" in text
    assert "input `bin`: the only input" in text
    # 8 bits need 3 digits: 255 has three (Python str)
    assert "8-bit input, 3 digits shown, 3 needed for 255" in text
    assert "PROVED" in text and "all 256 inputs simulated" in text


def test_text_report_of_a_counterexample_marks_the_wrong_digit():
    text = check_report(_check(threshold=4))
    assert "DISPROVED" in text
    # 8 is 0x08; the converter that adds 3 at >= 4 shows 14 in the ones nibble (scalar model)
    assert "counterexample: bin = 8 (0x08)" in text
    assert "14 (not a digit)" in text
    assert "first wrong digit: digit 0 (ones)" in text


def test_text_report_of_free_enable_suggests_tie():
    text = check_report(_check(enable=True))
    assert "en = 0" in text and "--tie en=VALUE" in text


def test_text_report_of_too_few_digits():
    text = check_report(_check(digits=2))
    # two digits show at most 99, 8 bits need 3 (Python str of 255); 10**2 = 100
    assert "TOO FEW" in text and "smallest value that does not fit: 100" in text
    assert "right for every input below 100" in text


def test_json_report_is_one_object_with_the_contract_fields():
    record = json.loads(check_json(_check(threshold=4)))
    for key in ("verdict", "engine", "seconds", "design", "covered", "reason"):
        assert key in record
    assert record["verdict"] == "disproved"
    design = record["design"]
    assert design["top"] == "conv" and design["ports"]["input"] == "bin"
    assert design["widths"] == {"input": 8, "digits": 3, "digits_needed": 3}
    found = record["counterexample"]
    assert found["inputs"] == {"bin": "8"}
    assert found["expected"] == ["8", "0", "0"]     # digits of 8, Python str
    assert found["actual"][0] == "14"
    assert found["wrong_digits"] == [0]


def test_json_report_of_too_few_digits_has_the_second_check():
    record = json.loads(check_json(_check(digits=2)))
    assert record["verdict"] == "disproved"
    assert record["counterexample"]["inputs"] == {"bin": "100"}   # 10**2
    assert record["digits_check"]["verdict"] == "proved"
    assert record["digits_check"]["below"] == "100"


def _suite(result):
    root = ElementTree.fromstring(check_junit(result).split("\n", 1)[1])
    assert root.tag == "testsuite"
    # the usual JUnit schema requires these attributes on testsuite and testcase
    for attribute in ("name", "tests", "failures", "errors"):
        assert attribute in root.attrib
    for case in root.iter("testcase"):
        assert "name" in case.attrib and "classname" in case.attrib
    return root


def test_junit_of_a_proof_has_no_failure():
    root = _suite(_check())
    assert root.attrib["tests"] == "1" and root.attrib["failures"] == "0"
    assert root.find("testcase/failure") is None and root.find("testcase/error") is None


def test_junit_of_a_disproof_has_a_failure():
    root = _suite(_check(threshold=4))
    assert root.attrib["failures"] == "1"
    assert "bin=8" in root.find("testcase/failure").attrib["message"]


def test_junit_of_unknown_is_an_error():
    root = _suite(_check(options={"engine": "random"}))
    assert root.attrib["errors"] == "1"
    assert root.find("testcase/error").attrib["type"] == "unknown"


def test_junit_of_too_few_digits_has_two_cases():
    root = _suite(_check(digits=2))
    assert root.attrib["tests"] == "2" and root.attrib["failures"] == "1"

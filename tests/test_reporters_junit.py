"""JUnit XML report, read back with junitparser (a general-purpose JUnit XML library)."""

from __future__ import annotations

import xml.etree.ElementTree as ET

import pytest
from conftest import SAMPLES, run_cli
from report_factory import table_report, with_extra_findings

from sequencecheck.reporters import REPORTERS, render
from sequencecheck.rules import rule_ids

junitparser = pytest.importorskip("junitparser")


def _parse(text: str):
    # junitparser (general-purpose library) reads the XML back; ElementTree checks well-formedness.
    # Only reading: junitparser's add_testcase is O(n) per call, too slow to build large suites.
    ET.fromstring(text.encode("utf-8"))
    return junitparser.JUnitXml.fromstring(text)


def _cases(suite) -> dict[str, object]:
    return {case.name: case for case in suite}


def test_registered_as_junit():
    assert "junit" in REPORTERS


def test_one_suite_per_input_and_one_case_per_leg_and_rule():
    report = table_report()
    xml = _parse(render(report, "junit"))
    suites = list(xml)
    assert [s.name for s in suites] == [r.input for r in report.inputs]
    checked = suites[0]
    expected = {f"leg {leg}: {rule}" for leg in ("U", "V") for rule in rule_ids()}
    assert set(_cases(checked)) == expected
    assert checked.tests == len(expected)
    assert checked.failures == 2  # leg U dead-time and leg U shoot-through


def test_failures_carry_time_measured_required_and_margin():
    xml = _parse(render(table_report(), "junit"))
    cases = _cases(next(iter(xml)))
    dead = cases["leg U: dead-time"]
    assert not dead.is_passed
    (failure,) = dead.result
    # UL off at 1000 ns, UH on at 1100 ns (report_factory.TABLE_EDGES); 300 ns required
    assert failure.type == "dead-time"
    assert "worst margin -200 ns" in failure.message
    text = failure.text
    assert "at 1 us" in text and "measured 100 ns" in text
    assert "required 300 ns" in text and "margin -200 ns" in text
    assert "pump/inverter.table:3" in text and "pump/inverter.table:4" in text
    shoot = cases["leg U: shoot-through"]
    (failure,) = shoot.result
    assert "at 5 us" in failure.text and "measured 200 ns" in failure.text
    for name in ("leg V: dead-time", "leg V: shoot-through"):
        assert cases[name].is_passed


def test_unreadable_input_is_an_errored_suite():
    xml = _parse(render(table_report(), "junit"))
    failed = list(xml)[1]
    assert failed.errors == 1
    (case,) = list(failed)
    (error,) = case.result
    assert isinstance(error, junitparser.Error)
    assert "no such file" in error.message


def test_warnings_go_to_system_out_and_inconclusive_still_fails():
    xml = _parse(render(with_extra_findings(table_report()), "junit"))
    capture = _cases(list(xml)[2])
    dead = capture["leg U: dead-time"]
    assert "[inconclusive at this sample rate]" in dead.result[0].text
    odd = capture["bridge: odd-input"]
    assert odd.is_passed
    assert "unregistered rule's warning" in odd.system_out


def test_xml_illegal_characters_are_replaced():
    names = {"UH": "U\x01H", "UL": "<b>x</b>"}
    text = render(table_report(names), "junit")
    assert "\x01" not in text
    xml = _parse(text)
    failure = _cases(next(iter(xml)))["leg U: dead-time"].result[0]
    assert "<b>x</b>" in failure.text  # escaped in the file, read back as the name
    assert "U\ufffdH" in failure.text


def test_cli_junit_on_the_demo_capture(tmp_path):
    out = tmp_path / "results.xml"
    r = run_cli(
        "check", str(SAMPLES / "cart_faulty.csv"), "--dead-time", "500ns",
        "--format", "junit", "--output", str(out),
    )  # fmt: skip
    assert r.returncode == 1, r.stderr
    xml = junitparser.JUnitXml.fromfile(str(out))
    (suite,) = list(xml)
    cases = _cases(suite)
    # the demo generator injects a 150 ns dead time at 1.18 ms and a 100 ns overlap at 3.05075 ms
    assert "at 1.180 ms: measured 150 ns" in cases["leg A: dead-time"].result[0].text
    assert "at 3.050 750 ms: measured 100 ns" in cases["leg A: shoot-through"].result[0].text
    assert cases["leg B: dead-time"].is_passed

"""JUnit XML report: one test suite per input, one test case per leg and rule.

A test case fails when its leg broke its rule; the failure lists every such finding
with its time, measured value, requirement and margin. An input that could not be
read becomes a suite with one errored test case.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

from ..findings import Finding, InputReport, Report
from ..rules import rule_ids
from ..units import format_time
from ._common import finding_summary, group_by_leg_and_rule, leg_rule_pairs, xml_safe

__all__ = ["render_junit"]


def _sub(parent: ET.Element, tag: str, **attrs: object) -> ET.Element:
    return ET.SubElement(parent, tag, {k: xml_safe(v) for k, v in attrs.items()})


def _failure(case: ET.Element, rule: str, found: list[Finding], unlisted: int) -> None:
    worst = min((f.margin_ps for f in found if f.margin_ps is not None), default=None)
    message = f"{len(found) + unlisted} violation(s)"
    if worst is not None:
        message += f", worst margin {format_time(worst)}"
    failure = _sub(case, "failure", message=message, type=rule)
    lines = [finding_summary(f) for f in found]
    if unlisted:
        lines.append(f"... and {unlisted} more not listed (raise --max-findings to list them)")
    failure.text = xml_safe("\n".join(lines))


def _suite(root: ET.Element, r: InputReport, ids: tuple[str, ...]) -> tuple[int, int, int]:
    suite = _sub(root, "testsuite", name=r.input, time="0")
    if r.error is not None:
        case = _sub(suite, "testcase", classname=r.input, name="read input", time="0")
        _sub(case, "error", message=r.error, type="input-error").text = xml_safe(r.error)
        suite.attrib.update(tests="1", failures="0", errors="1", skipped="0")
        return 1, 0, 1
    props = _sub(suite, "properties")
    checked = {
        "kind": r.kind,
        "rows": r.rows,
        "edges": r.edges,
        "start": format_time(r.start_ps),
        "end": format_time(r.end_ps),
        "sample_period": "" if r.sample_period_ps is None else format_time(r.sample_period_ps),
        "channels": ", ".join(r.channels),
    }
    for name, value in checked.items():
        _sub(props, "property", name=name, value=value)
    violations = group_by_leg_and_rule(r.violations)
    others = group_by_leg_and_rule(f for f in r.findings if not f.is_violation)
    tests = failures = 0
    for leg, rule in leg_rule_pairs(r, ids):
        where = "bridge" if leg is None else f"leg {leg}"
        case = _sub(suite, "testcase", classname=r.input, name=f"{where}: {rule}", time="0")
        tests += 1
        unlisted = r.unlisted.get((rule, leg), 0)
        if (leg, rule) in violations or unlisted:
            failures += 1
            _failure(case, rule, violations.get((leg, rule), []), unlisted)
        if (leg, rule) in others:
            out = _sub(case, "system-out")
            out.text = xml_safe("\n".join(finding_summary(f) for f in others[leg, rule]))
    suite.attrib.update(tests=str(tests), failures=str(failures), errors="0", skipped="0")
    return tests, failures, 0


def render_junit(report: Report) -> str:
    """The report as JUnit XML text (UTF-8, with an XML declaration)."""
    root = ET.Element("testsuites", {"name": "sequencecheck"})
    ids = rule_ids()
    totals = [0, 0, 0]
    for r in report.inputs:
        for i, n in enumerate(_suite(root, r, ids)):
            totals[i] += n
    root.attrib.update(tests=str(totals[0]), failures=str(totals[1]), errors=str(totals[2]))
    root.attrib["time"] = "0"
    ET.indent(root, space=" ")
    body = ET.tostring(root, encoding="unicode")
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + body + "\n"

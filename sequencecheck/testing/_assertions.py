"""Assertions for tests of controller code: fail with the findings as the text report shows them."""

from __future__ import annotations

from ..findings import InputReport, Report
from ..model import Bridge, Policy, Trace
from ..reporters import render
from ..rules import run

__all__ = ["SafetyAssertionError", "assert_safe"]


class SafetyAssertionError(AssertionError):
    """An AssertionError that keeps the InputReport it was raised for (``.report``)."""

    def __init__(self, message: str, report: InputReport) -> None:
        super().__init__(message)
        self.report = report


def assert_safe(trace: Trace, bridge: Bridge, policy: Policy | None = None) -> InputReport:
    """Run every registered rule over ``trace``; raise if any finding fails the run.

    The error's message is the text report of the findings (the same lines
    ``sequencecheck check`` prints), so pytest shows each violation with its time,
    measured value, requirement and margin. With ``policy.strict`` warnings fail
    too. Returns the InputReport when the trace is safe, for further checks.
    """
    policy = policy or Policy()
    result = run(trace, bridge, policy)
    report = Report((result,))
    if report.exit_status(strict=policy.strict) == 0:
        return result
    failing = len(result.violations) + (len(result.warnings) if policy.strict else 0)
    head = f"gate sequence is not safe: {failing} finding(s) in {trace.path}"
    raise SafetyAssertionError(f"{head}\n\n{render(report, 'text')}", result)

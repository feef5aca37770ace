"""Helpers several reporters share: grouping findings and making text safe for XML."""

from __future__ import annotations

import re
from collections.abc import Iterable, Sequence

from ..findings import Certainty, Finding, InputReport
from ..units import format_time

__all__ = ["finding_summary", "group_by_leg_and_rule", "leg_rule_pairs", "xml_safe"]

# Characters XML 1.0 forbids (ElementTree writes them anyway and makes invalid XML).
_XML_ILLEGAL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")


def xml_safe(text: object) -> str:
    """``text`` as str with every character XML 1.0 forbids replaced by U+FFFD."""
    return _XML_ILLEGAL.sub("\ufffd", str(text))


def leg_rule_pairs(r: InputReport, rule_ids: Sequence[str]) -> list[tuple[str | None, str]]:
    """Every (leg, rule) pair to report on for one input, legs and rules in their
    given order; rules seen only in findings (not registered) come last, and
    findings that belong to no leg give ``(None, rule)`` pairs."""
    rules = list(rule_ids)
    legs: list[str | None] = list(r.legs)
    for f in r.findings:
        if f.rule not in rules:
            rules.append(f.rule)
        if f.leg not in legs:
            legs.append(f.leg)
    return [(leg, rule) for leg in legs for rule in rules]


def group_by_leg_and_rule(
    findings: Iterable[Finding],
) -> dict[tuple[str | None, str], list[Finding]]:
    """Findings keyed by ``(leg, rule)``, each list in the input order."""
    groups: dict[tuple[str | None, str], list[Finding]] = {}
    for f in findings:
        groups.setdefault((f.leg, f.rule), []).append(f)
    return groups


def finding_summary(f: Finding) -> str:
    """One line with time, measured, required, margin and where: ``at 1.15 us: ...``."""
    parts = [f"at {format_time(f.start_ps)}: measured {format_time(f.measured_ps)}"]
    if f.required_ps is not None:
        parts.append(f"required {format_time(f.required_ps)}")
    if f.margin_ps is not None:
        parts.append(f"margin {format_time(f.margin_ps)}")
    text = ", ".join(parts)
    if f.certainty is Certainty.INCONCLUSIVE:
        text += " [inconclusive at this sample rate]"
    if f.sources:
        text += " (" + "; ".join(str(s) for s in f.sources) + ")"
    return f"{text}: {f.message}"

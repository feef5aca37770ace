"""SARIF 2.1.0 report (the OASIS standard) for code-scanning annotations.

One reporting descriptor per registered rule; one result per finding. Results
whose sources carry line numbers (table files, CSV rows) get physical locations,
every result gets a logical location (input and leg) and its time window in
``properties``; the second and later edges of a finding are related locations.
"""

from __future__ import annotations

import json
import os
from functools import lru_cache
from typing import Any
from urllib.parse import quote

from .. import __version__
from ..findings import Certainty, Finding, InputReport, Report, Severity
from ..model import Source
from ..rules import RULES
from ..units import format_time

__all__ = ["SARIF_SCHEMA", "SARIF_VERSION", "render_sarif"]

SARIF_VERSION = "2.1.0"
SARIF_SCHEMA = (
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
)

_FULL = (
    "{summary} Each result gives the time of the violation in the input, the measured "
    "value, the requirement and the signed margin (negative: violated), in exact picoseconds."
)


def _descriptor(rule_id: str, summary: str, help_text: str, family: str) -> dict[str, Any]:
    return {
        "id": rule_id,
        "name": "".join(p.capitalize() for p in rule_id.replace("_", "-").split("-")),
        "shortDescription": {"text": summary},
        "fullDescription": {"text": _FULL.format(summary=summary)},
        "help": {"text": help_text},
        "defaultConfiguration": {"level": "error"},
        "properties": {"family": family},
    }


def _uri(path: str) -> dict[str, Any]:
    return dict(_uri_items(path))


@lru_cache(maxsize=256)
def _uri_items(path: str) -> tuple[tuple[str, str], ...]:
    """An artifact location: relative paths against %SRCROOT%, absolute ones as file URIs."""
    uri = quote(path.replace(os.sep, "/"), safe="/:")
    if os.path.isabs(path):
        return (("uri", "file://" + uri if uri.startswith("/") else "file:///" + uri),)
    return (("uri", uri), ("uriBaseId", "%SRCROOT%"))


def _physical(s: Source) -> dict[str, Any]:
    region: dict[str, Any] = {"startLine": int(s.line or 1)}
    if s.column:
        region["startColumn"] = int(s.column)
    return {"artifactLocation": _uri(s.path), "region": region}


def _level(f: Finding) -> str:
    if f.severity is Severity.ERROR:
        return "note" if f.certainty is Certainty.INCONCLUSIVE else "error"
    return "warning" if f.severity is Severity.WARNING else "note"


def _result(f: Finding, index: dict[str, int]) -> dict[str, Any]:
    leg = f.leg if f.leg is not None else "bridge"
    logical = {"name": leg, "fullyQualifiedName": f"{f.input}::{leg}", "kind": "object"}
    location: dict[str, Any] = {"logicalLocations": [logical]}
    lined = [s for s in f.sources if s.line]
    if lined:
        location["physicalLocation"] = _physical(lined[0])
    else:
        location["physicalLocation"] = {"artifactLocation": _uri(f.input)}
    text = f.message
    if f.certainty is Certainty.INCONCLUSIVE and "inconclusive" not in text:
        text += " (inconclusive at this sample rate)"
    result: dict[str, Any] = {
        "ruleId": f.rule,
        "level": _level(f),
        "message": {"text": text},
        "locations": [location],
        "properties": {
            "startPs": f.start_ps,
            "endPs": f.end_ps,
            "start": format_time(f.start_ps),
            "end": format_time(f.end_ps),
            "measuredPs": f.measured_ps,
            "requiredPs": f.required_ps,
            "marginPs": f.margin_ps,
            "certainty": str(f.certainty),
            "channels": list(f.channels),
            **({} if f.bounds_ps is None else {"boundsPs": list(f.bounds_ps)}),
        },
    }
    if f.rule in index:
        result["ruleIndex"] = index[f.rule]
    if len(lined) > 1:
        result["relatedLocations"] = [
            {
                "id": n,
                "physicalLocation": _physical(s),
                "message": {"text": f"edge {n + 1} of {len(lined)} of this finding"},
            }
            for n, s in enumerate(lined[1:], start=1)
        ]
    return result


def sarif_record(report: Report) -> dict[str, Any]:
    """The SARIF log as plain dicts (``render_sarif`` serialises it)."""
    rules = [_descriptor(r.id, r.summary, r.help, r.family) for r in RULES]
    index = {r["id"]: n for n, r in enumerate(rules)}
    for f in report.findings:  # a rule not registered still gets a descriptor
        if f.rule not in index:
            index[f.rule] = len(rules)
            rules.append(_descriptor(f.rule, f.rule, "See the finding's message.", "other"))
    notifications = [
        {
            "level": "error",
            "message": {"text": r.error},
            "locations": [{"physicalLocation": {"artifactLocation": _uri(r.input)}}],
        }
        for r in report.inputs
        if r.error is not None
    ]
    invocation: dict[str, Any] = {"executionSuccessful": not notifications}
    if notifications:
        invocation["toolExecutionNotifications"] = notifications
    return {
        "$schema": SARIF_SCHEMA,
        "version": SARIF_VERSION,
        "runs": [
            {
                "tool": {
                    "driver": {
                        "name": "sequencecheck",
                        "version": __version__,
                        "semanticVersion": __version__,
                        "rules": rules,
                    }
                },
                "invocations": [invocation],
                "results": [_result(f, index) for f in report.findings],
                "properties": {"inputs": [_input(r) for r in report.inputs]},
            }
        ],
    }


def _input(r: InputReport) -> dict[str, Any]:
    return {
        "input": r.input,
        "rows": r.rows,
        "edges": r.edges,
        "startPs": r.start_ps,
        "endPs": r.end_ps,
        "error": r.error,
        "violations": r.violation_count,
        "unlistedViolations": r.unlisted_by_rule(),
    }


def render_sarif(report: Report) -> str:
    # no indent: json then uses its C encoder (several times faster on large logs)
    return json.dumps(sarif_record(report), ensure_ascii=False, separators=(",", ":")) + "\n"

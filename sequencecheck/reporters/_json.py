"""JSON report: times in float seconds (the contract) plus exact integer picoseconds."""

from __future__ import annotations

import json
from typing import Any

from ..findings import Finding, InputReport, LegStats, Report
from ..units import ps_to_seconds

__all__ = ["finding_record", "input_record", "render_json", "report_record"]


def finding_record(f: Finding) -> dict[str, Any]:
    """One finding as a JSON-ready dict; ``*_s`` floats for people, ``*_ps`` ints exact."""
    return {
        "rule": f.rule,
        "leg": f.leg,
        "channels": list(f.channels),
        "start_s": ps_to_seconds(f.start_ps),
        "end_s": ps_to_seconds(f.end_ps),
        "measured_s": ps_to_seconds(f.measured_ps),
        "required_s": ps_to_seconds(f.required_ps),
        "margin_s": ps_to_seconds(f.margin_ps),
        "input": f.input,
        "severity": str(f.severity),
        "certainty": str(f.certainty),
        "bounds_s": None if f.bounds_ps is None else [ps_to_seconds(b) for b in f.bounds_ps],
        "start_ps": f.start_ps,
        "end_ps": f.end_ps,
        "measured_ps": f.measured_ps,
        "required_ps": f.required_ps,
        "margin_ps": f.margin_ps,
        "sources": [{"path": s.path, "line": s.line, "column": s.column} for s in f.sources],
        "message": f.message,
        **{k: v for k, v in f.detail.items() if k not in _RESERVED},
    }


_RESERVED = {"rule", "leg", "channels", "input", "message"}


def _leg_record(s: LegStats, channels: tuple[str, str] | None = None) -> dict[str, Any]:
    def direction(d: Any) -> dict[str, Any]:
        return {
            "count": d.count,
            "min_dead_time_s": ps_to_seconds(d.min_gap_ps),
            "min_dead_time_ps": d.min_gap_ps,
            "at_s": ps_to_seconds(d.min_gap_at_ps),
            "not_proven": d.not_proven,
        }

    return {
        "leg": s.leg,
        "high_to_low": direction(s.high_to_low),
        "low_to_high": direction(s.low_to_high),
        "high": None if channels is None else channels[0],
        "low": None if channels is None else channels[1],
    }


def input_record(r: InputReport) -> dict[str, Any]:
    """Per-input summary: what was read and checked, statistics, worst margins."""
    return {
        "input": r.input,
        "kind": r.kind,
        "error": r.error,
        "rows": r.rows,
        "edges": r.edges,
        "start_s": ps_to_seconds(r.start_ps),
        "end_s": ps_to_seconds(r.end_ps),
        "start_ps": r.start_ps,
        "end_ps": r.end_ps,
        "sample_period_s": ps_to_seconds(r.sample_period_ps),
        "channels": list(r.channels),
        "legs": [_leg_record(s, r.leg_channels.get(s.leg)) for s in r.leg_stats],
        "unchecked_channels": list(r.unchecked_channels),
        "worst_margins": [
            {
                "rule": m.rule,
                "leg": m.leg,
                "kind": m.kind,
                "margin_s": ps_to_seconds(m.margin_ps),
                "margin_ps": m.margin_ps,
                "at_s": ps_to_seconds(m.at_ps),
                "measured_s": ps_to_seconds(m.measured_ps),
                "required_s": ps_to_seconds(m.required_ps),
                "at_ps": m.at_ps,
                "measured_ps": m.measured_ps,
                "required_ps": m.required_ps,
            }
            for m in r.margins
        ],
        "violations": r.violation_count,
        "unlisted": r.unlisted_by_rule(),
        "warnings": [finding_record(f) for f in r.warnings],
        **{k: v for k, v in r.extra.items() if isinstance(k, str) and _jsonable(v)},
    }


def _jsonable(v: Any) -> bool:
    try:
        json.dumps(v)
    except (TypeError, ValueError):
        return False
    return True


def report_record(report: Report) -> dict[str, Any]:
    violations = report.violations
    not_proven = sum(
        d.not_proven
        for r in report.inputs
        for s in r.leg_stats
        for d in (s.high_to_low, s.low_to_high)
    )
    return {
        "violations": [finding_record(f) for f in violations],
        "summary": {
            "violations": report.violation_count,
            "unlisted": report.violation_count - len(violations),
            "by_rule": report.by_rule(),
            "inputs": [input_record(r) for r in report.inputs],
            "inputs_failed": len(report.errors),
            "not_proven": not_proven,
            "settings": dict(report.settings),
        },
    }


def render_json(report: Report) -> str:
    return json.dumps(report_record(report), indent=2, ensure_ascii=False) + "\n"

"""The one registry of rules, and ``run()``: the choke point every finding passes."""

from __future__ import annotations

from collections.abc import Iterable

from ..findings import Finding, InputReport, LegStats
from ..model import Bridge, Policy, Trace
from ._base import CheckContext, Rule, RuleResult
from .bootstrap import BOOTSTRAP_REFRESH
from .conduction import DEAD_TIME, SHOOT_THROUGH
from .margins import DEAD_TIME_MARGIN
from .modes import MODE_TRANSITION
from .pulses import MIN_PULSE
from .sanity import SHORT_CAPTURE, STUCK_CHANNEL, TWIN_CHANNELS
from .unknown import UNKNOWN_STATE

__all__ = ["RULES", "CheckContext", "Rule", "RuleResult", "rule_ids", "run"]

#: Every rule, in the order reports list them. Add a rule here and nowhere else.
RULES: tuple[Rule, ...] = (
    SHOOT_THROUGH,
    DEAD_TIME,
    STUCK_CHANNEL,
    TWIN_CHANNELS,
    SHORT_CAPTURE,
    MODE_TRANSITION,
    MIN_PULSE,
    UNKNOWN_STATE,
    DEAD_TIME_MARGIN,
    BOOTSTRAP_REFRESH,
)


def rule_ids() -> tuple[str, ...]:
    return tuple(r.id for r in RULES)


def _check_bridge_channels(trace: Trace, bridge: Bridge) -> None:
    from .._printable import name_list
    from ..errors import InputError

    missing = [ch for ch in bridge.channels if ch not in trace.channels]
    if missing:
        known = name_list(trace.channels) or "none"
        raise InputError(
            f"channel {missing[0]!r} named by a leg is not in the input (channels: {known})",
            path=trace.path,
        )


def run(
    trace: Trace,
    bridge: Bridge,
    policy: Policy | None = None,
    *,
    rules: Iterable[Rule] | None = None,
) -> InputReport:
    """Run ``rules`` (default: all) over one trace and gather one InputReport."""
    policy = policy or Policy()
    _check_bridge_channels(trace, bridge)
    ctx = CheckContext(trace, bridge, policy)
    findings, margins, extra = [], [], {}
    stats: dict[str, LegStats] = {}
    unlisted: dict[tuple[str, str | None], int] = {}
    for rule in RULES if rules is None else rules:
        out: RuleResult = rule.check(ctx)
        findings.extend(_bounded(out, policy.max_findings_per_rule))
        margins.extend(out.margins)
        for s in out.leg_stats:
            stats.setdefault(s.leg, s)
        extra.update(out.extra)
        for key, n in out.unlisted.items():
            unlisted[key] = unlisted.get(key, 0) + n
    findings.sort(key=lambda f: (f.start_ps, f.end_ps, f.rule, f.leg or ""))
    on_legs = set(bridge.channels)
    checked = tuple(ch for ch in trace.channels if ch in on_legs)
    return InputReport(
        input=trace.path,
        kind=trace.kind,
        rows=trace.rows,
        edges=sum(trace.channel(ch).edge_count for ch in checked),
        start_ps=trace.start_ps,
        end_ps=trace.end_ps,
        sample_period_ps=trace.sample_period_ps,
        channels=checked,
        legs=tuple(leg.name for leg in bridge.legs),
        findings=tuple(findings),
        leg_stats=tuple(stats[leg.name] for leg in bridge.legs if leg.name in stats),
        margins=tuple(margins),
        extra=extra,
        leg_channels={leg.name: (leg.high, leg.low) for leg in bridge.legs},
        unchecked_channels=tuple(ch for ch in trace.channels if ch not in on_legs),
        unlisted=unlisted,
    )


def _bounded(out: RuleResult, limit: int | None) -> list[Finding]:
    """The rule's findings with at most ``limit`` violations per rule, the earliest;
    the rest are added to ``out.unlisted``. Rules that build many findings bound each
    group already (``RuleResult.listed``); this keeps the limit per rule overall."""
    if limit is None:
        return out.findings
    by_rule: dict[str, list[Finding]] = {}
    for f in out.findings:
        if f.is_violation:
            by_rule.setdefault(f.rule, []).append(f)
    dropped: set[int] = set()
    for group in by_rule.values():
        if len(group) > limit:
            group.sort(key=lambda f: (f.start_ps, f.end_ps, f.leg or ""))
            for f in group[limit:]:
                key = (f.rule, f.leg)
                out.unlisted[key] = out.unlisted.get(key, 0) + 1
                dropped.add(id(f))
    return [f for f in out.findings if id(f) not in dropped] if dropped else out.findings

"""The one registry of rules, and ``run()``: the choke point every finding passes."""

from __future__ import annotations

from collections.abc import Iterable

from ..findings import InputReport, LegStats
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
    from ..errors import InputError

    missing = [ch for ch in bridge.channels if ch not in trace.channels]
    if missing:
        known = ", ".join(trace.channels) or "none"
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
    for rule in RULES if rules is None else rules:
        out: RuleResult = rule.check(ctx)
        findings.extend(out.findings)
        margins.extend(out.margins)
        for s in out.leg_stats:
            stats.setdefault(s.leg, s)
        extra.update(out.extra)
    findings.sort(key=lambda f: (f.start_ps, f.end_ps, f.rule, f.leg or ""))
    return InputReport(
        input=trace.path,
        kind=trace.kind,
        rows=trace.rows,
        edges=trace.edge_count,
        start_ps=trace.start_ps,
        end_ps=trace.end_ps,
        sample_period_ps=trace.sample_period_ps,
        channels=tuple(trace.channels),
        legs=tuple(leg.name for leg in bridge.legs),
        findings=tuple(findings),
        leg_stats=tuple(stats[leg.name] for leg in bridge.legs if leg.name in stats),
        margins=tuple(margins),
        extra=extra,
    )

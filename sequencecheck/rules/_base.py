"""The shape every rule has, and the per-run context rules share."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

from ..findings import Finding, LegStats, WorstMargin
from ..model import Bridge, Policy, Trace
from ._intervals import Intervals, on_intervals

__all__ = ["CheckContext", "Rule", "RuleResult"]


@dataclass
class CheckContext:
    """One trace, its bridge and policy, and a cache of derived intervals.

    Rules ask the context for a switch's on-intervals so that several rules over
    one capture compute them once.
    """

    trace: Trace
    bridge: Bridge
    policy: Policy
    cache: dict[Any, Any] = field(default_factory=dict)

    def on(self, channel: str) -> Intervals:
        """Commanded on-intervals of the switch ``channel`` drives (polarity applied)."""
        key = ("on", channel)
        if key not in self.cache:
            self.cache[key] = on_intervals(
                self.trace.channel(channel),
                self.bridge.on_level(channel),
                self.trace.start_ps,
                self.trace.end_ps,
            )
        return self.cache[key]


@dataclass
class RuleResult:
    """What one rule returns: findings plus statistics that exist for clean runs too."""

    findings: list[Finding] = field(default_factory=list)
    leg_stats: list[LegStats] = field(default_factory=list)
    margins: list[WorstMargin] = field(default_factory=list)
    extra: dict[str, Any] = field(default_factory=dict)
    #: (rule, leg) -> violations found but not built as findings (see ``listed``)
    unlisted: dict[tuple[str, str | None], int] = field(default_factory=dict)

    def listed(self, ctx: CheckContext, rule: str, leg: str | None, found: Any) -> Any:
        """The first ``Policy.max_findings_per_rule`` of ``found`` (violations of one
        group, in time order: a sequence or array); the rest are counted as unlisted,
        so a rule builds a bounded number of findings however many faults there are."""
        limit = ctx.policy.max_findings_per_rule
        if limit is None or len(found) <= limit:
            return found
        key = (rule, leg)
        self.unlisted[key] = self.unlisted.get(key, 0) + len(found) - limit
        return found[:limit]


@dataclass(frozen=True, slots=True)
class Rule:
    """A registered rule: its id, family, one-line summary, help on fixing, and check."""

    id: str
    family: str
    summary: str
    help: str
    check: Callable[[CheckContext], RuleResult]

"""What is required of a bridge: the limits the rules check against."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

from ._bridge import Direction

__all__ = ["DeadTime", "Policy"]


@dataclass(frozen=True, slots=True)
class DeadTime:
    """Least dead time for each hand-over direction of a leg, in picoseconds."""

    high_to_low_ps: int = 0
    low_to_high_ps: int = 0

    @classmethod
    def both(cls, ps: int) -> DeadTime:
        return cls(ps, ps)

    def for_direction(self, direction: Direction) -> int:
        if direction is Direction.HIGH_TO_LOW:
            return self.high_to_low_ps
        return self.low_to_high_ps


@dataclass(frozen=True)
class Policy:
    """Requirements; ``None`` means "not required", so the rule measures but never fails.

    ``dead_time`` applies to every leg not named in ``dead_time_by_leg``.
    ``transitions`` is a TransitionPolicy (None: the default policy for the
    bridge's leg count); ``bootstrap`` holds bootstrap limits, if any.
    ``effective_dead_time`` is the least gap between effective (physical)
    conduction intervals; None means 0: the switches must never conduct together.
    ``max_findings_per_rule`` bounds the violations each rule lists per input; the
    rest are counted (``InputReport.unlisted``), so counts stay exact.
    ``state_summary`` asks mode-transition for the time spent in each bridge state and
    the transition counts (``extra["states"]``); without it, and with a transition
    policy that checks nothing, the states are not decoded at all.
    """

    dead_time: DeadTime | None = None
    dead_time_by_leg: Mapping[str, DeadTime] = field(default_factory=dict)
    min_pulse_ps: int | None = None
    reversal_dwell_ps: int | None = None
    require_margin_ps: int | None = None
    transitions: object | None = None
    bootstrap: object | None = None
    strict: bool = False
    effective_dead_time: DeadTime | None = None
    #: most findings each rule lists per input (the rest are counted); None: no limit
    max_findings_per_rule: int | None = None
    state_summary: bool = True

    def dead_time_for(self, leg: str) -> DeadTime | None:
        return self.dead_time_by_leg.get(leg, self.dead_time)

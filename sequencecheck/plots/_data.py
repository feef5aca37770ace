"""Numbers the pictures show, computed from a Trace (numpy only, no drawing)."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..findings import Finding
from ..model import Bridge, Channel, Direction, Leg, Policy, Trace
from ..rules import CheckContext
from ..rules.conduction import handovers

__all__ = ["HandoverGaps", "finding_window", "handover_gaps", "steps_in_window"]


def steps_in_window(ch: Channel, lo_ps: int, hi_ps: int) -> tuple[np.ndarray, np.ndarray]:
    """Level of ``ch`` over ``[lo_ps, hi_ps]`` as step points: times start with ``lo_ps``
    and end with ``hi_ps``; ``levels[i]`` holds from ``times[i]`` to ``times[i + 1]``
    (the last level is repeated at ``hi_ps``)."""
    first = int(np.searchsorted(ch.times, lo_ps, side="right"))
    last = int(np.searchsorted(ch.times, hi_ps, side="left"))
    start_level = ch.initial if first == 0 else int(ch.levels[first - 1])
    times = np.concatenate(([lo_ps], ch.times[first:last], [hi_ps])).astype(np.int64)
    inner = ch.levels[first:last].astype(np.int8)
    levels = np.concatenate(([start_level], inner, [inner[-1] if inner.size else start_level]))
    return times, levels.astype(np.int8)


def finding_window(f: Finding, sample_period_ps: int | None = None) -> tuple[int, int]:
    """A time window that shows a finding, its requirement and some context on both sides."""
    reach = max(f.end_ps, f.start_ps + max(f.required_ps or 0, 0))
    span = max(reach - f.start_ps, 4 * (sample_period_ps or 0), 1_000)
    pad = span + span // 2
    return f.start_ps - pad, reach + pad


@dataclass(frozen=True, slots=True)
class HandoverGaps:
    """Dead times measured on one leg in one direction, and what they must reach."""

    leg: Leg
    direction: Direction
    gaps_ps: np.ndarray
    required_ps: int | None


def handover_gaps(trace: Trace, bridge: Bridge, policy: Policy) -> list[HandoverGaps]:
    """Every hand-over gap of every leg, per direction (the dead-time rule's own pairing)."""
    ctx = CheckContext(trace, bridge, policy)
    out = []
    for leg in bridge.legs:
        high, low = ctx.on(leg.high), ctx.on(leg.low)
        need = policy.dead_time_for(leg.name)
        for h in (
            handovers(low, high, Direction.HIGH_TO_LOW),
            handovers(high, low, Direction.LOW_TO_HIGH),
        ):
            required = None if need is None else need.for_direction(h.direction)
            out.append(HandoverGaps(leg, h.direction, h.gap_ps, required))
    return out

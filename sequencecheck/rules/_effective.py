"""Effective (physical) conduction intervals from commanded ones and a SwitchTiming.

A switch starts conducting no earlier than ``driver_delay_min + turn_on_delay``
after its turn-on command and stops no later than ``driver_delay_max +
turn_off_delay + fall`` after its turn-off command (the worst case of the
dead-time formula: the real dead time is ``T_D' = T_D - (t3 + t4) + (t1 + t2)``).
"""

from __future__ import annotations

import numpy as np

from ..errors import InputError
from ..model import Bridge, Leg, SwitchTiming
from ._base import CheckContext
from ._intervals import EdgeLines, Intervals

__all__ = [
    "check_timing_channels",
    "effective_intervals",
    "effective_on",
    "leg_has_timing",
    "timing_of",
]

COMMANDED, EFFECTIVE = "commanded", "effective"


def timing_of(bridge: Bridge, channel: str) -> SwitchTiming | None:
    t = bridge.timing.get(channel)
    return t if isinstance(t, SwitchTiming) else None


def leg_has_timing(bridge: Bridge, leg: Leg) -> bool:
    """True when either switch of ``leg`` has a timing model."""
    return any(timing_of(bridge, ch) is not None for ch in leg.channels)


def check_timing_channels(ctx: CheckContext) -> None:
    """InputError when a timing model names a channel no leg uses (checked once per run)."""
    if ("timing-checked",) not in ctx.cache:
        _check_timing_channels(ctx)
        ctx.cache[("timing-checked",)] = True


def effective_intervals(
    iv: Intervals, timing: SwitchTiming, start_ps: int, end_ps: int
) -> Intervals:
    """Worst-case conduction: every start as early, every end as late as the timing allows.

    Starts move later by the turn-on path, ends later by the turn-off path; an
    interval that was on when the window opened keeps its start. Ends past the
    window are clipped to it; pulses the paths swallow vanish; intervals that
    now touch or overlap merge (keeping the lines of the outer edges).
    """
    on_path = timing.driver_delay_min_ps + timing.turn_on_delay_ps
    off_path = timing.driver_delay_max_ps + timing.turn_off_delay_ps + timing.fall_ps
    starts = iv.starts + on_path
    ends = iv.ends + off_path
    if iv.clipped_start and starts.size:
        starts[0] = iv.starts[0]
    if iv.clipped_end and ends.size:
        ends[-1] = iv.ends[-1]
    past_end = ends > end_ps
    if iv.clipped_end and ends.size:
        past_end[-1] = True
    ends = np.minimum(ends, end_ps)
    keep = starts < ends
    starts, ends, past_end = starts[keep], ends[keep], past_end[keep]
    clipped_start = bool(iv.clipped_start and keep.size and keep[0])
    first = last = None
    if starts.size:
        first = np.ones(starts.size, dtype=bool)
        first[1:] = starts[1:] > ends[:-1]
        last = np.ones(starts.size, dtype=bool)
        last[:-1] = first[1:]
        starts, ends, past_end = starts[first], ends[last], past_end[last]
    clipped_end = bool(past_end.size and past_end[-1])

    def lines() -> tuple[np.ndarray, np.ndarray]:
        start_lines, end_lines = iv.start_lines[keep], iv.end_lines[keep]
        if first is not None and last is not None:
            start_lines, end_lines = start_lines[first], end_lines[last]
        if clipped_end:
            end_lines = end_lines.copy()
            end_lines[-1] = 0
        return start_lines, end_lines

    return Intervals(
        starts.astype(np.int64, copy=False),
        ends.astype(np.int64, copy=False),
        clipped_start,
        clipped_end,
        EdgeLines(lines),
    )


def _check_timing_channels(ctx: CheckContext) -> None:
    known = set(ctx.bridge.channels)
    for ch in ctx.bridge.timing:
        if ch not in known:
            raise InputError(
                f"a switch timing names channel {ch!r}, which no leg uses "
                f"(leg channels: {', '.join(ctx.bridge.channels) or 'none'})",
                path=ctx.trace.path,
            )


def effective_on(ctx: CheckContext, channel: str) -> Intervals:
    """Effective on-intervals of ``channel``'s switch (commanded ones if it has no timing)."""
    key = ("effective-on", channel)
    if key not in ctx.cache:
        check_timing_channels(ctx)
        timing = timing_of(ctx.bridge, channel)
        on = ctx.on(channel)
        ctx.cache[key] = (
            on
            if timing is None
            else effective_intervals(on, timing, ctx.trace.start_ps, ctx.trace.end_ps)
        )
    return ctx.cache[key]

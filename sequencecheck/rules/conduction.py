"""Shoot-through and dead-time: the conduction rules of a half-bridge leg."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..findings import Certainty, DirectionStats, Finding, LegStats, WorstMargin
from ..model import DeadTime, Direction, Leg, Source
from ..physics.cautions import CAUTION
from ..units import format_time
from ._base import CheckContext, Rule, RuleResult
from ._effective import (
    COMMANDED,
    EFFECTIVE,
    check_timing_channels,
    effective_on,
    leg_has_timing,
)
from ._intervals import Intervals, intersect, rank_in

__all__ = [
    "DEAD_TIME",
    "SHOOT_THROUGH",
    "Handovers",
    "dead_time_robustness",
    "handovers",
    "leg_kinds",
]


@dataclass(frozen=True, slots=True)
class Handovers:
    """Complementary hand-overs in one direction: the complement turns off, then the
    switch turns on with no other turn-on or turn-off of the switch in between.

    Hand-over ``n`` is the turn-on that starts interval ``on_interval[n]`` of
    ``turning_on``, ``gap_ps[n]`` after the complement's turn-off. Only these two
    arrays are kept per hand-over; times and input lines are looked up for the few
    that are reported.
    """

    direction: Direction
    gap_ps: np.ndarray
    on_interval: np.ndarray
    turning_off: Intervals
    turning_on: Intervals

    def __len__(self) -> int:
        return int(self.gap_ps.size)

    def on_at(self, n: int) -> int:
        """Time of the turn-on of hand-over ``n``."""
        return int(self.turning_on.starts[self.on_interval[n]])

    def off_at(self, n: int) -> int:
        """Time of the complement's turn-off before hand-over ``n``."""
        return self.on_at(n) - int(self.gap_ps[n])

    def lines(self, n: int) -> tuple[int, int]:
        """Input lines of the turn-off and the turn-on of hand-over ``n``."""
        off = np.searchsorted(self.turning_off.ends, [self.off_at(n)])
        on = self.on_interval[n : n + 1]
        return int(self.turning_off.end_lines_at(off)[0]), int(
            self.turning_on.start_lines_at(on)[0]
        )


def handovers(
    turning_on: Intervals,
    turning_off: Intervals,
    direction: Direction,
    on_in_off: np.ndarray | None = None,
) -> Handovers:
    """Every turn-on of one switch whose latest preceding event is the complement's
    turn-off. Turn-ons while the complement still conducts are shoot-through, not
    hand-overs, and are left out here.

    One search per turn-on finds the complement's last interval starting at or before
    it; if that interval has ended by then, its end is the latest complement turn-off
    (intervals are disjoint, so the next one starts later still). ``on_in_off`` is
    ``rank_in(turning_on, turning_off)`` when the caller has it already.
    """
    first = 1 if turning_on.clipped_start else 0
    on_t = turning_on.starts[first:]
    n_off = len(turning_off)
    if on_t.size == 0 or n_off == 0 or (n_off == 1 and turning_off.clipped_end):
        empty = np.empty(0, dtype=np.int64)
        return Handovers(direction, empty, empty, turning_off, turning_on)
    k = (rank_in(turning_on, turning_off) if on_in_off is None else on_in_off)[first:] - 1
    np.maximum(k, 0, out=k)  # k = -1 (no complement interval yet) fails the test below
    gap = on_t - turning_off.ends[k]
    valid = (gap >= 0) & (turning_off.starts[k] <= on_t)
    if turning_off.clipped_end:  # the last interval never ended: no turn-off there
        valid &= k != n_off - 1
    del k
    # no own turn-off between the complement's turn-off and this turn-on
    own_ends = turning_on.ends
    prev_own_off = own_ends[first - 1 : -1] if first else own_ends[:-1]
    skip = 1 - first  # the first turn-on has no own turn-off before it unless clipped
    valid[skip:] &= on_t[skip:] - gap[skip:] >= prev_own_off[: on_t.size - skip]
    on_interval = np.flatnonzero(valid)
    gap = gap[on_interval]
    on_interval += first
    return Handovers(direction, gap, on_interval, turning_off, turning_on)


def _src(path: str, *lines: int) -> tuple[Source, ...]:
    return tuple(Source(path, int(n)) for n in lines if n)


def leg_kinds(ctx: CheckContext, leg: Leg) -> tuple[str, ...]:
    """Which conduction intervals to check on ``leg``: commanded, and effective when
    either switch has a timing model."""
    check_timing_channels(ctx)
    return (COMMANDED, EFFECTIVE) if leg_has_timing(ctx.bridge, leg) else (COMMANDED,)


def _on(ctx: CheckContext, channel: str, kind: str) -> Intervals:
    return ctx.on(channel) if kind == COMMANDED else effective_on(ctx, channel)


def _leg_conduction(ctx: CheckContext, leg: Leg, kind: str) -> tuple[tuple, tuple]:
    """The leg's high/low overlaps (``intersect``) and its hand-overs in both directions,
    computed once per run from one search of each side's starts among the other's."""
    key = ("conduction", leg.name, kind)
    if key not in ctx.cache:
        high, low = _on(ctx, leg.high, kind), _on(ctx, leg.low, kind)
        high_in_low, low_in_high = rank_in(high, low), rank_in(low, high)
        ctx.cache[key] = (
            intersect(high, low, high_in_low, low_in_high),
            (
                handovers(low, high, Direction.HIGH_TO_LOW, low_in_high),
                handovers(high, low, Direction.LOW_TO_HIGH, high_in_low),
            ),
        )
    return ctx.cache[key]


def _leg_handovers(
    ctx: CheckContext, leg: Leg, kind: str = COMMANDED
) -> tuple[Handovers, Handovers]:
    return _leg_conduction(ctx, leg, kind)[1]


def _overlaps(
    ctx: CheckContext, leg: Leg, kind: str
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """``intersect`` of the leg's high- and low-side intervals, computed once per run."""
    return _leg_conduction(ctx, leg, kind)[0]


def _check_shoot_through(ctx: CheckContext) -> RuleResult:
    result = RuleResult()
    for leg in ctx.bridge.legs:
        for kind in leg_kinds(ctx, leg):
            _shoot_through_leg(ctx, leg, kind, result)
            if kind == EFFECTIVE:  # physical judgement: carry the caution
                result.extra["caution"] = CAUTION
    return result


def _shoot_through_leg(ctx: CheckContext, leg: Leg, kind: str, result: RuleResult) -> None:
    trace, ts = ctx.trace, ctx.trace.sample_period_ps
    high, low = _on(ctx, leg.high, kind), _on(ctx, leg.low, kind)
    starts, ends, ih, il = _overlaps(ctx, leg, kind)
    shown = result.listed(ctx, "shoot-through", leg.name, np.arange(starts.size))
    sh, sl = ih[shown], il[shown]
    # the later turn-on opened the overlap, the earlier turn-off closed it
    open_line = np.where(
        high.starts[sh] >= low.starts[sl], high.start_lines_at(sh), low.start_lines_at(sl)
    )
    close_line = np.where(
        high.ends[sh] <= low.ends[sl], high.end_lines_at(sh), low.end_lines_at(sl)
    )
    effective = kind == EFFECTIVE
    for s, e, ol, cl in zip(
        starts[shown].tolist(),
        ends[shown].tolist(),
        open_line.tolist(),
        close_line.tolist(),
        strict=True,
    ):
        width = e - s
        open_end = e == trace.end_ps and (high.clipped_end or low.clipped_end)
        if effective:
            text = (
                f"leg {leg.name}: {leg.high} and {leg.low} conduct together for "
                f"{format_time(width)} with worst-case switch timing (effective)"
            )
        else:
            text = f"leg {leg.name}: {leg.high} and {leg.low} both on for {format_time(width)}"
        result.findings.append(
            Finding(
                rule="shoot-through",
                leg=leg.name,
                channels=leg.channels,
                start_ps=s,
                end_ps=e,
                measured_ps=width,
                required_ps=0,
                input=trace.path,
                message=text + (" (still on when the capture ends)" if open_end else ""),
                certainty=Certainty.PROVEN,
                bounds_ps=None if ts is None else (max(width - ts, 0), width + ts),
                sources=_src(trace.path, ol, cl),
                detail={"open_end": open_end, "kind": EFFECTIVE}
                if effective
                else {"open_end": open_end},
                margin_ps=-width,
            )
        )
    if starts.size:
        worst = int(np.argmax(ends - starts))
        width = int(ends[worst] - starts[worst])
        result.margins.append(
            WorstMargin("shoot-through", leg.name, -width, int(starts[worst]), width, 0, kind)
        )
    else:
        pairs = [h for h in _leg_handovers(ctx, leg, kind) if h.gap_ps.size]
        if pairs:
            at = [h.on_at(int(np.argmin(h.gap_ps))) for h in pairs]
            mins = [int(h.gap_ps.min()) for h in pairs]
            i = int(np.argmin(mins))
            result.margins.append(
                WorstMargin("shoot-through", leg.name, mins[i], int(at[i]), mins[i], 0, kind)
            )


def _direction_stats(h: Handovers, required: int | None, ts: int | None) -> DirectionStats:
    if h.gap_ps.size == 0:
        return DirectionStats()
    gaps = h.gap_ps
    i = int(np.argmin(gaps))
    not_proven = 0
    if required is not None and ts is not None:
        not_proven = int(np.count_nonzero((gaps >= required) & (gaps - ts < required)))
    return DirectionStats(int(gaps.size), int(gaps[i]), h.on_at(i), not_proven)


def _required_dead_time(ctx: CheckContext, leg: Leg, kind: str) -> DeadTime | None:
    """The commanded requirement, or for effective intervals the physical minimum gap
    (``Policy.effective_dead_time``, default 0: the switches must never conduct together)."""
    if kind == COMMANDED:
        return ctx.policy.dead_time_for(leg.name)
    return ctx.policy.effective_dead_time or DeadTime()


def dead_time_robustness(
    ctx: CheckContext, leg: Leg, kind: str, need: DeadTime
) -> WorstMargin | None:
    """Signed robustness of the dead-time formula on ``leg`` (Signal Temporal Logic).

    ``G(HS -> G[0,T] not LS) and G(LS -> G[0,T] not HS)`` has the temporal
    robustness ``min_k(g_k - T)`` over every hand-over gap g_k, where an overlap
    of width w counts as the gap -w (its direction: the switch that turned on
    while the other conducted). None when the leg has no hand-over or overlap.
    """
    key = ("dead-time-robustness", leg.name, kind, need)
    if key in ctx.cache:
        return ctx.cache[key]
    worst: WorstMargin | None = None
    for h in _leg_handovers(ctx, leg, kind):
        if h.gap_ps.size == 0:
            continue
        required = need.for_direction(h.direction)
        i = int(np.argmin(h.gap_ps))
        gap = int(h.gap_ps[i])
        if worst is None or gap - required < worst.margin_ps:
            worst = WorstMargin(
                "dead-time", leg.name, gap - required, h.on_at(i), gap, required, kind
            )
    high, low = _on(ctx, leg.high, kind), _on(ctx, leg.low, kind)
    starts, ends, ih, il = _overlaps(ctx, leg, kind)
    if starts.size:
        widths = ends - starts
        # the switch that turned on later turned on into a conducting complement
        high_later = high.starts[ih] >= low.starts[il]
        required = np.where(high_later, need.low_to_high_ps, need.high_to_low_ps)
        margins = -widths - required
        i = int(np.argmin(margins))
        if worst is None or int(margins[i]) < worst.margin_ps:
            worst = WorstMargin(
                "dead-time",
                leg.name,
                int(margins[i]),
                int(starts[i]),
                -int(widths[i]),
                int(required[i]),
                kind,
            )
    ctx.cache[key] = worst
    return worst


def _check_dead_time(ctx: CheckContext) -> RuleResult:
    result = RuleResult()
    for leg in ctx.bridge.legs:
        for kind in leg_kinds(ctx, leg):
            _dead_time_leg(ctx, leg, kind, result)
    result.findings.sort(key=lambda f: (f.start_ps, f.end_ps))
    return result


def _dead_time_leg(ctx: CheckContext, leg: Leg, kind: str, result: RuleResult) -> None:
    trace, ts = ctx.trace, ctx.trace.sample_period_ps
    need = _required_dead_time(ctx, leg, kind)
    effective = kind == EFFECTIVE
    stats = {}
    for h in _leg_handovers(ctx, leg, kind):
        required = None if need is None else need.for_direction(h.direction)
        stats[h.direction] = _direction_stats(h, required, ts)
        if required is None or h.gap_ps.size == 0:
            continue
        gaps = h.gap_ps
        bad = np.flatnonzero(gaps < required)
        off_ch, on_ch = (
            (leg.high, leg.low) if h.direction is Direction.HIGH_TO_LOW else (leg.low, leg.high)
        )
        for n in result.listed(ctx, "dead-time", leg.name, bad).tolist():
            off, on, gap = h.off_at(n), h.on_at(n), int(gaps[n])
            proven = ts is None or gap + ts <= required
            if effective:
                text = (
                    f"leg {leg.name}: {on_ch} conducts {format_time(gap)} after {off_ch} stops "
                    f"with worst-case switch timing; needs {format_time(required)} (effective)"
                )
            else:
                text = (
                    f"leg {leg.name}: {on_ch} on {format_time(gap)} after {off_ch} off; "
                    f"needs {format_time(required)}"
                )
            result.findings.append(
                Finding(
                    rule="dead-time",
                    leg=leg.name,
                    channels=(off_ch, on_ch),
                    start_ps=off,
                    end_ps=on,
                    measured_ps=gap,
                    required_ps=required,
                    input=trace.path,
                    message=text + ("" if proven else " (inconclusive at this sample rate)"),
                    certainty=Certainty.PROVEN if proven else Certainty.INCONCLUSIVE,
                    bounds_ps=None if ts is None else (gap - ts, gap + ts),
                    sources=_src(trace.path, *h.lines(n)),
                    detail={"direction": str(h.direction), "kind": EFFECTIVE}
                    if effective
                    else {"direction": str(h.direction)},
                )
            )
    if not effective:
        result.leg_stats.append(
            LegStats(
                leg.name,
                stats.get(Direction.HIGH_TO_LOW, DirectionStats()),
                stats.get(Direction.LOW_TO_HIGH, DirectionStats()),
            )
        )
    if need is not None:
        worst = dead_time_robustness(ctx, leg, kind, need)
        if worst is not None:
            result.margins.append(worst)


SHOOT_THROUGH = Rule(
    id="shoot-through",
    family="conduction",
    summary="Both switches of a leg commanded on at the same time.",
    help=(
        "Never command the high and low side of one leg on together: make the turn-on of "
        "each switch wait for the turn-off of its complement plus the dead time."
    ),
    check=_check_shoot_through,
)

DEAD_TIME = Rule(
    id="dead-time",
    family="conduction",
    summary="A switch turned on less than the required dead time after its complement turned off.",
    help=(
        "Delay the turn-on edge (or advance the complement's turn-off) until the gap meets the "
        "dead time the leg needs; derive that need from worst-case switch and driver delays."
    ),
    check=_check_dead_time,
)

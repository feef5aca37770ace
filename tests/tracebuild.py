"""Building traces by hand for rule tests: switches from on-intervals, legs from pole changes.

Every waveform here is invented test data (times in picoseconds).
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence

import numpy as np

from sequencecheck.model import Bridge, Channel, Leg, Trace

US = 1_000_000
NS = 1_000

TWO_LEGS = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")))
THREE_LEGS = Bridge((Leg("a", "AH", "AL"), Leg("b", "BH", "BL"), Leg("c", "CH", "CL")))


def channel(name: str, initial: int, changes: Iterable[tuple[int, int]]) -> Channel:
    changes = sorted(changes)
    t = np.array([c[0] for c in changes], dtype=np.int64)
    v = np.array([c[1] for c in changes], dtype=np.int8)
    return Channel.from_changes(name, initial, t, v)


def switch(name: str, on: Sequence[tuple[int, int]], start: int = 0) -> Channel:
    """A channel (active high) on during each ``[s, e)`` of ``on``; ``s == start`` means on
    from the window start."""
    initial = 1 if on and on[0][0] <= start else 0
    changes: list[tuple[int, int]] = []
    for s, e in on:
        if s > start:
            changes.append((s, 1))
        changes.append((e, 0))
    return channel(name, initial, changes)


def trace(channels: Iterable[Channel], end: int, start: int = 0, **kw: object) -> Trace:
    chans = {c.name: c for c in channels}
    return Trace(chans, start, end, **kw)  # type: ignore[arg-type]


def pole(changes: Sequence[tuple[int, int]], end: int, dead: int) -> tuple[list, list]:
    """On-intervals (high, low) of a complementary leg whose pole goes to ``side`` (1 high,
    0 low) at each ``(t, side)``; the incoming switch waits ``dead`` after the outgoing one
    turns off. The first change is at the window start and has no dead time."""
    high: list[tuple[int, int]] = []
    low: list[tuple[int, int]] = []
    for k, (t, side) in enumerate(changes):
        t_next = changes[k + 1][0] if k + 1 < len(changes) else end
        on_at = t if k == 0 else t + dead
        if on_at >= t_next:
            continue
        (high if side else low).append((on_at, t_next))
    return _join(high), _join(low)


def _join(iv: list[tuple[int, int]]) -> list[tuple[int, int]]:
    out: list[tuple[int, int]] = []
    for s, e in iv:
        if out and out[-1][1] == s:
            out[-1] = (out[-1][0], e)
        else:
            out.append((s, e))
    return out


def legs_trace(
    poles: Mapping[str, Sequence[tuple[int, int]]], bridge: Bridge, end: int, dead: int
) -> Trace:
    """A trace of complementary legs, each given as pole changes (see ``pole``)."""
    chans = []
    for leg in bridge.legs:
        high, low = pole(_dedupe(poles[leg.name]), end, dead)
        chans += [switch(leg.high, high), switch(leg.low, low)]
    return trace(chans, end)


def _dedupe(changes: Sequence[tuple[int, int]]) -> list[tuple[int, int]]:
    out: list[tuple[int, int]] = []
    for t, side in changes:
        if out and out[-1][1] == side:
            continue
        if out and out[-1][0] == t:
            out[-1] = (t, side)
            continue
        out.append((t, side))
    return out


def pwm_pole(period: int, highs: Sequence[int], t0: int = 0) -> list[tuple[int, int]]:
    """Pole changes for consecutive PWM periods starting at ``t0``: high for ``highs[k]``
    picoseconds at the start of period k, low for the rest."""
    out: list[tuple[int, int]] = []
    for k, h in enumerate(highs):
        s = t0 + k * period
        if h > 0:
            out.append((s, 1))
        if h < period:
            out.append((s + h, 0))
    return out

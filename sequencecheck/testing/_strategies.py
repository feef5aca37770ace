"""Hypothesis strategies for controller tests and for testing checkers.

Every strategy takes keyword-only options and checks them when it is called,
not when examples are drawn: a bad option raises hypothesis' InvalidArgument
naming the argument and its value. Each docstring says what examples shrink
toward, which is what a failing test will be reported with.
"""

from __future__ import annotations

import operator
from collections.abc import Iterable
from fractions import Fraction

import numpy as np
from hypothesis import strategies as st
from hypothesis.errors import InvalidArgument

from ..model import Bridge, Channel, Level, Trace
from ._commands import Command, DriveMode, PwmSettings, modes_for

__all__ = ["SWITCH_RANGES", "command_sequences", "edge_traces", "pwm_settings"]

#: Realistic carrier frequency (Hz) and dead time (ps) ranges per switch technology.
#: Dead time: silicon MOSFET legs tens to a few hundred ns, IGBT legs about 1-5 us
#: (facts.md section 1, common practice); the frequency ranges are common practice.
SWITCH_RANGES: dict[str, dict[str, tuple[int, int]]] = {
    "mosfet": {"frequency_hz": (10_000, 100_000), "dead_time_ps": (20_000, 500_000)},
    "igbt": {"frequency_hz": (2_000, 20_000), "dead_time_ps": (1_000_000, 5_000_000)},
}


def _fail(strategy: str, arg: str, value: object, why: str) -> InvalidArgument:
    return InvalidArgument(f"{strategy}({arg}={value!r}): {why}")


def _int(strategy: str, arg: str, value: object, *, minimum: int = 0) -> int:
    if isinstance(value, bool):
        raise _fail(strategy, arg, value, "must be an integer")
    try:
        n = operator.index(value)
    except TypeError:
        raise _fail(
            strategy, arg, value, f"must be an integer, not {type(value).__name__}"
        ) from None
    if n < minimum:
        raise _fail(strategy, arg, value, f"must be at least {minimum}")
    return n


def _range(strategy: str, arg: str, value: object, *, minimum: int = 0) -> tuple[int, int]:
    if not isinstance(value, tuple | list) or len(value) != 2:
        raise _fail(strategy, arg, value, "must be a (low, high) pair of integers")
    try:
        lo = _int(strategy, arg, value[0], minimum=minimum)
        hi = _int(strategy, arg, value[1], minimum=minimum)
    except InvalidArgument as e:  # name the whole pair, not just the bad end
        why = str(e).partition("): ")[2]
        raise _fail(strategy, arg, value, f"both ends {why}") from None
    if lo > hi:
        raise _fail(strategy, arg, value, "low end is above the high end")
    return lo, hi


def _bridge(strategy: str, bridge: object) -> Bridge:
    if not isinstance(bridge, Bridge):
        raise _fail(strategy, "bridge", bridge, "must be a sequencecheck Bridge")
    if not bridge.legs:
        raise _fail(strategy, "bridge", bridge, "needs at least one leg")
    return bridge


# -- PWM settings ------------------------------------------------------------------------


def _duty_steps(steps: int) -> st.SearchStrategy[int]:
    """Duty steps 0..steps, with the saturating ends (0, 1, steps-1, steps and a few
    steps short of full) drawn often: PWM stages fail there. Shrinks toward 0."""
    ends = sorted({0, 1, *(max(steps - k, 0) for k in (0, 1, 2, 5, 10))})
    return st.one_of(st.integers(0, steps), st.sampled_from(ends))


def pwm_settings(
    *,
    switch: str = "mosfet",
    frequency_hz: tuple[int, int] | None = None,
    dead_time_ps: tuple[int, int] | None = None,
    duty_steps: int = 1000,
) -> st.SearchStrategy[PwmSettings]:
    """PwmSettings with a realistic carrier frequency, duty and dead time.

    ``switch`` ("mosfet" or "igbt") picks the ranges in SWITCH_RANGES; the
    ``frequency_hz`` and ``dead_time_ps`` (low, high) pairs override them. The
    period is ``10**12 // frequency`` ps; the duty is a multiple of
    ``1 / duty_steps``. Shrinks toward the lowest frequency, the shortest dead
    time and a duty of 0.
    """
    name = "pwm_settings"
    if switch not in SWITCH_RANGES:
        raise _fail(name, "switch", switch, f"must be one of {', '.join(SWITCH_RANGES)}")
    ranges = SWITCH_RANGES[switch]
    f_lo, f_hi = _range(name, "frequency_hz", frequency_hz or ranges["frequency_hz"], minimum=1)
    d_lo, d_hi = _range(name, "dead_time_ps", dead_time_ps or ranges["dead_time_ps"])
    if f_hi > 10**12:
        raise _fail(name, "frequency_hz", frequency_hz, "is above 1 THz (1 ps resolution)")
    shortest_period = 10**12 // f_hi
    if 2 * d_lo >= shortest_period:
        raise _fail(
            name,
            "dead_time_ps",
            dead_time_ps or (d_lo, d_hi),
            f"the shortest dead time leaves no room in a {shortest_period} ps period "
            f"(frequency up to {f_hi} Hz)",
        )
    steps = _int(name, "duty_steps", duty_steps, minimum=1)

    @st.composite
    def settings(draw: st.DrawFn) -> PwmSettings:
        period = 10**12 // draw(st.integers(f_lo, f_hi), label="frequency_hz")
        dead_hi = min(d_hi, (period - 1) // 2)
        dead = draw(st.integers(d_lo, dead_hi), label="dead_time_ps")
        duty = Fraction(draw(_duty_steps(steps), label="duty_step"), steps)
        return PwmSettings(period, duty, dead)

    return settings()


# -- command sequences -------------------------------------------------------------------


def command_sequences(
    *,
    bridge: Bridge,
    modes: Iterable[str] | None = None,
    min_size: int = 1,
    max_size: int = 12,
    min_duration_ps: int = 1_000_000,
    max_duration_ps: int = 2_000_000_000,
    duty_steps: int = 1000,
) -> st.SearchStrategy[list[Command]]:
    """Lists of Commands a controller of ``bridge`` may be given.

    Modes are those of ``modes_for(bridge)`` (or the subset ``modes``): coast,
    brake, forward, reverse (two legs or more) and emergency stop, so direction
    changes and stops at any moment are covered. Durations are whole
    picoseconds in ``[min_duration_ps, max_duration_ps]``; driving commands
    get a duty that is a multiple of ``1 / duty_steps``, the others duty 0.
    Shrinks toward fewer commands, coast before brake before forward before
    reverse before stop, the shortest durations and a duty of 0.
    """
    name = "command_sequences"
    bridge = _bridge(name, bridge)
    allowed = modes_for(bridge)
    if modes is None:
        chosen = allowed
    else:
        wanted = list(modes) if not isinstance(modes, str) else [modes]
        known = {m.value for m in DriveMode}
        for m in wanted:
            if m not in known:
                raise _fail(name, "modes", modes, f"{m!r} is not one of {', '.join(sorted(known))}")
            if DriveMode(m) not in allowed:
                raise _fail(name, "modes", modes, f"{m!r} needs a bridge of two legs or more")
        if not wanted:
            raise _fail(name, "modes", modes, "must name at least one mode")
        chosen = tuple(m for m in allowed if m.value in wanted)
    lo_size = _int(name, "min_size", min_size)
    hi_size = _int(name, "max_size", max_size, minimum=1)
    if lo_size > hi_size:
        raise _fail(name, "min_size", min_size, f"is above max_size={max_size!r}")
    lo_dur = _int(name, "min_duration_ps", min_duration_ps, minimum=1)
    hi_dur = _int(name, "max_duration_ps", max_duration_ps, minimum=1)
    if lo_dur > hi_dur:
        raise _fail(
            name,
            "min_duration_ps",
            min_duration_ps,
            f"is above max_duration_ps={max_duration_ps!r}",
        )
    steps = _int(name, "duty_steps", duty_steps, minimum=1)

    @st.composite
    def command(draw: st.DrawFn) -> Command:
        mode = draw(st.sampled_from(chosen), label="mode")
        duration = draw(st.integers(lo_dur, hi_dur), label="duration_ps")
        duty = Fraction(draw(_duty_steps(steps)), steps) if mode.drives else Fraction(0)
        return Command(mode, duration, duty)

    return st.lists(command(), min_size=lo_size, max_size=hi_size)


# -- raw edge traces ---------------------------------------------------------------------


def edge_traces(
    *,
    bridge: Bridge,
    max_edges: int = 20,
    min_gap_ps: int = 1,
    max_gap_ps: int = 1_000_000,
    undefined_levels: bool = False,
) -> st.SearchStrategy[Trace]:
    """Traces of arbitrary edges on every channel of ``bridge``, safe or not.

    For testing checkers (your own or a rule against a brute-force reference):
    each channel gets up to ``max_edges`` real level changes, separated by
    ``[min_gap_ps, max_gap_ps]``; channels are independent, so overlaps,
    hand-overs with short or zero gaps and coincident edges all occur. With
    ``undefined_levels`` the levels X and Z appear too. The window starts at 0
    and ends 1 ps to ``max_gap_ps`` after the last edge. Shrinks toward fewer
    edges, every channel starting low, short gaps and an early end.
    """
    name = "edge_traces"
    bridge = _bridge(name, bridge)
    n_max = _int(name, "max_edges", max_edges)
    g_lo = _int(name, "min_gap_ps", min_gap_ps, minimum=1)
    g_hi = _int(name, "max_gap_ps", max_gap_ps, minimum=1)
    if g_lo > g_hi:
        raise _fail(name, "min_gap_ps", min_gap_ps, f"is above max_gap_ps={max_gap_ps!r}")
    if not isinstance(undefined_levels, bool):
        raise _fail(name, "undefined_levels", undefined_levels, "must be True or False")
    levels = tuple(int(v) for v in Level) if undefined_levels else (0, 1)

    @st.composite
    def channel(draw: st.DrawFn, ch: str) -> Channel:
        initial = draw(st.sampled_from(levels), label=f"{ch} initial")
        gaps = draw(st.lists(st.integers(g_lo, g_hi), max_size=n_max), label=f"{ch} gaps")
        values, current = [], initial
        for _ in gaps:
            current = draw(st.sampled_from([v for v in levels if v != current]))
            values.append(current)
        times = np.cumsum(np.asarray(gaps, dtype=np.int64))
        return Channel(ch, initial, times, np.asarray(values, dtype=np.int8))

    @st.composite
    def trace(draw: st.DrawFn) -> Trace:
        channels = {ch: draw(channel(ch)) for ch in bridge.channels}
        last = max((int(c.times[-1]) for c in channels.values() if c.times.size), default=0)
        end = last + draw(st.integers(1, g_hi), label="tail_ps")  # edges inside [0, end)
        rows = sum(c.edge_count for c in channels.values())
        return Trace(channels, 0, end, path="<edge_traces>", rows=rows, kind="generated")

    return trace()

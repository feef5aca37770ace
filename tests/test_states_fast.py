"""The fast state decoder (one sort of all edges, per-key tables) against the general
one (levels per segment, base-5 leg codes): identical timelines, cores included."""

from __future__ import annotations

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sequencecheck.model import Bridge, Channel, Leg, Level, Trace
from sequencecheck.rules._states import (
    DEFAULT_HANDOVER_MAX_PS,
    StateNamer,
    decode,
    decode_general,
)
from tests.test_modes_properties import USER_MODES, cases, make_trace

X, Z = int(Level.X), int(Level.Z)


def same(a, b):
    assert a.names == b.names
    for part in ("raw", "merged"):
        sa, sb = getattr(a, part), getattr(b, part)
        for field in ("starts", "ends", "states", "core_starts", "core_ends"):
            x, y = getattr(sa, field), getattr(sb, field)
            assert x.dtype == y.dtype, (part, field)
            assert x.tolist() == y.tolist(), (part, field)


@st.composite
def windowed(draw):
    """Edges before, at and after the window's ends; up to four legs; active-low."""
    n_legs = draw(st.integers(1, 4))
    legs = tuple(Leg(n, n + "H", n + "L") for n in "ABCD"[:n_legs])
    chans = [c for leg in legs for c in leg.channels]
    levels = st.sampled_from([0, 1, X, Z] if draw(st.booleans()) else [0, 1])
    channels = {}
    for c in chans:
        times = sorted(draw(st.sets(st.integers(0, 40), max_size=10)))
        channels[c] = Channel(
            c,
            draw(levels),
            np.array(times, dtype=np.int64),
            np.array([draw(levels) for _ in times], dtype=np.int8),
        )
    start = draw(st.integers(0, 20))
    end = draw(st.integers(start, 42))
    active_low = frozenset(draw(st.sets(st.sampled_from(chans), max_size=2)))
    modes = USER_MODES.get(n_legs, ()) if draw(st.booleans()) else ()
    bridge = Bridge(legs, active_low=active_low, modes=modes)
    return bridge, Trace(channels, start, end), draw(st.integers(0, 8))


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(windowed())
def test_fast_decoder_matches_general_with_windows(case):
    bridge, trace, max_gap = case
    general = decode_general(trace, bridge, StateNamer(bridge), max_gap)
    same(decode(trace, bridge, max_gap), general)


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(cases())
def test_fast_decoder_matches_general_on_walks(case):
    bridge, spec, width, max_gap = case
    trace = make_trace(spec, width)
    same(decode(trace, bridge, max_gap), decode_general(trace, bridge, StateNamer(bridge), max_gap))


def test_general_decoder_still_serves_many_legs():
    legs = tuple(Leg(f"L{k}", f"H{k}", f"O{k}") for k in range(7))
    chans = {}
    for k, leg in enumerate(legs):
        chans[leg.high] = Channel(
            leg.high, 0, np.array([k + 1], dtype=np.int64), np.array([1], dtype=np.int8)
        )
        chans[leg.low] = Channel(
            leg.low, 1, np.array([k + 1], dtype=np.int64), np.array([0], dtype=np.int8)
        )
    bridge = Bridge(legs)
    tl = decode(Trace(chans, 0, 10), bridge)
    assert tl.raw.starts.tolist() == list(range(8))
    assert tl.names[int(tl.raw.states[-1])] == "s-" + "1" * 7
    assert tl.handover_max_ps == DEFAULT_HANDOVER_MAX_PS

"""Shoot-through and dead-time on hand-built edge lists, and against a brute-force walk."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from reference import walk

from sequencecheck import Bridge, Certainty, Channel, DeadTime, Leg, Policy, Trace, read_csv, run

NS = 1_000
LEG = Leg("A", "AH", "AL")


def trace(
    edges: dict[str, tuple[int, list[tuple[int, int]]]], end: int, ts: int | None = None
) -> Trace:
    channels = {
        name: Channel.from_changes(
            name,
            initial,
            np.array([t for t, _ in ev], dtype=np.int64),
            np.array([v for _, v in ev], dtype=np.int8),
        )
        for name, (initial, ev) in edges.items()
    }
    return Trace(channels, 0, end, sample_period_ps=ts)


def check(tr: Trace, dead_ns: int | None = None, active_low: frozenset[str] = frozenset()):
    policy = Policy(dead_time=None if dead_ns is None else DeadTime.both(dead_ns * NS))
    return run(tr, Bridge((LEG,), active_low=active_low), policy)


def test_shoot_through_interval_is_exact():
    # AL stays on until 1200 ns; AH turns on at 1100 ns: 100 ns overlap [1100, 1200)
    tr = trace(
        {"AH": (0, [(1100 * NS, 1), (2000 * NS, 0)]), "AL": (1, [(1200 * NS, 0)])}, 3000 * NS
    )
    (f,) = [f for f in check(tr).violations if f.rule == "shoot-through"]
    assert (f.start_ps, f.end_ps, f.measured_ps, f.margin_ps) == (
        1100 * NS,
        1200 * NS,
        100 * NS,
        -100 * NS,
    )


def test_dead_time_finding_fields():
    # AH off at 1000 ns, AL on at 1150 ns: 150 ns dead time, 500 ns required
    tr = trace({"AH": (1, [(1000 * NS, 0)]), "AL": (0, [(1150 * NS, 1)])}, 2000 * NS)
    (f,) = check(tr, dead_ns=500).violations
    assert f.rule == "dead-time"
    assert (f.start_ps, f.end_ps, f.measured_ps, f.required_ps, f.margin_ps) == (
        1000 * NS,
        1150 * NS,
        150 * NS,
        500 * NS,
        -350 * NS,
    )
    assert f.detail["direction"] == "high-to-low"
    assert f.channels == ("AH", "AL")


def test_simultaneous_switching_is_zero_dead_time_not_shoot_through():
    tr = trace({"AH": (1, [(1000 * NS, 0)]), "AL": (0, [(1000 * NS, 1)])}, 2000 * NS)
    rules = [f.rule for f in check(tr, dead_ns=100).violations]
    assert rules == ["dead-time"]


def test_overlap_still_running_at_capture_end_ends_at_capture_end():
    tr = trace({"AH": (0, [(1500 * NS, 1)]), "AL": (1, [])}, 2000 * NS)
    (f,) = check(tr).violations
    assert (f.start_ps, f.end_ps) == (1500 * NS, 2000 * NS)
    assert f.detail["open_end"] is True


def test_active_low_channels_are_inverted():
    # AL active low: level 0 = on. AH on [100,200), AL on (level 0) [150, 300)
    tr = trace(
        {"AH": (0, [(100 * NS, 1), (200 * NS, 0)]), "AL": (1, [(150 * NS, 0), (300 * NS, 1)])},
        400 * NS,
    )
    (f,) = check(tr, active_low=frozenset({"AL"})).violations
    assert (f.rule, f.start_ps, f.end_ps) == ("shoot-through", 150 * NS, 200 * NS)


def test_non_complementary_pulse_is_not_a_handover():
    # AL turns off at 100 ns; AH pulses twice: only the first turn-on is a hand-over
    tr = trace(
        {
            "AH": (0, [(300 * NS, 1), (400 * NS, 0), (450 * NS, 1), (500 * NS, 0)]),
            "AL": (1, [(100 * NS, 0)]),
        },
        1000 * NS,
    )
    stats = check(tr, dead_ns=100).leg_stats[0]
    assert stats.low_to_high.count == 1
    assert stats.low_to_high.min_gap_ps == 200 * NS


def test_clean_run_has_statistics_and_margins():
    tr = trace(
        {"AH": (0, [(600 * NS, 1), (1000 * NS, 0)]), "AL": (1, [(100 * NS, 0), (1700 * NS, 1)])},
        2000 * NS,
    )
    r = check(tr, dead_ns=400)
    assert r.violations == ()
    s = r.leg_stats[0]
    assert (s.low_to_high.count, s.low_to_high.min_gap_ps, s.low_to_high.min_gap_at_ps) == (
        1,
        500 * NS,
        600 * NS,
    )
    assert (s.high_to_low.count, s.high_to_low.min_gap_ps) == (1, 700 * NS)
    (dead,) = [m for m in r.margins if m.rule == "dead-time"]
    assert (dead.margin_ps, dead.at_ps) == (100 * NS, 600 * NS)


# facts.md section 8 [derived] (sampled dead time): Ts = 10 ns, a gap of 12 samples lies in
# (110, 130) ns; with 0 samples the gap is in (-10, +10) ns and inconclusive.
@pytest.mark.parametrize(
    ("gap_samples", "required_ns", "expect"),
    [
        (12, 140, Certainty.PROVEN),  # (m+1) Ts = 130 <= 140: proven violation
        (12, 125, Certainty.INCONCLUSIVE),  # 120 < 125 < 130: measured fails, bounds straddle
        (0, 5, Certainty.INCONCLUSIVE),  # 0 samples: (-10, 10) ns straddles 5 ns
        (0, 10, Certainty.PROVEN),  # (0+1) Ts = 10 <= 10
    ],
)
def test_sampled_dead_time_bounds(gap_samples, required_ns, expect):
    ts = 10 * NS
    off = 100 * ts
    tr = trace({"AH": (1, [(off, 0)]), "AL": (0, [(off + gap_samples * ts, 1)])}, 300 * ts, ts=ts)
    (f,) = check(tr, dead_ns=required_ns).violations
    assert f.certainty is expect
    assert f.bounds_ps == ((gap_samples - 1) * ts, (gap_samples + 1) * ts)


def test_clean_but_unproven_handover_is_counted():
    # facts.md section 8 [derived]: 12 samples at 10 ns clear 115 ns by measurement (120 ns),
    # but the true gap may be as low as 110 ns: "not proven", never silently passed.
    ts = 10 * NS
    tr = trace({"AH": (1, [(100 * ts, 0)]), "AL": (0, [(112 * ts, 1)])}, 300 * ts, ts=ts)
    r = check(tr, dead_ns=115)
    assert r.violations == ()
    assert r.leg_stats[0].high_to_low.not_proven == 1


# ---- vectorised rules against the brute-force walk, through the CSV reader ----


@st.composite
def captures(draw):
    """Random two-channel captures: sampled (uniform step) or one row per change."""
    sampled = draw(st.booleans())
    n = draw(st.integers(2, 60))
    ah = draw(st.lists(st.integers(0, 1), min_size=n, max_size=n))
    al = draw(st.lists(st.integers(0, 1), min_size=n, max_size=n))
    if sampled:
        step = draw(st.sampled_from([1, 10, 1000]))
        times = [i * step for i in range(n)]
    else:
        steps = draw(st.lists(st.integers(0, 50), min_size=n - 1, max_size=n - 1))
        times = [0]
        for s in steps:
            times.append(times[-1] + s)
    active_low = frozenset(draw(st.sets(st.sampled_from(["AH", "AL"]))))
    dead = draw(st.integers(0, 120))
    return times, ah, al, active_low, dead


@settings(max_examples=150, deadline=None)
@given(captures())
def test_rules_match_brute_force_walk(tmp_path_factory, capture):
    times, ah, al, active_low, dead = capture
    path = tmp_path_factory.mktemp("cap") / "c.csv"
    path.write_text(
        "time_ns,AH,AL\n"
        + "".join(f"{t},{h},{lo}\n" for t, h, lo in zip(times, ah, al, strict=True))
    )
    tr = read_csv(str(path))
    report = run(
        tr, Bridge((LEG,), active_low=active_low), Policy(dead_time=DeadTime.both(dead * NS))
    )

    rows = [(t * NS, {"AH": h, "AL": lo}) for t, h, lo in zip(times, ah, al, strict=True)]
    overlaps, handovers = walk(rows, "AH", "AL", tr.end_ps, active_low)

    got_st = [(f.start_ps, f.end_ps) for f in report.violations if f.rule == "shoot-through"]
    assert got_st == [(o.start, o.end) for o in overlaps]
    got_dt = sorted((f.start_ps, f.end_ps) for f in report.violations if f.rule == "dead-time")
    want_dt = sorted((h.off, h.on) for h in handovers if h.on - h.off < dead * NS)
    assert got_dt == want_dt
    stats = report.leg_stats[0]
    for name, d in (("high-to-low", stats.high_to_low), ("low-to-high", stats.low_to_high)):
        gaps = [h.on - h.off for h in handovers if h.direction == name]
        assert d.count == len(gaps)
        assert d.min_gap_ps == (min(gaps) if gaps else None)


def test_sanity_warnings_do_not_fail_unless_strict():
    tr = trace({"AH": (0, [(100 * NS, 1)]), "AL": (0, [])}, 1000 * NS)
    r = check(tr)
    assert sorted(f.rule for f in r.warnings) == ["short-capture", "stuck-channel"]
    assert r.violations == ()


def test_twin_channels_warning():
    edges = [(100 * NS, 1), (200 * NS, 0), (300 * NS, 1), (400 * NS, 0)]
    tr = trace({"AH": (0, edges), "AL": (0, edges)}, 1000 * NS)
    assert "twin-channels" in [f.rule for f in check(tr).warnings]

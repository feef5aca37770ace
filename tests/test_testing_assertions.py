"""assert_safe against a brute-force walk over every instant between edges."""

from __future__ import annotations

import itertools

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sequencecheck.findings import Report
from sequencecheck.model import Bridge, DeadTime, Leg, Policy, Trace
from sequencecheck.reporters import render
from sequencecheck.rules import run
from sequencecheck.testing import Recorder, SafetyAssertionError, assert_safe, edge_traces

H_BRIDGE = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")), active_low=frozenset({"BL"}))


def _on_segments(trace: Trace, bridge: Bridge, ch: str) -> list[tuple[int, int]]:
    """Brute force: every [t_i, t_i+1) between consecutive edges where ``ch``'s switch is on."""
    c = trace.channel(ch)
    cuts = sorted({trace.start_ps, trace.end_ps, *c.times.tolist()})
    return [
        (a, b)
        for a, b in itertools.pairwise(cuts)
        if a < b and c.level_at(a) == bridge.on_level(ch)
    ]


def _turn_ons(trace: Trace, bridge: Bridge, ch: str) -> list[int]:
    c, on = trace.channel(ch), bridge.on_level(ch)
    return [
        t
        for t in c.times.tolist()
        if t < trace.end_ps and c.level_at(t) == on and c.level_at(t - 1) != on
    ]


def _unsafe_by_brute_force(trace: Trace, bridge: Bridge, dead_ps: int) -> bool:
    for leg in bridge.legs:
        high, low = (_on_segments(trace, bridge, ch) for ch in leg.channels)
        if any(min(b1, b2) > max(a1, a2) for a1, b1 in high for a2, b2 in low):
            return True  # both on together for a positive time
        for ch, other in ((leg.high, low), (leg.low, high)):
            for t in _turn_ons(trace, bridge, ch):
                # the complement must have been off during the whole dead time before
                if any(a < t and b > max(t - dead_ps, trace.start_ps) for a, b in other):
                    return True
    return False


@settings(max_examples=300, deadline=None, database=None)
@given(
    edge_traces(bridge=H_BRIDGE, max_edges=6, max_gap_ps=30, undefined_levels=True),
    st.integers(0, 40),
)
def test_assert_safe_agrees_with_brute_force(trace, dead_ps):
    policy = Policy(dead_time=DeadTime.both(dead_ps))
    result = run(trace, H_BRIDGE, policy)
    conduction = {f.rule for f in result.violations} & {"shoot-through", "dead-time"}
    assert bool(conduction) == _unsafe_by_brute_force(trace, H_BRIDGE, dead_ps)
    # assert_safe fails exactly when some registered rule (conduction or other) does
    try:
        assert_safe(trace, H_BRIDGE, policy)
    except SafetyAssertionError as e:
        assert result.violations and e.report.violations == result.violations
    else:
        assert not result.violations


def test_message_is_the_text_report():
    rec = Recorder(("AH", "AL", "BH", "BL"), initial={"BL": 1}, name="cart drive")
    rec.set(0, AL=1)
    rec.set(1_000_000, AL=0)
    rec.set(1_050_000, AH=1)  # 50 ns after AL off: short of 200 ns
    rec.set(3_000_000, AH=0)
    rec.set(3_000_000, AL=1)  # same instant: no dead time at all
    rec.step(1_000_000)
    trace = rec.trace()
    policy = Policy(dead_time=DeadTime.both(200_000))
    with pytest.raises(AssertionError) as info:
        assert_safe(trace, H_BRIDGE, policy)
    text = str(info.value)
    report_text = render(Report((run(trace, H_BRIDGE, policy),)), "text")
    assert text == "gate sequence is not safe: 2 finding(s) in cart drive\n\n" + report_text
    assert "leg A: AH on 50 ns after AL off; needs 200 ns  margin -150 ns" in text
    assert "leg A: AL on 0 s after AH off; needs 200 ns  margin -200 ns" in text


def test_safe_trace_returns_the_report_and_strict_counts_warnings():
    rec = Recorder(("AH", "AL", "BH", "BL"), initial={"BL": 1})
    rec.set(500_000, AH=1)
    rec.step(1_000_000, AH=0)
    rec.step(300_000, AL=1)
    rec.step(1_000)
    result = assert_safe(rec.trace(), H_BRIDGE, Policy(dead_time=DeadTime.both(200_000)))
    assert result.edges == 3 and not result.violations
    a = result.leg_stats[0]
    assert a.high_to_low.count == 1 and a.high_to_low.min_gap_ps == 300_000

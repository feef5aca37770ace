"""The strategies produce only valid values for the bridge given, and refuse bad options at once."""

from __future__ import annotations

from fractions import Fraction

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.errors import InvalidArgument

from sequencecheck.errors import UsageError
from sequencecheck.model import Bridge, Leg, Level
from sequencecheck.testing import (
    SWITCH_RANGES,
    Command,
    DriveMode,
    PwmSettings,
    command_sequences,
    edge_traces,
    modes_for,
    pwm_settings,
)

HALF = Bridge((Leg("U", "UH", "UL"),))
H_BRIDGE = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")))
THREE = Bridge((Leg("U", "UH", "UL"), Leg("V", "VH", "VL"), Leg("W", "WH", "WL")))
FAST = settings(max_examples=60, deadline=None, database=None)


@FAST
@given(st.data())
def test_command_sequences_are_valid_for_each_bridge(data):
    bridge = data.draw(st.sampled_from([HALF, H_BRIDGE, THREE]))
    commands = data.draw(
        command_sequences(
            bridge=bridge, min_size=2, max_size=6, min_duration_ps=10, max_duration_ps=99
        )
    )
    assert 2 <= len(commands) <= 6
    for c in commands:
        assert isinstance(c, Command)
        assert c.mode in modes_for(bridge)
        assert 10 <= c.duration_ps <= 99 and isinstance(c.duration_ps, int)
        assert 0 <= c.duty <= 1 and (c.mode.drives or c.duty == 0)
    if len(bridge.legs) == 1:
        assert DriveMode.REVERSE not in {c.mode for c in commands}


@FAST
@given(command_sequences(bridge=H_BRIDGE, modes=["brake", "forward"], duty_steps=4))
def test_command_sequences_keep_to_the_modes_and_duty_steps_asked(commands):
    assert {c.mode for c in commands} <= {DriveMode.BRAKE, DriveMode.FORWARD}
    assert all((c.duty * 4).denominator == 1 for c in commands)


@FAST
@given(
    st.sampled_from(sorted(SWITCH_RANGES)).flatmap(
        lambda s: st.tuples(st.just(s), pwm_settings(switch=s))
    )
)
def test_pwm_settings_are_realistic(switch_and_pwm):
    switch, pwm = switch_and_pwm
    f_lo, f_hi = SWITCH_RANGES[switch]["frequency_hz"]
    d_lo, d_hi = SWITCH_RANGES[switch]["dead_time_ps"]
    assert isinstance(pwm, PwmSettings)
    assert 10**12 // f_hi <= pwm.period_ps <= 10**12 // f_lo
    assert d_lo <= pwm.dead_time_ps <= d_hi and 2 * pwm.dead_time_ps < pwm.period_ps
    assert 0 <= pwm.duty <= 1 and 0 <= pwm.on_ps <= pwm.period_ps


def test_switch_ranges_match_the_trade():
    # facts.md section 1, magnitudes: MOSFET legs tens to a few hundred ns, IGBT legs about 1-5 us [common practice]
    assert SWITCH_RANGES["mosfet"]["dead_time_ps"] == (20_000, 500_000)
    assert SWITCH_RANGES["igbt"]["dead_time_ps"] == (1_000_000, 5_000_000)


@FAST
@given(st.data())
def test_edge_traces_are_well_formed(data):
    bridge = data.draw(st.sampled_from([HALF, H_BRIDGE, THREE]))
    undefined = data.draw(st.booleans())
    trace = data.draw(
        edge_traces(
            bridge=bridge, max_edges=8, min_gap_ps=3, max_gap_ps=40, undefined_levels=undefined
        )
    )
    assert set(trace.channels) == set(bridge.channels)
    allowed = {0, 1, 2, 3} if undefined else {0, 1}
    for ch in trace.channels.values():
        assert ch.times.dtype == np.int64 and ch.edge_count <= 8
        gaps = np.diff(np.concatenate(([0], ch.times)))
        assert ((gaps >= 3) & (gaps <= 40)).all()
        before = np.concatenate(([ch.initial], ch.levels[:-1]))
        assert (ch.levels != before).all()  # every edge is a real change
        assert set(ch.levels.tolist()) | {ch.initial} <= allowed
        assert not ch.times.size or ch.times[-1] < trace.end_ps
    assert trace.start_ps == 0


def test_edge_traces_shrink_toward_nothing():
    from hypothesis import find

    smallest = find(edge_traces(bridge=H_BRIDGE), lambda t: True, settings=settings(database=None))
    assert smallest.edge_count == 0
    assert all(ch.initial == Level.LOW for ch in smallest.channels.values())


@pytest.mark.parametrize(
    ("make", "pattern"),
    [
        (
            lambda: pwm_settings(switch="thyristor"),
            r"^pwm_settings\(switch='thyristor'\): must be one of mosfet, igbt$",
        ),
        (
            lambda: pwm_settings(frequency_hz=(20_000, 10_000)),
            r"pwm_settings\(frequency_hz=\(20000, 10000\)\): low end",
        ),
        (
            lambda: pwm_settings(frequency_hz=(1, 2.5)),
            r"pwm_settings\(frequency_hz=\(1, 2.5\)\): both ends must be an integer",
        ),
        (
            lambda: pwm_settings(dead_time_ps=(6_000_000, 7_000_000)),
            r"pwm_settings\(dead_time_ps=.*no room",
        ),
        (lambda: pwm_settings(duty_steps=0), r"pwm_settings\(duty_steps=0\): must be at least 1"),
        (
            lambda: command_sequences(bridge=HALF, modes=["reverse"]),
            r"'reverse' needs a bridge of two legs",
        ),
        (
            lambda: command_sequences(bridge=H_BRIDGE, modes=["sideways"]),
            r"command_sequences\(modes=\['sideways'\]\)",
        ),
        (lambda: command_sequences(bridge=H_BRIDGE, modes=[]), r"must name at least one mode"),
        (
            lambda: command_sequences(bridge="AH,AL"),
            r"command_sequences\(bridge='AH,AL'\): must be a sequencecheck Bridge",
        ),
        (
            lambda: command_sequences(bridge=H_BRIDGE, min_size=5, max_size=2),
            r"command_sequences\(min_size=5\)",
        ),
        (
            lambda: command_sequences(bridge=H_BRIDGE, min_duration_ps=0),
            r"min_duration_ps=0\): must be at least 1",
        ),
        (
            lambda: command_sequences(bridge=H_BRIDGE, min_duration_ps=9, max_duration_ps=3),
            r"min_duration_ps=9\): is above",
        ),
        (
            lambda: edge_traces(bridge=H_BRIDGE, min_gap_ps=10, max_gap_ps=1),
            r"edge_traces\(min_gap_ps=10\)",
        ),
        (
            lambda: edge_traces(bridge=H_BRIDGE, undefined_levels="yes"),
            r"edge_traces\(undefined_levels='yes'\)",
        ),
        (lambda: edge_traces(bridge=H_BRIDGE, max_edges=-1), r"edge_traces\(max_edges=-1\)"),
    ],
)
def test_bad_options_are_refused_when_the_strategy_is_made(make, pattern):
    with pytest.raises(InvalidArgument, match=pattern):
        make()  # not drawn from: validation is eager


def test_records_refuse_invalid_values():
    with pytest.raises(UsageError, match="a brake command has no duty"):
        Command("brake", 10, Fraction(1, 2))
    with pytest.raises(UsageError, match="command mode must be one of"):
        Command("sideways", 10)
    with pytest.raises(UsageError, match="duration_ps must be > 0 ps, not 0"):
        Command("coast", 0)
    with pytest.raises(UsageError, match="duty must be exact"):
        Command("forward", 10, 0.5)
    with pytest.raises(UsageError, match="duty must lie between 0 and 1"):
        PwmSettings(1_000, Fraction(3, 2), 0)
    with pytest.raises(UsageError, match="less than half the period"):
        PwmSettings(1_000, Fraction(1, 2), 500)
    assert (
        repr(Command("forward", 1_500, Fraction(1, 4)))
        == "Command('forward', duration_ps=1_500, duty=Fraction(1, 4))"
    )
    assert repr(Command("stop", 7)) == "Command('stop', duration_ps=7)"
    assert modes_for(HALF) == (DriveMode.COAST, DriveMode.BRAKE, DriveMode.FORWARD, DriveMode.STOP)

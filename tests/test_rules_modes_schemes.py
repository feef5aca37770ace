"""PWM schemes: locked anti-phase and sign-magnitude on two legs, six-step and sinusoidal
PWM on three legs. Clean schemes must give no finding; broken ones exact intervals."""

import math

import pytest
from tracebuild import NS, THREE_LEGS, TWO_LEGS, US, legs_trace, pwm_pole

from sequencecheck import Policy, check_trace
from sequencecheck.model import TransitionPolicy, TransitionRule
from sequencecheck.rules._states import decode
from sequencecheck.rules.modes import lap_periods

PERIOD, DEAD = 50 * US, 500 * NS
LAP = TransitionPolicy(scheme="locked-anti-phase")


def lap_trace(duties):
    """Locked anti-phase (facts.md section 5 [published, S19]): leg B is leg A inverted,
    so forward and reverse alternate every period; duty is leg A's high share."""
    highs = [round(d * PERIOD) for d in duties]
    a = pwm_pole(PERIOD, highs)
    b = [(t, 1 - side) for t, side in a]
    return legs_trace({"A": a, "B": b}, TWO_LEGS, len(duties) * PERIOD, DEAD)


def modes(report):
    return [f for f in report.findings if f.rule == "mode-transition"]


def test_locked_anti_phase_at_constant_duty_is_clean():
    t = lap_trace([0.7] * 20)
    policy = Policy(reversal_dwell_ps=1_000 * US, min_pulse_ps=10 * US, transitions=LAP)
    assert check_trace(t, TWO_LEGS, policy).findings == ()
    # the same waveform judged as sign-magnitude: every alternation is a reversal
    sm = Policy(reversal_dwell_ps=1_000 * US)
    found = modes(check_trace(t, TWO_LEGS, sm))
    assert len(found) == 20 + 19
    assert all(f.measured_ps == DEAD for f in found)


def test_locked_anti_phase_periods_and_directions():
    tl = decode(lap_trace([0.7, 0.5, 0.3]), TWO_LEGS)
    starts, drive_end, direction = lap_periods(tl, 20_000)
    assert starts.tolist() == [0, PERIOD + DEAD, 2 * PERIOD + DEAD]
    assert drive_end.tolist() == [PERIOD, 2 * PERIOD, 3 * PERIOD]
    assert direction.tolist() == [1, 0, -1]


def test_locked_anti_phase_fast_duty_flip_is_a_reversal():
    t = lap_trace([0.7] * 10 + [0.3] * 10)
    r = check_trace(t, TWO_LEGS, Policy(reversal_dwell_ps=1_000 * US, transitions=LAP))
    [f] = modes(r)
    # start: end of the last drive segment of the last forward period (reverse part of
    # period 9 ends at 10 periods); end: start of the first reverse-driving period
    assert (f.start_ps, f.end_ps, f.measured_ps) == (10 * PERIOD, 10 * PERIOD + DEAD, DEAD)
    assert (f.detail["from"], f.detail["to"]) == ("forward", "reverse")


@pytest.mark.parametrize(("neutral", "found"), [(30, False), (10, True)])
def test_locked_anti_phase_slow_crossing_dwells_near_half(neutral, found):
    duties = [0.7] * 10 + [0.55] * 3 + [0.5] * neutral + [0.45] * 10 + [0.3] * 5
    r = check_trace(
        lap_trace(duties), TWO_LEGS, Policy(reversal_dwell_ps=1_000 * US, transitions=LAP)
    )
    got = modes(r)
    if not found:
        assert got == []
        margin = [m for m in r.margins if m.rule == "mode-transition"]
        assert margin[0].measured_ps == neutral * PERIOD + DEAD
        return
    [f] = got
    assert (f.start_ps, f.end_ps) == (13 * PERIOD, (13 + neutral) * PERIOD + DEAD)
    assert f.measured_ps == neutral * PERIOD + DEAD


SIX_STEP = ["100", "110", "010", "011", "001", "101"]


def three_leg_trace(patterns, step):
    """Three complementary legs following one switching pattern per step."""
    poles = {leg.name: [] for leg in THREE_LEGS.legs}
    for k, bits in enumerate(patterns):
        for leg, b in zip(THREE_LEGS.legs, bits, strict=True):
            poles[leg.name].append((k * step, int(b)))
    return legs_trace(poles, THREE_LEGS, len(patterns) * step, DEAD)


# facts.md section 6 [derived]: 100 -> 011 and 000 -> 111 change all three legs
THREE_LEG_JUMPS = TransitionPolicy(
    rules=tuple(
        TransitionRule(f"V{x}", f"V{y}", allowed=False)
        for x, y in [(1, 4), (4, 1), (2, 5), (5, 2), (3, 6), (6, 3), (0, 7), (7, 0)]
    )
)


def test_six_step_is_clean_and_visits_the_vectors_in_order():
    t = three_leg_trace(SIX_STEP * 3, 100 * US)
    # only the six neighbour steps of facts.md section 6 [derived] are allowed
    ring = [f"V{k}" for k in (1, 2, 3, 4, 5, 6)]
    rules = [TransitionRule("*", "*", allowed=False)]
    rules += [TransitionRule(a, b) for a, b in zip(ring, ring[1:] + ring[:1], strict=True)]
    policy = Policy(min_pulse_ps=10 * US, transitions=TransitionPolicy(rules=tuple(rules)))
    r = check_trace(t, THREE_LEGS, policy)
    assert r.findings == ()
    tl = decode(t, THREE_LEGS)
    assert [tl.names[s] for s in tl.merged.states.tolist()] == ring * 3
    # each change of vector is at the incoming switch's turn-on, a dead time after the step
    assert tl.merged.starts.tolist()[1:] == [k * 100 * US + DEAD for k in range(1, 18)]


def test_six_step_with_a_skipped_step_is_found():
    patterns = ["100", "110", "010", "101", "100"]  # 010 -> 101 changes all three legs
    t = three_leg_trace(patterns, 100 * US)
    tp = TransitionPolicy(rules=(TransitionRule("V3", "V6", allowed=False),))
    [f] = modes(check_trace(t, THREE_LEGS, Policy(transitions=tp)))
    assert (f.start_ps, f.end_ps) == (300 * US, 300 * US + DEAD)
    assert (f.detail["from"], f.detail["to"]) == ("V3", "V6")


def spwm_trace(cycles=1, m=0.8, carrier=PERIOD, fundamental_ps=20_000 * US):
    """Regular-sampled, centre-aligned sinusoidal PWM of three legs 120 degrees apart."""
    n = cycles * fundamental_ps // carrier
    poles = {leg.name: [] for leg in THREE_LEGS.legs}
    for k in range(n):
        angle = 2 * math.pi * k * carrier / fundamental_ps
        for j, leg in enumerate(THREE_LEGS.legs):
            duty = 0.5 + 0.5 * m * math.sin(angle - 2 * math.pi * j / 3)
            high = round(duty * carrier / NS) * NS
            t0 = k * carrier + (carrier - high) // 2
            poles[leg.name] += [(k * carrier, 0), (t0, 1), (t0 + high, 0)]
    return legs_trace(poles, THREE_LEGS, n * carrier, DEAD)


def test_sinusoidal_pwm_of_three_legs_is_clean():
    t = spwm_trace()
    r = check_trace(t, THREE_LEGS, Policy(min_pulse_ps=1 * US, transitions=THREE_LEG_JUMPS))
    assert r.findings == ()
    view = r.extra["states"]
    visited = {s["state"] for s in view["states"] if s["visits"]}
    # dead time never shows up as a state: only the eight vectors remain
    assert visited <= {f"V{k}" for k in range(8)}
    assert {"V0", "V7"} <= visited and len(visited) == 8
    # without folding hand-overs, dead time would show up as open-leg states
    raw = {s["state"] for s in view["states"] if s["exact_time_ps"]}
    assert any(name.startswith("open-") for name in raw)


def test_locked_anti_phase_duty_is_exact_for_long_periods():
    # periods of 10 s (past the int64 fast path): 5.2 s forward is 52 % duty, outside a 1 %
    # band; 5.04 s forward is 50.4 %, inside it
    s = 10**12
    a = pwm_pole(10 * s, [round(5.2 * s), round(5.04 * s)])
    b = [(t, 1 - side) for t, side in a]
    t = legs_trace({"A": a, "B": b}, TWO_LEGS, 20 * s, 0)
    _, _, direction = lap_periods(decode(t, TWO_LEGS), 10_000)
    assert direction.tolist() == [1, 0]

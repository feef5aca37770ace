"""min-pulse and unknown-state on hand-built traces with exact intervals."""

from tracebuild import NS, TWO_LEGS, US, channel, switch, trace

from sequencecheck import Certainty, Policy, check_trace
from sequencecheck.model import Bridge, Level


def only(report, rule):
    return [f for f in report.findings if f.rule == rule]


def test_on_and_off_pulses_shorter_than_the_minimum():
    # AH: on 1-1.05 us (50 ns on-pulse), off 1.05-1.08 us (30 ns off-pulse), on until 3 us
    t = trace(
        [
            switch("AH", [(1 * US, 1_050 * NS), (1_080 * NS, 3 * US)]),
            switch("AL", [(0, 500 * NS)]),  # cut by the window start: not a pulse
            switch("BH", []),
            switch("BL", [(0, 5 * US)]),
        ],
        5 * US,
    )
    r = check_trace(t, TWO_LEGS, Policy(min_pulse_ps=100 * NS))
    got = [
        (f.channels, f.start_ps, f.end_ps, f.measured_ps, f.detail["pulse"])
        for f in only(r, "min-pulse")
    ]
    assert got == [
        (("AH",), 1 * US, 1_050 * NS, 50 * NS, "on"),
        (("AH",), 1_050 * NS, 1_080 * NS, 30 * NS, "off"),
    ]
    f = only(r, "min-pulse")[0]
    assert f.required_ps == 100 * NS and f.margin_ps == -50 * NS and f.leg == "A"
    # exactly the minimum passes
    assert only(check_trace(t, TWO_LEGS, Policy(min_pulse_ps=30 * NS)), "min-pulse") == []
    assert len(only(check_trace(t, TWO_LEGS, Policy(min_pulse_ps=30 * NS + 1)), "min-pulse")) == 1
    # no minimum: measured, never reported
    assert only(check_trace(t, TWO_LEGS, Policy()), "min-pulse") == []


def test_active_low_channel_pulses_are_named_by_the_switch():
    bridge = Bridge(TWO_LEGS.legs, active_low=frozenset({"AL"}))
    # AL is active low: a 40 ns low stretch is an on-pulse of the low side
    t = trace(
        [
            switch("AH", []),
            channel("AL", 1, [(200 * NS, 0), (240 * NS, 1)]),
            switch("BH", []),
            switch("BL", []),
        ],
        1 * US,
    )
    [f] = only(check_trace(t, bridge, Policy(min_pulse_ps=100 * NS)), "min-pulse")
    assert (f.start_ps, f.end_ps, f.detail["pulse"]) == (200 * NS, 240 * NS, "on")


def test_sampled_pulse_bounds_and_certainty():
    # facts.md section 8 [derived]: with sample period Ts, a width of m samples lies in
    # ((m-1) Ts, (m+1) Ts); proven short only when (m+1) Ts <= required
    ts = 10 * NS
    t = trace(
        [
            switch("AH", [(100 * NS, 150 * NS), (400 * NS, 495 * NS), (600 * NS, 690 * NS)]),
            switch("AL", []),
            switch("BH", []),
            switch("BL", []),
        ],
        1 * US,
        sample_period_ps=ts,
    )
    r = check_trace(t, TWO_LEGS, Policy(min_pulse_ps=100 * NS))
    pulses = {f.measured_ps: f for f in only(r, "min-pulse")}
    assert set(pulses) == {50 * NS, 95 * NS, 90 * NS}
    assert pulses[50 * NS].certainty is Certainty.PROVEN
    assert pulses[50 * NS].bounds_ps == (40 * NS, 60 * NS)
    assert pulses[90 * NS].certainty is Certainty.PROVEN  # (80, 100) ns: all short
    assert pulses[95 * NS].certainty is Certainty.INCONCLUSIVE  # (85, 105) ns straddles 100


def test_undefined_levels_are_reported_as_intervals():
    # AH: X from the start to 100 ns, Z 300-350 ns then X to 400 ns, X again from 900 ns
    ah = channel(
        "AH",
        Level.X,
        [
            (100 * NS, 0),
            (300 * NS, Level.Z),
            (350 * NS, Level.X),
            (400 * NS, 1),
            (900 * NS, Level.X),
        ],
    )
    t = trace([ah, switch("AL", []), switch("BH", []), switch("BL", [(0, 1 * US)])], 1 * US)
    r = check_trace(t, TWO_LEGS, Policy(min_pulse_ps=1 * US))
    got = [(f.start_ps, f.end_ps, f.measured_ps) for f in only(r, "unknown-state")]
    assert got == [
        (0, 100 * NS, 100 * NS),
        (300 * NS, 400 * NS, 100 * NS),
        (900 * NS, 1 * US, 100 * NS),
    ]
    last = only(r, "unknown-state")[-1]
    assert last.detail["open_end"] and last.channels == ("AH",) and last.leg == "A"
    # stretches at or next to an undefined level are not judged as pulses
    assert only(r, "min-pulse") == []
    # the decoded state is "unknown" while any switch is undefined, and no mode finding
    # is raised for changes into or out of it
    view = r.extra["states"]
    unknown = next(s for s in view["states"] if s["state"] == "unknown")
    assert unknown["exact_time_ps"] == 300 * NS
    assert only(r, "mode-transition") == []
    bl = channel("BL", 0, [(100 * NS, 1), (200 * NS, 0), (300 * NS, Level.Z), (400 * NS, 0)])
    t = trace([switch("AH", []), switch("AL", []), switch("BH", []), bl], 1 * US)
    r = check_trace(t, TWO_LEGS, Policy(min_pulse_ps=1 * US))
    # the on-pulse 100-200 ns is judged; the off stretch 200-300 ns ends in Z: not judged
    assert [(f.start_ps, f.end_ps) for f in only(r, "min-pulse")] == [(100 * NS, 200 * NS)]

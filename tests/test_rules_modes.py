"""Decoding of bridge states and the mode-transition rule on hand-built traces.

Every expected interval below is worked out by hand from the edges written in the test.
"""

import pytest
from tracebuild import NS, THREE_LEGS, TWO_LEGS, US, legs_trace, pwm_pole, switch, trace

from sequencecheck import Policy, check_trace
from sequencecheck.errors import InputError
from sequencecheck.model import (
    All,
    Any_,
    Bridge,
    Const,
    Leg,
    Mode,
    Not,
    Side,
    Source,
    SwitchOn,
    TransitionPolicy,
    TransitionRule,
)
from sequencecheck.rules._states import decode
from sequencecheck.rules.modes import MODE_TRANSITION


def segs(seq, names):
    return [
        (names[int(s)], int(a), int(b))
        for s, a, b in zip(seq.states, seq.starts, seq.ends, strict=True)
    ]


def modes(report):
    return [f for f in report.findings if f.rule == "mode-transition"]


def test_two_leg_hand_over_is_folded_into_the_state_before():
    # A: high on [0, 10 us), both off 500 ns, low on [10.5 us, 30 us); B: low on throughout
    t = trace(
        [
            switch("AH", [(0, 10 * US)]),
            switch("AL", [(10_500 * NS, 30 * US)]),
            switch("BH", []),
            switch("BL", [(0, 30 * US)]),
        ],
        30 * US,
    )
    tl = decode(t, TWO_LEGS)
    assert segs(tl.raw, tl.names) == [
        ("forward", 0, 10 * US),
        ("partial-B-low", 10 * US, 10_500 * NS),
        ("brake-low", 10_500 * NS, 30 * US),
    ]
    assert segs(tl.merged, tl.names) == [
        ("forward", 0, 10_500 * NS),
        ("brake-low", 10_500 * NS, 30 * US),
    ]
    assert int(tl.merged.core_ends[0]) == 10 * US  # forward as decoded ends at AH off
    # a gap longer than the hand-over bound is a state of its own
    tl = decode(t, TWO_LEGS, handover_max_ps=499 * NS)
    assert [s[0] for s in segs(tl.merged, tl.names)] == ["forward", "partial-B-low", "brake-low"]


def test_two_leg_default_names():
    # facts.md section 5, H-bridge states table [common practice]: forward A.HS + B.LS,
    # reverse B.HS + A.LS, brake low / high both LS / both HS, coast none, partial one switch
    on = {
        "forward": ("AH", "BL"),
        "reverse": ("AL", "BH"),
        "brake-low": ("AL", "BL"),
        "brake-high": ("AH", "BH"),
        "coast": (),
        "partial-A-high": ("AH",),
        "partial-B-low": ("BL",),
        "fault": ("AH", "AL", "BL"),
    }
    for name, chans in on.items():
        t = trace([switch(c, [(0, 10)] if c in chans else []) for c in TWO_LEGS.channels], 10)
        tl = decode(t, TWO_LEGS)
        assert segs(tl.raw, tl.names) == [(name, 0, 10)], name


def test_three_leg_vectors_are_numbered_as_in_the_trade():
    # facts.md section 6, S47 [memory]: V0 000, V1 100, V2 110, V3 010, V4 011, V5 001,
    # V6 101, V7 111 (S_a S_b S_c, 1 = high side on)
    table = {"000": 0, "100": 1, "110": 2, "010": 3, "011": 4, "001": 5, "101": 6, "111": 7}
    for bits, k in table.items():
        chans = []
        for leg, b in zip(THREE_LEGS.legs, bits, strict=True):
            chans.append(switch(leg.high, [(0, 10)] if b == "1" else []))
            chans.append(switch(leg.low, [(0, 10)] if b == "0" else []))
        tl = decode(trace(chans, 10), THREE_LEGS)
        assert segs(tl.raw, tl.names) == [(f"V{k}", 0, 10)]
    # an open leg: the pattern names it "_"
    chans = [
        switch("AH", [(0, 10)]),
        switch("AL", []),
        switch("BH", []),
        switch("BL", []),
        switch("CH", []),
        switch("CL", [(0, 10)]),
    ]
    tl = decode(trace(chans, 10), THREE_LEGS)
    assert segs(tl.raw, tl.names) == [("open-1_0", 0, 10)]


def test_direct_reversal_is_found_with_the_exact_interval():
    # both legs hand over at 20 us with 500 ns dead time: forward -> reverse (plugging)
    t = legs_trace(
        {"A": [(0, 1), (20 * US, 0)], "B": [(0, 0), (20 * US, 1)]},
        TWO_LEGS,
        40 * US,
        500 * NS,
    )
    r = check_trace(t, TWO_LEGS, Policy(reversal_dwell_ps=1_000 * US))
    [f] = modes(r)
    assert (f.start_ps, f.end_ps) == (20 * US, 20_500 * NS)  # end of forward, start of reverse
    assert f.measured_ps == 500 * NS
    assert f.required_ps == 1_000 * US
    assert f.margin_ps == 500 * NS - 1_000 * US
    assert (f.detail["from"], f.detail["to"]) == ("forward", "reverse")
    assert f.leg is None and f.channels == TWO_LEGS.channels
    # no reversal dwell required: measured only, never a finding
    assert modes(check_trace(t, TWO_LEGS, Policy())) == []


@pytest.mark.parametrize(("brake_us", "found"), [(300, True), (1_000, False), (2_000, False)])
def test_sign_magnitude_reversal_through_brake(brake_us, found):
    # facts.md section 5 [published, S19]: sign-magnitude alternates drive with brake each
    # period. Leg A PWM (60 % of 50 us) for 10 periods with B low, then brake low, then B PWM.
    period, dead = 50 * US, 500 * NS
    r_at = 10 * period + brake_us * US
    a = pwm_pole(period, [30 * US] * 10)
    b = [(0, 0), *pwm_pole(period, [30 * US] * 10, t0=r_at)]
    end = r_at + 10 * period
    t = legs_trace({"A": [*a, (10 * period, 0)], "B": b}, TWO_LEGS, end, dead)
    r = check_trace(t, TWO_LEGS, Policy(reversal_dwell_ps=1_000 * US))
    found_here = modes(r)
    if not found:
        assert found_here == []
        return
    [f] = found_here
    # forward as decoded ends when AH turns off in the last period (9 * 50 us + 30 us);
    # reverse starts when BH turns on, a dead time after the brake ends
    assert (f.start_ps, f.end_ps) == (9 * period + 30 * US, r_at + dead)
    assert f.measured_ps == r_at + dead - (9 * period + 30 * US)
    assert (f.detail["from"], f.detail["to"]) == ("forward", "reverse")


def test_sign_magnitude_pwm_in_both_directions_has_no_false_findings():
    # forward PWM, 3 ms of brake low, reverse PWM; brake-high <-> brake-low is forbidden
    # and every pulse is at least 5 us: nothing may be reported
    period, dead = 50 * US, 500 * NS
    highs = [5 * US + 4 * k * US for k in range(10)]
    r_at = 10 * period + 3_000 * US
    a = [*pwm_pole(period, highs), (10 * period, 0)]
    b = [(0, 0), *pwm_pole(period, highs, t0=r_at)]
    t = legs_trace({"A": a, "B": b}, TWO_LEGS, r_at + 10 * period, dead)
    tp = TransitionPolicy(
        rules=(
            TransitionRule("brake-high", "brake-low", allowed=False),
            TransitionRule("brake-low", "brake-high", allowed=False),
        )
    )
    policy = Policy(min_pulse_ps=4 * US, reversal_dwell_ps=2_000 * US, transitions=tp)
    r = check_trace(t, TWO_LEGS, policy)
    assert r.findings == ()
    view = r.extra["states"]
    assert {s["state"] for s in view["states"] if s["visits"]} == {
        "forward",
        "brake-low",
        "reverse",
    }
    n = dict(zip(view["names"], view["matrix"], strict=True))
    i = view["names"].index
    assert n["forward"][i("brake-low")] == 10 and n["brake-low"][i("forward")] == 9
    assert n["brake-low"][i("reverse")] == 10 and n["reverse"][i("brake-low")] == 10


def test_forbidden_change_spans_the_hand_overs():
    # brake high -> brake low: AH off 10 us, BH off 10.2 us, AL on 10.5 us, BL on 10.7 us
    t = trace(
        [
            switch("AH", [(0, 10 * US)]),
            switch("AL", [(10_500 * NS, 20 * US)]),
            switch("BH", [(0, 10_200 * NS)]),
            switch("BL", [(10_700 * NS, 20 * US)]),
        ],
        20 * US,
    )
    rule = TransitionRule("brake-high", "brake-low", allowed=False)
    r = check_trace(t, TWO_LEGS, Policy(transitions=TransitionPolicy(rules=(rule,))))
    [f] = modes(r)
    assert (f.start_ps, f.end_ps) == (10 * US, 10_700 * NS)
    assert (f.detail["from"], f.detail["to"]) == ("brake-high", "brake-low")
    assert f.required_ps is None
    # the merged timeline never shows the overlapping gaps as states
    tl = decode(t, TWO_LEGS)
    assert [s[0] for s in segs(tl.merged, tl.names)] == ["brake-high", "brake-low"]


def test_most_specific_rule_decides():
    # whitelist: everything forbidden except forward <-> brake-low
    t = trace(
        [
            switch("AH", [(0, 10 * US)]),
            switch("AL", [(10_500 * NS, 20 * US)]),
            switch("BH", []),
            switch("BL", [(0, 15 * US)]),
        ],
        20 * US,
    )
    tp = TransitionPolicy(
        rules=(
            TransitionRule("*", "*", allowed=False),
            TransitionRule("forward", "brake-low"),
        )
    )
    [f] = modes(check_trace(t, TWO_LEGS, Policy(transitions=tp)))
    # brake-low -> partial-A-low (BL off at 15 us, held for good: not a hand-over)
    assert (f.detail["from"], f.detail["to"]) == ("brake-low", "partial-A-low")
    assert (f.start_ps, f.end_ps) == (15 * US, 15 * US)


def test_min_dwell_in_a_state():
    # brake low from AL on (10.5 us) to AL off (12 us), then a 500 ns hand-over back to
    # forward, which counts in brake-low: 2 us on the merged timeline
    t = trace(
        [
            switch("AH", [(0, 10 * US), (12_500 * NS, 30 * US)]),
            switch("AL", [(10_500 * NS, 12 * US)]),
            switch("BH", []),
            switch("BL", [(0, 30 * US)]),
        ],
        30 * US,
    )
    # forward visits touch the window's ends, so they are not judged
    tp = TransitionPolicy(min_dwell_in={"brake-low": 2 * US + 1, "forward": 50 * US})
    [f] = modes(check_trace(t, TWO_LEGS, Policy(transitions=tp)))
    assert (f.start_ps, f.end_ps, f.measured_ps) == (10_500 * NS, 12_500 * NS, 2 * US)
    assert f.margin_ps == -1
    assert (f.detail["from"], f.detail["to"]) == ("brake-low", "forward")
    tp = TransitionPolicy(min_dwell_in={"brake-low": 2 * US})
    assert modes(check_trace(t, TWO_LEGS, Policy(transitions=tp))) == []


def test_user_modes_override_defaults():
    bridge = Bridge(
        TWO_LEGS.legs,
        modes=(
            Mode(
                "drive",
                Any_(
                    (
                        All((SwitchOn("A", Side.HIGH), SwitchOn("B", Side.LOW))),
                        All((SwitchOn("A", Side.LOW), SwitchOn("B", Side.HIGH))),
                    )
                ),
            ),
            Mode("idle", Not(Any_((SwitchOn("A", Side.HIGH), SwitchOn("B", Side.HIGH))))),
        ),
    )
    t = legs_trace(
        {"A": [(0, 1), (20 * US, 0)], "B": [(0, 0), (20 * US, 1), (30 * US, 0)]},
        bridge,
        40 * US,
        500 * NS,
    )
    tl = decode(t, bridge)
    # forward and reverse are both "drive"; both lows (and lone lows, and coast) are "idle"
    assert segs(tl.merged, tl.names) == [("drive", 0, 30_500 * NS), ("idle", 30_500 * NS, 40 * US)]
    assert tl.names[:2] == ("drive", "idle")


def _src_error(exc_info):
    return str(exc_info.value)


@pytest.mark.parametrize(
    ("tp", "where", "words"),
    [
        (
            TransitionPolicy(
                rules=(TransitionRule("forward", "sideways", source=Source("cart.br", 7, 3)),)
            ),
            "cart.br:7:3: ",
            "unknown state 'sideways'",
        ),
        (
            TransitionPolicy(
                rules=(
                    TransitionRule("forward", "reverse", source=Source("cart.br", 4, 1)),
                    TransitionRule(
                        "forward", "reverse", allowed=False, source=Source("cart.br", 9, 5)
                    ),
                )
            ),
            "cart.br:9:5: ",
            "both allowed and forbidden",
        ),
        (
            TransitionPolicy(
                rules=(
                    TransitionRule("forward", "*", min_dwell_ps=5, source=Source("cart.br", 2, 9)),
                )
            ),
            "cart.br:2:9: ",
            "needs both states named",
        ),
        (
            TransitionPolicy(min_dwell_in={"glide": 5}, source="cart.br"),
            "cart.br: ",
            "unknown state 'glide'",
        ),
        (TransitionPolicy(scheme="zigzag", source="cart.br"), "cart.br: ", "unknown PWM scheme"),
    ],
)
def test_bad_policies_are_input_errors(tp, where, words):
    t = trace([switch(c, []) for c in TWO_LEGS.channels], 10)
    with pytest.raises(InputError) as e:
        check_trace(t, TWO_LEGS, Policy(transitions=tp))
    text = str(e.value)
    assert text.startswith(where) and words in text and "\n" not in text


@pytest.mark.parametrize(
    ("expr", "words"),
    [
        (All((SwitchOn("A", Side.HIGH), SwitchOn("A", Side.LOW))), "matches no possible state"),
        (Const(False), "matches no possible state"),
        (SwitchOn("C", Side.HIGH), "names leg 'C'"),
    ],
)
def test_bad_modes_are_input_errors(expr, words):
    bridge = Bridge(TWO_LEGS.legs, modes=(Mode("odd", expr, Source("cart.br", 3, 5)),))
    t = trace([switch(c, []) for c in TWO_LEGS.channels], 10)
    with pytest.raises(InputError) as e:
        check_trace(t, bridge)
    assert str(e.value).startswith("cart.br:3:5: ") and words in str(e.value)


@pytest.mark.parametrize("name", ["fault", "unknown", "*", "twice"])
def test_reserved_or_repeated_mode_names_are_input_errors(name):
    twice = Mode("twice", Const(True), Source("cart.br", 1, 1))
    bridge = Bridge(TWO_LEGS.legs, modes=(twice, Mode(name, Const(True), Source("cart.br", 3, 5))))
    t = trace([switch(c, []) for c in TWO_LEGS.channels], 10)
    with pytest.raises(InputError) as e:
        check_trace(t, bridge)
    assert str(e.value).startswith("cart.br:3:5: mode ")


def test_bad_policy_through_check_is_exit_2(write_csv):
    from sequencecheck import check

    path = write_csv("time_ns,AH,AL,BH,BL\n0,1,0,0,1\n100,1,0,0,1\n")
    tp = TransitionPolicy(rules=(TransitionRule("up", "down", source=Source("cart.br", 1, 1)),))
    report = check(path, TWO_LEGS, Policy(transitions=tp))
    assert report.exit_status() == 2
    assert report.inputs[0].error.startswith("cart.br:1:1: ")


def test_one_leg_and_four_leg_names():
    one = Bridge((Leg("A", "AH", "AL"),))
    t = trace([switch("AH", [(0, 5)]), switch("AL", [(7, 10)])], 10)
    tl = decode(t, one)
    assert segs(tl.raw, tl.names) == [("high", 0, 5), ("coast", 5, 7), ("low", 7, 10)]
    four = Bridge(tuple(Leg(n, n + "H", n + "L") for n in "ABCD"))
    chans = [switch(c, [(0, 10)] if c in ("AH", "BL", "DH") else []) for c in four.channels]
    tl = decode(trace(chans, 10), four)
    assert segs(tl.raw, tl.names) == [("s-10_1", 0, 10)]


def test_rule_is_registered():
    from sequencecheck.rules import RULES

    assert MODE_TRANSITION in RULES
    assert {"mode-transition", "min-pulse", "unknown-state"} <= {r.id for r in RULES}


def test_nine_of_sixteen_two_leg_combinations_are_legal():
    # facts.md section 5 [derived]: 9 of the 16 combinations are legal
    import itertools

    from sequencecheck.rules._states import StateNamer

    namer = StateNamer(TWO_LEGS)
    names = []
    for ah, al, bh, bl in itertools.product((0, 1), repeat=4):
        codes = (ah + 2 * al, bh + 2 * bl)
        names.append(namer.name(codes))
    assert len(names) == 16 and sum(n != "fault" for n in names) == 9
    assert len(set(names) - {"fault"}) == 9  # and each legal one has its own name


@pytest.mark.parametrize(("need", "certainty"), [(505 * NS, "inconclusive"), (510 * NS, "proven")])
def test_sampled_reversal_bounds_and_certainty(need, certainty):
    # facts.md section 8 [derived]: each edge lies up to one sample period before its stamp,
    # so a 500 ns gap sampled every 10 ns lies in (490, 510) ns
    t = legs_trace(
        {"A": [(0, 1), (20 * US, 0)], "B": [(0, 0), (20 * US, 1)]}, TWO_LEGS, 40 * US, 500 * NS
    )
    t = trace(t.channels.values(), t.end_ps, sample_period_ps=10 * NS)
    [f] = modes(check_trace(t, TWO_LEGS, Policy(reversal_dwell_ps=need)))
    assert f.bounds_ps == (490 * NS, 510 * NS)
    assert str(f.certainty) == certainty


def test_reversal_dwell_is_ignored_on_three_legs():
    t = legs_trace(
        {"a": [(0, 1), (10 * US, 0)], "b": [(0, 0), (10 * US, 1)], "c": [(0, 0)]},
        THREE_LEGS,
        20 * US,
        500 * NS,
    )
    r = check_trace(t, THREE_LEGS, Policy(reversal_dwell_ps=1_000 * US))
    assert modes(r) == []
    assert [s["state"] for s in r.extra["states"]["states"] if s["visits"]] == ["V1", "V3"]

"""Effective (physical) conduction: worst-case switch timing applied to commanded edges."""

from __future__ import annotations

import json
import re

import numpy as np
import pytest
from cli_inprocess import run_here
from conftest import run_cli
from hypothesis import given, settings
from hypothesis import strategies as st

from sequencecheck import Bridge, DeadTime, InputError, Leg, Policy, check_trace
from sequencecheck.model import Channel, SwitchTiming, Trace

NS = 1_000
LEG = Leg("A", "AH", "AL")
TIMING = SwitchTiming(
    driver_delay_min_ps=100 * NS,
    driver_delay_max_ps=130 * NS,
    turn_on_delay_ps=11 * NS,
    turn_off_delay_ps=39 * NS,
    fall_ps=35 * NS,
)


def _handover_trace(gap_ns: int) -> Trace:
    high = Channel.from_changes("AH", 1, np.array([1000 * NS]), np.array([0]))
    low = Channel.from_changes(
        "AL", 0, np.array([1000 * NS + gap_ns * NS, 3000 * NS]), np.array([1, 0])
    )
    return Trace({"AH": high, "AL": low}, 0, 4000 * NS)


def test_worked_example_effective_overlap():
    # facts.md section 1 [derived] on S1 Eq. 28 [published]: command gap 80 ns; LS on path
    # 100+11 ns; HS off path 130+39+35 ns -> effective gap -13 ns: 13 ns overlap
    bridge = Bridge((LEG,), timing={"AH": TIMING, "AL": TIMING})
    report = check_trace(_handover_trace(80), bridge, Policy(dead_time=DeadTime.both(50 * NS)))
    [finding] = report.violations
    assert finding.rule == "shoot-through" and finding.detail["kind"] == "effective"
    assert finding.measured_ps == 13 * NS and finding.margin_ps == -13 * NS
    assert finding.start_ps == 1191 * NS and finding.end_ps == 1204 * NS
    margins = {(m.rule, m.kind): m.margin_ps for m in report.margins}
    assert margins[("dead-time", "commanded")] == 30 * NS  # the commands pass
    assert margins[("shoot-through", "effective")] == -13 * NS  # the switches do not
    assert margins[("dead-time", "effective")] == -13 * NS


def test_effective_gap_meets_a_physical_minimum():
    # command gap 150 ns leaves 150 - 204 + 111 = 57 ns at the devices (S1 Eq. 28 [published])
    bridge = Bridge((LEG,), timing={"AH": TIMING, "AL": TIMING})
    ok = check_trace(_handover_trace(150), bridge, Policy())
    assert not ok.violations
    assert {(m.rule, m.kind): m.margin_ps for m in ok.margins}[
        ("dead-time", "effective")
    ] == 57 * NS
    short = check_trace(
        _handover_trace(150), bridge, Policy(effective_dead_time=DeadTime.both(60 * NS))
    )
    [f] = short.violations
    assert (f.rule, f.detail["kind"], f.measured_ps, f.required_ps) == (
        "dead-time",
        "effective",
        57 * NS,
        60 * NS,
    )


def test_no_timing_means_no_effective_findings():
    report = check_trace(_handover_trace(80), Bridge((LEG,)), Policy())
    assert all(m.kind == "commanded" for m in report.margins)


def test_timing_for_a_channel_outside_the_legs_is_an_input_error():
    with pytest.raises(InputError, match="'XH'"):
        check_trace(_handover_trace(80), Bridge((LEG,), timing={"XH": TIMING}), Policy())


# --- brute force on a tick grid as the independent reference ---


@st.composite
def timed_legs(draw):
    runs = draw(
        st.lists(
            st.tuples(st.integers(1, 8), st.integers(0, 1), st.integers(0, 1)),
            min_size=1,
            max_size=12,
        )
    )
    h = [v for n, a, _ in runs for v in [a] * n]
    lo = [v for n, _, b in runs for v in [b] * n]
    timings = []
    for _ in range(2):
        dmin = draw(st.integers(0, 3))
        timings.append(
            (dmin, draw(st.integers(dmin, 5)), draw(st.integers(0, 3)), draw(st.integers(0, 3)),
             draw(st.integers(0, 3)))
        )  # fmt: skip
    return h, lo, timings


def _effective_grid(v: list[int], t: tuple[int, int, int, int, int]) -> list[int]:
    dmin, dmax, on_delay, off_delay, fall = t
    n, out = len(v), [0] * len(v)
    i = 0
    while i < n:
        if v[i]:
            j = i
            while j < n and v[j]:
                j += 1
            s = 0 if i == 0 else i + dmin + on_delay
            e = n if j == n else min(j + dmax + off_delay + fall, n)
            for k in range(s, e):
                out[k] = 1
            i = j
        else:
            i += 1
    return out


def _reference(h: list[int], lo: list[int]) -> tuple[list[tuple[int, int]], list[int]]:
    """Both-on runs, and every hand-over gap, found by walking the samples."""
    n = len(h)
    runs, t = [], 0
    while t < n:
        if h[t] and lo[t]:
            s = t
            while t < n and h[t] and lo[t]:
                t += 1
            runs.append((s, t))
        else:
            t += 1
    gaps = []
    for on, off in ((lo, h), (h, lo)):
        for t in range(1, n):
            if on[t] and not on[t - 1] and not off[t]:
                for back in range(t, 0, -1):
                    if off[back - 1] and not off[back]:
                        gaps.append(t - back)
                        break
                    if on[back - 1] and not on[back]:
                        break  # its own turn-off came later: not a hand-over
                    if off[back] and not off[back - 1]:
                        break
    return runs, gaps


@settings(max_examples=150, deadline=None)
@given(timed_legs())
def test_effective_conduction_matches_brute_force(case):
    h, lo, (th, tl) = case

    def channel(name: str, v: list[int]) -> Channel:
        return Channel.from_changes(name, v[0], np.arange(1, len(v)) * NS, np.array(v[1:]))

    def timing(t):
        return SwitchTiming(t[0] * NS, t[1] * NS, t[2] * NS, 0, t[3] * NS, t[4] * NS)

    trace = Trace({"AH": channel("AH", h), "AL": channel("AL", lo)}, 0, len(h) * NS)
    bridge = Bridge((LEG,), timing={"AH": timing(th), "AL": timing(tl)})
    report = check_trace(trace, bridge, Policy())
    runs, gaps = _reference(_effective_grid(h, th), _effective_grid(lo, tl))
    found = [
        (f.start_ps // NS, f.end_ps // NS)
        for f in report.findings
        if f.rule == "shoot-through" and f.detail.get("kind") == "effective"
    ]
    assert found == runs
    margin = {(m.rule, m.kind): m.margin_ps for m in report.margins}.get(
        ("shoot-through", "effective")
    )
    if runs:
        assert margin == -max(e - s for s, e in runs) * NS
    elif gaps:
        assert margin == min(gaps) * NS
    else:
        assert margin is None


# --- command line ---

TIMING_FLAG = "AH,AL:driver-min=100ns,driver-max=130ns,on-delay=11ns,off-delay=39ns,fall=35ns"
TABLE = "time_ns,AH,AL\n0,1,0\n1000,0,0\n1080,0,1\n3000,0,0\n4000,0,0\n"


def test_cli_reports_commanded_and_effective(write_csv):
    path = write_csv(TABLE)
    r = run_cli(
        "check", path, "--dead-time", "50ns", "--switch-timing", TIMING_FLAG, "--format", "json"
    )
    assert r.returncode == 1, r.stderr
    doc = json.loads(r.stdout)
    [v] = doc["violations"]
    assert v["rule"] == "shoot-through" and v["kind"] == "effective" and v["measured_ps"] == 13_000
    kinds = {
        (m["rule"], m["kind"]): m["margin_ps"] for m in doc["summary"]["inputs"][0]["worst_margins"]
    }
    assert kinds[("dead-time", "commanded")] == 30_000
    assert kinds[("dead-time", "effective")] == -13_000
    text = run_here("check", path, "--dead-time", "50ns", "--switch-timing", TIMING_FLAG).stdout
    # the margin table's row for leg A's shoot-through: commanded column, then effective
    assert re.search(r"leg A +shoot-through +\S+ \S+ @ [^-]+ +-13 ns @ ", text), text
    assert "conduct together for 13 ns with worst-case switch timing (effective)" in text
    assert "datasheet review" in text and "injure and burn" in text  # a physical judgement
    assert "injure and burn" in doc["summary"]["inputs"][0]["caution"]


@pytest.mark.parametrize(
    "flag",
    [
        "AH:driver-min=200ns,driver-max=100ns",  # min above max
        "AH:fall=-3ns",  # negative
        "AH:fall=3V",  # not a time
        "AH:fall=3",  # no unit
        "AH:speed=3ns",  # unknown key
        "AH",  # no parameters
        "ZZ:fall=3ns",  # no such channel in the legs
    ],
)
def test_cli_bad_switch_timing_exits_2(write_csv, flag):
    r = run_here("check", write_csv(TABLE), "--leg", "A=AH,AL", "--switch-timing", flag)
    assert r.returncode == 2, r.stdout
    assert r.stderr.count("\n") == 1 and "Traceback" not in r.stderr


def test_cli_unknown_timing_channel_with_guessed_legs_exits_2(write_csv):
    path = write_csv(TABLE.replace("AH", "A_H").replace("AL", "A_L"))
    r = run_here("check", path, "--switch-timing", "QH:fall=3ns")
    assert r.returncode == 2 and "'QH'" in r.stderr and r.stderr.count("\n") == 1

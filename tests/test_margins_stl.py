"""Margins are the signed Signal Temporal Logic robustness of each conduction rule.

Checked against the worked examples of facts.md section 9 and, on random traces,
against rtamt, an independent general-purpose STL monitoring library.
"""

from __future__ import annotations

import re
import warnings

import numpy as np
import pytest
from cli_inprocess import run_here
from conftest import run_cli
from hypothesis import given, settings
from hypothesis import strategies as st

from sequencecheck import Bridge, DeadTime, Leg, Policy, check_trace
from sequencecheck.model import Channel, Trace

NS = 1_000
LEG = Leg("A", "AH", "AL")


def _trace_from_edges(high: list[tuple[int, int]], low: list[tuple[int, int]], end: int) -> Trace:
    def channel(name: str, spans: list[tuple[int, int]]) -> Channel:
        times = [t for s, e in spans for t in (s, e)]
        levels = [v for _ in spans for v in (1, 0)]
        return Channel.from_changes(name, 0, np.array(times), np.array(levels))

    return Trace({"AH": channel("AH", high), "AL": channel("AL", low)}, 0, end)


def _margin(report, rule: str, kind: str = "commanded"):
    found = [m for m in report.margins if m.rule == rule and m.kind == kind]
    return found[0] if found else None


@pytest.mark.parametrize(
    ("gaps_ns", "expected_ns"),
    [((120, 112, 135), 12), ((120, 95, 135), -5)],  # facts.md section 9 [derived], S34
)
def test_dead_time_margin_worked_examples(gaps_ns, expected_ns):
    g1, g2, g3 = (g * NS for g in gaps_ns)
    high = [(0, 1000 * NS), (2000 * NS + g2, 3000 * NS)]
    low = [(1000 * NS + g1, 2000 * NS), (3000 * NS + g3, 4000 * NS)]
    report = check_trace(
        _trace_from_edges(high, low, 5000 * NS),
        Bridge((LEG,)),
        Policy(dead_time=DeadTime.both(100 * NS)),
    )
    m = _margin(report, "dead-time")
    assert m.margin_ps == expected_ns * NS
    assert m.measured_ps == min(gaps_ns) * NS and m.required_ps == 100 * NS


def test_overlap_makes_the_dead_time_margin_negative():
    # an overlap of 30 ns is a gap of -30 ns: with T = 100 ns the robustness is -130 ns
    report = check_trace(
        _trace_from_edges([(0, 1000 * NS)], [(970 * NS, 2000 * NS)], 3000 * NS),
        Bridge((LEG,)),
        Policy(dead_time=DeadTime.both(100 * NS)),
    )
    assert _margin(report, "dead-time").margin_ps == -130 * NS
    assert _margin(report, "shoot-through").margin_ps == -30 * NS


# --- rtamt, a general-purpose STL monitor (PyPI "rtamt"), as the independent reference ---

DEAD_TIME_STL = (
    "not((h >= 0.5) and (l >= 0.5)) "
    "and (fall(h >= 0.5) implies (always[0:{d}] (l < 0.5))) "
    "and (fall(l >= 0.5) implies (always[0:{d}] (h < 0.5)))"
)
NO_OVERLAP_OF_STL = "not(always[0:{w}] ((h >= 0.5) and (l >= 0.5)))"


def _rtamt_holds(formula: str, h: list[int], lo: list[int]) -> bool:
    """rtamt's verdict on ``G formula`` over a uniformly sampled pair of 0/1 signals.

    rtamt reads a signal that starts low as falling at its first sample, while the
    trace model has no edge there; so the first sample is given twice and the
    outer "always" is taken here over every sample but that extra one.
    """
    with warnings.catch_warnings():  # rtamt's dependencies import deprecated names
        warnings.simplefilter("ignore", DeprecationWarning)
        import rtamt

    spec = rtamt.StlDiscreteTimeSpecification()
    spec.declare_var("h", "float")
    spec.declare_var("l", "float")
    spec.spec = formula
    spec.parse()
    h, lo = [h[0], *h], [lo[0], *lo]
    rob = spec.evaluate({"time": list(range(len(h))), "h": h, "l": lo})
    return min(r for _, r in rob[1:]) > 0


def _holds_dead_time(d: int, h, lo) -> bool:  # gap of at least d ticks after every turn-off
    return _rtamt_holds(DEAD_TIME_STL.format(d=d - 1), h, lo)


def _holds_no_overlap_of(w: int, h, lo) -> bool:  # no both-on run of w ticks or more
    return _rtamt_holds(NO_OVERLAP_OF_STL.format(w=w - 1), h, lo)


@st.composite
def sampled_legs(draw):
    """Two 0/1 signals on a 1 ns tick grid made of runs, ending with both off long
    enough that no bounded formula looks past the end; shrinks toward few short runs."""
    runs = draw(
        st.lists(
            st.tuples(st.integers(1, 9), st.integers(0, 1), st.integers(0, 1)),
            min_size=1,
            max_size=14,
        )
    )
    h = [v for n, a, _ in runs for v in [a] * n]
    lo = [v for n, _, b in runs for v in [b] * n]
    pad = [0] * (len(h) + 2)
    return h + pad, lo + pad


def _to_trace(h: list[int], lo: list[int]) -> Trace:
    def channel(name: str, v: list[int]) -> Channel:
        return Channel.from_changes(name, v[0], np.arange(1, len(v)) * NS, np.array(v[1:]))

    return Trace({"AH": channel("AH", h), "AL": channel("AL", lo)}, 0, len(h) * NS)


@settings(max_examples=60, deadline=None)
@given(sampled_legs(), st.integers(1, 6))
def test_margins_match_rtamt(signals, dead_ticks):
    # rtamt [PyPI, general-purpose STL monitor] as the independent oracle (facts.md section 9,
    # S34): the temporal robustness min_k(g_k - T) is the largest shift d for which the dead-time
    # formula with bound d still holds, and its sign is rtamt's verdict for the bound T.
    h, lo = signals
    report = check_trace(
        _to_trace(h, lo), Bridge((LEG,)), Policy(dead_time=DeadTime.both(dead_ticks * NS))
    )
    dead = _margin(report, "dead-time")
    shoot = _margin(report, "shoot-through")
    if dead is None:  # no hand-over and no overlap: every bound holds
        assert shoot is None
        assert _holds_dead_time(len(h), h, lo)
        return
    assert (dead.margin_ps >= 0) == _holds_dead_time(dead_ticks, h, lo)
    gap, rest = divmod(dead.margin_ps + dead_ticks * NS, NS)  # smallest gap, overlaps negative
    assert rest == 0  # every gap on a tick grid is whole ticks
    assert shoot.margin_ps == gap * NS
    if gap >= 1:
        assert _holds_dead_time(gap, h, lo)
        assert not _holds_dead_time(gap + 1, h, lo)
    else:
        assert not _holds_dead_time(1, h, lo)
    if gap < 0:
        widest = -gap
        assert not _holds_no_overlap_of(widest, h, lo)
        assert _holds_no_overlap_of(widest + 1, h, lo)
    else:
        assert _holds_no_overlap_of(1, h, lo)


# --- --require-margin ---


def test_require_margin_fails_the_run(write_csv):
    path = write_csv("time_ns,AH,AL\n0,1,0\n1000,0,0\n1120,0,1\n2000,0,0\n2112,1,0\n3000,1,0\n")
    clean = run_cli("check", path, "--dead-time", "100ns", "--require-margin", "10ns")
    assert clean.returncode == 0, clean.stdout + clean.stderr
    # worst margin shown on a clean run, in the per-leg margin table
    assert re.search(r"leg A +dead-time +12 ns @ 2\.112 us", clean.stdout), clean.stdout
    short = run_here("check", path, "--dead-time", "100ns", "--require-margin", "20ns")
    assert short.returncode == 1
    assert "dead-time-margin" in short.stdout and "below the required margin 20 ns" in short.stdout


@pytest.mark.parametrize("bad", ["-5ns", "5V", "abc", "5"])
def test_require_margin_bad_value_exits_2(write_csv, bad):
    path = write_csv("time_ns,AH,AL\n0,1,0\n1000,0,0\n1120,0,1\n")
    r = run_here("check", path, "--require-margin", bad)
    assert r.returncode == 2 and r.stderr.count("\n") == 1

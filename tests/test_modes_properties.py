"""The vectorised state decoder and mode rules against a brute-force walk over every
picosecond, written independently in plain Python (no numpy, no shared helpers)."""

from __future__ import annotations

import itertools

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sequencecheck import Policy, check_trace
from sequencecheck.model import (
    All,
    Any_,
    Bridge,
    Channel,
    Leg,
    Level,
    Mode,
    Not,
    Side,
    SwitchOn,
    Trace,
    TransitionPolicy,
    TransitionRule,
)
from sequencecheck.rules._states import decode

X, Z = int(Level.X), int(Level.Z)
VECTOR_OF = {"000": 0, "100": 1, "110": 2, "010": 3, "011": 4, "001": 5, "101": 6, "111": 7}


@st.composite
def walks(draw):
    """Traces built from a walk over leg states (high, low, off, rarely both or X), so that
    drive, brake, coast and hand-over sequences come up often."""
    n_legs = draw(st.sampled_from([2, 3]))
    legs = tuple(Leg(n, n + "H", n + "L") for n in "ABC"[:n_legs])
    letter = st.sampled_from("HHLL--B?" if draw(st.booleans()) else "HL-")
    row = st.tuples(*[letter] * n_legs)
    if n_legs == 2:  # lean towards drive states, so reversals come up often
        row = st.one_of(st.sampled_from([("H", "L"), ("L", "H")]), row)
    steps = draw(st.lists(st.tuples(st.integers(1, 6), row), min_size=3, max_size=16))
    width = sum(d for d, _ in steps)
    levels = {"H": (1, 0), "L": (0, 1), "-": (0, 0), "B": (1, 1), "?": (X, 0)}
    spec = {}
    for k, leg in enumerate(legs):
        for side, chan in enumerate(leg.channels):
            values, t = [], 0
            for d, row in steps:
                values.append((t, levels[row[k]][side]))
                t += d
            spec[chan] = (values[0][1], values[1:])
    max_gap = draw(st.integers(0, 6))
    modes = USER_MODES[n_legs] if draw(st.booleans()) else ()
    return Bridge(legs, modes=modes), spec, width, max_gap


def _on(leg, side):
    return SwitchOn(leg, Side.HIGH if side == "high" else Side.LOW)


# user modes, and the same meaning written out plainly for the brute force (in ``name_of``)
USER_MODES = {
    2: (
        Mode(
            "drive",
            Any_(
                (
                    All((_on("A", "high"), _on("B", "low"))),
                    All((_on("A", "low"), _on("B", "high"))),
                )
            ),
        ),
    ),
    3: (Mode("no-high", All(tuple(Not(_on(n, "high")) for n in "ABC"))),),
}


@st.composite
def edges(draw):
    n_legs = draw(st.sampled_from([2, 3]))
    width = draw(st.integers(1, 48))
    with_x = draw(st.booleans())
    levels = st.sampled_from([0, 1, X, Z] if with_x else [0, 1])
    legs = tuple(Leg(n, n + "H", n + "L") for n in "ABC"[:n_legs])
    chans = [c for leg in legs for c in leg.channels]
    active_low = frozenset(draw(st.sets(st.sampled_from(chans), max_size=2)))
    spec = {}
    for c in chans:
        initial = draw(levels)
        times = sorted(draw(st.sets(st.integers(1, width), max_size=8)))  # width: the end
        lv = [draw(levels) for _ in times]
        spec[c] = (initial, list(zip(times, lv, strict=True)))
    max_gap = draw(st.integers(0, 6))
    return Bridge(legs, active_low=active_low), spec, width, max_gap


def cases():
    return st.one_of(edges(), walks())


def make_trace(spec, width):
    channels = {
        c: Channel.from_changes(
            c, init, np.array([t for t, _ in ch], dtype=np.int64), np.array([v for _, v in ch])
        )
        for c, (init, ch) in spec.items()
    }
    return Trace(channels, 0, width)


# --- the brute force -------------------------------------------------------------------


def level(spec_ch, t):
    value, changes = spec_ch
    for when, v in changes:
        if when <= t:
            value = v
    return value


def leg_letter(bridge, spec, leg, t):
    hi, lo = level(spec[leg.high], t), level(spec[leg.low], t)
    if hi in (X, Z) or lo in (X, Z):
        return "?"
    hi_on = hi == (0 if leg.high in bridge.active_low else 1)
    lo_on = lo == (0 if leg.low in bridge.active_low else 1)
    return {(1, 1): "B", (1, 0): "H", (0, 1): "L", (0, 0): "-"}[(hi_on, lo_on)]


def name_of(letters, legs, modes=()):
    if "?" in letters:
        return "unknown"
    if "B" in letters:
        return "fault"
    names = {m.name for m in modes}
    if "drive" in names and "".join(letters) in ("HL", "LH"):
        return "drive"
    if "no-high" in names and "H" not in letters:
        return "no-high"
    if all(x == "-" for x in letters):
        return "coast"
    if len(letters) == 2:
        fixed = {"HL": "forward", "LH": "reverse", "LL": "brake-low", "HH": "brake-high"}
        word = "".join(letters)
        if word in fixed:
            return fixed[word]
        k = 0 if letters[0] != "-" else 1
        return f"partial-{legs[k].name}-{'high' if letters[k] == 'H' else 'low'}"
    bits = "".join({"H": "1", "L": "0", "-": "_"}[x] for x in letters)
    return f"open-{bits}" if "_" in bits else f"V{VECTOR_OF[bits]}"


def brute(bridge, spec, width, max_gap):
    legs = bridge.legs
    letters = [[leg_letter(bridge, spec, leg, t) for leg in legs] for t in range(width)]
    raw = [name_of(row, legs, bridge.modes) for row in letters]
    inside = [False] * width
    for k in range(len(legs)):
        col = [row[k] for row in letters]
        t = 0
        while t < width:
            if col[t] != "-":
                t += 1
                continue
            a = t
            while t < width and col[t] == "-":
                t += 1
            b = t - 1
            if a > 0 and b < width - 1:
                before, after = col[a - 1], col[b + 1]
                if before in "HL" and after in "HL" and before != after and b - a + 1 <= max_gap:
                    for u in range(a, b + 1):
                        inside[u] = True
    merged = []
    for t in range(width):
        merged.append(merged[-1] if inside[t] else raw[t])
    return raw, merged, inside


def runs(seq):
    out = []
    for t, v in enumerate(seq):
        if out and out[-1][0] == v:
            out[-1][2] = t + 1
        else:
            out.append([v, t, t + 1])
    return [tuple(r) for r in out]


def expand(segments, names):
    out = []
    for s, a, b in zip(segments.states, segments.starts, segments.ends, strict=True):
        out += [names[int(s)]] * int(b - a)
    return out


# --- the properties ----------------------------------------------------------------------


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(cases())
def test_decoder_matches_brute_force(case):
    bridge, spec, width, max_gap = case
    tl = decode(make_trace(spec, width), bridge, max_gap)
    raw, merged, _ = brute(bridge, spec, width, max_gap)
    assert expand(tl.raw, tl.names) == raw
    assert expand(tl.merged, tl.names) == merged
    # consecutive segments always differ
    assert all(tl.merged.states[1:] != tl.merged.states[:-1])


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(cases(), st.integers(1, 12), st.integers(1, 12), st.data())
def test_rules_match_brute_force(case, min_pulse, dwell, data):
    bridge, spec, width, max_gap = case
    raw, merged, inside = brute(bridge, spec, width, max_gap)
    names = sorted(set(merged) - {"fault", "unknown"})
    banned = set()
    if names:
        pairs = st.tuples(st.sampled_from(names), st.sampled_from(names))
        banned = {(a, b) for a, b in data.draw(st.lists(pairs, max_size=4)) if a != b}
    tp = TransitionPolicy(
        rules=tuple(TransitionRule(a, b, allowed=False) for a, b in sorted(banned)),
        handover_max_ps=max_gap,
    )
    policy = Policy(min_pulse_ps=min_pulse, reversal_dwell_ps=dwell, transitions=tp)
    report = check_trace(make_trace(spec, width), bridge, policy)

    def got(rule, check=None):
        return sorted(
            (f.channels if rule != "mode-transition" else (), f.start_ps, f.end_ps)
            for f in report.findings
            if f.rule == rule and (check is None or f.detail.get("check") == check)
        )

    # min-pulse: every run of one defined level between two edges, with defined levels
    # before and after it (an edge exactly at the window's end still ends a pulse; the
    # window's start never begins one)
    want = []
    for c in bridge.channels:
        seq = [level(spec[c], t) for t in range(width + 1)]  # seq[width]: after the end edge
        for v, a, b in runs(seq[:width]):
            ended = b < width or seq[width] != v
            defined = v in (0, 1) and a > 0 and seq[a - 1] in (0, 1) and seq[b] in (0, 1)
            if defined and ended and b - a < min_pulse:
                want.append(((c,), a, b))
    assert got("min-pulse") == sorted(want)

    # unknown-state: every run of X or Z
    want = []
    for c in bridge.channels:
        undefined = [level(spec[c], t) in (X, Z) for t in range(width)]
        want += [((c,), a, b) for v, a, b in runs(undefined) if v]
    assert got("unknown-state") == sorted(want)

    # reversal dwell (sign-magnitude default on two legs), on the states as decoded
    want = []
    if len(bridge.legs) == 2:
        for t in range(1, width):
            for here, there in (("reverse", "forward"), ("forward", "reverse")):
                if raw[t] != here or raw[t - 1] == here or (there, here) in banned:
                    continue  # a rule of the policy's own for the pair replaces the default
                seen_there = [u for u in range(t) if raw[u] == there]
                seen_here = [u for u in range(t) if raw[u] == here]
                if seen_there and (not seen_here or seen_there[-1] > seen_here[-1]):
                    left = seen_there[-1] + 1
                    if t - left < dwell:
                        want.append(((), left, t))
    assert got("mode-transition", "reversal-dwell") == sorted(want)

    # forbidden changes, on the merged states: from the end of the old state as decoded
    want = []
    for t in range(1, width):
        a, b = merged[t - 1], merged[t]
        if a != b and (a, b) in banned:
            last_exact = max(u for u in range(t) if not inside[u])
            want.append(((), last_exact + 1, t))
    assert got("mode-transition", "forbidden") == sorted(want)

    # the states view: time per state and the change counts
    view = report.extra["states"]
    for row in view["states"]:
        assert row["time_ps"] == merged.count(row["state"])
        assert row["exact_time_ps"] == raw.count(row["state"])
    pairs = {}
    for (a, _, _), (b, _, _) in zip(runs(merged), runs(merged)[1:], strict=False):
        pairs[(a, b)] = pairs.get((a, b), 0) + 1
    shown = {
        (a, b): n
        for a, row in zip(view["names"], view["matrix"], strict=True)
        for b, n in zip(view["names"], row, strict=True)
        if n
    }
    assert shown == pairs


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(cases(), st.integers(1, 20), st.sampled_from([0, 20_000, 100_000, 250_000]))
def test_locked_anti_phase_matches_brute_force(case, dwell, band_ppm):
    bridge, spec, width, max_gap = case
    tp = TransitionPolicy(
        scheme="locked-anti-phase", handover_max_ps=max_gap, neutral_band_ppm=band_ppm
    )
    report = check_trace(
        make_trace(spec, width), bridge, Policy(reversal_dwell_ps=dwell, transitions=tp)
    )
    got = sorted(
        (f.start_ps, f.end_ps, f.detail["from"], f.detail["to"])
        for f in report.findings
        if f.rule == "mode-transition"
    )
    want = []
    if len(bridge.legs) == 2:
        raw, _, _ = brute(bridge, spec, width, max_gap)
        firsts = [
            t for t in range(width) if raw[t] == "forward" and (t == 0 or raw[t - 1] != "forward")
        ]
        if not firsts or firsts[0] != 0:
            firsts = [0, *firsts]
        periods = []  # (start, end of last drive instant + 1, direction)
        for k, a in enumerate(firsts):
            b = firsts[k + 1] if k + 1 < len(firsts) else width
            fwd = sum(1 for t in range(a, b) if raw[t] == "forward")
            rev = sum(1 for t in range(a, b) if raw[t] == "reverse")
            drive = [t for t in range(a, b) if raw[t] in ("forward", "reverse")]
            # duty = fwd / (fwd + rev); near 50 % when |duty - 1/2| <= band
            near = abs(fwd - rev) * 1_000_000 <= 2 * band_ppm * (fwd + rev)
            direction = 0 if near else (1 if fwd > rev else -1)
            periods.append((a, drive[-1] + 1 if drive else None, direction))
        driving = [p for p in periods if p[2] != 0]
        for old, new in itertools.pairwise(driving):
            if old[2] != new[2] and new[0] - old[1] < dwell:
                names = ("forward", "reverse") if old[2] > 0 else ("reverse", "forward")
                want.append((old[1], new[0], *names))
    assert got == sorted(want)

"""Pictures: the numbers they show (against brute-force walks) and the files they make."""

from __future__ import annotations

import csv
import xml.etree.ElementTree as ET

import numpy as np
import pytest
from conftest import SAMPLES

from sequencecheck import Bridge, Channel, DeadTime, Direction, Leg, Policy, check, read
from sequencecheck.plots import draw_report, finding_window, handover_gaps, steps_in_window
from sequencecheck.plots._histogram import _bins

pytest.importorskip("matplotlib")

CART = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")))
POLICY = Policy(dead_time=DeadTime.both(500_000))
SVG = "{http://www.w3.org/2000/svg}"


def test_steps_in_window_match_level_at_everywhere():
    rng = np.random.default_rng(5)
    times = np.unique(rng.integers(0, 10_000, 60)).astype(np.int64)
    levels = (np.arange(times.size) % 2 == 0).astype(np.int8)
    ch = Channel("X", 0, times, levels)
    for lo, hi in [(0, 10_000), (1234, 1500), (times[3], times[9]), (-50, 20)]:
        t, v = steps_in_window(ch, int(lo), int(hi))
        assert t[0] == lo and t[-1] == hi and np.all(np.diff(t) >= 0)
        for probe in range(int(lo), int(hi), 7):  # brute force: the level at every probe
            i = int(np.searchsorted(t, probe, side="right")) - 1
            assert v[i] == ch.level_at(probe)


def _walk_gaps(path) -> dict[Direction, list[int]]:
    """Brute-force hand-over gaps: walk the CSV rows one by one (time in ns)."""
    last_off = {"AH": None, "AL": None}
    state = {"AH": 0, "AL": 0}
    out: dict[Direction, list[int]] = {Direction.HIGH_TO_LOW: [], Direction.LOW_TO_HIGH: []}
    with open(path, newline="") as f:
        rows = csv.DictReader(f)
        for n, row in enumerate(rows):
            t = int(row["time_ns"]) * 1000
            new = {ch: int(row[ch]) for ch in state}
            if n == 0:
                state = new
                continue
            for ch, other, d in (
                ("AL", "AH", Direction.HIGH_TO_LOW),
                ("AH", "AL", Direction.LOW_TO_HIGH),
            ):
                turned_on = state[ch] == 0 and new[ch] == 1
                if turned_on and new[other] == 0 and state[other] == 0:
                    off = last_off[other]
                    own = last_off[ch]
                    if off is not None and (own is None or own <= off):
                        out[d].append(t - off)
            for ch in state:
                if state[ch] == 1 and new[ch] == 0:
                    last_off[ch] = t
            state = new
    return out


def test_histogram_data_matches_a_sample_walk():
    path = SAMPLES / "cart_faulty.csv"
    gaps = {
        g.direction: g for g in handover_gaps(read(str(path)), CART, POLICY) if g.leg.name == "A"
    }
    walked = _walk_gaps(path)
    for d in Direction:
        assert sorted(gaps[d].gaps_ps.tolist()) == sorted(walked[d])
        assert gaps[d].required_ps == 500_000
    # the demo generator's injected fault: one 150 ns hand-over, the rest 750 ns
    assert sorted(set(walked[Direction.HIGH_TO_LOW])) == [150_000, 750_000]


@pytest.mark.parametrize("required", [None, 0, 500_000, 123_457])
def test_histogram_bins_never_straddle_the_requirement(required):
    gaps = np.array([150_000, 749_000, 750_000, 2_000_000], dtype=np.int64)
    edges = _bins(gaps, required)
    assert edges[0] <= gaps.min() and edges[-1] > gaps.max()
    assert len(edges) <= 45
    if required is not None:
        assert required in edges.tolist()


def test_finding_window_shows_the_finding_and_its_requirement():
    report = check(str(SAMPLES / "cart_faulty.csv"), CART, POLICY)
    for f in report.findings:
        lo, hi = finding_window(f, 50_000)
        assert lo < f.start_ps and hi > max(f.end_ps, f.start_ps + (f.required_ps or 0))


def _texts(svg_path) -> list[str]:
    root = ET.parse(svg_path).getroot()
    return ["".join(t.itertext()) for t in root.iter(f"{SVG}text")]


def test_draw_report_writes_png_and_svg_with_values(tmp_path):
    report = check(str(SAMPLES / "cart_faulty.csv"), CART, POLICY)
    figures = draw_report(report, CART, POLICY, out_dir=str(tmp_path))
    names = sorted(p.name for p in tmp_path.iterdir())
    assert names == sorted(
        [
            f"cart_faulty_{stem}.{ext}"
            for stem in (
                "dead-time_A_001",
                "shoot-through_A_001",
                "dead-time-histogram_A_high-to-low",
                "dead-time-histogram_A_low-to-high",
            )
            for ext in ("png", "svg")
        ]
    )
    for p in tmp_path.glob("*.png"):
        assert p.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    texts = _texts(tmp_path / "cart_faulty_dead-time_A_001.svg")
    assert "measured 150 ns" in texts and "required 500 ns" in texts
    assert "A high: AH" in texts and "A low: AL" in texts
    assert "time (µs) from 1.180 ms; ticks: samples every 50 ns" in texts
    texts = _texts(tmp_path / "cart_faulty_shoot-through_A_001.svg")
    assert "overlap 100 ns" in texts
    hist = _texts(tmp_path / "cart_faulty_dead-time-histogram_A_high-to-low.svg")
    assert " required 500 ns" in hist and "dead time (ns)" in hist
    assert figures.left_out == {}


def test_limit_per_rule_counts_what_was_left_out(tmp_path):
    report = check(
        [str(SAMPLES / "cart_faulty.csv"), str(SAMPLES / "cart_faulty_changes.csv")], CART, POLICY
    )
    figures = draw_report(report, CART, POLICY, limit=1, histograms=False)
    assert len(figures.diagrams) == 2  # one per rule
    assert figures.left_out == {"dead-time": 1, "shoot-through": 1}
    first = {}
    for k, f in enumerate(report.inputs[0].findings):
        if f.is_violation:
            first.setdefault(f.rule, (0, k))
    assert set(figures.diagrams) == set(first.values())  # the first violation of each rule
    assert all(p.svg.startswith("<svg") and not p.files for p in figures.diagrams.values())


def test_markup_and_dollars_in_names_are_drawn_as_typed(tmp_path):
    text = (SAMPLES / "cart_faulty_changes.csv").read_text().replace("AH", "$x$<b>", 1)
    src = tmp_path / "odd.csv"
    src.write_text(text)
    bridge = Bridge((Leg("A", "$x$<b>", "AL"),))
    report = check(str(src), bridge, POLICY)
    figures = draw_report(report, bridge, POLICY, histograms=False)
    assert "A high: $x$&lt;b&gt;" in figures.diagrams[0, 0].svg

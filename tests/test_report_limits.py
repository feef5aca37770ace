"""Bounded reports: --max-findings lists the earliest N violations per rule and input and
counts the rest exactly; the report names each leg's channels and the channels left out.

Counts are checked against an unlimited run of the same rules and, for shoot-through,
against a plain walk over the CSV rows written in the test (no project code).
"""

from __future__ import annotations

import json
from collections import Counter
from pathlib import Path

import numpy as np
import pytest
from conftest import run_cli

from sequencecheck import Bridge, Channel, DeadTime, Leg, Policy, Trace, check_trace
from sequencecheck._printable import clip_middle, name_list, printable
from sequencecheck.errors import InputError
from sequencecheck.model import BootstrapSupply

NS = 1_000
STEP = 100 * NS


def _noisy_trace(samples: int = 400, seed: int = 3) -> Trace:
    """Invented pump inverter, legs A and B, every channel random on each 100 ns sample;
    BL is sometimes undefined (x)."""
    rng = np.random.default_rng(seed)
    t = np.arange(samples, dtype=np.int64) * STEP
    channels = {}
    for name in ("AH", "AL", "BH", "BL"):
        if name == "BL":
            levels = rng.choice([0, 1, 0, 1, 2], samples).astype(np.int8)
        else:
            levels = rng.integers(0, 2, samples).astype(np.int8)
        channels[name] = Channel.from_changes(
            name, int(levels[0]), t[1:], levels[1:], np.arange(2, samples + 1), start_ps=0
        )
    return Trace(channels, 0, samples * STEP, path="noisy.csv", rows=samples, kind="csv")


SUPPLY = BootstrapSupply(100e-9, 50e-9, 1e-3, 12.0, 0.7, 10.0)  # invented, drains fast
BRIDGE = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")), bootstrap={"A": SUPPLY})
POLICY = Policy(
    dead_time=DeadTime.both(500 * NS), min_pulse_ps=250 * NS, reversal_dwell_ps=1_000 * NS
)


def _key(f: object) -> tuple:
    return (f.rule, f.leg, f.start_ps, f.end_ps, f.message)  # type: ignore[attr-defined]


@pytest.mark.parametrize("limit", [1, 5, 40])
def test_limited_run_lists_the_earliest_and_counts_the_rest(limit: int) -> None:
    from dataclasses import replace

    trace = _noisy_trace()
    full = check_trace(trace, BRIDGE, POLICY)
    part = check_trace(trace, BRIDGE, replace(POLICY, max_findings_per_rule=limit))
    every = Counter(f.rule for f in full.violations)
    assert {"shoot-through", "dead-time", "min-pulse", "unknown-state"} <= set(every)
    assert every["mode-transition"] > 5 and every["bootstrap-refresh"] > 5  # limits bite
    assert part.violation_count == full.violation_count == len(full.violations)
    assert full.unlisted == {}
    listed = Counter(f.rule for f in part.violations)
    for rule, n in every.items():
        assert listed[rule] == min(n, limit), rule
        assert part.unlisted_by_rule().get(rule, 0) == n - min(n, limit), rule
        earliest = sorted(
            (f for f in full.violations if f.rule == rule),
            key=lambda f: (f.start_ps, f.end_ps, f.leg or ""),
        )[:limit]
        got = [f for f in part.violations if f.rule == rule]
        assert sorted(map(_key, got)) == sorted(map(_key, earliest)), rule
    for leg in ("A", "B", None):  # per-leg counts stay exact too
        on_leg = sum(1 for f in full.violations if f.leg == leg)
        shown = sum(1 for f in part.violations if f.leg == leg)
        hidden = sum(n for (_, lg), n in part.unlisted.items() if lg == leg)
        assert shown + hidden == on_leg
    # worst margins and statistics do not depend on what is listed
    assert part.margins == full.margins and part.leg_stats == full.leg_stats


def test_library_default_lists_every_violation() -> None:
    report = check_trace(_noisy_trace(), BRIDGE, POLICY)
    assert Policy().max_findings_per_rule is None
    assert report.unlisted == {} and len(report.violations) == report.violation_count > 500


def _noisy_csv(path: Path, rows: int, seed: int = 11) -> tuple[str, int]:
    """A noisy leg A/B capture, and its shoot-through count by a plain walk over rows:
    one per run of consecutive rows with both switches of a leg on (each row holds for
    one 10 ns sample, the last row too: an evenly sampled capture)."""
    rng = np.random.default_rng(seed)
    levels = rng.integers(0, 2, (rows, 4)).tolist()
    overlaps = 0
    for hi, lo in ((0, 1), (2, 3)):
        both = [r[hi] == 1 and r[lo] == 1 for r in levels]
        overlaps += sum(1 for k, b in enumerate(both) if b and (k == 0 or not both[k - 1]))
    body = "\n".join(f"{k * 10},{a},{b},{c},{d}" for k, (a, b, c, d) in enumerate(levels))
    path.write_text("time_ns,AH,AL,BH,BL\n" + body + "\n")
    return str(path), overlaps


def test_cli_counts_stay_exact_with_a_small_limit(tmp_path: Path) -> None:
    path, overlaps = _noisy_csv(tmp_path / "noisy.csv", 3_000)
    args = ("check", path, "--dead-time", "30ns", "--format", "json")
    limited = run_cli(*args, "--max-findings", "3")
    unlimited = run_cli(*args, "--max-findings", "0")
    assert limited.returncode == unlimited.returncode == 1, limited.stderr
    small, full = json.loads(limited.stdout), json.loads(unlimited.stdout)
    assert small["summary"]["by_rule"]["shoot-through"] == overlaps  # the walk above
    assert small["summary"]["by_rule"] == full["summary"]["by_rule"]
    assert small["summary"]["violations"] == full["summary"]["violations"]
    assert full["summary"]["violations"] == len(full["violations"])
    assert full["summary"]["unlisted"] == 0
    record = small["summary"]["inputs"][0]
    assert record["violations"] == full["summary"]["violations"]
    assert record["unlisted"] == {r: n - 3 for r, n in full["summary"]["by_rule"].items()}
    assert len(small["violations"]) == 3 * len(full["summary"]["by_rule"])
    assert small["summary"]["settings"]["max_findings_per_rule"] == 3
    text = run_cli("check", path, "--dead-time", "30ns", "--max-findings", "3")
    assert f"{overlaps - 3:,} more shoot-through violation(s) not listed" in text.stdout
    assert f"{full['summary']['violations']} violation(s)" in text.stdout


def test_negative_max_findings_is_a_usage_error(tmp_path: Path) -> None:
    path, _ = _noisy_csv(tmp_path / "noisy.csv", 50)
    r = run_cli("check", path, "--max-findings", "-1")
    assert r.returncode == 2 and r.stdout == ""
    assert r.stderr.count("\n") == 1 and "--max-findings" in r.stderr


def test_report_names_legs_and_unchecked_channels(tmp_path: Path) -> None:
    text = "time_ns,AH,AL,BH,BL,FAN,LED\n0,0,1,0,1,0,1\n100,0,0,0,0,1,1\n300,1,0,1,0,0,0\n"
    path = tmp_path / "cart.csv"
    path.write_text(text)
    doc = json.loads(run_cli("check", str(path), "--format", "json").stdout)
    record = doc["summary"]["inputs"][0]
    assert record["channels"] == ["AH", "AL", "BH", "BL"]
    assert record["unchecked_channels"] == ["FAN", "LED"]
    assert record["edges"] == 4  # FAN and LED edges are not counted as checked
    assert [(g["leg"], g["high"], g["low"]) for g in record["legs"]] == [
        ("A", "AH", "AL"),
        ("B", "BH", "BL"),
    ]
    out = run_cli("check", str(path)).stdout
    assert "  legs: A = AH / AL, B = BH / BL" in out
    assert "not checked (in no leg): FAN, LED" in out


def test_printable_escapes_every_control_character() -> None:
    assert printable("a\x1b[2Jb") == "a\\x1b[2Jb"
    assert printable("x\ny\rz\t\x00\x7f\x9b") == "x\\ny\\rz\\t\\x00\\x7f\\x9b"
    assert printable("Zweig_ä H") == "Zweig_ä H"


def test_name_list_caps_long_lists() -> None:
    assert name_list(["a", "b"]) == "a, b"
    names = [f"C{i}" for i in range(2_000)]
    text = name_list(names)
    assert text.startswith("C0, C1,") and text.endswith("C19, ... and 1,980 more")


def test_clip_middle_keeps_start_and_end() -> None:
    assert clip_middle("short") == "short"
    text = "expected 9 fields (" + "x" * 5_000 + "), found 2 fields"
    clipped = clip_middle(text)
    assert len(clipped) <= 280
    assert clipped.startswith("expected 9 fields (") and clipped.endswith("found 2 fields")


def test_input_error_is_one_printable_line() -> None:
    e = InputError("bad\x1b[31m value\nhere", path="run\n\x1b.csv", line=3)
    assert str(e) == "run\\n\\x1b.csv:3: bad\\x1b[31m value here"


def test_usage_errors_print_control_characters_escaped(tmp_path: Path) -> None:
    path, _ = _noisy_csv(tmp_path / "noisy.csv", 50)
    bad_leg = run_cli("check", path, "--leg", "A=AH\x1b[2J")  # not NAME=HIGH,LOW
    bad_choice = run_cli("check", path, "--time-unit", "s\x1b[2J")
    for r in (bad_leg, bad_choice):
        assert r.returncode == 2 and r.stderr.count("\n") == 1, r.stderr
        assert "\x1b" not in r.stderr and "\\x1b[2J" in r.stderr


def test_junit_and_sarif_count_unlisted_violations(tmp_path):
    """A capped report still tells CI how many violations there were."""
    import json as _json
    import xml.etree.ElementTree as ET

    from sequencecheck.cli import run as cli_run

    rows = ["time_ns,AH,AL"] + [f"{10 * i},{i % 2},{i % 2}" for i in range(200)]
    path = tmp_path / "noisy.csv"
    path.write_text("\n".join(rows) + "\n")
    junit, sarif = tmp_path / "r.xml", tmp_path / "r.sarif"
    base = ["check", str(path), "--leg", "A=AH,AL", "--max-findings", "5"]
    assert cli_run([*base, "--format", "junit", "--output", str(junit)]) == 1
    assert cli_run([*base, "--format", "sarif", "--output", str(sarif)]) == 1
    failure = next(ET.parse(junit).iter("failure"))
    assert failure.get("message").startswith("100 violation(s)")  # 100 overlaps, 5 listed
    assert "95 more not listed" in failure.text
    (inp,) = _json.loads(sarif.read_text())["runs"][0]["properties"]["inputs"]
    assert inp["violations"] == 100 and inp["unlistedViolations"] == {"shoot-through": 95}

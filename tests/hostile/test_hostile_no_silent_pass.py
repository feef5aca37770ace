"""No silent pass: the report says how much was checked, and thin evidence warns.

The figures expected here come from a plain walk over the CSV rows in the test (not
from the reader): rows, edges, the time span and the channels.
"""

from __future__ import annotations

import itertools
import json
from pathlib import Path

import pytest
from conftest import run_cli

NS = 1_000

# Invented scenario: the pump inverter's leg A (AH/AL), three PWM periods, 200 ns dead time.
CLEAN = """time_ns,AH,AL
0,0,1
100,0,0
300,1,0
1000,0,0
1200,0,1
2000,0,0
2200,1,0
3000,0,0
3200,0,1
4000,0,0
4200,1,0
5000,0,0
5200,0,1
"""


def _walk(text: str) -> dict[str, object]:
    """Rows, edges, first/last time and channels, counted from the text itself."""
    lines = text.strip().splitlines()
    names = lines[0].split(",")[1:]
    rows = [line.split(",") for line in lines[1:]]
    edges = sum(
        1
        for prev, row in itertools.pairwise(rows)
        for a, b in zip(prev[1:], row[1:], strict=True)
        if a != b
    )
    return {
        "rows": len(rows),
        "edges": edges,
        "start_ps": int(rows[0][0]) * NS,
        "end_ps": int(rows[-1][0]) * NS,
        "channels": names,
    }


def _write(tmp_path: Path, text: str, name: str = "capture.csv") -> str:
    path = tmp_path / name
    path.write_text(text)
    return str(path)


def _json(*args: str) -> tuple[int, dict]:
    r = run_cli(*args, "--format", "json")
    assert "Traceback" not in r.stderr
    return r.returncode, json.loads(r.stdout)


def test_text_report_states_rows_edges_span_and_channels(tmp_path: Path) -> None:
    path = _write(tmp_path, CLEAN)
    expect = _walk(CLEAN)
    r = run_cli("check", path, "--dead-time", "150ns")
    assert r.returncode == 0, r.stderr
    assert (
        f"checked {expect['rows']} rows, {expect['edges']} edges, 0 s to 5.200 us (csv-changes); "
        f"channels: AH, AL"
    ) in r.stdout
    assert "no violations in 1 input(s)" in r.stdout


def test_json_report_states_rows_edges_span_and_channels(tmp_path: Path) -> None:
    path = _write(tmp_path, CLEAN)
    expect = _walk(CLEAN)
    status, doc = _json("check", path, "--dead-time", "150ns")
    assert status == 0
    record = doc["summary"]["inputs"][0]
    got = {k: record[k] for k in ("rows", "edges", "start_ps", "end_ps", "channels")}
    assert got == expect
    assert record["legs"][0]["leg"] == "A"
    assert record["legs"][0]["high_to_low"]["count"] == 3  # every hand-over was looked at
    assert record["legs"][0]["low_to_high"]["count"] == 3


def test_an_unreadable_input_among_good_ones_is_reported_not_checked(tmp_path: Path) -> None:
    good = _write(tmp_path, CLEAN, "good.csv")
    bad = _write(tmp_path, CLEAN.replace("2200,1,0", "2200,1,7"), "bad.csv")
    status, doc = _json("check", good, bad, "--dead-time", "150ns")
    assert status == 2
    inputs = {Path(r["input"]).name: r for r in doc["summary"]["inputs"]}
    assert inputs["good.csv"]["error"] is None and inputs["good.csv"]["rows"] == 13
    assert inputs["bad.csv"]["error"].startswith(f"{bad}:8: ")
    assert inputs["bad.csv"]["rows"] == 0
    assert doc["summary"]["inputs_failed"] == 1


def test_report_names_each_legs_channels(tmp_path: Path) -> None:
    path = _write(tmp_path, CLEAN)
    r = run_cli("check", path, "--dead-time", "150ns")
    _status, doc = _json("check", path, "--dead-time", "150ns")
    record = doc["summary"]["inputs"][0]
    assert any("AH" in json.dumps(leg) and "AL" in json.dumps(leg) for leg in record["legs"])
    assert "A: high AH, low AL" in r.stdout or "A = AH / AL" in r.stdout


def test_channel_left_out_of_every_leg_is_named(tmp_path: Path) -> None:
    text = CLEAN.replace("time_ns,AH,AL", "time_ns,AH,AL,FAN").replace("\n", ",0\n")
    text = text.replace("time_ns,AH,AL,FAN,0", "time_ns,AH,AL,FAN")
    path = _write(tmp_path, text)
    _status, doc = _json("check", path, "--dead-time", "150ns")
    record = doc["summary"]["inputs"][0]
    assert "FAN" not in record["channels"]
    r = run_cli("check", path, "--dead-time", "150ns")
    assert "FAN" in r.stdout and "not checked" in r.stdout


# --- warnings: never a failure on their own, a failure with --strict --------------------

STUCK = CLEAN.replace("time_ns,AH,AL", "time_ns,AH,AL,BH,BL").replace("\n", ",0,1\n")
STUCK = STUCK.replace("time_ns,AH,AL,BH,BL,0,1", "time_ns,AH,AL,BH,BL")
SHORT = "time_ns,AH,AL\n0,0,1\n100,0,0\n300,1,0\n1000,0,0\n1200,0,1\n"


@pytest.mark.parametrize(
    ("text", "rule", "count"),
    [(STUCK, "stuck-channel", 2), (SHORT, "short-capture", 1)],
    ids=["stuck-channel", "short-capture"],
)
def test_warning_is_reported_and_fails_only_with_strict(
    tmp_path: Path, text: str, rule: str, count: int
) -> None:
    path = _write(tmp_path, text)
    status, doc = _json("check", path, "--dead-time", "150ns")
    assert status == 0
    warnings = doc["summary"]["inputs"][0]["warnings"]
    assert [w["rule"] for w in warnings] == [rule] * count
    assert all(w["severity"] == "warning" for w in warnings)
    assert doc["summary"]["violations"] == 0
    r = run_cli("check", path, "--dead-time", "150ns")
    assert r.returncode == 0
    assert rule in r.stdout and f"{count} warning(s)" in r.stdout
    strict = run_cli("check", path, "--dead-time", "150ns", "--strict")
    assert strict.returncode == 1, strict.stdout
    assert strict.stderr == ""


def test_identical_leg_columns_warn(tmp_path: Path) -> None:
    """Same signal on both sides of a leg: a twin-channels warning beside the overlaps."""
    rows = ["time_ns,AH,AL"] + [f"{t},{v},{v}" for t, v in [(0, 0), (100, 1), (500, 0), (900, 1)]]
    path = _write(tmp_path, "\n".join(rows) + "\n")
    status, doc = _json("check", path, "--dead-time", "150ns")
    warnings = doc["summary"]["inputs"][0]["warnings"]
    assert [w["rule"] for w in warnings] == ["twin-channels"]
    assert warnings[0]["channels"] == ["AH", "AL"]
    assert status == 1  # both switches on together is also a shoot-through
    r = run_cli("check", path, "--dead-time", "150ns")
    assert "twin-channels" in r.stdout and "identical signals" in r.stdout


def test_clean_capture_has_no_warnings_even_with_strict(tmp_path: Path) -> None:
    path = _write(tmp_path, CLEAN)
    r = run_cli("check", path, "--dead-time", "150ns", "--strict")
    assert r.returncode == 0, r.stdout
    assert "warning" not in r.stdout

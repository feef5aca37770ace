"""Bounded output on a capture full of faults (a floating probe): the report must not
grow with every violation. Measured in bench/bench_noisy_capture.py.
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np

from sequencecheck.cli import run


def _noisy(path: Path, rows: int) -> str:
    """Every channel of legs A and B at a random level on every 10 ns sample."""
    rng = np.random.default_rng(7)
    levels = rng.integers(0, 2, (rows, 4))
    body = "\n".join(f"{k * 10},{a},{b},{c},{d}" for k, (a, b, c, d) in enumerate(levels.tolist()))
    path.write_text("time_ns,AH,AL,BH,BL\n" + body + "\n")
    return str(path)


def _json_report(tmp_path: Path, rows: int) -> tuple[int, dict]:
    capture = _noisy(tmp_path / f"noisy_{rows}.csv", rows)
    out = tmp_path / f"report_{rows}.json"
    assert (
        run(["check", capture, "--dead-time", "500ns", "--format", "json", "--output", str(out)])
        == 1
    )
    return out.stat().st_size, json.loads(out.read_text())


def test_noisy_capture_counts_every_violation(tmp_path: Path) -> None:
    """The summary counts every fault even when there are thousands."""
    _, doc = _json_report(tmp_path, 2_000)
    record = doc["summary"]["inputs"][0]
    assert record["rows"] == 2_000
    assert doc["summary"]["violations"] > 500
    assert sum(doc["summary"]["by_rule"].values()) == doc["summary"]["violations"]


def test_report_size_is_bounded_on_a_capture_full_of_faults(tmp_path: Path) -> None:
    small, _ = _json_report(tmp_path, 2_000)
    large, doc = _json_report(tmp_path, 20_000)
    assert doc["summary"]["violations"] > 5_000  # ten times the faults ...
    assert large < 2 * small  # ... but not ten times the report

"""`sequencecheck check` with tables and with --bridge: exit codes, sources, overrides."""

from __future__ import annotations

import json
import re

from conftest import SAMPLES, run_cli

from sequencecheck.cli import run


def test_clean_table_exits_0():
    r = run_cli("check", str(SAMPLES / "cart_reversal.steps"))
    assert r.returncode == 0, r.stderr
    assert "no violations" in r.stdout
    assert "(table)" in r.stdout


def test_faulty_table_names_the_line_to_fix():
    r = run_cli("check", str(SAMPLES / "cart_reversal_fault.steps"))
    assert r.returncode == 1, r.stderr
    line = next(ln for ln in r.stdout.splitlines() if "dead-time  leg B" in ln)
    # the turn-on written on line 22 is 150 ns after the turn-off; leg B needs 600 ns low-to-high
    assert re.search(r"BH on 150 ns after BL off; needs 600 ns  margin -450 ns", line), line
    assert "(" + str(SAMPLES / "cart_reversal_fault.steps") + ":22;" in line


def test_json_findings_carry_both_source_lines(capsys):
    status = run(["check", str(SAMPLES / "cart_reversal_fault.steps"), "--format", "json"])
    assert status == 1
    doc = json.loads(capsys.readouterr().out)
    assert doc["summary"]["by_rule"] == {"dead-time": 1}
    # the turn-off (line 21, BL=off) and the turn-on (line 22, BH=on)
    assert [s["line"] for s in doc["violations"][0]["sources"]] == [21, 22]


def test_dead_time_flag_overrides_the_file(capsys):
    # 100 ns everywhere (also replacing leg B's own 600 ns): the 150 ns gap now passes
    status = run(["check", str(SAMPLES / "cart_reversal_fault.steps"), "--dead-time", "100ns"])
    assert status == 0, capsys.readouterr()
    status = run(["check", str(SAMPLES / "cart_reversal.steps"), "--dead-time", "1us"])
    out = capsys.readouterr().out
    assert status == 1 and "needs 1 us" in out


def test_bridge_file_for_a_capture(capsys):
    status = run(
        [
            "check",
            str(SAMPLES / "cart_faulty_changes.csv"),
            "--bridge",
            str(SAMPLES / "cart.bridge"),
        ]
    )
    out = capsys.readouterr().out
    assert status == 1
    assert "dead-time  leg A: AL on 150 ns after AH off; needs 500 ns" in out
    assert "shoot-through" in out


def test_bridge_file_with_leg_flags_is_a_usage_error(capsys):
    status = run(
        [
            "check",
            str(SAMPLES / "cart_clean.csv"),
            "--bridge",
            str(SAMPLES / "cart.bridge"),
            "--leg",
            "A=AH,AL",
        ]
    )
    assert status == 2
    assert "either with --bridge or with --leg" in capsys.readouterr().err


def test_syntax_error_exits_2_with_one_line(tmp_path):
    (tmp_path / "t.steps").write_text("leg A high AH low AL\n0 AH=on\n+5 AL=on\n")
    r = run_cli("check", str(tmp_path / "t.steps"))
    assert r.returncode == 2
    assert r.stderr.count("\n") == 1 and "Traceback" not in r.stderr
    assert re.search(r"t\.steps:3:1: a time needs a unit .*not \+5$", r.stderr.strip()), r.stderr


def test_missing_bridge_exits_2(tmp_path):
    (tmp_path / "t.steps").write_text('include "gone.bridge"\n0 AH=on\n')
    r = run_cli("check", str(tmp_path / "t.steps"))
    assert r.returncode == 2 and r.stderr.count("\n") == 1
    assert "t.steps:1:9: bridge file 'gone.bridge' not found" in r.stderr


def test_bad_bridge_flag_file_exits_2(tmp_path):
    (tmp_path / "b.bridge").write_bytes(b"\xff\xfe")
    r = run_cli("check", str(SAMPLES / "cart_clean.csv"), "--bridge", str(tmp_path / "b.bridge"))
    assert r.returncode == 2 and r.stderr.count("\n") == 1
    assert "b.bridge:1: is not UTF-8 text" in r.stderr


def test_bridge_description_is_not_an_input(tmp_path):
    r = run_cli("check", str(SAMPLES / "cart.bridge"))
    assert r.returncode == 2
    assert "is a bridge description, not an input to check" in r.stderr


def test_empty_and_non_utf8_tables_exit_2_with_one_line(tmp_path):
    (tmp_path / "empty.steps").write_text("")
    (tmp_path / "latin.steps").write_bytes(b"# caf\xe9\nleg A high AH low AL\n")
    for name, text in (
        ("empty.steps", "empty.steps:1: empty file, expected a table: an include line and steps"),
        ("latin.steps", "latin.steps:1: is not UTF-8 text (byte 0xe9)"),
    ):
        r = run_cli("check", str(tmp_path / name))
        assert r.returncode == 2 and r.stderr.count("\n") == 1, r.stderr
        assert text in r.stderr and "Traceback" not in r.stderr

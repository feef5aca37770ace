"""The command-line contract: exit codes 0/1/2, one-line errors, the JSON shape."""

import json

from conftest import SAMPLES, run_cli


def test_clean_sample_exits_0():
    r = run_cli("check", str(SAMPLES / "cart_clean.csv"), "--dead-time", "500ns")
    assert r.returncode == 0, r.stderr
    assert "no violations" in r.stdout


def test_faulty_sample_exits_1_with_json_contract():
    r = run_cli(
        "check", str(SAMPLES / "cart_faulty.csv"), "--dead-time", "500ns", "--format", "json"
    )
    assert r.returncode == 1, r.stderr
    doc = json.loads(r.stdout)
    assert doc["summary"]["violations"] == 2
    assert doc["summary"]["by_rule"] == {"dead-time": 1, "shoot-through": 1}
    for v in doc["violations"]:
        assert set(v) >= {
            "rule",
            "leg",
            "channels",
            "start_s",
            "end_s",
            "measured_s",
            "required_s",
            "margin_s",
            "input",
        }


def test_missing_file_exits_2_with_one_line():
    r = run_cli("check", "no/such/file.csv")
    assert r.returncode == 2
    assert r.stderr.count("\n") == 1
    assert "no/such/file.csv" in r.stderr
    assert "Traceback" not in r.stderr


def test_unknown_channel_in_leg_exits_2():
    r = run_cli("check", str(SAMPLES / "cart_clean.csv"), "--leg", "A=AH,XL")
    assert r.returncode == 2
    assert r.stderr.strip().count("\n") == 0
    assert "'XL'" in r.stderr and "cart_clean.csv" in r.stderr


def test_bad_duration_exits_2_with_one_line():
    r = run_cli("check", str(SAMPLES / "cart_clean.csv"), "--dead-time", "5OOns")
    assert r.returncode == 2
    assert r.stderr.strip() == (
        "sequencecheck: error: --dead-time must be a duration such as 500ns or 1.5us, not '5OOns'"
    )


def test_usage_error_is_one_line():
    r = run_cli("check", str(SAMPLES / "cart_clean.csv"), "--format", "yaml")
    assert r.returncode == 2
    assert r.stderr.strip().count("\n") == 0
    assert "invalid choice" in r.stderr


def test_output_into_missing_folder_exits_2(tmp_path):
    r = run_cli(
        "check", str(SAMPLES / "cart_clean.csv"), "--output", str(tmp_path / "no" / "r.json")
    )
    assert r.returncode == 2
    assert "does not exist" in r.stderr


def test_output_file_is_written(tmp_path):
    out = tmp_path / "r.json"
    r = run_cli(
        "check",
        str(SAMPLES / "cart_faulty_changes.csv"),
        "--dead-time",
        "500ns",
        "--format",
        "json",
        "--output",
        str(out),
    )
    assert r.returncode == 1
    assert r.stdout == ""
    doc = json.loads(out.read_text())
    (inp,) = doc["summary"]["inputs"]
    assert inp["rows"] > 0 and inp["end_ps"] == 3_999_950_000  # the last row of the export


def test_one_bad_input_among_good_ones_exits_2_and_checks_the_rest():
    r = run_cli(
        "check",
        str(SAMPLES / "cart_faulty.csv"),
        "missing.csv",
        "--dead-time",
        "500ns",
        "--format",
        "json",
    )
    assert r.returncode == 2
    doc = json.loads(r.stdout)
    assert doc["summary"]["violations"] == 2
    assert doc["summary"]["inputs_failed"] == 1
    assert "missing.csv" in r.stderr


def test_sampled_and_change_only_exports_agree():
    a = json.loads(
        run_cli(
            "check", str(SAMPLES / "cart_faulty.csv"), "--dead-time", "500ns", "--format", "json"
        ).stdout
    )
    b = json.loads(
        run_cli(
            "check",
            str(SAMPLES / "cart_faulty_changes.csv"),
            "--dead-time",
            "500ns",
            "--format",
            "json",
        ).stdout
    )
    key = [(v["rule"], v["start_ps"], v["end_ps"]) for v in a["violations"]]
    assert key == [(v["rule"], v["start_ps"], v["end_ps"]) for v in b["violations"]]


def test_version_and_help_with_examples():
    assert run_cli("--version").stdout.startswith("sequencecheck ")
    r = run_cli("check", "--help")
    assert r.returncode == 0 and "examples:" in r.stdout and "exit status" in r.stdout


def test_text_report_has_no_colour_codes_when_piped():
    r = run_cli("check", str(SAMPLES / "cart_faulty.csv"), "--dead-time", "500ns")
    assert "\x1b[" not in r.stdout
    assert "1.180 150 ms" in r.stdout or "1.180 ms" in r.stdout

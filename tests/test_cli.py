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
            "rule", "leg", "channels", "start_s", "end_s", "measured_s",
            "required_s", "margin_s", "input",
        }


def test_missing_file_exits_2_with_one_line():
    r = run_cli("check", "no/such/file.csv")
    assert r.returncode == 2
    assert r.stderr.count("\n") == 1
    assert "no/such/file.csv" in r.stderr
    assert "Traceback" not in r.stderr

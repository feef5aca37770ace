"""SARIF 2.1.0 report, validated against the OASIS schema with jsonschema."""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from conftest import ROOT, SAMPLES, run_cli
from report_factory import table_report, with_extra_findings

from sequencecheck.reporters import REPORTERS, render
from sequencecheck.rules import RULES

jsonschema = pytest.importorskip("jsonschema")

# OASIS, SARIF Version 2.1.0 (schema in schemas/sarif-schema-2.1.0.json): in ../shared beside
# the clone (CI), or beside a folder above it (a developer's git worktree).
_SCHEMA = Path("shared", "reference", "schemas", "sarif-schema-2.1.0.json")
SCHEMA_PATH = next(
    (p / _SCHEMA for p in ROOT.parents if (p / _SCHEMA).is_file()), ROOT.parent / _SCHEMA
)


@pytest.fixture(scope="module")
def validator():
    if not SCHEMA_PATH.is_file():
        pytest.skip(f"SARIF schema not found at {SCHEMA_PATH} (needs ../shared beside the clone)")
    schema = json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))
    return jsonschema.Draft4Validator(schema)


def _assert_valid(validator, doc: dict) -> None:
    errors = sorted(validator.iter_errors(doc), key=lambda e: list(e.path))
    assert not errors, "\n".join(f"{list(e.path)}: {e.message}" for e in errors[:5])


def _sarif(report) -> dict:
    return json.loads(render(report, "sarif"))


def test_registered_as_sarif():
    assert "sarif" in REPORTERS


def test_valid_against_the_oasis_schema(validator):
    # OASIS, SARIF Version 2.1.0 (schema in schemas/sarif-schema-2.1.0.json)
    doc = _sarif(with_extra_findings(table_report()))
    _assert_valid(validator, doc)
    assert doc["version"] == "2.1.0"


def test_the_schema_check_can_fail(validator):
    doc = _sarif(table_report())
    doc["runs"][0]["results"][0]["level"] = "fatal"
    assert list(validator.iter_errors(doc))


def test_every_registered_rule_is_described():
    driver = _sarif(table_report())["runs"][0]["tool"]["driver"]
    ids = [d["id"] for d in driver["rules"]]
    assert ids[: len(RULES)] == [r.id for r in RULES]
    for rule, d in zip(RULES, driver["rules"], strict=False):
        assert d["shortDescription"]["text"] == rule.summary
        assert rule.summary in d["fullDescription"]["text"]
        assert d["help"]["text"] == rule.help


def test_results_levels_and_rule_index():
    doc = _sarif(with_extra_findings(table_report()))
    run = doc["runs"][0]
    ids = [d["id"] for d in run["tool"]["driver"]["rules"]]
    levels = {(r["ruleId"], r["properties"]["start"]): r["level"] for r in run["results"]}
    assert levels[("dead-time", "1 us")] == "error"
    assert levels[("shoot-through", "5 us")] == "error"
    assert levels[("dead-time", "2 us")] == "note"  # inconclusive at this sample rate
    assert levels[("odd-input", "3 us")] == "warning"
    assert "odd-input" in ids  # unregistered rules get a descriptor too
    for r in run["results"]:
        assert ids[r["ruleIndex"]] == r["ruleId"]


def test_table_findings_point_at_their_lines_with_the_second_edge_related():
    run = _sarif(table_report())["runs"][0]
    dead = next(r for r in run["results"] if r["ruleId"] == "dead-time")
    loc = dead["locations"][0]
    # UL turns off on line 3, UH turns on on line 4 (report_factory.TABLE_EDGES)
    assert loc["physicalLocation"]["artifactLocation"]["uri"] == "pump/inverter.table"
    assert loc["physicalLocation"]["region"] == {"startLine": 3}
    assert dead["relatedLocations"][0]["physicalLocation"]["region"] == {"startLine": 4}
    assert loc["logicalLocations"][0]["name"] == "U"
    props = dead["properties"]
    assert (props["startPs"], props["endPs"]) == (1_000_000, 1_100_000)
    assert (props["measuredPs"], props["requiredPs"], props["marginPs"]) == (
        100_000,
        300_000,
        -200_000,
    )


def test_columns_are_kept_when_sources_have_them():
    from dataclasses import replace

    from sequencecheck.model import Source

    report = table_report()
    first = report.inputs[0]
    f = replace(first.findings[0], sources=(Source("pump/inverter.table", 7, 12),))
    report = replace(report, inputs=(replace(first, findings=(f,)),))
    region = _sarif(report)["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["region"]
    assert region == {"startLine": 7, "startColumn": 12}


def test_capture_findings_have_a_logical_location_and_time_window():
    doc = _sarif(with_extra_findings(table_report()))
    res = next(r for r in doc["runs"][0]["results"] if r["level"] == "note")
    loc = res["locations"][0]
    assert loc["logicalLocations"][0]["fullyQualifiedName"] == "bench/pump_capture.csv::U"
    assert loc["physicalLocation"]["artifactLocation"]["uri"] == "bench/pump_capture.csv"
    assert res["properties"]["start"] == "2 us" and res["properties"]["end"] == "2.280 us"
    assert res["properties"]["boundsPs"] == [230_000, 330_000]


def test_unreadable_input_is_a_tool_notification():
    inv = _sarif(table_report())["runs"][0]["invocations"][0]
    assert inv["executionSuccessful"] is False
    assert "no such file" in inv["toolExecutionNotifications"][0]["message"]["text"]


def test_cli_sarif_on_the_demo_capture(tmp_path, validator):
    out = tmp_path / "results.sarif"
    r = run_cli(
        "check", str(SAMPLES / "cart_faulty.csv"), "--dead-time", "500ns",
        "--format", "sarif", "--output", str(out),
    )  # fmt: skip
    assert r.returncode == 1, r.stderr
    doc = json.loads(Path(out).read_text(encoding="utf-8"))
    _assert_valid(validator, doc)
    results = [r for r in doc["runs"][0]["results"] if r["level"] == "error"]
    assert sorted(r["ruleId"] for r in results) == ["dead-time", "shoot-through"]
    for res in results:  # CSV rows carry line numbers too
        assert res["locations"][0]["physicalLocation"]["region"]["startLine"] > 1
        assert res["locations"][0]["physicalLocation"]["artifactLocation"]["uri"].startswith(
            "file:"
        )


def test_paths_become_valid_uris(validator):
    from dataclasses import replace

    from sequencecheck.model import Source

    report = table_report()
    first = report.inputs[0]
    f = replace(
        first.findings[0],
        input="/bench/pump run #2.csv",
        sources=(Source("/bench/pump run #2.csv", 5), Source("tables/leg u.table", 9)),
    )
    report = replace(report, inputs=(replace(first, findings=(f,)),))
    doc = _sarif(report)
    _assert_valid(validator, doc)
    (res,) = doc["runs"][0]["results"]
    loc = res["locations"][0]["physicalLocation"]["artifactLocation"]
    assert loc == {"uri": "file:///bench/pump%20run%20%232.csv"}
    related = res["relatedLocations"][0]["physicalLocation"]["artifactLocation"]
    assert related == {"uri": "tables/leg%20u.table", "uriBaseId": "%SRCROOT%"}

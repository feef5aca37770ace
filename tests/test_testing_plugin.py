"""The pytest plugin, run in temporary projects with the project's own strict settings."""

from __future__ import annotations

import re
import tomllib
from importlib.metadata import entry_points

import pytest
from conftest import ROOT

PLUGIN = "sequencecheck.testing.pytest_plugin"

# Installed (CI): the entry point loads the plugin, as for users; a checkout: load it by name.
# (Passing -p as well when installed would re-import a module pytest cannot rewrite any more.)
LOAD = () if entry_points(group="pytest11", name=PLUGIN) else ("-p", PLUGIN)

STRICT_INI = """
[pytest]
addopts = --strict-markers
xfail_strict = true
filterwarnings =
    error
"""

TESTS = """
import pytest
from sequencecheck.model import Bridge, DeadTime, Leg, Policy

PUMP = Bridge((Leg("A", "AH", "AL"),))
STRICT = Policy(dead_time=DeadTime.both(200_000))


@pytest.mark.gate_check(bridge=PUMP, policy=STRICT)
def test_clean(gate_recorder):
    gate_recorder.set(0, AL=1)
    gate_recorder.set(1_000_000, AL=0)
    gate_recorder.set(1_300_000, AH=1)
    gate_recorder.step(1_000)


@pytest.mark.gate_check(bridge=PUMP, policy=STRICT)
def test_short_dead_time(gate_recorder):
    gate_recorder.set(0, AL=1)
    gate_recorder.set(1_000_000, AL=0)
    gate_recorder.set(1_100_000, AH=1)
    gate_recorder.step(1_000)


def test_guessed_legs_overlap(gate_recorder):
    gate_recorder.set(0, QB_H=1, QB_L=0)
    gate_recorder.set(5_000, QB_L=1)
    gate_recorder.set(6_000, QB_H=0)
    gate_recorder.step(1_000)


@pytest.mark.gate_check(check=False)
def test_check_off(gate_recorder):
    gate_recorder.set(0, AH=1, AL=1)
    gate_recorder.step(10)


def test_nothing_recorded(gate_recorder):
    pass


def test_own_failure_comes_first(gate_recorder):
    gate_recorder.set(0, AH=1, AL=1)
    assert 1 + 1 == 3
"""


def test_plugin_fixture_and_marker(pytester: pytest.Pytester):
    pytester.makeini(STRICT_INI)
    pytester.makepyfile(test_gates=TESTS)
    result = pytester.runpytest(*LOAD, "-p", "no:cacheprovider")
    result.assert_outcomes(passed=2, failed=4)
    out = result.stdout.str()
    result.stdout.fnmatch_lines(
        [
            "*test_short_dead_time*",
            "*gate sequence is not safe: 1 finding(s) in test_gates.py::test_short_dead_time*",
            "*dead-time  leg A: AH on 100 ns after AL off; needs 200 ns  margin -100 ns*",
        ]
    )
    assert "shoot-through  leg QB: QB_H and QB_L both on for 1 ns" in out
    assert "gate_recorder: nothing was recorded in test_gates.py::test_nothing_recorded" in out
    assert "assert (1 + 1) == 3" in out


def test_marker_is_registered_and_checked(pytester: pytest.Pytester):
    pytester.makeini(STRICT_INI)
    pytester.makepyfile(
        test_marker="""
import pytest

@pytest.mark.gate_check(dead_time=5)
def test_bad_option(gate_recorder):
    gate_recorder.set(0, AH=1)
"""
    )
    result = pytester.runpytest(*LOAD, "-p", "no:cacheprovider", "--markers")
    result.stdout.fnmatch_lines(["@pytest.mark.gate_check(bridge=None, policy=None, check=True):*"])
    result = pytester.runpytest(*LOAD, "-p", "no:cacheprovider")
    result.assert_outcomes(errors=1)
    result.stdout.fnmatch_lines(
        ["*gate_check does not take dead_time (it takes bridge, policy, check)*"]
    )


def test_without_the_plugin_the_marker_is_unknown(
    pytester: pytest.Pytester, monkeypatch: pytest.MonkeyPatch
):
    # the strict settings really are in force in these temporary projects; a subprocess,
    # because pytest caches known markers per process
    pytester.makeini(STRICT_INI)
    pytester.makepyfile(
        test_x="import pytest\n@pytest.mark.gate_check()\ndef test_x():\n    pass\n"
    )
    monkeypatch.setenv("PYTHONPATH", str(ROOT))
    result = pytester.runpytest_subprocess("-p", "no:cacheprovider", "-p", "no:" + PLUGIN)
    assert result.ret != 0
    # pytest's wording differs between versions; both say the marker is not registered
    assert re.search(
        r"Unknown pytest\.mark\.gate_check|'gate_check' not found in `markers`", result.stdout.str()
    ), result.stdout.str()


def test_entry_point_names_the_plugin_module():
    project = tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]
    assert project["entry-points"]["pytest11"] == {PLUGIN: PLUGIN}
    assert "hypothesis" in " ".join(project["optional-dependencies"]["testing"])
    assert "hypothesis" in " ".join(project["optional-dependencies"]["test"])

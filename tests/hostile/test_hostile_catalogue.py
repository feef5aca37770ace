"""Every catalogued hostile input through the CLI and through ``read()``.

Broken input: exit 2, exactly one stderr line ``sequencecheck: error: PATH[:LINE]: ...``,
printable, of bounded length, no traceback, and the report still says the input was
not checked. Valid-but-odd input: read to exactly the catalogued edges.
"""

from __future__ import annotations

import json
import os
import re
import subprocess
import sys
from pathlib import Path

import pytest
from catalogue import CASES, Case, Fails, Reads, markdown_table
from conftest import ROOT, run_cli

from sequencecheck.errors import InputError, UsageError
from sequencecheck.readers import read

MAX_MESSAGE = 300  # characters after the "PATH:LINE: " prefix
CONTROL = re.compile(r"[\x00-\x08\x0b-\x1f\x7f]")


def _params(cases: list[Case]) -> list[object]:
    out = []
    for c in cases:
        marks = [pytest.mark.xfail(strict=True, reason=c.known_bug)] if c.known_bug else []
        out.append(pytest.param(c, id=re.sub(r"[^\w.+-]+", "-", c.name), marks=marks))
    return out


def _skip_as_root(case: Case) -> None:
    if case.skip_as_root and hasattr(os, "geteuid") and os.geteuid() == 0:
        pytest.skip(case.skip_as_root)


def _cli(case: Case, path: Path) -> subprocess.CompletedProcess[str]:
    args = ("check", str(path), *case.args, "--format", "json")
    if case.timeout is None:
        return run_cli(*args)
    env = dict(os.environ, PYTHONPATH=str(ROOT), NO_COLOR="1")
    try:
        return subprocess.run(
            [sys.executable, "-m", "sequencecheck", *args],
            capture_output=True,
            text=True,
            env=env,
            timeout=case.timeout,
        )
    except subprocess.TimeoutExpired:
        pytest.fail(f"no answer within {case.timeout} s: the run hangs")


def _check_message(text: str, path: Path, expect: Fails) -> None:
    """The shared promises of an error message: place, wording, one printable line."""
    shown = str(path).replace("\n", "\\n")  # a newline in the path is shown escaped
    if expect.usage:
        prefix = ""
    elif expect.line is not None:
        prefix = f"{shown}:{expect.line}: "
    else:
        prefix = f"{shown}: "
    assert text.startswith(prefix), f"expected the prefix {prefix!r}: {text[:300]!r}"
    assert re.search(expect.pattern, text), f"{expect.pattern!r} not in {text[:300]!r}"
    assert "\n" not in text and "\r" not in text, f"not one line: {text[:300]!r}"
    assert not CONTROL.search(text), f"raw control characters: {text[:300]!r}"
    assert len(text) - len(prefix) <= MAX_MESSAGE, f"message of {len(text):,} characters"


@pytest.mark.parametrize("case", _params(CASES))
def test_cli(case: Case, tmp_path: Path) -> None:
    _skip_as_root(case)
    path = case.make(tmp_path)
    r = _cli(case, path)
    assert "Traceback" not in r.stderr, r.stderr[-3000:]
    if isinstance(case.expect, Fails):
        assert r.returncode == 2, (r.returncode, r.stderr[-2000:])
        assert r.stderr.endswith("\n") and r.stderr.count("\n") == 1, r.stderr[:2000]
        head = "sequencecheck: error: "
        assert r.stderr.startswith(head)
        message = r.stderr[len(head) : -1]
        _check_message(message, path, case.expect)
        if case.expect.usage:
            assert r.stdout == ""  # a bad flag stops the run before any report
            return
        # no silent pass: the report itself says this input was not checked
        summary = json.loads(r.stdout)["summary"]
        assert summary["inputs_failed"] == 1
        assert summary["inputs"][0]["error"] == message
    else:
        assert isinstance(case.expect, Reads)
        assert r.returncode in (0, 1), r.stderr[-2000:]
        assert r.stderr == ""
        record = json.loads(r.stdout)["summary"]["inputs"][0]
        expect = case.expect
        assert record["error"] is None
        assert record["rows"] == expect.rows
        assert record["channels"] == list(expect.channels)
        assert record["edges"] == sum(len(e) for _, e in expect.channels.values())
        if expect.start_ps is not None:
            assert (record["start_ps"], record["end_ps"]) == (expect.start_ps, expect.end_ps)


@pytest.mark.parametrize("case", _params([c for c in CASES if c.in_process]))
def test_read(case: Case, tmp_path: Path) -> None:
    _skip_as_root(case)
    path = case.make(tmp_path)
    if isinstance(case.expect, Fails) and case.expect.usage:
        with pytest.raises(UsageError) as usage:
            read(str(path), **case.read_options)
        _check_message(str(usage.value), path, case.expect)
        return
    if isinstance(case.expect, Fails):
        with pytest.raises(InputError) as err:
            read(str(path), **case.read_options)
        assert err.value.path == str(path)
        assert err.value.line == case.expect.line
        _check_message(str(err.value), path, case.expect)
        return
    assert isinstance(case.expect, Reads)
    trace = read(str(path), **case.read_options)
    assert trace.rows == case.expect.rows
    assert list(trace.channels) == list(case.expect.channels)
    for name, (initial, edges) in case.expect.channels.items():
        ch = trace.channel(name)
        got = list(zip(ch.times.tolist(), ch.levels.tolist(), strict=True))
        assert (ch.initial, got) == (initial, edges), name
    if case.expect.start_ps is not None:
        assert (trace.start_ps, trace.end_ps) == (case.expect.start_ps, case.expect.end_ps)


def test_catalogue_names_are_unique() -> None:
    names = [(c.reader, c.name) for c in CASES]
    assert len(names) == len(set(names))


def test_developers_guide_lists_every_case() -> None:
    text = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    assert markdown_table() in text, (
        "run: python tests/hostile/catalogue.py, paste into DEVELOPERS.md"
    )

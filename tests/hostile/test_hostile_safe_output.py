"""Safe output: input is data, never code; reports are written whole or not at all;
odd channel names reach text and JSON reports intact (JSON-escaped).
"""

from __future__ import annotations

import ast
import contextlib
import csv
import errno
import io
import json
import os
import stat
from pathlib import Path

import pytest
from conftest import ROOT, SAMPLES, run_cli

import sequencecheck.cli._output as output_module
from sequencecheck.cli import run
from sequencecheck.reporters import REPORTERS

PACKAGE = ROOT / "sequencecheck"

# --- nothing from the input is executed or evaluated ------------------------------------

#: Calls that run text as code or a command, or load objects from bytes.
FORBIDDEN_NAMES = {"eval", "exec", "compile", "__import__", "breakpoint"}
FORBIDDEN_ATTRS = {
    ("os", "system"),
    ("os", "popen"),
    ("pickle", "load"),
    ("pickle", "loads"),
    ("marshal", "load"),
    ("marshal", "loads"),
    ("yaml", "load"),
    ("shelve", "open"),
}


def _forbidden_calls(source: str, filename: str) -> list[str]:
    found = []
    for node in ast.walk(ast.parse(source, filename)):
        if not isinstance(node, ast.Call):
            continue
        f = node.func
        if isinstance(f, ast.Name) and f.id in FORBIDDEN_NAMES:
            found.append(f"{filename}:{node.lineno}: {f.id}()")
        elif (
            isinstance(f, ast.Attribute)
            and isinstance(f.value, ast.Name)
            and (f.value.id, f.attr) in FORBIDDEN_ATTRS
        ):
            found.append(f"{filename}:{node.lineno}: {f.value.id}.{f.attr}()")
        if any(k.arg == "shell" for k in node.keywords):
            found.append(f"{filename}:{node.lineno}: shell=")
    return found


def test_the_package_never_evaluates_text() -> None:
    """No eval/exec/pickle/shell anywhere in the package (mode expressions included)."""
    hits = []
    for path in sorted(PACKAGE.rglob("*.py")):
        hits += _forbidden_calls(path.read_text(encoding="utf-8"), str(path.relative_to(ROOT)))
    assert hits == []


def test_the_scan_finds_what_it_looks_for() -> None:
    src = "import os, pickle\neval(x)\nos.system(c)\npickle.loads(b)\nrun(c, shell=True)\n"
    assert len(_forbidden_calls(src, "probe.py")) == 4


def test_code_in_channel_names_and_flags_stays_text(tmp_path: Path) -> None:
    high = "__import__('os').system('touch pwned-high')_H"
    low = "{__import__('os').system('touch pwned-low')}_L"
    stamp = "$(touch pwned-time) `touch pwned-tick` (ns)"
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow([stamp, high, low])
    w.writerows([[0, 0, 1], [100, 0, 0], [300, 1, 0], [900, 0, 0], [1100, 0, 1]])
    (tmp_path / "capture.csv").write_text(buf.getvalue())
    r = run_cli(
        "check", "capture.csv", "--leg", f"X={high},{low}", "--format", "json", cwd=tmp_path
    )
    assert r.returncode == 0, r.stderr
    doc = json.loads(r.stdout)
    assert doc["summary"]["inputs"][0]["channels"] == [high, low]
    bad_flag = run_cli(
        "check", "capture.csv", "--dead-time", "__import__('os').system('touch pwned-flag')"
    )
    assert bad_flag.returncode == 2
    assert sorted(p.name for p in tmp_path.iterdir()) == ["capture.csv"]


# --- odd channel names reach the reports intact ------------------------------------------

HIGH = 'pump <b>U</b> & "hi" \\ ü; H'
LOW = 'pump <b>U</b> & "hi" \\ ü; L'


def _odd_capture(tmp_path: Path, high: str = HIGH, low: str = LOW) -> str:
    """A capture with a 100 ns shoot-through, so findings carry the names too."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["time_ns", high, low])
    w.writerows([[0, 0, 1], [100, 0, 0], [300, 1, 0], [900, 1, 1], [1000, 0, 1], [1100, 0, 1]])
    path = tmp_path / "capture.csv"
    path.write_text(buf.getvalue(), encoding="utf-8")
    return str(path)


def test_odd_names_survive_json(tmp_path: Path) -> None:
    path = _odd_capture(tmp_path)
    r = run_cli("check", path, "--format", "json")
    assert r.returncode == 1, r.stderr
    doc = json.loads(r.stdout)
    assert doc["summary"]["inputs"][0]["channels"] == [HIGH, LOW]
    (finding,) = doc["violations"]
    assert finding["rule"] == "shoot-through"
    assert finding["channels"] == [HIGH, LOW]
    assert HIGH in finding["message"] and LOW in finding["message"]
    assert json.dumps(HIGH, ensure_ascii=False) in r.stdout  # quotes and backslash escaped


def test_odd_names_survive_text(tmp_path: Path) -> None:
    path = _odd_capture(tmp_path)
    r = run_cli("check", path)
    assert r.returncode == 1, r.stderr
    assert f"channels: {HIGH}, {LOW}" in r.stdout
    assert f"{HIGH} and {LOW} both on" in r.stdout


def test_control_characters_in_names_are_escaped_in_json(tmp_path: Path) -> None:
    high, low = "A\x1b[2J H", "A\x1b[2J L"
    path = _odd_capture(tmp_path, high, low)
    r = run_cli("check", path, "--format", "json")
    assert "\x1b" not in r.stdout
    assert json.loads(r.stdout)["summary"]["inputs"][0]["channels"] == [high, low]


def test_control_characters_in_names_are_escaped_in_text(tmp_path: Path) -> None:
    path = _odd_capture(tmp_path, "A\x1b[2J H", "A\x1b[2J L")
    r = run_cli("check", path)
    assert "\x1b" not in r.stdout


# --- reports are written atomically -------------------------------------------------------

SAMPLE = str(SAMPLES / "cart_faulty_changes.csv")
PREVIOUS = '{"previous": "report"}\n'


def _leftovers(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name != "report.json")


@pytest.fixture
def previous(tmp_path: Path) -> Path:
    out = tmp_path / "report.json"
    out.write_text(PREVIOUS)
    return out


def _check_args(out: Path) -> list[str]:
    return ["check", SAMPLE, "--dead-time", "500ns", "--format", "json", "--output", str(out)]


def test_report_file_is_replaced_whole(previous: Path) -> None:
    assert run(_check_args(previous)) == 1
    doc = json.loads(previous.read_text())
    assert doc["summary"]["violations"] == 2
    assert _leftovers(previous.parent) == []


def test_a_renderer_that_fails_leaves_the_previous_report(
    previous: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    def broken(report: object, **options: object) -> str:
        raise RuntimeError("renderer failed halfway")

    monkeypatch.setitem(REPORTERS, "json", broken)
    with pytest.raises(RuntimeError, match="halfway"):
        run(_check_args(previous))
    assert previous.read_text() == PREVIOUS
    assert _leftovers(previous.parent) == []


@pytest.mark.parametrize("interruption", [KeyboardInterrupt, SystemExit, OSError])
def test_interrupted_rename_leaves_the_previous_report(
    previous: Path, monkeypatch: pytest.MonkeyPatch, interruption: type[BaseException]
) -> None:
    def interrupted(src: str, dst: str) -> None:
        raise interruption()

    monkeypatch.setattr(output_module.os, "replace", interrupted)
    with contextlib.suppress(KeyboardInterrupt, OSError):
        run(_check_args(previous))  # run() turns SystemExit into a status; others escape
    assert previous.read_text() == PREVIOUS
    assert _leftovers(previous.parent) == []


class _DiskFull(io.BufferedWriter):
    """A file that takes half of what is written, then reports a full disk."""

    def write(self, data: bytes) -> int:  # type: ignore[override]
        super().write(bytes(data)[: len(data) // 2])
        self.flush()
        raise OSError(errno.ENOSPC, "No space left on device")


def _disk_full_fdopen(fd: int, mode: str = "rb", *args: object, **kwargs: object) -> io.IOBase:
    return _DiskFull(io.FileIO(fd, "w"))


def test_disk_full_mid_write_leaves_the_previous_report(
    previous: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setattr(output_module.os, "fdopen", _disk_full_fdopen)
    assert run(_check_args(previous)) == 2  # one line on stderr, as the next test pins
    assert previous.read_text() == PREVIOUS
    assert _leftovers(previous.parent) == []


def test_disk_full_mid_write_is_a_one_line_error(
    previous: Path, monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    monkeypatch.setattr(output_module.os, "fdopen", _disk_full_fdopen)
    assert run(_check_args(previous)) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and str(previous) in err


def test_report_keeps_the_previous_files_mode(previous: Path) -> None:
    previous.chmod(0o644)
    run(_check_args(previous))
    assert stat.S_IMODE(previous.stat().st_mode) == 0o644


def test_output_through_a_symlink_updates_its_target(tmp_path: Path) -> None:
    target = tmp_path / "run-42.json"
    target.write_text(PREVIOUS)
    link = tmp_path / "latest.json"
    link.symlink_to(target.name)
    run(_check_args(link))
    assert link.is_symlink()
    assert json.loads(target.read_text())["summary"]["violations"] == 2


def test_output_to_a_device_file_writes_to_the_device(tmp_path: Path) -> None:
    node = tmp_path / "null"
    try:
        os.mknod(node, stat.S_IFCHR | 0o666, os.makedev(1, 3))  # the null device's numbers
    except (PermissionError, OSError) as e:
        pytest.skip(f"cannot make a device node here: {e}")
    run(_check_args(node))
    assert stat.S_ISCHR(node.stat().st_mode)


def test_output_never_overwrites_an_input(tmp_path: Path) -> None:
    capture = tmp_path / "capture.csv"
    original = (SAMPLES / "cart_faulty_changes.csv").read_bytes()
    capture.write_bytes(original)
    status = run(["check", str(capture), "--dead-time", "500ns", "--output", str(capture)])
    assert capture.read_bytes() == original
    assert status == 2


# --- every registered report format keeps hostile names as data --------------------------

INJECT_HIGH = "<sc-injected a='1'>&amp;\"q\"</sc-injected> H"
INJECT_LOW = "<sc-injected a='1'>&amp;\"q\"</sc-injected> L"


def _strings(node: object) -> list[str]:
    if isinstance(node, str):
        return [node]
    if isinstance(node, dict):
        return [s for k, v in node.items() for s in (*_strings(k), *_strings(v))]
    if isinstance(node, list):
        return [s for v in node for s in _strings(v)]
    return []


def _markup_text_and_tags(text: str) -> tuple[list[str], set[str]]:
    """Text and attribute values, and tag names, of an XML or HTML document."""
    import xml.etree.ElementTree as ET
    from html.parser import HTMLParser

    try:
        root = ET.fromstring(text)
    except ET.ParseError:
        found: list[str] = []
        tags: set[str] = set()

        class Collect(HTMLParser):
            def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
                tags.add(tag)
                found.extend(v for _, v in attrs if v)

            def handle_data(self, data: str) -> None:
                found.append(data)

        Collect(convert_charrefs=True).feed(text)
        return found, tags
    return (
        [s for el in root.iter() for s in (el.text or "", el.tail or "", *el.attrib.values())],
        {el.tag for el in root.iter()},
    )


@pytest.mark.parametrize("fmt", sorted(REPORTERS))
def test_every_report_format_keeps_hostile_names_as_data(fmt: str, tmp_path: Path) -> None:
    """Markup, quotes and entities in names stay text in every format, escaped as it needs."""
    from sequencecheck.api import check
    from sequencecheck.reporters import render

    report = check([_odd_capture(tmp_path, INJECT_HIGH, INJECT_LOW)])
    out = render(report, fmt)
    text = out.decode("utf-8") if isinstance(out, bytes) else out
    stripped = text.lstrip()
    if fmt == "text":
        assert INJECT_HIGH in text and INJECT_LOW in text
    elif stripped.startswith(("{", "[")):
        strings = _strings(json.loads(text))
        assert any(INJECT_HIGH in s for s in strings) and any(INJECT_LOW in s for s in strings)
    elif stripped.startswith("<"):
        found, tags = _markup_text_and_tags(text)
        assert "sc-injected" not in tags, f"{fmt}: a channel name became markup"
        joined = "\n".join(found)
        assert INJECT_HIGH in joined and INJECT_LOW in joined, f"{fmt}: name not kept as text"
    else:
        pytest.fail(f"teach this test how to read the {fmt!r} format")


def test_the_markup_reader_tells_escaped_from_injected() -> None:
    from html import escape

    html_raw = f"<html><body><td>{INJECT_HIGH}</td></body></html>"
    html_safe = f"<html><body><td>{escape(INJECT_HIGH)}</td></body></html>"
    xml_safe = f'<testsuite name="{escape(INJECT_HIGH, quote=True)}"><c>{escape(INJECT_LOW)}</c></testsuite>'
    assert "sc-injected" in _markup_text_and_tags(html_raw)[1]
    found, tags = _markup_text_and_tags(html_safe)
    assert "sc-injected" not in tags and INJECT_HIGH in "".join(found)
    found, tags = _markup_text_and_tags(xml_safe)
    assert "sc-injected" not in tags and {INJECT_HIGH, INJECT_LOW} <= set(found)

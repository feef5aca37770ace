"""HTML bench report: self-contained, escaped, and clean in a real headless Chromium."""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from conftest import SAMPLES
from headless_chromium import Browser, find_chromium
from report_factory import table_report

from sequencecheck.cli import run
from sequencecheck.reporters import REPORTERS, render
from sequencecheck.reporters._html import CAUTION

NASTY = "<b>x</b>"


def _nasty_capture(tmp_path: Path) -> Path:
    """The demo capture with channel AH renamed to markup and a file name with markup."""
    text = (SAMPLES / "cart_faulty.csv").read_text().replace("AH", NASTY, 1)
    path = tmp_path / "pump<i>&amp;.csv"
    path.write_text(text)
    return path


def _html_report(tmp_path: Path, *extra: str) -> tuple[Path, str]:
    src = _nasty_capture(tmp_path)
    out = tmp_path / "report.html"
    status = run(
        ["check", str(src), "--leg", f"A={NASTY},AL", "--leg", "B=BH,BL",
         "--dead-time", "500ns", "--format", "html", "--output", str(out), *extra]
    )  # fmt: skip
    assert status == 1
    return out, out.read_text(encoding="utf-8")


@pytest.fixture(scope="module")
def page(tmp_path_factory) -> tuple[Path, str]:
    return _html_report(tmp_path_factory.mktemp("html"))


def test_registered_as_html():
    assert "html" in REPORTERS


def test_input_strings_are_escaped(page):
    _, text = page
    assert NASTY not in text
    assert "&lt;b&gt;x&lt;/b&gt;" in text
    assert "pump&lt;i&gt;&amp;amp;.csv" in text
    assert "<i>" not in text


def test_self_contained_with_caution_and_pictures(page):
    _, text = page
    assert not re.search(r"<(script|link|iframe|img)\b", text)
    assert not re.search(r"""(src|href)\s*=\s*["']?(https?:|//)""", text)
    assert "Content-Security-Policy" in text
    assert CAUTION in text
    assert text.count("<svg") == 2 + 2  # two findings, two histograms (leg A both ways)
    assert 'id="summary-0"' in text
    assert "1.180 ms" in text and "3.050 750 ms" in text  # the demo's injected faults


def test_limit_and_left_out_note(tmp_path):
    _, text = _html_report(tmp_path, "--plots-limit", "0")
    assert text.count("<svg") == 2  # histograms only
    assert "2 finding(s) shown without a diagram" in text
    assert "at most 0 diagrams per rule" in text


def test_unreadable_input_and_no_figures():
    text = render(table_report(), "html")
    assert "not checked" in text and "no such file" in text
    assert "Diagrams were not drawn" in text


@pytest.fixture(scope="module")
def browser():
    exe = find_chromium()
    if exe is None:
        pytest.skip("chromium not installed (.ci/run installs the Debian package chromium)")
    b = Browser(exe)
    yield b
    b.close()


def test_browser_harness_sees_console_errors(browser, tmp_path):
    bad = tmp_path / "bad.html"
    bad.write_text("<!DOCTYPE html><html><body><script>console.error('x')</script></body></html>")
    assert browser.load(bad)


def test_loads_in_chromium_without_console_errors(browser, page):
    path, _ = page
    assert browser.load(path) == []
    # escaping: the channel name is text, not a bold element
    assert browser.evaluate("document.querySelectorAll('main b').length") == 0
    cells = browser.evaluate(
        "Array.from(document.querySelectorAll('#summary-0 td')).map(td => td.textContent)"
    )
    assert NASTY in cells
    assert browser.evaluate("document.querySelector('h2').textContent").endswith(
        "/pump<i>&amp;.csv"
    )


def test_screenshot_shows_the_summary_table(browser, page, tmp_path):
    path, _ = page
    assert browser.load(path, width=1200, height=900) == []
    box = browser.evaluate(
        "(() => { const r = document.querySelector('#summary-0').getBoundingClientRect();"
        " return [r.left, r.top, r.right, r.bottom]; })()"
    )
    left, top, right, bottom = box
    assert 0 <= left < right <= 1200 and 0 <= top < bottom <= 900, box
    shot = tmp_path / "report.png"
    browser.screenshot(shot)
    pytest.importorskip("matplotlib")
    import matplotlib.image

    pixels = matplotlib.image.imread(str(shot))
    assert pixels.shape[:2] == (900, 1200)
    region = pixels[int(top) : int(bottom), int(left) : int(right), :3]
    # the table has text and borders: dark pixels and many distinct shades inside its box
    assert (region.mean(axis=2) < 0.3).mean() > 0.01
    assert len({tuple(p) for p in region.reshape(-1, 3)[::7].round(2).tolist()}) > 10

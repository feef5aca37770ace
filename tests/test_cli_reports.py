"""Command line for reports and pictures: formats, --plots, the plot command, bad paths."""

from __future__ import annotations

import os
from pathlib import Path

import pytest
from conftest import SAMPLES, run_cli

from sequencecheck.cli import run
from sequencecheck.reporters import REPORTERS

FAULTY = str(SAMPLES / "cart_faulty_changes.csv")


def _one_line_error(r) -> None:
    assert r.returncode == 2
    assert r.stderr.count("\n") == 1, r.stderr
    assert "Traceback" not in r.stderr


def _run(capsys, *argv: str) -> tuple[int, str, str]:
    """The CLI in this process (faster than a subprocess): status, stdout, stderr."""
    status = run(list(argv))
    out, err = capsys.readouterr()
    return status, out, err


def _error_line(capsys, *argv: str) -> str:
    status, _, err = _run(capsys, *argv)
    assert status == 2
    assert err.count("\n") == 1, err
    return err


def test_unknown_format_lists_the_known_ones():
    r = run_cli("check", FAULTY, "--format", "pdf")
    _one_line_error(r)
    for name in ("text", "json", "junit", "sarif", "html"):
        assert name in REPORTERS
        assert f"'{name}'" in r.stderr


@pytest.mark.parametrize("fmt", ["junit", "sarif", "html"])
def test_output_in_a_missing_folder_exits_2(fmt, tmp_path, capsys):
    err = _error_line(
        capsys, "check", FAULTY, "--format", fmt, "--output", str(tmp_path / "no" / "r.out")
    )
    assert "does not exist" in err


def test_output_in_a_folder_that_is_not_writable_exits_2(tmp_path, capsys, monkeypatch):
    # root may write anywhere, so the permission answer is simulated for this folder
    real_access = os.access
    monkeypatch.setattr(
        os, "access", lambda p, mode: False if str(p) == str(tmp_path) else real_access(p, mode)
    )
    for argv in (
        ["--format", "sarif", "--output", str(tmp_path / "r.sarif")],
        ["--plots", str(tmp_path)],
    ):
        err = _error_line(capsys, "check", FAULTY, *argv)
        assert "not writable" in err


def test_plots_writes_pictures_and_says_what_was_left_out(tmp_path):
    out = tmp_path / "plots"
    r = run_cli("check", FAULTY, "--dead-time", "500ns", "--plots", str(out), "--plots-limit", "0")
    assert r.returncode == 1, r.stderr
    assert "no violations" not in r.stdout
    assert "2 finding(s) without a diagram (--plots-limit 0 per rule)" in r.stderr
    names = sorted(p.name for p in out.iterdir())
    assert names == [
        f"cart_faulty_changes_dead-time-histogram_A_{d}.{ext}"
        for d in ("high-to-low", "low-to-high")
        for ext in ("png", "svg")
    ]


@pytest.mark.parametrize(
    ("args", "expected"),
    [
        (["--plots", "{tmp}/a/b"], "does not exist"),
        (["--plots", "{file}"], "is a file"),
        (["--plots-limit", "-1"], "must not be negative"),
        (["--plots-limit", "many"], "whole number"),
    ],
)
def test_bad_plot_options_exit_2(args, expected, tmp_path, capsys):
    afile = tmp_path / "f.txt"
    afile.write_text("x")
    argv = [a.format(tmp=tmp_path, file=afile) for a in args]
    assert run(["check", FAULTY, "--dead-time", "500ns", *argv]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and expected in err


def test_plot_command_writes_png_and_svg(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    status, out, err = _run(capsys, "plot", FAULTY, "--at", "1.18ms", "--dead-time", "500ns")
    assert status == 0, err
    written = out.split()
    assert written == ["cart_faulty_changes_at_1.180ms.png", "cart_faulty_changes_at_1.180ms.svg"]
    assert (tmp_path / written[0]).read_bytes()[:4] == b"\x89PNG"
    svg = (tmp_path / written[1]).read_text(encoding="utf-8")
    assert "measured 150 ns" in svg and "required 500 ns" in svg
    assert "B low: BL" in svg  # every leg is drawn
    assert "time (µs) from 1.180 ms" in svg


def test_plot_command_single_file_and_errors(tmp_path, capsys):
    out = tmp_path / "overlap.svg"
    status, _, err = _run(
        capsys, "plot", FAULTY, "--at", "3.05075ms", "--window", "2us", "--output", str(out)
    )
    assert status == 0, err
    assert "overlap 100 ns" in out.read_text(encoding="utf-8")
    assert ".png or .svg" in _error_line(
        capsys, "plot", FAULTY, "--at", "1ms", "--output", str(tmp_path / "x.pdf")
    )
    err = _error_line(capsys, "plot", FAULTY, "--at", "9ms")
    assert "outside" in err and "(0 s to 3.999 950 ms)" in err  # the last change row's time
    assert "--window" in _error_line(capsys, "plot", FAULTY, "--at", "1ms", "--window", "0s")
    assert "does not exist" in _error_line(
        capsys, "plot", FAULTY, "--at", "1ms", "--output", str(tmp_path / "no/x.png")
    )
    assert "no/such.csv" in _error_line(capsys, "plot", "no/such.csv", "--at", "1ms")
    assert "--at" in _error_line(capsys, "plot", FAULTY)  # --at is required


def test_plot_is_listed_in_help(capsys):
    status, out, _ = _run(capsys, "--help")
    assert status == 0 and "plot" in out and "check" in out


def test_plot_and_check_do_not_import_matplotlib_without_pictures():
    code = (
        "import sys; from sequencecheck.cli import run;"
        f"run(['check', {FAULTY!r}, '--format', 'sarif', '--output', '-']);"
        "sys.stderr.write(str('matplotlib' in sys.modules))"
    )
    import subprocess
    import sys

    from conftest import ROOT

    env = dict(os.environ, PYTHONPATH=str(ROOT))
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env)
    assert r.stderr.strip().endswith("False"), r.stderr


def test_precommit_hook_definition():
    import re

    yaml = pytest.importorskip("yaml")
    root = Path(__file__).resolve().parent.parent
    hooks = yaml.safe_load((root / ".pre-commit-hooks.yaml").read_text())
    (hook,) = hooks
    assert hook["entry"] == "sequencecheck check"
    assert hook["language"] == "python"
    files = re.compile(hook["files"])
    for name in ("drive/reversal.steps", "a/b.steps", "pwm.steps"):
        assert files.search(name), name
    for name in ("capture.csv", "notes.txt", "steps.py", "cart.bridge"):
        assert not files.search(name), name


def test_without_matplotlib_html_has_tables_and_plots_exits_2(tmp_path, capsys, monkeypatch):
    import builtins

    real_import = builtins.__import__

    def no_matplotlib(name, *args, **kwargs):
        if name == "matplotlib" or name.startswith("matplotlib."):
            raise ImportError(name)
        return real_import(name, *args, **kwargs)

    monkeypatch.setattr(builtins, "__import__", no_matplotlib)
    out = tmp_path / "r.html"
    status, _, err = _run(capsys, "check", FAULTY, "--dead-time", "500ns", "--format", "html",
                          "--output", str(out))  # fmt: skip
    assert status == 1
    assert "matplotlib is not installed" in err
    assert "Diagrams were not drawn" in out.read_text(encoding="utf-8")
    err = _error_line(capsys, "check", FAULTY, "--plots", str(tmp_path / "p"))
    assert "--plots needs matplotlib" in err

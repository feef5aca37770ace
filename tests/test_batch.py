"""Many inputs: process pool, order and isolation of results, exit status, progress."""

from __future__ import annotations

import io
import multiprocessing
import os
import shutil

import pytest
from conftest import SAMPLES, run_cli

import sequencecheck as sc
from sequencecheck.batch import check_many
from sequencecheck.cli._progress import TerminalProgress, progress_display

POLICY = sc.Policy(dead_time=sc.DeadTime.both(sc.parse_duration("500ns")))
VCD = """$timescale 10 ns $end
$scope module pump $end
$var wire 1 ! U_H $end
$var wire 1 " U_L $end
$upscope $end
$enddefinitions $end
#0
0!
1"
#100
0"
#110
1!
#300
"""


@pytest.fixture
def inputs(tmp_path):
    """Clean and faulty CSV captures, a VCD with a dead-time fault, and a broken file."""
    paths = []
    for i, name in enumerate(["cart_clean.csv", "cart_faulty.csv"] * 2):
        p = tmp_path / f"{i}_{name}"
        shutil.copy(SAMPLES / name, p)
        paths.append(str(p))
    vcd = tmp_path / "pump.vcd"
    vcd.write_text(VCD)
    bad = tmp_path / "broken.csv"
    bad.write_text("time,AH,AL\n0,0,1\n1,2,0\n")
    return [*paths, str(vcd), str(bad)]


class Recorder:
    def __init__(self) -> None:
        self.events: list[tuple[str, str, int]] = []

    def start(self, path: str, total_bytes: int) -> None:
        self.events.append(("start", path, total_bytes))

    def advance(self, path: str, done_bytes: int) -> None:
        self.events.append(("advance", path, done_bytes))

    def done(self, path: str) -> None:
        self.events.append(("done", path, 0))


@pytest.mark.parametrize("jobs", [1, 2, 3])
def test_results_in_input_order_and_never_mixed(inputs, jobs):
    report = check_many(inputs, None, POLICY, jobs=jobs, chunk_bytes=1 << 12)
    assert [r.input for r in report.inputs] == inputs
    for r in report.inputs:
        assert all(f.input == r.input for f in r.findings)
    counts = [len(r.violations) for r in report.inputs]
    assert counts == [0, 2, 0, 2, 1, 0]
    assert report.inputs[-1].error is not None and ":3:" in report.inputs[-1].error
    assert report.exit_status() == 2
    one = check_many(inputs, None, POLICY, jobs=1)
    assert [r.findings for r in report.inputs] == [r.findings for r in one.inputs]


def test_api_check_takes_jobs(inputs):
    assert (
        sc.check(inputs[:2], None, POLICY, jobs=2).by_rule()
        == sc.check(inputs[:2], None, POLICY).by_rule()
    )


@pytest.mark.parametrize("jobs", [1, 2])
def test_progress_per_chunk_reaches_file_size(inputs, jobs):
    rec = Recorder()
    check_many([*inputs[:2], inputs[4]], None, POLICY, jobs=jobs, progress=rec, chunk_bytes=1 << 14)
    for path in [*inputs[:2], inputs[4]]:
        mine = [e for e in rec.events if e[1] == path]
        assert mine[0] == ("start", path, os.path.getsize(path))
        assert mine[-1][0] == "done"
        done = [b for kind, _, b in mine if kind == "advance"]
        assert done == sorted(done) and done[-1] == os.path.getsize(path)
        if path.endswith(".csv"):
            assert len(done) >= os.path.getsize(path) // (1 << 14)  # per chunk, not per row


def test_no_progress_when_not_a_terminal_or_quiet():
    class Tty(io.StringIO):
        def isatty(self) -> bool:
            return True

    assert progress_display(3, quiet=False, stream=io.StringIO()).__enter__() is None
    assert progress_display(3, quiet=True, stream=Tty()).__enter__() is None
    shown = progress_display(3, quiet=False, stream=Tty())
    assert isinstance(shown, TerminalProgress)
    with shown as bar:
        bar.start("a.csv", 100)
        bar.advance("a.csv", 50)
        bar.done("a.csv")
        bar.advance("a.csv", 60)  # late news of a finished file is ignored


def test_cli_batch_exit_status_is_the_worst(inputs):
    r = run_cli("check", *inputs[:2], "--dead-time", "500ns", "--jobs", "2")
    assert r.returncode == 1, r.stderr
    assert "per-input summary:" in r.stdout and r.stderr == ""
    r = run_cli("check", *inputs, "--dead-time", "500ns", "--jobs", "2", "--quiet")
    assert r.returncode == 2
    assert r.stderr.strip().splitlines() == [
        f"sequencecheck: error: {inputs[-1]}:3: column 'AH': expected 0 or 1, found 2"
    ]
    assert "2 violation(s)" in r.stdout and "not checked" in r.stdout


def test_cli_rejects_bad_jobs():
    r = run_cli("check", str(SAMPLES / "cart_clean.csv"), "--jobs", "0")
    assert r.returncode == 2
    assert "--jobs" in r.stderr and "Traceback" not in r.stderr


@pytest.mark.skipif(
    "fork" not in multiprocessing.get_all_start_methods(), reason="the stand-in job needs fork"
)
def test_ctrl_c_stops_the_workers(inputs):
    """Workers busy for a minute (a stand-in job that sleeps) end at once on Ctrl-C."""
    import signal
    import subprocess
    import sys
    import time

    from conftest import ROOT

    code = (
        "import time, sequencecheck.batch as b\n"
        "b.check_one = lambda *a, **k: time.sleep(600)\n"
        "from sequencecheck.cli import main\n"
        "main()\n"
    )
    p = subprocess.Popen(
        [sys.executable, "-c", code, "check", *inputs[:4], "--jobs", "2", "--quiet"],
        env=dict(os.environ, PYTHONPATH=str(ROOT)),
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
        text=True,
        start_new_session=True,
    )
    time.sleep(1.5)
    os.killpg(p.pid, signal.SIGINT)  # as a terminal's Ctrl-C: the whole (own) process group
    # the workers would sleep 600 s: ending at all (a hang guard, not a speed check) shows
    # that Ctrl-C stops them instead of waiting for them
    _, err = p.communicate(timeout=120)
    assert p.returncode == 130
    assert err == "sequencecheck: interrupted\n"

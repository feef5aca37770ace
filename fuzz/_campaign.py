"""Bookkeeping shared by the fuzz harnesses: distinct crash kinds, counters, the summary.

Each distinct crash (exception type, message shape, innermost sequencecheck frame) is
kept once under ``out/crashes`` with the input that caused it; ``summary.txt`` is
rewritten every few seconds so a long campaign can be watched. ``run`` is the command
line the harnesses share.
"""

from __future__ import annotations

import argparse
import hashlib
import os
import re
import shutil
import sys
import tempfile
import time
import traceback
from collections import Counter
from collections.abc import Callable
from pathlib import Path


def signature(exc: BaseException) -> str:
    """What makes two crashes the same kind: type, innermost own frame, message shape."""
    frames = [f for f in traceback.extract_tb(exc.__traceback__) if "sequencecheck" in f.filename]
    where = f"{Path(frames[-1].filename).name}:{frames[-1].lineno}" if frames else "?"
    shape = re.sub(r"\d+", "N", re.sub(r"'[^']*'", "'...'", str(exc)))[:80]
    return f"{type(exc).__name__} at {where}: {shape}"


class Campaign:
    """Counters and crash kinds of one fuzz run, written under ``out``."""

    def __init__(self, out: Path) -> None:
        self.out = out
        self.stats: Counter[str] = Counter()
        self.seen: dict[str, int] = {}
        self.started = time.monotonic()
        self._last_summary = 0.0

    def record(self, exc: BaseException, data: bytes) -> None:
        sig = signature(exc)
        self.seen[sig] = self.seen.get(sig, 0) + 1
        if self.seen[sig] == 1:
            crashes = self.out / "crashes"
            crashes.mkdir(parents=True, exist_ok=True)
            name = hashlib.sha1(data).hexdigest()[:12]
            (crashes / f"crash-{name}.bin").write_bytes(data)
            (crashes / f"crash-{name}.txt").write_text(
                sig + "\n\n" + "".join(traceback.format_exception(exc))
            )
            print(f"\n[new crash kind #{len(self.seen)}] {sig}", file=sys.stderr, flush=True)

    def summary_text(self) -> str:
        s = self.stats
        text = (
            f"fuzz summary: {s['inputs']:,} inputs in {time.monotonic() - self.started:.0f} s; "
            f"read {s['read']:,}, input errors {s['input_errors']:,}, "
            f"usage errors {s['usage_errors']:,}; "
        )
        if "slowest_ms" in s:
            text += f"slowest input {s['slowest_ms']:,} ms; "
        lines = [text + f"distinct crash kinds {len(self.seen)}"]
        lines += [
            f"  {n:>8,}  {sig}" for sig, n in sorted(self.seen.items(), key=lambda kv: -kv[1])
        ]
        return "\n".join(lines) + "\n"

    def tick(self) -> None:
        """Rewrite the summary file at most every five seconds."""
        if time.monotonic() - self._last_summary > 5:
            self._last_summary = time.monotonic()
            self.out.mkdir(parents=True, exist_ok=True)
            (self.out / "summary.txt").write_text(self.summary_text())


def run(
    campaign: Campaign,
    description: str,
    *,
    minutes: float,
    out: Path,
    scratch_prefix: str,
    max_len: int,
    prepare: Callable[[str], None],
    test_one_input: Callable[[bytes], None],
    instrument: Callable[[], None],
    seed: Callable[[Path], None],
) -> None:
    """The command line every harness shares: ``--minutes``, ``--out``, ``--replay DIR``
    (run each ``*.bin`` once and stop) and libFuzzer arguments after ``--``.

    ``prepare`` gets a fresh scratch folder (in /dev/shm where there is one), removed at
    the end; ``instrument`` imports the code to cover inside atheris' instrumentation;
    ``seed`` writes the starting corpus into the folder it is given.
    """
    parser = argparse.ArgumentParser(description=description)
    parser.add_argument("--minutes", type=float, default=minutes, help="campaign length")
    parser.add_argument("--out", default=str(out), help="crashes, corpus and summary")
    parser.add_argument("--replay", metavar="DIR", help="run each *.bin in DIR once and stop")
    args, extra = parser.parse_known_args()
    campaign.out = Path(args.out)
    scratch = tempfile.mkdtemp(
        prefix=scratch_prefix, dir="/dev/shm" if os.path.isdir("/dev/shm") else None
    )
    prepare(scratch)
    campaign.started = time.monotonic()
    try:
        if args.replay:
            for p in sorted(Path(args.replay).glob("*.bin")):
                test_one_input(p.read_bytes())
            return
        import atheris

        with atheris.instrument_imports():
            instrument()
        corpus = campaign.out / "corpus"
        corpus.mkdir(parents=True, exist_ok=True)
        seed(corpus)
        libfuzzer = [
            sys.argv[0],
            f"-max_total_time={int(args.minutes * 60)}",
            f"-max_len={max_len}",
            "-timeout=20",
            "-rss_limit_mb=4096",
            *[a for a in extra if a != "--"],
            str(corpus),
        ]
        atheris.Setup(libfuzzer, test_one_input)
        atheris.Fuzz()  # libFuzzer ends the process itself when time is up
    finally:
        print(campaign.summary_text(), file=sys.stderr)
        shutil.rmtree(scratch, ignore_errors=True)

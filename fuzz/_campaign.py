"""Bookkeeping shared by the fuzz harnesses: distinct crash kinds, counters, the summary.

Each distinct crash (exception type, message shape, innermost sequencecheck frame) is
kept once under ``out/crashes`` with the input that caused it; ``summary.txt`` is
rewritten every few seconds so a long campaign can be watched.
"""

from __future__ import annotations

import hashlib
import re
import sys
import time
import traceback
from collections import Counter
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

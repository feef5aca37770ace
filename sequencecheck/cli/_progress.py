"""Progress on stderr while inputs are read: a bar per file being read (bytes, rate,
time left) and one for the whole batch. Only on a terminal, never with ``--quiet``;
rich is imported only when a display is shown, and redrawn at most ten times a second
from the calling thread (updates arrive per chunk, never per row)."""

from __future__ import annotations

import os
import sys
import time
from types import TracebackType
from typing import Any

__all__ = ["TerminalProgress", "progress_display"]

_REDRAW_S = 0.1


class TerminalProgress:
    """A :class:`sequencecheck.batch.ProgressSink` drawing rich progress bars on stderr."""

    def __init__(self, n_inputs: int, stream: Any = None) -> None:
        from rich.console import Console
        from rich.progress import (
            BarColumn,
            DownloadColumn,
            Progress,
            TextColumn,
            TimeRemainingColumn,
            TransferSpeedColumn,
        )

        self._progress = Progress(
            TextColumn("{task.description}", justify="left"),
            BarColumn(),
            DownloadColumn(),
            TransferSpeedColumn(),
            TimeRemainingColumn(),
            console=Console(stderr=True) if stream is None else Console(file=stream),
            auto_refresh=False,
            transient=True,
        )
        # the batch bar counts bytes of all inputs, so its rate and time left mean something
        self._overall = self._progress.add_task(f"0/{n_inputs} inputs", total=0)
        self._n = n_inputs
        self._finished = 0
        self._total = 0
        self._sizes: dict[str, int] = {}
        self._read: dict[str, int] = {}
        self._read_before = 0  # bytes of inputs already finished
        self._tasks: dict[str, Any] = {}
        self._last = 0.0

    def __enter__(self) -> TerminalProgress:
        self._progress.start()
        return self

    def __exit__(
        self, kind: type[BaseException] | None, exc: BaseException | None, tb: TracebackType | None
    ) -> None:
        self._progress.stop()

    def _redraw(self, force: bool = False) -> None:
        now = time.monotonic()
        if force or now - self._last >= _REDRAW_S:
            self._last = now
            self._progress.refresh()

    def start(self, path: str, total_bytes: int) -> None:
        self._sizes[path] = total_bytes
        self._total += total_bytes
        self._progress.update(self._overall, total=self._total)

    def advance(self, path: str, done_bytes: int) -> None:
        if path not in self._sizes:
            return  # already finished
        task = self._tasks.get(path)
        if task is None:
            name = os.path.basename(path)
            task = self._progress.add_task(name[-40:], total=self._sizes[path] or None)
            self._tasks[path] = task
        self._progress.update(task, completed=done_bytes)
        self._read[path] = done_bytes
        self._progress.update(self._overall, completed=self._read_before + sum(self._read.values()))
        self._redraw()

    def done(self, path: str) -> None:
        self._read_before += self._sizes.pop(path, 0)
        self._read.pop(path, None)
        task = self._tasks.pop(path, None)
        if task is not None:
            self._progress.remove_task(task)
        self._finished += 1
        self._progress.update(
            self._overall,
            completed=self._read_before + sum(self._read.values()),
            description=f"{self._finished}/{self._n} inputs",
        )
        self._redraw(force=True)


class _Nothing:
    def __enter__(self) -> None:
        return None

    def __exit__(self, *exc: object) -> None:
        return None


def progress_display(n_inputs: int, *, quiet: bool, stream: Any = None) -> Any:
    """A context manager giving a TerminalProgress, or None when nothing should be shown."""
    stream = sys.stderr if stream is None else stream
    if quiet or not getattr(stream, "isatty", lambda: False)() or os.environ.get("TERM") == "dumb":
        return _Nothing()
    try:
        return TerminalProgress(n_inputs, None if stream is sys.stderr else stream)
    except ImportError:  # rich missing: checking matters more than the bars
        return _Nothing()

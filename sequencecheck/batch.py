"""Many inputs at once: the same per-file job, in this process or across a process pool.

The unit of work is ``check_file(path, bridge, policy, **read_options)``, a pure
function: each input is read and checked on its own, results come back whole and
are put in input order, so findings of one file never mix into another's. An
input that cannot be read becomes an InputReport with ``error`` set and the
others are still checked.
"""

from __future__ import annotations

import inspect
import os
import signal
from collections.abc import Callable, Sequence
from typing import Any, Protocol

from .api import check_file
from .errors import InputError
from .findings import InputReport, Report
from .model import Bridge, Policy
from .readers import READERS, read_csv

__all__ = ["ProgressSink", "check_many", "check_one", "default_jobs"]


class ProgressSink(Protocol):
    """Receives progress: ``start`` once per input, ``advance`` per chunk, ``done`` at the end."""

    def start(self, path: str, total_bytes: int) -> None: ...
    def advance(self, path: str, done_bytes: int) -> None: ...
    def done(self, path: str) -> None: ...


def default_jobs() -> int:
    """Worker processes by default: the cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # not on every platform
        return max(1, os.cpu_count() or 1)


def _reader_takes(path: str, option: str) -> bool:
    reader = READERS.get(os.path.splitext(path)[1].lower(), read_csv)
    try:
        return option in inspect.signature(reader).parameters
    except (TypeError, ValueError):
        return False


def check_one(
    path: str,
    bridge: Bridge | None,
    policy: Policy | None,
    read_options: dict[str, Any],
    progress: Callable[[int], None] | None = None,
) -> InputReport:
    """Check one input; an unreadable one becomes an InputReport with ``error`` set."""
    options = dict(read_options)
    if progress is not None and _reader_takes(path, "progress"):
        options["progress"] = progress
    if "chunk_bytes" in options and not _reader_takes(path, "chunk_bytes"):
        del options["chunk_bytes"]
    try:
        return check_file(path, bridge, policy, **options)
    except InputError as e:
        return InputReport(input=os.fspath(path), error=str(e))


# -- worker side of the process pool ---------------------------------------------------------
_QUEUE: Any = None


def _init_worker(queue: Any) -> None:
    global _QUEUE
    _QUEUE = queue
    signal.signal(signal.SIGINT, signal.SIG_IGN)  # Ctrl-C is the parent's to handle


def _job(path: str, bridge: Bridge | None, policy: Policy | None, options: dict) -> InputReport:
    queue = _QUEUE
    progress = None if queue is None else (lambda done: queue.put((path, done)))
    try:
        return check_one(path, bridge, policy, options, progress)
    finally:
        if queue is not None:
            queue.put((path, None))  # this input is finished: after all of its progress


def _size(path: str) -> int:
    try:
        return os.path.getsize(path)
    except OSError:
        return 0


def check_many(
    paths: Sequence[str],
    bridge: Bridge | None = None,
    policy: Policy | None = None,
    *,
    jobs: int | None = None,
    progress: ProgressSink | None = None,
    **read_options: Any,
) -> Report:
    """Check every input with up to ``jobs`` worker processes (default: one per core).

    Reports come back in the order of ``paths`` whatever order the workers finish in.
    """
    paths = [os.fspath(p) for p in paths]
    jobs = default_jobs() if jobs is None else jobs
    if jobs < 1:
        raise ValueError("jobs must be at least 1")
    jobs = min(jobs, len(paths))
    if jobs <= 1:
        results = []
        for p in paths:
            if progress is not None:
                progress.start(p, _size(p))
            sink = None if progress is None else (lambda done, p=p: progress.advance(p, done))
            results.append(check_one(p, bridge, policy, read_options, sink))
            if progress is not None:
                progress.done(p)
        return Report(tuple(results))
    return Report(tuple(_pool(paths, bridge, policy, jobs, progress, read_options)))


def _pool(
    paths: list[str],
    bridge: Bridge | None,
    policy: Policy | None,
    jobs: int,
    progress: ProgressSink | None,
    read_options: dict[str, Any],
) -> list[InputReport]:
    import multiprocessing as mp
    from concurrent.futures import FIRST_COMPLETED, Future, ProcessPoolExecutor, wait

    # fork starts workers in milliseconds; workers are started before any other thread
    ctx = mp.get_context("fork") if "fork" in mp.get_all_start_methods() else mp.get_context()
    # progress and an end-of-input mark travel on one queue, so "done" follows the last
    # "advance" of an input whatever order the result and the messages arrive in
    queue = ctx.SimpleQueue() if progress is not None else None
    unfinished = set(paths) if progress is not None else set()
    results: list[InputReport | None] = [None] * len(paths)
    with ProcessPoolExecutor(
        jobs, mp_context=ctx, initializer=_init_worker, initargs=(queue,)
    ) as pool:
        futures: dict[Future[InputReport], int] = {}
        sizes = [_size(p) for p in paths]
        for i in sorted(range(len(paths)), key=lambda i: -sizes[i]):  # biggest first
            futures[pool.submit(_job, paths[i], bridge, policy, read_options)] = i
            if progress is not None:
                progress.start(paths[i], sizes[i])
        pending = set(futures)
        try:
            while pending:
                finished, pending = wait(pending, timeout=0.1, return_when=FIRST_COMPLETED)
                _drain(queue, progress, unfinished, block=False)
                for f in finished:
                    results[futures[f]] = f.result()
            _drain(queue, progress, unfinished, block=True)  # the last marks still on the way
        except BaseException:  # Ctrl-C or a bug: stop the workers, start nothing more
            workers = list((getattr(pool, "_processes", None) or {}).values())
            pool.shutdown(wait=False, cancel_futures=True)
            if hasattr(signal, "SIGPIPE"):  # pipes to stopped workers break as we leave
                signal.signal(signal.SIGPIPE, signal.SIG_IGN)
            for process in workers:
                process.terminate()  # a worker may be deep in a multi-gigabyte file
            raise
    return [r for r in results if r is not None]


def _drain(queue: Any, progress: ProgressSink | None, unfinished: set[str], *, block: bool) -> None:
    """Pass progress on; with ``block``, wait until every input has sent its end mark."""
    if queue is None or progress is None:
        return
    while unfinished and (block or not queue.empty()):
        path, done = queue.get()
        if done is None:
            unfinished.discard(path)
            progress.done(path)
        else:
            progress.advance(path, done)

"""On-intervals of switches, and their intersections, as int64 arrays."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..model import Channel

__all__ = ["Intervals", "intersect", "on_intervals"]

_NO_LINES = np.empty(0, dtype=np.int64)


@dataclass(frozen=True, slots=True)
class Intervals:
    """Disjoint, sorted half-open intervals ``[starts[i], ends[i])`` in picoseconds.

    ``clipped_start`` says the first interval began before the observed window
    (its start is the window start, not an edge); ``clipped_end`` that the last
    one was still running when the window ended. ``start_lines``/``end_lines``
    give the input line of each edge (0 where unknown or clipped).
    """

    starts: np.ndarray
    ends: np.ndarray
    clipped_start: bool
    clipped_end: bool
    start_lines: np.ndarray
    end_lines: np.ndarray

    def __len__(self) -> int:
        return int(self.starts.size)

    def edge_starts(self) -> tuple[np.ndarray, np.ndarray]:
        """Indices and times of starts that are real turn-on edges."""
        first = 1 if self.clipped_start else 0
        idx = np.arange(first, self.starts.size)
        return idx, self.starts[first:]

    def edge_ends(self) -> tuple[np.ndarray, np.ndarray]:
        """Indices and times of ends that are real turn-off edges."""
        stop = self.ends.size - 1 if self.clipped_end else self.ends.size
        return np.arange(stop), self.ends[:stop]


def on_intervals(ch: Channel, on_level: int, start_ps: int, end_ps: int) -> Intervals:
    """Where ``ch`` holds ``on_level`` inside ``[start_ps, end_ps]``.

    Undefined levels (X, Z) count as not on; the unknown-state rule reports them.
    """
    on = np.empty(ch.levels.size + 1, dtype=bool)
    on[0] = ch.initial == on_level
    np.equal(ch.levels, on_level, out=on[1:])
    rise = np.flatnonzero(~on[:-1] & on[1:])
    fall = np.flatnonzero(on[:-1] & ~on[1:])
    lines = ch.lines if ch.lines is not None else np.zeros(ch.levels.size, dtype=np.int64)
    starts, ends = ch.times[rise], ch.times[fall]
    start_lines, end_lines = lines[rise], lines[fall]
    clipped_start, clipped_end = bool(on[0]), bool(on[-1])
    if clipped_start:
        starts = np.concatenate(([start_ps], starts)).astype(np.int64, copy=False)
        start_lines = np.concatenate(([0], start_lines)).astype(np.int64, copy=False)
    if clipped_end:
        ends = np.concatenate((ends, [end_ps])).astype(np.int64, copy=False)
        end_lines = np.concatenate((end_lines, [0])).astype(np.int64, copy=False)
    return Intervals(starts, ends, clipped_start, clipped_end, start_lines, end_lines)


def intersect(a: Intervals, b: Intervals) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Overlaps of positive length between two interval sets.

    Returns ``(starts, ends, ia, ib)``: each overlap and the indices of the
    intervals of ``a`` and ``b`` that form it, in time order. O((n + m) log m).
    """
    if len(a) == 0 or len(b) == 0:
        empty = np.empty(0, dtype=np.int64)
        return empty, empty, empty, empty
    first = np.searchsorted(b.ends, a.starts, side="right")  # first b ending after a starts
    last = np.searchsorted(b.starts, a.ends, side="left")  # b starting before a ends
    counts = np.maximum(last - first, 0)
    ia = np.repeat(np.arange(len(a)), counts)
    offsets = np.arange(counts.sum()) - np.repeat(np.cumsum(counts) - counts, counts)
    ib = np.repeat(first, counts) + offsets
    starts = np.maximum(a.starts[ia], b.starts[ib])
    ends = np.minimum(a.ends[ia], b.ends[ib])
    keep = ends > starts
    return starts[keep], ends[keep], ia[keep], ib[keep]

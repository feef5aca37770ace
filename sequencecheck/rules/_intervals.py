"""On-intervals of switches, and their intersections, as int64 arrays."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from ..model import Channel

__all__ = ["EdgeLines", "Intervals", "intersect", "on_intervals", "rank_in"]


Pick = Callable[[np.ndarray, bool], np.ndarray]


class EdgeLines:
    """Input lines of the edges of some intervals, worked out when asked: most checks
    report a handful of findings, so the lines of a million edges are rarely needed.

    ``make`` gives every line (start lines, end lines); ``pick``, if given, the lines
    of some intervals only (their indices, and True for starts, False for ends).
    """

    __slots__ = ("_make", "_pick", "_value")

    def __init__(self, make: Callable[[], tuple[np.ndarray, np.ndarray]], pick: Pick | None = None):
        self._make = make
        self._pick = pick
        self._value: tuple[np.ndarray, np.ndarray] | None = None

    def get(self) -> tuple[np.ndarray, np.ndarray]:
        """(start lines, end lines) of every interval."""
        if self._value is None:
            self._value = self._make()
        return self._value

    def at(self, idx: np.ndarray, starts: bool) -> np.ndarray:
        """Lines of the starts (or ends) of intervals ``idx``."""
        if self._value is None and self._pick is not None:
            return self._pick(np.asarray(idx, dtype=np.int64), starts)
        return self.get()[0 if starts else 1][idx]


@dataclass(frozen=True, slots=True)
class Intervals:
    """Disjoint, sorted half-open intervals ``[starts[i], ends[i])`` in picoseconds.

    ``clipped_start`` says the first interval began before the observed window
    (its start is the window start, not an edge); ``clipped_end`` that the last
    one was still running when the window ended. ``start_lines``/``end_lines``
    give the input line of each edge (0 where unknown or clipped), from ``lines``.
    """

    starts: np.ndarray
    ends: np.ndarray
    clipped_start: bool
    clipped_end: bool
    lines: EdgeLines

    def __len__(self) -> int:
        return int(self.starts.size)

    @property
    def start_lines(self) -> np.ndarray:
        return self.lines.get()[0]

    @property
    def end_lines(self) -> np.ndarray:
        return self.lines.get()[1]

    def start_lines_at(self, idx: np.ndarray) -> np.ndarray:
        """Input lines of the starts of intervals ``idx`` (0 where clipped)."""
        return self.lines.at(idx, True)

    def end_lines_at(self, idx: np.ndarray) -> np.ndarray:
        """Input lines of the ends of intervals ``idx`` (0 where clipped)."""
        return self.lines.at(idx, False)

    def edge_starts(self) -> tuple[np.ndarray, np.ndarray]:
        """Indices and times of starts that are real turn-on edges."""
        first = 1 if self.clipped_start else 0
        idx = np.arange(first, self.starts.size)
        return idx, self.starts[first:]

    def edge_ends(self) -> tuple[np.ndarray, np.ndarray]:
        """Indices and times of ends that are real turn-off edges."""
        stop = self.ends.size - 1 if self.clipped_end else self.ends.size
        return np.arange(stop), self.ends[:stop]


def _switched_on(ch: Channel, on_level: int) -> np.ndarray:
    """Whether the switch is on at the start, then after each edge."""
    on = np.empty(ch.levels.size + 1, dtype=bool)
    on[0] = ch.initial == on_level
    np.equal(ch.levels, on_level, out=on[1:])
    return on


def _rises_and_falls(on: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Indices of the edges that turn the switch on, and of those that turn it off."""
    return np.flatnonzero(~on[:-1] & on[1:]), np.flatnonzero(on[:-1] & ~on[1:])


def _interval_lines(ch: Channel, on_level: int) -> tuple[np.ndarray, np.ndarray]:
    on = _switched_on(ch, on_level)
    rise, fall = _rises_and_falls(on)
    lines = ch.lines if ch.lines is not None else np.zeros(ch.levels.size, dtype=np.int64)
    start_lines, end_lines = lines[rise].astype(np.int64), lines[fall].astype(np.int64)
    if on[0]:
        start_lines = np.concatenate(([0], start_lines))
    if on[-1]:
        end_lines = np.concatenate((end_lines, [0]))
    return start_lines, end_lines


def _edge_times(ch: Channel, on: np.ndarray, on_level: int) -> tuple[np.ndarray, np.ndarray]:
    """Times of the turn-on and of the turn-off edges.

    Edges always change the level, so a channel with only 0/1 levels alternates between
    on and off from its first edge: every other edge turns the switch on, and both lists
    are read-only strided views of the channel's times (no copy). Otherwise, with X or Z
    levels, the edges are picked one by one.
    """
    times, levels = ch.times, ch.levels
    if levels.size and int(levels.max()) <= 1 and int(levels.min()) >= 0:
        first_on = 0 if levels[0] == on_level else 1
        first_off = 1 - first_on
        if first_off == 0 and not on[0]:  # off to off at the first edge: X before it
            first_off = 2
        starts, ends = times[first_on::2], times[first_off::2]
        starts.flags.writeable = ends.flags.writeable = False
        return starts, ends
    rise, fall = _rises_and_falls(on)
    return times[rise], times[fall]


def on_intervals(ch: Channel, on_level: int, start_ps: int, end_ps: int) -> Intervals:
    """Where ``ch`` holds ``on_level`` inside ``[start_ps, end_ps]``.

    Undefined levels (X, Z) count as not on; the unknown-state rule reports them.
    """
    on = _switched_on(ch, on_level)
    clipped_start, clipped_end = bool(on[0]), bool(on[-1])
    starts, ends = _edge_times(ch, on, on_level)
    if clipped_start:
        starts = np.concatenate(([start_ps], starts)).astype(np.int64, copy=False)
    if clipped_end:
        ends = np.concatenate((ends, [end_ps])).astype(np.int64, copy=False)

    def pick(idx: np.ndarray, of_starts: bool) -> np.ndarray:
        """Each interval's edge is the channel's edge at that time (times are strictly
        increasing); the clipped first start and last end are no edge (line 0)."""
        at = (starts if of_starts else ends)[idx]
        if ch.lines is None or ch.times.size == 0:
            return np.zeros(idx.size, dtype=np.int64)
        edge = np.minimum(np.searchsorted(ch.times, at), ch.times.size - 1)
        found = ch.lines[edge].astype(np.int64)
        clipped = (idx == 0) if of_starts and clipped_start else None
        if not of_starts and clipped_end:
            clipped = idx == ends.size - 1
        if clipped is not None:
            found[clipped] = 0
        return found

    lines = EdgeLines(lambda: _interval_lines(ch, on_level), pick)
    return Intervals(starts, ends, clipped_start, clipped_end, lines)


def rank_in(a: Intervals, b: Intervals) -> np.ndarray:
    """For each start of ``a``, how many starts of ``b`` are at or before it."""
    return np.searchsorted(b.starts, a.starts, side="right")


def _ends_up_to(b: Intervals, t: np.ndarray, rank: np.ndarray) -> np.ndarray:
    """How many ends of ``b`` are at or before each time ``t``, given ``rank``: how many
    starts of ``b`` are. Intervals are sorted and disjoint (s0 <= e0 <= s1 <= e1 ...), so
    every interval before the last one started has ended; only that one needs a look."""
    last = np.maximum(rank - 1, 0)
    return last + ((rank > 0) & (b.ends[last] <= t))


def intersect(
    a: Intervals,
    b: Intervals,
    a_in_b: np.ndarray | None = None,
    b_in_a: np.ndarray | None = None,
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Overlaps of positive length between two interval sets.

    Returns ``(starts, ends, ia, ib)``: each overlap and the indices of the
    intervals of ``a`` and ``b`` that form it, in time order. ``a_in_b`` and
    ``b_in_a`` are ``rank_in(a, b)`` and ``rank_in(b, a)`` when the caller has them
    already; the rest is linear. O((n + m) log(n + m)).
    """
    if len(a) == 0 or len(b) == 0:
        empty = np.empty(0, dtype=np.int64)
        return empty, empty, empty, empty
    a_in_b = rank_in(a, b) if a_in_b is None else a_in_b
    b_in_a = rank_in(b, a) if b_in_a is None else b_in_a
    first = _ends_up_to(b, a.starts, a_in_b)  # first b ending after a starts
    # b starting before a ends: b's start j comes before a's end i exactly when fewer
    # than i + 1 ends of a are at or before it
    ends_before = _ends_up_to(a, b.starts, b_in_a)
    last = np.cumsum(np.bincount(ends_before, minlength=len(a) + 1)[: len(a)])
    counts = np.maximum(last - first, 0)
    ia = np.repeat(np.arange(len(a)), counts)
    offsets = np.arange(counts.sum()) - np.repeat(np.cumsum(counts) - counts, counts)
    ib = np.repeat(first, counts) + offsets
    starts = np.maximum(a.starts[ia], b.starts[ib])
    ends = np.minimum(a.ends[ia], b.ends[ib])
    keep = ends > starts
    return starts[keep], ends[keep], ia[keep], ib[keep]

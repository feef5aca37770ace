"""A capture or table as per-channel edge lists in exact picoseconds."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from enum import IntEnum

import numpy as np

__all__ = ["Channel", "Level", "Trace", "normalize_edges"]


class Level(IntEnum):
    """Logic level of a channel; X and Z are undefined (carried by VCD inputs)."""

    LOW = 0
    HIGH = 1
    X = 2
    Z = 3


def normalize_edges(
    initial: int,
    times: np.ndarray,
    levels: np.ndarray,
    lines: np.ndarray | None = None,
) -> tuple[np.ndarray, np.ndarray, np.ndarray | None]:
    """Make an edge list strictly increasing in time, with real level changes only.

    ``times`` must be non-decreasing. Of several changes at one instant the last
    wins (each row's values hold until the next row's time, so a row followed by
    one at the same time lasts zero picoseconds); a change to the level already
    held is dropped.
    """
    times = np.asarray(times, dtype=np.int64)
    levels = np.asarray(levels, dtype=np.int8)
    if times.size == 0:
        return times, levels, lines
    last_of_instant = np.ones(times.size, dtype=bool)
    last_of_instant[:-1] = times[1:] != times[:-1]
    if not last_of_instant.all():
        times, levels = times[last_of_instant], levels[last_of_instant]
        lines = None if lines is None else lines[last_of_instant]
    before = np.empty_like(levels)
    before[0] = initial
    before[1:] = levels[:-1]
    changed = levels != before
    if not changed.all():
        # one pass suffices: a dropped repeat's successor now follows an equal level
        times, levels = times[changed], levels[changed]
        lines = None if lines is None else lines[changed]
    return times, levels, lines


@dataclass(frozen=True, slots=True)
class Channel:
    """One channel's edges: the level after each edge, and the level at the start.

    ``times`` is a strictly increasing int64 array of picoseconds, ``levels`` the
    int8 :class:`Level` after each edge, ``lines`` the 1-based input line (or CSV
    row line) of each edge, when the input has lines.
    """

    name: str
    initial: int
    times: np.ndarray
    levels: np.ndarray
    lines: np.ndarray | None = None

    @classmethod
    def from_changes(
        cls,
        name: str,
        initial: int,
        times: np.ndarray,
        levels: np.ndarray,
        lines: np.ndarray | None = None,
        *,
        start_ps: int | None = None,
    ) -> Channel:
        """Build a channel from raw, possibly redundant changes (see normalize_edges).

        Changes at or before ``start_ps`` (rows at the window's first instant) fold
        into the initial level instead of becoming edges.
        """
        times = np.asarray(times, dtype=np.int64)
        levels = np.asarray(levels, dtype=np.int8)
        if start_ps is not None and times.size and times[0] <= start_ps:
            n = int(np.searchsorted(times, start_ps, side="right"))
            initial = int(levels[n - 1])
            times, levels = times[n:], levels[n:]
            lines = None if lines is None else lines[n:]
        t, v, ln = normalize_edges(initial, times, levels, lines)
        return cls(name, int(initial), t, v, ln)

    @property
    def edge_count(self) -> int:
        return int(self.times.size)

    def level_at(self, t_ps: int) -> int:
        """Level in force at ``t_ps`` (an edge at ``t_ps`` has already happened)."""
        i = int(np.searchsorted(self.times, t_ps, side="right"))
        return self.initial if i == 0 else int(self.levels[i - 1])

    def line_of_edge_at(self, t_ps: int) -> int | None:
        """Input line of the edge exactly at ``t_ps``, if there is one."""
        if self.lines is None:
            return None
        i = int(np.searchsorted(self.times, t_ps, side="left"))
        if i < self.times.size and self.times[i] == t_ps:
            return int(self.lines[i])
        return None


@dataclass(frozen=True, slots=True)
class Trace:
    """Every channel of one input over the observed window ``[start_ps, end_ps)``.

    ``sample_period_ps`` is set when the input was sampled (each edge then lies
    up to one period before its stamp); ``rows`` counts the input rows, lines or
    value changes read, so reports can say how much was checked.
    """

    channels: Mapping[str, Channel]
    start_ps: int
    end_ps: int
    path: str = "<memory>"
    sample_period_ps: int | None = None
    rows: int = 0
    kind: str = "memory"
    meta: Mapping[str, object] = field(default_factory=dict)

    def channel(self, name: str) -> Channel:
        return self.channels[name]

    @property
    def edge_count(self) -> int:
        return sum(ch.edge_count for ch in self.channels.values())

"""Brute-force references: walk every sample (row) in pure Python.

These share no code with sequencecheck's vectorised rules: they read rows of
(time_ps, {channel: level}) and apply the definitions literally, one row at a time.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Overlap:
    start: int
    end: int


@dataclass(frozen=True)
class Handover:
    off: int  # complement turn-off
    on: int  # switch turn-on
    direction: str


def collapse(rows: list[tuple[int, dict[str, int]]]) -> list[tuple[int, dict[str, int]]]:
    """Rows at the same time last zero picoseconds: keep the last of each instant."""
    out: list[tuple[int, dict[str, int]]] = []
    for t, values in rows:
        if out and out[-1][0] == t:
            out[-1] = (t, values)
        else:
            out.append((t, values))
    return out


def walk(
    rows: list[tuple[int, dict[str, int]]],
    high: str,
    low: str,
    end: int,
    active_low: frozenset[str] = frozenset(),
) -> tuple[list[Overlap], list[Handover]]:
    """Overlaps (both on) and complementary hand-overs of one leg, row by row."""
    rows = collapse(rows)

    def is_on(values: dict[str, int], ch: str) -> bool:
        return values[ch] == (0 if ch in active_low else 1)

    overlaps: list[Overlap] = []
    handovers: list[Handover] = []
    both_since: int | None = None
    last_off = {high: None, low: None}  # time of each switch's latest turn-off edge
    prev: dict[str, int] | None = None
    for t, values in rows:
        h, lo = is_on(values, high), is_on(values, low)
        if h and lo and both_since is None:
            both_since = t
        if not (h and lo) and both_since is not None:
            if t > both_since:
                overlaps.append(Overlap(both_since, t))
            both_since = None
        if prev is not None:
            # a turn-off in this row happens at this instant, before any turn-on that follows
            for ch in (high, low):
                if is_on(prev, ch) and not is_on(values, ch):
                    last_off[ch] = t
            for me, other, direction in ((low, high, "high-to-low"), (high, low, "low-to-high")):
                was, now = is_on(prev, me), is_on(values, me)
                if not was and now and not is_on(values, other):
                    off = last_off[other]
                    mine = last_off[me]
                    if off is not None and (mine is None or off >= mine):
                        handovers.append(Handover(off, t, direction))
        prev = values
    if both_since is not None and end > both_since:
        overlaps.append(Overlap(both_since, end))
    return overlaps, handovers

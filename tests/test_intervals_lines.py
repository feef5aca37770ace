"""On-intervals (times, and input lines looked up for a few or for all) against a walk
over the edges in plain Python (edges at the window's ends, X and Z levels included)."""

from __future__ import annotations

import numpy as np
from hypothesis import given
from hypothesis import strategies as st

from sequencecheck.model import Channel, Level
from sequencecheck.rules._intervals import EdgeLines, Intervals, intersect, on_intervals, rank_in

LEVELS = [0, 1, 0, 1, int(Level.X), int(Level.Z)]


@st.composite
def channels(draw):
    n = draw(st.integers(0, 12))
    times = sorted(draw(st.lists(st.integers(0, 40), min_size=n, max_size=n, unique=True)))
    levels = draw(st.lists(st.sampled_from(LEVELS), min_size=n, max_size=n))
    lines = [100 + 3 * k for k in range(n)]
    initial = draw(st.sampled_from(LEVELS))
    with_lines = draw(st.booleans())
    ch = Channel.from_changes(
        "HA",
        initial,
        np.array(times, dtype=np.int64),
        np.array(levels),
        np.array(lines, dtype=np.int64) if with_lines else None,
    )
    end = max(times, default=0) + draw(st.integers(0, 3))  # an edge may sit on the end
    return ch, draw(st.sampled_from([0, 1])), end


def _walk(ch: Channel, on_level: int, end: int) -> tuple[list, list]:
    """(time, line) of each interval's start and end, walking the edges one by one."""
    starts, ends = [], []
    on = ch.initial == on_level
    if on:
        starts.append((0, 0))  # clipped: the window's start, no edge
    lines = ch.lines.tolist() if ch.lines is not None else [0] * ch.times.size
    for t, level, line in zip(ch.times.tolist(), ch.levels.tolist(), lines, strict=True):
        now = level == on_level
        if now and not on:
            starts.append((t, line))
        elif on and not now:
            ends.append((t, line))
        on = now
    if on:
        ends.append((end, 0))
    return starts, ends


@given(channels(), st.data())
def test_picked_lines_match_the_walk(case, data):
    ch, on_level, end = case
    iv = on_intervals(ch, on_level, 0, end)
    walked_starts, walked_ends = _walk(ch, on_level, end)
    assert iv.starts.tolist() == [t for t, _ in walked_starts]
    assert iv.ends.tolist() == [t for t, _ in walked_ends]
    want_starts, want_ends = [ln for _, ln in walked_starts], [ln for _, ln in walked_ends]
    if len(iv) == 0:
        return
    idx = np.array(data.draw(st.lists(st.integers(0, len(iv) - 1), max_size=6)), dtype=np.int64)
    assert iv.start_lines_at(idx).tolist() == [want_starts[i] for i in idx]  # picked
    assert iv.end_lines_at(idx).tolist() == [want_ends[i] for i in idx]
    assert iv.start_lines.tolist() == want_starts  # every line at once
    assert iv.end_lines.tolist() == want_ends


@st.composite
def interval_sets(draw):
    """Sorted, disjoint intervals; zero-length ones only at the window's ends, as a
    clipped first or last interval can be."""
    cuts = sorted(draw(st.lists(st.integers(0, 60), max_size=14, unique=True)))
    cuts = cuts[: len(cuts) // 2 * 2]
    starts, ends = cuts[0::2], cuts[1::2]
    if draw(st.booleans()):
        starts, ends = [0, *starts], [0, *ends]  # zero length at the window start
    if draw(st.booleans()):
        starts, ends = [*starts, 61], [*ends, 61]  # zero length at the window end
    if starts and starts[0] == 0 and len(starts) > 1 and starts[1] == 0:
        starts, ends = starts[1:], ends[1:]
    arr = np.array(starts, dtype=np.int64), np.array(ends, dtype=np.int64)
    return Intervals(*arr, False, False, EdgeLines(lambda: (arr[0] * 0, arr[1] * 0)))


@given(interval_sets(), interval_sets(), st.booleans())
def test_intersect_matches_every_pair(a, b, give_ranks):
    """Every pair of intervals compared (O(n m)) against the linear intersect."""
    want = [
        (max(sa, sb), min(ea, eb), i, j)
        for i, (sa, ea) in enumerate(zip(a.starts.tolist(), a.ends.tolist(), strict=True))
        for j, (sb, eb) in enumerate(zip(b.starts.tolist(), b.ends.tolist(), strict=True))
        if min(ea, eb) > max(sa, sb)
    ]
    ranks = (rank_in(a, b), rank_in(b, a)) if give_ranks else (None, None)
    got = intersect(a, b, *ranks)
    assert sorted(zip(*(x.tolist() for x in got), strict=True)) == sorted(want)
    assert got[0].tolist() == sorted(got[0].tolist())  # in time order

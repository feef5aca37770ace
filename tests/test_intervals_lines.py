"""Input lines of interval edges looked up for a few intervals equal the full list, which
is worked out edge by edge in plain Python here (edges at the window's ends included)."""

from __future__ import annotations

import numpy as np
from hypothesis import given
from hypothesis import strategies as st

from sequencecheck.model import Channel, Level
from sequencecheck.rules._intervals import on_intervals

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


def _walk(ch: Channel, on_level: int) -> tuple[list[int], list[int]]:
    """Start and end lines by walking the edges one by one."""
    starts, ends = [], []
    on = ch.initial == on_level
    if on:
        starts.append(0)  # clipped: no edge
    lines = ch.lines.tolist() if ch.lines is not None else [0] * ch.times.size
    for level, line in zip(ch.levels.tolist(), lines, strict=True):
        now = level == on_level
        if now and not on:
            starts.append(line)
        elif on and not now:
            ends.append(line)
        on = now
    if on:
        ends.append(0)
    return starts, ends


@given(channels(), st.data())
def test_picked_lines_match_the_walk(case, data):
    ch, on_level, end = case
    iv = on_intervals(ch, on_level, 0, end)
    want_starts, want_ends = _walk(ch, on_level)
    assert len(iv) == len(want_starts) == len(want_ends)
    if len(iv) == 0:
        return
    idx = np.array(data.draw(st.lists(st.integers(0, len(iv) - 1), max_size=6)), dtype=np.int64)
    assert iv.start_lines_at(idx).tolist() == [want_starts[i] for i in idx]  # picked
    assert iv.end_lines_at(idx).tolist() == [want_ends[i] for i in idx]
    assert iv.start_lines.tolist() == want_starts  # every line at once
    assert iv.end_lines.tolist() == want_ends

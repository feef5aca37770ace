"""The timeline of a table: steps in time order, repeat blocks, and the Trace they make.

Every change is kept as (time, channel index, level, source line). Changes are
emitted in non-decreasing time, so the arrays need no sorting; a repeat block
is expanded with numpy by tiling its first pass.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from ..model import Channel

__all__ = ["MAX_CHANGES", "Frame", "channels_from_changes"]

#: A table may expand to at most this many switch changes (memory guard).
MAX_CHANGES = 50_000_000

Arrays = tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]


class Frame:
    """The top level of a table, or one open repeat block.

    Times are relative to the frame's base (0 for the top level, the start of
    the first pass for a block). ``now`` is the time of the latest step.
    """

    __slots__ = ("C", "L", "T", "V", "chunks", "column", "count", "every", "line", "now", "opened_at", "steps")  # fmt: skip

    def __init__(
        self,
        count: int = 1,
        every: int | None = None,
        opened_at: int = 0,
        line: int = 0,
        column: int = 0,
    ) -> None:
        self.count, self.every, self.opened_at = count, every, opened_at
        self.line, self.column = line, column
        self.now = 0
        self.steps = 0
        self.T: list[int] = []
        self.C: list[int] = []
        self.V: list[int] = []
        self.L: list[int] = []
        self.chunks: list[Arrays] = []

    @property
    def size(self) -> int:
        return len(self.T) + sum(c[0].size for c in self.chunks)

    def flush(self) -> None:
        if self.T:
            self.chunks.append(
                (
                    np.array(self.T, dtype=np.int64),
                    np.array(self.C, dtype=np.int32),
                    np.array(self.V, dtype=np.int8),
                    np.array(self.L, dtype=np.int64),
                )
            )
            self.T, self.C, self.V, self.L = [], [], [], []

    def arrays(self) -> Arrays:
        self.flush()
        if not self.chunks:
            return (np.empty(0, np.int64), np.empty(0, np.int32), np.empty(0, np.int8), np.empty(0, np.int64))  # fmt: skip
        if len(self.chunks) == 1:
            return self.chunks[0]
        parts = list(zip(*self.chunks, strict=True))
        return tuple(np.concatenate(p) for p in parts)  # type: ignore[return-value]

    def pass_length(self) -> int:
        """Time from one pass's start to the next: the period, else the last step's time."""
        return self.every if self.every is not None else self.now

    def expand_into(self, parent: Frame) -> None:
        """Append every pass of this block to ``parent``, starting at ``opened_at``."""
        t, c, v, ln = self.arrays()
        n, length = self.count, self.pass_length()
        starts = np.arange(n, dtype=np.int64) * np.int64(length) + np.int64(self.opened_at)
        parent.flush()
        parent.chunks.append(
            (
                (t[None, :] + starts[:, None]).ravel(),
                np.tile(c, n),
                np.tile(v, n),
                np.tile(ln, n),
            )
        )
        parent.now = self.opened_at + n * length
        parent.steps += self.steps * n


def channels_from_changes(
    names: Sequence[str],
    off_levels: Sequence[int],
    arrays: Arrays,
    start_ps: int,
) -> dict[str, Channel]:
    """Per-channel edge lists; what is set at ``start_ps`` is each channel's initial level.

    A channel not set at the start begins at its ``off_levels`` entry (switch off).
    """
    t, c, v, ln = arrays
    order = np.argsort(c, kind="stable")  # keeps time order within each channel
    t, c, v, ln = t[order], c[order], v[order], ln[order]
    bounds = np.searchsorted(c, np.arange(len(names) + 1), side="left")
    out: dict[str, Channel] = {}
    for i, name in enumerate(names):
        lo, hi = int(bounds[i]), int(bounds[i + 1])
        ct, cv, cl = t[lo:hi], v[lo:hi], ln[lo:hi]
        k = int(np.searchsorted(ct, start_ps, side="right"))
        initial = int(cv[k - 1]) if k else int(off_levels[i])
        out[name] = Channel.from_changes(name, initial, ct[k:], cv[k:], cl[k:])
    return out

"""Where a piece of input came from."""

from __future__ import annotations

from typing import NamedTuple

__all__ = ["Source"]


class Source(NamedTuple):
    """A place in an input file: path, 1-based line (row for CSV) and column."""

    path: str
    line: int | None = None
    column: int | None = None

    def __str__(self) -> str:
        return ":".join(str(p) for p in (self.path, self.line, self.column) if p is not None)

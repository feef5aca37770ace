"""Our look for pictures: colours that stay apart in greyscale, and time axes."""

from __future__ import annotations

from collections.abc import Iterator
from contextlib import contextmanager
from typing import Any

__all__ = ["INK", "PALE", "REQUIRED", "TRACE", "VIOLATION", "axis_unit", "drawing", "finish"]

TRACE = "#17405e"  # deep blue-grey: dark in greyscale
VIOLATION = "#e8a33d"  # amber: light in greyscale, also hatched
VIOLATION_EDGE = "#9c5a00"
REQUIRED = "#7a1f5c"  # plum, drawn dashed
INK = "#222222"
PALE = "#d9dee3"

_UNITS = (("s", 10**12), ("ms", 10**9), ("µs", 10**6), ("ns", 10**3), ("ps", 1))


def axis_unit(span_ps: int) -> tuple[str, int]:
    """The engineering unit (name, picoseconds) in which ``span_ps`` reads as 1 to 1000."""
    for name, scale in _UNITS:
        if span_ps >= scale:
            return name, scale
    return "ps", 1


@contextmanager
def drawing(salt: str) -> Iterator[Any]:
    """Import matplotlib (Agg, no pyplot) and apply our settings; yields the Figure class.

    Text taken from inputs must be drawn with ``parse_math=False`` (a channel
    named ``$x$`` stays as typed). ``salt`` makes the SVG ids of one picture differ from another's, so several
    pictures can sit inline in one HTML page.
    """
    import matplotlib

    matplotlib.use("Agg", force=False)
    from matplotlib import rc_context
    from matplotlib.figure import Figure

    settings = {
        "svg.fonttype": "none",
        "svg.hashsalt": salt,
        "font.size": 9,
        "font.family": "DejaVu Sans",
        "axes.edgecolor": INK,
        "axes.labelcolor": INK,
        "xtick.color": INK,
        "ytick.color": INK,
        "axes.spines.top": False,
        "axes.spines.right": False,
    }
    with rc_context(settings):
        yield Figure


def finish(fig: Any, formats: tuple[str, ...]) -> dict[str, bytes]:
    """Render ``fig`` to each format (``png``, ``svg``); call inside ``drawing()``."""
    import io

    out = {}
    for fmt in formats:
        buf = io.BytesIO()
        meta = {"Date": None} if fmt == "svg" else {"Software": "sequencecheck"}
        fig.savefig(buf, format=fmt, dpi=110, metadata=meta)
        out[fmt] = buf.getvalue()
    return out

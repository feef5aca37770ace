"""Text view of the decoded bridge states: time per state and counts of changes between them."""

from __future__ import annotations

from typing import Any

from ..findings import InputReport
from ..units import format_time

__all__ = ["states_lines"]


def _table(rows: list[list[str]], right: int = 1) -> list[str]:
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    out = []
    for n, row in enumerate(rows):
        cells = [
            c.ljust(w) if i < right else c.rjust(w)
            for i, (c, w) in enumerate(zip(row, widths, strict=True))
        ]
        out.append("    " + "  ".join(cells).rstrip())
        if n == 0:
            out.append("    " + "  ".join("-" * w for w in widths))
    return out


def states_lines(r: InputReport) -> list[str]:
    """Lines of the states view of one input; none when the report carries no view."""
    view: Any = r.extra.get("states")
    if not isinstance(view, dict) or not view.get("states"):
        return []
    scheme = f", {view['scheme']} PWM" if view.get("scheme") else ""
    lines = [
        f"  bridge states ({view['changes']:,} changes; hand-over gaps up to "
        f"{format_time(view['handover_max_ps'])} counted in the state before{scheme}):"
    ]
    rows = [["state", "visits", "time", "share", "as decoded"]]
    for s in view["states"]:
        rows.append(
            [
                s["state"],
                f"{s['visits']:,}",
                format_time(s["time_ps"]),
                f"{100 * s['share']:.2f} %",
                format_time(s["exact_time_ps"]),
            ]
        )
    lines += _table(rows)
    names = view["names"]
    lines.append("  changes (row: from, column: to):")
    matrix = [["from \\ to", *names]]
    for name, counts in zip(names, view["matrix"], strict=True):
        matrix.append([name, *(f"{c:,}" if c else "." for c in counts)])
    lines += _table(matrix)
    return lines

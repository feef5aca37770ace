"""Per-file summary lines for reports over several inputs: one line per input."""

from __future__ import annotations

from ..findings import InputReport, Report
from ..units import format_time

__all__ = ["file_status", "file_summary_lines"]


def file_status(r: InputReport) -> str:
    """``not checked``, ``clean`` or ``N violation(s)`` for one input."""
    if r.error is not None:
        return "not checked"
    n = len(r.violations)
    return "clean" if n == 0 else f"{n} violation(s)"


def file_summary_lines(report: Report) -> list[str]:
    """A small table: input, status, rows, edges and the time span checked."""
    rows = [["input", "status", "rows", "edges", "span"]]
    for r in report.inputs:
        if r.error is not None:
            rows.append([r.input, file_status(r), "-", "-", r.error.rsplit(": ", 1)[-1]])
        else:
            span = f"{format_time(r.start_ps)} to {format_time(r.end_ps)}"
            rows.append([r.input, file_status(r), f"{r.rows:,}", f"{r.edges:,}", span])
    widths = [max(len(row[i]) for row in rows) for i in range(5)]
    out = ["per-input summary:"]
    for n, row in enumerate(rows):
        out.append("  " + "  ".join(c.ljust(w) for c, w in zip(row, widths, strict=True)).rstrip())
        if n == 0:
            out.append("  " + "  ".join("-" * w for w in widths))
    out.append("")
    return out

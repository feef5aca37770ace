"""Dead-time histograms: the hand-over gaps of one leg and direction, with the requirement."""

from __future__ import annotations

import numpy as np

from ..units import format_time
from ._data import HandoverGaps
from ._style import (
    INK,
    PALE,
    REQUIRED,
    TRACE,
    VIOLATION,
    VIOLATION_EDGE,
    axis_unit,
    drawing,
    finish,
)

__all__ = ["draw_histogram"]

_MAX_BINS = 40


def _bins(gaps: np.ndarray, required: int | None) -> np.ndarray:
    """Bin edges in picoseconds: whole multiples of a round step, covering gaps and the
    requirement, so that no bar straddles the requirement."""
    lo = int(gaps.min())
    hi = int(gaps.max())
    if required is not None:
        lo, hi = min(lo, required), max(hi, required)
    span = max(hi - lo, 1)
    step = 1
    while span / step > _MAX_BINS:
        for m in (2, 5, 10):
            if span / (step * m) <= _MAX_BINS:
                step *= m
                break
        else:
            step *= 10
    start = (lo // step) * step
    if required is not None:
        start = required - ((required - start + step - 1) // step) * step
    edges = np.arange(start, hi + step + 1, step, dtype=np.int64)
    return edges


def draw_histogram(
    data: HandoverGaps,
    *,
    title: str = "",
    formats: tuple[str, ...] = ("png", "svg"),
    salt: str = "sc",
) -> dict[str, bytes]:
    """Histogram of ``data.gaps_ps``; bars below the requirement are hatched."""
    gaps = data.gaps_ps
    with drawing(salt) as Figure:
        fig = Figure(figsize=(6.2, 3.0), layout="constrained")
        ax = fig.add_subplot()
        if gaps.size == 0:
            ax.text(0.5, 0.5, "no hand-overs in this direction", ha="center", va="center",
                    transform=ax.transAxes, color=INK)  # fmt: skip
            ax.set_xticks([])
            ax.set_yticks([])
        else:
            edges = _bins(gaps, data.required_ps)
            counts, _ = np.histogram(gaps, bins=edges)
            unit, scale = axis_unit(int(edges[-1]))
            left = (edges[:-1] / scale).astype(float)
            width = float((edges[1] - edges[0]) / scale)
            short = (
                edges[1:] <= data.required_ps
                if data.required_ps is not None
                else np.zeros(counts.size, dtype=bool)
            )
            ax.bar(left[~short], counts[~short], width=width, align="edge", color=TRACE,
                   edgecolor="white", lw=0.5, label="meets the requirement")  # fmt: skip
            if short.any():
                ax.bar(left[short], counts[short], width=width, align="edge", color=VIOLATION,
                       edgecolor=VIOLATION_EDGE, hatch="///", lw=0.8,
                       label="shorter than required")  # fmt: skip
            if data.required_ps is not None:
                xr = data.required_ps / scale
                ax.axvline(xr, color=REQUIRED, ls="--", lw=1.6)
                ax.text(xr, 1.0, f" required {format_time(data.required_ps)}", color=REQUIRED,
                        transform=ax.get_xaxis_transform(), va="top", ha="left", fontsize=8.5,
                        fontweight="bold")  # fmt: skip
            shown = np.flatnonzero(counts if np.count_nonzero(counts) <= 12 else counts * short)
            for i in shown.tolist():
                ax.text(left[i] + width / 2, counts[i], str(int(counts[i])), ha="center",
                        va="bottom", fontsize=8, color=INK)  # fmt: skip
            ax.margins(y=0.15)
            ax.set_xlabel(f"dead time ({unit})")
            ax.set_ylabel("hand-overs")
            ax.grid(axis="y", color=PALE, lw=0.6)
            ax.legend(loc="upper left", fontsize=8, frameon=False)
        if title:
            ax.set_title(title, loc="left", fontsize=10, color=INK, parse_math=False)
        return finish(fig, formats)

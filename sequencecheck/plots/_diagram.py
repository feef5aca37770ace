"""Timing diagrams: channels as digital traces, a finding's interval shaded, and its
measured value and requirement drawn as dimension arrows."""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from ..findings import Certainty, Finding
from ..model import Trace
from ..units import format_time
from ._data import steps_in_window
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

__all__ = ["draw_timing"]

_ROW = 1.6  # vertical distance between channel rows; a trace swings 0..1
_ARROW_STEP = 0.75
_MAX_SAMPLE_TICKS = 120  # mark sample instants when the window holds no more than this


def _arrow(ax: Any, x0: float, x1: float, y: float, label: str, colour: str, dashed: bool) -> None:
    style = "--" if dashed else "-"
    ax.annotate(
        "",
        xy=(x1, y),
        xytext=(x0, y),
        arrowprops={
            "arrowstyle": "<|-|>",
            "color": colour,
            "lw": 1.3,
            "linestyle": style,
            "shrinkA": 0,
            "shrinkB": 0,
            "mutation_scale": 9,
        },
    )
    ax.text(
        (x0 + x1) / 2,
        y + 0.12,
        label,
        ha="center",
        va="bottom",
        color=colour,
        fontsize=8.5,
        fontweight="bold",
        bbox={"boxstyle": "round,pad=0.15", "fc": "white", "ec": "none", "alpha": 0.85},
    )


def _annotate(ax: Any, f: Finding, to_x: Any, top: float, slot: int, bottom: float) -> float:
    """Shade ``f`` and draw its dimension arrows above ``top``; returns the highest y used."""
    x0, x1 = to_x(f.start_ps), to_x(f.end_ps)
    if x1 > x0:
        ax.axvspan(
            x0, x1, ymin=0, ymax=1, facecolor=VIOLATION, edgecolor=VIOLATION_EDGE,
            hatch="///", alpha=0.55, lw=0.8, zorder=0,
        )  # fmt: skip
    else:
        ax.axvline(x0, color=VIOLATION_EDGE, lw=2, zorder=0)
    y = top + _ARROW_STEP * (1 + 2 * slot)
    tag = "" if f.certainty is Certainty.PROVEN else " (inconclusive)"
    kind = "overlap" if f.rule == "shoot-through" else "measured"
    _arrow(ax, x0, x1, y, f"{kind} {format_time(f.measured_ps)}{tag}", INK, dashed=False)
    ends = [x0, x1]
    if f.required_ps:
        xr = to_x(f.start_ps + f.required_ps)
        y_req = y + _ARROW_STEP
        _arrow(ax, x0, xr, y_req, f"required {format_time(f.required_ps)}", REQUIRED, dashed=True)
        ends.append(xr)
        y = y_req
    for x in set(ends):  # extension lines from the edges up to the arrows
        ax.plot([x, x], [bottom, y], color=INK, lw=0.6, ls=":", zorder=1)
    return y + 0.6


def draw_timing(
    trace: Trace,
    rows: Sequence[tuple[str, str]],
    lo_ps: int,
    hi_ps: int,
    findings: Sequence[Finding] = (),
    *,
    title: str = "",
    active_low: frozenset[str] = frozenset(),
    origin_ps: int | None = None,
    formats: tuple[str, ...] = ("png", "svg"),
    salt: str = "sc",
) -> dict[str, bytes]:
    """Draw ``rows`` ``(label, channel)`` of ``trace`` over ``[lo_ps, hi_ps]`` and
    annotate ``findings``; returns the picture in each of ``formats``.

    The time axis counts from ``origin_ps`` (default: the first finding's start,
    else ``lo_ps``) in the engineering unit that suits the window.
    """
    unit, scale = axis_unit(hi_ps - lo_ps)
    if origin_ps is None:
        origin_ps = findings[0].start_ps if findings else lo_ps
    origin = origin_ps

    def to_x(t: int) -> float:
        return (t - origin) / scale

    with drawing(salt) as Figure:
        n = len(rows)
        extra = 1.6 * max(len(findings), 1) + 0.8
        fig = Figure(figsize=(8.2, 1.1 + 0.62 * n + 0.42 * extra), layout="constrained")
        ax = fig.add_subplot()
        top = 0.0
        labels, ticks = [], []
        for i, (label, name) in enumerate(rows):
            base = -i * _ROW
            times, levels = steps_in_window(trace.channel(name), lo_ps, hi_ps)
            xs = [to_x(int(t)) for t in times]
            ys = [base + (0.5 if v > 1 else float(v)) for v in levels.tolist()]
            ax.fill_between(xs, base, ys, step="post", color=PALE, lw=0, zorder=1)
            ax.step(xs, ys, where="post", color=TRACE, lw=1.8, zorder=3)
            ax.axhline(base, color=PALE, lw=0.6, zorder=0)
            ticks.append(base + 0.5)
            labels.append(label + (" (active low)" if name in active_low else ""))
            top = max(top, base + 1)
        bottom = -(n - 1) * _ROW
        y_max = top + 0.5
        for slot, f in enumerate(findings):
            y_max = max(y_max, _annotate(ax, f, to_x, top, slot, bottom))
        ax.set_yticks(ticks, labels)
        for text in ax.get_yticklabels():
            text.set_parse_math(False)
        ax.tick_params(axis="y", length=0)
        ax.set_ylim(bottom - 0.4, y_max)
        ax.set_xlim(to_x(lo_ps), to_x(hi_ps))
        xlabel = f"time ({unit}) from {format_time(origin)}"
        ts = trace.sample_period_ps
        if ts and (hi_ps - lo_ps) // ts <= _MAX_SAMPLE_TICKS:
            first = trace.start_ps + -(-(lo_ps - trace.start_ps) // ts) * ts
            xs = [to_x(t) for t in range(first, hi_ps + 1, ts)]
            ax.plot(xs, [bottom - 0.3] * len(xs), "|", color=INK, ms=5, mew=0.8, zorder=2)
            xlabel += f"; ticks: samples every {format_time(ts)}"
        ax.set_xlabel(xlabel)
        ax.spines["left"].set_visible(False)
        ax.grid(axis="x", color=PALE, lw=0.6)
        if title:
            ax.set_title(title, loc="left", fontsize=10, color=INK, parse_math=False)
        return finish(fig, formats)

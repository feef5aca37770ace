"""unknown-state: stretches where a bridge channel is at an undefined level (X or Z).

Inputs that can carry such levels (VCD) are checked, never rejected: each maximal
stretch of undefined level on a channel (X and Z joined) is one finding, from the
edge into it to the edge out of it or the end of the window.
"""

from __future__ import annotations

import numpy as np

from ..findings import Certainty, Finding
from ..model import Level, Source
from ..units import format_time
from ._base import CheckContext, Rule, RuleResult

__all__ = ["UNKNOWN_STATE", "undefined_intervals"]


def undefined_intervals(
    initial: int, times: np.ndarray, levels: np.ndarray, start_ps: int, end_ps: int
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Maximal undefined stretches: (starts, ends, index of opening edge or -1, of closing
    edge or -1), clipped to the window."""
    bad = np.empty(levels.size + 1, dtype=bool)
    bad[0] = initial >= Level.X
    bad[1:] = levels >= Level.X
    rise = np.flatnonzero(~bad[:-1] & bad[1:])  # edge index opening a stretch
    fall = np.flatnonzero(bad[:-1] & ~bad[1:])  # edge index closing one
    open_idx = rise.astype(np.int64)
    close_idx = fall.astype(np.int64)
    if bad[0]:
        open_idx = np.concatenate(([-1], open_idx))
    if bad[-1]:
        close_idx = np.concatenate((close_idx, [-1]))
    starts = np.where(open_idx >= 0, times[np.maximum(open_idx, 0)] if times.size else 0, start_ps)
    ends = np.where(close_idx >= 0, times[np.maximum(close_idx, 0)] if times.size else 0, end_ps)
    starts = np.maximum(starts.astype(np.int64), start_ps)
    ends = np.minimum(ends.astype(np.int64), end_ps)
    keep = ends > starts
    return starts[keep], ends[keep], open_idx[keep], close_idx[keep]


def _check_unknown_state(ctx: CheckContext) -> RuleResult:
    result = RuleResult()
    trace, ts = ctx.trace, ctx.trace.sample_period_ps
    total = 0
    for leg in ctx.bridge.legs:
        for name in leg.channels:
            ch = trace.channel(name)
            starts, ends, oi, ci = undefined_intervals(
                ch.initial, ch.times, ch.levels, trace.start_ps, trace.end_ps
            )
            total += int((ends - starts).sum())
            shown = result.listed(ctx, "unknown-state", leg.name, np.arange(starts.size))
            for s, e, o, c in zip(
                starts[shown].tolist(),
                ends[shown].tolist(),
                oi[shown].tolist(),
                ci[shown].tolist(),
                strict=True,
            ):
                w = e - s
                open_end = c < 0
                lines = [] if ch.lines is None else [int(ch.lines[i]) for i in (o, c) if i >= 0]
                result.findings.append(
                    Finding(
                        rule="unknown-state",
                        leg=leg.name,
                        channels=(name,),
                        start_ps=s,
                        end_ps=e,
                        measured_ps=w,
                        required_ps=None,
                        input=trace.path,
                        message=(
                            f"leg {leg.name}: {name} at an undefined level (x/z) for "
                            f"{format_time(w)}"
                            + (" (still undefined when the capture ends)" if open_end else "")
                        ),
                        certainty=Certainty.PROVEN,
                        bounds_ps=None if ts is None else (max(w - ts, 0), w + ts),
                        sources=tuple(Source(trace.path, n) for n in lines if n),
                        detail={"open_end": open_end, "open_start": o < 0},
                        margin_ps=-w,
                    )
                )
    result.extra["undefined_ps"] = total
    return result


UNKNOWN_STATE = Rule(
    id="unknown-state",
    family="unknown",
    summary="A gate command at an undefined level (x or z) for some time.",
    help=(
        "Give every gate command a defined level from the start (reset values, pull "
        "resistors on the driver inputs); an undefined command may turn a switch on."
    ),
    check=_check_unknown_state,
)

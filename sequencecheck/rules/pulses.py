"""min-pulse: on- and off-pulses of every switch shorter than the gate driver's minimum.

A pulse is the time between two consecutive edges of a channel: an on-pulse while
the switch is commanded on, an off-pulse while it is commanded off. Stretches cut
by the window's start or end are not pulses (their width is unknown), nor are
stretches at an undefined level (unknown-state reports those) or next to one (the
switch may have been in the same state during it). For sampled inputs
the true width lies within one sample period either way (facts.md section 8).
"""

from __future__ import annotations

import numpy as np

from ..findings import Certainty, Finding, WorstMargin
from ..model import Level, Source
from ..units import format_time
from ._base import CheckContext, Rule, RuleResult

__all__ = ["MIN_PULSE", "pulses"]


def pulses(
    initial: int, times: np.ndarray, levels: np.ndarray
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Every stretch between two edges at a defined level with defined levels on both
    sides: (index of its first edge, width, level held)."""
    if times.size < 2:
        e = np.empty(0, dtype=np.int64)
        return e, e, e.astype(np.int8)
    defined = np.concatenate(([initial], levels)) < Level.X  # before edge 0, after each edge
    ok = defined[:-2] & defined[1:-1] & defined[2:]  # before, during and after stretch k
    idx = np.flatnonzero(ok)
    return idx, times[idx + 1] - times[idx], levels[idx]


def _check_min_pulse(ctx: CheckContext) -> RuleResult:
    result = RuleResult()
    need = ctx.policy.min_pulse_ps
    trace, ts = ctx.trace, ctx.trace.sample_period_ps
    if need is None:  # no minimum: nothing to measure pulses against
        return result
    for leg in ctx.bridge.legs:
        worst: WorstMargin | None = None
        for name in leg.channels:
            ch = trace.channel(name)
            idx, width, level = pulses(ch.initial, ch.times, ch.levels)
            if width.size == 0:
                continue
            k = int(np.argmin(width))
            if worst is None or int(width[k]) - need < worst.margin_ps:
                worst = WorstMargin(
                    "min-pulse",
                    leg.name,
                    int(width[k]) - need,
                    int(ch.times[idx[k]]),
                    int(width[k]),
                    need,
                )
            on_level = ctx.bridge.on_level(name)
            short = np.flatnonzero(width < need)
            for n in result.listed(ctx, "min-pulse", leg.name, short).tolist():
                i, w = int(idx[n]), int(width[n])
                start, end = int(ch.times[i]), int(ch.times[i + 1])
                kind = "on" if int(level[n]) == on_level else "off"
                proven = ts is None or w + ts <= need
                lines = () if ch.lines is None else (int(ch.lines[i]), int(ch.lines[i + 1]))
                result.findings.append(
                    Finding(
                        rule="min-pulse",
                        leg=leg.name,
                        channels=(name,),
                        start_ps=start,
                        end_ps=end,
                        measured_ps=w,
                        required_ps=need,
                        input=trace.path,
                        message=(
                            f"leg {leg.name}: {kind}-pulse of {name} lasts {format_time(w)}; "
                            f"needs {format_time(need)}"
                            + ("" if proven else " (inconclusive at this sample rate)")
                        ),
                        certainty=Certainty.PROVEN if proven else Certainty.INCONCLUSIVE,
                        bounds_ps=None if ts is None else (max(w - ts, 0), w + ts),
                        sources=tuple(Source(trace.path, n_) for n_ in lines if n_),
                        detail={"pulse": kind},
                    )
                )
        if worst is not None:
            result.margins.append(worst)
    return result


MIN_PULSE = Rule(
    id="min-pulse",
    family="pulses",
    summary="An on- or off-pulse of a switch shorter than the gate driver's minimum.",
    help=(
        "Drop or stretch pulses below the driver's minimum input pulse (clamp the PWM "
        "compare values near 0 % and 100 % duty); a shorter pulse may pass, shrink or vanish."
    ),
    check=_check_min_pulse,
)

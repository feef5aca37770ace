"""Warnings about inputs that check "clean" without having shown much: no silent pass.

A warning never fails a run on its own; ``--strict`` (Policy.strict) makes it fail.
"""

from __future__ import annotations

import numpy as np

from ..findings import Finding, Severity
from ._base import CheckContext, Rule, RuleResult

__all__ = ["SHORT_CAPTURE", "STUCK_CHANNEL", "TWIN_CHANNELS"]


def _warning(
    ctx: CheckContext, rule: str, leg: str, channels: tuple[str, ...], message: str
) -> Finding:
    t = ctx.trace
    return Finding(
        rule=rule,
        leg=leg,
        channels=channels,
        start_ps=t.start_ps,
        end_ps=t.end_ps,
        measured_ps=t.end_ps - t.start_ps,
        required_ps=None,
        input=t.path,
        message=message,
        severity=Severity.WARNING,
    )


def _check_stuck(ctx: CheckContext) -> RuleResult:
    out = RuleResult()
    for leg in ctx.bridge.legs:
        for ch in leg.channels:
            c = ctx.trace.channel(ch)
            if c.edge_count == 0:
                state = "on" if c.initial == ctx.bridge.on_level(ch) else "off"
                out.findings.append(
                    _warning(
                        ctx,
                        "stuck-channel",
                        leg.name,
                        (ch,),
                        f"leg {leg.name}: {ch} never changes (switch {state} throughout)",
                    )
                )
    return out


def _check_twins(ctx: CheckContext) -> RuleResult:
    out = RuleResult()
    for leg in ctx.bridge.legs:
        hi, lo = ctx.trace.channel(leg.high), ctx.trace.channel(leg.low)
        same_polarity = ctx.bridge.on_level(leg.high) == ctx.bridge.on_level(leg.low)
        if (
            same_polarity
            and hi.edge_count
            and hi.initial == lo.initial
            and np.array_equal(hi.times, lo.times)
            and np.array_equal(hi.levels, lo.levels)
        ):
            out.findings.append(
                _warning(
                    ctx,
                    "twin-channels",
                    leg.name,
                    leg.channels,
                    f"leg {leg.name}: {leg.high} and {leg.low} are identical signals; same probe captured twice?",
                )
            )
    return out


def _check_short(ctx: CheckContext) -> RuleResult:
    out = RuleResult()
    for leg in ctx.bridge.legs:
        turn_ons = [len(ctx.on(ch).edge_starts()[1]) for ch in leg.channels]
        switching = any(ctx.trace.channel(ch).edge_count for ch in leg.channels)
        if switching and max(turn_ons) < 2:
            out.findings.append(
                _warning(
                    ctx,
                    "short-capture",
                    leg.name,
                    leg.channels,
                    f"leg {leg.name}: fewer than two turn-ons of either switch; the capture may be shorter than one PWM period",
                )
            )
    return out


STUCK_CHANNEL = Rule(
    id="stuck-channel",
    family="sanity",
    summary="A leg's channel never changes during the capture (warning).",
    help="Check the probe and the channel mapping; a stuck channel hides every fault on that switch.",
    check=_check_stuck,
)

TWIN_CHANNELS = Rule(
    id="twin-channels",
    family="sanity",
    summary="A leg's high- and low-side channels carry identical signals (warning).",
    help="Check that the two channels are different probes; identical columns usually mean a mapping mistake.",
    check=_check_twins,
)

SHORT_CAPTURE = Rule(
    id="short-capture",
    family="sanity",
    summary="A switching leg shows fewer than two turn-ons of either switch (warning).",
    help="Capture at least a few PWM periods so that every hand-over direction is seen.",
    check=_check_short,
)

"""``dead-time-margin``: hold a safety margin on every leg's worst dead time.

The margin is the signed Signal Temporal Logic robustness of the dead-time
formula (see conduction.dead_time_robustness). With ``Policy.require_margin_ps``
set, a leg whose worst margin (commanded, or effective when the leg has a timing
model) is below it gets one finding per kind, so CI can keep headroom.
"""

from __future__ import annotations

from ..findings import Finding
from ..model import DeadTime
from ..units import format_time
from ._base import CheckContext, Rule, RuleResult
from ._effective import COMMANDED
from .conduction import dead_time_robustness, leg_kinds

__all__ = ["DEAD_TIME_MARGIN"]


def _check_margin(ctx: CheckContext) -> RuleResult:
    result = RuleResult()
    floor = ctx.policy.require_margin_ps
    if floor is None:
        return result
    for leg in ctx.bridge.legs:
        for kind in leg_kinds(ctx, leg):
            if kind == COMMANDED:
                need = ctx.policy.dead_time_for(leg.name) or DeadTime()
            else:
                need = ctx.policy.effective_dead_time or DeadTime()
            worst = dead_time_robustness(ctx, leg, kind, need)
            if worst is None or worst.margin_ps >= floor:
                continue
            what = "" if kind == COMMANDED else " (effective)"
            result.findings.append(
                Finding(
                    rule="dead-time-margin",
                    leg=leg.name,
                    channels=leg.channels,
                    start_ps=worst.at_ps,
                    end_ps=worst.at_ps,
                    measured_ps=worst.margin_ps,
                    required_ps=floor,
                    input=ctx.trace.path,
                    message=(
                        f"leg {leg.name}: worst dead-time margin{what} {format_time(worst.margin_ps)} "
                        f"(gap {format_time(worst.measured_ps)}, needs "
                        f"{format_time(worst.required_ps)}) is below the required margin "
                        f"{format_time(floor)}"
                    ),
                    detail={
                        "kind": kind,
                        "gap_ps": worst.measured_ps,
                        "dead_time_ps": worst.required_ps,
                    },
                )
            )
    return result


DEAD_TIME_MARGIN = Rule(
    id="dead-time-margin",
    family="conduction",
    summary="A leg's worst dead-time margin is below the margin the run requires.",
    help=(
        "Lengthen the dead time (or use faster switches and drivers) until the smallest gap "
        "exceeds the required dead time by the margin asked for."
    ),
    check=_check_margin,
)

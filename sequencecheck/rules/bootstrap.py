"""``bootstrap-refresh``: can each leg's bootstrap supply hold its high side on?

For every leg with a BootstrapSupply (``Bridge.bootstrap``) the rule follows the
capacitor through the commanded on-intervals (physics.bootstrap.walk_high_side)
and flags high-side on-intervals that are too long, refreshes (low-side pulses)
too short, the missing pre-charge before the first turn-on, and coasts that
drain the capacitor between a refresh and the next turn-on.
"""

from __future__ import annotations

from ..errors import InputError
from ..findings import Finding, WorstMargin
from ..model import BootstrapSupply, Leg, Source
from ..physics.bootstrap import BootstrapEvent, BootstrapLimits, supply_problem, walk_high_side
from ..physics.cautions import CAUTION
from ..units import format_time
from ._base import CheckContext, Rule, RuleResult

__all__ = ["BOOTSTRAP_REFRESH"]


def _message(leg: Leg, e: BootstrapEvent, min_vgs: float) -> str:
    h = e.high
    t = format_time
    vgs = f"its gate falls to {max(h.vgs_end_v, 0.0):.2f} V, below {min_vgs:g} V"
    if e.check == "on-time":
        return (
            f"leg {leg.name}: {leg.high} on for {t(e.measured_ps)}; the bootstrap supply holds "
            f"at most {t(e.required_ps)} even when full ({vgs})"
        )
    if e.check == "coast":
        return (
            f"leg {leg.name}: {leg.high} turns on {t(e.measured_ps)} after the last refresh; "
            f"leakage allows at most {t(e.required_ps)} ({vgs})"
        )
    if e.measured_ps == 0:
        where = "first turn-on" if h.first else "turn-on after a coast"
        return (
            f"leg {leg.name}: {leg.high} {where} with no low-side pulse before it; needs a "
            f"pre-charge of {leg.low} on for at least {t(e.required_ps)} ({vgs})"
        )
    return (
        f"leg {leg.name}: {leg.low} refreshed for {t(e.measured_ps)} before {leg.high} turned "
        f"on; needs {t(e.required_ps)} ({vgs})"
    )


def _check_bootstrap(ctx: CheckContext) -> RuleResult:
    result = RuleResult()
    limits = ctx.policy.bootstrap
    start_charged = isinstance(limits, BootstrapLimits) and limits.start_charged
    names = {leg.name for leg in ctx.bridge.legs}
    for name in ctx.bridge.bootstrap:
        if name not in names:
            raise InputError(
                f"a bootstrap supply names leg {name!r}, which is not defined "
                f"(legs: {', '.join(sorted(names)) or 'none'})",
                path=ctx.trace.path,
            )
    for leg in ctx.bridge.legs:
        supply = ctx.bridge.bootstrap.get(leg.name)
        if not isinstance(supply, BootstrapSupply):
            continue
        problem = supply_problem(supply)
        if problem is not None:
            raise InputError(f"bootstrap supply of leg {leg.name}: {problem}", path=ctx.trace.path)
        result.extra["caution"] = CAUTION
        high, low = ctx.on(leg.high), ctx.on(leg.low)
        passing, events = walk_high_side(
            supply,
            list(zip(high.starts.tolist(), high.ends.tolist(), strict=True)),
            list(zip(low.starts.tolist(), low.ends.tolist(), strict=True)),
            ctx.trace.start_ps,
            high_clipped_start=high.clipped_start,
            start_charged=start_charged,
        )
        line_of = dict(zip(high.starts.tolist(), high.start_lines.tolist(), strict=True))
        # worst margin: a failing interval's margin (listed or not), else hold time minus on-time
        candidates = [
            (
                e.required_ps - e.measured_ps
                if e.check in ("on-time", "coast")
                else e.measured_ps - e.required_ps,
                e.high.start_ps,
                e.measured_ps,
                e.required_ps,
            )
            for e in events
        ]
        for e in result.listed(ctx, "bootstrap-refresh", leg.name, events):
            more_is_worse = e.check in ("on-time", "coast")
            line = line_of.get(e.high.start_ps, 0)
            result.findings.append(
                Finding(
                    rule="bootstrap-refresh",
                    leg=leg.name,
                    channels=leg.channels,
                    start_ps=e.high.start_ps,
                    end_ps=e.high.end_ps,
                    measured_ps=e.measured_ps,
                    required_ps=e.required_ps,
                    input=ctx.trace.path,
                    message=_message(leg, e, supply.min_vgs_v),
                    sources=(Source(ctx.trace.path, int(line)),) if line else (),
                    detail={
                        "check": e.check,
                        "vgs_end_v": round(max(e.high.vgs_end_v, 0.0), 6),
                        "min_vgs_v": supply.min_vgs_v,
                    },
                    margin_ps=e.required_ps - e.measured_ps if more_is_worse else None,
                )
            )
        if passing is not None and passing.margin_ps is not None and passing.hold_ps is not None:
            candidates.append(
                (
                    passing.margin_ps,
                    passing.start_ps,
                    passing.end_ps - passing.start_ps,
                    passing.hold_ps,
                )
            )
        if candidates:
            m, at, measured, required = min(candidates)
            result.margins.append(
                WorstMargin("bootstrap-refresh", leg.name, m, at, measured, required)
            )
    return result


BOOTSTRAP_REFRESH = Rule(
    id="bootstrap-refresh",
    family="bootstrap",
    summary="A bootstrap-supplied high side stays on too long or is refreshed too briefly.",
    help=(
        "Keep each high-side on-interval within what the bootstrap capacitor holds, give the "
        "low side a long enough on-pulse before each high-side turn-on (a pre-charge pulse "
        "at start-up and after a long coast), or use a larger capacitor."
    ),
    check=_check_bootstrap,
)

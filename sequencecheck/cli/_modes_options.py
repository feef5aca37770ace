"""``check`` options for the mode rules: minimum pulse, reversal dwell, PWM scheme, states view."""

from __future__ import annotations

import argparse
from dataclasses import replace
from typing import Any

from ..findings import InputReport
from ..model import Policy, TransitionPolicy
from ..units import parse_duration

__all__ = ["add_mode_options", "apply_mode_options", "mode_settings", "states_view"]

SCHEMES = ("sign-magnitude", "locked-anti-phase")


def add_mode_options(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "--min-pulse",
        metavar="DURATION",
        help="shortest allowed on- or off-pulse of any switch, e.g. 100ns",
    )
    p.add_argument(
        "--reversal-dwell",
        metavar="DURATION",
        help="two-leg bridges: least time in brake/coast between forward and reverse, e.g. 2ms",
    )
    p.add_argument(
        "--pwm-scheme",
        choices=SCHEMES,
        help="how a two-leg bridge is driven, which decides what a reversal is "
        "(default: sign-magnitude)",
    )
    p.add_argument(
        "--handover-max",
        metavar="DURATION",
        help="longest all-off gap of a leg between its two sides that counts as a hand-over, "
        "not a state of its own (default: 5us)",
    )
    p.add_argument(
        "--states",
        action="store_true",
        help="show the time spent in each bridge state and the counts of changes between states",
    )


def apply_mode_options(args: argparse.Namespace, policy: Policy) -> Policy:
    """``policy`` with the mode options given on the command line applied over it."""
    changes: dict[str, Any] = {}
    if args.min_pulse is not None:
        changes["min_pulse_ps"] = parse_duration(args.min_pulse, what="--min-pulse")
    if args.reversal_dwell is not None:
        changes["reversal_dwell_ps"] = parse_duration(args.reversal_dwell, what="--reversal-dwell")
    tp_changes: dict[str, Any] = {}
    if args.pwm_scheme is not None:
        tp_changes["scheme"] = args.pwm_scheme
    if args.handover_max is not None:
        tp_changes["handover_max_ps"] = parse_duration(args.handover_max, what="--handover-max")
    if tp_changes:
        tp = policy.transitions if isinstance(policy.transitions, TransitionPolicy) else None
        changes["transitions"] = replace(tp or TransitionPolicy(), **tp_changes)
    return replace(policy, **changes) if changes else policy


def mode_settings(policy: Policy) -> dict[str, object]:
    tp = policy.transitions if isinstance(policy.transitions, TransitionPolicy) else None
    return {
        "min_pulse_ps": policy.min_pulse_ps,
        "reversal_dwell_ps": policy.reversal_dwell_ps,
        "pwm_scheme": (tp or TransitionPolicy()).scheme,
    }


def states_view(inputs: tuple[InputReport, ...], show: bool) -> tuple[InputReport, ...]:
    """Keep each input's states view (``extra["states"]``) only when asked for."""
    if show:
        return inputs
    return tuple(
        replace(r, extra={k: v for k, v in r.extra.items() if k != "states"})
        if "states" in r.extra
        else r
        for r in inputs
    )

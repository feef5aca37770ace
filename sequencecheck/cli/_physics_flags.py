"""``check`` flags for physical timing: switch timing, bootstrap supplies, margins.

``--switch-timing CH[,CH...]:KEY=DURATION,...`` with keys driver-min, driver-max,
driver (both), on-delay, rise, off-delay, fall (missing keys are 0).
``--bootstrap LEG[,LEG...]:KEY=VALUE,...`` with keys cap, gate-charge, leakage,
supply, diode, min-vgs (all required) and resistance (default 0 ohm).
"""

from __future__ import annotations

import argparse
from dataclasses import replace
from typing import Any

from ..errors import UsageError
from ..model import BootstrapSupply, Bridge, DeadTime, Policy, SwitchTiming
from ..physics.bootstrap import BootstrapLimits, supply_problem
from ..physics.quantities import parse_quantity
from ..units import parse_duration

__all__ = [
    "add_physics_arguments",
    "apply_physics_arguments",
    "parse_bootstrap",
    "parse_switch_timing",
    "physics_settings",
]

_TIMING_KEYS = {
    "driver-min": ("driver_delay_min_ps",),
    "driver-max": ("driver_delay_max_ps",),
    "driver": ("driver_delay_min_ps", "driver_delay_max_ps"),
    "on-delay": ("turn_on_delay_ps",),
    "rise": ("rise_ps",),
    "off-delay": ("turn_off_delay_ps",),
    "fall": ("fall_ps",),
}
_BOOTSTRAP_KEYS = {
    "cap": ("capacitance_f", "F"),
    "gate-charge": ("gate_charge_c", "C"),
    "leakage": ("leakage_a", "A"),
    "supply": ("supply_v", "V"),
    "diode": ("diode_drop_v", "V"),
    "min-vgs": ("min_vgs_v", "V"),
    "resistance": ("resistance_ohm", "ohm"),
}


def add_physics_arguments(p: argparse.ArgumentParser) -> None:
    g = p.add_argument_group("physical timing")
    g.add_argument(
        "--switch-timing",
        action="append",
        default=[],
        metavar="CH[,CH...]:KEY=DURATION,...",
        help="worst-case timing of the switches those channels drive, repeatable; keys "
        "driver-min, driver-max, driver, on-delay, rise, off-delay, fall, e.g. "
        "AH,AL:driver-min=100ns,driver-max=130ns,on-delay=11ns,off-delay=39ns,fall=35ns; "
        "adds effective (physical) shoot-through and dead-time checks",
    )
    g.add_argument(
        "--effective-dead-time",
        metavar="DURATION",
        help="least gap between effective conduction intervals (default 0: never together)",
    )
    g.add_argument(
        "--require-margin",
        metavar="DURATION",
        help="fail when a leg's worst dead-time margin (commanded or effective) is below this",
    )
    g.add_argument(
        "--bootstrap",
        action="append",
        default=[],
        metavar="LEG[,LEG...]:KEY=VALUE,...",
        help="bootstrap high-side supply of those legs, repeatable; keys cap, gate-charge, "
        "leakage, supply, diode, min-vgs, resistance, e.g. A:cap=100nF,gate-charge=54nC,"
        "leakage=115uA,supply=12V,diode=0.85V,min-vgs=4.45V,resistance=10ohm",
    )
    g.add_argument(
        "--bootstrap-start",
        choices=["empty", "charged"],
        default="empty",
        help="bootstrap capacitors when the input begins (default empty: the first high-side "
        "turn-on needs a pre-charge pulse)",
    )


def _split(flag: str, text: str) -> tuple[list[str], list[tuple[str, str]]]:
    names, colon, rest = text.partition(":")
    targets = [n.strip() for n in names.split(",") if n.strip()]
    pairs = []
    for item in rest.split(","):
        key, eq, value = item.partition("=")
        if not eq or not key.strip() or not value.strip():
            pairs = []
            break
        pairs.append((key.strip(), value.strip()))
    if not colon or not targets or not pairs:
        raise UsageError(f"{flag} must look like NAME[,NAME...]:KEY=VALUE,..., not {text!r}")
    return targets, pairs


def parse_switch_timing(text: str) -> tuple[list[str], SwitchTiming]:
    """``AH,AL:driver-min=100ns,...`` -> (channels, SwitchTiming)."""
    channels, pairs = _split("--switch-timing", text)
    values: dict[str, int] = {}
    for key, value in pairs:
        if key not in _TIMING_KEYS:
            raise UsageError(
                f"--switch-timing: unknown key {key!r} (expected {', '.join(_TIMING_KEYS)})"
            )
        ps = parse_duration(value, what=f"--switch-timing {key}")
        for field in _TIMING_KEYS[key]:
            values[field] = ps
    try:
        return channels, SwitchTiming(**values)
    except ValueError as e:
        raise UsageError(f"--switch-timing {text!r}: {e}") from None


def parse_bootstrap(text: str) -> tuple[list[str], BootstrapSupply]:
    """``A:cap=100nF,...`` -> (legs, BootstrapSupply)."""
    legs, pairs = _split("--bootstrap", text)
    values: dict[str, float] = {}
    for key, value in pairs:
        if key not in _BOOTSTRAP_KEYS:
            raise UsageError(
                f"--bootstrap: unknown key {key!r} (expected {', '.join(_BOOTSTRAP_KEYS)})"
            )
        field, unit = _BOOTSTRAP_KEYS[key]
        positive = key in ("cap", "supply", "min-vgs")
        values[field] = parse_quantity(
            value, unit, what=f"--bootstrap {key}", allow_zero=not positive
        )
    missing = [k for k, (f, _) in _BOOTSTRAP_KEYS.items() if f not in values and k != "resistance"]
    if missing:
        raise UsageError(f"--bootstrap {text!r}: missing {', '.join(missing)}")
    return legs, check_supply(BootstrapSupply(**values), "--bootstrap")


def check_supply(s: BootstrapSupply, what: str) -> BootstrapSupply:
    """UsageError when a supply cannot work at all (no voltage left above the minimum)."""
    problem = supply_problem(s)
    if problem is not None:
        raise UsageError(f"{what}: {problem}")
    return s


def apply_physics_arguments(
    args: argparse.Namespace, bridge: Bridge, policy: Policy
) -> tuple[Bridge, Policy]:
    timing: dict[str, object] = dict(bridge.timing)
    for text in args.switch_timing:
        channels, t = parse_switch_timing(text)
        for ch in channels:
            if ch in timing and ch not in bridge.timing:
                raise UsageError(f"--switch-timing: channel {ch!r} is given twice")
            timing[ch] = t
    supplies: dict[str, object] = dict(bridge.bootstrap)
    for text in args.bootstrap:
        legs, s = parse_bootstrap(text)
        for leg in legs:
            if leg in supplies and leg not in bridge.bootstrap:
                raise UsageError(f"--bootstrap: leg {leg!r} is given twice")
            supplies[leg] = s
    if bridge.legs:
        known = set(bridge.channels)
        names = {leg.name for leg in bridge.legs}
        for ch in timing:
            if ch not in known:
                raise UsageError(f"--switch-timing: channel {ch!r} is in no --leg")
        for leg in supplies:
            if leg not in names:
                raise UsageError(f"--bootstrap: no leg named {leg!r}")
    bridge = replace(bridge, timing=timing, bootstrap=supplies)
    changes: dict[str, Any] = {}
    if args.effective_dead_time is not None:
        changes["effective_dead_time"] = DeadTime.both(
            parse_duration(args.effective_dead_time, what="--effective-dead-time")
        )
    if args.require_margin is not None:
        changes["require_margin_ps"] = parse_duration(args.require_margin, what="--require-margin")
    if args.bootstrap_start == "charged" or args.bootstrap:
        changes["bootstrap"] = BootstrapLimits(start_charged=args.bootstrap_start == "charged")
    return bridge, replace(policy, **changes) if changes else policy


def physics_settings(args: argparse.Namespace) -> dict[str, object]:
    """The physical-timing flags as given, for the report's settings."""
    return {
        "switch_timing": list(args.switch_timing),
        "effective_dead_time": args.effective_dead_time,
        "require_margin": args.require_margin,
        "bootstrap": list(args.bootstrap),
        "bootstrap_start": args.bootstrap_start,
    }

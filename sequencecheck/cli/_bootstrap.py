"""``sequencecheck bootstrap``: what a bootstrap high-side supply can hold, and its refresh."""

from __future__ import annotations

import argparse
import json
import math

from ..errors import UsageError
from ..model import BootstrapSupply
from ..physics.bootstrap import (
    allowed_droop,
    full_voltage,
    longest_on_time_s,
    minimum_capacitance,
    refresh_time_s,
    switch_drop_v,
    total_charge,
    vgs_after,
)
from ..physics.cautions import CAUTION
from ..physics.quantities import parse_quantity
from ..units import format_time, parse_duration
from ._physics_flags import check_supply

__all__ = ["add_parser", "bootstrap_figures", "run_bootstrap"]

#: Full enhancement and the usual gate-source maximum (common practice).
FULL_ENHANCEMENT_V = 10.0
VGS_MAX_V = 20.0

EXAMPLES = """examples:
  sequencecheck bootstrap --cap 100nF --gate-charge 54nC --leakage 115uA --supply 12V \\
      --diode 0.85V --min-vgs 4.45V --resistance 10ohm --switching-frequency 20kHz
  sequencecheck bootstrap --cap 100nF --gate-charge 54nC --leakage 115uA --supply 12V \\
      --diode 0.85V --min-vgs 4.45V --on-time 2ms --format json

exit status: 0 figures printed, 2 a parameter is missing or malformed.
"""

_SUPPLY = (
    ("--cap", "F", "bootstrap capacitance, e.g. 100nF"),
    ("--gate-charge", "C", "high-side total gate charge, e.g. 54nC"),
    ("--leakage", "A", "leakage plus driver quiescent current drawn from the capacitor"),
    ("--supply", "V", "gate-drive supply voltage"),
    ("--diode", "V", "bootstrap diode forward drop"),
    ("--min-vgs", "V", "least gate-source voltage the high side may fall to (e.g. the UVLO)"),
)


def add_parser(sub: argparse._SubParsersAction) -> argparse.ArgumentParser:  # type: ignore[type-arg]
    p = sub.add_parser(
        "bootstrap",
        help="how long a bootstrap supply holds the high side on, and its refresh",
        description=(
            "Charge budget, longest continuous high-side on-time, low-side refresh and "
            "pre-charge times of a bootstrap high-side supply."
        ),
        epilog=EXAMPLES,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    for flag, _, text in _SUPPLY:
        p.add_argument(flag, required=True, metavar="VALUE", help=text)
    p.add_argument("--resistance", default="0", metavar="OHMS", help="charging path resistance")
    p.add_argument("--switching-frequency", metavar="HZ", help="for the per-period charge budget")
    p.add_argument("--ripple", metavar="VOLTS", help="allowed ripple for the least capacitance")
    p.add_argument(
        "--on-time",
        metavar="DURATION",
        help="longest high-side on-interval of the sequence (default: the longest possible)",
    )
    p.add_argument(
        "--residual",
        default="10mV",
        metavar="VOLTS",
        help="droop a refresh must get back within (default 10mV)",
    )
    p.add_argument("--format", choices=["text", "json"], default="text", help="output format")
    p.set_defaults(func=run_bootstrap)
    return p


def _supply(args: argparse.Namespace) -> BootstrapSupply:
    v = {}
    for flag, unit, _ in _SUPPLY:
        positive = flag in ("--cap", "--supply", "--min-vgs")
        v[flag] = parse_quantity(
            getattr(args, flag[2:].replace("-", "_")), unit, what=flag, allow_zero=not positive
        )
    r = parse_quantity(args.resistance, "ohm", what="--resistance")
    s = BootstrapSupply(
        v["--cap"],
        v["--gate-charge"],
        v["--leakage"],
        v["--supply"],
        v["--diode"],
        v["--min-vgs"],
        r,
    )
    return check_supply(s, "bootstrap")


def bootstrap_figures(args: argparse.Namespace) -> dict[str, object]:
    """Every figure the command prints, as a JSON-ready dict (SI units, times also in ps)."""
    s = _supply(args)
    droop = allowed_droop(s)
    out: dict[str, object] = {
        "full_voltage_v": full_voltage(s),
        "allowed_droop_v": droop,
    }
    t_max = longest_on_time_s(s.capacitance_f, droop, s.gate_charge_c, s.leakage_a)
    out["longest_on_time_s"] = None if math.isinf(t_max) else t_max
    out["longest_on_time_ps"] = None if math.isinf(t_max) else math.floor(t_max * 1e12)
    if args.switching_frequency is not None:
        fsw = parse_quantity(
            args.switching_frequency, "Hz", what="--switching-frequency", allow_zero=False
        )
        q = total_charge(s.gate_charge_c, s.leakage_a, fsw)
        ripple = droop
        if args.ripple is not None:
            ripple = parse_quantity(args.ripple, "V", what="--ripple", allow_zero=False)
        out.update(
            switching_frequency_hz=fsw,
            charge_per_period_c=q,
            ripple_v=ripple,
            least_capacitance_f=minimum_capacitance(q, ripple),
            resistance_drop_v=switch_drop_v(q, 1 / fsw, s.resistance_ohm),
        )
    elif args.ripple is not None:
        raise UsageError("--ripple needs --switching-frequency")
    if args.on_time is not None:
        on_ps = parse_duration(args.on_time, what="--on-time")
    elif math.isinf(t_max):
        raise UsageError("nothing leaks (--leakage 0): give --on-time to see the gate voltage")
    else:
        on_ps = math.floor(t_max * 1e12)
    on_s = on_ps / 1e12
    vgs = vgs_after(s, on_s)
    residual = parse_quantity(args.residual, "V", what="--residual", allow_zero=False)
    used = (s.gate_charge_c + s.leakage_a * on_s) / s.capacitance_f
    first_target = droop - used
    out.update(
        on_time_ps=on_ps,
        vgs_end_v=vgs,
        droop_end_v=used,
        residual_v=residual,
        resistance_ohm=s.resistance_ohm,
        time_constant_s=s.resistance_ohm * s.capacitance_f,
        refresh_s=refresh_time_s(s.resistance_ohm, s.capacitance_f, used, residual),
        precharge_s=None
        if first_target <= 0
        else refresh_time_s(s.resistance_ohm, s.capacitance_f, full_voltage(s), first_target),
    )
    warnings = []
    if vgs < s.min_vgs_v:
        warnings.append(
            f"the gate falls to {vgs:.2f} V, below the minimum {s.min_vgs_v:g} V: shorten the "
            "on-time or enlarge the capacitor"
        )
    if vgs < FULL_ENHANCEMENT_V:
        warnings.append(
            f"the gate ends at {vgs:.2f} V, below full enhancement (about "
            f"{FULL_ENHANCEMENT_V:g} V, common practice): on-resistance and losses rise"
        )
    if full_voltage(s) > VGS_MAX_V:
        warnings.append(
            f"the drive reaches {full_voltage(s):.2f} V, above the usual +/-{VGS_MAX_V:g} V "
            "gate-source maximum (common practice): check the switch's rating"
        )
    out["warnings"] = warnings
    out["caution"] = CAUTION
    return out


def _si(value: float, unit: str) -> str:
    for prefix, scale in (
        ("M", 1e6),
        ("k", 1e3),
        ("", 1.0),
        ("m", 1e-3),
        ("u", 1e-6),
        ("n", 1e-9),
        ("p", 1e-12),
    ):
        if abs(value) >= scale or scale == 1e-12:
            return f"{value / scale:.4g} {prefix}{unit}"
    return f"{value:g} {unit}"  # pragma: no cover


def _seconds(s: float) -> str:
    return format_time(math.ceil(round(s * 1e12, 3))) if s > 0 else "0 s"


def _text(f: dict[str, object], args: argparse.Namespace) -> str:
    g = f.get
    lines = [
        "Bootstrap high-side supply:",
        f"  full capacitor voltage   V_full = supply - diode drop = {g('full_voltage_v'):.4g} V",
        f"  allowed droop            dV = V_DD - V_F - V_min = {g('allowed_droop_v'):.4g} V",
    ]
    if "charge_per_period_c" in f:
        lines += [
            f"  charge per period        Q_tot = Q_g + I / f_sw = {_si(g('charge_per_period_c'), 'C')}"
            f" at {_si(g('switching_frequency_hz'), 'Hz')}",
            f"  least capacitance        C_min = Q_tot / dV = {_si(g('least_capacitance_f'), 'F')}"
            f" for {g('ripple_v'):.4g} V",
            f"  charging-path drop       Q_tot x f_sw x R = {g('resistance_drop_v'):.4g} V",
        ]
    longest = g("longest_on_time_ps")
    lines.append(
        "  longest high-side on     t_on,max = (C dV - Q_g) / I = "
        + ("unlimited (nothing leaks)" if longest is None else format_time(longest))
    )
    lines.append(
        f"  gate voltage at the end of a {format_time(g('on_time_ps'))} on-interval: "
        f"{g('vgs_end_v'):.4g} V (droop {g('droop_end_v'):.4g} V)"
    )
    if g("resistance_ohm"):
        lines.append(
            f"  refresh through R        t = R C ln(dV0 / delta) = {_seconds(g('refresh_s'))} "
            f"to get within {_si(g('residual_v'), 'V')} (3 RC, 95 %: {_seconds(3 * g('time_constant_s'))})"
        )
        pre = g("precharge_s")
        lines.append(
            "  pre-charge from empty    "
            + (
                "impossible: this on-time exceeds what the capacitor holds"
                if pre is None
                else f"low side on for at least {_seconds(pre)} before the first high-side turn-on"
            )
        )
    else:
        lines.append(
            "  refresh and pre-charge   no charging resistance given: any low-side pulse "
            "recharges in this model; give --resistance for real times"
        )
    for w in g("warnings") or []:
        lines.append(f"warning: {w}")
    lines.append(CAUTION)
    return "\n".join(lines) + "\n"


def run_bootstrap(args: argparse.Namespace) -> int:
    figures = bootstrap_figures(args)
    if args.format == "json":
        print(json.dumps(figures, indent=2, ensure_ascii=False))
    else:
        print(_text(figures, args), end="")
    return 0

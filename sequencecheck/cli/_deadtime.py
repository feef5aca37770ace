"""``sequencecheck deadtime``: the minimum dead time from switch and driver delays."""

from __future__ import annotations

import argparse
import json
from decimal import Decimal, InvalidOperation

from ..errors import UsageError
from ..physics.cautions import CAUTION
from ..physics.deadtime import (
    SwitchDelays,
    dead_time_error_voltage,
    minimum_dead_time,
    real_dead_time,
)
from ..physics.quantities import parse_quantity
from ..units import format_time, parse_duration, ps_to_seconds

__all__ = ["add_parser", "run_deadtime"]

EXAMPLES = """examples:
  sequencecheck deadtime --turn-off-delay-max 39ns --fall-max 35ns --turn-on-delay-min 11ns \\
      --driver-delay-max 130ns --driver-delay-min 100ns
  sequencecheck deadtime --turn-off-delay-max 0.8us --fall-max 0 --turn-on-delay-min 0.1us \\
      --driver-delay-max 0.5us --driver-delay-min 0.1us --bus-voltage 300V --switching-frequency 10kHz

exit status: 0 figures printed, 2 a parameter is missing or malformed.
"""

_DELAYS = (
    ("--turn-off-delay-max", "td(off) max", "switch turn-off delay, maximum"),
    ("--fall-max", "tf max", "switch fall time, maximum (0 to leave it out)"),
    ("--turn-on-delay-min", "td(on) min", "switch turn-on delay, minimum"),
    ("--driver-delay-max", "tpd max", "gate-driver propagation delay, maximum"),
    ("--driver-delay-min", "tpd min", "gate-driver propagation delay, minimum"),
)


def add_parser(sub: argparse._SubParsersAction) -> argparse.ArgumentParser:  # type: ignore[type-arg]
    p = sub.add_parser(
        "deadtime",
        help="minimum dead time from worst-case switch and driver delays",
        description=(
            "Minimum dead time to command, from worst-case switch and gate-driver delays "
            "(the dead-time formula), and the output-voltage error it costs."
        ),
        epilog=EXAMPLES,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    for flag, _, text in _DELAYS:
        p.add_argument(flag, required=True, metavar="DURATION", help=text)
    p.add_argument(
        "--safety-factor", default="1.2", metavar="K", help="multiplier of at least 1 (default 1.2)"
    )
    p.add_argument(
        "--commanded",
        metavar="DURATION",
        help="a commanded dead time: show what it leaves at the devices "
        "and use it for the voltage error (default: the minimum)",
    )
    p.add_argument("--bus-voltage", metavar="VOLTS", help="DC bus voltage, e.g. 48V")
    p.add_argument("--switching-frequency", metavar="HZ", help="switching frequency, e.g. 20kHz")
    p.add_argument("--format", choices=["text", "json"], default="text", help="output format")
    p.set_defaults(func=run_deadtime)
    return p


def _delays(args: argparse.Namespace) -> SwitchDelays:
    values = [
        parse_duration(getattr(args, flag[2:].replace("-", "_")), what=flag)
        for flag, _, _ in _DELAYS
    ]
    try:
        return SwitchDelays(*values)
    except ValueError:
        raise UsageError("--driver-delay-min is above --driver-delay-max") from None


def _safety_factor(text: str) -> Decimal:
    try:
        k = Decimal(text.strip())
    except InvalidOperation:
        raise UsageError(f"--safety-factor must be a number such as 1.2, not {text!r}") from None
    if not k.is_finite() or k < 1:
        raise UsageError(f"--safety-factor must be a number of at least 1, not {text!r}")
    return k


def deadtime_figures(args: argparse.Namespace) -> dict[str, object]:
    """Every figure the command prints, as a JSON-ready dict (times in ps and s)."""
    delays = _delays(args)
    budget = minimum_dead_time(delays, _safety_factor(args.safety_factor))
    if (args.bus_voltage is None) != (args.switching_frequency is None):
        raise UsageError(
            "--bus-voltage and --switching-frequency go together: give both or neither"
        )
    out: dict[str, object] = {
        "inputs_ps": {
            label: getattr(delays, f)
            for (_, label, _), f in zip(_DELAYS, SwitchDelays.__dataclass_fields__, strict=True)
        },
        "switch_term_ps": budget.switch_term_ps,
        "driver_term_ps": budget.driver_term_ps,
        "safety_factor": str(budget.safety_factor),
        "minimum_dead_time_ps": budget.minimum_ps,
        "minimum_dead_time_s": ps_to_seconds(budget.minimum_ps),
        "without_fall_ps": budget.without_fall_ps,
        "turn_on_path_ps": delays.turn_on_path_ps,
        "turn_off_path_ps": delays.turn_off_path_ps,
    }
    if args.commanded is not None:
        commanded = parse_duration(args.commanded, what="--commanded")
        out["commanded_ps"] = commanded
        out["real_dead_time_ps"] = real_dead_time(
            commanded,
            delays.driver_delay_min_ps,
            delays.turn_on_delay_min_ps,
            delays.driver_delay_max_ps,
            delays.turn_off_delay_max_ps + delays.fall_max_ps,
        )
    if args.bus_voltage is not None:
        bus = parse_quantity(args.bus_voltage, "V", what="--bus-voltage")
        fsw = parse_quantity(
            args.switching_frequency, "Hz", what="--switching-frequency", allow_zero=False
        )
        out["bus_voltage_v"] = bus
        out["switching_frequency_hz"] = fsw
        td = out.get("commanded_ps", budget.minimum_ps)
        assert isinstance(td, int)
        out["error_dead_time_ps"] = td
        out["error_voltage_v"] = dead_time_error_voltage(bus, td, fsw)
    out["caution"] = CAUTION
    return out


def _text(f: dict[str, object]) -> str:
    t = format_time
    i = f["inputs_ps"]
    assert isinstance(i, dict)
    lines = [
        "Minimum dead time (dead-time formula):",
        "  t_dead = [(td(off)max + tf max - td(on)min) + (tpd max - tpd min)] x k",
        f"  switch term  td(off)max + tf max - td(on)min = {t(i['td(off) max'])} + "
        f"{t(i['tf max'])} - {t(i['td(on) min'])} = {t(f['switch_term_ps'])}",
        f"  driver term  tpd max - tpd min = {t(i['tpd max'])} - {t(i['tpd min'])} = "
        f"{t(f['driver_term_ps'])}",
        f"  safety factor k = {f['safety_factor']}",
        f"  minimum dead time = ({t(f['switch_term_ps'])} + {t(f['driver_term_ps'])}) x "
        f"{f['safety_factor']} = {t(f['minimum_dead_time_ps'])}",
        f"  without the fall time: {t(f['without_fall_ps'])}",
        f"  worst-case paths: turn-on no earlier than {t(f['turn_on_path_ps'])} after its "
        f"command, turn-off no later than {t(f['turn_off_path_ps'])} after its command",
    ]
    if "real_dead_time_ps" in f:
        real = f["real_dead_time_ps"]
        assert isinstance(real, int)
        verdict = f"shoot-through: the switches overlap by {t(-real)}" if real < 0 else "no overlap"
        lines.append(
            f"  commanded {t(f['commanded_ps'])} leaves T_D' = T_D - (t3 + t4) + (t1 + t2) = "
            f"{t(real)} at the devices ({verdict})"
        )
    if "error_voltage_v" in f:
        lines.append(
            f"Average output-voltage error: dV = Vdc x td x fsw = {f['bus_voltage_v']:g} V x "
            f"{t(f['error_dead_time_ps'])} x {f['switching_frequency_hz']:g} Hz = "
            f"{f['error_voltage_v']:.4g} V per switching leg (opposite to the current; about "
            "twice that with both legs switching)"
        )
    lines.append(CAUTION)
    return "\n".join(lines) + "\n"


def run_deadtime(args: argparse.Namespace) -> int:
    figures = deadtime_figures(args)
    if args.format == "json":
        print(json.dumps(figures, indent=2, ensure_ascii=False))
    else:
        print(_text(figures), end="")
    return 0

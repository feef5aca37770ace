"""``sequencecheck check``: read inputs, run the rules, report, exit 0/1/2."""

from __future__ import annotations

import argparse
import os
import sys
from dataclasses import replace

from ..api import check  # noqa: F401 - kept for code importing it from here
from ..batch import check_many
from ..legs import parse_leg
from ..model import Bridge, DeadTime, Policy
from ..reporters import REPORTERS, render
from ..units import parse_duration
from ._bridge_file import add_bridge_argument, apply_bridge_file
from ._modes_options import add_mode_options, apply_mode_options, mode_settings, states_view
from ._output import check_output_path, write_output
from ._physics_flags import add_physics_arguments, apply_physics_arguments, physics_settings
from ._pictures import add_picture_options, check_plots_dir, draw_pictures
from ._progress import progress_display

__all__ = ["add_parser", "build_bridge", "build_policy", "run_check"]

#: violations listed per rule and input unless --max-findings says otherwise
DEFAULT_MAX_FINDINGS = 1000

EXAMPLES = """examples:
  sequencecheck check capture.csv --leg A=AH,AL --leg B=BH,BL --dead-time 500ns
  sequencecheck check capture.csv --dead-time 1us --active-low AL,BL --format json
  sequencecheck check samples.csv --time-column sample --sample-rate 100e6 --dead-time 200ns
  sequencecheck check night/*.csv night/*.vcd --dead-time 500ns --jobs 2
  sequencecheck check capture.csv --min-pulse 100ns --reversal-dwell 2ms --states
  sequencecheck check reversal.steps            (a table brings its bridge and limits)
  sequencecheck check capture.csv --bridge drive.bridge --dead-time 1us

exit status: 0 no violation, 1 at least one violation, 2 usage or input error.
"""


def add_parser(sub: argparse._SubParsersAction) -> argparse.ArgumentParser:  # type: ignore[type-arg]
    p = sub.add_parser(
        "check",
        help="check captures or tables for shoot-through, dead-time and other faults",
        description="Check captures or tables for shoot-through, dead-time and other faults.",
        epilog=EXAMPLES,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("inputs", nargs="+", metavar="INPUT", help="CSV or VCD capture(s)")
    p.add_argument(
        "--leg",
        action="append",
        default=[],
        metavar="NAME=HIGH,LOW",
        help="leg definition, repeatable; legs keep the order given "
        "(default: paired from channel names such as A_H/A_L)",
    )
    p.add_argument(
        "--dead-time", metavar="DURATION", help="minimum dead time for every leg, e.g. 500ns"
    )
    p.add_argument(
        "--active-low",
        metavar="CH[,CH...]",
        default="",
        help="channels whose logic 0 commands the switch on",
    )
    p.add_argument("--time-column", metavar="NAME", help="time column (default: the first)")
    p.add_argument(
        "--time-unit",
        choices=["s", "ms", "us", "ns", "ps"],
        help="unit of the time column (default: from the header, e.g. time_ns, else seconds)",
    )
    p.add_argument(
        "--sample-rate",
        metavar="HZ",
        type=float,
        help="the time column is a sample index at this rate",
    )
    p.add_argument("--format", choices=sorted(REPORTERS), default="text", help="report format")
    p.add_argument("--output", metavar="FILE", help="write the report to FILE (default: stdout)")
    p.add_argument("--strict", action="store_true", help="warnings fail the run too")
    p.add_argument(
        "--max-findings",
        metavar="N",
        type=int,
        default=DEFAULT_MAX_FINDINGS,
        help="list at most N violations per rule and input; the rest are counted "
        f"(default: {DEFAULT_MAX_FINDINGS}; 0: list every one)",
    )
    p.add_argument(
        "--jobs",
        "-j",
        metavar="N",
        type=_positive_int,
        default=None,
        help="check up to N inputs at once in worker processes (default: one per core)",
    )
    p.add_argument("--quiet", action="store_true", help="no progress bars on stderr")
    add_picture_options(p)
    add_mode_options(p)

    add_physics_arguments(p)

    add_bridge_argument(p)
    p.set_defaults(func=run_check)
    return p


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 1:
        raise argparse.ArgumentTypeError(f"must be a whole number >= 1, not {text!r}")
    return value


def build_bridge(args: argparse.Namespace) -> Bridge:
    legs = tuple(parse_leg(text) for text in args.leg)
    active_low = frozenset(c.strip() for c in args.active_low.split(",") if c.strip())
    try:
        return Bridge(legs, active_low=active_low)
    except ValueError as e:
        from ..errors import UsageError

        raise UsageError(f"--leg: {e}") from None


def build_policy(args: argparse.Namespace) -> Policy:
    dead = None
    if args.dead_time is not None:
        dead = DeadTime.both(parse_duration(args.dead_time, what="--dead-time"))
    limit = getattr(args, "max_findings", 0)  # commands without the flag list every one
    if limit < 0:
        from ..errors import UsageError

        raise UsageError(f"--max-findings must be 0 (no limit) or more, not {limit}")
    return Policy(dead_time=dead, strict=args.strict, max_findings_per_rule=limit or None)


def _settings(args: argparse.Namespace, policy: Policy) -> dict[str, object]:
    return {
        "dead_time_ps": None if policy.dead_time is None else policy.dead_time.high_to_low_ps,
        "legs": list(args.leg),
        "active_low": sorted(c for c in args.active_low.split(",") if c),
        "max_findings_per_rule": policy.max_findings_per_rule,
        **physics_settings(args),
    }


def run_check(args: argparse.Namespace) -> int:
    check_output_path(args.output, args.inputs)
    check_plots_dir(args.plots)
    bridge = build_bridge(args)
    policy = build_policy(args)
    policy = apply_mode_options(args, policy)

    bridge, policy = apply_physics_arguments(args, bridge, policy)

    bridge, policy = apply_bridge_file(args, bridge, policy)
    policy = replace(policy, state_summary=args.states)  # decode states only when needed
    read_options = {
        "time_column": args.time_column,
        "time_unit": args.time_unit,
        "sample_rate_hz": args.sample_rate,
    }
    with progress_display(len(args.inputs), quiet=args.quiet) as display:
        report = check_many(
            args.inputs, bridge, policy, jobs=args.jobs, progress=display, **read_options
        )
    report = type(report)(report.inputs, _settings(args, policy))
    report = type(report)(
        states_view(report.inputs, args.states), {**report.settings, **mode_settings(policy)}
    )
    options = {}
    if args.format == "text":
        to_terminal = args.output in (None, "-") and sys.stdout.isatty()
        options["colour"] = to_terminal and "NO_COLOR" not in os.environ
    options.update(draw_pictures(args, report, bridge, policy, read_options))
    write_output(render(report, args.format, **options), args.output)
    for r in report.errors:
        print(f"sequencecheck: error: {r.error}", file=sys.stderr)
    return report.exit_status(strict=policy.strict)

"""``sequencecheck plot``: a timing diagram of an input around one instant."""

from __future__ import annotations

import argparse
import os
import re
from dataclasses import replace

from ..api import check_trace
from ..errors import UsageError
from ..legs import legs_or_guess
from ..readers import read
from ..units import format_time, parse_duration
from ._check import build_bridge, build_policy
from ._output import check_output_path, write_output

__all__ = ["add_parser", "run_plot"]

MAX_ANNOTATED = 3

EXAMPLES = """examples:
  sequencecheck plot capture.csv --at 1.18ms --dead-time 500ns
  sequencecheck plot capture.csv --at 3.05ms --window 2us --output overlap.svg

Violations inside the window are shaded, with their measured value and requirement
drawn as dimension arrows. Without --output, NAME_at_TIME.png and .svg are written
to the current folder. Exit status: 0 drawn, 2 usage or input error.
"""


def add_parser(sub: argparse._SubParsersAction) -> argparse.ArgumentParser:  # type: ignore[type-arg]
    p = sub.add_parser(
        "plot",
        help="draw a timing diagram of an input around one instant",
        description="Draw the channels of every leg around --at as a timing diagram.",
        epilog=EXAMPLES,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("input", metavar="INPUT", help="a capture or table")
    p.add_argument("--at", required=True, metavar="TIME", help="centre of the window, e.g. 1.18ms")
    p.add_argument(
        "--window", default="10us", metavar="DURATION", help="width of the window (default 10us)"
    )
    p.add_argument(
        "--leg", action="append", default=[], metavar="NAME=HIGH,LOW",
        help="leg definition, repeatable (default: paired from channel names)",
    )  # fmt: skip
    p.add_argument("--dead-time", metavar="DURATION", help="minimum dead time for every leg")
    p.add_argument("--active-low", metavar="CH[,CH...]", default="", help="active-low channels")
    p.add_argument("--time-column", metavar="NAME", help="time column (default: the first)")
    p.add_argument("--time-unit", choices=["s", "ms", "us", "ns", "ps"], help="time unit")
    p.add_argument("--sample-rate", metavar="HZ", type=float, help="time column is a sample index")
    p.add_argument("--output", metavar="FILE", help="picture to write: a .png or .svg file name")
    p.set_defaults(func=run_plot, strict=False)
    return p


def _formats(output: str | None) -> tuple[str, ...]:
    if output is None:
        return ("png", "svg")
    suffix = os.path.splitext(output)[1].lower().lstrip(".")
    if suffix not in ("png", "svg"):
        raise UsageError(f"--output {output}: expected a file name ending in .png or .svg")
    return (suffix,)


def run_plot(args: argparse.Namespace) -> int:
    formats = _formats(args.output)
    check_output_path(args.output)
    at = parse_duration(args.at, what="--at")
    window = parse_duration(args.window, what="--window")
    if window <= 0:
        raise UsageError(f"--window must be longer than 0 s, not {args.window!r}")
    bridge, policy = build_bridge(args), build_policy(args)
    options = {
        "time_column": args.time_column,
        "time_unit": args.time_unit,
        "sample_rate_hz": args.sample_rate,
    }
    path = os.fspath(args.input)
    trace = read(path, channels=list(bridge.channels) or None, **options)
    if not bridge.legs:
        bridge = replace(bridge, legs=legs_or_guess((), list(trace.channels), path))
    if not trace.start_ps <= at <= trace.end_ps:
        raise UsageError(
            f"--at {args.at} is outside {path} "
            f"({format_time(trace.start_ps)} to {format_time(trace.end_ps)})"
        )
    lo = max(at - window // 2, trace.start_ps)
    hi = min(at - window // 2 + window, trace.end_ps)
    checked = check_trace(trace, bridge, policy)
    inside = [f for f in checked.violations if f.end_ps >= lo and f.start_ps <= hi]
    rows = [
        (f"{leg.name} {side}: {ch}", ch)
        for leg in bridge.legs
        for side, ch in (("high", leg.high), ("low", leg.low))
    ]
    title = f"{os.path.basename(path)} around {format_time(at)}"
    if inside:
        more = len(inside) - MAX_ANNOTATED
        title += f": {len(inside)} violation(s)" + (f", {more} not annotated" if more > 0 else "")
    from ..plots import draw_timing

    pictures = draw_timing(
        trace, rows, lo, hi, inside[:MAX_ANNOTATED], title=title, active_low=bridge.active_low,
        origin_ps=at, formats=formats,
    )  # fmt: skip
    if args.output is not None:
        targets = {formats[0]: args.output}
    else:
        stem = re.sub(r"[^A-Za-z0-9_.-]+", "-", os.path.splitext(os.path.basename(path))[0])
        when = re.sub(r"[^A-Za-z0-9.]+", "", format_time(at))
        targets = {fmt: f"{stem}_at_{when}.{fmt}" for fmt in formats}
    for fmt, target in targets.items():
        write_output(pictures[fmt], target)
        print(target)
    return 0

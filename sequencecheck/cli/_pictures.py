"""``check --plots DIR`` and the pictures of ``--format html``: options and drawing."""

from __future__ import annotations

import argparse
import os
import sys
from collections.abc import Mapping
from typing import Any

from ..errors import UsageError
from ..findings import Report
from ..model import Bridge, Policy

__all__ = ["add_picture_options", "check_plots_dir", "draw_pictures", "plots_limit"]

DEFAULT_LIMIT = 20  # the same as sequencecheck.plots.DEFAULT_LIMIT, without importing it


def plots_limit(text: str) -> int:
    """argparse type for ``--plots-limit``: a whole number, 0 or more."""
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(
            f"must be a whole number such as 20, not {text!r}"
        ) from None
    if value < 0:
        raise argparse.ArgumentTypeError(f"must not be negative, not {text!r}")
    return value


def add_picture_options(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "--plots",
        metavar="DIR",
        help="write a timing diagram per finding and dead-time histograms (PNG and SVG) to DIR",
    )
    p.add_argument(
        "--plots-limit",
        metavar="N",
        type=plots_limit,
        default=DEFAULT_LIMIT,
        help=f"draw at most N diagrams per rule (default {DEFAULT_LIMIT}); "
        "the report says how many were left out",
    )


def check_plots_dir(path: str | None) -> None:
    """Fail early (exit 2) unless ``path`` is, or can be made, a writable folder."""
    if path is None:
        return
    if os.path.exists(path) and not os.path.isdir(path):
        raise UsageError(f"--plots {path}: is a file, expected a folder")
    parent = os.path.dirname(os.path.abspath(path))
    if not os.path.isdir(path):
        if not os.path.isdir(parent):
            raise UsageError(f"--plots {path}: folder {parent} does not exist")
        try:
            os.mkdir(path)
        except OSError as e:
            raise UsageError(f"--plots {path}: cannot create the folder ({e.strerror})") from None
    if not os.access(path, os.W_OK):
        raise UsageError(f"--plots {path}: folder is not writable")


def draw_pictures(
    args: argparse.Namespace,
    report: Report,
    bridge: Bridge,
    policy: Policy,
    read_options: Mapping[str, Any],
) -> dict[str, Any]:
    """Draw what ``--plots`` and ``--format html`` need; returns the renderer's options."""
    want_html = args.format == "html"
    if not args.plots and not want_html:
        return {}
    try:
        import matplotlib  # noqa: F401
    except ImportError:
        if args.plots:
            raise UsageError(
                "--plots needs matplotlib: python -m pip install 'sequencecheck[plot]'"
            ) from None
        print(
            "sequencecheck: no diagrams in the HTML report: matplotlib is not installed "
            "(python -m pip install 'sequencecheck[plot]')",
            file=sys.stderr,
        )
        return {}
    from ..plots import draw_report

    figures = draw_report(
        report,
        bridge,
        policy,
        read_options=read_options,
        limit=args.plots_limit,
        out_dir=args.plots,
    )
    if args.plots:
        left = sum(figures.left_out.values())
        note = (
            f"; {left} finding(s) without a diagram (--plots-limit {args.plots_limit} per rule)"
            if left
            else ""
        )
        print(
            f"sequencecheck: wrote {len(figures.files)} picture file(s) to {args.plots}{note}",
            file=sys.stderr,
        )
        for text in figures.notes:
            print(f"sequencecheck: {text}", file=sys.stderr)
    return {"figures": figures} if want_html else {}

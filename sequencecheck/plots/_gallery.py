"""All the pictures for one report: a diagram per violation (up to a limit per rule) and
dead-time histograms per leg and direction, drawn from re-read traces.

The Report stays plain data: pictures need the edges, so each checked input is read
again here, only when pictures were asked for.
"""

from __future__ import annotations

import contextlib
import os
import re
from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from typing import Any

from ..errors import SequenceCheckError, UsageError
from ..findings import Finding, InputReport, Report
from ..legs import legs_or_guess
from ..model import Bridge, Leg, Policy, Trace
from ..readers import read
from ..units import format_time
from ._data import finding_window, handover_gaps
from ._diagram import draw_timing
from ._histogram import draw_histogram

__all__ = ["DEFAULT_LIMIT", "Figures", "Picture", "draw_finding", "draw_report", "inline_svg"]

DEFAULT_LIMIT = 20


@dataclass(frozen=True, slots=True)
class Picture:
    """One drawn picture: a caption, its SVG markup for inline use and files written."""

    caption: str
    svg: str
    files: tuple[str, ...] = ()


@dataclass(frozen=True)
class Figures:
    """Pictures for a report, keyed by input index (and finding index for diagrams).

    Diagrams are drawn for violations only (warnings such as a stuck channel span
    the whole input). ``left_out`` counts, per rule, the violations without a diagram because of
    ``limit``; ``legs`` gives each input's legs with their channels; ``notes`` says
    what could not be drawn and why.
    """

    diagrams: Mapping[tuple[int, int], Picture] = field(default_factory=dict)
    histograms: Mapping[int, tuple[Picture, ...]] = field(default_factory=dict)
    left_out: Mapping[str, int] = field(default_factory=dict)
    limit: int = DEFAULT_LIMIT
    legs: Mapping[int, tuple[Leg, ...]] = field(default_factory=dict)
    active_low: frozenset[str] = frozenset()
    notes: tuple[str, ...] = ()

    @property
    def files(self) -> list[str]:
        pics = [*self.diagrams.values(), *(p for ps in self.histograms.values() for p in ps)]
        return [f for p in pics for f in p.files]


def inline_svg(svg: bytes) -> str:
    """SVG file bytes as markup to place inside HTML (no XML declaration or doctype)."""
    text = svg.decode("utf-8")
    return text[text.index("<svg") :]


def _slug(text: str) -> str:
    return re.sub(r"[^A-Za-z0-9_.-]+", "-", text).strip("-.") or "x"


def _leg_rows(f: Finding, legs: tuple[Leg, ...]) -> list[tuple[str, str]]:
    for leg in legs:
        if leg.name == f.leg:
            return [
                (f"{leg.name} high: {leg.high}", leg.high),
                (f"{leg.name} low: {leg.low}", leg.low),
            ]
    return [(ch, ch) for ch in f.channels]


def draw_finding(
    trace: Trace,
    f: Finding,
    legs: tuple[Leg, ...],
    *,
    active_low: frozenset[str] = frozenset(),
    formats: tuple[str, ...] = ("png", "svg"),
    salt: str = "sc",
) -> dict[str, bytes]:
    """The timing diagram of one finding: its leg's channels around it."""
    lo, hi = finding_window(f, trace.sample_period_ps)
    rows = [r for r in _leg_rows(f, legs) if r[1] in trace.channels]
    margin = "" if f.margin_ps is None else f", margin {format_time(f.margin_ps)}"
    where = "bridge" if f.leg is None else f"leg {f.leg}"
    title = f"{f.rule} on {where} at {format_time(f.start_ps)}{margin}"
    return draw_timing(
        trace, rows, lo, hi, [f], title=title, active_low=active_low, formats=formats, salt=salt
    )


def _write(out_dir: str | None, stem: str, pics: dict[str, bytes]) -> tuple[str, ...]:
    if out_dir is None:
        return ()
    written = []
    for fmt in ("png", "svg"):
        if fmt in pics:
            path = os.path.join(out_dir, f"{stem}.{fmt}")
            with open(path, "wb") as fh:
                fh.write(pics[fmt])
            written.append(path)
    return tuple(written)


def _reread(
    r: InputReport, bridge: Bridge, read_options: Mapping[str, Any]
) -> tuple[Trace, Bridge]:
    """Read the input again; legs as the check found them (given, carried by the input, or
    guessed from channel names). Without legs, diagrams fall back to each finding's channels."""
    channels = list(bridge.channels) if bridge.legs else None
    trace = read(r.input, channels=channels, **read_options)
    if not bridge.legs:
        carried = trace.meta.get("bridge")
        if isinstance(carried, Bridge) and carried.legs:
            return trace, carried
        with contextlib.suppress(UsageError):  # no legs: findings' own channels are drawn
            bridge = replace(bridge, legs=legs_or_guess((), list(trace.channels), r.input))
    return trace, bridge


def draw_report(
    report: Report,
    bridge: Bridge,
    policy: Policy,
    *,
    read_options: Mapping[str, Any] | None = None,
    limit: int = DEFAULT_LIMIT,
    out_dir: str | None = None,
    histograms: bool = True,
) -> Figures:
    """Draw every picture of ``report``; write PNG and SVG files to ``out_dir`` if given.

    ``bridge`` and ``policy`` are the ones the report was checked with (a bridge
    without legs means legs guessed from channel names, as the check does).
    """
    formats = ("png", "svg") if out_dir is not None else ("svg",)
    if out_dir is not None:
        os.makedirs(out_dir, exist_ok=True)
    read_options = dict(read_options or {})
    diagrams: dict[tuple[int, int], Picture] = {}
    hists: dict[int, tuple[Picture, ...]] = {}
    legs_by_input: dict[int, tuple[Leg, ...]] = {}
    drawn: dict[str, int] = {}
    left_out: dict[str, int] = {}
    notes: list[str] = []
    multi = len(report.inputs) > 1
    for i, r in enumerate(report.inputs):
        if r.error is not None:
            continue
        base = _slug(os.path.splitext(os.path.basename(r.input))[0])
        base = f"{i + 1:02d}-{base}" if multi else base
        try:
            trace, leg_bridge = _reread(r, bridge, read_options)
        except SequenceCheckError as e:
            notes.append(f"{r.input}: no pictures, the input could not be read again: {e}")
            continue
        legs_by_input[i] = leg_bridge.legs
        for n, f in enumerate(r.findings):
            if not f.is_violation:  # warnings often span the whole input: no diagram
                continue
            if drawn.get(f.rule, 0) >= limit:
                left_out[f.rule] = left_out.get(f.rule, 0) + 1
                continue
            drawn[f.rule] = drawn.get(f.rule, 0) + 1
            salt = f"d{i}-{n}"
            pics = draw_finding(
                trace, f, leg_bridge.legs, active_low=leg_bridge.active_low, formats=formats,
                salt=salt,
            )  # fmt: skip
            stem = f"{base}_{_slug(f.rule)}_{_slug(f.leg or 'bridge')}_{drawn[f.rule]:03d}"
            caption = f"{f.rule}, {'bridge' if f.leg is None else 'leg ' + f.leg}, at {format_time(f.start_ps)}"
            diagrams[i, n] = Picture(caption, inline_svg(pics["svg"]), _write(out_dir, stem, pics))
        if not histograms:
            continue
        pictures = []
        for gaps in handover_gaps(trace, leg_bridge, policy):
            if gaps.gaps_ps.size == 0:
                continue
            low = int(gaps.gaps_ps.min())
            caption = (
                f"leg {gaps.leg.name}, {gaps.direction}: {gaps.gaps_ps.size} hand-overs, "
                f"shortest {format_time(low)}"
            )
            salt = f"h{i}-{gaps.leg.name}-{gaps.direction}"
            pics = draw_histogram(gaps, title=caption, formats=formats, salt=salt)
            stem = f"{base}_dead-time-histogram_{_slug(gaps.leg.name)}_{gaps.direction}"
            pictures.append(Picture(caption, inline_svg(pics["svg"]), _write(out_dir, stem, pics)))
        hists[i] = tuple(pictures)
    return Figures(diagrams, hists, left_out, limit, legs_by_input, bridge.active_low, tuple(notes))

"""HTML bench report: one self-contained file (no network, pictures as inline SVG).

Every string that comes from an input (file names, channel and leg names, messages)
is escaped. Pictures are drawn elsewhere (``sequencecheck.plots.draw_report``) and
passed in as ``figures``; without them the report has tables only.
"""

from __future__ import annotations

import html
from collections.abc import Iterable, Mapping
from typing import TYPE_CHECKING, Any

from .. import __version__
from ..findings import Certainty, DirectionStats, Finding, InputReport, Report
from ..units import format_time
from ._common import xml_safe

if TYPE_CHECKING:  # the plots package is imported only when pictures are drawn
    from ..plots import Figures

__all__ = ["CAUTION", "render_html"]

CAUTION = (
    "Mains and battery-powered bridges can injure and burn. These results support, never "
    "replace, a design review, measurement on the real hardware, local codes and licensed "
    "practice."
)

_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:"

_STYLE = """
:root { --ink:#1d2730; --muted:#5b6670; --line:#d5dbe0; --bad:#9c3d00; --bad-bg:#fbe9d6;
  --ok:#1d5e3a; --ok-bg:#e3f1e8; --note-bg:#eef1f4; --accent:#17405e; }
* { box-sizing: border-box; }
body { font: 14px/1.45 system-ui, sans-serif; color: var(--ink); margin: 0 auto;
  max-width: 1100px; padding: 1.2rem 1.5rem 3rem; }
h1 { font-size: 1.5rem; margin: 0 0 .3rem; }
h2 { font-size: 1.2rem; margin: 2rem 0 .4rem; border-bottom: 2px solid var(--accent);
  padding-bottom: .2rem; overflow-wrap: anywhere; }
h3 { font-size: 1.02rem; margin: 1.4rem 0 .4rem; }
.verdict { font-size: 1.1rem; font-weight: 600; padding: .45rem .7rem; border-radius: 4px;
  display: inline-block; margin: .3rem 0 .6rem; }
.verdict.bad { background: var(--bad-bg); color: var(--bad); border-left: 5px solid var(--bad); }
.verdict.ok { background: var(--ok-bg); color: var(--ok); border-left: 5px solid var(--ok); }
.caution { background: #fff6d8; border: 1px solid #c9a227; border-left-width: 6px;
  padding: .55rem .8rem; margin: .6rem 0 1rem; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: .15rem 1rem; margin: .3rem 0; }
dl.facts dt { color: var(--muted); }
dl.facts dd { margin: 0; overflow-wrap: anywhere; }
table { border-collapse: collapse; margin: .4rem 0 .8rem; width: 100%; }
th, td { border: 1px solid var(--line); padding: .25rem .45rem; text-align: left;
  vertical-align: top; }
th { background: var(--note-bg); font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tr.violation td.margin { color: var(--bad); font-weight: 600; }
.tag { font-size: .8rem; padding: 0 .3rem; border-radius: 3px; background: var(--note-bg); }
.tag.bad { background: var(--bad-bg); color: var(--bad); }
figure { margin: .8rem 0 1.2rem; border: 1px solid var(--line); padding: .4rem; }
figure svg { max-width: 100%; height: auto; display: block; }
figcaption { color: var(--muted); font-size: .9rem; }
.note { color: var(--muted); }
.nw { white-space: nowrap; }
.error { color: var(--bad); font-weight: 600; }
footer { margin-top: 2.5rem; color: var(--muted); font-size: .85rem; }
"""


def _e(value: object) -> str:
    """Escape text for HTML (and drop characters XML forbids)."""
    return html.escape(xml_safe(value), quote=True)


def _t(ps: int | None) -> str:
    return "–" if ps is None else _e(format_time(ps))


def _facts(items: Iterable[tuple[str, str]]) -> str:
    rows = "".join(f"<dt>{_e(k)}</dt><dd>{v}</dd>" for k, v in items)
    return f'<dl class="facts">{rows}</dl>'


def _direction(d: DirectionStats) -> tuple[str, str]:
    if d.count == 0 or d.min_gap_ps is None:
        return "0", "–"
    return str(d.count), f"{_t(d.min_gap_ps)} at {_t(d.min_gap_at_ps)}"


def _leg_table(r: InputReport, n: int, legs: Mapping[str, Any]) -> str:
    head = (
        "<tr><th>leg</th><th>high side</th><th>low side</th><th>hand-overs high→low</th>"
        "<th>shortest dead time high→low</th><th>hand-overs low→high</th>"
        "<th>shortest dead time low→high</th><th>worst margins</th><th>violations</th></tr>"
    )
    stats = {s.leg: s for s in r.leg_stats}
    rows = []
    for name in r.legs:
        leg = legs.get(name)
        s = stats.get(name)
        hl = _direction(s.high_to_low) if s else ("–", "–")
        lh = _direction(s.low_to_high) if s else ("–", "–")
        margins = "<br>".join(
            f"{_e(m.rule)}{'' if m.kind == 'commanded' else ' (' + _e(m.kind) + ')'}: "
            f"<span class=nw>{_t(m.margin_ps)}</span> at <span class=nw>{_t(m.at_ps)}</span>"
            for m in r.margins
            if m.leg == name
        )
        count = sum(1 for f in r.violations if f.leg == name)
        count += sum(k for (_rule, leg_name), k in r.unlisted.items() if leg_name == name)
        cls = ' class="violation"' if count else ""
        rows.append(
            f"<tr{cls}><td>{_e(name)}</td><td>{_e(leg.high) if leg else '–'}</td>"
            f"<td>{_e(leg.low) if leg else '–'}</td><td class=num>{hl[0]}</td>"
            f"<td class=num>{hl[1]}</td><td class=num>{lh[0]}</td><td class=num>{lh[1]}</td>"
            f"<td>{margins or '–'}</td><td class=num>{count}</td></tr>"
        )
    return (
        f'<table class="summary" id="summary-{n}"><caption class="note">per-leg summary'
        f"</caption>{head}{''.join(rows)}</table>"
    )


def _finding_row(f: Finding, anchor: str | None) -> str:
    where = "; ".join(_e(s) for s in f.sources) or "–"
    certainty = (
        ""
        if f.certainty is Certainty.PROVEN
        else ' <span class="tag">inconclusive at this sample rate</span>'
    )
    rule = f'<a href="#{anchor}">{_e(f.rule)}</a>' if anchor else _e(f.rule)
    cls = "violation" if f.is_violation else "warning"
    return (
        f'<tr class="{cls}"><td class=num>{_t(f.start_ps)}</td><td>{rule}</td>'
        f"<td>{_e(f.leg if f.leg is not None else 'bridge')}</td>"
        f"<td class=num>{_t(f.measured_ps)}</td><td class=num>{_t(f.required_ps)}</td>"
        f"<td class='num margin'>{_t(f.margin_ps)}</td><td>{_e(f.message)}{certainty}</td>"
        f"<td>{where}</td></tr>"
    )


def _input_section(r: InputReport, n: int, figures: Figures | None) -> str:
    parts = [f'<section class="input" id="input-{n}"><h2>{_e(r.input)}</h2>']
    if r.error is not None:
        parts.append(f'<p class="error">not checked: {_e(r.error)}</p></section>')
        return "".join(parts)
    legs = {leg.name: leg for leg in (figures.legs.get(n, ()) if figures else ())}
    bridge = ", ".join(
        f"{_e(name)} = {_e(legs[name].high)} / {_e(legs[name].low)}" if name in legs else _e(name)
        for name in r.legs
    )
    sampled = (
        f"sampled every {_t(r.sample_period_ps)}" if r.sample_period_ps else "edges at exact times"
    )
    parts.append(
        _facts(
            [
                ("kind", f"{_e(r.kind)} ({sampled})"),
                ("checked", f"{r.rows:,} rows, {r.edges:,} edges"),
                ("time span", f"{_t(r.start_ps)} to {_t(r.end_ps)}"),
                ("channels", ", ".join(_e(c) for c in r.channels)),
                ("bridge (leg = high / low)", bridge or "–"),
            ]
            + (
                [("not checked (in no leg)", ", ".join(_e(c) for c in r.unchecked_channels))]
                if r.unchecked_channels
                else []
            )
        )
    )
    parts.append(_leg_table(r, n, legs))
    not_proven = sum(d.not_proven for s in r.leg_stats for d in (s.high_to_low, s.low_to_high))
    if not_proven:
        parts.append(
            f'<p class="note">{not_proven} clean hand-over(s) not proven at this sample rate.</p>'
        )
    parts.append(f"<h3>Findings ({len(r.findings)})</h3>")
    diagrams = figures.diagrams if figures else {}
    if r.findings:
        parts.append(
            f'<table class="findings" id="findings-{n}"><tr><th>time</th><th>rule</th><th>leg</th>'
            "<th>measured</th><th>required</th><th>margin</th><th>what</th><th>where</th></tr>"
        )
        parts += [
            _finding_row(f, f"d-{n}-{k}" if (n, k) in diagrams else None)
            for k, f in enumerate(r.findings)
        ]
        parts.append("</table>")
        for k, _f in enumerate(r.findings):
            pic = diagrams.get((n, k))
            if pic is not None:
                parts.append(
                    f'<figure id="d-{n}-{k}">{pic.svg}<figcaption>{_e(pic.caption)}</figcaption>'
                    "</figure>"
                )
    else:
        parts.append('<p class="note">No findings.</p>')
    for rule, count in r.unlisted_by_rule().items():
        parts.append(
            f'<p class="note">{count:,} more {_e(rule)} violation(s) not listed '
            "(see --max-findings).</p>"
        )
    hists = figures.histograms.get(n, ()) if figures else ()
    if hists:
        parts.append("<h3>Dead-time histograms</h3>")
        parts += [
            f'<figure class="histogram">{p.svg}<figcaption>{_e(p.caption)}</figcaption></figure>'
            for p in hists
        ]
    parts.append("</section>")
    return "".join(parts)


def _settings(report: Report) -> str:
    s = report.settings
    items = []
    if "dead_time_ps" in s:
        dead = s["dead_time_ps"]
        items.append(("required dead time", "not set" if dead is None else _t(int(dead))))
    if s.get("legs"):
        items.append(("legs given", ", ".join(_e(x) for x in s["legs"])))
    if s.get("active_low"):
        items.append(("active-low channels", ", ".join(_e(x) for x in s["active_low"])))
    return _facts(items) if items else ""


def _pictures_note(figures: Figures | None, total: int) -> str:
    if figures is None:
        if total:
            return '<p class="note">Diagrams were not drawn for this report.</p>'
        return ""
    lines = []
    left = sum(figures.left_out.values())
    if left:
        per_rule = ", ".join(f"{_e(k)} {v}" for k, v in sorted(figures.left_out.items()))
        lines.append(
            f'<p class="note" id="left-out">{left} finding(s) shown without a diagram '
            f"(at most {figures.limit} diagrams per rule): {per_rule}.</p>"
        )
    lines += [f'<p class="note">{_e(t)}</p>' for t in figures.notes]
    return "".join(lines)


def render_html(
    report: Report, *, figures: Figures | None = None, title: str = "Gate-sequence check"
) -> str:
    """The report as one HTML page; ``figures`` is a ``sequencecheck.plots.Figures``."""
    violations = report.violations
    if violations:
        by_rule = ", ".join(f"{_e(k)} {v}" for k, v in sorted(report.by_rule().items()))
        verdict = f'<p class="verdict bad">{report.violation_count} violation(s): {by_rule}</p>'
    else:
        verdict = '<p class="verdict ok">No violations</p>'
    failed = (
        f'<p class="error">{len(report.errors)} input(s) could not be checked.</p>'
        if report.errors
        else ""
    )
    sections = "".join(_input_section(r, n, figures) for n, r in enumerate(report.inputs))
    return (
        "<!DOCTYPE html>\n"
        '<html lang="en"><head><meta charset="utf-8">'
        f'<meta http-equiv="Content-Security-Policy" content="{_CSP}">'
        '<meta name="viewport" content="width=device-width, initial-scale=1">'
        f"<title>{_e(title)}</title><style>{_STYLE}</style></head><body>"
        f"<header><h1>{_e(title)}</h1>{verdict}{failed}"
        f'<div class="caution" role="note"><strong>Caution.</strong> {_e(CAUTION)}</div>'
        f"{_settings(report)}{_pictures_note(figures, len(report.findings))}</header>"
        f"<main>{sections}</main>"
        f"<footer>sequencecheck {_e(__version__)}; times are exact, in engineering units."
        "</footer></body></html>\n"
    )

"""Text report for people: a per-leg summary table, then findings in time order.

Every string that comes from an input (paths, channel, leg and state names, messages)
passes through ``printable``: control characters print as escapes such as ``\\x1b``,
so a name cannot move the cursor or clear the terminal.
"""

from __future__ import annotations

from .._printable import printable as _p
from ..findings import Certainty, DirectionStats, Finding, InputReport, Report
from ..units import format_time
from ._files import file_summary_lines
from ._states import states_lines

__all__ = ["render_text"]

_RED, _YELLOW, _GREEN, _BOLD, _RESET = "\x1b[31m", "\x1b[33m", "\x1b[32m", "\x1b[1m", "\x1b[0m"


class _Paint:
    def __init__(self, colour: bool) -> None:
        self.colour = colour

    def __call__(self, code: str, text: str) -> str:
        return f"{code}{text}{_RESET}" if self.colour else text


def _table(rows: list[list[str]]) -> list[str]:
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    out = []
    for n, row in enumerate(rows):
        out.append("  " + "  ".join(c.ljust(w) for c, w in zip(row, widths, strict=True)).rstrip())
        if n == 0:
            out.append("  " + "  ".join("-" * w for w in widths))
    return out


def _direction(d: DirectionStats) -> tuple[str, str]:
    if d.count == 0 or d.min_gap_ps is None:
        return "0", "-"
    at = f"{format_time(d.min_gap_ps)} @ {format_time(d.min_gap_at_ps or 0)}"
    return str(d.count), at


#: What one unit of Trace.rows is called, per input kind.
_ROW_NOUN = {"table": "lines", "vcd": "value changes", "recorder": "recorder calls"}


def _where(f: Finding) -> str:
    """``(path:22; also line 21)``: the input line to fix first (the latest edge), then
    the lines of the other edges involved."""
    located = [s for s in f.sources if s.line]
    if not located:
        return ""
    main = located[-1]
    others = [str(s.line) if s.path == main.path else _p(s) for s in located[:-1] if s != main]
    also = f"; also line {', '.join(others)}" if others else ""
    return f"  ({_p(main)}{also})"


def _finding_line(f: Finding, paint: _Paint) -> str:
    where = _where(f)
    margin = "" if f.margin_ps is None else f"  margin {format_time(f.margin_ps)}"
    tag = "" if f.certainty is Certainty.PROVEN else "  [inconclusive at this sample rate]"
    colour = _RED if f.is_violation else _YELLOW
    return f"  {format_time(f.start_ps):>16}  {paint(colour, _p(f.rule))}  {_p(f.message)}{margin}{tag}{where}"


def _margin_table(r: InputReport) -> list[str]:
    """Worst margin per leg and rule (signed: negative is violated), commanded and effective."""
    cells: dict[tuple[str, str], dict[str, str]] = {}
    for m in r.margins:
        cells.setdefault((m.leg, m.rule), {})[m.kind] = (
            f"{format_time(m.margin_ps)} @ {format_time(m.at_ps)}"
        )
    kinds = ["commanded", *sorted({m.kind for m in r.margins} - {"commanded"})]
    rows = [["worst margin", "rule", *kinds]]
    leg_order = {name: i for i, name in enumerate(r.legs)}
    for (leg, rule), by_kind in sorted(cells.items(), key=lambda c: leg_order.get(c[0][0], 0)):
        rows.append([f"leg {_p(leg)}", _p(rule), *(by_kind.get(k, "-") for k in kinds)])
    return _table(rows)


def _input_block(r: InputReport, paint: _Paint) -> list[str]:
    if r.error is not None:
        return [paint(_BOLD, _p(r.input)), f"  {paint(_RED, 'not checked')}: {_p(r.error)}", ""]
    sampled = f", sample period {format_time(r.sample_period_ps)}" if r.sample_period_ps else ""
    lines = [
        paint(_BOLD, _p(r.input)),
        f"  checked {r.rows:,} {_ROW_NOUN.get(r.kind, 'rows')}, {r.edges:,} edges, {format_time(r.start_ps)} to "
        f"{format_time(r.end_ps)} ({_p(r.kind)}{sampled}); channels: {_p(', '.join(r.channels))}",
    ]
    if r.leg_channels:
        legs = ", ".join(f"{leg} = {hi} / {lo}" for leg, (hi, lo) in r.leg_channels.items())
        lines.append(f"  legs: {_p(legs)}")
    if r.unchecked_channels:
        unchecked = _p(", ".join(r.unchecked_channels))
        lines.append(paint(_YELLOW, f"  not checked (in no leg): {unchecked}"))
    if r.leg_stats:
        rows = [
            [
                "leg",
                "high->low",
                "min dead time (high off -> low on)",
                "low->high",
                "min dead time (low off -> high on)",
                "violations",
            ]
        ]
        for s in r.leg_stats:
            n_hl, m_hl = _direction(s.high_to_low)
            n_lh, m_lh = _direction(s.low_to_high)
            count = sum(1 for f in r.violations if f.leg == s.leg)
            count += sum(n for (_rule, leg), n in r.unlisted.items() if leg == s.leg)
            rows.append([_p(s.leg), n_hl, m_hl, n_lh, m_lh, str(count)])
        lines += _table(rows)
    if r.margins:
        lines += _margin_table(r)
    if isinstance(r.extra.get("caution"), str):  # set by rules that judge hardware
        lines.append(paint(_YELLOW, f"  {r.extra['caution']}"))
    not_proven = sum(d.not_proven for s in r.leg_stats for d in (s.high_to_low, s.low_to_high))
    if not_proven:
        lines.append(
            paint(_YELLOW, f"  {not_proven} clean hand-over(s) not proven at this sample rate")
        )
    if r.findings:
        lines.append("  findings:")
        lines += [_finding_line(f, paint) for f in r.findings]
    for rule, n in r.unlisted_by_rule().items():
        lines.append(
            paint(_YELLOW, f"  {n:,} more {_p(rule)} violation(s) not listed (see --max-findings)")
        )
    lines += [_p(line) for line in states_lines(r)]
    lines.append("")
    return lines


def render_text(report: Report, *, colour: bool = False) -> str:
    paint = _Paint(colour)
    lines: list[str] = []
    for r in report.inputs:
        lines += _input_block(r, paint)
    if len(report.inputs) > 1:
        lines += file_summary_lines(report)
    violations = report.violation_count
    by_rule = ", ".join(f"{k} {v}" for k, v in sorted(report.by_rule().items()))
    n_in = len(report.inputs)
    if violations:
        verdict = paint(_RED, f"{violations} violation(s)") + f" ({_p(by_rule)})"
    else:
        verdict = paint(_GREEN, "no violations")
    failed = f"; {len(report.errors)} input(s) could not be checked" if report.errors else ""
    n_warn = sum(len(r.warnings) for r in report.inputs)
    if n_warn:
        failed += "; " + paint(_YELLOW, f"{n_warn} warning(s)")
    lines.append(f"{verdict} in {n_in} input(s){failed}")
    return "\n".join(lines) + "\n"

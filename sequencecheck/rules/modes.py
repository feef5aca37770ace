"""mode-transition: changes of the decoded bridge state checked against a transition policy.

How each check measures (times from the decoding in _states.py):

- Forbidden change: on the merged timeline (hand-over gaps held), each change of
  state the policy forbids. [start, end] runs from the end of the old state as
  decoded exactly to the start of the new one, so it spans the hand-over.
- Dwell between two states (``from -> to`` with a minimum dwell; under
  sign-magnitude PWM, the reversal dwell): on the raw timeline, at each entry into
  ``to`` that follows a visit of ``from`` with no ``to`` in between, measured =
  entry time minus the end of that visit of ``from``. For a reversal, start = end of
  the last drive state, end = start of the opposite drive state.
- Dwell in a state: each visit (merged timeline) shorter than the minimum; visits cut
  by the window's start or end are not judged.
- Locked anti-phase PWM: forward and reverse alternate every period by design, so a
  period runs from one entry into ``forward`` to the next and its direction is the sign
  of duty minus 50 % (duty = time in forward / time in forward or reverse); periods
  within the neutral band around 50 % have no direction. A reversal is a change of
  direction between two periods that have one; start = end of the last drive
  segment (forward or reverse) of the last period of the old direction, end = start of
  the first period of the new one. The time between is the time spent near 50 %.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ..findings import Certainty, Finding, WorstMargin
from ..model import Source, TransitionPolicy
from ..units import format_time
from ._base import CheckContext, Rule, RuleResult
from ._grouped import sum_by
from ._states import StateNamer, StateTimeline, decode
from ._transitions import CompiledPolicy, compile_policy

__all__ = ["MODE_TRANSITION", "lap_periods", "state_summary", "timeline"]


def timeline(ctx: CheckContext) -> StateTimeline:
    """The decoded states of the context's trace (computed once per run)."""
    key = ("states",)
    if key not in ctx.cache:
        tp = ctx.policy.transitions
        handover = tp.handover_max_ps if isinstance(tp, TransitionPolicy) else None
        ctx.cache[key] = decode(ctx.trace, ctx.bridge, handover)
    return ctx.cache[key]


def state_summary(tl: StateTimeline, policy: CompiledPolicy | None = None) -> dict[str, Any]:
    """Time and visits per state and the transition-count matrix (merged timeline)."""
    seg = tl.merged
    dur = seg.ends - seg.starts
    n = len(tl.names)
    time = sum_by(seg.states, dur, n)
    visits = np.bincount(seg.states, minlength=n)
    exact = sum_by(tl.raw.states, tl.raw.ends - tl.raw.starts, n)
    counts = np.zeros((n, n), dtype=np.int64)
    if len(seg) > 1:
        pairs = seg.states[:-1].astype(np.int64) * n + seg.states[1:]
        counts = np.bincount(pairs, minlength=n * n).astype(np.int64).reshape(n, n)
    seen = [i for i in range(n) if visits[i] or exact[i]]
    total = int(dur.sum())
    return {
        "states": [
            {
                "state": tl.names[i],
                "visits": int(visits[i]),
                "time_ps": int(time[i]),
                "time_s": int(time[i]) / 1e12,
                "share": (int(time[i]) / total) if total else 0.0,
                "exact_time_ps": int(exact[i]),
            }
            for i in seen
        ],
        "names": [tl.names[i] for i in seen],
        "matrix": [[int(counts[i, j]) for j in seen] for i in seen],
        "changes": int(max(len(seg) - 1, 0)),
        "handover_max_ps": tl.handover_max_ps,
        "scheme": None if policy is None else policy.scheme,
    }


def _sources(ctx: CheckContext, *times: int) -> tuple[Source, ...]:
    out = []
    for t in times:
        for ch in ctx.bridge.channels:
            line = ctx.trace.channel(ch).line_of_edge_at(t)
            if line:
                out.append(Source(ctx.trace.path, line))
                break
    return tuple(out)


def _finding(
    ctx: CheckContext,
    start: int,
    end: int,
    required: int | None,
    src: str,
    dst: str,
    message: str,
    kind: str,
) -> Finding:
    ts = ctx.trace.sample_period_ps
    measured = end - start
    proven = required is None or ts is None or measured + ts <= required
    note = "" if proven else " (inconclusive at this sample rate)"
    return Finding(
        rule="mode-transition",
        leg=None,
        channels=ctx.bridge.channels,
        start_ps=start,
        end_ps=end,
        measured_ps=measured,
        required_ps=required,
        input=ctx.trace.path,
        message=message + note,
        certainty=Certainty.PROVEN if proven else Certainty.INCONCLUSIVE,
        bounds_ps=None if ts is None else (max(measured - ts, 0), measured + ts),
        sources=_sources(ctx, start, end),
        detail={"from": src, "to": dst, "check": kind},
    )


def _forbidden(
    ctx: CheckContext, tl: StateTimeline, cp: CompiledPolicy, result: RuleResult
) -> list[Finding]:
    seg = tl.merged
    if len(seg) < 2:
        return []
    if not cp.forbidden.any():  # nothing forbidden: no pass over the changes
        return []
    a, b = seg.states[:-1], seg.states[1:]
    bad = np.flatnonzero(cp.forbidden[a, b])
    out = []
    for i in result.listed(ctx, "mode-transition", None, bad).tolist():
        src, dst = tl.names[int(a[i])], tl.names[int(b[i])]
        start, end = int(seg.core_ends[i]), int(seg.core_starts[i + 1])
        out.append(
            _finding(
                ctx,
                start,
                end,
                None,
                src,
                dst,
                f"forbidden change {src} -> {dst}",
                "forbidden",
            )
        )
    return out


def dwell_between(states: np.ndarray, from_id: int, to_id: int) -> tuple[np.ndarray, np.ndarray]:
    """Indices (entries into ``to_id``, the visit of ``from_id`` each follows) of every
    entry into ``to_id`` preceded by a visit of ``from_id`` more recent than any ``to_id``."""
    m = states.size
    idx = np.arange(m)
    last_from = np.maximum.accumulate(np.where(states == from_id, idx, -1))
    last_to = np.maximum.accumulate(np.where(states == to_id, idx, -1))
    entries = np.flatnonzero(states[1:] == to_id) + 1
    f = last_from[entries - 1]
    t = last_to[entries - 1]
    keep = (f >= 0) & (f > t)
    return entries[keep], f[keep]


def _dwells(
    ctx: CheckContext, tl: StateTimeline, cp: CompiledPolicy, result: RuleResult
) -> list[Finding]:
    seg = tl.raw
    out = []
    worst: WorstMargin | None = None
    for rule in cp.dwell_rules:
        fi, ti = tl.index(rule.from_state), tl.index(rule.to_state)
        if fi is None or ti is None or len(seg) < 2:
            continue
        entries, visits = dwell_between(seg.states, fi, ti)
        if entries.size == 0:
            continue
        gaps = seg.starts[entries] - seg.ends[visits]
        k = int(np.argmin(gaps))
        margin = int(gaps[k]) - rule.min_dwell_ps
        if worst is None or margin < worst.margin_ps:
            at = int(seg.starts[entries[k]])
            worst = WorstMargin(
                "mode-transition", "bridge", margin, at, int(gaps[k]), rule.min_dwell_ps
            )
        short = np.flatnonzero(gaps < rule.min_dwell_ps)
        for n in result.listed(ctx, "mode-transition", None, short).tolist():
            start, end = int(seg.ends[visits[n]]), int(seg.starts[entries[n]])
            out.append(
                _finding(
                    ctx,
                    start,
                    end,
                    rule.min_dwell_ps,
                    rule.from_state,
                    rule.to_state,
                    (
                        f"reversal {rule.from_state} -> {rule.to_state} with "
                        f"{format_time(end - start)} in brake/coast between; needs "
                        f"{format_time(rule.min_dwell_ps)} (reversal dwell)"
                    )
                    if rule.reversal
                    else (
                        f"{rule.from_state} -> {rule.to_state} after {format_time(end - start)} "
                        f"between them; needs {format_time(rule.min_dwell_ps)}"
                    ),
                    "reversal-dwell" if rule.reversal else "dwell-between",
                )
            )
    if worst is not None:
        result.margins.append(worst)
    return out


def _dwell_in(
    ctx: CheckContext, tl: StateTimeline, cp: CompiledPolicy, result: RuleResult
) -> list[Finding]:
    seg = tl.merged
    out = []
    for name, need in cp.min_dwell_in.items():
        si = tl.index(name)
        if si is None or len(seg) < 3:
            continue
        inner = np.arange(1, len(seg) - 1)  # visits cut by the window are not judged
        dur = seg.ends[inner] - seg.starts[inner]
        bad = inner[(seg.states[inner] == si) & (dur < need)]
        for i in result.listed(ctx, "mode-transition", None, bad).tolist():
            start, end = int(seg.starts[i]), int(seg.ends[i])
            nxt = tl.names[int(seg.states[i + 1])]
            out.append(
                _finding(
                    ctx,
                    start,
                    end,
                    need,
                    name,
                    nxt,
                    f"left {name} for {nxt} after {format_time(end - start)}; "
                    f"needs {format_time(need)} in {name}",
                    "dwell-in",
                )
            )
    return out


def lap_periods(
    tl: StateTimeline, band_ppm: int
) -> tuple[np.ndarray, np.ndarray, np.ndarray] | None:
    """Locked anti-phase periods: (start, end of last drive segment, direction +1/0/-1).

    None when the bridge has no ``forward`` or ``reverse`` state.
    """
    fi, ri = tl.index("forward"), tl.index("reverse")
    seg = tl.raw
    if fi is None or ri is None or len(seg) == 0:
        return None
    starts = seg.starts[seg.states == fi]
    if starts.size == 0 or starts[0] != seg.starts[0]:
        starts = np.concatenate(([seg.starts[0]], starts))
    period = np.searchsorted(starts, seg.starts, side="right") - 1
    dur = seg.ends - seg.starts
    is_f, is_r = seg.states == fi, seg.states == ri
    fwd = sum_by(period[is_f], dur[is_f], starts.size)
    rev = sum_by(period[is_r], dur[is_r], starts.size)
    drive_end = np.full(starts.size, -1, dtype=np.int64)
    drive = is_f | is_r
    # periods and ends both rise with time: a period's latest end is its last one
    in_period, drive_ends = period[drive], seg.ends[drive]
    last = np.ones(in_period.size, dtype=bool)
    np.not_equal(in_period[1:], in_period[:-1], out=last[:-1])
    drive_end[in_period[last]] = np.maximum(drive_ends[last], -1)
    # |duty - 1/2| <= band  <=>  |fwd - rev| * 1e6 <= 2 * band * (fwd + rev), in exact ints
    diff, total = np.abs(fwd - rev), fwd + rev
    if total.size and int(total.max()) > 4_000_000_000_000:  # over 4 s: int64 could overflow
        near = np.array(
            [
                int(d) * 1_000_000 <= 2 * band_ppm * int(t)
                for d, t in zip(diff.tolist(), total.tolist(), strict=True)
            ],
            dtype=bool,
        )
    else:
        near = diff * 1_000_000 <= 2 * band_ppm * total
    direction = np.where(near, 0, np.sign(fwd - rev)).astype(np.int8)
    return starts, drive_end, direction


def _lap_reversals(
    ctx: CheckContext, tl: StateTimeline, cp: CompiledPolicy, result: RuleResult
) -> list[Finding]:
    need = cp.reversal_dwell_ps
    found = lap_periods(tl, cp.neutral_band_ppm) if need is not None else None
    if need is None or found is None:
        return []
    starts, drive_end, direction = found
    nz = np.flatnonzero(direction != 0)
    if nz.size < 2:
        return []
    flips = np.flatnonzero(direction[nz[1:]] != direction[nz[:-1]])
    old, new = nz[flips], nz[flips + 1]
    gaps = starts[new] - drive_end[old]
    out = []
    if gaps.size:
        k = int(np.argmin(gaps))
        result.margins.append(
            WorstMargin(
                "mode-transition",
                "bridge",
                int(gaps[k]) - need,
                int(starts[new[k]]),
                int(gaps[k]),
                need,
            )
        )
    short = np.flatnonzero(gaps < need)
    for n in result.listed(ctx, "mode-transition", None, short).tolist():
        src = "forward" if direction[old[n]] > 0 else "reverse"
        dst = "reverse" if src == "forward" else "forward"
        start, end = int(drive_end[old[n]]), int(starts[new[n]])
        out.append(
            _finding(
                ctx,
                start,
                end,
                need,
                src,
                dst,
                f"duty crossed 50 % ({src} -> {dst}) after {format_time(end - start)} near "
                f"50 %; needs {format_time(need)}",
                "reversal-duty",
            )
        )
    return out


#: Up to this many legs every state name is known without decoding the trace.
_NAMES_WITHOUT_DECODING = 8


def _check_mode_transition(ctx: CheckContext) -> RuleResult:
    result = RuleResult()
    n_legs = len(ctx.bridge.legs)
    if 0 < n_legs <= _NAMES_WITHOUT_DECODING and not ctx.policy.state_summary:
        names = StateNamer(ctx.bridge).possible_names()  # also checks the bridge's modes
        if not compile_policy(ctx.policy, names, n_legs).checks_anything():
            return result  # no change of state can break the policy: nothing to decode
    tl = timeline(ctx)
    cp = compile_policy(ctx.policy, tl.names, n_legs)
    findings = _forbidden(ctx, tl, cp, result)
    findings += _dwells(ctx, tl, cp, result)
    findings += _dwell_in(ctx, tl, cp, result)
    findings += _lap_reversals(ctx, tl, cp, result)
    findings.sort(key=lambda f: (f.start_ps, f.end_ps))
    result.findings = findings
    if ctx.policy.state_summary:
        result.extra["states"] = state_summary(tl, cp)
    return result


MODE_TRANSITION = Rule(
    id="mode-transition",
    family="modes",
    summary="A change of bridge state the transition policy forbids, or too short a dwell.",
    help=(
        "Pass through brake or coast for at least the reversal dwell before driving the other "
        "way, and keep each state as long as the policy asks; check the PWM scheme the policy "
        "names matches the controller's."
    ),
    check=_check_mode_transition,
)

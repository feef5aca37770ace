"""Decoding switch states into named bridge states, over the whole trace at once.

Every instant of the observed window gets a bridge state. The window is cut at
every edge of every bridge channel into elementary segments; numpy finds each
channel's level on each segment, then each leg's code:

    off (neither switch on), high, low, both (a fault), unknown (an X/Z level)

The legs' codes form one integer per segment, and each distinct integer is named
once (Python work is per distinct combination, never per segment).

Names, in order of precedence:

- ``unknown``: some switch of the bridge has an X or Z level;
- ``fault``: some leg has both switches on (shoot-through reports it);
- the first user mode (``Bridge.modes``) whose expression holds;
- the defaults: ``coast`` when every switch is off; for two legs (A then B)
  ``forward`` (A high, B low), ``reverse`` (A low, B high), ``brake-low``,
  ``brake-high`` and ``partial-<leg>-<side>`` when one switch only is on; for three
  legs the switching vectors ``V0``..``V7`` (S_a S_b S_c, 1 = high side on:
  V0 000, V1 100, V2 110, V3 010, V4 011, V5 001, V6 101, V7 111) and
  ``open-<pattern>`` when one or two legs are off, the pattern giving each leg as
  ``1`` (high), ``0`` (low) or ``_`` (off), e.g. ``open-1_0``; for one leg
  ``high``/``low``; for other leg counts ``s-<pattern>``.

Hand-overs: a leg's hand-over gap is a maximal stretch with both its switches off,
after one of them was on and before the other turns on, no longer than
``handover_max_ps``. Every instant inside some leg's hand-over gap keeps the state
in force just before the gap, so dead time never shows up as a state (or a mode
change) of its own: the change happens when the last incoming switch turns on.
This gives two timelines: ``raw`` (states exactly as decoded) and ``merged``
(hand-over gaps folded into the state before them). Mode changes are counted on
``merged``; dwell between two states is measured on ``raw``.
"""

from __future__ import annotations

import itertools
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..model import All, Any_, Bridge, Const, Level, Mode, Not, Side, SwitchOn, Trace

__all__ = [
    "COAST",
    "DEFAULT_HANDOVER_MAX_PS",
    "FAULT",
    "LEG_BOTH",
    "LEG_HIGH",
    "LEG_LOW",
    "LEG_OFF",
    "LEG_UNKNOWN",
    "UNKNOWN",
    "VECTORS",
    "Segments",
    "StateNamer",
    "StateTimeline",
    "decode",
    "evaluate",
    "handover_gaps",
    "leg_codes",
]

LEG_OFF, LEG_HIGH, LEG_LOW, LEG_BOTH, LEG_UNKNOWN = 0, 1, 2, 3, 4
_BASE = 5  # leg codes per leg: one base-5 digit per leg in a segment's combination code

FAULT, UNKNOWN, COAST = "fault", "unknown", "coast"

#: Default longest hand-over gap: the upper end of IGBT-leg dead times (facts.md section 1).
DEFAULT_HANDOVER_MAX_PS = 5_000_000

#: Switching vectors of a two-level three-phase inverter, (S_a, S_b, S_c) -> number.
VECTORS: dict[tuple[int, int, int], int] = {
    (0, 0, 0): 0,
    (1, 0, 0): 1,
    (1, 1, 0): 2,
    (0, 1, 0): 3,
    (0, 1, 1): 4,
    (0, 0, 1): 5,
    (1, 0, 1): 6,
    (1, 1, 1): 7,
}

_PATTERN = {LEG_HIGH: "1", LEG_LOW: "0", LEG_OFF: "_"}


def _mode_error(message: str, mode: Mode, bridge: Bridge) -> InputError:
    src = mode.source
    if src is not None:
        return InputError(message, path=src.path, line=src.line, column=src.column)
    return InputError(message, path=bridge.source)


def evaluate(expr: object, codes: Sequence[int], legs: dict[str, int]) -> bool:
    """Truth of a mode expression for one combination of leg codes (never eval'd)."""
    if isinstance(expr, SwitchOn):
        code = codes[legs[expr.leg]]
        if expr.side is Side.HIGH or expr.side == "high":
            return code in (LEG_HIGH, LEG_BOTH)
        return code in (LEG_LOW, LEG_BOTH)
    if isinstance(expr, Not):
        return not evaluate(expr.operand, codes, legs)
    if isinstance(expr, All):
        return all(evaluate(e, codes, legs) for e in expr.operands)
    if isinstance(expr, Any_):
        return any(evaluate(e, codes, legs) for e in expr.operands)
    if isinstance(expr, Const):
        return bool(expr.value)
    raise TypeError(f"not a mode expression: {expr!r}")


def _legs_named(expr: object) -> set[str]:
    if isinstance(expr, SwitchOn):
        return {expr.leg}
    if isinstance(expr, Not):
        return _legs_named(expr.operand)
    if isinstance(expr, All | Any_):
        return set().union(*(_legs_named(e) for e in expr.operands)) if expr.operands else set()
    return set()


class StateNamer:
    """Names combinations of leg codes; checks the bridge's user modes once."""

    def __init__(self, bridge: Bridge) -> None:
        self.bridge = bridge
        self.leg_names = [leg.name for leg in bridge.legs]
        self.leg_index = {name: i for i, name in enumerate(self.leg_names)}
        self.modes: tuple[Mode, ...] = tuple(bridge.modes)  # type: ignore[arg-type]
        self._check_modes()
        self._cache: dict[tuple[int, ...], str] = {}

    def _check_modes(self) -> None:
        seen: set[str] = set()
        for mode in self.modes:
            if not isinstance(mode, Mode):
                raise InputError(f"not a mode: {mode!r}", path=self.bridge.source)
            if mode.name in (FAULT, UNKNOWN, "*") or not mode.name:
                raise _mode_error(
                    f"mode {mode.name!r}: the name is reserved (fault, unknown, *) or empty",
                    mode,
                    self.bridge,
                )
            if mode.name in seen:
                raise _mode_error(f"mode {mode.name!r} is defined twice", mode, self.bridge)
            seen.add(mode.name)
            named = _legs_named(mode.expr)
            unknown = sorted(named - set(self.leg_index))
            if unknown:
                raise _mode_error(
                    f"mode {mode.name!r} names leg {unknown[0]!r}, which the bridge does not have "
                    f"(legs: {', '.join(self.leg_names)})",
                    mode,
                    self.bridge,
                )
            if not self._satisfiable(mode, sorted(named)):
                raise _mode_error(
                    f"mode {mode.name!r} matches no possible state (no combination of switch "
                    "states without a leg fully on makes it true)",
                    mode,
                    self.bridge,
                )

    def _satisfiable(self, mode: Mode, named: list[str]) -> bool:
        codes = [LEG_OFF] * len(self.leg_names)
        for combo in itertools.product((LEG_OFF, LEG_HIGH, LEG_LOW), repeat=len(named)):
            for leg, code in zip(named, combo, strict=True):
                codes[self.leg_index[leg]] = code
            if evaluate(mode.expr, codes, self.leg_index):
                return True
        return False

    def name(self, codes: tuple[int, ...]) -> str:
        """The state name of one combination of leg codes."""
        found = self._cache.get(codes)
        if found is None:
            found = self._cache[codes] = self._name(codes)
        return found

    def _name(self, codes: tuple[int, ...]) -> str:
        if LEG_UNKNOWN in codes:
            return UNKNOWN
        if LEG_BOTH in codes:
            return FAULT
        for mode in self.modes:
            if evaluate(mode.expr, codes, self.leg_index):
                return mode.name
        return self.default_name(codes)

    def default_name(self, codes: tuple[int, ...]) -> str:
        if all(c == LEG_OFF for c in codes):
            return COAST
        n = len(codes)
        if n == 2:
            named = {
                (LEG_HIGH, LEG_LOW): "forward",
                (LEG_LOW, LEG_HIGH): "reverse",
                (LEG_LOW, LEG_LOW): "brake-low",
                (LEG_HIGH, LEG_HIGH): "brake-high",
            }
            if codes in named:
                return named[codes]
            on = [i for i, c in enumerate(codes) if c != LEG_OFF]
            side = "high" if codes[on[0]] == LEG_HIGH else "low"
            return f"partial-{self.leg_names[on[0]]}-{side}"
        if n == 1:
            return "high" if codes[0] == LEG_HIGH else "low"
        pattern = "".join(_PATTERN[c] for c in codes)
        if n == 3:
            if LEG_OFF in codes:
                return f"open-{pattern}"
            return f"V{VECTORS[tuple(1 if c == LEG_HIGH else 0 for c in codes)]}"  # type: ignore[index]
        return f"s-{pattern}"

    def possible_names(self) -> tuple[str, ...]:
        """Every state name the bridge can be in, in a stable order (defaults first by kind)."""
        n = len(self.leg_names)
        names: list[str] = []
        if n <= 8:
            combos = itertools.product((LEG_OFF, LEG_HIGH, LEG_LOW), repeat=n)
            found = {self.name(tuple(c)) for c in combos}
        else:  # too many to enumerate: user modes plus the names seen so far
            found = {m.name for m in self.modes} | set(self._cache.values())
        found |= {FAULT, UNKNOWN}
        for name in self.canonical_order():
            if name in found and name not in names:
                names.append(name)
        names += sorted(found - set(names))
        return tuple(names)

    def canonical_order(self) -> list[str]:
        order = [m.name for m in self.modes]
        if len(self.leg_names) == 2:
            order += ["forward", "reverse", "brake-low", "brake-high", COAST]
        elif len(self.leg_names) == 3:
            order += [f"V{k}" for k in range(8)] + [COAST]
        elif len(self.leg_names) == 1:
            order += ["high", "low", COAST]
        return order


@dataclass(frozen=True, slots=True)
class Segments:
    """Consecutive states: ``[starts[i], ends[i])`` spent in ``names[states[i]]``.

    ``core_starts``/``core_ends`` bound the part of each segment where the state was
    decoded exactly (not held across a hand-over gap); they equal the segment where
    no such part exists.
    """

    starts: np.ndarray
    ends: np.ndarray
    states: np.ndarray
    core_starts: np.ndarray
    core_ends: np.ndarray

    def __len__(self) -> int:
        return int(self.starts.size)


@dataclass(frozen=True)
class StateTimeline:
    """The decoded states of one trace: exact (``raw``) and with hand-overs folded (``merged``)."""

    names: tuple[str, ...]
    raw: Segments
    merged: Segments
    handover_max_ps: int

    def index(self, name: str) -> int | None:
        try:
            return self.names.index(name)
        except ValueError:
            return None


def _sorted_unique(a: np.ndarray) -> np.ndarray:
    """Sorted distinct values (a sort and a diff: faster here than np.unique's hashing)."""
    a = np.sort(a, kind="stable")
    if a.size < 2:
        return a
    keep = np.empty(a.size, dtype=bool)
    keep[0] = True
    np.not_equal(a[1:], a[:-1], out=keep[1:])
    return a[keep]


def _elementary(trace: Trace, channels: Sequence[str]) -> tuple[np.ndarray, np.ndarray]:
    """Cut the window at every edge of ``channels``: segment starts and ends."""
    start, end = trace.start_ps, trace.end_ps
    parts = [trace.channel(c).times for c in channels]
    cuts = _sorted_unique(np.concatenate(parts)) if parts else np.empty(0, dtype=np.int64)
    cuts = cuts[(cuts > start) & (cuts < end)]
    starts = np.concatenate(([start], cuts)).astype(np.int64, copy=False)
    ends = np.concatenate((cuts, [end])).astype(np.int64, copy=False)
    return starts, ends


def _levels_at(trace: Trace, channel: str, starts: np.ndarray) -> np.ndarray:
    """The channel's level on each segment; every edge inside the window starts a segment."""
    ch = trace.channel(channel)
    # the first segment each edge is in force on: edges before the window act on the
    # first segment, edges at or after its end on none
    pos = np.maximum(np.searchsorted(starts, ch.times, side="right") - 1, 0)
    edge = np.flatnonzero(ch.times <= starts[pos])
    at = pos[edge]
    last = np.ones(edge.size, dtype=bool)
    last[:-1] = at[:-1] != at[1:]  # of edges sharing a segment, the last wins
    src = np.zeros(starts.size, dtype=np.int64)
    src[at[last]] = edge[last] + 1
    np.maximum.accumulate(src, out=src)
    table = np.concatenate(([ch.initial], ch.levels)).astype(np.int8, copy=False)
    return table[src]


def leg_codes(trace: Trace, bridge: Bridge, starts: np.ndarray) -> np.ndarray:
    """Array (segments x legs) of leg codes on each elementary segment."""
    codes = np.empty((starts.size, len(bridge.legs)), dtype=np.int8)
    for k, leg in enumerate(bridge.legs):
        hi = _levels_at(trace, leg.high, starts)
        lo = _levels_at(trace, leg.low, starts)
        undefined = (hi >= Level.X) | (lo >= Level.X)
        code = (hi == bridge.on_level(leg.high)).astype(np.int8)
        code += 2 * (lo == bridge.on_level(leg.low)).astype(np.int8)
        code[undefined] = LEG_UNKNOWN
        codes[:, k] = code
    return codes


def _gap_runs(
    code: np.ndarray, starts: np.ndarray, ends: np.ndarray, max_gap_ps: int
) -> tuple[np.ndarray, np.ndarray]:
    """First and last elementary segment of each hand-over gap of one leg (``code``:
    the leg's code on every segment)."""
    none = np.empty(0, dtype=np.int64)
    off = code == LEG_OFF
    if not off.any():
        return none, none
    edge = np.diff(off.view(np.int8))
    run_first = np.flatnonzero(edge == 1) + 1  # off-runs preceded by a segment
    run_last = np.flatnonzero(edge == -1)  # off-runs followed by a segment
    if off[0]:
        run_last = run_last[1:]
    run_first = run_first[: run_last.size]
    if run_first.size == 0:
        return none, none
    before, after = code[run_first - 1], code[run_last + 1]
    sided = (before == LEG_HIGH) | (before == LEG_LOW)
    flip = sided & ((after == LEG_HIGH) | (after == LEG_LOW)) & (before != after)
    gap = ends[run_last] - starts[run_first]
    keep = flip & (gap <= max_gap_ps)
    return run_first[keep], run_last[keep]


def _inside_runs(m: int, firsts: list[np.ndarray], lasts: list[np.ndarray]) -> np.ndarray:
    """Mask of the ``m`` segments covered by any run ``[firsts[i], lasts[i]]``."""
    if sum(f.size for f in firsts) == 0:
        return np.zeros(m, dtype=bool)
    # one leg's runs are disjoint and never abut (a non-off segment separates them),
    # so each leg's marks land on distinct indices; at most one +1 per leg overlaps
    dtype = np.int8 if len(firsts) < 127 else np.int64
    mark = np.zeros(m + 1, dtype=dtype)
    for first, last in zip(firsts, lasts, strict=True):
        mark[first] += 1
        mark[last + 1] -= 1
    return np.cumsum(mark[:m], dtype=dtype) > 0


def handover_gaps(
    codes: np.ndarray, starts: np.ndarray, ends: np.ndarray, max_gap_ps: int
) -> np.ndarray:
    """Mask of elementary segments inside some leg's hand-over gap: a maximal stretch
    with both switches of the leg off, after one of its switches and before the other,
    no longer than ``max_gap_ps``."""
    m = codes.shape[0]
    if m < 3:
        return np.zeros(m, dtype=bool)
    firsts, lasts = [], []
    for k in range(codes.shape[1]):
        f, la = _gap_runs(np.ascontiguousarray(codes[:, k]), starts, ends, max_gap_ps)
        firsts.append(f)
        lasts.append(la)
    return _inside_runs(m, firsts, lasts)


def _combine(codes: np.ndarray) -> np.ndarray:
    weights = _BASE ** np.arange(codes.shape[1], dtype=np.int64)
    return codes.astype(np.int64) @ weights


def _runs(
    starts: np.ndarray, ends: np.ndarray, states: np.ndarray, exact: np.ndarray | None
) -> Segments:
    """Join consecutive elementary segments of equal state; ``exact`` marks those whose
    state was decoded as such (their span is the core; None: all of them)."""
    m = states.size
    if m == 0:
        e = np.empty(0, dtype=np.int64)
        return Segments(e, e, e.astype(np.int32), e, e)
    first = np.ones(m, dtype=bool)
    np.not_equal(states[1:], states[:-1], out=first[1:])
    every = bool(first.all())  # every segment its own run: no copies
    heads = np.arange(m) if every else np.flatnonzero(first)
    if every:
        run_s, run_e, run_states = starts, ends, states
        tails = heads
    else:
        tails = np.concatenate((heads[1:] - 1, [m - 1]))
        run_s, run_e, run_states = starts[heads], ends[tails], states[heads]
    core_s, core_e = run_s, run_e
    if exact is not None and not exact.all():
        core_s, core_e = run_s.copy(), run_e.copy()
        idx = np.arange(m)
        last_exact = np.maximum.accumulate(np.where(exact, idx, -1))[tails]
        first_exact = np.minimum.accumulate(np.where(exact, idx, m)[::-1])[::-1][heads]
        has = last_exact >= heads
        core_s[has] = starts[first_exact[has]]
        core_e[has] = ends[last_exact[has]]
    return Segments(run_s, run_e, run_states.astype(np.int32, copy=False), core_s, core_e)


def _held_runs(
    starts: np.ndarray, ends: np.ndarray, states: np.ndarray, inside: np.ndarray
) -> Segments:
    """``_runs`` of ``states`` with each stretch of ``inside`` segments holding the state
    before it (segment 0 is never inside). A run starts at an exact segment whose state
    differs from the last exact one; its core ends with its last exact segment."""
    exact = np.flatnonzero(~inside)
    held = states[exact]
    first = np.ones(exact.size, dtype=bool)
    np.not_equal(held[1:], held[:-1], out=first[1:])
    heads = np.flatnonzero(first)
    # runs abut: each ends where the next starts, so starts and ends are two views of one
    # buffer (the last run ends with the window)
    bounds = np.empty(heads.size + 1, dtype=np.int64)
    np.take(starts, exact[heads], out=bounds[:-1])
    bounds[-1] = ends[-1]
    run_s, run_e = bounds[:-1], bounds[1:]
    last_exact = np.empty(heads.size, dtype=np.int64)  # the last exact segment of each run
    np.subtract(heads[1:], 1, out=last_exact[:-1])
    last_exact[-1] = exact.size - 1
    core_e = ends[exact[last_exact]]
    return Segments(run_s, run_e, held[heads].astype(np.int32, copy=False), run_s, core_e)


#: Per leg of the fast decoder: 3 * high-side state + low-side state, each state
#: 0 (off), 1 (on) or 2 (undefined); a segment's key has one base-9 digit per leg.
_PAIR = 9
_FAST_MAX_LEGS = 6  # 9**6 keys: lookup tables stay small


def _switch_states(trace: Trace, bridge: Bridge, channel: str) -> np.ndarray:
    """State (0 off, 1 on, 2 undefined) of ``channel``'s switch: initially, then after each edge."""
    ch = trace.channel(channel)
    levels = np.concatenate(([ch.initial], ch.levels)).astype(np.int8, copy=False)
    state = (levels == bridge.on_level(channel)).astype(np.int32)
    state[levels >= Level.X] = 2
    return state


def _keyed_segments(trace: Trace, bridge: Bridge) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Elementary segments (starts, ends) and each one's key (``_PAIR`` digits per leg).

    One stable sort of every edge of the bridge: the key after each edge is a running
    sum of key changes, and a segment's key is the one after the last edge at its start.
    """
    start, end = trace.start_ps, trace.end_ps
    times, deltas = [], []
    key0 = 0
    for k, leg in enumerate(bridge.legs):
        for channel, weight in ((leg.high, 3 * _PAIR**k), (leg.low, _PAIR**k)):
            state = _switch_states(trace, bridge, channel)
            key0 += int(state[0]) * weight
            times.append(trace.channel(channel).times)
            deltas.append(np.diff(state) * weight)
    all_times = np.concatenate(times).astype(np.int64, copy=False)
    all_deltas = np.concatenate(deltas)
    del times, deltas, state  # free what is no longer needed before the big arrays
    order = np.argsort(all_times, kind="stable")
    n = all_times.size
    # the sorted times and keys go straight into the buffers the segments will use, and
    # are compacted there (fewer large arrays alive at once: less memory to fault in)
    bounds = np.empty(n + 2, dtype=np.int64)
    t = bounds[1 : n + 1]
    np.take(all_times, order, out=t)
    del all_times
    seg_keys = np.empty(n + 1, dtype=np.int32)  # int32: keys stay below 9**_FAST_MAX_LEGS
    keys = seg_keys[1:]
    np.take(all_deltas, order, out=keys)
    del order, all_deltas
    np.cumsum(keys, out=keys)
    keys += key0
    last = np.ones(n, dtype=bool)  # the last edge at each distinct time
    np.not_equal(t[1:], t[:-1], out=last[:-1])
    n_cuts = int(np.count_nonzero(last))
    # cut i (the i-th distinct edge time) goes to index i + 1 of one buffer: segments'
    # starts and ends are two overlapping views of it, so neither is a copy
    if n_cuts < n:  # compact in place (numpy copies the source first where they overlap)
        np.compress(last, t, out=bounds[1 : n_cuts + 1])
        np.compress(last, keys, out=seg_keys[1 : n_cuts + 1])
        bounds, seg_keys = bounds[: n_cuts + 2], seg_keys[: n_cuts + 1]
    del t, keys, last
    cut_t = bounds[1 : n_cuts + 1]
    lo = int(np.searchsorted(cut_t, start, side="right"))  # edges up to start: first segment
    hi = int(np.searchsorted(cut_t, end, side="left"))  # edges at or after end: none
    hi = max(hi, lo)
    if lo == 0:
        seg_keys[0] = key0  # else seg_keys[lo] is the key after the last edge up to start
    bounds[lo] = start
    bounds[hi + 1] = end
    starts, ends = bounds[lo : hi + 1], bounds[lo + 1 : hi + 2]
    seg_keys = seg_keys[lo : hi + 1]
    return starts, ends, seg_keys


def _key_codes(keys: np.ndarray, n_legs: int) -> np.ndarray:
    """Leg codes (keys x legs) of fast-decoder keys."""
    codes = np.empty((keys.size, n_legs), dtype=np.int8)
    for k in range(n_legs):
        pair = (keys // _PAIR**k) % _PAIR
        hi, lo = pair // 3, pair % 3
        code = (hi + 2 * lo).astype(np.int8)
        code[(hi == 2) | (lo == 2)] = LEG_UNKNOWN
        codes[:, k] = code
    return codes


def _decode_fast(trace: Trace, bridge: Bridge, namer: StateNamer, max_gap: int) -> StateTimeline:
    """``decode`` for up to ``_FAST_MAX_LEGS`` legs, through per-key lookup tables."""
    n_legs = len(bridge.legs)
    starts, ends, seg_keys = _keyed_segments(trace, bridge)
    present = np.flatnonzero(np.bincount(seg_keys, minlength=1))
    present_codes = _key_codes(present, n_legs)
    combos = _combine(present_codes)
    # name the combinations in the order the general decoder does (sorted combination codes)
    uniq = _sorted_unique(combos)
    combo_names = [namer.name(_digits(int(u), n_legs)) for u in uniq.tolist()]
    names = list(namer.possible_names())
    for nm in combo_names:
        if nm not in names:
            names.append(nm)
    by_combo = np.array([names.index(nm) for nm in combo_names], dtype=np.int32)
    size = _PAIR**n_legs
    state_of = np.zeros(size, dtype=np.int32)
    state_of[present] = by_combo[np.searchsorted(uniq, combos)]
    raw_states = state_of[seg_keys]
    m = starts.size
    inside = np.zeros(m, dtype=bool)
    if m >= 3:
        firsts, lasts = [], []
        all_codes = _key_codes(np.arange(size, dtype=np.int64), n_legs)
        for k in range(n_legs):
            code = all_codes[:, k][seg_keys]
            f, la = _gap_runs(code, starts, ends, max_gap)
            firsts.append(f)
            lasts.append(la)
        inside = _inside_runs(m, firsts, lasts)
    raw = _runs(starts, ends, raw_states, None)
    merged = _held_runs(starts, ends, raw_states, inside)
    return StateTimeline(tuple(names), raw, merged, max_gap)


def decode(trace: Trace, bridge: Bridge, handover_max_ps: int | None = None) -> StateTimeline:
    """Decode ``trace`` into bridge states (see the module docstring)."""
    namer = StateNamer(bridge)
    max_gap = DEFAULT_HANDOVER_MAX_PS if handover_max_ps is None else handover_max_ps
    if 0 < len(bridge.legs) <= _FAST_MAX_LEGS:
        return _decode_fast(trace, bridge, namer, max_gap)
    return decode_general(trace, bridge, namer, max_gap)


def decode_general(trace: Trace, bridge: Bridge, namer: StateNamer, max_gap: int) -> StateTimeline:
    """``decode`` for any number of legs: leg codes per segment, combined in base 5."""
    starts, ends = _elementary(trace, bridge.channels)
    raw_codes = leg_codes(trace, bridge, starts)
    combos = _combine(raw_codes)
    uniq = _sorted_unique(combos)
    inverse = np.searchsorted(uniq, combos)
    n_legs = len(bridge.legs)
    combo_names = [namer.name(_digits(int(u), n_legs)) for u in uniq.tolist()]
    names = list(namer.possible_names())
    for nm in combo_names:
        if nm not in names:
            names.append(nm)
    lookup = np.array([names.index(nm) for nm in combo_names], dtype=np.int32)
    raw_states = lookup[inverse.reshape(-1)]
    # each stretch inside a hand-over gap keeps the state in force just before it
    inside = handover_gaps(raw_codes, starts, ends, max_gap)
    held_from = np.where(inside, 0, np.arange(starts.size))
    np.maximum.accumulate(held_from, out=held_from)
    held_states = raw_states[held_from]
    raw = _runs(starts, ends, raw_states, np.ones(starts.size, dtype=bool))
    merged = _runs(starts, ends, held_states, ~inside)
    return StateTimeline(tuple(names), raw, merged, max_gap)


def _digits(combo: int, n: int) -> tuple[int, ...]:
    out = []
    for _ in range(n):
        combo, d = divmod(combo, _BASE)
        out.append(d)
    return tuple(out)

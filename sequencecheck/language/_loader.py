"""Load a bridge description or a table: parse line by line, check meaning, build the model.

One ``_Loader`` reads one file (and the files it includes). Each line is parsed
on its own by the LALR parser into a statement tuple (see _statements.py), then
handled by the method of the same name here, which checks it against what came
before (unknown channel, a channel in two legs, time going backwards...) and
raises InputError with path, line and column.
"""

from __future__ import annotations

import os
import re
import threading
from dataclasses import dataclass, field
from typing import Any

from ..errors import InputError
from ..model import (
    BootstrapSupply,
    Bridge,
    DeadTime,
    Leg,
    Mode,
    ModeExpr,
    Policy,
    Side,
    Source,
    SwitchTiming,
    Trace,
    TransitionPolicy,
    TransitionRule,
)
from ..units import format_time
from ._diagnose import syntax_error
from ._modes import Switch, resolve, single_state
from ._timeline import MAX_CHANGES, Frame, channels_from_changes
from ._values import MAX_PS, check_range, duration_ps, quantity, time_ps

__all__ = ["Loaded", "load"]

_STEP_KINDS = frozenset({"step", "repeat", "close", "end"})
#: Words that start a statement (grammar/bridge.lark). The lexer would read ``leggy``
#: as ``leg`` followed by ``gy``, so a line's first word is checked against these.
KEYWORDS = frozenset(
    [
        "include",
        "leg",
        "active-low",
        "dead-time",
        "min-pulse",
        "min-margin",
        "reversal-dwell",
        "mode",
        "allow",
        "forbid",
        "dwell",
        "scheme",
        "timing",
        "bootstrap",
        "repeat",
        "end",
    ]
)
_FIRST_WORD = re.compile(r"[A-Za-z_][\w-]*")
_TIMING_FIELDS = {
    "turn-on-delay": "turn_on_delay_ps",
    "turn-off-delay": "turn_off_delay_ps",
    "rise": "rise_ps",
    "fall": "fall_ps",
}
#: bootstrap key -> (BootstrapSupply field, unit, required)
_SUPPLY_FIELDS = {
    "capacitance": ("capacitance_f", "F", True),
    "gate-charge": ("gate_charge_c", "C", True),
    "leakage": ("leakage_a", "A", True),
    "supply": ("supply_v", "V", True),
    "diode-drop": ("diode_drop_v", "V", True),
    "min-vgs": ("min_vgs_v", "V", True),
    "resistance": ("resistance_ohm", "ohm", False),
}
_SEEN_LINES = 4096  # distinct lines remembered per file
_PARSER: Any = None
_PARSER_LOCK = threading.Lock()


def _parser() -> Any:
    global _PARSER
    with _PARSER_LOCK:
        if _PARSER is None:
            from ._grammar import line_parser
            from ._statements import Statements

            _PARSER = line_parser(Statements())
        return _PARSER


@dataclass
class Loaded:
    """What a file said: its bridge, its policy, and (for a table) its trace."""

    bridge: Bridge
    policy: Policy
    trace: Trace | None = None
    includes: list[str] = field(default_factory=list)


def read_text(path: str) -> str:
    """The file as text; InputError (one line) if missing, a folder, or not UTF-8."""
    try:
        with open(path, "rb") as f:
            data = f.read()
    except FileNotFoundError:
        raise InputError("no such file", path=path) from None
    except IsADirectoryError:
        raise InputError("is a folder, expected a bridge description or table", path=path) from None
    except OSError as e:
        raise InputError(f"cannot be read ({e.strerror})", path=path) from None
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data[: e.start].count(b"\n") + 1
        raise InputError(
            f"is not UTF-8 text (byte 0x{data[e.start]:02x}); expected a bridge description or table",
            path=path,
            line=line,
        ) from None


class _Loader:
    """Statements of one file (plus its includes) turned into Bridge, Policy and steps."""

    def __init__(self, path: str, *, steps_allowed: bool) -> None:
        self.path = path
        self.steps_allowed = steps_allowed
        self.line = 0
        self.column = 1
        self.includes: list[str] = []
        self.stack: list[str] = [os.path.abspath(path)]
        # bridge
        self.legs: dict[str, Leg] = {}
        self.switch_of: dict[str, Switch] = {}  # channel -> (leg, side)
        self.defined_at: dict[str, int] = {}  # leg, channel or mode name -> line
        self.active_low: set[str] = set()
        self.timing: dict[str, SwitchTiming] = {}
        self.bootstrap: dict[str, BootstrapSupply] = {}
        self.modes: dict[str, Mode] = {}
        # policy
        self.dead_time: DeadTime | None = None
        self.dead_time_by_leg: dict[str, DeadTime] = {}
        self.limits: dict[str, int] = {}
        self.rules: list[TransitionRule] = []
        self.dwell_in: dict[str, int] = {}
        self.scheme: str | None = None
        # steps
        self.frames: list[Frame] = [Frame()]
        self.channel_index: dict[str, int] = {}
        self.on_level: list[int] = []
        self.settings_cache: dict[str, tuple[tuple[int, ...], tuple[int, ...]]] = {}
        self.mode_cache: dict[str, tuple[tuple[int, ...], tuple[int, ...]]] = {}
        self.first_step_line = 0
        self.end_ps: int | None = None
        self.end_line = 0

    # ------------------------------------------------------------------ helpers

    def error(self, message: str, token: Any = None, column: int | None = None) -> InputError:
        if column is None and token is not None:
            column = getattr(token, "column", None)
        return InputError(message, path=self.path, line=self.line, column=column)

    def where(self, token: Any) -> tuple[str, int, int]:
        return (self.path, self.line, token.column)

    def duration(self, token: Any, what: str = "duration") -> int:
        return duration_ps(str(token), self.where(token), what)

    def leg_named(self, token: Any) -> Leg:
        leg = self.legs.get(str(token))
        if leg is None:
            known = ", ".join(self.legs) or "none yet"
            raise self.error(f"unknown leg {str(token)!r} (legs: {known})", token)
        return leg

    def source(self, token: Any) -> Source:
        return Source(self.path, self.line, getattr(token, "column", None))

    # ------------------------------------------------------------------ reading

    def run(self, text: str) -> None:
        parse = _parser().parse
        from lark.exceptions import UnexpectedInput, VisitError

        handlers = {
            "step": self.on_step,
            "repeat": self.on_repeat,
            "close": self.on_close,
            "end": self.on_end,
        }
        # A line's statement depends on its text alone (columns included; token.line is
        # always 1 in a one-line parse and never used), so repeated lines parse once.
        seen: dict[str, tuple[Any, ...]] = {}
        for number, raw in enumerate(text.splitlines(), start=1):
            stripped = raw.lstrip()
            if not stripped or stripped[0] == "#":
                continue
            self.line = number
            self.column = len(raw) - len(stripped) + 1
            word = _FIRST_WORD.match(stripped)
            if word is not None and word.group(0) not in KEYWORDS:
                raise self.error(
                    f"unknown statement {word.group(0)!r}; expected a step (a time such as 0 or "
                    "+750ns) or a statement such as leg, mode, dead-time, allow, repeat, include",
                    column=self.column,
                )
            statement = seen.get(raw)
            if statement is None:
                try:
                    statement = parse(raw)
                except UnexpectedInput as e:
                    raise syntax_error(e, raw, self.path, number, _parser()) from None
                except VisitError as e:  # a callback raised: surface the original error
                    raise e.orig_exc from None
                if len(seen) < _SEEN_LINES:
                    seen[raw] = statement
            kind = statement[0]
            if kind in _STEP_KINDS:
                if not self.steps_allowed:
                    raise self.error(
                        "a bridge description holds no steps; put steps in a table "
                        "(.steps) that includes this file",
                        column=self.column,
                    )
                if self.end_ps is not None:
                    raise self.error(
                        f"nothing may follow 'end' (line {self.end_line}) but comments",
                        column=self.column,
                    )
                handlers[kind](*statement[1:])
            else:
                if self.first_step_line:
                    raise self.error(
                        "bridge statements (leg, mode, dead-time, include...) come before "
                        f"the first step (line {self.first_step_line})",
                        column=self.column,
                    )
                getattr(self, "on_" + kind)(*statement[1:])
        if len(self.frames) > 1:
            frame = self.frames[-1]
            self.line = frame.line
            raise self.error("this repeat block is never closed with '}'", column=frame.column)

    # ------------------------------------------------------------------ bridge statements

    def on_include(self, token: Any) -> None:
        name = str(token)[1:-1]
        target = os.path.normpath(os.path.join(os.path.dirname(self.path), name))
        if os.path.abspath(target) in self.stack:
            raise self.error(
                f"include {name!r} includes itself (directly or through another file)", token
            )
        if not os.path.isfile(target):
            raise self.error(f"bridge file {name!r} not found (looked for {target})", token)
        text = read_text(target)
        outer_path, outer_line, outer_allowed = self.path, self.line, self.steps_allowed
        self.path, self.steps_allowed = target, False
        self.stack.append(os.path.abspath(target))
        try:
            self.run(text)
        finally:
            self.stack.pop()
            self.path, self.line, self.steps_allowed = outer_path, outer_line, outer_allowed
        self.includes.append(target)

    def on_leg(self, name: Any, high: Any, low: Any) -> None:
        if str(name) in self.legs:
            raise self.error(
                f"leg {str(name)!r} is already defined (line {self.defined_at['leg ' + name]})",
                name,
            )
        if str(high) == str(low):
            raise self.error(f"leg {name} uses channel {str(low)!r} for both switches", low)
        for token, side in ((high, Side.HIGH), (low, Side.LOW)):
            other = self.switch_of.get(str(token))
            if other is not None:
                raise self.error(
                    f"channel {str(token)!r} is already in leg {other[0]} "
                    f"(line {self.defined_at['channel ' + token]}); a channel drives one switch",
                    token,
                )
            self.switch_of[str(token)] = (str(name), side)
            self.defined_at["channel " + token] = self.line
        self.legs[str(name)] = Leg(str(name), str(high), str(low))
        self.defined_at["leg " + name] = self.line

    def on_active_low(self, names: tuple[Any, ...]) -> None:
        for token in names:
            if str(token) not in self.switch_of:
                known = ", ".join(self.switch_of) or "none yet"
                raise self.error(f"unknown channel {str(token)!r} (channels: {known})", token)
            self.active_low.add(str(token))

    def on_dead_time(self, leg: Any, values: tuple[tuple[Any, Any], ...]) -> None:
        current = self.dead_time or DeadTime()
        if leg is not None:
            current = self.dead_time_by_leg.get(self.leg_named(leg).name, current)
        hl, lh = current.high_to_low_ps, current.low_to_high_ps
        for which, token in values:
            ps = self.duration(token, "dead time")
            if which is None or which == "high-to-low":
                hl = ps
            if which is None or which == "low-to-high":
                lh = ps
        if leg is None:
            self.dead_time = DeadTime(hl, lh)
        else:
            self.dead_time_by_leg[str(leg)] = DeadTime(hl, lh)

    def on_limit(self, field_name: str, token: Any) -> None:
        self.limits[field_name] = self.duration(token)

    def on_mode(self, name: Any, node: tuple[Any, ...]) -> None:
        key = "mode " + name
        if str(name) in self.modes:
            raise self.error(
                f"mode {str(name)!r} is already defined (line {self.defined_at[key]})", name
            )
        if str(name) in self.switch_of:
            raise self.error(f"mode {str(name)!r} has the name of a channel; choose another", name)

        def fail(message: str, token: Any) -> InputError:
            return self.error(f"mode {name}: {message}", token)

        exprs = {n: m.expr for n, m in self.modes.items()}
        expr: ModeExpr = resolve(node, self.legs, self.switch_of, exprs, fail)
        self.modes[str(name)] = Mode(str(name), expr, self.source(name))
        self.defined_at[key] = self.line

    def _known_state(self, token: Any) -> str:
        name = str(token)
        if name != "*" and name not in self.modes:
            known = ", ".join(self.modes) or "none yet"
            raise self.error(f"unknown mode {name!r} (modes: {known}; '*' means any)", token)
        return name

    def on_transition(self, verdict: Any, src: Any, dst: Any, after: Any) -> None:
        allowed = str(verdict) == "allow"
        if after is not None and not allowed:
            raise self.error("'after' belongs to 'allow': a forbidden change has no dwell", after)
        self.rules.append(
            TransitionRule(
                self._known_state(src),
                self._known_state(dst),
                allowed=allowed,
                min_dwell_ps=None if after is None else self.duration(after, "dwell"),
                source=self.source(verdict),
            )
        )

    def on_dwell(self, mode: Any, value: Any) -> None:
        self.dwell_in[self._known_state(mode)] = self.duration(value, "dwell")

    def on_scheme(self, token: Any) -> None:
        self.scheme = str(token)

    def on_timing(self, target: Any, items: tuple[tuple[Any, ...], ...]) -> None:
        name = str(target)
        if name in self.legs:
            channels = list(self.legs[name].channels)
        elif name in self.switch_of:
            channels = [name]
        else:
            raise self.error(
                f"timing names {name!r}, which is neither a channel nor a leg "
                f"(channels: {', '.join(self.switch_of) or 'none yet'})",
                target,
            )
        values: dict[str, int] = {}
        for item in items:
            if item[0] == "driver-delay":
                low, high = (
                    self.duration(item[1], "driver delay"),
                    self.duration(item[2], "driver delay"),
                )
                if low > high:
                    raise self.error(
                        "driver delay: the first value is the minimum, the second the maximum",
                        item[2],
                    )
                values["driver_delay_min_ps"], values["driver_delay_max_ps"] = low, high
            else:
                values[_TIMING_FIELDS[item[0]]] = self.duration(item[1], item[0])
        for ch in channels:
            self.timing[ch] = SwitchTiming(**values)

    def on_bootstrap(self, leg: Any, items: tuple[tuple[Any, Any], ...]) -> None:
        name = self.leg_named(leg).name
        values: dict[str, float] = {}
        for key, token in items:
            field_name, unit, _ = _SUPPLY_FIELDS[str(key)]
            values[field_name] = quantity(str(token), unit, str(key), self.where(token))
        missing = [k for k, (f, _, req) in _SUPPLY_FIELDS.items() if req and f not in values]
        if missing:
            raise self.error(
                f"bootstrap {name} also needs: {', '.join(missing)}", column=self.column
            )
        self.bootstrap[name] = BootstrapSupply(**values)

    # ------------------------------------------------------------------ steps

    def _index(self) -> None:
        """Freeze channel numbering and on-levels when the first step arrives."""
        for leg in self.legs.values():
            for ch in leg.channels:
                self.channel_index[ch] = len(self.on_level)
                self.on_level.append(0 if ch in self.active_low else 1)

    def _settings(self, token: Any) -> tuple[tuple[int, ...], tuple[int, ...]]:
        text = str(token)
        hit = self.settings_cache.get(text)
        if hit is not None:
            return hit
        chans: list[int] = []
        levels: list[int] = []
        offset = 0
        for item in text.split():
            offset = text.index(item, offset)
            name, _, value = item.partition("=")
            column = token.column + offset
            offset += len(item)
            if "." in name:
                leg_name, _, side = name.partition(".")
                leg = self.legs.get(leg_name)
                if leg is None:
                    known = ", ".join(self.legs) or "none"
                    raise self.error(
                        f"unknown leg {leg_name!r} in {name!r} (legs: {known})", column=column
                    )
                name = leg.high if side == "high" else leg.low
            index = self.channel_index.get(name)
            if index is None:
                known = (
                    ", ".join(self.channel_index) or "none: include a bridge or define legs first"
                )
                raise self.error(f"unknown channel {name!r} (channels: {known})", column=column)
            if index in chans:
                raise self.error(
                    f"{item!r}: channel {name} is set twice in one step", column=column
                )
            on = self.on_level[index]
            level = {"on": on, "off": 1 - on, "1": 1, "0": 0}[value]
            chans.append(index)
            levels.append(level)
        result = (tuple(chans), tuple(levels))
        self.settings_cache[text] = result
        return result

    def _mode_settings(self, token: Any) -> tuple[tuple[int, ...], tuple[int, ...]]:
        name = str(token)
        hit = self.mode_cache.get(name)
        if hit is not None:
            return hit
        mode = self.modes.get(name)
        if mode is None:
            known = ", ".join(self.modes) or "none defined"
            raise self.error(f"unknown mode {name!r} (modes: {known})", token)
        switches = tuple(
            (leg.name, side) for leg in self.legs.values() for side in (Side.HIGH, Side.LOW)
        )
        state = single_state(mode.expr, switches)
        if isinstance(state, str):
            raise self.error(
                f"mode {name} (line {self.defined_at['mode ' + name]}) cannot be a step: {state}; "
                "set the switches explicitly",
                token,
            )
        chans, levels = [], []
        for leg in self.legs.values():
            for ch, side in ((leg.high, Side.HIGH), (leg.low, Side.LOW)):
                index = self.channel_index[ch]
                on = self.on_level[index]
                chans.append(index)
                levels.append(on if (leg.name, side) in state else 1 - on)
        result = (tuple(chans), tuple(levels))
        self.mode_cache[name] = result
        return result

    def on_step(self, time_token: Any, mode: Any, settings: Any) -> None:
        if not self.first_step_line:
            self.first_step_line = self.line
            self._index()
        frame = self.frames[-1]
        relative, ps = time_ps(str(time_token), self.where(time_token))
        t = frame.now + ps if relative else ps
        check_range(t, str(time_token), self.where(time_token))
        if t < frame.now:
            inside = (
                " (times in a repeat block count from the start of each pass)"
                if len(self.frames) > 1
                else ""
            )
            raise self.error(
                f"time goes backwards: {time_token} is {format_time(t)}, before the previous "
                f"step at {format_time(frame.now)}{inside}",
                time_token,
            )
        if frame.every is not None and t > frame.every:
            raise self.error(
                f"step at {format_time(t)} into the pass is past the repeat period {format_time(frame.every)}",
                time_token,
            )
        chans, levels = self._mode_settings(mode) if mode is not None else ((), ())
        if settings is not None:
            more_c, more_v = self._settings(settings)
            chans, levels = chans + more_c, levels + more_v
        n = len(chans)
        frame.T.extend([t] * n)
        frame.C.extend(chans)
        frame.V.extend(levels)
        frame.L.extend([self.line] * n)
        frame.now = t
        frame.steps += 1

    def on_repeat(self, count: Any, every: Any) -> None:
        if not self.first_step_line:
            self.first_step_line = self.line
            self._index()
        n = int(str(count))
        if n < 1:
            raise self.error(f"repeat count must be at least 1, not {n}", count)
        period = None if every is None else self.duration(every, "repeat period")
        if period == 0:
            raise self.error("repeat period must be longer than 0", every)
        parent = self.frames[-1]
        self.frames.append(Frame(n, period, parent.now, self.line, self.column))

    def on_close(self) -> None:
        if len(self.frames) == 1:
            raise self.error("'}' closes no repeat block", column=self.column)
        frame = self.frames.pop()
        if frame.steps == 0:
            self.line = frame.line
            raise self.error("this repeat block holds no steps", column=frame.column)
        parent = self.frames[-1]
        if frame.opened_at + frame.count * frame.pass_length() > MAX_PS:
            self.line = frame.line
            raise self.error(
                "this repeat runs past the longest time a table may span (about 53 days)",
                column=frame.column,
            )
        total = frame.size * frame.count + parent.size
        if total > MAX_CHANGES:
            self.line = frame.line
            raise self.error(
                f"this repeat expands the table to {total:,} switch changes, more than the "
                f"{MAX_CHANGES:,} a table may hold",
                column=frame.column,
            )
        frame.expand_into(parent)

    def on_end(self, time_token: Any) -> None:
        if len(self.frames) > 1:
            raise self.error(
                "'end' belongs at the top level, not inside a repeat block", time_token
            )
        frame = self.frames[0]
        relative, ps = time_ps(str(time_token), self.where(time_token))
        t = frame.now + ps if relative else ps
        check_range(t, str(time_token), self.where(time_token))
        if t < frame.now:
            raise self.error(
                f"end at {format_time(t)} is before the last step at {format_time(frame.now)}",
                time_token,
            )
        self.end_ps, self.end_line = t, self.line

    # ------------------------------------------------------------------ results

    def bridge_and_policy(self) -> tuple[Bridge, Policy]:
        bridge = Bridge(
            tuple(self.legs.values()),
            active_low=frozenset(self.active_low),
            timing=dict(self.timing),
            bootstrap=dict(self.bootstrap),
            modes=tuple(self.modes.values()),
            source=self.path,
        )
        transitions = None
        if self.rules or self.dwell_in or self.scheme is not None:
            transitions = TransitionPolicy(
                tuple(self.rules),
                dict(self.dwell_in),
                self.scheme or "sign-magnitude",
                source=self.path,
            )
        policy = Policy(
            dead_time=self.dead_time,
            dead_time_by_leg=dict(self.dead_time_by_leg),
            transitions=transitions,
            **self.limits,
        )
        return bridge, policy

    def trace(self, rows: int) -> Trace:
        top = self.frames[0]
        t, c, v, ln = top.arrays()
        if t.size == 0:
            raise InputError(
                "no steps: a table needs at least one step such as '0 AH=off AL=on'", path=self.path
            )
        start = int(t[0])
        end = self.end_ps if self.end_ps is not None else max(top.now, int(t[-1]))
        names = list(self.channel_index)
        off = [1 - on for on in self.on_level]
        channels = channels_from_changes(names, off, (t, c, v, ln), start)
        return Trace(
            channels=channels,
            start_ps=start,
            end_ps=end,
            path=self.path,
            rows=rows,
            kind="table",
            meta={"steps": top.steps, "changes": int(t.size)},
        )


def load(path: str, *, table: bool) -> Loaded:
    """Read ``path`` as a table (``table=True``) or a bridge description."""
    path = os.fspath(path)
    text = read_text(path)
    if not text.strip():
        what = "a table: an include line and steps" if table else "a bridge description: leg lines"
        raise InputError(f"empty file, expected {what}", path=path, line=1)
    loader = _Loader(path, steps_allowed=table)
    loader.run(text)
    if not loader.legs:
        raise InputError(
            "no legs: expected a line such as 'leg A high AH low AL'"
            + (" or 'include \"drive.bridge\"'" if table else ""),
            path=path,
        )
    bridge, policy = loader.bridge_and_policy()
    trace = None
    if table:
        trace = loader.trace(text.count("\n") + (0 if text.endswith("\n") else 1))
        trace = Trace(
            trace.channels,
            trace.start_ps,
            trace.end_ps,
            trace.path,
            None,
            trace.rows,
            trace.kind,
            {**trace.meta, "bridge": bridge, "policy": policy, "includes": tuple(loader.includes)},
        )
    return Loaded(bridge, policy, trace, loader.includes)

"""Table statements: steps, repeat blocks and the window's end, and the Trace they make."""

from __future__ import annotations

from typing import Any

from ..errors import InputError
from ..model import Side, Trace
from ..units import format_time
from ._modes import single_state
from ._state import LoaderState
from ._timeline import MAX_CHANGES, Frame, channels_from_changes
from ._values import MAX_PS, check_range, time_ps

__all__ = ["StepStatements"]


class StepStatements(LoaderState):
    """``on_<statement>`` for steps and blocks; ``trace()`` expands them."""

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
        try:
            state = single_state(mode.expr, switches)
        except RecursionError:  # modes built from modes, nested beyond Python's stack
            state = "it nests too deeply to evaluate"
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
        text = str(count).lstrip("0") or "0"
        if len(text) > 18:  # beyond any table (and int() refuses 4,300 digits)
            raise self.error(
                f"repeat count of {len(text):,} digits; a table may hold at most "
                f"{MAX_CHANGES:,} switch changes",
                count,
            )
        n = int(text)
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

    def trace(self, rows: int) -> Trace:
        top = self.frames[0]
        t, c, v, ln = top.arrays()
        if t.size == 0:
            what = "no switch is set" if top.steps else "no steps"
            raise InputError(
                f"{what}: a table needs at least one step that sets switches, such as "
                "'0 AH=off AL=on'",
                path=self.path,
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

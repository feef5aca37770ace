"""Record gate levels set by controller code at integer picosecond times."""

from __future__ import annotations

import operator
from collections.abc import Iterable, Mapping

import numpy as np

from ..errors import UsageError
from ..model import Channel, Level, Trace

__all__ = ["Recorder"]

_LEVELS = frozenset(int(v) for v in Level)


def _exact_ps(value: object, what: str) -> int:
    """``value`` as an int of picoseconds; floats are refused, never rounded."""
    if isinstance(value, bool):
        raise UsageError(f"{what} must be an integer number of picoseconds, not {value!r}")
    try:
        return operator.index(value)  # int, numpy integers
    except TypeError:
        raise UsageError(
            f"{what} must be an integer number of picoseconds, not {value!r} "
            f"({type(value).__name__}); convert once, e.g. round(seconds * 10**12)"
        ) from None


class Recorder:
    """Collects channel levels as controller code sets them, and gives a Trace.

    Times are exact integer picoseconds. ``set(t_ps, AH=1, AL=0)`` sets levels at
    an absolute time; ``step(dt_ps, AH=0)`` sets them ``dt_ps`` after the latest
    time seen (``step(dt_ps)`` alone just lets time pass). Several changes at one
    instant are allowed: the last one wins, as in every reader. A channel's
    changes must come in time order: a change before the channel's previous one
    raises UsageError naming the channel and both times.

    ``channels`` fixes the channel names up front (any other name is refused);
    without it, a channel is created the first time it is set. ``initial`` is
    the level every channel holds at ``start_ps`` (a mapping may give it per
    channel; unnamed channels start at 0, LOW). ``name`` becomes the trace's path
    in reports.

    >>> rec = Recorder(("AH", "AL"))
    >>> rec.set(0, AL=1)
    >>> rec.step(500_000, AL=0)
    >>> rec.step(100_000, AH=1)
    >>> rec.step(2_000_000)
    >>> rec.trace().edge_count
    3
    """

    def __init__(
        self,
        channels: Iterable[str] | None = None,
        *,
        initial: int | Mapping[str, int] = 0,
        start_ps: int = 0,
        name: str = "<recorder>",
    ) -> None:
        self.name = name
        if isinstance(channels, str):
            raise UsageError(
                f"{name}: channels must be a list of names, not the string {channels!r}"
            )
        self.start_ps = _exact_ps(start_ps, "start_ps")
        self._fixed = channels is not None
        self._default_initial = 0 if isinstance(initial, Mapping) else self._level("*", initial)
        self._initial: dict[str, int] = {}
        self._times: dict[str, list[int]] = {}
        self._levels: dict[str, list[int]] = {}
        self._now = self.start_ps
        self.calls = 0
        for ch in channels or ():
            self._add(ch)
        if isinstance(initial, Mapping):
            for ch, level in initial.items():
                self._check_known(ch)
                if ch not in self._times:
                    self._add(ch)
                self._initial[ch] = self._level(ch, level)

    # -- recording -------------------------------------------------------------------

    @property
    def now_ps(self) -> int:
        """The latest time set so far (``start_ps`` before anything is set)."""
        return self._now

    @property
    def channels(self) -> tuple[str, ...]:
        return tuple(self._times)

    def set(self, t_ps: int, levels: Mapping[str, int] | None = None, /, **named: int) -> None:
        """Set channel levels at absolute time ``t_ps``.

        Levels come as keywords (``AH=1``) or, for names that are not Python
        identifiers, as a mapping in the second argument.
        """
        t = t_ps if type(t_ps) is int else _exact_ps(t_ps, "time")
        if t < self.start_ps:
            raise UsageError(
                f"{self.name}: time {t} ps is before the recording start {self.start_ps} ps"
            )
        changes = {**levels, **named} if levels else named
        all_times, checked = self._times, []
        for ch, level in changes.items():  # check everything before changing anything
            times = all_times.get(ch)
            if times is None:
                self._check_known(ch)
            elif times and t < times[-1]:
                raise UsageError(
                    f"{self.name}: channel {ch!r} set at {t} ps, before its previous "
                    f"change at {times[-1]} ps; time must not go backwards"
                )
            value = level if type(level) is int and 0 <= level <= 1 else None
            checked.append((ch, self._level(ch, level) if value is None else value, times))
        for ch, value, times in checked:
            if times is None:
                self._add(ch)
                times = all_times[ch]
            times.append(t)
            self._levels[ch].append(value)
        self.calls += 1
        if t > self._now:
            self._now = t

    def step(self, dt_ps: int, levels: Mapping[str, int] | None = None, /, **named: int) -> None:
        """Let ``dt_ps`` (>= 0) pass after ``now_ps``, then set the levels given (if any)."""
        dt = _exact_ps(dt_ps, "step")
        if dt < 0:
            raise UsageError(
                f"{self.name}: step of {dt} ps from {self._now} ps would go back in time"
            )
        self.set(self._now + dt, levels, **named)

    # -- reading back ------------------------------------------------------------------

    def level(self, channel: str) -> int:
        """The level ``channel`` was last set to (its initial level if never set)."""
        levels = self._levels.get(channel)
        if levels is None:
            raise KeyError(channel)
        return levels[-1] if levels else self._initial[channel]

    def trace(self, *, end_ps: int | None = None) -> Trace:
        """The recording as a Trace over ``[start_ps, end_ps)`` (default: ``now_ps``).

        Same-instant changes collapse to the last one and repeats of the level
        held are dropped, exactly as the file readers do.
        """
        end = self._now if end_ps is None else _exact_ps(end_ps, "end_ps")
        if end < self._now:
            raise UsageError(
                f"{self.name}: end_ps {end} ps is before the last change at {self._now} ps"
            )
        channels = {
            ch: Channel.from_changes(
                ch,
                self._initial[ch],
                np.fromiter(self._times[ch], dtype=np.int64, count=len(self._times[ch])),
                np.fromiter(self._levels[ch], dtype=np.int8, count=len(self._levels[ch])),
            )
            for ch in self._times
        }
        return Trace(channels, self.start_ps, end, path=self.name, rows=self.calls, kind="recorder")

    # -- helpers -----------------------------------------------------------------------

    def _add(self, ch: str) -> None:
        if not isinstance(ch, str) or not ch:
            raise UsageError(f"{self.name}: channel names must be non-empty strings, not {ch!r}")
        self._times[ch] = []
        self._levels[ch] = []
        self._initial.setdefault(ch, self._default_initial)

    def _check_known(self, ch: str) -> None:
        if self._fixed and ch not in self._times:
            known = ", ".join(self._times) or "none"
            raise UsageError(f"{self.name}: unknown channel {ch!r} (channels: {known})")

    def _level(self, ch: str, level: object) -> int:
        if isinstance(level, bool | np.bool_):
            return int(level)
        try:
            value = operator.index(level)
        except TypeError:
            value = None
        if value not in _LEVELS:
            raise UsageError(
                f"{self.name}: channel {ch!r} level must be 0 or 1 (or Level.X/Level.Z), "
                f"not {level!r}"
            )
        return value

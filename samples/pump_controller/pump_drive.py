"""An invented controller: direction and speed of a small reversible pump.

The pump's DC motor sits in an H-bridge (legs A and B). Forward drives leg A
with complementary PWM while B's low side stays on; reverse mirrors it; brake
turns both low sides on; coast and emergency stop turn everything off. A
dead-time stage per leg turns the wanted leg states into gate edges and keeps
each switch off until its complement has been off for the dead time. A
reversal waits in coast for ``reversal_dwell_ps`` after the last drive the
other way. New commands take effect at the next PWM period; an emergency stop
takes effect at once.

Gates are written to a sequencecheck.testing.Recorder (channels AH, AL, BH, BL,
logic 1 = switch on), so the output can be checked without hardware.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from sequencecheck.model import Bridge, Leg
from sequencecheck.testing import Command, DriveMode, Recorder

__all__ = ["PUMP_BRIDGE", "DeadTimeStage", "PumpDrive", "PumpTiming"]

PUMP_BRIDGE = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")))

HIGH, LOW, OFF = "high", "low", "off"  # wanted state of a leg


@dataclass(frozen=True, slots=True)
class PumpTiming:
    """PWM period, dead time and reversal dwell of the pump drive (picoseconds)."""

    period_ps: int
    dead_time_ps: int
    reversal_dwell_ps: int = 0

    @property
    def saturation_ps(self) -> int:
        """Low-side time per period below which the drive switches fully on instead."""
        return 2 * self.dead_time_ps


class DeadTimeStage:
    """One leg's dead-time insertion: wanted states in, gate edges out.

    A switch turns off as soon as it is no longer wanted and turns on only once
    its complement has been off for ``dead_time_ps``; a turn-on still waiting
    when the wanted state changes again is dropped.
    """

    def __init__(self, rec: Recorder, leg: Leg, dead_time_ps: int) -> None:
        self.rec, self.leg, self.dead = rec, leg, dead_time_ps
        self.wanted = OFF
        self.on = {leg.high: False, leg.low: False}
        self.off_at = {leg.high: rec.start_ps - dead_time_ps, leg.low: rec.start_ps - dead_time_ps}
        self.pending: tuple[int, str] | None = None  # (time, channel) of a waiting turn-on

    def _set(self, t: int, ch: str, on: bool) -> None:
        if self.on[ch] != on:
            self.rec.set(t, {ch: int(on)})
            self.on[ch] = on
            if not on:
                self.off_at[ch] = t

    def flush(self, until_ps: int) -> None:
        """Carry out a waiting turn-on due before ``until_ps``."""
        if self.pending is not None and self.pending[0] < until_ps:
            t, ch = self.pending
            self._set(t, ch, True)
            self.pending = None

    def want(self, t: int, state: str) -> None:
        self.flush(t)
        if state == self.wanted:
            return
        self.wanted, self.pending = state, None
        high, low = self.leg.high, self.leg.low
        if state == OFF:
            self._set(t, high, False)
            self._set(t, low, False)
            return
        ch, other = (high, low) if state == HIGH else (low, high)
        self._set(t, other, False)
        if not self.on[ch]:
            self.pending = (max(t, self.off_at[other] + self.dead), ch)
            self.flush(t + 1)  # no wait needed: turn on now


class PumpDrive:
    """The correct pump drive. ``run(commands)`` writes its gates to the recorder."""

    def __init__(self, rec: Recorder, timing: PumpTiming) -> None:
        self.rec, self.timing = rec, timing
        self.stages = {
            leg.name: DeadTimeStage(rec, leg, timing.dead_time_ps) for leg in PUMP_BRIDGE.legs
        }
        self.last_drive: DriveMode | None = None  # direction of the last drive period
        self.last_drive_end = rec.start_ps

    # -- the PWM plan of one period -------------------------------------------------------

    def high_ps(self, duty_num: int, duty_den: int) -> int:
        """Commanded on-time of the driving high side, saturated to a full period when
        the low-side pulse left would be shorter than ``saturation_ps``."""
        period = self.timing.period_ps
        on = period * duty_num // duty_den
        return period if period - on < self.timing.saturation_ps else on

    def drive_period(self, start: int, drive_leg: str, duty_num: int, duty_den: int) -> list:
        """(time, leg, wanted) changes for one drive period of ``drive_leg``."""
        hold_leg = "B" if drive_leg == "A" else "A"
        on = self.high_ps(duty_num, duty_den)
        plan = [(start, hold_leg, LOW)]
        if on == 0:
            plan.append((start, drive_leg, LOW))
        else:
            plan += self.high_phase(start, drive_leg, on)
            if on < self.timing.period_ps:
                plan.append((start + on, drive_leg, LOW))
        return plan

    def high_phase(self, start: int, drive_leg: str, on_ps: int) -> list:
        """The driving leg's high phase goes through the dead-time stage like any change."""
        return [(start, drive_leg, HIGH)]

    def period_plan(self, start: int, cmd: Command | None) -> list:
        mode = DriveMode.COAST if cmd is None else cmd.mode
        if mode.drives:
            if self.reversing(mode, start):
                mode = DriveMode.COAST  # dwell before driving the other way
            else:
                self.last_drive = mode
                self.last_drive_end = start + self.timing.period_ps
                leg = "A" if mode is DriveMode.FORWARD else "B"
                return self.drive_period(start, leg, cmd.duty.numerator, cmd.duty.denominator)
        self.note_idle(mode)
        state = LOW if mode is DriveMode.BRAKE else OFF
        return [(start, "A", state), (start, "B", state)]

    def reversing(self, mode: DriveMode, start: int) -> bool:
        """True while a drive the other way ended less than the reversal dwell ago."""
        opposite = self.last_drive is not None and self.last_drive is not mode
        return opposite and start - self.last_drive_end < self.timing.reversal_dwell_ps

    def note_idle(self, mode: DriveMode) -> None:
        """A period spent braking or coasting (the dwell is counted from the last drive)."""

    # -- running a command list --------------------------------------------------------

    def run(self, commands: Sequence[Command]) -> None:
        period = self.timing.period_ps
        t0 = self.rec.start_ps
        issued, t = [], t0
        for cmd in commands:
            issued.append((t, cmd))
            t += cmd.duration_ps
        end = t
        current: Command | None = None
        i, start = 0, t0
        while start < end:
            while i < len(issued) and issued[i][0] <= start:
                current = issued[i][1]
                i += 1
            stop_at = next(
                (ti for ti, c in issued[i:] if c.mode is DriveMode.STOP and ti < start + period),
                None,
            )
            cut = min(start + period, end) if stop_at is None else stop_at
            for t_change, leg, state in self.period_plan(start, current):
                if t_change < cut:
                    self.apply(t_change, leg, state)
            if stop_at is not None:  # emergency stop: everything off at once
                for name in self.stages:
                    self.apply(stop_at, name, OFF)
            start += period
        for stage in self.stages.values():
            stage.flush(end)  # a turn-on due at or after the end never happens
        self.rec.set(end)

    def apply(self, t: int, leg: str, state: str) -> None:
        self.stages[leg].want(t, state)

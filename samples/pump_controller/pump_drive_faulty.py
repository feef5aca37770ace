"""The pump drive with two subtle faults, for the property tests to find.

``SaturatingPumpDrive``: when the duty command saturates (the low-side pulse
left would be too short), a fast path writes the gates directly instead of
through the dead-time stage, so the first saturated period after one with the
low side on turns AL off and AH on in the same instant.

``BrakeResetPumpDrive``: braking is taken to mean the motor has stopped, so a
reversal right after a short brake skips the reversal dwell.
"""

from __future__ import annotations

from sequencecheck.testing import DriveMode

from .pump_drive import HIGH, PumpDrive

__all__ = ["BrakeResetPumpDrive", "SaturatingPumpDrive"]

FULL_ON = "full-on"


class SaturatingPumpDrive(PumpDrive):
    def high_phase(self, start: int, drive_leg: str, on_ps: int) -> list:
        if on_ps < self.timing.period_ps:
            return super().high_phase(start, drive_leg, on_ps)
        return [(start, drive_leg, FULL_ON)]

    def apply(self, t: int, leg: str, state: str) -> None:
        if state != FULL_ON:
            super().apply(t, leg, state)
            return
        # full duty: the PWM compare never fires, so set the gates directly
        stage = self.stages[leg]
        stage.flush(t)
        stage.pending = None
        stage._set(t, stage.leg.low, False)
        stage._set(t, stage.leg.high, True)
        stage.wanted = HIGH


class BrakeResetPumpDrive(PumpDrive):
    def note_idle(self, mode: DriveMode) -> None:
        if mode is DriveMode.BRAKE:
            self.last_drive = None  # braked: treat the motor as stopped

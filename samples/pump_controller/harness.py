"""Run the pump drive on a command list and record its gates, for the property tests."""

from __future__ import annotations

from collections.abc import Sequence

from sequencecheck.model import DeadTime, Policy, Trace
from sequencecheck.testing import Command, PwmSettings, Recorder

from .pump_drive import PUMP_BRIDGE, PumpDrive, PumpTiming

__all__ = ["REVERSAL_DWELL_PS", "pump_policy", "record_drive"]

#: The pump's reversal dwell: coast this long before driving the other way (invented value).
REVERSAL_DWELL_PS = 500_000_000


def record_drive(drive: type[PumpDrive], pwm: PwmSettings, commands: Sequence[Command]) -> Trace:
    """The gate trace ``drive`` produces for ``commands`` with ``pwm``'s period and dead time."""
    rec = Recorder(PUMP_BRIDGE.channels, name=f"pump drive ({drive.__name__})")
    timing = PumpTiming(pwm.period_ps, pwm.dead_time_ps, REVERSAL_DWELL_PS)
    drive(rec, timing).run(commands)
    return rec.trace()


def pump_policy(pwm: PwmSettings, *, reversal_dwell: bool = False) -> Policy:
    """What the pump's gates must meet: the dead time (and, if asked, the reversal dwell)."""
    return Policy(
        dead_time=DeadTime.both(pwm.dead_time_ps),
        reversal_dwell_ps=REVERSAL_DWELL_PS if reversal_dwell else None,
    )

"""What a controller is asked to do (commands) and how its PWM is set (PwmSettings).

Plain records with no dependency on hypothesis, so controller harnesses can
build them by hand as well as draw them from the strategies.
"""

from __future__ import annotations

import operator
from dataclasses import dataclass
from enum import StrEnum
from fractions import Fraction
from typing import Any

from ..errors import UsageError
from ..model import Bridge

__all__ = ["Command", "DriveMode", "PwmSettings", "modes_for"]


class DriveMode(StrEnum):
    """What a command asks the bridge for.

    COAST: every switch off. BRAKE: every low side on. FORWARD / REVERSE: drive
    in one direction at the command's duty (REVERSE needs two legs or more).
    STOP: emergency stop, every switch off at once, even in the middle of a PWM
    period; the controller stays stopped until the next command takes effect.
    """

    COAST = "coast"
    BRAKE = "brake"
    FORWARD = "forward"
    REVERSE = "reverse"
    STOP = "stop"

    @property
    def drives(self) -> bool:
        return self in (DriveMode.FORWARD, DriveMode.REVERSE)


def modes_for(bridge: Bridge) -> tuple[DriveMode, ...]:
    """The modes a bridge can be asked for, simplest first (REVERSE needs two legs)."""
    if not bridge.legs:
        raise UsageError("a bridge needs at least one leg")
    if len(bridge.legs) == 1:
        return (DriveMode.COAST, DriveMode.BRAKE, DriveMode.FORWARD, DriveMode.STOP)
    return tuple(DriveMode)


def _positive_ps(value: object, what: str, *, zero_ok: bool = False) -> int:
    if isinstance(value, bool):
        raise UsageError(f"{what} must be an integer number of picoseconds, not {value!r}")
    try:
        ps = operator.index(value)
    except TypeError:
        raise UsageError(
            f"{what} must be an integer number of picoseconds, not {value!r}"
        ) from None
    if ps < 0 or (ps == 0 and not zero_ok):
        raise UsageError(f"{what} must be {'>= 0' if zero_ok else '> 0'} ps, not {ps}")
    return ps


def _duty(value: object, what: str = "duty") -> Fraction:
    if isinstance(value, float):
        raise UsageError(f"{what} must be exact (an int or Fraction), not the float {value!r}")
    try:
        duty = Fraction(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        raise UsageError(f"{what} must be a fraction between 0 and 1, not {value!r}") from None
    if not 0 <= duty <= 1:
        raise UsageError(f"{what} must lie between 0 and 1, not {value!r}")
    return duty


@dataclass(frozen=True, slots=True)
class Command:
    """Run the bridge in ``mode`` for ``duration_ps``; ``duty`` is the share of each PWM
    period the driving switch is commanded on (exact, 0 for modes that do not drive).
    """

    mode: DriveMode
    duration_ps: int
    duty: Fraction = Fraction(0)

    def __post_init__(self) -> None:
        try:
            mode = DriveMode(self.mode)
        except ValueError:
            names = ", ".join(m.value for m in DriveMode)
            raise UsageError(f"command mode must be one of {names}, not {self.mode!r}") from None
        object.__setattr__(self, "mode", mode)
        object.__setattr__(self, "duration_ps", _positive_ps(self.duration_ps, "duration_ps"))
        duty = _duty(self.duty)
        if duty and not mode.drives:
            raise UsageError(f"a {mode.value} command has no duty, got {self.duty!r}")
        object.__setattr__(self, "duty", duty)

    def __repr__(self) -> str:
        duty = f", duty=Fraction({self.duty.numerator}, {self.duty.denominator})"
        return (
            f"Command({self.mode.value!r}, duration_ps={self.duration_ps:_}"
            f"{duty if self.mode.drives else ''})"
        )

    def _repr_pretty_(self, printer: Any, cycle: bool) -> None:
        """Hypothesis (and IPython) print the short form too."""
        printer.text(repr(self))


@dataclass(frozen=True, slots=True)
class PwmSettings:
    """A PWM carrier: period, duty of the driving switch, dead time (exact picoseconds)."""

    period_ps: int
    duty: Fraction
    dead_time_ps: int

    def __post_init__(self) -> None:
        period = _positive_ps(self.period_ps, "period_ps")
        dead = _positive_ps(self.dead_time_ps, "dead_time_ps", zero_ok=True)
        if 2 * dead >= period:
            raise UsageError(f"dead_time_ps {dead} must be less than half the period ({period} ps)")
        object.__setattr__(self, "period_ps", period)
        object.__setattr__(self, "dead_time_ps", dead)
        object.__setattr__(self, "duty", _duty(self.duty))

    @property
    def frequency_hz(self) -> float:
        """For display only; never compare it."""
        return 1e12 / self.period_ps

    @property
    def on_ps(self) -> int:
        """Commanded on-time of the driving switch per period, rounded down to 1 ps."""
        return self.period_ps * self.duty.numerator // self.duty.denominator

    def __repr__(self) -> str:
        return (
            f"PwmSettings(period_ps={self.period_ps:_}, "
            f"duty=Fraction({self.duty.numerator}, {self.duty.denominator}), "
            f"dead_time_ps={self.dead_time_ps:_})"
        )

    def _repr_pretty_(self, printer: Any, cycle: bool) -> None:
        """Hypothesis (and IPython) print the short form too."""
        printer.text(repr(self))

"""The dead-time formula, the real dead time at the devices, and dead-time distortion.

Times are exact integer picoseconds; the safety factor is a Decimal so that
``93 ns x 1.2`` is exactly ``111.6 ns``. A result that is not a whole picosecond
is rounded up (a longer dead time is the safe side).
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import ROUND_CEILING, Decimal

__all__ = [
    "DeadTimeBudget",
    "SwitchDelays",
    "dead_time_error_voltage",
    "minimum_dead_time",
    "real_dead_time",
]


@dataclass(frozen=True, slots=True)
class SwitchDelays:
    """Worst-case delays of a switch and its driver channel, in picoseconds."""

    turn_off_delay_max_ps: int
    fall_max_ps: int
    turn_on_delay_min_ps: int
    driver_delay_max_ps: int
    driver_delay_min_ps: int

    def __post_init__(self) -> None:
        for name in self.__dataclass_fields__:
            if getattr(self, name) < 0:
                raise ValueError(f"{name} must not be negative")
        if self.driver_delay_min_ps > self.driver_delay_max_ps:
            raise ValueError("driver delay minimum is above its maximum")

    @property
    def turn_off_path_ps(self) -> int:
        """Latest end of conduction after a turn-off command: driver max + td(off) + tf."""
        return self.driver_delay_max_ps + self.turn_off_delay_max_ps + self.fall_max_ps

    @property
    def turn_on_path_ps(self) -> int:
        """Earliest start of conduction after a turn-on command: driver min + td(on)."""
        return self.driver_delay_min_ps + self.turn_on_delay_min_ps


@dataclass(frozen=True, slots=True)
class DeadTimeBudget:
    """The terms of the dead-time formula and its result (picoseconds).

    ``minimum_ps = ceil(((td(off)max + tf,max - td(on)min) + (tpd,max - tpd,min)) x k)``;
    ``without_fall_ps`` is the same without tf (the shorter, IGBT-style budget).
    """

    switch_term_ps: int  # td(off)max + tf,max - td(on)min
    driver_term_ps: int  # tpd,max - tpd,min
    safety_factor: Decimal
    minimum_ps: int
    without_fall_ps: int


def _times(ps: int, factor: Decimal) -> int:
    return int((Decimal(ps) * factor).to_integral_value(rounding=ROUND_CEILING))


def minimum_dead_time(
    delays: SwitchDelays, safety_factor: Decimal | str | float = "1.2"
) -> DeadTimeBudget:
    """The minimum dead time to command, from worst-case switch and driver delays.

    ``[(td(off)max + tf,max - td(on)min) + (tpd,max - tpd,min)] x k``; a negative
    bracket (a switch that turns on slower than it turns off) gives 0.
    """
    k = Decimal(str(safety_factor))
    if not k.is_finite() or k < 1:
        raise ValueError("safety factor must be a number of at least 1")
    driver = delays.driver_delay_max_ps - delays.driver_delay_min_ps
    with_fall = delays.turn_off_delay_max_ps + delays.fall_max_ps - delays.turn_on_delay_min_ps
    without_fall = delays.turn_off_delay_max_ps - delays.turn_on_delay_min_ps
    return DeadTimeBudget(
        switch_term_ps=with_fall,
        driver_term_ps=driver,
        safety_factor=k,
        minimum_ps=max(_times(with_fall + driver, k), 0),
        without_fall_ps=max(_times(without_fall + driver, k), 0),
    )


def real_dead_time(
    commanded_ps: int,
    on_driver_delay_ps: int,
    on_switch_delay_ps: int,
    off_driver_delay_ps: int,
    off_switch_delay_ps: int,
) -> int:
    """Dead time left at the devices: ``T_D' = T_D - (t3 + t4) + (t1 + t2)``.

    t1/t2: driver delay and gate-to-conduction delay of the turn-on; t3/t4: the
    same for the turn-off (t4 includes the fall). Negative means shoot-through.
    """
    return (
        commanded_ps
        - (off_driver_delay_ps + off_switch_delay_ps)
        + (on_driver_delay_ps + on_switch_delay_ps)
    )


def dead_time_error_voltage(bus_v: float, dead_time_ps: int, switching_hz: float) -> float:
    """Average pole-voltage error one switching leg loses to dead time: ``Vdc x td x fsw``.

    Its sign is opposite to the phase current; a bridge with both legs switching
    (locked anti-phase) errs about twice this.
    """
    return bus_v * (dead_time_ps / 1e12) * switching_hz

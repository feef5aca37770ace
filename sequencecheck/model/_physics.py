"""Physical parameters of switches, drivers and bootstrap supplies.

Times are exact picoseconds. Electrical quantities (farads, coulombs, amperes,
volts, ohms) are floats: they feed formulas whose results are rounded once to
picoseconds before any comparison.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["BootstrapSupply", "SwitchTiming"]


@dataclass(frozen=True, slots=True)
class SwitchTiming:
    """Worst-case timing of one switch and its gate-driver channel (picoseconds).

    A commanded turn-on reaches conduction no earlier than
    ``driver_delay_min_ps + turn_on_delay_ps``; a commanded turn-off stops
    conduction no later than ``driver_delay_max_ps + turn_off_delay_ps + fall_ps``.
    """

    driver_delay_min_ps: int = 0
    driver_delay_max_ps: int = 0
    turn_on_delay_ps: int = 0
    rise_ps: int = 0
    turn_off_delay_ps: int = 0
    fall_ps: int = 0

    def __post_init__(self) -> None:
        for name in self.__dataclass_fields__:
            if getattr(self, name) < 0:
                raise ValueError(f"{name} must not be negative")
        if self.driver_delay_min_ps > self.driver_delay_max_ps:
            raise ValueError("driver delay minimum is above its maximum")


@dataclass(frozen=True, slots=True)
class BootstrapSupply:
    """A leg's bootstrap high-side supply.

    ``capacitance_f`` bootstrap capacitor; ``gate_charge_c`` high-side total gate
    charge; ``leakage_a`` leakage plus driver quiescent current drawn from the
    capacitor; ``supply_v`` gate-drive supply; ``diode_drop_v`` bootstrap diode
    drop; ``min_vgs_v`` least gate-source voltage the switch may be left with;
    ``resistance_ohm`` series resistance of the charging path.
    """

    capacitance_f: float
    gate_charge_c: float
    leakage_a: float
    supply_v: float
    diode_drop_v: float
    min_vgs_v: float
    resistance_ohm: float = 0.0

"""Bootstrap high-side supply: charge budget, hold time, refresh, and a walk over a sequence.

Electrical values are floats in SI units; every time result is rounded once to
whole picoseconds on the safe side (hold times down, refresh times up).

Model (documented in DEVELOPERS.md): the capacitor charges toward
``V_full = supply - diode drop`` through ``R`` while the low side conducts
(RC law); each high-side turn-on takes the gate charge ``Q_g`` from it; the
leakage plus driver quiescent current ``I`` drains it at all other times. The
high side's gate-source voltage is the capacitor voltage, which must stay at or
above ``min_vgs_v``.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ..model import BootstrapSupply

__all__ = [
    "BootstrapEvent",
    "BootstrapLimits",
    "HighSideCheck",
    "allowed_droop",
    "full_voltage",
    "hold_time_ps",
    "longest_on_time_s",
    "minimum_capacitance",
    "refresh_time_s",
    "supply_problem",
    "switch_drop_v",
    "total_charge",
    "vgs_after",
    "walk_high_side",
]

PS = 1e-12


def supply_problem(s: BootstrapSupply) -> str | None:
    """Why ``s`` cannot describe a working supply, or None when it can."""
    values = (s.capacitance_f, s.gate_charge_c, s.leakage_a, s.supply_v, s.diode_drop_v)
    if not all(math.isfinite(v) for v in (*values, s.min_vgs_v, s.resistance_ohm)):
        return "every value must be a finite number"
    if s.capacitance_f <= 0 or s.supply_v <= 0 or s.min_vgs_v <= 0:
        return "capacitance, supply and minimum gate voltage must be above zero"
    if min(s.gate_charge_c, s.leakage_a, s.diode_drop_v, s.resistance_ohm) < 0:
        return "gate charge, leakage, diode drop and resistance must not be negative"
    if s.diode_drop_v >= s.supply_v:
        return f"diode drop {s.diode_drop_v:g} V is not below the supply {s.supply_v:g} V"
    if s.min_vgs_v >= s.supply_v - s.diode_drop_v:
        return (
            f"minimum gate voltage {s.min_vgs_v:g} V is not below supply minus diode drop "
            f"({s.supply_v - s.diode_drop_v:g} V)"
        )
    return None


def full_voltage(s: BootstrapSupply) -> float:
    """Capacitor voltage when fully charged: supply minus the diode drop."""
    return s.supply_v - s.diode_drop_v


def allowed_droop(s: BootstrapSupply) -> float:
    """``dV = V_DD - V_F - V_min``: how far the capacitor may droop."""
    return s.supply_v - s.diode_drop_v - s.min_vgs_v


def total_charge(gate_charge_c: float, leakage_a: float, switching_hz: float) -> float:
    """Charge drawn per switching period: ``Q_tot = Q_g + I / f_sw``."""
    return gate_charge_c + leakage_a / switching_hz


def minimum_capacitance(charge_c: float, ripple_v: float) -> float:
    """``C_min = Q_tot / dV``."""
    return charge_c / ripple_v


def longest_on_time_s(
    capacitance_f: float, droop_v: float, gate_charge_c: float, leakage_a: float
) -> float:
    """``t_on,max = (C dV - Q_g) / I``; 0 when the gate charge alone exceeds the budget,
    infinity when nothing leaks."""
    spare = capacitance_f * droop_v - gate_charge_c
    if spare <= 0:
        return 0.0
    return math.inf if leakage_a == 0 else spare / leakage_a


def refresh_time_s(
    resistance_ohm: float, capacitance_f: float, droop_v: float, residual_v: float
) -> float:
    """RC law: low-side on-time to bring a droop of ``droop_v`` back within ``residual_v``:
    ``t = R C ln(dV0 / delta)`` (0 when already within)."""
    if droop_v <= residual_v:
        return 0.0
    return resistance_ohm * capacitance_f * math.log(droop_v / residual_v)


def switch_drop_v(charge_c: float, period_s: float, resistance_ohm: float) -> float:
    """Average drop across a charging path of ``R`` carrying ``Q`` each ``T``: ``Q / T x R``."""
    return charge_c / period_s * resistance_ohm


def vgs_after(s: BootstrapSupply, on_time_s: float, start_droop_v: float = 0.0) -> float:
    """High-side gate-source voltage at the end of an on-interval of ``on_time_s``."""
    used = (s.gate_charge_c + s.leakage_a * on_time_s) / s.capacitance_f
    return full_voltage(s) - start_droop_v - used


def hold_time_ps(s: BootstrapSupply, start_droop_v: float = 0.0) -> int | None:
    """Longest high-side on-time from a capacitor ``start_droop_v`` below full, floored
    to picoseconds (-1 when it cannot even turn on); None when nothing leaks."""
    spare = s.capacitance_f * (allowed_droop(s) - start_droop_v) - s.gate_charge_c
    if spare < 0:
        return -1
    if s.leakage_a == 0:
        return None
    return math.floor(spare / s.leakage_a / PS)


@dataclass(frozen=True, slots=True)
class BootstrapLimits:
    """Policy for the bootstrap-refresh rule (``Policy.bootstrap``).

    ``start_charged`` False (the default) treats the capacitor as empty when the
    capture begins, so the first high-side turn-on needs a pre-charge pulse.
    """

    start_charged: bool = False


@dataclass(frozen=True, slots=True)
class HighSideCheck:
    """One high-side on-interval and how the bootstrap supply held it.

    ``hold_ps`` is the longest on-time its starting charge allows (None: no
    leakage, unlimited; -1: cannot turn on), ``margin_ps`` = hold - on-time
    (None when unlimited). ``vgs_end_v`` the gate voltage left at its end.
    """

    start_ps: int
    end_ps: int
    start_droop_v: float
    hold_ps: int | None
    margin_ps: int | None
    vgs_end_v: float
    refresh_ps: int  # the last low-side on-pulse before it (0: none)
    refresh_end_ps: int | None  # when that pulse ended
    first: bool  # no high-side on-interval before it in the window


@dataclass(frozen=True, slots=True)
class BootstrapEvent:
    """A high-side on-interval the supply cannot hold, classified.

    ``check`` is "on-time" (too long even from a full capacitor), "coast" (the
    capacitor drained between the last refresh and the turn-on) or "refresh"
    (the last low-side pulse, or the pre-charge, was too short).
    """

    check: str
    high: HighSideCheck
    measured_ps: int
    required_ps: int


def _drain(droop: float, s: BootstrapSupply, dt_ps: int, full: float) -> float:
    return min(droop + s.leakage_a * dt_ps * PS / s.capacitance_f, full)


def _charge(droop: float, s: BootstrapSupply, dt_ps: int) -> float:
    tau = s.resistance_ohm * s.capacitance_f
    if tau == 0:
        return 0.0
    return droop * math.exp(-dt_ps * PS / tau)


def walk_high_side(
    s: BootstrapSupply,
    high: Sequence[tuple[int, int]],
    low: Sequence[tuple[int, int]],
    start_ps: int,
    *,
    high_clipped_start: bool = False,
    start_charged: bool = False,
) -> tuple[HighSideCheck | None, list[BootstrapEvent]]:
    """Follow the capacitor through the high- and low-side on-intervals (sorted, disjoint
    per side) and check every high-side on-interval.

    Returns the passing interval with the smallest margin (None if none passed or
    nothing leaks) and an event for every failing one. The capacitor starts empty
    (``start_charged`` False), so the first high-side turn-on needs a pre-charge
    pulse. A high-side interval already on when the window opens is given a full
    capacitor: only its length is judged.
    """
    full = full_voltage(s)
    budget = allowed_droop(s)
    c, qg, leak = s.capacitance_f, s.gate_charge_c, s.leakage_a
    tau = s.resistance_ohm * c
    drain_per_ps = leak * PS / c
    droop = 0.0 if start_charged else full
    events: list[BootstrapEvent] = []
    worst: HighSideCheck | None = None
    worst_margin = math.inf
    t = start_ps
    j, n_low = 0, len(low)
    for n, (hs, he) in enumerate(high):
        last_pulse, last_end, pulse_droop = 0, None, 0.0
        while j < n_low and low[j][0] < hs:
            ls, le = low[j]
            ls, cut = max(ls, t), min(le, hs)
            if cut > ls:
                droop = min(droop + (ls - t) * drain_per_ps, full)
                pulse_droop = droop
                droop = 0.0 if tau == 0 else droop * math.exp(-(cut - ls) * PS / tau)
                last_pulse, last_end, t = cut - ls, cut, cut
            if le <= hs:
                j += 1
            else:
                break
        clipped = n == 0 and high_clipped_start
        droop = 0.0 if clipped else min(droop + (hs - t) * drain_per_ps, full)
        on_ps = he - hs
        spare = c * (budget - droop) - qg
        if leak == 0:
            margin = -1 if spare < 0 else None
            hold = -1 if spare < 0 else None
        else:
            hold = -1 if spare < 0 else math.floor(spare / leak / PS)
            margin = hold - on_ps
        if margin is not None and (margin < 0 or margin < worst_margin):
            vgs = vgs_after(s, on_ps * PS, droop)
            check = HighSideCheck(hs, he, droop, hold, margin, vgs, last_pulse, last_end, n == 0)
            if margin < 0:
                start_droop = pulse_droop if last_end is not None else droop
                events.append(_classify(s, check, budget, on_ps, start_droop))
            else:
                worst, worst_margin = check, margin
        droop = min(droop + (qg + leak * on_ps * PS) / c, full)
        t = he
    return worst, events


def _classify(
    s: BootstrapSupply, c: HighSideCheck, budget: float, on_ps: int, pulse_droop: float
) -> BootstrapEvent:
    full_hold = hold_time_ps(s, 0.0)
    # the droop the capacitor may start this interval with
    target = budget - (s.gate_charge_c + s.leakage_a * on_ps * PS) / s.capacitance_f
    if target <= 0 or (full_hold is not None and on_ps > full_hold):
        return BootstrapEvent("on-time", c, on_ps, max(full_hold or 0, 0))
    coast = 0 if c.refresh_end_ps is None else c.start_ps - c.refresh_end_ps
    coast_drain = s.leakage_a * coast * PS / s.capacitance_f
    if c.refresh_end_ps is not None and coast_drain >= target:
        max_coast = (
            math.floor(target * s.capacitance_f / s.leakage_a / PS) if s.leakage_a else coast
        )
        return BootstrapEvent("coast", c, coast, max(max_coast, 0))
    need_s = refresh_time_s(s.resistance_ohm, s.capacitance_f, pulse_droop, target - coast_drain)
    need = max(math.ceil(need_s / PS), c.refresh_ps + 1 if s.resistance_ohm == 0 else 1)
    return BootstrapEvent("refresh", c, c.refresh_ps, need)

"""Bridge statements: legs, polarity, limits, modes, transitions, timing, bootstrap."""

from __future__ import annotations

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
    SwitchTiming,
    TransitionPolicy,
    TransitionRule,
)
from ._modes import MAX_DEPTH, MAX_TERMS, measure, resolve
from ._state import LoaderState
from ._values import quantity

__all__ = ["BridgeStatements"]

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


class BridgeStatements(LoaderState):
    """``on_<statement>`` for each bridge statement, and the Bridge and Policy they make."""

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
            return self.error(f"mode {name}: {message}", token or name)

        exprs = {n: m.expr for n, m in self.modes.items()}
        expr: ModeExpr = resolve(node, self.legs, self.switch_of, exprs, fail)
        # earlier modes are put in place, so the expansion can nest deeper or grow
        # far larger than this line: bound both, or evaluating it would never end
        depth, terms = measure(expr)
        if depth > MAX_DEPTH + 1:
            raise fail(
                f"with the modes it uses put in place, the expression nests deeper than "
                f"{MAX_DEPTH} levels",
                None,
            )
        if terms > MAX_TERMS:
            raise fail(
                f"with the modes it uses put in place, the expression grows past "
                f"{MAX_TERMS:,} terms",
                None,
            )
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

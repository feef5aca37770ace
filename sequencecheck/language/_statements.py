"""Grammar rules to plain statement tuples, reduced as the LALR parser goes (no tree).

Each method is named after a rule (or alias) of grammar/bridge.lark and returns
a tuple whose first item names the statement; the loader dispatches on it.
Tokens are kept as they are so the loader can report their line and column.
"""

from __future__ import annotations

from typing import Any

from lark import Token, Transformer, v_args

__all__ = ["Statements"]


@v_args(inline=True)
class Statements(Transformer):  # type: ignore[type-arg]
    """Stateless: one instance serves every parse."""

    # tables
    def step_set(self, time: Token, settings: Token | None) -> tuple[Any, ...]:
        return ("step", time, None, settings)

    def step_mode(self, time: Token, mode: Token, settings: Token | None) -> tuple[Any, ...]:
        return ("step", time, mode, settings)

    def repeat_open(self, count: Token, every: Token | None) -> tuple[Any, ...]:
        return ("repeat", count, every)

    def block_close(self) -> tuple[Any, ...]:
        return ("close",)

    def window_end(self, time: Token) -> tuple[Any, ...]:
        return ("end", time)

    def include(self, path: Token) -> tuple[Any, ...]:
        return ("include", path)

    # bridges
    def leg(self, name: Token, high: Token, low: Token) -> tuple[Any, ...]:
        return ("leg", name, high, low)

    def active_low(self, *names: Token) -> tuple[Any, ...]:
        return ("active_low", names)

    def dead_time_both(self, leg: Token | None, value: Token) -> tuple[Any, ...]:
        return ("dead_time", leg, ((None, value),))

    def dead_time_split(
        self, leg: Token | None, *directions: tuple[Token, Token]
    ) -> tuple[Any, ...]:
        return ("dead_time", leg, directions)

    def direction(self, which: Token, value: Token) -> tuple[Token, Token]:
        return (which, value)

    def min_pulse(self, value: Token) -> tuple[Any, ...]:
        return ("limit", "min_pulse_ps", value)

    def min_margin(self, value: Token) -> tuple[Any, ...]:
        return ("limit", "require_margin_ps", value)

    def reversal_dwell(self, value: Token) -> tuple[Any, ...]:
        return ("limit", "reversal_dwell_ps", value)

    def mode_def(self, name: Token, expr: tuple[Any, ...]) -> tuple[Any, ...]:
        return ("mode", name, expr)

    def transition(
        self, verdict: Token, src: Token, dst: Token, after: Token | None
    ) -> tuple[Any, ...]:
        return ("transition", verdict, src, dst, after)

    def dwell(self, mode: Token, value: Token) -> tuple[Any, ...]:
        return ("dwell", mode, value)

    def scheme(self, name: Token) -> tuple[Any, ...]:
        return ("scheme", name)

    def timing(self, target: Token, *items: tuple[Token, ...]) -> tuple[Any, ...]:
        return ("timing", target, items)

    def driver_delay(self, low: Token, high: Token | None) -> tuple[Token, ...]:
        return ("driver-delay", low, high or low)

    def timing_value(self, key: Token, value: Token) -> tuple[Token, ...]:
        return (str(key), value)

    def bootstrap(self, leg: Token, *items: tuple[Token, Token]) -> tuple[Any, ...]:
        return ("bootstrap", leg, items)

    def bootstrap_item(self, key: Token, value: Token) -> tuple[Token, Token]:
        return (key, value)

    # mode expressions: small tuples, resolved against the bridge by _modes.py
    def expr(self, *operands: tuple[Any, ...]) -> tuple[Any, ...]:
        return ("or", operands)

    def and_expr(self, *operands: tuple[Any, ...]) -> tuple[Any, ...]:
        return ("and", operands)

    def negation(self, operand: tuple[Any, ...]) -> tuple[Any, ...]:
        return ("not", operand)

    def switch_ref(self, token: Token) -> tuple[Any, ...]:
        return ("switch", token)

    def name_ref(self, token: Token) -> tuple[Any, ...]:
        return ("name", token)

    def true_(self) -> tuple[Any, ...]:
        return ("const", True)

    def false_(self) -> tuple[Any, ...]:
        return ("const", False)

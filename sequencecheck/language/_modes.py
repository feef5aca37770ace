"""Mode expressions: from parsed tuples to model records, and evaluation over switch states.

Expressions are data (sequencecheck.model.All / Any_ / Not / SwitchOn / Const)
and are evaluated here by walking them; nothing is ever passed to eval().
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from itertools import combinations
from typing import Any

from ..model import All, Any_, Const, Leg, ModeExpr, Not, Side, SwitchOn

__all__ = [
    "MAX_DEPTH",
    "MAX_TERMS",
    "SEARCH_LIMIT",
    "Switch",
    "holds",
    "measure",
    "resolve",
    "single_state",
]

#: Deepest nesting of not/and/or a mode expression may have.
MAX_DEPTH = 100
#: Most terms a mode expression may expand to once earlier modes are put in place
#: (``mode m2 = m1 and m1`` doubles m1): evaluation walks the whole expansion.
MAX_TERMS = 10_000
#: Most switch states tried when finding the one a mode step sets (2**16: 8 legs).
SEARCH_LIMIT = 65_536

Switch = tuple[str, Side]  # (leg name, side)


def resolve(
    node: tuple[Any, ...],
    legs: Mapping[str, Leg],
    switch_of: Mapping[str, Switch],
    modes: Mapping[str, ModeExpr],
    fail: Callable[[str, Any], Exception],
    depth: int = 0,
) -> ModeExpr:
    """Turn a parsed expression into model records.

    ``A.high`` names leg A's high side; a bare name is a channel (its switch)
    or an earlier mode (its expression is used in place). ``fail(message, token)``
    builds the error raised for a name that is neither.
    """
    kind = node[0]
    if depth > MAX_DEPTH:
        raise fail(f"the expression nests deeper than {MAX_DEPTH} levels", None)
    if kind == "switch":
        token = node[1]
        leg, _, side = str(token).partition(".")
        if leg not in legs:
            known = ", ".join(legs) or "none yet"
            raise fail(f"switch {token} names no leg {leg!r} (legs: {known})", token)
        return SwitchOn(leg, Side(side))
    if kind == "name":
        token = node[1]
        name = str(token)
        if name in switch_of:
            return SwitchOn(*switch_of[name])
        if name in modes:
            return modes[name]
        channels = ", ".join(switch_of) or "none yet"
        known_modes = ", ".join(modes) or "none yet"
        raise fail(
            f"{name!r} is neither a switch channel nor an earlier mode "
            f"(channels: {channels}; modes: {known_modes})",
            token,
        )
    if kind == "const":
        return Const(bool(node[1]))
    if kind == "not":
        return Not(resolve(node[1], legs, switch_of, modes, fail, depth + 1))
    operands = tuple(resolve(op, legs, switch_of, modes, fail, depth + 1) for op in node[1])
    return All(operands) if kind == "and" else Any_(operands)


def measure(expr: ModeExpr) -> tuple[int, int]:
    """(depth, terms) of ``expr`` fully expanded, counted without expanding it.

    Modes built from earlier modes share their sub-expressions, so the expansion
    can be exponentially larger than the text; each shared node is measured once.
    """
    seen: dict[int, tuple[int, int]] = {}
    order: list[ModeExpr] = []
    stack: list[ModeExpr] = [expr]
    while stack:  # children before parents, without recursion
        node = stack.pop()
        if id(node) in seen:
            continue
        seen[id(node)] = (0, 0)
        order.append(node)
        stack.extend(_children(node))
    for node in reversed(order):
        kids = [seen[id(k)] for k in _children(node)]
        depth = 1 + max((d for d, _ in kids), default=0)
        terms = 1 + sum(t for _, t in kids)
        seen[id(node)] = (depth, terms)
    return seen[id(expr)]


def _children(expr: ModeExpr) -> tuple[ModeExpr, ...]:
    if isinstance(expr, All | Any_):
        return tuple(expr.operands)
    if isinstance(expr, Not):
        return (expr.operand,)
    return ()


def holds(expr: ModeExpr, on: frozenset[Switch]) -> bool:
    """Whether ``expr`` is true when exactly the switches in ``on`` are on."""
    if isinstance(expr, SwitchOn):
        return (expr.leg, expr.side) in on
    if isinstance(expr, All):
        return all(holds(e, on) for e in expr.operands)
    if isinstance(expr, Any_):
        return any(holds(e, on) for e in expr.operands)
    if isinstance(expr, Not):
        return not holds(expr.operand, on)
    return bool(expr.value)


def single_state(expr: ModeExpr, switches: tuple[Switch, ...]) -> frozenset[Switch] | str:
    """The one state with the fewest switches on for which ``expr`` holds.

    Returns the set of switches on, or a sentence saying why there is no single
    such state (never true, or several equally small states).
    """
    tried = 0
    for k in range(len(switches) + 1):
        found = []
        for c in combinations(switches, k):
            tried += 1
            if tried > SEARCH_LIMIT:
                return f"its state is not found among the first {SEARCH_LIMIT:,} switch states"
            if holds(expr, frozenset(c)):
                found.append(frozenset(c))
        if len(found) == 1:
            return found[0]
        if found:
            shown = " or ".join(
                "{" + ", ".join(f"{leg}.{side}" for leg, side in sorted(s)) + "}" for s in found[:3]
            )
            return f"it holds in several states with {k} switch(es) on ({shown})"
    return "it holds in no state of the bridge's switches"

"""Legs from flags (``A=AH,AL``) or guessed from channel names (``QA_H``/``QA_L``)."""

from __future__ import annotations

import re
from collections.abc import Iterable, Sequence

from ._printable import name_list, printable
from .errors import UsageError
from .model import Leg

__all__ = ["guess_legs", "parse_leg"]

_SUFFIX = re.compile(r"^(?P<base>.*?)[_\-. ]?(?P<side>HS|LS|HI|LO|HIGH|LOW|H|L)$", re.I)
_HIGH = {"h", "hs", "hi", "high"}


def parse_leg(text: str) -> Leg:
    """``NAME=HIGH,LOW`` -> Leg."""
    name, eq, rest = text.partition("=")
    parts = [p.strip() for p in rest.split(",")]
    if not eq or not name.strip() or len(parts) != 2 or not all(parts):
        raise UsageError(f"--leg must look like NAME=HIGH,LOW (e.g. A=AH,AL), not {text!r}")
    return Leg(name.strip(), parts[0], parts[1])


def guess_legs(channels: Iterable[str]) -> tuple[Leg, ...]:
    """Pair channels named like ``A_H``/``A_L``, ``QA_HS``/``QA_LS`` or ``UH``/``UL``.

    Returns legs in the order their high side appears; channels that pair with
    nothing are left out. Callers decide what to do when nothing pairs.
    """
    sides: dict[str, dict[str, str]] = {}
    order: list[str] = []
    for ch in channels:
        m = _SUFFIX.match(ch)
        if not m or not m.group("base"):
            continue
        base = m.group("base").rstrip("_-. ")
        side = "high" if m.group("side").lower() in _HIGH else "low"
        slot = sides.setdefault(base, {})
        if side in slot:
            continue
        slot[side] = ch
        if base not in order:
            order.append(base)
    return tuple(Leg(b, sides[b]["high"], sides[b]["low"]) for b in order if len(sides[b]) == 2)


def legs_or_guess(legs: Sequence[Leg], channels: Sequence[str], path: str) -> tuple[Leg, ...]:
    """The legs given, or the ones the channel names suggest; UsageError if none."""
    if legs:
        return tuple(legs)
    found = guess_legs(channels)
    if not found:
        raise UsageError(
            f"{printable(path)}: cannot tell the legs from channels "
            f"{printable(name_list(channels))}; "
            "name them with --leg NAME=HIGH,LOW"
        )
    return found

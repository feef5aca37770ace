"""Electrical quantities from text: ``100nF``, ``54 nC``, ``115uA``, ``0.85V``, ``20kHz``.

Values are floats in base SI units (farads, coulombs, amperes, volts, ohms,
hertz). They feed formulas whose time results are rounded once to whole
picoseconds; times themselves are parsed by :func:`sequencecheck.units.parse_duration`.
"""

from __future__ import annotations

import math
import re

from ..errors import UsageError

__all__ = ["SI_PREFIXES", "parse_quantity"]

#: Multipliers of the SI prefixes the tool accepts.
SI_PREFIXES: dict[str, float] = {
    "p": 1e-12,
    "n": 1e-9,
    "u": 1e-6,
    "µ": 1e-6,
    "μ": 1e-6,
    "m": 1e-3,
    "": 1.0,
    "k": 1e3,
    "M": 1e6,
}
_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S*)\s*$")
_UNIT_NAMES = {
    "F": "farads",
    "C": "coulombs",
    "A": "amperes",
    "V": "volts",
    "ohm": "ohms",
    "Hz": "hertz",
}
_ALIASES = {"ohm": ("ohm", "ohms", "Ω", "R"), "Hz": ("Hz", "hz")}


def parse_quantity(
    text: str,
    unit: str,
    *,
    what: str = "value",
    allow_negative: bool = False,
    allow_zero: bool = True,
) -> float:
    """Parse ``text`` as a quantity in ``unit`` (``F C A V ohm Hz``) with an SI prefix.

    A bare number is taken in the base unit. Anything else (another unit, a time,
    a negative value unless allowed) raises UsageError naming ``what``.
    """
    match = _NUMBER.match(text)
    example = f"such as 100n{unit}" if unit != "ohm" else "such as 10ohm"
    if not match:
        raise UsageError(f"{what} must be a number in {_UNIT_NAMES[unit]} {example}, not {text!r}")
    number, suffix = match.groups()
    scale = _scale(suffix, unit)
    if scale is None:
        raise UsageError(f"{what} must be in {_UNIT_NAMES[unit]} ({unit}), {example}, not {text!r}")
    value = float(number) * scale
    if not math.isfinite(value):
        raise UsageError(f"{what} is not a finite number: {text!r}")
    if value < 0 and not allow_negative:
        raise UsageError(f"{what} must not be negative: {text!r}")
    if value == 0 and not allow_zero:
        raise UsageError(f"{what} must be above zero: {text!r}")
    return value


def _scale(suffix: str, unit: str) -> float | None:
    names = _ALIASES.get(unit, (unit,))
    if suffix == "":
        return 1.0
    for name in names:
        if suffix.endswith(name):
            prefix = suffix[: -len(name)]
            if prefix in SI_PREFIXES:
                return SI_PREFIXES[prefix]
    return None

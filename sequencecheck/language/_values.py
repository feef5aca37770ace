"""Times, durations and electrical quantities as written in the bridge language.

Times become exact picoseconds (as ``units.parse_duration`` reads them);
electrical quantities become floats in base SI units.
"""

from __future__ import annotations

import re
from decimal import Decimal

from ..errors import InputError, UsageError
from ..units import PS_PER_UNIT, DurationRangeError, parse_duration

__all__ = ["MAX_PS", "QUANTITY_UNITS", "Where", "check_range", "duration_ps", "quantity", "time_ps"]

#: Latest time a table may reach (int64 picoseconds, with room for sums): about 53 days.
MAX_PS = 2**62

Where = tuple[str, int, int]  # path, line, column

_SPLIT = re.compile(r"^(\+?)((?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)[ \t]*([a-zµμ]*)$")
_DIGITS = 24  # longer numbers are read as decimals (and found out of range there)
_CACHE: dict[str, tuple[bool, int]] = {}


def time_ps(text: str, where: Where) -> tuple[bool, int]:
    """``+750ns`` -> (True, 750000); ``10us`` -> (False, 10000000). Cached by text."""
    hit = _CACHE.get(text)
    if hit is not None:
        return hit
    m = _SPLIT.match(text)
    if m is None:  # pragma: no cover - the grammar admits only these shapes
        raise InputError(f"expected a time, found {text!r}", path=where[0], line=where[1])
    plus, number, unit = m.groups()
    if number.isdigit() and len(number) <= _DIGITS and unit in PS_PER_UNIT and PS_PER_UNIT[unit]:
        ps = check_range(int(number) * PS_PER_UNIT[unit], text, where)
    else:
        ps = duration_ps(number + unit, where)
    if len(_CACHE) < 100_000:
        _CACHE[text] = (bool(plus), ps)
    return bool(plus), ps


def duration_ps(text: str, where: Where, what: str = "duration") -> int:
    """A DURATION token to picoseconds; finer than 1 ps is an InputError at ``where``."""
    path, line, column = where
    try:
        ps = parse_duration(text, what=what)
    except DurationRangeError:
        ps = MAX_PS + 1  # worded below as this language's own limit
    except UsageError as e:
        raise InputError(str(e), path=path, line=line, column=column) from None
    except (ArithmeticError, ValueError):  # an exponent or a digit count beyond any int
        ps = MAX_PS + 1
    return check_range(ps, text, where)


def check_range(ps: int, text: str, where: Where) -> int:
    """``ps`` itself, or an InputError if it lies beyond MAX_PS."""
    if ps > MAX_PS:
        path, line, column = where
        raise InputError(
            f"{text!r} is beyond the longest time a table may span (about 53 days)",
            path=path,
            line=line,
            column=column,
        )
    return ps


#: Unit symbol of each kind of quantity the language accepts.
QUANTITY_UNITS = {"F": "farads", "C": "coulombs", "A": "amperes", "V": "volts", "ohm": "ohms"}
_PREFIX = {"": 1, "p": Decimal("1e-12"), "n": Decimal("1e-9"), "u": Decimal("1e-6"),
           "µ": Decimal("1e-6"), "μ": Decimal("1e-6"), "m": Decimal("1e-3"), "k": 1000}  # fmt: skip
_QUANTITY = re.compile(r"^([0-9.eE+-]+)[ \t]*([pnuµμmk]?)(F|C|A|V|ohm|Ω)$")


def quantity(text: str, unit: str, what: str, where: Where) -> float:
    """``100nF`` read as ``unit`` "F" -> 1e-07; a different unit is an InputError."""
    m = _QUANTITY.match(text)
    path, line, column = where
    if m is None:  # pragma: no cover - the grammar admits only these shapes
        raise InputError(f"{what}: expected a value with a unit, found {text!r}",
                         path=path, line=line, column=column)  # fmt: skip
    number, prefix, found = m.groups()
    try:
        value = float(Decimal(number) * _PREFIX[prefix])
    except ArithmeticError:
        value = float("inf")
    found = "ohm" if found == "Ω" else found
    if found != unit:
        example = {"F": "100nF", "C": "54nC", "A": "115uA", "V": "12V", "ohm": "10ohm"}[unit]
        raise InputError(
            f"{what} is in {QUANTITY_UNITS[unit]}, such as {example}, not {text!r}",
            path=path,
            line=line,
            column=column,
        )
    if not value < 1e30:
        raise InputError(f"{what}: {text!r} is out of range", path=path, line=line, column=column)
    return value

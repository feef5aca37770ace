"""Exact time: integer picoseconds in, engineering text out.

>>> parse_duration("1.5us")
1500000
>>> format_time(12_345_600_000)
'12.345 600 ms'
"""

from __future__ import annotations

import re
from decimal import Context, Decimal, Inexact, InvalidOperation, Overflow, Underflow, localcontext

from .errors import UsageError

__all__ = [
    "PS_PER_UNIT",
    "DurationRangeError",
    "format_duration",
    "format_time",
    "parse_duration",
    "ps_to_seconds",
    "unit_scale",
]

#: Picoseconds in one of each time unit the tool accepts.
PS_PER_UNIT: dict[str, int] = {
    "fs": 0,  # placeholder: finer than the tool's resolution, handled by readers
    "ps": 1,
    "ns": 1_000,
    "us": 1_000_000,
    "µs": 1_000_000,
    "μs": 1_000_000,
    "ms": 1_000_000_000,
    "s": 1_000_000_000_000,
}
_UNITS = {k: v for k, v in PS_PER_UNIT.items() if v}


class DurationRangeError(UsageError):
    """A duration beyond what int64 picoseconds hold (callers may word their own limit)."""


#: The longest time the tool represents: int64 picoseconds (about 106 days).
MAX_PS = 2**63 - 1


def _short(text: str) -> str:
    """``text`` quoted, cut in the middle when long (a 5,000-digit number stays readable)."""
    return repr(text) if len(text) <= 40 else repr(text[:18] + "..." + text[-18:])


_EXACT = Context(prec=64, traps=[InvalidOperation, Overflow, Underflow, Inexact])
_DURATION = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([a-zµμ]*)\s*$")


def unit_scale(unit: str) -> int:
    """Picoseconds per ``unit`` (``s ms us ns ps``); UsageError otherwise."""
    try:
        return _UNITS[unit.strip()]
    except KeyError:
        raise UsageError(f"time unit must be one of s, ms, us, ns, ps, not {unit!r}") from None


def parse_duration(text: str, *, what: str = "duration", allow_negative: bool = False) -> int:
    """Parse ``500ns``, ``1.5us``, ``2e-6s``, ``0.25 ms`` or ``40 ps`` to exact picoseconds.

    A bare number is read as seconds only if it is zero. Values finer than 1 ps are
    rejected rather than rounded, so a typo cannot silently change a limit.
    """
    match = _DURATION.match(text)
    if not match:
        raise UsageError(f"{what} must be a duration such as 500ns or 1.5us, not {text!r}")
    number, unit = match.groups()
    if not unit:
        if Decimal(number) == 0:
            return 0
        raise UsageError(f"{what} needs a unit (s, ms, us, ns, ps): {text!r}")
    if unit not in _UNITS:
        raise UsageError(
            f"{what} must be a duration such as 500ns or 1.5us, not {text!r} (unknown unit {unit!r})"
        )
    try:
        with localcontext(_EXACT):
            value = Decimal(number) * _UNITS[unit]
            exact = value == value.to_integral_value()
    except Overflow:  # absurd exponents (Overflow is also Inexact: caught first)
        raise DurationRangeError(f"{what} {_short(text)} is out of range") from None
    except (Underflow, Inexact):  # absurdly small, or more digits than any real limit
        raise UsageError(
            f"{what} {_short(text)} is finer than the tool's 1 ps resolution"
        ) from None
    if not exact:
        raise UsageError(f"{what} {text!r} is finer than the tool's 1 ps resolution")
    if abs(value) > MAX_PS:
        raise DurationRangeError(f"{what} {_short(text)} is out of range (at most about 106 days)")
    ps = int(value)
    if ps < 0 and not allow_negative:
        raise UsageError(f"{what} must not be negative: {text!r}")
    return ps


def ps_to_seconds(ps: int | None) -> float | None:
    """Float seconds for reports (JSON); never used for comparisons."""
    return None if ps is None else ps / 1e12


_FORMAT_UNITS = (("s", 10**12), ("ms", 10**9), ("us", 10**6), ("ns", 10**3), ("ps", 1))


def format_time(ps: int) -> str:
    """Exact engineering text: ``12_345_600_000`` -> ``'12.345 600 ms'``.

    The unit is the largest one the magnitude reaches; decimals come in groups
    of three and trailing all-zero groups are dropped, so nothing is rounded.
    """
    ps = int(ps)
    if ps == 0:
        return "0 s"
    sign = "-" if ps < 0 else ""
    mag = abs(ps)
    for unit, scale in _FORMAT_UNITS:
        if mag >= scale or scale == 1:
            whole, frac = divmod(mag, scale)
            digits = len(str(scale)) - 1
            text = str(whole)
            if digits:
                frac_text = f"{frac:0{digits}d}"
                groups = [frac_text[i : i + 3] for i in range(0, digits, 3)]
                while groups and groups[-1] == "000":
                    groups.pop()
                if groups:
                    text += "." + " ".join(groups)
            return f"{sign}{text} {unit}"
    raise AssertionError("unreachable")  # pragma: no cover


format_duration = format_time

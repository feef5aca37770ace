"""Syntax errors in plain words: where, what was found, and what was expected.

Lark reports the terminals it expected (TIME, SETTINGS, ...); people get a
description of each instead, plus a hint for the usual slips (a time without a
unit, ``AH = on`` with spaces, a setting other than on/off/1/0).
"""

from __future__ import annotations

import re
from typing import Any

from ..errors import InputError

__all__ = ["TERMINAL_WORDS", "syntax_error"]

#: What each terminal of grammar/bridge.lark is, in words.
TERMINAL_WORDS = {
    "TIME": "a time such as 0, 10us or +750ns",
    "DURATION": "a duration such as 500ns",
    "SETTINGS": "switch settings such as AH=on BL=off",
    "NAME": "a name",
    "SWITCH": "a switch such as A.high",
    "COUNT": "a whole number of passes",
    "PATH": 'a file name in double quotes, such as "drive.bridge"',
    "QUANTITY": "a value with its unit, such as 100nF, 54nC, 115uA, 12V or 10ohm",
    "DIRECTION": "a direction (high-to-low or low-to-high)",
    "STATE": "a mode name or *",
    "VERDICT": "allow or forbid",
    "SCHEME": "sign-magnitude or locked-anti-phase",
    "TIMING_KEY": "a timing (driver-delay, turn-on-delay, turn-off-delay, rise or fall)",
    "SUPPLY_KEY": "a bootstrap value (capacitance, gate-charge, leakage, supply, diode-drop, "
    "min-vgs or resistance)",
    "$END": "the end of the line",
    "<END-OF-FILE>": "the end of the line",  # lark's lexer names $END so
}
_STATEMENT = (
    "a step (a time such as 0 or +750ns, then settings such as AH=on or 'mode NAME') or a "
    "statement such as leg, mode, dead-time, allow, repeat, include"
)
_BARE_NUMBER = re.compile(r"^\+?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$")
_NUMBER_UNIT = re.compile(r"^\+?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?([A-Za-zµμ]+)$")
_BAD_SETTING = re.compile(r"^([A-Za-z_][\w.]*)=(\S*)")
_LOOSE_SETTING = re.compile(r"^([A-Za-z_][\w.]*)(=\S*)?$")


def _word_at(text: str, column: int) -> str:
    rest = text[column - 1 :]
    m = re.match(r"\S+", rest)
    if m is None:  # a space-like character the grammar does not skip (form feed, U+2028...)
        return rest[:1]
    return m.group(0)


def _pattern(name: str, parser: Any) -> str:
    try:
        return str(parser.get_terminal(name).pattern.value)
    except (KeyError, AttributeError):  # pragma: no cover - every terminal has a pattern
        return name


def _describe(names: set[str], parser: Any) -> str:
    if {"TIME", "LEG"} <= names:
        return _STATEMENT
    if "TIMING_KEY" in names:  # driver-delay is already named in the timing description
        names = {n for n in names if _pattern(n, parser) != "driver-delay"}
    words = []
    for name in sorted(names, key=lambda n: (n not in TERMINAL_WORDS, n)):
        if name in TERMINAL_WORDS:
            words.append(TERMINAL_WORDS[name])
            continue
        words.append(repr(_pattern(name, parser)))
    if len(words) == 1:
        return words[0]
    return ", ".join(words[:-1]) + " or " + words[-1]


def _hint(found: str, names: set[str], text: str, column: int) -> str | None:
    """A sentence for a usual slip, or None."""
    if names & {"TIME", "DURATION"} and _BARE_NUMBER.match(found):
        return f"a time needs a unit (s, ms, us, ns, ps): write {found.lstrip('+')}us or similar, not {found}"
    if names & {"TIME", "DURATION"} and (m := _NUMBER_UNIT.match(found)):
        return f"unknown time unit {m.group(3)!r} in {found!r}; use s, ms, us, ns or ps"
    step_line = text.lstrip()[:1].isdigit() or text.lstrip()[:1] in "+."
    if names == {"$END"} and step_line and (m := _LOOSE_SETTING.match(found)) is not None:
        return (
            f"{found!r}: set a switch to on or off (or a pin level to 1 or 0), "
            f"such as {m.group(1)}=on"
        )
    if "SETTINGS" in names:
        if step_line and (m := _LOOSE_SETTING.match(found)) is not None and not m.group(2):
            after = text[column - 1 + len(found) :].lstrip()
            if not after.startswith("="):  # a bare switch name: `0 AH`
                return (
                    f"{found!r}: set a switch to on or off (or a pin level to 1 or 0), "
                    f"such as {m.group(1)}=on"
                )
        if (m := _BAD_SETTING.match(found)) is not None:
            return f"{found!r}: set a switch to on or off (or a pin level to 1 or 0), not {m.group(2)!r}"
        after = text[column - 1 + len(found) :].lstrip()
        if after.startswith("="):
            return f"write settings without spaces around '=', such as {found}=on"
    return None


def syntax_error(error: Any, text: str, path: str, line: int, parser: Any) -> InputError:
    """One InputError for lark's UnexpectedInput ``error`` on the line ``text``."""
    from lark.exceptions import UnexpectedCharacters, UnexpectedToken

    if isinstance(error, UnexpectedCharacters):
        column = error.column
        names = set(error.allowed or ())
        found = _word_at(text, column)
    elif isinstance(error, UnexpectedToken) and error.token.type != "$END":
        column = error.column
        names = set(error.accepts or error.expected or ())
        found = _word_at(text, column) or str(error.token)
    else:  # the line ended too soon
        names = set(getattr(error, "expected", None) or ())
        column = len(text.rstrip()) + 1
        found = ""
    hint = _hint(found, names, text, column) if found else None
    expected = _describe(names, parser)
    what = f"found {found!r}" if found else "found the end of the line"
    message = hint if hint else f"expected {expected}, {what}"
    return InputError(message, path=path, line=line, column=column)

"""Making input-derived text safe to print: visible escapes and short name lists."""

from __future__ import annotations

import re
from collections.abc import Iterable

__all__ = ["clip_middle", "name_list", "printable"]

# C0 controls, DEL and C1 controls (U+009B alone starts a terminal control sequence).
_CONTROL = re.compile("[\x00-\x1f\x7f-\x9f]")
_NAMED = {"\n": "\\n", "\r": "\\r", "\t": "\\t"}


def _escape(m: re.Match[str]) -> str:
    ch = m.group()
    return _NAMED.get(ch, f"\\x{ord(ch):02x}")


def printable(text: object) -> str:
    """``text`` as one line with every control character shown as an escape (``\\x1b``)."""
    return _CONTROL.sub(_escape, str(text))


def name_list(names: Iterable[str], limit: int = 20) -> str:
    """``a, b, c``; past ``limit`` names: the first ``limit`` then ``... and N more``."""
    shown: list[str] = []
    more = 0
    for name in names:
        if len(shown) < limit:
            shown.append(str(name))
        else:
            more += 1
    return ", ".join(shown) + (f", ... and {more:,} more" if more else "")


def clip_middle(text: str, limit: int = 280) -> str:
    """``text`` unchanged up to ``limit`` characters, else its start and end around a note
    saying how many characters were left out (the end usually says what was found)."""
    if len(text) <= limit:
        return text
    tail = limit // 4
    head = limit - tail - 40
    cut = len(text) - head - tail
    return f"{text[:head]} ... [{cut:,} characters left out] ... {text[-tail:]}"

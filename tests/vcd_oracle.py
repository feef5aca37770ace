"""An independent VCD reference built on pyvcd's tokenizer, and a pyvcd-based fixture writer.

``oracle_channels`` walks every token pyvcd yields and rebuilds each channel's
initial level and edges in plain Python, so tests can compare the reader with
something that shares none of its code.
"""

from __future__ import annotations

import io
from fractions import Fraction

from vcd.reader import TokenKind, tokenize

UNIT_PS = {
    "s": Fraction(10**12),
    "ms": Fraction(10**9),
    "us": Fraction(10**6),
    "ns": Fraction(10**3),
    "ps": Fraction(1),
    "fs": Fraction(1, 1000),
}
LEVEL = {"0": 0, "1": 1, "x": 2, "z": 3}


def _bits(value: object, width: int) -> str:
    if isinstance(value, int):
        return format(value, f"0{width}b")[-width:]
    text = str(value).lower()
    pad = text[0] if text[0] in "xz" else "0"
    return pad * (width - len(text)) + text


def oracle_channels(data: bytes) -> tuple[dict[str, tuple[int, list[int], list[int]]], int, int]:
    """{full_name[bit]: (initial, times_ps, levels)}, start_ps, end_ps for every 1-bit lane."""
    scope: list[str] = []
    lanes: dict[str, list[tuple[str, int, int]]] = {}  # id -> (name, offset, width)
    scale = Fraction(10**12)
    time = None
    first = None
    changes: dict[str, list[tuple[int, int]]] = {}
    for tok in tokenize(io.BytesIO(data)):
        k = tok.kind
        if k is TokenKind.TIMESCALE:
            scale = tok.data.magnitude * UNIT_PS[tok.data.unit.value]
        elif k is TokenKind.SCOPE:
            scope.append(tok.data.ident)
        elif k is TokenKind.UPSCOPE:
            scope.pop()
        elif k is TokenKind.VAR:
            v = tok.data
            if v.type_.value == "real":
                continue
            full = ".".join([*scope, v.reference])
            for offset in range(v.size):
                name = full if v.size == 1 else f"{full}[{v.size - 1 - offset}]"
                lanes.setdefault(v.id_code, []).append((name, offset, v.size))
                changes.setdefault(name, [])
        elif k is TokenKind.CHANGE_TIME:
            time = tok.data
            if first is None:
                first = time
        elif k in (TokenKind.CHANGE_SCALAR, TokenKind.CHANGE_VECTOR):
            width = lanes[tok.data.id_code][0][2] if tok.data.id_code in lanes else 1
            bits = _bits(tok.data.value, width)
            for name, offset, _ in lanes.get(tok.data.id_code, ()):
                changes[name].append((time, LEVEL[bits[offset]]))
    start = first or 0
    end = time if time is not None else start
    out = {}
    for name, seq in changes.items():
        seq = [(start if t is None else t, v) for t, v in seq]
        initial = 2
        for t, v in seq:
            if t <= start:
                initial = v
        times: list[int] = []
        levels: list[int] = []
        for t, v in seq:
            if t <= start:
                continue
            if times and times[-1] == t:  # last change of an instant wins
                times.pop()
                levels.pop()
            held = levels[-1] if levels else initial
            if v != held:
                times.append(t)
                levels.append(v)
        ps = []
        for t in times:
            assert (t * scale).denominator == 1
            ps.append(int(t * scale))
        out[name] = (initial, ps, levels)
    return out, int(start * scale), int(end * scale)

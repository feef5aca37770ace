"""The raw-bytes fast path for CSV captures shaped ``time,ch,ch,...`` with 0/1 channels.

Logic-analyzer exports write every row in the same layout: a time field, then one
``,0``/``,1`` per channel. A run of rows of equal length is then a 2-D byte array,
and every field sits at a fixed column: channels are read as strided byte
columns, and the time field eight digits at a time (``_swar``) from strided
64-bit words. Every byte of every row is checked against the layout
of the run's first row; anything else raises :class:`Decline` and the general
(pyarrow) reader takes the file, so errors and odd shapes behave exactly as there.

Times equal pyarrow's parse: the decimal's mantissa and exponent are exact
integers, and ``mantissa / 10**k`` (or ``* 10**k``) is correctly rounded while the
mantissa is below 2**53 and k <= 22 (the fast path of Clinger's algorithm).
"""

from __future__ import annotations

import itertools
import re
from collections.abc import Callable, Iterator, Sequence
from typing import BinaryIO

import numpy as np

from ._swar import eight_digits

__all__ = ["PAD", "Decline", "raw_batches", "takes_layout"]

PAD = 16  # bytes in front of each chunk so that 8-byte words never start before it
_MAX_RUNS = 64  # more distinct row lengths in one chunk than this: not a fixed layout
_FLOAT = re.compile(
    r"^(?P<sign>s?)(?P<int>d*)(?:(?P<dot>\.)(?P<frac>d*))?(?:e(?P<esign>s?)(?P<exp>d+))?$"
)
_CLASS = {**{chr(c): "d" for c in range(48, 58)}, ".": ".", "e": "e", "E": "e", "+": "s", "-": "s"}
_POW10 = np.array([10.0**i for i in range(23)])


class Decline(Exception):
    """The fast path does not take this input; read it with the general reader."""


def takes_layout(names: Sequence[str], time_index: int, delimiter: str) -> bool:
    """Whether the header allows the fast path: time first, single-byte delimiter."""
    return time_index == 0 and len(delimiter.encode()) == 1 and len(names) >= 2


def _words(buf: bytes, start: int, n: int, stride: int) -> np.ndarray:
    """The 8 bytes at ``start + i*stride`` for each row i, as little-endian uint64."""
    return np.ndarray(shape=(n,), dtype="<u8", buffer=buf, offset=start, strides=(stride,))


def _column(buf: bytes, start: int, n: int, stride: int) -> np.ndarray:
    return np.ndarray(shape=(n,), dtype=np.uint8, buffer=buf, offset=start, strides=(stride,))


def _digits(buf: bytes, start: int, n: int, stride: int, lo: int, hi: int) -> np.ndarray:
    """Value of the decimal digits at row columns ``[lo, hi)``; Decline if any is not a digit."""
    if hi - lo <= 2:  # one or two digits: byte columns beat a 64-bit word
        out = np.zeros(n, dtype=np.uint64)
        for col in range(lo, hi):
            d = _column(buf, start + col, n, stride) - np.uint8(48)
            if (d > 9).any():
                raise Decline
            out *= np.uint64(10)
            out += d
        return out
    out = np.zeros(n, dtype=np.uint64)
    for w in range((hi - lo + 7) // 8):
        word = _words(buf, start + hi - 8 * (w + 1), n, stride).copy()
        word, bad = eight_digits(word, min(8, hi - lo - 8 * w))
        if bad.any():
            raise Decline
        if w:
            word *= np.uint64(10 ** (8 * w))
        out += word
    return out


def _signs(buf: bytes, start: int, n: int, stride: int, col: int) -> np.ndarray:
    c = _column(buf, start + col, n, stride)
    if not ((c == 43) | (c == 45)).all():
        raise Decline
    return c == 45


def _times(buf: bytes, start: int, n: int, stride: int, width: int, integer: bool) -> np.ndarray:
    """Time fields (columns ``[0, width)`` of each row) as float64, or int64 when ``integer``."""
    first = buf[start : start + width].decode("latin-1")
    pattern = "".join(_CLASS.get(ch, "?") for ch in first)
    m = _FLOAT.match(pattern)
    if m is None or (not m["int"] and not m["frac"]):
        raise Decline
    if integer and (m["dot"] or m["exp"] is not None or m["sign"]):
        raise Decline  # sample indexes: plain digits only
    for col, ch in enumerate(first):  # dot and exponent letter: same byte in every row
        if ch in ".eE" and not (_column(buf, start + col, n, stride) == ord(ch)).all():
            raise Decline
    int_lo, int_hi = m.span("int")
    frac_lo, frac_hi = m.span("frac") if m["dot"] else (int_hi, int_hi)
    n_frac = frac_hi - frac_lo
    n_digits = (int_hi - int_lo) + n_frac
    if n_digits > 18:
        raise Decline
    mant = _digits(buf, start, n, stride, int_lo, int_hi) if int_hi > int_lo else 0
    if n_frac:
        frac = _digits(buf, start, n, stride, frac_lo, frac_hi)
        mant = mant * np.uint64(10**n_frac) + frac if int_hi > int_lo else frac
    mant = np.asarray(mant, dtype=np.uint64)
    negative = _signs(buf, start, n, stride, 0) if m["sign"] else None
    if integer:
        out = mant.astype(np.int64)
        return np.negative(out, where=negative, out=out) if negative is not None else out
    if n_digits > 15 and int(mant.max(initial=0)) > 2**53:
        raise Decline  # beyond exact float64 integers: leave the rounding to pyarrow
    value = mant.astype(np.float64)
    if m["exp"] is None:
        if n_frac:
            value /= _POW10[n_frac]
    else:
        e10 = _digits(buf, start, n, stride, *m.span("exp")).astype(np.int64)
        if m["esign"]:
            np.negative(e10, where=_signs(buf, start, n, stride, m.start("esign")), out=e10)
        e10 -= n_frac
        if int(np.abs(e10).max(initial=0)) > 22:
            raise Decline
        up = e10 >= 0
        value = np.where(
            up, value * _POW10[np.where(up, e10, 0)], value / _POW10[np.where(up, 0, -e10)]
        )
    if negative is not None:
        np.negative(value, where=negative, out=value)
    return value


def _run(
    buf: bytes, start: int, n: int, stride: int, n_channels: int, delim: int, integer: bool
) -> tuple[np.ndarray, np.ndarray]:
    """One run of ``n`` rows of ``stride`` bytes: (times, channel byte columns - '0')."""
    cr = 1 if stride >= 2 and buf[start + stride - 2] == 13 else 0
    if not (_column(buf, start + stride - 1, n, stride) == 10).all():
        raise Decline
    if cr and not (_column(buf, start + stride - 2, n, stride) == 13).all():
        raise Decline
    width = stride - 1 - cr - 2 * n_channels
    if width < 1:
        raise Decline
    values = np.empty((n_channels, n), dtype=np.int8)
    for g in range(0, n_channels, 4):  # four ",v" pairs per 64-bit word
        k = min(4, n_channels - g)
        end = width + 2 * (g + k)  # column just after this group's last value
        mask = pattern = 0
        for j in range(k):
            shift = 8 * (8 - 2 * (k - j))  # little-endian: later bytes are higher
            mask |= (0xFF | 0xFE << 8) << shift
            pattern |= (delim | 48 << 8) << shift
        raw = _words(buf, start + end - 8, n, stride).copy()
        if ((raw & np.uint64(mask)) != np.uint64(pattern)).any():
            raise Decline
        as_bytes = raw.view(np.uint8).reshape(n, 8)
        for j in range(k):
            np.bitwise_and(as_bytes[:, 9 - 2 * (k - j)], 1, out=values[g + j].view(np.uint8))
    return _times(buf, start, n, stride, width, integer), values


def _chunk(
    buf: bytearray, size: int, n_channels: int, delim: int, integer: bool
) -> Iterator[tuple[np.ndarray, np.ndarray]]:
    """Split ``buf[PAD:PAD + size]`` (whole lines) into runs of equal row length, parse each."""
    stride = buf.find(b"\n", PAD) - PAD + 1
    if size % stride == 0 and (_column(buf, PAD + stride - 1, size // stride, stride) == 10).all():
        # every row ends where the first does; _run checks every other byte
        yield _run(buf, PAD, size // stride, stride, n_channels, delim, integer)
        return
    arr = np.frombuffer(buf, dtype=np.uint8, count=size, offset=PAD)
    ends = np.flatnonzero(arr == 10) + 1
    lengths = np.diff(ends, prepend=0)
    cuts = np.flatnonzero(lengths[1:] != lengths[:-1]) + 1
    if cuts.size >= _MAX_RUNS:
        raise Decline
    bounds = [0, *cuts.tolist(), lengths.size]
    for a, b in itertools.pairwise(bounds):
        offset = PAD + (int(ends[a - 1]) if a else 0)
        yield _run(buf, offset, b - a, int(lengths[a]), n_channels, delim, integer)


def _pieces(f: BinaryIO, chunk_bytes: int) -> Iterator[tuple[bytearray, int, int]]:
    """Yield (buffer, size, bytes read) per piece of whole lines at ``buffer[PAD:PAD + size]``.

    Each piece gets a buffer of its own (PAD bytes in front, one spare at the end).
    """
    rest = b""
    done = 0
    while True:
        want = max(chunk_bytes, len(rest))  # a line longer than a chunk: read twice as much
        buf = bytearray(PAD + len(rest) + want + 1)
        buf[PAD : PAD + len(rest)] = rest
        got = f.readinto(memoryview(buf)[PAD + len(rest) : PAD + len(rest) + want])
        done += got
        end = PAD + len(rest) + got
        if got == 0:
            if rest:
                buf[end] = 10  # a last line without a newline
                yield buf, len(rest) + 1, done
            return
        cut = buf.rfind(b"\n", PAD, end) + 1
        if cut == 0:
            rest = bytes(buf[PAD:end])  # a line longer than a chunk: read on
            continue
        rest = bytes(buf[cut:end])
        yield buf, cut - PAD, done


def raw_batches(
    path: str,
    header_bytes: int,
    n_channels: int,
    delimiter: str,
    integer_time: bool,
    chunk_bytes: int,
    progress: Callable[[int], None] | None = None,
) -> Iterator[tuple[np.ndarray, np.ndarray]]:
    """Yield (time values, channel values [n_channels, rows]) per run of rows, in file order."""
    delim = ord(delimiter)
    with open(path, "rb") as f:
        f.seek(header_bytes)
        for buf, size, done in _pieces(f, chunk_bytes):
            yield from _chunk(buf, size, n_channels, delim, integer_time)
            if progress is not None:
                progress(header_bytes + done)

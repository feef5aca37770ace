"""The value-change part of a VCD, read chunk by chunk with state carried across borders.

Runs of plain lines (a timestamp ``#N``, a scalar change such as ``1!`` with an
identifier of up to eight characters, or nothing) go through the numpy fast path;
from any other line the general line parser takes over until no section is open.
Both append to the same per-channel buffers, so the result does not depend on where
chunks are cut.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from ..errors import InputError
from ..model import Level
from ._swar import eight_digits
from ._vcd_header import BitSelect, VcdHeader

__all__ = ["GrowingArray", "VcdBody"]

_LEVEL = {"0": Level.LOW, "1": Level.HIGH, "x": Level.X, "z": Level.Z}
_SCALAR = {**{k: int(v) for k, v in _LEVEL.items()}, "X": int(Level.X), "Z": int(Level.Z)}
_VALUE_LUT = np.full(256, 255, dtype=np.uint8)
for _c, _v in (("0", 0), ("1", 1), ("x", 2), ("X", 2), ("z", 3), ("Z", 3)):
    _VALUE_LUT[ord(_c)] = _v
_DUMP_SECTIONS = {"$dumpvars", "$dumpon", "$dumpoff", "$dumpall"}
_UNDECLARED, _GENERAL, _UNWANTED = -3, -2, -1
#: Masks keeping the first n bytes (n = 0..8) of a little-endian 64-bit word.
_ID_MASKS = np.array([(1 << (8 * n)) - 1 for n in range(8)] + [2**64 - 1], dtype=np.uint64)
_MAX_TICK_DIGITS = 18
_MAX_RESERVE = 1 << 26  # edges per channel reserved ahead at most


class GrowingArray:
    """An append-only array that doubles its capacity: one block per channel and field,
    so memory is the edges themselves (the unused tail is never touched, so never
    resident) instead of thousands of small pieces the allocator keeps after a join."""

    def __init__(self, dtype: type) -> None:
        self._data = np.empty(0, dtype=dtype)
        self.size = 0

    def extend(self, values: np.ndarray) -> None:
        end = self.size + values.size
        if end > self._data.size:
            bigger = np.empty(max(end, 2 * self._data.size, 1 << 12), dtype=self._data.dtype)
            bigger[: self.size] = self._data[: self.size]
            self._data = bigger
        self._data[self.size : end] = values
        self.size = end

    def reserve(self, capacity: int) -> None:
        """Make room for ``capacity`` values now (room never written is never resident),
        so that growing by doubling does not copy what was read so far again and again."""
        if capacity > self._data.size:
            bigger = np.empty(capacity, dtype=self._data.dtype)
            bigger[: self.size] = self._data[: self.size]
            self._data = bigger

    def widen(self, dtype: type) -> None:
        """Hold the values as ``dtype`` from now on."""
        self._data = self._data[: self.size].astype(dtype)

    def view(self) -> np.ndarray:
        return self._data[: self.size]

    def release(self) -> None:
        self._data = self._data[:0]
        self.size = 0


class VcdBody:
    """Accumulates the changes of the selected channels, in ticks, chunk after chunk."""

    #: False sends every line through the general parser (for measurements and tests).
    fast_path = True

    def __init__(self, path: str, head: VcdHeader, selects: Sequence[BitSelect]) -> None:
        self.path = path
        self.num, self.den = head.ps_per_tick.numerator, head.ps_per_tick.denominator
        self.timescale = head.timescale or "1 s"
        self.max_tick = (2**63 - 1) * self.den // self.num
        self.declared = {v.code: v for v in reversed(head.variables)}  # first declaration wins
        self.slot_of: dict[tuple[str, int], int] = {}
        self.channel_slot: list[int] = []
        for s in selects:
            self.channel_slot.append(self.slot_of.setdefault((s.code, s.offset), len(self.slot_of)))
        self.slots_by_code: dict[str, list[tuple[int, int]]] = {}
        for (code, offset), slot in self.slot_of.items():
            self.slots_by_code.setdefault(code, []).append((slot, offset))
        n = len(self.slot_of)
        self.times = [GrowingArray(np.int64) for _ in range(n)]
        self.levels = [GrowingArray(np.int8) for _ in range(n)]
        # line numbers as int32 (half the memory) until a file is long enough to need more
        self.line_dtype: type = np.int32
        self.lines = [GrowingArray(self.line_dtype) for _ in range(n)]
        self.time = -1  # current time in ticks; -1 before the first timestamp
        self.first_time: int | None = None
        self.changes = 0
        self.section: tuple[str, int] | None = None  # open $keyword and its line
        self.outer: tuple[str, int] | None = None  # a dump section around a $comment
        self.pending: tuple[str, int] | None = None  # vector/real value awaiting its id
        self._id_lut = self._one_char_lut()
        self._keys, self._key_slots, self._key_sizes = self._key_table()

    # -- lookup tables for the fast path ---------------------------------------------------
    def _one_char_lut(self) -> np.ndarray:
        lut = np.full(256, _UNDECLARED, dtype=np.int32)
        for code in self.declared:
            if len(code) == 1:
                lut[ord(code)] = self._code_slot(code)
        return lut

    def _code_slot(self, code: str) -> int:
        var = self.declared[code]
        slots = self.slots_by_code.get(code, [])
        if var.width != 1 or var.kind == "real" or len(slots) > 1:
            return _GENERAL if slots or var.kind == "real" else _UNWANTED
        return slots[0][0] if slots else _UNWANTED

    def _key_table(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Identifier codes of 2-8 characters as sorted little-endian integers, their
        slots and their lengths. Codes holding a NUL byte are left to the general parser
        (as integers they would equal shorter codes)."""
        rows = sorted(
            (int.from_bytes(code.encode("latin-1"), "little"), self._code_slot(code), len(code))
            for code in self.declared
            if 2 <= len(code) <= 8 and "\0" not in code
        )
        keys = np.array([k for k, _, _ in rows], dtype=np.uint64)
        slots = np.array([v for _, v, _ in rows], dtype=np.int32)
        return keys, slots, np.array([n for _, _, n in rows], dtype=np.int64)

    # -- chunks ------------------------------------------------------------------------------
    def feed(self, data: bytes, first_line: int) -> int:
        """Consume ``data`` (whole lines) whose first line is number ``first_line``;
        return the number of the line after them.

        Runs of plain lines go through the numpy fast path; from the first line it
        cannot take, the general parser runs until no section or value is open.
        """
        if self.line_dtype is np.int32 and first_line + len(data) >= 2**31 - 1:
            self.line_dtype = np.int64  # every line has a byte: past here lines may not fit
            for lines in self.lines:
                lines.widen(np.int64)
        pos, line = 0, first_line
        while pos < len(data):
            taken = 0
            if self.fast_path and self.section is None and self.pending is None:
                used, taken = self._fast(data, pos, line)
                pos += used
                line += taken
                if pos >= len(data):
                    break
            used, lines = self._general(data, pos, line, min_lines=1 if taken >= 64 else 4096)
            pos += used
            line += lines
        return line

    def expect(self, fraction_read: float) -> None:
        """Reserve room for each channel's edges as if the rest of the file were like the
        part read so far (``fraction_read`` of the body); at most ``_MAX_RESERVE`` edges."""
        if not 0 < fraction_read < 1:
            return
        for arrays in (self.times, self.levels, self.lines):
            for a in arrays:
                guess = int(a.size / fraction_read * 1.05) + 4096
                a.reserve(min(guess, a.size + _MAX_RESERVE))

    def _store(self, slot: int, t: np.ndarray, v: np.ndarray, ln: np.ndarray) -> None:
        self.times[slot].extend(t)
        self.levels[slot].extend(v)
        self.lines[slot].extend(ln)

    def _fast(self, data: bytes, pos: int, first_line: int) -> tuple[int, int]:
        """Take the leading plain lines of ``data[pos:]``; return (bytes, lines) taken."""
        buf = np.frombuffer(data, dtype=np.uint8, offset=pos)
        nl = np.flatnonzero(buf == 10)
        if nl.size == 0:
            return 0, 0
        starts = np.empty_like(nl)
        starts[0] = 0
        starts[1:] = nl[:-1] + 1
        ends = nl
        if data.find(b"\r", pos) >= 0:
            ends = nl - ((buf[np.maximum(nl - 1, 0)] == 13) & (nl > starts))
        length = ends - starts
        head = buf[starts]  # the newline itself for an empty line
        is_time = (head == 35) & (length >= 2) & (length <= _MAX_TICK_DIGITS + 1)
        is_value = _VALUE_LUT[head] < 4
        is_change = (length == 2) & is_value
        second = starts + 1
        if second[-1] >= buf.size:  # an empty last line
            second[-1] = buf.size - 1
        slot = self._id_lut[buf[second]]
        if self._keys.size:  # identifier codes of 2-8 characters (more than 94 variables)
            longer = np.flatnonzero((length >= 3) & (length <= 9) & is_value)
            if longer.size:
                self._long_ids(data, pos, starts[longer], length[longer] - 1, longer, slot)
                is_change[longer] = True
        ok = is_time | (is_change & (slot > _GENERAL)) | (length == 0)
        t_idx = np.flatnonzero(is_time)
        ticks, bad_tick = _parse_ticks(buf, starts[t_idx] + 1, ends[t_idx])
        if bad_tick is not None:
            ok[t_idx[bad_tick]] = False
        n = nl.size if ok.all() else int(np.argmin(ok))
        if n == 0:
            return 0, 0
        if n < nl.size:
            cut = np.searchsorted(t_idx, n)
            ticks, t_idx = ticks[:cut], t_idx[:cut]
            is_time, is_change, slot = is_time[:n], is_change[:n], slot[:n]
        self._check_times(ticks, t_idx + first_line)
        # each change takes the time of the last timestamp line before it
        table = np.empty(ticks.size + 1, dtype=np.int64)
        table[0] = self.time
        table[1:] = ticks
        c_idx = np.flatnonzero(is_change)
        self.changes += int(c_idx.size)
        if ticks.size:
            self.time = int(ticks[-1])
            if self.first_time is None:
                self.first_time = int(ticks[0])
        ch_slot = slot[c_idx]
        counts = np.bincount(ch_slot + 1)[1:] if c_idx.size else np.zeros(0, np.int64)
        if counts.any():
            # group the changes by channel slot (a stable radix sort), then slice
            keys = ch_slot.astype(np.int16) if counts.size < 2**15 else ch_slot
            order = np.argsort(keys, kind="stable")
            order = order[c_idx.size - int(counts.sum()) :]  # drop unwanted ids (slot -1)
            picked = c_idx[order]
            t_of_change = table[np.cumsum(is_time, dtype=np.int32)[picked]]
            level = _VALUE_LUT[head[picked]].astype(np.int8)
            lines = picked.astype(self.line_dtype) + first_line
            bounds = np.concatenate(([0], np.cumsum(counts)))
            for s in np.flatnonzero(counts).tolist():
                a, b = int(bounds[s]), int(bounds[s + 1])
                self._store(s, t_of_change[a:b], level[a:b], lines[a:b])
        return int(nl[n - 1]) + 1, n

    def _long_ids(
        self,
        data: bytes,
        pos: int,
        starts: np.ndarray,
        sizes: np.ndarray,
        rows: np.ndarray,
        slot: np.ndarray,
    ) -> None:
        """Look up multi-character identifiers (after the value character) into ``slot``."""
        padded = np.frombuffer(data[pos:] + bytes(8), dtype=np.uint8)
        words = np.ndarray(
            shape=(padded.size - 7,), dtype="<u8", buffer=padded.data, offset=0, strides=(1,)
        )
        key = words[starts + 1] & _ID_MASKS[sizes]
        at = np.minimum(np.searchsorted(self._keys, key), self._keys.size - 1)
        # a key of the same length: trailing NUL bytes must not vanish in the padding
        found = (self._keys[at] == key) & (self._key_sizes[at] == sizes)
        slot[rows] = np.where(found, self._key_slots[at], _UNDECLARED)

    def _check_times(self, ticks: np.ndarray, lines: np.ndarray) -> None:
        """Raise for the first timestamp that goes back or is not a whole picosecond."""
        if ticks.size == 0:
            return
        prev = np.empty_like(ticks)
        prev[0] = self.time
        prev[1:] = ticks[:-1]
        bad = (ticks < prev) | (ticks > self.max_tick)
        if self.den != 1:
            bad |= ticks % self.den != 0
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            self._check_time(int(prev[i]), int(ticks[i]), int(lines[i]))

    def _check_time(self, before: int, now: int, line: int) -> None:
        if now < before:
            self._backwards(before, now, line)
        if now > self.max_tick:
            self._fail(f"timestamp #{now} is too large to hold in picoseconds", line)
        if self.den != 1 and now % self.den:
            self._fail(
                f"timestamp #{now} at a timescale of {self.timescale} is not a whole "
                "picosecond; expected times in whole picoseconds",
                line,
            )

    def _backwards(self, before: int, now: int, line: int) -> None:
        raise InputError(
            f"timestamp #{now} goes back in time after #{before}; expected non-decreasing times",
            path=self.path,
            line=line,
        )

    # -- the general line parser ------------------------------------------------------------
    def _general(self, data: bytes, pos: int, first_line: int, min_lines: int) -> tuple[int, int]:
        """Parse lines of ``data[pos:]`` one by one until at least ``min_lines`` are done
        and no section or value is open; return (bytes, lines) taken."""
        out: dict[int, tuple[list[int], list[int], list[int]]] = {}
        i, n, size = pos, 0, len(data)
        declared, slots_by_code = self.declared, self.slots_by_code
        while i < size:
            j = data.find(b"\n", i)
            end = size if j < 0 else j + 1
            ln = first_line + n
            for tok in data[i:end].decode("latin-1").split():
                level = _SCALAR.get(tok[0])
                code = tok[1:]
                if (  # the commonest token, a 1-bit change outside any section: inline
                    level is not None
                    and code in declared
                    and self.section is None
                    and self.pending is None
                    and declared[code].width == 1
                ):
                    self.changes += 1
                    for slot, _ in slots_by_code.get(code, ()):
                        t, v, lines = out.setdefault(slot, ([], [], []))
                        t.append(self.time)
                        v.append(level)
                        lines.append(ln)
                else:
                    self._token(tok, ln, out)
            i = end
            if j >= 0:  # a piece may end inside a line (between tokens): same line next time
                n += 1
            if n >= min_lines and self.section is None and self.pending is None:
                break
        for s, (t, v, lines) in out.items():
            self._store(
                s,
                np.array(t, dtype=np.int64),
                np.array(v, dtype=np.int8),
                np.array(lines, dtype=self.line_dtype),
            )
        return i - pos, n

    def _token(self, tok: str, ln: int, out: dict) -> None:
        if self.section is not None:
            if tok == "$end":
                self.section = self.outer
                self.outer = None
                return
            if self.section[0] not in _DUMP_SECTIONS:
                return  # $comment text
            if tok == "$comment":
                self.outer, self.section = self.section, (tok, ln)
                return
        if self.pending is not None:
            value, vline = self.pending
            self.pending = None
            self._vector(value, tok, vline, out)
            return
        c = tok[0]
        if c == "#":
            digits = tok[1:]
            if not digits.isdigit() or not digits.isascii():
                self._fail(f"expected a timestamp such as #100, found {tok[:40]!r}", ln)
            if len(digits) > _MAX_TICK_DIGITS + 1 and len(digits.lstrip("0")) > 19:
                self._fail(  # beyond int64 in any timescale; int() would refuse it anyway
                    f"timestamp {tok[:24]}... ({len(digits)} digits) is too large to hold "
                    "in picoseconds",
                    ln,
                )
            t = int(digits)
            if t < self.time or t > self.max_tick or (self.den != 1 and t % self.den):
                self._check_time(self.time, t, ln)
            self.time = t
            if self.first_time is None:
                self.first_time = t
        elif c in "01xXzZ":
            if len(tok) == 1:
                self._fail(f"value {tok!r} has no identifier code after it", ln)
            self._scalar(_LEVEL[c.lower()], tok[1:], ln, out)
        elif c in "bBrR":
            self.pending = (tok, ln)
        elif c == "$":
            if tok in _DUMP_SECTIONS or tok == "$comment":
                self.section = (tok, ln)
            elif tok == "$end":
                self._fail("$end without an open section", ln)
            else:
                self._fail(
                    f"{tok} is not allowed after $enddefinitions; expected #time, a value "
                    "change, $dumpvars, $dumpon, $dumpoff, $dumpall or $comment",
                    ln,
                )
        else:
            self._fail(
                f"expected a timestamp (#N) or a value change (0!, b1010 !, r1.5 !), "
                f"found {tok[:40]!r}",
                ln,
            )

    def _code(self, code: str, ln: int) -> None:
        if code not in self.declared:
            self._fail(f"identifier code {code!r} was never declared in a $var", ln)

    def _scalar(self, level: int, code: str, ln: int, out: dict) -> None:
        self._code(code, ln)
        self.changes += 1
        for slot, offset in self.slots_by_code.get(code, ()):
            width = self.declared[code].width
            bit = level if offset == width - 1 or level >= Level.X else Level.LOW
            t, v, lines = out.setdefault(slot, ([], [], []))
            t.append(self.time)
            v.append(bit)
            lines.append(ln)

    def _vector(self, value: str, code: str, ln: int, out: dict) -> None:
        self._code(code, ln)
        self.changes += 1
        if value[0] in "rR":
            return  # real values carry no logic level
        digits = value[1:].lower()
        if not digits or any(d not in "01xz" for d in digits):
            self._fail(f"expected a binary vector such as b1010, found {value[:40]!r}", ln)
        width = self.declared[code].width
        if len(digits) > width:
            self._fail(
                f"vector value {value[:40]!r} has {len(digits)} bits, but {code!r} is "
                f"declared {width} bits wide",
                ln,
            )
        pad = digits[0] if digits[0] in "xz" else "0"
        digits = pad * (width - len(digits)) + digits
        for slot, offset in self.slots_by_code.get(code, ()):
            t, v, lines = out.setdefault(slot, ([], [], []))
            t.append(self.time)
            v.append(_LEVEL[digits[offset]])
            lines.append(ln)

    def _fail(self, message: str, line: int) -> None:
        raise InputError(message, path=self.path, line=line)

    def finish(self, last_line: int) -> None:
        """Say so if the file ended in the middle of something."""
        if self.section is not None:
            kw, ln = self.section
            self._fail(f"file ends inside {kw} (truncated?); expected $end", ln)
        if self.pending is not None:
            value, ln = self.pending
            self._fail(
                f"file ends after value {value[:40]!r} (truncated?); expected an identifier code",
                ln,
            )


def _parse_ticks(
    buf: np.ndarray, starts: np.ndarray, ends: np.ndarray
) -> tuple[np.ndarray, int | None]:
    """Decimal digits ``buf[starts:ends]`` per row as int64 (eight digits at a time).

    Returns the values and the index of the first row that is not all digits
    (its value and later ones are meaningless), or None when all are numbers.
    Rows are taken in groups of equal length, so every mask is a constant.
    """
    n = starts.size
    out = np.zeros(n, dtype=np.int64)
    if n == 0:
        return out, None
    pad = 8 * ((_MAX_TICK_DIGITS + 7) // 8)
    padded = np.empty(buf.size + pad, dtype=np.uint8)
    padded[:pad] = 48
    padded[pad:] = buf
    words_at = np.ndarray(
        shape=(padded.size - 7,), dtype="<u8", buffer=padded.data, offset=0, strides=(1,)
    )  # the 8 bytes starting at every byte offset, as little-endian integers
    lengths = ends - starts
    first_bad: int | None = None
    counts = np.bincount(lengths)
    for length in np.flatnonzero(counts).tolist():
        rows = None if counts[length] == n else np.flatnonzero(lengths == length)
        at = (ends if rows is None else ends[rows]) + pad
        value = np.zeros(at.size, dtype=np.uint64)
        bad = np.zeros(at.size, dtype=bool) if length else np.ones(at.size, dtype=bool)
        for w in range((length + 7) // 8):
            word, not_digit = eight_digits(words_at[at - 8 * (w + 1)], min(8, length - 8 * w))
            bad |= not_digit
            if w:
                word *= np.uint64(10 ** (8 * w))
            value += word
        if rows is None:
            out = value.view(np.int64)
        else:
            out[rows] = value.view(np.int64)
        if bad.any():
            i = int(np.argmax(bad))
            i = i if rows is None else int(rows[i])
            first_bad = i if first_bad is None else min(first_bad, i)
    return out, first_bad

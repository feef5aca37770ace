"""CSV captures: one row per sample or one row per change, read in bounded chunks.

The first row names the columns; the time column is the first unless named.
Each row's values hold until the next row's time.

>>> import io, tempfile, os
>>> p = os.path.join(tempfile.mkdtemp(), "t.csv")
>>> _ = open(p, "w").write("time_ns,AH,AL\\n0,0,1\\n100,0,0\\n200,1,0\\n")
>>> tr = read_csv(p)
>>> tr.channel("AH").times.tolist(), tr.sample_period_ps
([200000], 100000)
"""

from __future__ import annotations

import csv
import math
import os
import re
import stat
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass
from decimal import ROUND_HALF_EVEN, Decimal, InvalidOperation

import numpy as np

from ..errors import InputError, UsageError
from ..model import Channel, Trace
from ..units import unit_scale
from ._csv_fast import Decline, raw_batches, takes_layout

__all__ = ["CsvLayout", "read_csv", "sniff_layout"]

_UNIT_IN_NAME = re.compile(
    r"(?:[\s_\-]*[\(\[]\s*|[_\-\s])(s|ms|us|µs|μs|ns|ps)\s*[\)\]]?\s*$", re.I
)
BLOCK_BYTES = 4 << 20  # pyarrow's block: a row must fit in two
CHUNK_BYTES = 1 << 20  # the raw-bytes path's chunk (small enough to stay in cache)
_PS_LIMIT = float(2**63)  # int64 picoseconds: about 106 days either side of zero
_OUT_OF_RANGE = "is out of range: times must stay within about 106 days (int64 picoseconds)"


@dataclass(frozen=True, slots=True)
class CsvLayout:
    """What the header says: delimiter, column names, time column and its scale."""

    delimiter: str
    names: tuple[str, ...]
    time_index: int
    ps_per_tick: int | None  # exact picoseconds per time unit, or None for a sample index
    sample_period_ps: int | None  # set when the time column is a sample index
    header_bytes: int


def _open_error(path: str) -> InputError:
    if not os.path.exists(path):
        return InputError("no such file", path=path)
    if os.path.isdir(path):
        return InputError("is a folder, expected a CSV file", path=path)
    return InputError("cannot be read (permission?)", path=path)


#: Longest column name accepted (characters).
NAME_LIMIT = 1024
#: Longest header line read (bytes); a longer first line is not a CSV header.
HEADER_LIMIT = 1 << 20


def _header_line(path: str) -> tuple[bytes, int]:
    """The first line (without its end: LF, CRLF or CR) and the bytes it takes."""
    try:
        if os.path.isdir(path):
            raise _open_error(path)
        if not stat.S_ISREG(os.stat(path).st_mode):
            raise InputError(
                "is not a regular file (a pipe or device?); expected a CSV file", path=path
            )
        with open(path, "rb") as f:
            block = f.read(HEADER_LIMIT + 2)
    except OSError:
        raise _open_error(path) from None
    ends = [i for i in (block.find(b"\n"), block.find(b"\r")) if i >= 0]
    if not ends:
        if len(block) > HEADER_LIMIT:
            raise InputError(
                f"the first line is longer than {HEADER_LIMIT:,} bytes; expected a CSV header",
                path=path,
                line=1,
            )
        return block, len(block)
    end = min(ends)
    if end > HEADER_LIMIT:
        raise InputError(
            f"the first line is longer than {HEADER_LIMIT:,} bytes; expected a CSV header",
            path=path,
            line=1,
        )
    after = end + (2 if block[end : end + 2] == b"\r\n" else 1)
    return block[:end], after


def sniff_layout(
    path: str,
    *,
    time_column: str | None = None,
    time_unit: str | None = None,
    sample_rate_hz: float | None = None,
) -> CsvLayout:
    """Read the header line and decide how the rest of the file is read."""
    head, header_bytes = _header_line(path)
    if not head.strip():
        raise InputError(
            "empty file, expected a header row such as 'time,AH,AL'", path=path, line=1
        )
    bom = head.startswith(b"\xef\xbb\xbf")
    try:
        text = head[3 if bom else 0 :].decode("utf-8")
    except UnicodeDecodeError:
        raise InputError(
            "header is not UTF-8 text; is this a CSV file?", path=path, line=1
        ) from None
    if "\x00" in text:
        raise InputError(
            "header holds NUL bytes; expected a text header such as 'time,AH,AL'",
            path=path,
            line=1,
        )
    if text.count('"') % 2:
        raise InputError("a quote opened in the header is never closed", path=path, line=1)
    delimiter = max((",", ";", "\t"), key=text.count)
    csv.field_size_limit(max(csv.field_size_limit(), HEADER_LIMIT))
    names = tuple(n.strip() for n in next(csv.reader([text], delimiter=delimiter)))
    long_name = next((n for n in names if len(n) > NAME_LIMIT), None)
    if long_name is not None:
        raise InputError(
            f"a column name is {len(long_name):,} characters long ({_short(long_name)}); "
            f"expected names of at most {NAME_LIMIT:,}",
            path=path,
            line=1,
        )
    if len(names) < 2:
        raise InputError("header needs a time column and at least one channel", path=path, line=1)
    if len(set(names)) != len(names):
        dup = next(n for n in names if names.count(n) > 1)
        raise InputError(f"column {dup!r} appears twice in the header", path=path, line=1)
    if time_column is None:
        time_index = 0
    elif time_column in names:
        time_index = names.index(time_column)
    else:
        raise InputError(
            f"no time column {time_column!r} in the header (columns: {', '.join(names)})",
            path=path,
            line=1,
        )
    ps_per_tick: int | None
    sample_period_ps = None
    if sample_rate_hz is not None:
        if not (sample_rate_hz > 0 and math.isfinite(sample_rate_hz)):
            raise UsageError(f"--sample-rate must be a positive frequency, not {sample_rate_hz}")
        period = 1e12 / sample_rate_hz
        if not 1 <= period < 2**62:
            raise UsageError(
                f"--sample-rate {sample_rate_hz:g} Hz gives a sample period outside 1 ps to "
                "about 53 days; expected a rate between about 2.2e-7 Hz and 1e12 Hz"
            )
        ps_per_tick = None
        sample_period_ps = round(period)
    elif time_unit is not None:
        ps_per_tick = unit_scale(time_unit)
    else:
        m = _UNIT_IN_NAME.search(names[time_index])
        ps_per_tick = unit_scale(m.group(1).lower()) if m else unit_scale("s")
    return CsvLayout(delimiter, names, time_index, ps_per_tick, sample_period_ps, header_bytes)


def _arrow_batches(
    path: str,
    layout: CsvLayout,
    columns: Sequence[str],
    progress: Callable[[int], None] | None = None,
    time_as_text: bool = False,
) -> Iterator[tuple[np.ndarray, list[np.ndarray]]]:
    """Yield (time column, channel columns) per pyarrow block, as numpy arrays
    (with ``time_as_text``, the time column as an object array of its text)."""
    import pyarrow as pa
    import pyarrow.csv as pacsv

    time_name = layout.names[layout.time_index]
    types = {name: pa.int8() for name in columns}
    types[time_name] = pa.int64() if layout.ps_per_tick is None else pa.float64()
    if time_as_text:
        types[time_name] = pa.string()
    reader = pacsv.open_csv(
        path,  # a path, never a Python file: pyarrow's read-ahead threads must not call Python
        read_options=pacsv.ReadOptions(
            column_names=list(layout.names),
            skip_rows=1,
            block_size=BLOCK_BYTES,
            use_threads=True,
        ),
        parse_options=pacsv.ParseOptions(delimiter=layout.delimiter, ignore_empty_lines=False),
        convert_options=pacsv.ConvertOptions(
            column_types=types,
            include_columns=[time_name, *columns],
            null_values=[],
            strings_can_be_null=False,
            quoted_strings_can_be_null=False,
        ),
    )
    time_type = np.int64 if layout.ps_per_tick is None else np.float64
    size = os.path.getsize(path)
    row_bytes = _mean_row_bytes(path, layout.header_bytes) if progress is not None else 0
    rows = 0
    try:
        for batch in reader:
            if time_as_text:
                t = np.array(batch.column(0).to_pylist(), dtype=object)
            else:
                t = _numpy(batch.column(0), time_type)
            yield t, [_numpy(batch.column(i), np.int8) for i in range(1, len(columns) + 1)]
            rows += t.size
            if progress is not None:  # an estimate: pyarrow does not say how far it has read
                progress(min(size, layout.header_bytes + int(rows * row_bytes)))
    finally:  # stop pyarrow's read-ahead before an error unwinds to exit
        close = getattr(reader, "close", None)
        if close is not None:
            close()
    if progress is not None:
        progress(size)


def _mean_row_bytes(path: str, header_bytes: int) -> float:
    """Average row length in the first 64 KiB after the header (for progress estimates)."""
    with open(path, "rb") as f:
        f.seek(header_bytes)
        sample = f.read(1 << 16)
    return len(sample) / max(1, sample.count(b"\n"))


def _numpy(col: object, dtype: type) -> np.ndarray:
    """A pyarrow column as numpy without pyarrow's pandas-importing to_numpy()."""
    chunks = col.chunks if hasattr(col, "chunks") else [col]  # type: ignore[attr-defined]
    parts = []
    for arr in chunks:
        if arr.null_count:
            raise ValueError("null")
        buf = arr.buffers()[1]
        parts.append(np.frombuffer(buf, dtype=dtype, count=len(arr) + arr.offset)[arr.offset :])
    return parts[0] if len(parts) == 1 else np.concatenate(parts)


#: What the CSV parser trims around a value (spaces and tabs only, not other white space).
_BLANKS = " \t"


def _short(text: str) -> str:
    """``text`` quoted, shortened in the middle when long."""
    return repr(text) if len(text) <= 40 else repr(text[:18] + "..." + text[-18:])


def _diagnose(path: str, layout: CsvLayout, columns: Sequence[str]) -> InputError:
    """Walk the file in pure Python to name the first bad row, after the fast path failed."""
    idx = [layout.names.index(c) for c in columns]
    time_name = layout.names[layout.time_index]
    last_ps: int | None = None
    csv.field_size_limit(max(csv.field_size_limit(), 1 << 30))  # long fields are named, not fatal
    with open(path, newline="", encoding="utf-8-sig", errors="replace") as f:
        reader = csv.reader(f, delimiter=layout.delimiter)
        next(reader, None)
        for row in reader:
            line = reader.line_num
            if len(row) != len(layout.names):
                what = "an empty row" if not row else f"{len(row)} fields"
                return InputError(
                    f"expected {len(layout.names)} fields ({', '.join(layout.names)}), found {what}",
                    path=path,
                    line=line,
                )
            t = row[layout.time_index].strip(_BLANKS)
            try:
                if layout.ps_per_tick is None:
                    int(t)
                elif not math.isfinite(float(t)):
                    return InputError(
                        f"column {time_name!r}: expected a finite time, found {t!r}",
                        path=path,
                        line=line,
                    )
            except ValueError:
                kind = "a sample index" if layout.ps_per_tick is None else "a number"
                return InputError(
                    f"column {time_name!r}: expected {kind}, found {t!r}", path=path, line=line
                )
            if layout.ps_per_tick is None:
                t_ps = int(t) * (layout.sample_period_ps or 0)
                if not 0 <= t_ps < 2**63:
                    return InputError(
                        f"column {time_name!r}: expected a sample index in range "
                        f"(time within int64 picoseconds), found {_short(t)}",
                        path=path,
                        line=line,
                    )
            else:
                t_ps = int(np.rint(float(t) * layout.ps_per_tick))
            if last_ps is not None and t_ps < last_ps:  # as the batch check words it
                return InputError(
                    f"time goes backwards (column {time_name!r}); expected non-decreasing time",
                    path=path,
                    line=line,
                )
            last_ps = t_ps
            for i, name in zip(idx, columns, strict=True):
                v = row[i].strip(_BLANKS)
                if v not in ("0", "1"):
                    return InputError(
                        f"column {name!r}: expected 0 or 1, found {_short(v)}",
                        path=path,
                        line=line,
                    )
    return InputError("could not be read as CSV (no bad row found; is it truncated?)", path=path)


class _EdgeCollector:
    """Turns consecutive chunks of one channel's samples into edges, carrying the last value."""

    def __init__(self) -> None:
        self.initial: int | None = None
        self.last: int = 0
        self.times: list[np.ndarray] = []
        self.levels: list[np.ndarray] = []
        self.lines: list[np.ndarray] = []

    def feed(self, values: np.ndarray, times: np.ndarray, first_line: int) -> None:
        if self.initial is None:
            self.initial = self.last = int(values[0])
        prev = np.empty_like(values)
        prev[0] = self.last
        prev[1:] = values[:-1]
        idx = np.flatnonzero(values != prev)
        if idx.size:
            self.times.append(times[idx])
            self.levels.append(values[idx].copy())
            self.lines.append(idx.astype(np.int64) + first_line)
        self.last = int(values[-1])

    def channel(self, name: str, start_ps: int) -> Channel:
        def cat(parts: list[np.ndarray], dtype: type) -> np.ndarray:
            return np.concatenate(parts) if parts else np.empty(0, dtype=dtype)

        return Channel.from_changes(
            name,
            self.initial or 0,
            cat(self.times, np.int64),
            cat(self.levels, np.int8),
            cat(self.lines, np.int64),
            start_ps=start_ps,
        )


def read_csv(
    path: str,
    *,
    channels: Sequence[str] | None = None,
    time_column: str | None = None,
    time_unit: str | None = None,
    sample_rate_hz: float | None = None,
    chunk_bytes: int = CHUNK_BYTES,
    progress: Callable[[int], None] | None = None,
    fast_path: bool = True,
) -> Trace:
    """Read a CSV capture into a Trace of the named channels (default: every column).

    Memory is bounded by the number of edges: rows are parsed in chunks of about
    ``chunk_bytes`` (pyarrow's fallback in blocks of at least 4 MiB) and only
    changes are kept. Rows in the common fixed layout
    (time first, then 0/1 channels) take a raw-bytes numpy path; any other shape
    goes through pyarrow. Raises InputError naming the row of any bad value;
    ``progress`` is called with the bytes read so far after each chunk;
    ``fast_path=False`` forces the general reader (for comparisons).
    """
    path = os.fspath(path)
    if chunk_bytes < 1:
        raise ValueError("chunk_bytes must be >= 1")
    layout = sniff_layout(
        path, time_column=time_column, time_unit=time_unit, sample_rate_hz=sample_rate_hz
    )
    time_name = layout.names[layout.time_index]
    wanted = [n for n in layout.names if n != time_name] if channels is None else list(channels)
    for name in wanted:
        if name not in layout.names or name == time_name:
            raise InputError(
                f"no channel {name!r} in the header (columns: {', '.join(layout.names)})",
                path=path,
                line=1,
            )
    if layout.header_bytes >= os.path.getsize(path):  # nothing after the header line
        raise InputError("header only, expected rows of data after it", path=path, line=2)
    if fast_path and takes_layout(layout.names, layout.time_index, layout.delimiter):
        picks = [layout.names.index(name) - 1 for name in wanted]
        raw = raw_batches(
            path,
            layout.header_bytes,
            len(layout.names) - 1,
            layout.delimiter,
            layout.ps_per_tick is None,
            chunk_bytes,
            progress,
        )
        try:
            trace = _assemble(path, layout, wanted, ((t, v[picks]) for t, v in raw))
            return _exactly(trace, path, layout, wanted)
        except Decline:
            pass  # not the fixed layout after all: the general reader decides
    batches = _arrow_batches(path, layout, wanted, progress)
    return _exactly(_assemble(path, layout, wanted, batches), path, layout, wanted)


def _exactly(trace: Trace, path: str, layout: CsvLayout, wanted: Sequence[str]) -> Trace:
    """``trace``, or the file read again with exact time text if float times could be off."""
    if layout.ps_per_tick is None or max(abs(trace.start_ps), abs(trace.end_ps)) < FLOAT_EXACT_PS:
        return trace
    return _assemble(path, layout, wanted, _arrow_batches(path, layout, wanted, time_as_text=True))


def _first_problem(
    path: str,
    layout: CsvLayout,
    wanted: Sequence[str],
    first_line: int,
    tf: np.ndarray | None,
    t: np.ndarray,
    last_t: int | None,
    values: Sequence[np.ndarray],
    raw_t: np.ndarray | None = None,
) -> InputError | None:
    """The earliest bad row of a batch (non-finite, out-of-range or decreasing time,
    value not 0/1)."""
    time_name = layout.names[layout.time_index]
    found: list[tuple[int, int, str]] = []  # (row, order at a tie, message)
    if tf is not None and not np.isfinite(tf).all():
        bad = int(np.flatnonzero(~np.isfinite(tf))[0])
        found.append((bad, 0, f"column {time_name!r}: expected a finite time, found {tf[bad]}"))
    if tf is not None:
        with np.errstate(invalid="ignore", over="ignore"):
            out = np.isfinite(tf) & ~(np.abs(tf * layout.ps_per_tick) < _PS_LIMIT)
        if out.any():
            bad = int(np.flatnonzero(out)[0])
            found.append((bad, 0, f"column {time_name!r}: time {tf[bad]!r} {_OUT_OF_RANGE}"))
    elif raw_t is not None and layout.sample_period_ps:
        most = (2**63 - 1) // layout.sample_period_ps
        out = (raw_t > most) | (raw_t < -most)
        if out.any():
            bad = int(np.flatnonzero(out)[0])
            found.append(
                (bad, 0, f"column {time_name!r}: sample index {int(raw_t[bad])} {_OUT_OF_RANGE}")
            )
    prev = np.empty_like(t)
    prev[1:] = t[:-1]
    prev[0] = t[0] if last_t is None else last_t
    back = np.flatnonzero(t < prev)
    if back.size:
        found.append(
            (
                int(back[0]),
                1,
                f"time goes backwards (column {time_name!r}); expected non-decreasing time",
            )
        )
    for name, v in zip(wanted, values, strict=True):
        over = v.view(np.uint8) > 1
        if over.any():
            bad = int(np.flatnonzero(over)[0])
            found.append((bad, 2, f"column {name!r}: expected 0 or 1, found {int(v[bad])}"))
    if not found:
        return None
    row, _, message = min(found)
    return InputError(message, path=path, line=first_line + row)


#: Beyond this many picoseconds a float64 time may be off by half a picosecond or more,
#: so such files are read again with their time text converted exactly.
FLOAT_EXACT_PS = 2**50


def _exact_ps(texts: np.ndarray, scale: int) -> tuple[np.ndarray, np.ndarray]:
    """Picoseconds from time text, rounded once (half to even), and a float view for checks.

    Unparsable text gives NaN in the float view and out-of-range values +inf, which the
    row checks then name with their line.
    """
    ps = np.zeros(texts.size, dtype=np.int64)
    view = np.empty(texts.size, dtype=np.float64)
    for i, text in enumerate(texts.tolist()):
        try:
            d = Decimal(text.strip(_BLANKS))
        except (InvalidOperation, ValueError):
            view[i] = math.nan
            continue
        if not d.is_finite():
            view[i] = math.nan if d.is_nan() else math.inf
            continue
        exact = (d * scale).to_integral_value(ROUND_HALF_EVEN)
        if abs(exact) >= 2**63:
            view[i] = math.inf
            continue
        ps[i] = int(exact)
        view[i] = float(d)
    return ps, view


def _assemble(
    path: str,
    layout: CsvLayout,
    wanted: Sequence[str],
    batches: Iterator[tuple[np.ndarray, Sequence[np.ndarray]]],
) -> Trace:
    """Turn batches of (raw times, values per wanted channel) into a Trace."""
    time_name = layout.names[layout.time_index]
    collectors = {name: _EdgeCollector() for name in wanted}
    rows = 0
    first_t = last_t = None
    min_step = max_step = None
    try:
        for raw_t, values in batches:
            n = raw_t.size
            if n == 0:
                continue
            first_line = rows + 2
            if layout.ps_per_tick is None:
                tf = None
                with np.errstate(over="ignore"):  # out of range: named below
                    t = raw_t.astype(np.int64, copy=False) * np.int64(layout.sample_period_ps)
            elif raw_t.dtype == object:  # time text, converted exactly
                t, tf = _exact_ps(raw_t, layout.ps_per_tick)
            else:
                tf = raw_t
                with np.errstate(invalid="ignore", over="ignore"):  # nan/inf: named below
                    t = np.rint(tf * layout.ps_per_tick).astype(np.int64)
            problem = _first_problem(path, layout, wanted, first_line, tf, t, last_t, values, raw_t)
            if problem is not None:
                raise problem
            steps = np.diff(t) if last_t is None else np.diff(t, prepend=last_t)
            if steps.size:
                lo, hi = int(steps.min()), int(steps.max())
                min_step = lo if min_step is None else min(min_step, lo)
                max_step = hi if max_step is None else max(max_step, hi)
            if first_t is None:
                first_t = int(t[0])
            last_t = int(t[-1])
            for name, v in zip(wanted, values, strict=True):
                collectors[name].feed(v, t, first_line)
            rows += n
    except (InputError, Decline):
        raise
    except Exception:  # pyarrow's parse/convert errors carry no row: find it ourselves
        raise _diagnose(path, layout, wanted) from None
    if rows == 0 or first_t is None or last_t is None:
        raise InputError("header only, expected rows of data after it", path=path, line=2)
    period = layout.sample_period_ps
    uniform = (
        min_step is not None
        and max_step is not None
        and min_step > 0
        and max_step - min_step <= max(2, min_step // 1000)  # float rounding of time text
    )
    if period is None and uniform:
        period = max_step  # uniformly spaced rows are samples
    end = last_t + (period or 0)
    return Trace(
        channels={name: c.channel(name, first_t) for name, c in collectors.items()},
        start_ps=first_t,
        end_ps=end,
        path=path,
        sample_period_ps=period,
        rows=rows,
        kind="csv-sampled" if period else "csv-changes",
        meta={"time_column": time_name, "columns": layout.names},
    )

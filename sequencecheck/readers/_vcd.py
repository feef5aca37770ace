"""IEEE 1364 value change dumps (VCD, IEEE Std 1364-2005 clause 18) as Traces.

Channels are 1-bit variables named by reference (``ha``), by full hierarchical
name (``top.driver.ha``) or as one bit of a vector (``bus[3]``). x and z are kept
as Level.X and Level.Z. The body is read in chunks of ``chunk_bytes``; memory
grows with the changes of the selected channels, not with the file.

>>> import tempfile, os
>>> p = os.path.join(tempfile.mkdtemp(), "t.vcd")
>>> _ = open(p, "w").write(
...     "$timescale 10ns $end $scope module top $end $var wire 1 ! ls $end\\n"
...     "$var wire 1 # hs $end $upscope $end $enddefinitions $end\\n"
...     "#0\\n1!\\n0#\\n#100\\n0!\\n#110\\n1#\\n#200\\n")
>>> tr = read_vcd(p)
>>> tr.channel("hs").times.tolist(), tr.channel("ls").times.tolist(), tr.end_ps
([1100000], [1000000], 2000000)
"""

from __future__ import annotations

import os
from collections.abc import Callable, Iterator, Sequence
from typing import Any

import numpy as np

from ..errors import InputError
from ..model import Channel, Level, Trace, normalize_edges
from ._vcd_body import VcdBody
from ._vcd_header import read_header, select

__all__ = ["DEFAULT_CHUNK_BYTES", "read_vcd"]

DEFAULT_CHUNK_BYTES = 1 << 18  # 256 KiB: the per-line arrays of a chunk stay in cache


def _chunks(path: str, offset: int, chunk_bytes: int) -> Iterator[tuple[bytes, int]]:
    """Yield (bytes, bytes read so far) cut after a newline, or between tokens when a
    line is longer than a chunk; no token is ever split."""
    rest = b""
    with open(path, "rb") as f:
        f.seek(offset)
        done = offset
        while True:
            block = f.read(chunk_bytes)
            done += len(block)
            if not block:
                if rest:
                    yield rest, done
                return
            data = rest + block
            cut = data.rfind(b"\n") + 1
            if cut == 0:  # no newline: cut between tokens (VCD may put many on a line)
                cut = max(data.rfind(b" "), data.rfind(b"\t")) + 1
            if cut == 0:
                rest = data
                continue
            rest = data[cut:]
            yield data[:cut], done


def read_vcd(
    path: str,
    *,
    channels: Sequence[str] | None = None,
    chunk_bytes: int = DEFAULT_CHUNK_BYTES,
    progress: Callable[[int], None] | None = None,
    **_csv_options: Any,
) -> Trace:
    """Read a VCD file into a Trace of the named channels (default: every 1-bit variable).

    CSV-only options (time column, unit, sample rate) do not apply and are ignored:
    a VCD carries its own ``$timescale``. Raises InputError naming the line of
    anything that is not IEEE 1364 VCD.
    """
    path = os.fspath(path)
    if chunk_bytes < 1:
        raise ValueError("chunk_bytes must be >= 1")
    _check_not_empty(path)
    head = read_header(path)
    selects = select(head, channels, path)
    body = VcdBody(path, head, selects)
    line = head.body_line
    body_bytes = os.path.getsize(path) - head.body_offset
    for n, (data, done) in enumerate(_chunks(path, head.body_offset, chunk_bytes)):
        line = body.feed(data, line)
        if n == 0 and body_bytes > 0:  # size the edge arrays from what one chunk held
            body.expect((done - head.body_offset) / body_bytes)
        if progress is not None:
            progress(done)
    body.finish(line)
    start_tick = body.first_time if body.first_time is not None else 0
    end_tick = max(body.time, start_tick)
    num, den = body.num, body.den
    built: dict[int, tuple[int, np.ndarray, np.ndarray, np.ndarray]] = {}
    for slot in range(len(body.times)):
        t, v, ln = body.times[slot].view(), body.levels[slot].view(), body.lines[slot].view()
        if t.size and t[0] < start_tick:  # values given before the first timestamp
            t[: np.searchsorted(t, start_tick)] = start_tick
        k = int(np.searchsorted(t, start_tick, side="right"))
        initial = int(v[k - 1]) if k else int(Level.X)
        ps = t[k:]
        if num != 1:
            ps *= num
        if den != 1:
            ps //= den
        built[slot] = (initial, *normalize_edges(initial, ps, v[k:], ln[k:]))
    out: dict[str, Channel] = {}
    for sel, slot in zip(selects, body.channel_slot, strict=True):
        initial, t, v, ln = built[slot]
        out[sel.name] = Channel(sel.name, initial, t, v, ln)
    return Trace(
        channels=out,
        start_ps=start_tick * num // den,
        end_ps=end_tick * num // den,
        path=path,
        sample_period_ps=None,
        rows=body.changes,
        kind="vcd",
        meta={
            "timescale": head.timescale or "1 s (no $timescale given)",
            "variables": [v.full_name for v in head.variables],
        },
    )


def _check_not_empty(path: str) -> None:
    if os.path.getsize(path) == 0:
        raise InputError(
            "empty file, expected a VCD header ($timescale, $var ...)", path=path, line=1
        )

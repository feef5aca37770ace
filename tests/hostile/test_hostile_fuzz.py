"""Hypothesis fuzzing of the CSV reader: mutated captures never crash it, and a sampled
and a change-only export of one capture give the same findings.

Mutations of valid files (byte flips, truncation, insertion of bytes or of tokens the
reader cares about, line duplication, deletion) must end in a Trace or in InputError /
UsageError, never another exception (warnings are errors in this suite). A Trace that
comes back must be sound (strictly increasing edge times inside the window, levels 0/1)
and must have read as many rows as Python's own csv module finds: nothing skipped.
Time per example is bounded by hypothesis' deadline; the CI budget is a few seconds.

Known crash kinds, catalogued as strict xfails in test_hostile_catalogue.py, are listed
in KNOWN_CRASHES so the fuzzer keeps looking for new ones; delete an entry once fixed.
"""

from __future__ import annotations

import csv
import io
import itertools
import os
import re
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from datetime import timedelta

import numpy as np
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from sequencecheck.api import check_file
from sequencecheck.errors import InputError, UsageError
from sequencecheck.model import Bridge, DeadTime, Leg, Policy
from sequencecheck.readers._csv import read_csv

CI = os.environ.get("CI") == "true"
FUZZ = settings(
    # HOSTILE_FUZZ_EXAMPLES=20000 for a longer local run
    max_examples=int(os.environ.get("HOSTILE_FUZZ_EXAMPLES", "300")),
    deadline=timedelta(milliseconds=1500),  # generous: inputs are under ~8 kB
    derandomize=CI,  # CI runs the same examples every time; locally they vary
    suppress_health_check=[HealthCheck.too_slow],
)

#: csv module errors the reader lets escape today (catalogued: "CR-only line ends",
#: "huge single field", "huge channel name", "1 MiB of NUL bytes").
KNOWN_CRASHES: tuple[re.Pattern[str], ...] = ()  # none left: add a pattern to tolerate one


CHANNELS = ("AH", "AL", "BH", "BL")
TOKENS = [
    b",", b";", b"\t", b"\r", b"\n", b"\r\n", b'"', b"\xef\xbb\xbf", b"\x00", b"\xff",
    b"nan", b"inf", b"-inf", b"-1", b"2", b"X", b"1e-300", b"0.5", b"e9", b"AH", b"time_ns",
]  # fmt: skip


@contextmanager
def _scratch(data: bytes, name: str = "capture.csv") -> Iterator[str]:
    with tempfile.TemporaryDirectory(prefix="sc-fuzz-") as folder:
        path = os.path.join(folder, name)
        with open(path, "wb") as f:
            f.write(data)
        yield path


# --- captures and their two exports ----------------------------------------------------


@st.composite
def captures(draw: st.DrawFn) -> np.ndarray:
    """Levels of AH, AL, BH, BL per sample (shape n x 4), built from runs of states."""
    runs = draw(
        st.lists(
            st.tuples(st.integers(1, 12), st.tuples(*[st.integers(0, 1)] * 4)),
            min_size=1,
            max_size=40,
        )
    )
    return np.array([state for length, state in runs for _ in range(length)], dtype=np.int8)


def _time_text(k: int, ts_ns: int, unit: str) -> str:
    return str(k * ts_ns) if unit == "ns" else f"{k * ts_ns / 1000:.3f}"


def sampled_export(levels: np.ndarray, ts_ns: int, unit: str = "ns") -> bytes:
    header = f"time_{unit}," + ",".join(CHANNELS)
    rows = [header] + [
        _time_text(k, ts_ns, unit) + "," + ",".join(map(str, row.tolist()))
        for k, row in enumerate(levels)
    ]
    return ("\n".join(rows) + "\n").encode()


def change_export(levels: np.ndarray, ts_ns: int, unit: str = "ns") -> tuple[bytes, bool]:
    """Rows only where a level changes, plus a last row at the end of the capture.

    Also returns whether the row times are evenly spaced (the reader then takes the
    file for a sampled one, by design).
    """
    n = len(levels)
    changed = [0] + [k for k in range(1, n) if (levels[k] != levels[k - 1]).any()]
    header = f"time_{unit}," + ",".join(CHANNELS)
    rows = [header]
    for k in changed:
        rows.append(_time_text(k, ts_ns, unit) + "," + ",".join(map(str, levels[k].tolist())))
    rows.append(_time_text(n, ts_ns, unit) + "," + ",".join(map(str, levels[-1].tolist())))
    times = [*changed, n]
    steps = {b - a for a, b in itertools.pairwise(times)}
    return ("\n".join(rows) + "\n").encode(), len(steps) == 1


BRIDGE = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")))


def _findings(path: str, dead_ps: int) -> tuple[list[tuple], list[tuple]]:
    """Findings and per-leg statistics, without what depends on the file's form.

    Left out: input lines (sources), certainty and bounds (only a sampled file knows
    its sample period), and the not-proven counts that follow from it.
    """
    report = check_file(path, BRIDGE, Policy(dead_time=DeadTime.both(dead_ps)))
    findings = [
        (f.rule, f.leg, f.channels, f.start_ps, f.end_ps, f.measured_ps, f.required_ps,
         f.margin_ps, str(f.severity), f.message)
        for f in report.findings
    ]  # fmt: skip
    stats = [
        (s.leg, d.count, d.min_gap_ps, d.min_gap_at_ps)
        for s in report.leg_stats
        for d in (s.high_to_low, s.low_to_high)
    ]
    return findings, stats


@FUZZ
@given(
    levels=captures(),
    ts_ns=st.sampled_from([10, 50, 250]),
    unit=st.sampled_from(["ns", "us"]),
    dead_samples=st.integers(0, 6),
)
def test_sampled_and_change_only_exports_agree(
    levels: np.ndarray, ts_ns: int, unit: str, dead_samples: int
) -> None:
    changes, evenly_spaced = change_export(levels, ts_ns, unit)
    assume(not evenly_spaced)
    dead_ps = dead_samples * ts_ns * 1000
    with _scratch(sampled_export(levels, ts_ns, unit)) as a, _scratch(changes) as b:
        sampled, changed = _findings(a, dead_ps), _findings(b, dead_ps)
    assert sampled == changed


# --- mutations -------------------------------------------------------------------------

MUTATION = st.one_of(
    st.tuples(st.just("flip"), st.integers(0, 1 << 20), st.integers(1, 255)),
    st.tuples(st.just("truncate"), st.integers(0, 1 << 20)),
    st.tuples(
        st.just("insert"),
        st.integers(0, 1 << 20),
        st.sampled_from(TOKENS) | st.binary(min_size=1, max_size=6),
    ),
    st.tuples(st.just("duplicate-line"), st.integers(0, 1 << 20)),
    st.tuples(st.just("delete"), st.integers(0, 1 << 20), st.integers(1, 12)),
)


def mutate(data: bytes, mutations: list[tuple]) -> bytes:
    buf = bytearray(data)
    for m in mutations:
        if not buf:
            break
        at = m[1] % len(buf)
        if m[0] == "flip":
            buf[at] ^= m[2]
        elif m[0] == "truncate":
            del buf[at:]
        elif m[0] == "insert":
            buf[at:at] = m[2]
        elif m[0] == "duplicate-line":
            lines = bytes(buf).split(b"\n")
            i = at % len(lines)
            buf = bytearray(b"\n".join([*lines[: i + 1], lines[i], *lines[i + 1 :]]))
        elif m[0] == "delete":
            del buf[at : at + m[2]]
    return bytes(buf)


OPTIONS = st.sampled_from(
    [{}, {"time_unit": "ns"}, {"sample_rate_hz": 100e6}, {"channels": ["AH", "BL"]}]
)


def _csv_records(data: bytes, delimiter: str) -> int | None:
    """Data records Python's csv module finds, or None where it cannot tell."""
    try:
        text = data.decode("utf-8-sig")
        return sum(1 for _ in csv.reader(io.StringIO(text, newline=""), delimiter=delimiter)) - 1
    except (UnicodeDecodeError, csv.Error):
        return None


def _assert_sound_error(e: InputError, path: str) -> None:
    """One line naming the file and, inside a regular file, the line."""
    assert e.path == path
    assert "\n" not in str(e) and "Traceback" not in str(e)
    if e.line is None:
        raise AssertionError(f"error names no line: {e}")


def _assert_sound(trace: object, data: bytes) -> None:
    from sequencecheck.model import Trace

    assert isinstance(trace, Trace)
    assert trace.rows >= 1 and trace.start_ps <= trace.end_ps
    for ch in trace.channels.values():
        assert ch.times.dtype == np.int64 and ch.initial in (0, 1)
        assert set(ch.levels.tolist()) <= {0, 1}
        assert (np.diff(ch.times) > 0).all()
        if ch.times.size:
            assert trace.start_ps < ch.times[0] and ch.times[-1] <= trace.end_ps
    delimiter = str(trace.meta.get("delimiter", "")) or max(
        (",", ";", "\t"), key=data.split(b"\n", 1)[0].decode("utf-8", "replace").count
    )
    records = _csv_records(data, delimiter)
    if records is not None and trace.rows != records:
        # known: an open quote in the header line is accepted (catalogued as
        # "unbalanced quote in the header"); csv then counts the whole file as header
        assume(data.split(b"\n", 1)[0].count(b'"') % 2 == 0)
        raise AssertionError(f"read {trace.rows} rows, the file holds {records} records")


@FUZZ
@given(
    levels=captures(),
    changes_only=st.booleans(),
    mutations=st.lists(MUTATION, min_size=1, max_size=4),
    options=OPTIONS,
)
def test_mutated_captures_never_crash(
    levels: np.ndarray, changes_only: bool, mutations: list[tuple], options: dict
) -> None:
    base = change_export(levels, 10)[0] if changes_only else sampled_export(levels, 10)
    data = mutate(base, mutations)
    with _scratch(data) as path:
        try:
            trace = read_csv(path, **options)
        except InputError as e:
            _assert_sound_error(e, path)
            return
        except UsageError:
            return
        except csv.Error as e:
            assume(not any(k.search(str(e)) for k in KNOWN_CRASHES))
            raise
        _assert_sound(trace, data)


@FUZZ
@given(data=st.binary(max_size=600), options=OPTIONS)
def test_arbitrary_bytes_never_crash(data: bytes, options: dict) -> None:
    with _scratch(data) as path:
        try:
            read_csv(path, **options)
        except InputError as e:
            _assert_sound_error(e, path)
        except UsageError:
            pass
        except csv.Error as e:
            assume(not any(k.search(str(e)) for k in KNOWN_CRASHES))
            raise


def test_exports_are_what_they_claim() -> None:
    """The two exports of one small capture, written out by hand."""
    levels = np.array([[0, 1, 0, 1], [0, 1, 0, 1], [0, 0, 0, 1], [1, 0, 0, 1]], dtype=np.int8)
    assert sampled_export(levels, 10).decode().splitlines()[1:3] == ["0,0,1,0,1", "10,0,1,0,1"]
    changes, even = change_export(levels, 10)
    assert changes.decode().splitlines() == [
        "time_ns,AH,AL,BH,BL",
        "0,0,1,0,1",
        "20,0,0,0,1",
        "30,1,0,0,1",
        "40,1,0,0,1",
    ]
    assert not even


def test_mutate_applies_each_kind() -> None:
    assert mutate(b"ab\ncd\n", [("flip", 0, 3)]) == b"bb\ncd\n"
    assert mutate(b"ab\ncd\n", [("truncate", 4)]) == b"ab\nc"
    assert mutate(b"ab\ncd\n", [("insert", 2, b"X")]) == b"abX\ncd\n"
    assert mutate(b"ab\ncd\n", [("duplicate-line", 1)]) == b"ab\ncd\ncd\n"
    assert mutate(b"ab\ncd\n", [("delete", 1, 2)]) == b"acd\n"

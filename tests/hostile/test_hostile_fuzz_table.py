"""Hypothesis fuzzing of the bridge language: mutated tables and bridge descriptions never
crash the reader, and one table written in different forms reads to identical edges.

Mutations of valid files (byte flips, truncation, inserted bytes or tokens of the
language, duplicated and deleted lines) must end in a Trace or in InputError /
UsageError, never another exception, within hypothesis' deadline per example. A
Trace that comes back must be sound (strictly increasing edge times inside the
window, levels 0/1, a source line for every edge). For valid tables built at random,
relative times, absolute times in mixed units, and a repeat block give the same edges
as a brute-force walk over the steps.

Longer local runs: HOSTILE_FUZZ_EXAMPLES=20000 python -m pytest -q tests/hostile/test_hostile_fuzz_table.py
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from datetime import timedelta
from pathlib import Path

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sequencecheck.errors import InputError, UsageError
from sequencecheck.language import read_table

CI = os.environ.get("CI") == "true"
FUZZ = settings(
    max_examples=int(os.environ.get("HOSTILE_FUZZ_EXAMPLES", "200")),
    deadline=timedelta(milliseconds=2000),  # a bounded time per example: no hang
    derandomize=CI,
    suppress_health_check=[HealthCheck.too_slow],
)
ROOT = Path(__file__).resolve().parents[2]

DRIVE = (
    b"leg A high AH low AL\nleg B high BH low BL\ndead-time 500ns\n"
    b"mode coast = not (AH or AL or BH or BL)\nmode brake = AL and BL\n"
    b"allow brake -> * after 1us\ndwell brake 1us\n"
)
TABLES = [
    b'include "drive.bridge"\n0 AH=off AL=on BL=on\n+1us AL=off\n+500ns AH=on\n+2us AH=off\n'
    b"+500ns AL=on\nend +1us\n",
    b'include "drive.bridge"\n0 mode coast\n+10us mode brake   # charge\nrepeat 3 every 50us {\n'
    b"  0 AL=off\n  +750ns AH=on\n  30us AH=off\n  +750ns AL=on\n}\n+5us mode coast\n",
    b"leg A high AH low AL\nactive-low AL\nmode on = A.high and not A.low\n0 A.low=0\n"
    b"+1us A.low=1\n+0.5us mode on\nrepeat 2 {\n repeat 2 every 1us {\n  0 AL=on\n  +100ns AL=off\n"
    b" }\n}\nend +1ms\n",
    (ROOT / "samples" / "cart_reversal.steps")
    .read_bytes()
    .replace(b"cart.bridge", b"drive.bridge"),
]
TOKENS = [
    b"\n", b"\r", b"\r\n", b" ", b"\t", b"#", b"{", b"}", b"(", b")", b'"', b"=", b"+", b"-", b".",
    b"\x00", b"\xff", b"\xef\xbb\xbf", b"\x0c", "\u2028".encode(), b"0", b"1e999", b"1e-99",
    b"nan", b"inf", b"us", b"ps", b"AH=on", b"AL=off", b"A.high=1", b"mode coast", b"mode brake",
    b"repeat 0 {", b"repeat 99999999999999999999 {", b"repeat 3 every 1us {", b"end",
    b"include", b'include "drive.bridge"', b'include "table.steps"', b"leg A high AH low AL",
    b"mode m = not m", b"mode x = coast and brake", b"not not not", b"9" * 40,
]  # fmt: skip


@contextmanager
def _folder(table: bytes, bridge: bytes = DRIVE) -> Iterator[str]:
    with tempfile.TemporaryDirectory(prefix="sc-fuzz-table-") as folder:
        Path(folder, "drive.bridge").write_bytes(bridge)
        path = Path(folder, "table.steps")
        path.write_bytes(table)
        yield str(path)


def _check_sound(trace) -> None:  # type: ignore[no-untyped-def]
    for ch in trace.channels.values():
        t = ch.times
        assert ch.initial in (0, 1)
        assert set(ch.levels.tolist()) <= {0, 1}
        assert np.all(np.diff(t) > 0), ch.name
        if t.size:
            assert trace.start_ps < t[0] and t[-1] <= trace.end_ps, ch.name
            assert ch.lines is not None and ch.lines.size == t.size and np.all(ch.lines >= 1)
            # each edge really changes the level
            previous = np.concatenate([[ch.initial], ch.levels[:-1]])
            assert np.all(previous != ch.levels), ch.name


def _read_never_crashes(table: bytes, bridge: bytes = DRIVE) -> None:
    with _folder(table, bridge) as path:
        try:
            trace = read_table(path)
        except InputError as e:
            assert "\n" not in str(e) and e.path is not None
            return
        except UsageError:
            return
        _check_sound(trace)


@st.composite
def mutated(draw: st.DrawFn, seeds: list[bytes]) -> bytes:
    data = bytearray(draw(st.sampled_from(seeds)))
    for _ in range(draw(st.integers(1, 4))):
        kind = draw(st.sampled_from(["flip", "truncate", "insert", "token", "dup", "delete"]))
        at = draw(st.integers(0, len(data)))
        if kind == "flip" and data:
            i = min(at, len(data) - 1)
            data[i] ^= 1 << draw(st.integers(0, 7))
        elif kind == "truncate":
            del data[at:]
        elif kind == "insert":
            data[at:at] = draw(st.binary(min_size=1, max_size=8))
        elif kind == "token":
            data[at:at] = draw(st.sampled_from(TOKENS))
        elif kind in ("dup", "delete"):
            lines = bytes(data).split(b"\n")
            i = draw(st.integers(0, len(lines) - 1))
            if kind == "dup":
                lines[i:i] = [lines[i]] * draw(st.integers(1, 3))
            else:
                del lines[i]
            data = bytearray(b"\n".join(lines))
    return bytes(data)


@FUZZ
@given(mutated(TABLES))
def test_mutated_tables_never_crash(table: bytes) -> None:
    _read_never_crashes(table)


@FUZZ
@given(mutated([DRIVE, (ROOT / "samples" / "cart.bridge").read_bytes()]))
def test_mutated_bridges_never_crash(bridge: bytes) -> None:
    _read_never_crashes(TABLES[0], bridge)


# --- one valid table in several forms --------------------------------------------------

SWITCHES = ("AH", "AL", "BH", "BL")
UNITS = {"s": 10**12, "ms": 10**9, "us": 10**6, "ns": 10**3, "ps": 1}


def _in_unit(ps: int, unit: str) -> str:
    """``ps`` exactly in ``unit`` (decimal fractions are exact in the language)."""
    whole, frac = divmod(ps, UNITS[unit])
    if not frac:
        return f"{whole}{unit}"
    digits = len(str(UNITS[unit])) - 1
    return f"{whole}.{str(frac).rjust(digits, '0').rstrip('0')}{unit}"


steps_strategy = st.lists(
    st.tuples(
        st.integers(0, 3_000_000),  # gap to the previous step, ps (0: the same instant)
        st.dictionaries(st.sampled_from(SWITCHES), st.sampled_from(["on", "off"]), min_size=1),
    ),
    min_size=1,
    max_size=25,
)


def _walk(steps: list[tuple[int, dict[str, str]]]) -> dict[str, tuple[int, list[tuple[int, int]]]]:
    """Brute force: each switch's level after each instant; edges where it changes.

    What is set at the first step's instant (0) is the starting level; a switch never
    set there starts off. Of several settings at one instant the last one holds.
    """
    at: dict[str, dict[int, int]] = {s: {} for s in SWITCHES}  # switch -> instant -> level
    t = 0
    for i, (gap, settings_) in enumerate(steps):
        t += gap if i else 0
        for s, v in settings_.items():
            at[s][t] = 1 if v == "on" else 0
    out = {}
    for s in SWITCHES:
        level = at[s].get(0, 0)
        initial, edges = level, []
        for when in sorted(at[s]):
            if when > 0 and at[s][when] != level:
                level = at[s][when]
                edges.append((when, level))
        out[s] = (initial, edges)
    return out


def _render(steps: list[tuple[int, dict[str, str]]], absolute: bool, units: list[str]) -> bytes:
    lines = [b'include "drive.bridge"']
    t = 0
    for i, (gap, settings_) in enumerate(steps):
        t += gap if i else 0
        unit = units[i % len(units)]
        when = (
            ("0" if t == 0 else _in_unit(t, unit))
            if absolute or i == 0
            else "+" + _in_unit(gap, unit)
        )
        body = " ".join(f"{s}={v}" for s, v in settings_.items())
        lines.append(f"{when} {body}".encode())
    return b"\n".join(lines) + b"\n"


def _edges(table: bytes) -> dict[str, tuple[int, list[tuple[int, int]]]]:
    with _folder(table) as path:
        trace = read_table(path)
    return {
        name: (ch.initial, list(zip(ch.times.tolist(), ch.levels.tolist(), strict=True)))
        for name, ch in trace.channels.items()
    }


@FUZZ
@given(steps_strategy, st.lists(st.sampled_from(list(UNITS)), min_size=1, max_size=4))
def test_relative_and_absolute_times_give_the_same_edges(steps, units) -> None:  # type: ignore[no-untyped-def]
    expected = _walk(steps)
    assert _edges(_render(steps, absolute=False, units=units)) == expected
    assert _edges(_render(steps, absolute=True, units=units[::-1])) == expected


@FUZZ
@given(steps_strategy, st.integers(1, 5))
def test_a_repeat_block_gives_the_same_edges_as_its_passes_written_out(steps, passes) -> None:  # type: ignore[no-untyped-def]
    body = _render(steps, absolute=False, units=["ps"]).split(b"\n")[1:-1]
    # a pass starts where the previous one's last step was: its first step is "+0"
    body[0] = b"+0" + body[0][body[0].index(b" ") :]
    first = b'include "drive.bridge"\n0 AH=off AL=off BH=off BL=off\n'
    block = first + b"repeat %d {\n" % passes + b"\n".join(body) + b"\n}\n"
    unrolled = first + b"\n".join(body * passes) + b"\n"
    assert _edges(block) == _edges(unrolled)

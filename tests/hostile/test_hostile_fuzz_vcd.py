"""Hypothesis fuzzing of the VCD reader, and VCD against CSV on the same capture.

- Mutated valid VCD files (byte flips, truncation, inserted bytes and VCD tokens,
  duplicated and deleted lines) end in a Trace or in InputError / UsageError, never
  another exception; an error is one line naming the file and a line; a Trace is sound.
  The same bytes read with a tiny read chunk and with the general line parser instead
  of the numpy fast path give exactly the same result (edges, or error line and text).
- A capture written as VCD (by pyvcd's writer, a general-purpose library) and as a
  change-only CSV gives identical findings.
- Every $timescale the standard allows, in both spellings, reads to exact picoseconds.

Time per example is bounded by hypothesis' deadline; the CI budget is a few seconds.
Known bugs (strict xfails in the catalogue) are listed in KNOWN so the fuzzer keeps
looking for new ones; delete an entry once it is fixed.
"""

from __future__ import annotations

import os
from collections.abc import Iterator
from contextlib import contextmanager, nullcontext
from datetime import timedelta
from fractions import Fraction

import numpy as np
import pytest
from catalogue_vcd import UNIT_PS, _body, _edges, vcd_text
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st
from test_hostile_fuzz import (
    CHANNELS,
    MUTATION,
    _findings,
    _scratch,
    captures,
    change_export,
    mutate,
)

from sequencecheck.errors import InputError, UsageError
from sequencecheck.model import Trace
from sequencecheck.readers._vcd import read_vcd
from sequencecheck.readers._vcd_body import VcdBody

CI = os.environ.get("CI") == "true"
FUZZ = settings(
    # HOSTILE_FUZZ_EXAMPLES=20000 for a longer local run
    max_examples=int(os.environ.get("HOSTILE_FUZZ_EXAMPLES", "200")),
    deadline=timedelta(milliseconds=1500),  # generous: inputs are under ~4 kB
    derandomize=CI,
    suppress_health_check=[HealthCheck.too_slow],
)

TOKENS = [
    b" ", b"\n", b"\r\n", b"\t", b"#", b"#0", b"#-1", b"#99999999999999999999", b"$end",
    b"$dumpvars", b"$dumpoff", b"$dumpon", b"$comment", b"$var", b"$scope", b"$upscope",
    b"$enddefinitions", b"$timescale", b"b", b"b1x0z", b"r1.5", b"x", b"z", b"0", b"1",
    b"!", b'"', b"%", b"\x00", b"\xff", b"\xef\xbb\xbf", b"[3:0]", b"ns", b"10", b"fs",
]  # fmt: skip


# --- a small valid VCD of a capture ------------------------------------------------------


def written_vcd(levels: np.ndarray, tick_ns: int = 10) -> bytes:
    """Leg A and B of the invented pump inverter: scalars, a vector, a real, x levels."""
    head = (
        "$timescale 10 ns $end\n$scope module pump $end\n"
        + "".join(f"$var wire 1 {c} {n} $end\n" for c, n in zip('!"#$', CHANNELS, strict=True))
        + "$var wire 4 %& bus [3:0] $end\n$var real 64 r v $end\n"
        "$upscope $end\n$enddefinitions $end\n"
    )
    lines = ["#0", "$dumpvars", *[f"{v}{c}" for v, c in zip(levels[0], '!"#$', strict=True)]]
    lines += ["bx0 %&", "r0 r", "$end"]
    for k in range(1, len(levels)):
        lines.append(f"#{k * tick_ns // 10}")
        for i, c in enumerate('!"#$'):
            if levels[k][i] != levels[k - 1][i]:
                lines.append(f"{levels[k][i]}{c}")
        if k % 5 == 0:
            lines += [f"b{''.join(map(str, levels[k]))} %&", f"r{k}.5 r"]
    lines.append(f"#{len(levels) * tick_ns // 10}")
    return (head + "\n".join(lines) + "\n").encode()


def _outcome(path: str, chunk_bytes: int = 1 << 20, fast: bool = True) -> tuple:
    VcdBody.fast_path = fast
    try:
        tr = read_vcd(path, chunk_bytes=chunk_bytes)
    except InputError as e:
        return ("error", e.path, e.line, e.message)
    except UsageError as e:
        return ("usage", str(e))
    finally:
        VcdBody.fast_path = True
    _assert_sound(tr)
    chans = {n: (c.initial, c.times.tolist(), c.levels.tolist()) for n, c in tr.channels.items()}
    return ("read", tr.rows, tr.start_ps, tr.end_ps, chans)


def _assert_sound(trace: Trace) -> None:
    assert trace.start_ps <= trace.end_ps
    for ch in trace.channels.values():
        assert ch.times.dtype == np.int64 and ch.initial in (0, 1, 2, 3)
        assert set(ch.levels.tolist()) <= {0, 1, 2, 3}
        assert (np.diff(ch.times) > 0).all()
        if ch.times.size:
            assert trace.start_ps < ch.times[0] and ch.times[-1] <= trace.end_ps


@FUZZ
@given(levels=captures(), mutations=st.lists(MUTATION, min_size=1, max_size=4), tokens=st.data())
def test_mutated_vcd_never_crashes(
    levels: np.ndarray, mutations: list[tuple], tokens: st.DataObject
) -> None:
    # some insertions are VCD tokens rather than random bytes
    mutations = [
        ("insert", m[1], tokens.draw(st.sampled_from(TOKENS)))
        if m[0] == "insert" and tokens.draw(st.booleans())
        else m
        for m in mutations
    ]
    data = mutate(written_vcd(levels), mutations)
    with _scratch(data, "capture.vcd") as path:
        plain = _outcome(path)
        if plain[0] == "error":
            _, where, line, message = plain
            assert where == path and "\n" not in message
            assert line is not None or data.strip() == b"", message
        small = _outcome(path, chunk_bytes=7)
        general = _outcome(path, fast=False)
    assert small == plain, "a 7-byte read chunk changes the result"
    assert general == plain, f"fast path {plain!r:.300} vs general parser {general!r:.300}"


@FUZZ
@given(data=st.binary(max_size=400) | st.lists(st.sampled_from(TOKENS), max_size=40).map(b" ".join))
def test_arbitrary_bytes_never_crash(data: bytes) -> None:
    with _scratch(data, "capture.vcd") as path:
        _outcome(path)


# --- the same capture as VCD and as change-only CSV ------------------------------------

#: pyvcd timescale -> picoseconds per tick: facts.md S10 [published] (IEEE Std 1364-2005 cl. 18)
SCALES = {"1 ns": 1000, "10 ns": 10_000, "100 ps": 100, "1 ps": 1}


def pyvcd_export(levels: np.ndarray, ts_ns: int, scale: str) -> bytes:
    """The capture as a VCD written by pyvcd (change-only, ending at the capture's end)."""
    import io

    from vcd import VCDWriter

    per_sample = ts_ns * 1000 // SCALES[scale]
    text = io.StringIO()
    w = VCDWriter(text, timescale=scale, date="invented pump bench run")
    handles = [
        w.register_var("pump", name, "wire", size=1, init=int(levels[0][i]))
        for i, name in enumerate(CHANNELS)
    ]
    for k in range(1, len(levels)):
        for i, h in enumerate(handles):
            if levels[k][i] != levels[k - 1][i]:
                w.change(h, k * per_sample, int(levels[k][i]))
    w.close(len(levels) * per_sample)
    return text.getvalue().encode()


@settings(FUZZ, max_examples=int(os.environ.get("HOSTILE_FUZZ_EXAMPLES", "100")))
@given(
    levels=captures(),
    ts_ns=st.sampled_from([10, 50, 250]),
    scale=st.sampled_from(sorted(SCALES)),
    dead_samples=st.integers(0, 6),
)
def test_vcd_and_change_only_csv_agree(
    levels: np.ndarray, ts_ns: int, scale: str, dead_samples: int
) -> None:
    changes, evenly_spaced = change_export(levels, ts_ns, "ns")
    assume(not evenly_spaced)  # the CSV reader would take it for a sampled file
    dead_ps = dead_samples * ts_ns * 1000
    with (
        _scratch(pyvcd_export(levels, ts_ns, scale), "capture.vcd") as a,
        _scratch(changes) as b,
    ):
        assert _findings(a, dead_ps) == _findings(b, dead_ps)


def test_pyvcd_export_is_what_it_claims() -> None:
    levels = np.array([[0, 1, 0, 1], [0, 0, 0, 1], [1, 0, 0, 1]], dtype=np.int8)
    text = pyvcd_export(levels, 10, "10 ns").decode()
    assert "$timescale 10 ns $end" in text
    assert text.split("$enddefinitions $end\n")[1].split() == [
        "#0", "$dumpvars", "0!", '1"', "0#", "1$", "$end", "#1", '0"', "#2", "1!", "#3",
    ]  # fmt: skip
    with _scratch(text.encode(), "capture.vcd") as path:
        tr = read_vcd(path)
    assert tr.channel("AH").times.tolist() == [20_000] and tr.end_ps == 30_000


# --- every timescale, both spellings ---------------------------------------------------


@pytest.mark.parametrize("space", ["", " "])
@pytest.mark.parametrize("mag", [1, 10, 100])
@pytest.mark.parametrize("unit", list(UNIT_PS))
def test_every_timescale_reads_exact_picoseconds(
    tmp_path: object, unit: str, mag: int, space: str
) -> None:
    # facts.md S10 [published] (IEEE Std 1364-2005, clause 18): 1, 10 or 100 of
    # s, ms, us, ns, ps, fs, written with or without a space
    ps_per_tick = mag * UNIT_PS[unit]
    ticks = [0, 1001, 2003, 3007, 4011, 5013]
    if unit == "fs":
        ticks = [t * (1000 // mag) for t in ticks]
    with _scratch(vcd_text(_body(ticks), scale=f"{mag}{space}{unit}"), "t.vcd") as path:
        tr = read_vcd(path)
    want = _edges(ticks, ps_per_tick)
    for name, (initial, edges) in want.items():
        ch = tr.channel(name)
        assert (ch.initial, list(zip(ch.times.tolist(), ch.levels.tolist(), strict=True))) == (
            initial,
            edges,
        )
    assert tr.end_ps == ticks[-1] * ps_per_tick


@pytest.mark.parametrize("mag", [1, 10, 100])
def test_sub_picosecond_times_are_refused(mag: int) -> None:
    # facts.md S10 [published]: a 1/10/100 fs timescale is finer than 1 ps
    step = Fraction(1000, mag)  # ticks per picosecond
    bad = int(step * 3) + 1  # 3 ps and one tick: never a whole picosecond
    ticks = [0, int(step), bad, int(step * 5), int(step * 7), int(step * 9)]
    data = vcd_text(_body(ticks), scale=f"{mag} fs")
    with (
        _scratch(data, "t.vcd") as path,
        pytest.raises(InputError, match=rf"#{bad} .*not a whole picosecond") as e,
    ):
        read_vcd(path)
    assert e.value.line == 15  # the line of the third timestamp


@contextmanager
def _general_parser() -> Iterator[None]:
    VcdBody.fast_path = False
    try:
        yield
    finally:
        VcdBody.fast_path = True


def test_once_known_bugs_are_refused_alike_by_both_paths() -> None:
    """Inputs the fuzz campaign once crashed on: one line naming error, fast or general."""
    nul = vcd_text("#0\n0AB\n1AC\n#100\n1AB\0\0\n", codes=("AB", "AC"))
    sup = vcd_text("", extra_vars="$var wire \xb2 # bus $end\n").replace(b"\xc2\xb2", b"\xb2")
    two = vcd_text("#0\nb0 !\n#100\nb1 !\n", extra_vars="$var wire 4 ! bus [3:0] $end\n")
    for data, channels, pattern, line in [
        (nul, None, "identifier code 'AB\\\\x00\\\\x00' was never declared", 12),
        (sup, None, "width must be a whole number of bits >= 1", 6),
        (two, ["bus[0]"], "declared 4 bits wide here but 1 bits wide at line 4", 6),
    ]:
        with _scratch(data, "t.vcd") as path:
            for parser in (nullcontext, _general_parser):
                with parser(), pytest.raises(InputError, match=pattern) as caught:
                    read_vcd(path, channels=channels)
                assert caught.value.line == line

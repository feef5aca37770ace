"""The VCD reader against pyvcd's tokenizer (an independent general-purpose library),
on files pyvcd's writer generates from hypothesis-chosen signals, with the body read
in chunks of every size hypothesis picks."""

from __future__ import annotations

import io

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from vcd_oracle import oracle_channels

from sequencecheck.readers import read_vcd

vcd_writer = pytest.importorskip("vcd.writer")

SCALES = [f"{m} {u}" for m in (1, 10, 100) for u in ("s", "ms", "us", "ns", "ps", "fs")]


@st.composite
def vcd_files(draw: st.DrawFn) -> bytes:
    """A VCD written by pyvcd: scalars and vectors in nested scopes, x/z, dump on/off."""
    scale = draw(st.sampled_from(SCALES))
    mag, unit = scale.split()
    step = 1 if unit != "fs" else 1000 // int(mag)  # keep every time a whole picosecond
    n_vars = draw(st.integers(1, 5))
    widths = [draw(st.sampled_from([1, 1, 1, 2, 3, 5])) for _ in range(n_vars)]
    scopes = [draw(st.sampled_from(["top", "top.drv", "top.drv.leg", "bench"])) for _ in widths]
    events = draw(
        st.lists(
            st.tuples(
                st.integers(0, 3),
                st.integers(0, n_vars - 1),
                st.text("01xzXZ", min_size=1, max_size=5),
                st.sampled_from(["change"] * 12 + ["off", "on"]),
            ),
            max_size=60,
        )
    )
    f = io.StringIO()
    with vcd_writer.VCDWriter(f, timescale=scale, date="today") as w:
        vs = [
            w.register_var(sc, f"s{i}", "wire", size=wd, init=draw(st.sampled_from("01xz")))
            for i, (sc, wd) in enumerate(zip(scopes, widths, strict=True))
        ]
        t = 0
        dumping = True
        for dt, i, text, what in events:
            t += dt * step
            if what == "off" and dumping:
                w.dump_off(t)
                dumping = False
            elif what == "on" and not dumping:
                w.dump_on(t)
                dumping = True
            elif what == "change" and dumping:
                text = text.lower()
                value = text[0] if widths[i] == 1 else text[: widths[i]]
                w.change(vs[i], t, value)
        w.flush()
    text = f.getvalue()
    lines = text.split("\n")
    body = next(i for i, ln in enumerate(lines) if ln.startswith("$enddefinitions")) + 1
    for at in draw(st.lists(st.integers(body, len(lines)), max_size=3)):
        lines.insert(at, "$comment a note from the bench $end")
    if draw(st.booleans()):
        lines = [
            ln.replace("x", "X").replace("z", "Z") if not ln.startswith("$") else ln for ln in lines
        ]
    if draw(st.booleans()):  # tokens need only whitespace between them, not newlines
        joined = draw(st.integers(body, max(body, len(lines) - 1)))
        lines = [*lines[:joined], " ".join(lines[joined:])]
    newline = draw(st.sampled_from(["\n", "\r\n"]))
    return newline.join(lines).encode()


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=vcd_files(), chunk=st.one_of(st.integers(1, 200), st.just(4 << 20)))
def test_reader_matches_pyvcd_tokenizer(tmp_path_factory, data: bytes, chunk: int) -> None:
    path = tmp_path_factory.mktemp("vcd") / "gen.vcd"
    path.write_bytes(data)
    expected, start, end = oracle_channels(data)
    trace = read_vcd(str(path), channels=list(expected), chunk_bytes=chunk)
    assert (trace.start_ps, trace.end_ps) == (start, end)
    for name, (initial, times, levels) in expected.items():
        ch = trace.channel(name)
        assert (ch.initial, ch.times.tolist(), ch.levels.tolist()) == (initial, times, levels), name


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=vcd_files(), chunk=st.integers(1, 200))
def test_plain_python_path_matches_pyvcd_tokenizer(tmp_path_factory, data: bytes, chunk: int):
    """The same comparison with the numpy fast path switched off."""
    from sequencecheck.readers._vcd_body import VcdBody

    path = tmp_path_factory.mktemp("vcd") / "gen.vcd"
    path.write_bytes(data)
    expected, start, end = oracle_channels(data)
    VcdBody.fast_path = False
    try:
        trace = read_vcd(str(path), channels=list(expected), chunk_bytes=chunk)
    finally:
        VcdBody.fast_path = True
    assert (trace.start_ps, trace.end_ps) == (start, end)
    for name, (initial, times, levels) in expected.items():
        ch = trace.channel(name)
        assert (ch.initial, ch.times.tolist(), ch.levels.tolist()) == (initial, times, levels), name


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    n_vars=st.integers(95, 300),
    events=st.lists(st.tuples(st.integers(0, 2), st.integers(0, 299), st.sampled_from("01xz"))),
    chunk=st.one_of(st.integers(16, 400), st.just(1 << 20)),
)
def test_many_variables_with_multi_character_codes(tmp_path_factory, n_vars, events, chunk):
    """More than 94 variables: identifier codes of two characters go through the fast path."""
    f = io.StringIO()
    with vcd_writer.VCDWriter(f, timescale="1 ns", date="today") as w:
        vs = [w.register_var("top.bank", f"g{i}", "wire", size=1, init="0") for i in range(n_vars)]
        t = 0
        for dt, i, value in events:
            t += dt
            w.change(vs[i % n_vars], t, value)
    data = f.getvalue().encode()
    path = tmp_path_factory.mktemp("vcd") / "many.vcd"
    path.write_bytes(data)
    expected, start, end = oracle_channels(data)
    trace = read_vcd(str(path), channels=list(expected), chunk_bytes=chunk)
    assert (trace.start_ps, trace.end_ps) == (start, end)
    for name, (initial, times, levels) in expected.items():
        ch = trace.channel(name)
        assert (ch.initial, ch.times.tolist(), ch.levels.tolist()) == (initial, times, levels), name

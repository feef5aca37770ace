"""Streaming: the result never depends on where chunks are cut, and the CSV raw-bytes
fast path gives exactly what the general (pyarrow) reader gives, errors included."""

from __future__ import annotations

import itertools

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import sequencecheck as sc
from sequencecheck.errors import InputError
from sequencecheck.readers import read_csv

SETTINGS = settings(
    max_examples=120,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture],
)
TIME_FORMATS = ["{:.8f}", "{:.9g}", "{:.6e}", "{:.3E}", "{:.10f}", "{:+.7f}", "{:.4f}"]


@st.composite
def leg_levels(draw: st.DrawFn, n: int) -> tuple[np.ndarray, np.ndarray]:
    """High and low side of one leg over n samples: complementary with random gaps."""
    edges = sorted(draw(st.lists(st.integers(1, max(1, n - 1)), max_size=12, unique=True)))
    high = np.zeros(n, dtype=np.int8)
    low = np.zeros(n, dtype=np.int8)
    state = draw(st.integers(0, 2))  # 0: low on, 1: high on, 2: both off
    bounds = [0, *edges, n]
    for a, b in itertools.pairwise(bounds):
        high[a:b] = state == 1
        low[a:b] = state == 0
        state = draw(st.sampled_from([s for s in (0, 1, 2, 3) if s != state]))
        if state == 3:  # both on now and then: shoot-through
            high[b : b + 1] = 1
            low[b : b + 1] = 1
            state = 2
    return high, low


@st.composite
def sampled_csv(draw: st.DrawFn) -> tuple[str, dict]:
    """CSV text of a sampled two-leg capture in one of several time formats."""
    n = draw(st.integers(1, 80))
    legs = [draw(leg_levels(n)) for _ in range(draw(st.integers(1, 2)))]
    names = ["A_H", "A_L", "B_H", "B_L"][: 2 * len(legs)]
    cols = [c for leg in legs for c in leg]
    kind = draw(st.sampled_from(["seconds", "ns", "index"]))
    step = draw(st.sampled_from([1, 10, 20, 125]))
    t0 = draw(st.integers(0, 10**6))
    options: dict = {}
    if kind == "seconds":
        fmt = draw(st.sampled_from(TIME_FORMATS))
        times = [fmt.format((t0 + i * step) * 1e-9) for i in range(n)]
        header = "time"
    elif kind == "ns":
        times = [str(t0 + i * step) for i in range(n)]
        header = "time_ns"
    else:
        times = [str(t0 + i) for i in range(n)]
        header = "sample"
        options["sample_rate_hz"] = 1e8
    rows = [",".join([t, *(str(int(c[i])) for c in cols)]) for i, t in enumerate(times)]
    if draw(st.booleans()):  # change-only: keep rows where something changed
        keep = [0] + [i for i in range(1, n) if any(c[i] != c[i - 1] for c in cols)]
        rows = [rows[i] for i in keep]
    newline = draw(st.sampled_from(["\n", "\r\n"]))
    text = newline.join([",".join([header, *names]), *rows])
    if draw(st.booleans()):
        text += newline
    return text, options


BREAKAGES = [
    lambda r: r.replace(",1", ",2", 1),
    lambda r: "abc" + r[r.index(",") :],
    lambda r: "nan" + r[r.index(",") :],
    lambda r: r + ",0",
    lambda r: r[: r.rindex(",")],
    lambda r: "",
    lambda r: "-5" + r[r.index(",") :],
    lambda r: " " + r,
]


@st.composite
def maybe_broken_csv(draw: st.DrawFn) -> tuple[str, dict]:
    text, options = draw(sampled_csv())
    lines = text.split("\n")
    if len(lines) > 1 and draw(st.booleans()):
        i = draw(st.integers(1, len(lines) - 1))
        if lines[i].strip():
            lines[i] = draw(st.sampled_from(BREAKAGES))(lines[i])
    return "\n".join(lines), options


def _outcome(read, *args, **kwargs):
    try:
        tr = read(*args, **kwargs)
    except InputError as e:
        return ("error", str(e))
    return (
        "trace",
        tr.start_ps,
        tr.end_ps,
        tr.sample_period_ps,
        tr.rows,
        tr.kind,
        {
            n: (c.initial, c.times.tolist(), c.levels.tolist(), c.lines.tolist())
            for n, c in tr.channels.items()
        },
    )


@SETTINGS
@given(case=maybe_broken_csv(), chunk=st.integers(1, 300))
def test_csv_fast_path_equals_general_reader(tmp_path, case, chunk):
    text, options = case
    path = tmp_path / "c.csv"
    path.write_text(text, newline="")
    general = _outcome(read_csv, str(path), fast_path=False, **options)
    assert _outcome(read_csv, str(path), chunk_bytes=chunk, **options) == general
    assert _outcome(read_csv, str(path), **options) == general


def _vcd_text(names: list[str], cols: list[np.ndarray], step: int) -> str:
    ids = "!#$%"
    lines = ["$timescale 1 ns $end", "$scope module cart $end"]
    lines += [f"$var wire 1 {i} {n} $end" for i, n in zip(ids, names, strict=False)]
    lines += ["$upscope $end", "$enddefinitions $end", "#0", "$dumpvars"]
    lines += [f"{int(c[0])}{i}" for i, c in zip(ids, cols, strict=False)] + ["$end"]
    for k in range(1, cols[0].size):
        changed = [f"{int(c[k])}{i}" for i, c in zip(ids, cols, strict=False) if c[k] != c[k - 1]]
        if changed:
            lines += [f"#{k * step}", *changed]
    lines.append(f"#{cols[0].size * step}")
    return "\n".join(lines) + "\n"


@SETTINGS
@given(
    n=st.integers(2, 120),
    data=st.data(),
    chunk=st.integers(1, 400),
    dead_ns=st.sampled_from([0, 10, 30, 100]),
)
def test_findings_identical_for_every_chunk_size(tmp_path, n, data, chunk, dead_ns):
    """Same findings from CSV and VCD, whatever chunk size the body is read in."""
    legs = [data.draw(leg_levels(n)) for _ in range(2)]
    names = ["A_H", "A_L", "B_H", "B_L"]
    cols = [c for leg in legs for c in leg]
    step = 10
    csv_path = tmp_path / "cap.csv"
    rows = [",".join([str(i * step), *(str(int(c[i])) for c in cols)]) for i in range(n)]
    csv_path.write_text("\n".join([",".join(["time_ns", *names]), *rows]) + "\n")
    vcd_path = tmp_path / "cap.vcd"
    vcd_path.write_text(_vcd_text(names, cols, step))
    bridge = sc.Bridge((sc.Leg("A", "A_H", "A_L"), sc.Leg("B", "B_H", "B_L")))
    policy = sc.Policy(dead_time=sc.DeadTime.both(dead_ns * 1000))
    for path in (csv_path, vcd_path):
        whole = sc.check_file(str(path), bridge, policy)
        pieces = sc.check_file(str(path), bridge, policy, chunk_bytes=chunk)
        assert pieces.findings == whole.findings
        assert pieces.leg_stats == whole.leg_stats
        assert (pieces.rows, pieces.edges, pieces.end_ps) == (whole.rows, whole.edges, whole.end_ps)

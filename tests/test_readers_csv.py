"""CSV reader: layouts it accepts, and one-line errors naming file, row and expectation."""

from __future__ import annotations

import pytest

from sequencecheck import InputError, read_csv
from sequencecheck.errors import UsageError

NS = 1_000


def test_change_rows_become_exact_edges(write_csv):
    path = write_csv("time_ns,AH,AL\n0,0,1\n100,0,0\n250,1,0\n400,0,0\n")
    tr = read_csv(path)
    ah = tr.channel("AH")
    assert (ah.initial, ah.times.tolist(), ah.levels.tolist()) == (0, [250 * NS, 400 * NS], [1, 0])
    assert ah.lines.tolist() == [4, 5]  # file lines of the rows that changed
    assert (tr.start_ps, tr.end_ps, tr.rows, tr.sample_period_ps) == (0, 400 * NS, 4, None)


def test_sampled_rows_get_a_sample_period_and_window_end(write_csv):
    path = write_csv("t,AH\n" + "".join(f"{i * 1e-8:.9g},{int(i >= 3)}\n" for i in range(6)))
    tr = read_csv(path)
    assert tr.sample_period_ps == 10 * NS
    assert tr.channel("AH").times.tolist() == [30 * NS]
    assert tr.end_ps == 60 * NS  # the last sample holds for one period


@pytest.mark.parametrize(
    ("header", "scale"),
    [
        ("time_ns", NS),
        ("time (us)", 1_000 * NS),
        ("Time [ms]", 10**9),
        ("t_ps", 1),
        ("time", 10**12),
    ],
)
def test_time_unit_from_header(write_csv, header, scale):
    tr = read_csv(write_csv(f"{header},AH\n0,0\n3,1\n7,1\n"))
    assert tr.channel("AH").times.tolist() == [3 * scale]


def test_sample_index_with_sample_rate(write_csv):
    tr = read_csv(write_csv("sample,AH\n0,0\n1,0\n2,1\n"), sample_rate_hz=100e6)
    assert tr.channel("AH").times.tolist() == [20 * NS]
    assert tr.sample_period_ps == 10 * NS


def test_named_time_column_and_unit_flag(write_csv):
    tr = read_csv(write_csv("AH,stamp\n0,0\n1,5\n"), time_column="stamp", time_unit="us")
    assert tr.channel("AH").times.tolist() == [5_000 * NS]


def test_semicolons_crlf_and_bom_are_read(tmp_path):
    path = tmp_path / "c.csv"
    path.write_bytes(b"\xef\xbb\xbftime_ns;AH;AL\r\n0;0;1\r\n10;1;0\r\n")
    tr = read_csv(str(path))
    assert tr.channel("AH").times.tolist() == [10 * NS]


def test_duplicate_timestamps_last_row_wins(write_csv):
    tr = read_csv(write_csv("time_ns,AH\n0,0\n5,1\n5,0\n9,1\n"))
    # the row at 5 ns with AH=1 lasts zero time
    assert tr.channel("AH").times.tolist() == [9 * NS]


@pytest.mark.parametrize(
    ("text", "line", "pattern"),
    [
        ("", 1, r"empty file"),
        ("time,AH\n", 2, r"header only"),
        ("time,AH\n0,0\n1e-9,2\n", 3, r"column 'AH': expected 0 or 1, found 2"),
        ("time,AH\n0,0\nabc,1\n", 3, r"column 'time': expected a number, found 'abc'"),
        ("time,AH\n0,0\nnan,1\n", 3, r"expected a finite time"),
        ("time,AH\n0,0\n2e-9,1\n1e-9,0\n", 4, r"time goes backwards"),
        ("time,AH,AL\n0,0,1\n1e-9,1\n", 3, r"expected 3 fields"),
        ("time,AH\n0,0\n1e-9,x\n", 3, r"column 'AH': expected 0 or 1, found 'x'"),
        ("time,AH,AH\n0,0,0\n", 1, r"column 'AH' appears twice"),
    ],
)
def test_bad_input_names_file_line_and_expectation(write_csv, text, line, pattern):
    path = write_csv(text)
    with pytest.raises(InputError, match=pattern) as err:
        read_csv(path)
    assert err.value.path == path
    assert err.value.line == line
    assert str(err.value).startswith(f"{path}:{line}: ")
    assert "\n" not in str(err.value)


def test_unknown_channel_and_time_column(write_csv):
    path = write_csv("time,AH\n0,0\n")
    with pytest.raises(InputError, match=r"no channel 'BH' in the header \(columns: time, AH\)"):
        read_csv(path, channels=["BH"])
    with pytest.raises(InputError, match=r"no time column 'stamp'"):
        read_csv(path, time_column="stamp")


def test_missing_file(tmp_path):
    with pytest.raises(InputError, match=r"no such file"):
        read_csv(str(tmp_path / "absent.csv"))


def test_bad_sample_rate(write_csv):
    with pytest.raises(UsageError, match=r"--sample-rate"):
        read_csv(write_csv("s,AH\n0,0\n"), sample_rate_hz=0)


def test_large_second_times_are_exact_to_the_picosecond(write_csv):
    """Past about 1,000 s a float64 cannot hold picosecond digits: the time text is then
    converted exactly (checked against Python's decimal arithmetic, a general-purpose library)."""
    from decimal import Decimal

    times = ["100000.000000000000", "100000.000000100003", "100000.000000300007"]
    tr = read_csv(write_csv("time_s,AH\n" + "".join(f"{t},{i % 2}\n" for i, t in enumerate(times))))
    want = [int(Decimal(t) * 10**12) for t in times[1:]]
    assert tr.channel("AH").times.tolist() == want

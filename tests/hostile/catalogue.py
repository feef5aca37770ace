"""The catalogue of hostile and broken inputs: one entry per case, for every reader.

Each ``Case`` says how to make the input (bytes, or a function that makes it in a
folder), how to invoke the tool on it, and what must happen:

- ``Fails``: exit status 2 and exactly one stderr line ``sequencecheck: error: PATH:LINE: ...``
  matching ``pattern`` (``line=None``: a problem of the whole file, no line named);
- ``Reads``: the input is valid though odd, and is read to exactly these edges.

``known_bug`` marks a case the current code gets wrong (the test is a strict xfail
until it is fixed). Add cases for a new reader by extending ``CASES`` with entries of
its own ``reader`` and ``suffix``; ``python tests/hostile/catalogue.py`` prints the
Markdown table kept in DEVELOPERS.md.
"""

from __future__ import annotations

import functools
import os
import random
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

__all__ = ["CASES", "Case", "Fails", "Reads", "markdown_table"]

NS = 1_000  # picoseconds per nanosecond
BLOCK = 4 << 20  # the CSV reader's read block; cases below cross it on purpose


@dataclass(frozen=True)
class Fails:
    """Exit 2 with one line naming the file (and ``line``) and matching ``pattern``.

    ``usage=True``: a bad flag (UsageError): the line need not start with the path, and
    the run stops before any report is printed.
    """

    pattern: str
    line: int | None
    usage: bool = False


@dataclass(frozen=True)
class Reads:
    """Read correctly: rows, and per channel (initial level, [(time_ps, level), ...])."""

    rows: int
    channels: dict[str, tuple[int, list[tuple[int, int]]]]
    start_ps: int | None = None
    end_ps: int | None = None


@dataclass(frozen=True)
class Case:
    name: str
    data: bytes | Callable[[Path], Path]
    expect: Fails | Reads
    behaviour: str  # one line for the DEVELOPERS.md table
    reader: str = "csv"
    suffix: str = ".csv"
    args: tuple[str, ...] = ()  # extra CLI arguments (legs, time column, ...)
    read_options: dict[str, object] = field(default_factory=dict)  # the same, for read()
    known_bug: str | None = None
    skip_as_root: str | None = None  # root ignores file permissions
    in_process: bool = True  # False when read() itself would block (a FIFO)
    timeout: float | None = None  # CLI time limit, for cases that could hang

    def make(self, folder: Path) -> Path:
        """Create the input inside ``folder`` and return its path."""
        if callable(self.data):
            return self.data(folder)
        path = folder / f"capture{self.suffix}"
        path.write_bytes(self.data)
        return path


def _edges(*pairs: tuple[int, int]) -> list[tuple[int, int]]:
    return [(t * NS, v) for t, v in pairs]


def _ab(ah: tuple[int, list[tuple[int, int]]], al: tuple[int, list[tuple[int, int]]]) -> dict:
    return {"AH": ah, "AL": al}


# A small valid capture of the invented pump inverter's leg A, and what it reads to.
GOOD = b"time_ns,AH,AL\n0,0,1\n100,0,0\n200,1,0\n300,0,0\n400,0,1\n"
GOOD_EDGES = _ab((0, _edges((200, 1), (300, 0))), (1, _edges((100, 0), (400, 1))))


def _reads_good(rows: int = 5) -> Reads:
    # evenly spaced rows are samples: the last one holds for one period (100 ns)
    return Reads(rows=rows, channels=GOOD_EDGES, start_ps=0, end_ps=500 * NS)


def _folder_input(folder: Path) -> Path:
    path = folder / "capture.csv"
    path.mkdir()
    return path


def _unreadable(folder: Path) -> Path:
    path = folder / "capture.csv"
    path.write_bytes(GOOD)
    path.chmod(0)
    return path


def _fifo(folder: Path) -> Path:
    path = folder / "capture.csv"
    os.mkfifo(path)
    return path


def _newline_in_name(folder: Path) -> Path:
    path = folder / "bench\nrun.csv"
    path.write_bytes(b"time_ns,AH,AL\n0,0,1\n100,2,0\n")
    return path


@functools.cache
def _long_rows(n: int, bad_row: int | None = None, backwards_row: int | None = None) -> bytes:
    """``n`` rows of leg A toggling every 1000 rows; optionally one bad value or time step."""
    out = [b"time_ns,AH,AL\n"]
    for i in range(n):
        t = i * 10 if backwards_row is None or i != backwards_row else (i - 2) * 10
        ah = (i // 1000) % 2
        value = b"7" if i == bad_row else str(ah).encode()
        out.append(b"%d,%s,%d\n" % (t, value, 1 - ah))
    return b"".join(out)


def _big_valid_edges(n: int) -> dict:
    ah = [((k * 1000) * 10 * NS, k % 2) for k in range(1, (n - 1) // 1000 + 1)]
    al = [(t, 1 - v) for t, v in ah]
    return _ab((0, ah), (1, al))


def _first_row_of_second_block(n: int) -> int:
    """Index of the first data row that ends past the 4 MiB block border."""
    data, offset = _long_rows(n), 0
    for i, line in enumerate(data.split(b"\n")):
        offset += len(line) + 1
        if offset > BLOCK:
            return i - 1  # minus the header
    raise AssertionError("file smaller than one block")


_BIG_ROWS = 420_000  # about 6.5 MiB: two read blocks
_BORDER_ROW = _first_row_of_second_block(_BIG_ROWS)

CASES: list[Case] = [
    # --- empty and truncated -------------------------------------------------------------
    Case("empty file", b"", Fails(r"empty file", 1), "exit 2: empty file, expected a header row"),
    Case(
        "only blank lines and spaces",
        b"   \n\n\n",
        Fails(r"empty file", 1),
        "exit 2: empty file (blank lines are not a header)",
    ),
    Case(
        "header only",
        b"time_ns,AH,AL\n",
        Fails(r"header only, expected rows of data", 2),
        "exit 2 at line 2: header only",
    ),
    Case(
        "header only, CRLF",
        b"time_ns,AH,AL\r\n",
        Fails(r"header only", 2),
        "exit 2 at line 2: header only",
    ),
    Case(
        "header only, no final newline",
        b"time_ns,AH,AL",
        Fails(r"header only", 2),
        "exit 2 at line 2: header only",
    ),
    Case(
        "header then one blank line",
        b"time_ns,AH,AL\n\n",
        Fails(r"expected 3 fields \(time_ns, AH, AL\), found an empty row", 2),
        "exit 2 at line 2: expected 3 fields, found an empty row",
    ),
    Case(
        "truncated mid-line",
        b"time_ns,AH,AL\n0,0,1\n100,1,0\n200,0",
        Fails(r"expected 3 fields \(time_ns, AH, AL\), found 2 fields", 4),
        "exit 2 at the cut line: expected 3 fields, found 2",
    ),
    Case(
        "truncated inside a number",
        b"time_ns,AH,AL\n0,0,1\n100,1,0\n2",
        Fails(r"expected 3 fields", 4),
        "exit 2 at the cut line: expected 3 fields, found 1",
    ),
    Case(
        "truncated inside a quoted field",
        b'time_ns,AH,AL\n0,0,1\n"100,1,0\n200,0,0\n',
        Fails(r"expected 3 fields", 4),
        "exit 2 at the line where the open quote ends the file: expected 3 fields",
    ),
    # --- not text ------------------------------------------------------------------------
    Case(
        "binary garbage (bytes 0-255)",
        bytes(range(256)) * 4,
        Fails(r"expected 2 fields", 2),
        "exit 2 at line 2 (the first line happens to be valid UTF-8); control characters in the message are escaped",
    ),
    Case(
        "random bytes",
        random.Random(7).randbytes(4096),
        Fails(r"header is not UTF-8 text", 1),
        "exit 2 at line 1: header is not UTF-8 text",
    ),
    Case(
        "1 MiB of NUL bytes",
        b"\0" * (1 << 20),
        Fails(r"header|text|CSV", 1),
        "exit 2 at line 1: not a text header",
        known_bug="csv 'field larger than field limit' escapes from the header sniffer (traceback)",
    ),
    Case(
        "UTF-16 text",
        "time_ns,AH,AL\n0,0,1\n100,1,0\n".encode("utf-16"),
        Fails(r"header is not UTF-8 text", 1),
        "exit 2 at line 1: header is not UTF-8 text",
    ),
    Case(
        "non-UTF-8 header (Latin-1 name)",
        b"time_ns,Str\xf6m_H,Str\xf6m_L\n0,0,1\n",
        Fails(r"header is not UTF-8 text", 1),
        "exit 2 at line 1: header is not UTF-8 text",
    ),
    Case(
        "non-UTF-8 byte in a value",
        b"time_ns,AH,AL\n0,0,1\n100,\xff,0\n",
        Fails(r"column 'AH': expected 0 or 1, found '\ufffd'", 3),
        "exit 2 at the row: column 'AH': expected 0 or 1 (the byte shown as U+FFFD)",
    ),
    Case(
        "non-UTF-8 byte in a time",
        b"time_ns,AH,AL\n0,0,1\n1\xff0,1,0\n",
        Fails(r"column 'time_ns': expected a number", 3),
        "exit 2 at the row: column 'time_ns': expected a number",
    ),
    Case(
        "NUL byte inside a value",
        b"time_ns,AH,AL\n0,0,1\n100,1\x00,0\n",
        Fails(r"column 'AH': expected 0 or 1, found '1\\x00'", 3),
        "exit 2 at the row: expected 0 or 1, found '1\\x00' (escaped)",
    ),
    # --- times ---------------------------------------------------------------------------
    Case(
        "NaN time",
        b"time_ns,AH,AL\n0,0,1\nnan,1,0\n",
        Fails(r"column 'time_ns': expected a finite time, found '?nan'?", 3),
        "exit 2 at the row: expected a finite time",
    ),
    Case(
        "inf time",
        b"time_ns,AH,AL\n0,0,1\ninf,1,0\n",
        Fails(r"expected a finite time, found '?inf'?", 3),
        "exit 2 at the row: expected a finite time",
    ),
    Case(
        "-inf time",
        b"time_ns,AH,AL\n-inf,0,1\n0,1,0\n",
        Fails(r"expected a finite time, found '?-inf'?", 2),
        "exit 2 at the row: expected a finite time",
    ),
    Case(
        "time beyond the picosecond range (1e300 ns)",
        b"time_ns,AH,AL\n0,0,1\n1e300,1,0\n",
        Fails(r"(?i)time.*(range|too (large|big|late))", 3),
        "exit 2 at the row: time out of range",
    ),
    Case(
        "time beyond the picosecond range (1e10 s)",
        b"time_s,AH,AL\n0,0,1\n1e10,1,0\n",
        Fails(r"(?i)time.*(range|too (large|big|late))", 3),
        "exit 2 at the row: time out of range (int64 picoseconds end after about 106 days)",
    ),
    Case(
        "absolute (epoch) timestamps in seconds",
        b"time_s,AH,AL\n1733000000.0000001,0,1\n1733000000.0000002,1,0\n1733000000.0000003,0,0\n",
        Fails(r"(?i)time.*(range|too (large|big|late))", 2),
        "exit 2 at the first row: time out of range (int64 picoseconds end after about 106 days)",
    ),
    Case(
        "seconds with a 100,000 s offset and picosecond digits",
        b"time_s,AH,AL\n100000.000000000000,0,1\n100000.000000100003,0,0\n"
        b"100000.000000300007,1,0\n100000.000001000011,0,0\n100000.000001200013,0,1\n",
        Reads(
            5,
            _ab(
                (0, [(10**17 + 300_007, 1), (10**17 + 1_000_011, 0)]),
                (1, [(10**17 + 100_003, 0), (10**17 + 1_200_013, 1)]),
            ),
            10**17,
            10**17 + 1_200_013,
        ),
        "read to the exact picosecond",
        known_bug="times are parsed as float64 before scaling: at 1e5 s one float step is 14.6 ps, so edges move by up to 11 ps",
    ),
    Case(
        "decreasing timestamps",
        b"time_ns,AH,AL\n0,0,1\n100,0,0\n50,1,0\n",
        Fails(r"time goes backwards \(column 'time_ns'\); expected non-decreasing time", 4),
        "exit 2 at the row: time goes backwards",
    ),
    Case(
        "time goes backwards at the first row of the second read block",
        lambda d: _write(d, _long_rows(_BIG_ROWS, backwards_row=_BORDER_ROW)),
        Fails(r"time goes backwards", _BORDER_ROW + 2),
        "exit 2 naming the exact line across the 4 MiB block border",
    ),
    Case(
        "hexadecimal time",
        b"time_ns,AH,AL\n0,0,1\n0x10,1,0\n",
        Fails(r"column 'time_ns': expected a number, found '0x10'", 3),
        "exit 2 at the row: expected a number",
    ),
    Case(
        "decimal comma with semicolons",
        b"time_s;AH;AL\n0,000001;0;1\n",
        Fails(r"column 'time_s': expected a number, found '0,000001'", 2),
        "exit 2 at the row: expected a number (decimal commas are not guessed)",
    ),
    Case(
        "quoted newline inside a time",
        b'time_ns,AH,AL\n0,0,1\n"10\n0",1,0\n',
        Fails(r"expected a number, found '10\\n0'", 4),
        "exit 2 naming the line where the quoted row ends; the newline is shown escaped",
    ),
    Case(
        "fractional sample index with --sample-rate",
        b"sample,AH,AL\n0,0,1\n0.5,1,0\n",
        Fails(r"column 'sample': expected a sample index, found '0.5'", 3),
        "exit 2 at the row: expected a sample index",
        args=("--sample-rate", "100e6"),
        read_options={"sample_rate_hz": 100e6},
    ),
    Case(
        "sample index times the sample period beyond int64",
        b"sample,AH,AL\n0,0,1\n1,1,0\n2000000000000000,0,0\n",
        Fails(r"(?i)(range|too (large|big|late))", 4),
        "exit 2 at the row: time out of range",
        args=("--sample-rate", "100e6"),
        read_options={"sample_rate_hz": 100e6},
    ),
    Case(
        "sample index beyond int64",
        b"sample,AH,AL\n0,0,1\n99999999999999999999,1,0\n",
        Fails(r"(?i)(sample index|range|too (large|big))", 3),
        "exit 2 at the row: expected a sample index in range",
        args=("--sample-rate", "100e6"),
        read_options={"sample_rate_hz": 100e6},
        known_bug="the row finder accepts the big integer, so the error names no line ('could not be read as CSV')",
    ),
    *[
        Case(
            f"--sample-rate {rate}",
            b"sample,AH,AL\n0,0,1\n1,0,0\n3,1,0\n9,0,0\n",
            Fails(r"--sample-rate", None, usage=True),
            f"exit 2: --sample-rate {rate} {why}",
            args=("--sample-rate", rate),
            read_options={"sample_rate_hz": float(rate)},
            known_bug=bug,
        )
        for rate, why, bug in [
            ("nan", "is not a positive frequency", None),
            ("0", "is not a positive frequency", None),
            (
                "3e12",
                "gives a sample period under the 1 ps resolution",
                "the period rounds to 0 ps: every sample lands on one instant and the run passes clean",
            ),
            (
                "inf",
                "gives a sample period under the 1 ps resolution",
                "the period rounds to 0 ps: every sample lands on one instant and the run passes clean",
            ),
            (
                "1e-300",
                "gives a sample period beyond the picosecond range",
                "round(1e12 / rate) raises OverflowError: a traceback",
            ),
        ]
    ],
    Case(
        "channel names that pair into no leg",
        b"time_ns,CH0,CH1\n0,0,1\n100,1,0\n",
        Fails(
            r"cannot tell the legs from channels CH0, CH1; name them with --leg", None, usage=True
        ),
        "exit 2: cannot tell the legs, name them with --leg (no report: the run stops)",
        in_process=False,
    ),
    # --- values --------------------------------------------------------------------------
    *[
        Case(
            f"value {shown}",
            b"time_ns,AH,AL\n0,0,1\n100,%s,0\n" % raw,
            Fails(r"column 'AH': expected 0 or 1, found " + pattern, 3),
            "exit 2 at the row: column 'AH': expected 0 or 1",
        )
        for shown, raw, pattern in [
            ("2", b"2", "2"),
            ("-1", b"-1", "-1"),
            ("300 (outside int8)", b"300", "'300'"),
            ("X", b"X", "'X'"),
            ("1.0", b"1.0", r"'1\.0'"),
            ("+1", b"+1", r"'\+1'"),
            ("empty", b"", "''"),
        ]
    ],
    Case(
        "bad value in row 400,000 (second read block)",
        lambda d: _write(d, _long_rows(_BIG_ROWS, bad_row=400_000)),
        Fails(r"column 'AH': expected 0 or 1, found 7", 400_002),
        "exit 2 naming the exact line, far past the first read block",
    ),
    # --- columns -------------------------------------------------------------------------
    Case(
        "missing column in a row",
        b"time_ns,AH,AL\n0,0,1\n100,1\n",
        Fails(r"expected 3 fields \(time_ns, AH, AL\), found 2 fields", 3),
        "exit 2 at the row: expected 3 fields, found 2",
    ),
    Case(
        "extra column in a row",
        b"time_ns,AH,AL\n0,0,1\n100,1,0,1\n",
        Fails(r"expected 3 fields \(time_ns, AH, AL\), found 4 fields", 3),
        "exit 2 at the row: expected 3 fields, found 4",
    ),
    Case(
        "blank line between rows",
        b"time_ns,AH,AL\n0,0,1\n\n100,1,0\n",
        Fails(r"found an empty row", 3),
        "exit 2 at the blank line (never skipped silently)",
    ),
    Case(
        "duplicate column names",
        b"time_ns,AH,AH\n0,0,1\n",
        Fails(r"column 'AH' appears twice in the header", 1),
        "exit 2 at line 1: column appears twice",
    ),
    Case(
        "duplicate column names after trimming spaces",
        b"time_ns,AH, AH \n0,0,1\n",
        Fails(r"column 'AH' appears twice in the header", 1),
        "exit 2 at line 1: column appears twice",
    ),
    Case(
        "header with a single column",
        b"time_ns\n0\n",
        Fails(r"header needs a time column and at least one channel", 1),
        "exit 2 at line 1: needs a time column and a channel",
    ),
    Case(
        "unbalanced quote in the header",
        b'time_ns,"AH,AL\n0,0,1\n100,1,0\n',
        Fails(r"(?i)quote", 1),
        "exit 2 at line 1: a quote opened in the header is never closed",
        known_bug="the header sniffer accepts the open quote; the error names no line ('could not be read as CSV')",
    ),
    Case(
        "trailing delimiter on every line",
        b"time_ns,AH,AL,\n0,0,1,\n100,1,0,\n",
        Fails(r"column '': expected 0 or 1, found ''", 2),
        "exit 2 at line 2: the unnamed last column holds no 0/1 values",
    ),
    Case(
        "leg names a channel the file lacks",
        GOOD,
        Fails(r"no channel 'BL' in the header \(columns: time_ns, AH, AL\)", 1),
        "exit 2 at line 1: no such channel, the columns listed",
        args=("--leg", "A=AH,BL"),
        read_options={"channels": ["AH", "BL"]},
    ),
    Case(
        "time column the file lacks",
        GOOD,
        Fails(r"no time column 'stamp'", 1),
        "exit 2 at line 1: no such time column",
        args=("--time-column", "stamp"),
        read_options={"time_column": "stamp"},
    ),
    # --- long lines and huge fields ------------------------------------------------------
    Case(
        "time field of 300,000 digits",
        b"time_ns,AH,AL\n0,0,1\n" + b"1" * 300_000 + b",1,0\n",
        Fails(r"expected a finite time", 3),
        "exit 2 at the row: expected a finite time (the number overflows a float)",
    ),
    Case(
        "one line longer than the 4 MiB read block",
        b"time_ns,AH,AL\n0,0,1\n" + b"1" * (BLOCK + 4096) + b",1,0\n",
        Fails(r"expected a finite time", 3),
        "exit 2 at the row: expected a finite time",
    ),
    Case(
        "huge single field (200 kB value)",
        b"time_ns,AH,AL\n0,0,1\n100," + b"1" * 200_000 + b",0\n",
        Fails(r"column 'AH': expected 0 or 1", 3),
        "exit 2 at the row: expected 0 or 1; the value is shortened in the message",
        known_bug="the row finder's csv module hits its 131072-byte field limit: _csv.Error escapes (traceback)",
    ),
    Case(
        "huge channel name (200 kB) in the header",
        b"time_ns," + b"A" * 200_000 + b",AL\n0,0,1\n",
        Fails(r"header|column|name", 1),
        "exit 2 at line 1, message of bounded length",
        known_bug="the header sniffer's csv module hits its field limit: _csv.Error escapes (traceback)",
    ),
    Case(
        "2,000 channels and a short row",
        b"time_ns,"
        + b",".join(b"C%04d" % i for i in range(2000))
        + b"\n0"
        + b",0" * 2000
        + b"\n1"
        + b",0" * 10
        + b"\n",
        Fails(r"expected 2001 fields", 3),
        "exit 2 at the row; the message stays short (does not list 2,000 names)",
        read_options={"channels": ["C0000"]},
        args=("--leg", "A=C0000,C0001"),
    ),
    # --- not a regular file --------------------------------------------------------------
    Case(
        "folder given as input",
        _folder_input,
        Fails(r"is a folder, expected a CSV file", None),
        "exit 2: is a folder",
    ),
    Case(
        "missing file",
        lambda d: d / "absent.csv",
        Fails(r"no such file", None),
        "exit 2: no such file",
    ),
    Case(
        "unreadable file (no permission)",
        _unreadable,
        Fails(r"cannot be read", None),
        "exit 2: cannot be read (permission?)",
        skip_as_root="root reads any file regardless of its permission bits",
    ),
    Case(
        "named pipe (FIFO) with no writer",
        _fifo,
        Fails(r"(?i)not a (regular )?file", None),
        "exit 2: not a regular file (instead of waiting forever for a writer)",
        in_process=False,
        timeout=3.0,
        known_bug="open() blocks forever on a FIFO: the run hangs",
    ),
    Case(
        "file name containing a newline",
        _newline_in_name,
        Fails(r"column 'AH': expected 0 or 1, found 2", 3),
        "exit 2 with the path escaped, so the message stays one line",
    ),
    # --- valid but odd: read correctly ---------------------------------------------------
    Case("byte-order mark", b"\xef\xbb\xbf" + GOOD, _reads_good(), "read; the BOM is dropped"),
    Case("CRLF line ends", GOOD.replace(b"\n", b"\r\n"), _reads_good(), "read"),
    Case(
        "BOM, CRLF and semicolons together",
        b"\xef\xbb\xbf" + GOOD.replace(b",", b";").replace(b"\n", b"\r\n"),
        _reads_good(),
        "read",
    ),
    Case(
        "CR-only line ends",
        GOOD.replace(b"\n", b"\r"),
        _reads_good(),
        "read (old line-end convention)",
        known_bug="the header sniffer reads the whole file as one line: csv 'new-line character seen in unquoted field' escapes (traceback)",
    ),
    Case("semicolon separators", GOOD.replace(b",", b";"), _reads_good(), "read"),
    Case("tab separators", GOOD.replace(b",", b"\t"), _reads_good(), "read"),
    Case(
        "quoted values",
        b'time_ns,AH,AL\n"0","0","1"\n"100","0","0"\n"200","1","0"\n"300","0","0"\n"400","0","1"\n',
        _reads_good(),
        "read",
    ),
    Case(
        "spaces around values",
        b"time_ns,AH,AL\n0, 0 ,1\n100,0, 0\n200, 1,0\n300,0 ,0\n400,0,1 \n",
        _reads_good(),
        "read; spaces around 0/1 are ignored",
    ),
    Case(
        "duplicate timestamps",
        b"time_ns,AH,AL\n0,0,1\n100,0,0\n200,0,0\n200,1,0\n300,1,0\n300,0,0\n400,0,1\n",
        Reads(7, GOOD_EDGES, 0, 400 * NS),
        "read; of several rows at one instant the last wins (the others last 0 ps)",
    ),
    Case(
        "negative times (pre-trigger samples)",
        b"time_ns,AH,AL\n-200,0,1\n-100,0,0\n0,1,0\n100,0,0\n200,0,1\n",
        Reads(
            5,
            _ab((0, _edges((0, 1), (100, 0))), (1, _edges((-100, 0), (200, 1)))),
            -200 * NS,
            300 * NS,
        ),
        "read; times before the trigger are kept as negative picoseconds",
    ),
    Case(
        "a single data row",
        b"time_ns,AH,AL\n0,0,1\n",
        Reads(1, _ab((0, []), (1, [])), 0, 0),
        "read: zero edges, and the report warns (stuck channels, short capture)",
    ),
    Case(
        "channel names with spaces",
        b"time_ns,pump A H,pump A L\n0,0,1\n100,0,0\n200,1,0\n300,0,0\n400,0,1\n",
        Reads(5, {"pump A H": GOOD_EDGES["AH"], "pump A L": GOOD_EDGES["AL"]}, 0, 500 * NS),
        "read; names kept whole, leg 'pump A' guessed",
    ),
    Case(
        "channel names with quotes and commas",
        b'time_ns,"pump, ""U"" H","pump, ""U"" L"\n0,0,1\n100,0,0\n200,1,0\n300,0,0\n400,0,1\n',
        Reads(5, {'pump, "U" H': GOOD_EDGES["AH"], 'pump, "U" L': GOOD_EDGES["AL"]}, 0, 500 * NS),
        "read; CSV quoting undone, names kept whole",
    ),
    Case(
        "channel names with markup",
        b"time_ns,<b>x</b>_H,<b>x</b>_L\n0,0,1\n100,0,0\n200,1,0\n300,0,0\n400,0,1\n",
        Reads(5, {"<b>x</b>_H": GOOD_EDGES["AH"], "<b>x</b>_L": GOOD_EDGES["AL"]}, 0, 500 * NS),
        "read; markup is just text (escaped by XML/HTML reports)",
    ),
    Case(
        "channel names in non-ASCII UTF-8",
        "time_ns,Zweig_ä H,Zweig_ä L\n0,0,1\n100,0,0\n200,1,0\n300,0,0\n400,0,1\n".encode(),
        Reads(5, {"Zweig_ä H": GOOD_EDGES["AH"], "Zweig_ä L": GOOD_EDGES["AL"]}, 0, 500 * NS),
        "read",
    ),
    Case(
        "time column last, named with --time-column",
        b"AH,AL,stamp (ns)\n0,1,0\n0,0,100\n1,0,200\n0,0,300\n0,1,400\n",
        _reads_good(),
        "read; unit taken from the name",
        args=("--time-column", "stamp (ns)"),
        read_options={"time_column": "stamp (ns)"},
    ),
    Case(
        "edges across the 4 MiB read block border",
        lambda d: _write(d, _long_rows(_BIG_ROWS)),
        Reads(_BIG_ROWS, _big_valid_edges(_BIG_ROWS), 0, _BIG_ROWS * 10 * NS),
        "read; every edge kept across block borders (levels carried over)",
    ),
]


def _write(folder: Path, data: bytes) -> Path:
    path = folder / "capture.csv"
    path.write_bytes(data)
    return path


def markdown_table(cases: list[Case] = CASES) -> str:
    """The DEVELOPERS.md table: one row per case."""
    rows = [
        "| reader | case | behaviour | status |",
        "| --- | --- | --- | --- |",
    ]
    for c in cases:
        if c.known_bug:
            status = f"**known bug** (strict xfail): {c.known_bug}"
        elif c.skip_as_root:
            status = "ok; skipped when run as root"
        else:
            status = "ok"
        rows.append(f"| {c.reader} | {c.name} | {c.behaviour} | {status} |")
    return "\n".join(rows) + "\n"


if __name__ == "__main__":
    print(markdown_table(), end="")

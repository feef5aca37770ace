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
    column: int | None = None  # the bridge language also names the column
    at: str | None = None  # the file named, when not the input (an included file)


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
    cli: bool = True  # False: read() only, where a sibling case already takes the CLI path
    subprocess: bool = True  # False: the CLI runs in this process (same code, no start-up cost)

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
        Fails(r"header holds NUL bytes", 1),
        "exit 2 at line 1: the first line (valid UTF-8) holds NUL bytes, so it is no header",
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
                None,
            ),
            (
                "inf",
                "gives a sample period under the 1 ps resolution",
                None,
            ),
            (
                "1e-300",
                "gives a sample period beyond the picosecond range",
                None,
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
    ),
    Case(
        "huge channel name (200 kB) in the header",
        b"time_ns," + b"A" * 200_000 + b",AL\n0,0,1\n",
        Fails(r"header|column|name", 1),
        "exit 2 at line 1, message of bounded length",
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

CASES += __import__("catalogue_vcd").vcd_cases(Case, Fails, Reads)  # the VCD reader's entries


def _write(folder: Path, data: bytes) -> Path:
    path = folder / "capture.csv"
    path.write_bytes(data)
    return path


# --- the bridge language: step tables (.steps) and bridge descriptions (.bridge) -------
US = 1_000_000  # picoseconds per microsecond

# An invented two-leg drive; tables below include it as "drive.bridge".
DRIVE = (
    b"# an invented two-leg drive\n"
    b"leg A high AH low AL\n"
    b"leg B high BH low BL\n"
    b"dead-time 500ns\n"
    b"mode coast = not (AH or AL or BH or BL)\n"
    b"mode brake = AL and BL\n"
)
INCLUDE = b'include "drive.bridge"\n'
# A valid table and what it reads to: leg A switches once each way, B's low side stays on.
TABLE = INCLUDE + (
    b"0      AH=off AL=on BL=on\n"
    b"+1us   AL=off\n"
    b"+500ns AH=on\n"
    b"+2us   AH=off\n"
    b"+500ns AL=on\n"
    b"end +1us\n"
)
TABLE_EDGES = {
    "AH": (0, [(1_500_000, 1), (3_500_000, 0)]),
    "AL": (1, [(1 * US, 0), (4 * US, 1)]),
    "BH": (0, []),
    "BL": (1, []),
}


def _reads_table(rows: int = 7, end_ps: int = 5 * US) -> Reads:
    return Reads(rows=rows, channels=TABLE_EDGES, start_ps=0, end_ps=end_ps)


def _table(body: bytes, bridge: bytes = DRIVE, name: str = "table.steps") -> Callable[[Path], Path]:
    """A maker: ``drive.bridge`` (``bridge``) and the table ``body`` side by side."""

    def make(folder: Path) -> Path:
        (folder / "drive.bridge").write_bytes(bridge)
        path = folder / name
        path.write_bytes(body)
        return path

    return make


def _files(main: str, **files: bytes) -> Callable[[Path], Path]:
    """A maker for several files (keyword = file name with ``_`` for ``.``)."""

    def make(folder: Path) -> Path:
        for key, data in files.items():
            (folder / key.replace("_", ".")).write_bytes(data)
        return folder / main

    return make


def _lang(name: str, body: bytes | Callable[[Path], Path], expect: Fails | Reads, behaviour: str,
          **kw: object) -> Case:  # fmt: skip
    data = _table(body) if isinstance(body, bytes) else body
    kw.setdefault("subprocess", name in _IN_A_SUBPROCESS)
    return Case(name, data, expect, behaviour, reader="table", suffix=".steps", **kw)  # type: ignore[arg-type]


# Language cases whose CLI run is a real subprocess; the others call the CLI in process,
# which keeps the catalogue's CI time low (each subprocess costs about 0.4 s of start-up).
_IN_A_SUBPROCESS = {
    "empty table",
    "binary garbage table (bytes 0-255)",
    "valid table",
    "table with CR-only line ends",
    "decreasing times",
    "unknown channel",
    "table naming a missing bridge file",
    "cycle of includes through two bridges",
    "repeat count zero",
    "repeat of 40 million passes",
    "chain of 3,000 modes each negating the last",
    "stray tokens after a step",
    "control characters after a step",
}


def _bad_step(name: str, step: bytes, pattern: str, column: int, behaviour: str) -> Case:
    """A table whose second line (after the include) is ``step``."""
    return _lang(
        name, INCLUDE + step + b"\n+1us AL=on\n", Fails(pattern, 2, column=column), behaviour
    )


def _nested_repeats(depth: int, passes: int) -> bytes:
    return (
        INCLUDE
        + b"0 AL=on\n"
        + b"repeat %d {\n" % passes * depth
        + b"+1ns AH=on\n+1ns AH=off\n"
        + b"}\n" * depth
    )


def _mode_chain(n: int, link: str) -> bytes:
    lines = [b"leg A high AH low AL", b"mode m0 = AH"]
    lines += [(f"mode m{i} = " + link.format(p=f"m{i - 1}")).encode() for i in range(1, n + 1)]
    return INCLUDE + b"\n".join(lines) + b"\n"


_EXPECTED_STEP = r"expected a step \(a time such as 0 or \+750ns, then settings"
_SETTING = r"set a switch to on or off \(or a pin level to 1 or 0\)"

LANGUAGE_CASES: list[Case] = [
    # --- empty, not text -----------------------------------------------------------------
    _lang(
        "empty table",
        b"",
        Fails(r"empty file, expected a table", 1),
        "exit 2 at line 1: empty file",
    ),
    _lang(
        "table of spaces and blank lines",
        b"  \n\t\n\n",
        Fails(r"empty file", 1),
        "exit 2 at line 1: empty file",
    ),
    _lang(
        "table of comments only",
        b"# nothing yet\n   # still nothing\n",
        Fails(r"no legs: expected a line such as 'leg A high AH low AL' or 'include", None),
        "exit 2: no legs (a problem of the whole file: no line named)",
    ),
    _lang(
        "table with an include and no steps",
        INCLUDE + b"# to do\n",
        Fails(r"no steps: a table needs at least one step that sets switches", None),
        "exit 2: no steps (whole file)",
    ),
    _lang(
        "table whose steps set no switch",
        INCLUDE + b"0\n+10us\nend +1us\n",
        Fails(r"no switch is set", None),
        "exit 2: no switch is set (whole file)",
    ),
    _lang(
        "binary garbage table (bytes 0-255)",
        bytes(range(256)) * 4,
        Fails(r"is not UTF-8 text \(byte 0x80\)", 2),
        "exit 2 at the line of the first byte that is not UTF-8",
    ),
    _lang(
        "table of NUL bytes",
        b"\0" * 4096,
        Fails(_EXPECTED_STEP + r".*found '\\x00", 1, column=1),
        "exit 2 at 1:1: expected a step; the NULs are escaped and the message shortened",
    ),
    _lang(
        "non-UTF-8 byte in a comment",
        INCLUDE + b"0 AL=on  # Str\xf6m\n",
        Fails(r"is not UTF-8 text \(byte 0xf6\)", 2),
        "exit 2 at the line: not UTF-8 text",
    ),
    _lang(
        "UTF-16 table",
        TABLE.decode().encode("utf-16"),
        Fails(r"is not UTF-8 text \(byte 0xff\)", 1),
        "exit 2 at line 1: not UTF-8 text",
    ),
    _lang(
        "non-UTF-8 bridge description",
        _table(INCLUDE + b"0 AL=on\n", bridge=DRIVE + b"# \xe9t\xe9\n"),
        Fails(r"is not UTF-8 text \(byte 0xe9\)", 7, at="drive.bridge"),
        "exit 2 naming the included file and its line",
    ),
    # --- valid but odd: read correctly ---------------------------------------------------
    _lang("valid table", TABLE, _reads_table(), "read to the exact picosecond"),
    _lang(
        "table with a byte-order mark",
        b"\xef\xbb\xbf" + TABLE,
        _reads_table(),
        "read; the BOM is dropped",
    ),
    _lang("table with CRLF line ends", TABLE.replace(b"\n", b"\r\n"), _reads_table(), "read"),
    _lang(
        "table with CR-only line ends",
        TABLE.replace(b"\n", b"\r"),
        _reads_table(),
        "read; lines counted as an editor counts them",
    ),
    _lang(
        "bridge with BOM and CRLF",
        _table(TABLE, bridge=b"\xef\xbb\xbf" + DRIVE.replace(b"\n", b"\r\n")),
        _reads_table(),
        "read",
    ),
    _lang("table without a final newline", TABLE.rstrip(b"\n"), _reads_table(), "read"),
    _lang(
        "tabs, trailing comments and absolute times",
        INCLUDE + b"0\tAH=off\tAL=on BL=on   # start\n1us AL=off\n1.5us AH=on\n"
        b"3.5us AH=off\n4000ns AL=on\nend 5us # done\n",
        _reads_table(),
        "read; absolute and relative times give the same edges",
    ),
    _lang(
        "one line of 4 MiB (a comment)",
        TABLE + b"#" + b"x" * (4 << 20) + b"\n",
        _reads_table(8),
        "read in bounded time",
    ),
    _lang(
        "a step padded with 2 MB of spaces",
        TABLE.replace(b"+1us   AL=off", b"+1us" + b" " * 2_000_000 + b"AL=off"),
        _reads_table(),
        "read in bounded time",
    ),
    _lang(
        "duplicate times: settings at one instant, the last wins",
        INCLUDE + b"0 AH=off AL=on BL=on\n1us AL=off\n1us AL=off\n1.5us AH=on\n1.5us AH=off\n"
        b"1.5us AH=on\n3.5us AH=off\n4us AL=on\nend 5us\n",
        _reads_table(10),
        "read; repeated instants keep their order and the last setting holds (no 0 ps pulse)",
    ),
    _lang(
        "the same table written with a repeat block",
        INCLUDE + b"0 AH=off AL=on BL=on\nrepeat 1 every 5us {\n  +1us AL=off\n  +500ns AH=on\n"
        b"  +2us AH=off\n  +500ns AL=on\n}\n",
        _reads_table(8),
        "read; the block expands to the same edges",
    ),
    _lang(
        "repeat block whose passes take no time",
        INCLUDE + b"0 AH=off AL=on BL=on\nrepeat 1000000 {\n  0 AL=off\n  0 AL=on\n}\n"
        b"+1us AL=off\n+500ns AH=on\n+2us AH=off\n+500ns AL=on\nend +1us\n",
        _reads_table(11),
        "read at once: two million changes at one instant leave no edge",
    ),
    _lang(
        "names with markup are refused as names",
        _table(INCLUDE + b"0 AL=on\n", bridge=b"leg A high <b>AH</b> low AL\n"),
        Fails(r"expected a name, found '<b>AH</b>'", 1, column=12, at="drive.bridge"),
        "exit 2 at the name: names are letters, digits and _",
    ),
    # --- times ---------------------------------------------------------------------------
    _bad_step(
        "time NaN",
        b"nan AH=on",
        r"unknown statement 'nan'; expected a step \(a time",
        1,
        "exit 2: not a time (a step starts with a time)",
    ),
    _bad_step("time inf", b"inf AH=on", r"unknown statement 'inf'", 1, "exit 2: not a time"),
    _bad_step(
        "time -1us",
        b"-1us AH=on",
        _EXPECTED_STEP + r".*found '-1us'",
        1,
        "exit 2: times are never negative",
    ),
    _bad_step(
        "time 1e999us",
        b"1e999us AH=on",
        r"'1e999us' is beyond the longest time a table may span",
        1,
        "exit 2: beyond about 53 days",
    ),
    _bad_step(
        "time 1e99999999999s",
        b"1e99999999999s AH=on",
        r"'1e99999999999s' is beyond the longest time a table may span",
        1,
        "exit 2: beyond the longest span (never rounded)",
    ),
    _bad_step(
        "time 1e-99999999999s",
        b"1e-99999999999s AH=on",
        r"finer than the tool's 1 ps resolution",
        1,
        "exit 2: finer than 1 ps (never rounded to 0)",
    ),
    _bad_step(
        "time 1e-30s",
        b"1e-30s AH=on",
        r"finer than the tool's 1 ps resolution",
        1,
        "exit 2: finer than 1 ps",
    ),
    _bad_step(
        "time of 5,000 digits",
        b"1" + b"0" * 5000 + b"ps AH=on",
        r"is beyond the longest time a table may span",
        1,
        "exit 2: beyond about 53 days",
    ),
    _bad_step(
        "time of 5,000 decimals",
        b"0." + b"0" * 5000 + b"1s AH=on",
        r"finer than|out of range",
        1,
        "exit 2: finer than 1 ps",
    ),
    _lang(
        "relative times adding up past the longest span",
        INCLUDE + b"0 AL=on\n" + b"+30d AL=off\n".replace(b"30d", b"2000000s") * 4,
        Fails(r"'\+2000000s' is beyond the longest time a table may span", 5, column=1),
        "exit 2 at the step that passes about 53 days",
    ),
    _lang(
        "decreasing times",
        INCLUDE + b"0 AL=on\n2us AL=off\n1us AH=on\n",
        Fails(r"time goes backwards: 1us is 1 us, before the previous step at 2 us", 4, column=1),
        "exit 2 at the step: time goes backwards",
    ),
    _lang(
        "end before the last step",
        INCLUDE + b"0 AL=on\n2us AL=off\nend 1us\n",
        Fails(r"end at 1 us is before the last step at 2 us", 4, column=5),
        "exit 2 at the end line",
    ),
    _bad_step(
        "time without a unit",
        b"5 AH=on",
        r"a time needs a unit \(s, ms, us, ns, ps\): write 5us",
        1,
        "exit 2: a time needs a unit",
    ),
    _bad_step(
        "time with an unknown unit",
        b"5min AH=on",
        r"unknown time unit 'min' in '5min'",
        1,
        "exit 2: unknown unit",
    ),
    # --- names ---------------------------------------------------------------------------
    _bad_step(
        "unknown channel",
        b"0 XH=on",
        r"unknown channel 'XH' \(channels: AH, AL, BH, BL\)",
        3,
        "exit 2 at the setting: unknown channel, the known ones listed",
    ),
    _bad_step(
        "unknown leg in A.high form",
        b"0 C.high=on",
        r"unknown leg 'C' in 'C.high'",
        3,
        "exit 2 at the setting: unknown leg",
    ),
    _bad_step(
        "unknown mode",
        b"0 mode flying",
        r"unknown mode 'flying' \(modes: coast, brake\)",
        8,
        "exit 2 at the name: unknown mode, the known ones listed",
    ),
    _bad_step(
        "channel set twice in one step",
        b"0 AH=on AH=off",
        r"channel AH is set twice in one step",
        9,
        "exit 2 at the second setting",
    ),
    _lang(
        "channel in two legs",
        _table(INCLUDE + b"0 AL=on\n", bridge=b"leg A high AH low AL\nleg B high AH low BL\n"),
        Fails(
            r"channel 'AH' is already in leg A \(line 1\); a channel drives one switch",
            2,
            column=12,
            at="drive.bridge",
        ),
        "exit 2 at the second leg, naming the first",
    ),
    _lang(
        "leg defined twice",
        INCLUDE + b"leg A high XH low XL\n0 AL=on\n",
        Fails(r"leg 'A' is already defined", 2, column=5),
        "exit 2 at the second definition",
    ),
    _lang(
        "markup and quotes in a setting",
        INCLUDE + b'0 <AH>="on"\n',
        Fails(
            r"expected switch settings such as AH=on BL=off or 'mode', found '<AH>=", 2, column=3
        ),
        "exit 2 at the column: not a setting",
    ),
    _bad_step(
        "quoted value", b'0 AH="on"', _SETTING + r", not '\"on\"'", 3, "exit 2: on, off, 1 or 0"
    ),
    _bad_step(
        "control characters after a step",
        b"0 AH=on\x1b[31m",
        r"expected the end of the line, found '\\x1b\[31m'",
        8,
        "exit 2; the escape sequence is shown escaped",
    ),
    _bad_step(
        "form feed inside a step",
        b"0 AH=on\x0cAL=off",
        r"expected the end of the line, found '\\x0c'",
        8,
        "exit 2 at the column; a form feed does not end a line",
    ),
    _bad_step(
        "Unicode line separator inside a step",
        "0 AH=on\u2028AL=off".encode(),
        r"expected the end of the line, found '\\u2028'",
        8,
        "exit 2 at the column; lines end only at LF, CRLF or CR, as editors count them",
    ),
    # --- includes ------------------------------------------------------------------------
    _lang(
        "table naming a missing bridge file",
        _files("table.steps", table_steps=b'include "absent.bridge"\n0 AL=on\n'),
        Fails(r"bridge file 'absent.bridge' not found", 1, column=9),
        "exit 2 at the include",
    ),
    _lang(
        "include of an empty name",
        _files("table.steps", table_steps=b'include ""\n0 AL=on\n'),
        Fails(r"bridge file '' not found", 1, column=9),
        "exit 2 at the include",
    ),
    _lang(
        "table including itself",
        _files("table.steps", table_steps=b'include "table.steps"\n0 AL=on\n'),
        Fails(r"include 'table.steps' includes itself", 1, column=9),
        "exit 2 at the include",
    ),
    _lang(
        "cycle of includes through two bridges",
        _files(
            "table.steps",
            table_steps=b'include "one.bridge"\n0 AL=on\n',
            one_bridge=b'include "two.bridge"\n',
            two_bridge=b'include "one.bridge"\nleg A high AH low AL\n',
        ),
        Fails(
            r"include 'one.bridge' includes itself \(directly or through another file\)",
            1,
            column=9,
            at="two.bridge",
        ),
        "exit 2 at the include that closes the cycle",
    ),
    _lang(
        "table including a table",
        _files(
            "table.steps",
            table_steps=b'include "other.steps"\n0 AL=on\n',
            other_steps=b"leg A high AH low AL\n0 AL=on\n",
        ),
        Fails(r"a bridge description holds no steps", 2, column=1, at="other.steps"),
        "exit 2 at the first step of the included file",
    ),
    # --- repeat blocks -------------------------------------------------------------------
    _lang(
        "repeat count zero",
        INCLUDE + b"0 AL=on\nrepeat 0 {\n+1us AH=on\n}\n",
        Fails(r"repeat count must be at least 1, not 0", 3, column=8),
        "exit 2 at the count",
    ),
    _lang(
        "repeat count of 5,000 digits",
        INCLUDE + b"0 AL=on\nrepeat 1" + b"0" * 5000 + b" {\n+1us AH=on\n}\n",
        Fails(r"repeat count of 5,001 digits", 3, column=8),
        "exit 2 at the count, at once",
    ),
    _lang(
        "repeat 10^20 passes",
        INCLUDE + b"0 AL=on\nrepeat 100000000000000000000 {\n+1ns AH=on\n}\n",
        Fails(r"repeat count of 21 digits", 3, column=8),
        "exit 2 at once (never expanded)",
    ),
    _lang(
        "repeat past the longest span",
        INCLUDE + b"0 AL=on\nrepeat 999999999999999999 every 1us {\n0 AH=on\n+1ns AH=off\n}\n",
        Fails(r"this repeat runs past the longest time a table may span", 3, column=1),
        "exit 2 at the block, at once",
    ),
    _lang(
        "repeat of 40 million passes",
        INCLUDE + b"0 AL=on\nrepeat 40000000 every 1us {\n0 AH=on\n+1ns AH=off\n}\n",
        Fails(
            r"expands the table to 80,000,001 switch changes, more than the 50,000,000", 3, column=1
        ),
        "exit 2 at the block before any memory is used",
    ),
    _lang(
        "1,000 nested repeat blocks of one pass",
        _nested_repeats(1000, 1),
        Reads(
            2004,
            {"AH": (0, [(1_000, 1), (2_000, 0)]), "AL": (1, []), "BH": (0, []), "BL": (0, [])},
            0,
            2_000,
        ),
        "read; nesting depth costs no stack",
    ),
    _lang(
        "three nested blocks of 1,000 passes",
        _nested_repeats(3, 1000),
        Fails(
            r"expands the table to 2,000,000,001 switch changes, more than the 50,000,000",
            3,
            column=1,
        ),
        "exit 2 at the outer block, before any memory is used",
    ),
    _lang(
        "repeat block never closed",
        INCLUDE + b"0 AL=on\nrepeat 3 {\n+1us AH=on\n",
        Fails(r"this repeat block is never closed with '}'", 3, column=1),
        "exit 2 at the block",
    ),
    _lang(
        "'}' closing no block",
        INCLUDE + b"0 AL=on\n}\n",
        Fails(r"'}' closes no repeat block", 3, column=1),
        "exit 2 at the brace",
    ),
    _lang(
        "empty repeat block",
        INCLUDE + b"0 AL=on\nrepeat 3 {\n}\n",
        Fails(r"this repeat block holds no steps", 3, column=1),
        "exit 2 at the block",
    ),
    _lang(
        "repeat without its brace",
        INCLUDE + b"0 AL=on\nrepeat 3 every 1us\n0 AH=on\n}\n",
        Fails(r"expected '\{', found the end of the line", 3, column=19),
        "exit 2 at the end of the line",
    ),
    _lang(
        "repeat with every but no period",
        INCLUDE + b"0 AL=on\nrepeat 3 every {\n0 AH=on\n}\n",
        Fails(r"expected a duration such as 500ns, found '\{'", 3, column=16),
        "exit 2 at the brace",
    ),
    _lang(
        "repeat block on one line",
        INCLUDE + b"0 AL=on\nrepeat 3 every 1us { 0 AH=on }\n",
        Fails(r"expected the end of the line, found '0'", 3, column=22),
        "exit 2: one statement a line",
    ),
    _lang(
        "step past the repeat period",
        INCLUDE + b"0 AL=on\nrepeat 3 every 1us {\n2us AH=on\n}\n",
        Fails(r"past the repeat period", 4, column=1),
        "exit 2 at the step",
    ),
    _lang(
        "end inside a repeat block",
        INCLUDE + b"0 AL=on\nrepeat 3 {\n+1us AH=on\nend +1us\n}\n",
        Fails(r"'end' belongs at the top level", 5, column=5),
        "exit 2 at the end",
    ),
    _lang(
        "step after end",
        INCLUDE + b"0 AL=on\nend 1us\n+1us AH=on\n",
        Fails(r"nothing may follow 'end' \(line 3\)", 4, column=1),
        "exit 2 at the step",
    ),
    # --- modes ---------------------------------------------------------------------------
    _lang(
        "mode nested in 5,000 brackets",
        _table(
            INCLUDE + b"0 mode m\n",
            bridge=b"leg A high AH low AL\nmode m = " + b"(" * 5000 + b"AH" + b")" * 5000 + b"\n",
        ),
        Reads(2, {"AH": (1, []), "AL": (0, [])}, 0, 0),
        "read: brackets alone add no depth",
    ),
    _lang(
        "mode of 5,000 nested nots",
        _table(
            INCLUDE + b"0 mode m\n",
            bridge=b"leg A high AH low AL\nmode m = " + b"not " * 5000 + b"AH\n",
        ),
        Fails(
            r"mode m: the expression nests deeper than 100 levels", 2, column=6, at="drive.bridge"
        ),
        "exit 2 at the mode",
    ),
    _lang(
        "chain of 3,000 modes each negating the last",
        _files(
            "chain.steps",
            chain_steps=b'include "chain.bridge"\n0 AH=on\n+1us AH=off\n',
            chain_bridge=_mode_chain(3000, "not {p}")[len(INCLUDE) :],
        ),
        Fails(
            r"mode m101: with the modes it uses put in place, the expression nests deeper",
            103,
            column=6,
            at="chain.bridge",
        ),
        "exit 2 at the first mode too deep (a deep mode used only by the checks would overflow the stack)",
    ),
    _lang(
        "modes doubling the mode before",
        _files(
            "chain.steps",
            chain_steps=b'include "chain.bridge"\n0 AH=on\n+1us AH=off\n',
            chain_bridge=_mode_chain(60, "{p} and {p}")[len(INCLUDE) :],
        ),
        Fails(
            r"mode m13: with the modes it uses put in place, the expression grows past 10,000 terms",
            15,
            column=6,
            at="chain.bridge",
        ),
        "exit 2 at the first mode too large (2^60 terms would never finish evaluating)",
    ),
    # --- syntax errors -------------------------------------------------------------------
    _bad_step(
        "setting with a bad value",
        b"0 AH=maybe",
        _SETTING + r", not 'maybe'",
        3,
        "exit 2 at the setting",
    ),
    _bad_step(
        "setting without a value",
        b"0 AH",
        _SETTING + r", such as AH=on",
        3,
        "exit 2 at the setting",
    ),
    _bad_step(
        "spaces around =",
        b"0 AH = on",
        r"write settings without spaces around '=', such as AH=on",
        3,
        "exit 2 at the setting",
    ),
    _bad_step(
        "stray tokens after a step",
        b"0 AH=on }}",
        r"expected the end of the line, found '}}'",
        9,
        "exit 2 at the stray token",
    ),
    _bad_step(
        "stray semicolon after a step",
        b"0 AH=on ;",
        r"expected the end of the line, found ';'",
        9,
        "exit 2 at the stray token",
    ),
    _bad_step(
        "mode without a name",
        b"0 mode",
        r"expected a name, found the end of the line",
        7,
        "exit 2 at the end of the line",
    ),
    _bad_step(
        "unknown statement", b"wait 5us", r"unknown statement 'wait'", 1, "exit 2 at the word"
    ),
    _lang(
        "leg missing its low side",
        _table(INCLUDE + b"0 AL=on\n", bridge=b"leg A high AH\n"),
        Fails(r"expected 'low', found the end of the line", 1, column=14, at="drive.bridge"),
        "exit 2 at the end of the line",
    ),
    _lang(
        "include without quotes",
        _files("table.steps", table_steps=b"include drive.bridge\n0 AL=on\n"),
        Fails(r"expected a file name in double quotes", 1, column=9),
        "exit 2 at the name",
    ),
    _lang(
        "dead-time without a unit",
        _table(INCLUDE + b"0 AL=on\n", bridge=DRIVE + b"dead-time 500\n"),
        Fails(r"a time needs a unit", 7, column=11, at="drive.bridge"),
        "exit 2 at the value",
    ),
    _lang(
        "bootstrap value in the wrong unit",
        _table(
            INCLUDE + b"0 AL=on\n",
            bridge=DRIVE
            + b"bootstrap A capacitance 100nC gate-charge 54nC leakage 115uA supply 12V diode-drop 0.85V min-vgs 6V\n",
        ),
        Fails(
            r"capacitance is in farads, such as 100nF, not '100nC'", 7, at="drive.bridge", column=25
        ),
        "exit 2 at the value",
    ),
    _lang(
        "mode expression cut short",
        _table(INCLUDE + b"0 AL=on\n", bridge=DRIVE + b"mode m = AH and\n"),
        Fails(r"expected .*found the end of the line", 7, at="drive.bridge", column=16),
        "exit 2 at the end of the line",
    ),
    _lang(
        "unclosed bracket in a mode",
        _table(INCLUDE + b"0 AL=on\n", bridge=DRIVE + b"mode m = (AH and AL\n"),
        Fails(r"expected .*'\)'.*found the end of the line", 7, at="drive.bridge", column=20),
        "exit 2 at the end of the line",
    ),
    _lang(
        "mode naming an unknown switch",
        _table(INCLUDE + b"0 AL=on\n", bridge=DRIVE + b"mode m = XH\n"),
        Fails(
            r"mode m: 'XH' is neither a switch channel nor an earlier mode",
            7,
            at="drive.bridge",
            column=10,
        ),
        "exit 2 at the name",
    ),
    _lang(
        "transition to an unknown mode",
        _table(INCLUDE + b"0 AL=on\n", bridge=DRIVE + b"allow coast -> flying\n"),
        Fails(r"unknown mode 'flying'", 7, at="drive.bridge", column=16),
        "exit 2 at the name",
    ),
    _lang(
        "step inside a bridge description",
        _table(INCLUDE + b"0 AL=on\n", bridge=DRIVE + b"0 AH=on\n"),
        Fails(r"a bridge description holds no steps", 7, at="drive.bridge", column=1),
        "exit 2 at the step",
    ),
    _lang(
        "bridge statement after the first step",
        INCLUDE + b"0 AL=on\nleg C high CH low CL\n",
        Fails(r"bridge statements .* come before the first step \(line 2\)", 3, column=1),
        "exit 2 at the statement",
    ),
]
CASES += LANGUAGE_CASES


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

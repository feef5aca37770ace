"""Hostile and odd VCD inputs for the catalogue (IEEE Std 1364-2005 clause 18).

``vcd_cases(Case, Fails, Reads)`` returns the entries; catalogue.py appends them to
``CASES`` (the classes are passed in so this module works whether catalogue.py is
imported or run as a script). Expected edges of valid files follow the standard's
rules as facts.md section 10 lists them: "# facts.md S10 [published]" beside each.
"""

from __future__ import annotations

import random
from fractions import Fraction
from pathlib import Path
from typing import Any

__all__ = ["GOOD_VCD", "vcd_cases", "vcd_text"]

NS = 1_000  # picoseconds per nanosecond

#: ps per unit of $timescale -- facts.md S10 [published] (IEEE Std 1364-2005, clause 18)
UNIT_PS = {
    "s": Fraction(10**12),
    "ms": Fraction(10**9),
    "us": Fraction(10**6),
    "ns": Fraction(10**3),
    "ps": Fraction(1),
    "fs": Fraction(1, 1000),
}


def vcd_text(
    body: str,
    *,
    scale: str = "1 ns",
    names: tuple[str, str] = ("AH", "AL"),
    codes: tuple[str, str] = ("!", '"'),
    extra_vars: str = "",
) -> bytes:
    """A VCD of the invented pump inverter's leg A with ``body`` after the header."""
    head = (
        "$date invented pump bench run $end\n"
        f"$timescale {scale} $end\n"
        "$scope module pump $end\n"
        f"$var wire 1 {codes[0]} {names[0]} $end\n"
        f"$var wire 1 {codes[1]} {names[1]} $end\n"
        f"{extra_vars}"
        "$upscope $end\n"
        "$enddefinitions $end\n"
    )
    return (head + body).encode("utf-8")


def _body(ticks: list[int], hs: str = "!", ls: str = '"') -> str:
    """The leg's sequence at six timestamps: LS falls, HS rises, HS falls, LS rises, end."""
    t0, t1, t2, t3, t4, t5 = ticks
    return (
        f"#{t0}\n$dumpvars\n0{hs}\n1{ls}\n$end\n"
        f"#{t1}\n0{ls}\n#{t2}\n1{hs}\n#{t3}\n0{hs}\n#{t4}\n1{ls}\n#{t5}\n"
    )


GOOD_TICKS = [0, 100, 200, 300, 400, 500]
GOOD_VCD = vcd_text(_body(GOOD_TICKS))
# the header is 7 lines (8 with ``extra_vars``); the body starts at line 8 (9)


def _edges(ticks: list[int], ps_per_tick: Fraction) -> dict[str, tuple[int, list]]:
    def ps(t: int) -> int:
        exact = t * ps_per_tick
        assert exact.denominator == 1
        return int(exact)

    _, t1, t2, t3, t4, _ = ticks
    return {
        "AH": (0, [(ps(t2), 1), (ps(t3), 0)]),
        "AL": (1, [(ps(t1), 0), (ps(t4), 1)]),
    }


def _write(folder: Path, data: bytes, name: str = "capture.vcd") -> Path:
    path = folder / name
    path.write_bytes(data)
    return path


def _many_on_one_line(n: int) -> bytes:
    """``n`` PWM periods, every token on one line of several MiB (crosses read chunks)."""
    parts = ['#0 $dumpvars 0! 1" $end']
    for k in range(n):
        base = 1000 * (k + 1)
        parts.append(f'#{base} 0" #{base + 100} 1! #{base + 500} 0! #{base + 600} 1"')
    parts.append(f"#{1000 * (n + 1)}")
    return vcd_text(" ".join(parts) + "\n")


def _many_edges(n: int) -> dict[str, tuple[int, list]]:
    ah, al = [], []
    for k in range(n):
        base = 1000 * (k + 1) * NS
        al.append((base, 0))
        ah += [(base + 100 * NS, 1), (base + 500 * NS, 0)]
        al.append((base + 600 * NS, 1))
    return {"AH": (0, ah), "AL": (1, al)}


_MANY = 60_000  # about 2.3 MiB on one line


def vcd_cases(Case: Any, Fails: Any, Reads: Any) -> list[Any]:
    """The VCD reader's catalogue entries."""

    def case(name: str, data: Any, expect: Any, behaviour: str, **kw: Any) -> Any:
        return Case(name, data, expect, behaviour, reader="vcd", suffix=".vcd", **kw)

    # read() only for near-repeats: each error kind still goes through the CLI once
    cli_scales = {"100 fs"}

    def reads_good(rows: int = 6, edges: dict | None = None) -> Any:
        return Reads(rows, edges or _edges(GOOD_TICKS, UNIT_PS["ns"]), 0, 500 * NS)

    cases: list[Any] = []

    # --- empty and truncated ---------------------------------------------------------------
    cases += [
        case(
            "empty file",
            b"",
            Fails(r"empty file, expected a VCD header", 1),
            "exit 2 at line 1: empty file, expected a VCD header",
        ),
        case(
            "only blank lines",
            b"\n \n\t\n",
            Fails(r"file ends before '\$enddefinitions \$end'", 1),
            "exit 2: file ends before $enddefinitions",
            cli=False,
        ),
        case(
            "only a header (no value changes)",
            GOOD_VCD.split(b"#0")[0],
            Reads(0, {"AH": (2, []), "AL": (2, [])}, 0, 0),
            "read: no changes, both channels undefined (x) throughout; the report warns",
        ),
        case(
            "header cut inside a $var",
            GOOD_VCD[: GOOD_VCD.index(b"AH $end") + 2],
            Fails(r"file ends inside \$var \(truncated\?\); expected \$end", 4),
            "exit 2 at the $var's line: file ends inside $var",
        ),
        case(
            "header cut before $enddefinitions",
            GOOD_VCD[: GOOD_VCD.index(b"$upscope")],
            Fails(r"file ends before '\$enddefinitions \$end'", 5),
            "exit 2 at the last line: file ends before $enddefinitions",
        ),
        case(
            "header cut inside $timescale",
            b"$timescale 1 n",
            Fails(r"file ends inside \$timescale", 1),
            "exit 2 at line 1: file ends inside $timescale",
            cli=False,
        ),
        case(
            "body cut inside $dumpvars",
            GOOD_VCD[: GOOD_VCD.index(b"$end\n#100")],
            Fails(r"file ends inside \$dumpvars \(truncated\?\); expected \$end", 9),
            "exit 2 at the $dumpvars line: file ends inside $dumpvars",
        ),
        case(
            "body cut after a vector value",
            vcd_text('#0\n0!\n1"\n#10\nb1', extra_vars="$var wire 4 # bus [3:0] $end\n"),
            Fails(r"file ends after value 'b1' \(truncated\?\); expected an identifier code", 13),
            "exit 2 at the cut line: expected an identifier code",
        ),
        case(
            "body cut after a scalar value digit",
            vcd_text('#0\n0!\n1"\n#10\n1'),
            Fails(r"value '1' has no identifier code after it", 12),
            "exit 2 at the cut line: no identifier code after the value",
            cli=False,
        ),
        case(
            "body cut between lines (a shorter capture)",
            GOOD_VCD[: GOOD_VCD.index(b"#300")],
            Reads(4, {"AH": (0, [(200 * NS, 1)]), "AL": (1, [(100 * NS, 0)])}, 0, 200 * NS),
            "read: a cut at a line end is a valid shorter file; the report's time span shows it",
            cli=False,
        ),
    ]

    # --- not text / not a VCD --------------------------------------------------------------
    cases += [
        case(
            "binary garbage (bytes 0-255) named .vcd",
            bytes(range(256)) * 4,
            Fails(r"expected a VCD header keyword .*; is this a VCD file\?", 1),
            "exit 2 at line 1: is this a VCD file? (control characters escaped)",
        ),
        case(
            "random bytes named .vcd",
            random.Random(11).randbytes(4096),
            Fails(r"is this a VCD file\?", 1),
            "exit 2 at the first line with a token: is this a VCD file?",
            cli=False,
        ),
        case(
            "1 MiB of NUL bytes named .vcd",
            b"\0" * (1 << 20),
            Fails(r"is this a VCD file\?", 1),
            "exit 2 at line 1: is this a VCD file? (the token is shortened)",
            cli=False,
        ),
        case(
            "a CSV capture named .vcd",
            b"time_ns,AH,AL\n0,0,1\n100,1,0\n",
            Fails(r"expected a VCD header keyword .*found 'time_ns,AH,AL'", 1),
            "exit 2 at line 1: expected a VCD header keyword",
        ),
        case(
            "UTF-16 VCD",
            GOOD_VCD.decode().encode("utf-16"),
            Fails(r"is this a VCD file\?", 1),
            "exit 2 at line 1: is this a VCD file?",
            cli=False,
        ),
        case(
            "non-UTF-8 byte in the body",
            vcd_text('#0\n0!\n1"\n#10\n\xff\n').replace(b"\xc3\xbf", b"\xff"),
            Fails(r"expected a timestamp \(#N\) or a value change", 12),
            "exit 2 at the line: expected a timestamp or a value change",
        ),
        case(
            "non-UTF-8 byte as an identifier code",
            vcd_text('#0\n0!\n1"\n#10\n1\xff\n').replace(b"\xc3\xbf", b"\xff"),
            Fails(r"identifier code '.' was never declared", 12),
            "exit 2 at the line: identifier code never declared",
            cli=False,
        ),
        case(
            "Latin-1 byte in a name",
            vcd_text(_body(GOOD_TICKS), names=("Str\xf6m_H", "Str\xf6m_L")).replace(
                b"\xc3\xb6", b"\xf6"
            ),
            Fails(r"\$var name 'Str.m_H' is not UTF-8 text \(byte 0xf6\)", 4),
            "exit 2 at the $var line: the name is not UTF-8 text",
            cli=False,
        ),
        case(
            "UTF-8 names",
            vcd_text(_body(GOOD_TICKS), names=("Zweig_\xe4_H", "Zweig_\xe4_L")),
            reads_good(
                edges={
                    "Zweig_\xe4_H": _edges(GOOD_TICKS, UNIT_PS["ns"])["AH"],
                    "Zweig_\xe4_L": _edges(GOOD_TICKS, UNIT_PS["ns"])["AL"],
                }
            ),
            "read; names kept as UTF-8 text",
        ),
    ]

    # --- valid but odd layout ------------------------------------------------------------
    cases += [
        case("CRLF line ends", GOOD_VCD.replace(b"\n", b"\r\n"), reads_good(), "read"),
        case(
            "byte-order mark",
            b"\xef\xbb\xbf" + GOOD_VCD,
            reads_good(),
            "read; the BOM is dropped",
        ),
        case(
            "BOM and CRLF together",
            b"\xef\xbb\xbf" + GOOD_VCD.replace(b"\n", b"\r\n"),
            reads_good(),
            "read",
            cli=False,
        ),
        case(
            "tabs and several tokens per line",
            vcd_text('#0 $dumpvars\t0! 1" $end\n#100 0"\t#200 1!\n#300 0! #400 1" #500\n'),
            reads_good(),
            "read; any whitespace separates tokens",
            cli=False,
        ),
        case(
            f"{_MANY:,} periods on one line of 2 MiB",
            lambda d: _write(d, _many_on_one_line(_MANY)),
            Reads(2 + 4 * _MANY, _many_edges(_MANY), 0, 1000 * (_MANY + 1) * NS),
            "read; a line longer than the 256 KiB read chunk is cut between tokens",
        ),
        case(
            "$comment of 3 MiB in the header",
            lambda d: _write(
                d, GOOD_VCD.replace(b"$date", b"$comment " + b"x" * (3 << 20) + b" $end\n$date")
            ),
            reads_good(),
            "read; header comments of any length are skipped",
            cli=False,
        ),
        case(
            "timestamp of 2 MiB digits",
            vcd_text('#0\n0!\n1"\n#' + "9" * (2 << 20) + "\n"),
            Fails(r"too large to hold in picoseconds", 11),
            "exit 2 at the line: timestamp too large; the number is shortened in the message",
        ),
        case(
            "one token of 3 MiB in the body",
            vcd_text('#0\n0!\n1"\n' + "q" * (3 << 20) + "\n"),
            Fails(r"expected a timestamp \(#N\) or a value change", 11),
            "exit 2 at the line: expected a timestamp or a value change (shortened)",
        ),
    ]

    # --- every $timescale the standard allows ------------------------------------------
    # facts.md S10 [published] (IEEE Std 1364-2005, clause 18): 1, 10 or 100 of
    # s, ms, us, ns, ps, fs, with or without a space. Ticks that are not round numbers,
    # so any rounding shows; for fs, ticks that make whole picoseconds.
    for k, unit in enumerate(UNIT_PS):
        for j, mag in enumerate((1, 10, 100)):
            space = " " if (k + j) % 2 else ""
            scale = f"{mag}{space}{unit}"
            ps_per_tick = mag * UNIT_PS[unit]
            if unit == "fs":
                step = 1000 // mag
                ticks = [0, 100 * step, 213 * step, 300 * step, 417 * step, 500 * step]
            else:
                ticks = [0, 1001, 2003, 3007, 4011, 5013]
            edges = _edges(ticks, ps_per_tick)
            end = int(ticks[-1] * ps_per_tick)
            cases.append(
                case(
                    f"$timescale {scale}",
                    vcd_text(_body(ticks), scale=scale),
                    Reads(6, edges, 0, end),
                    f"read; one tick is {ps_per_tick} ps (exact)",
                    cli=scale in cli_scales,
                )
            )
    cases += [
        case(
            "$timescale 1 fs with a time that is not a whole picosecond",
            vcd_text(_body([0, 1000, 1500, 3000, 4000, 5000]), scale="1 fs"),
            Fails(r"timestamp #1500 .* not a whole picosecond", 15),
            "exit 2 at the line: not a whole picosecond",
        ),
        case(
            "$timescale 100fs with a time that is not a whole picosecond",
            vcd_text(_body([0, 10, 20, 30, 45, 50]), scale="100fs"),
            Fails(r"timestamp #45 .* not a whole picosecond", 19),
            "exit 2 at the line: not a whole picosecond",
            cli=False,
        ),
    ]
    for bad, why in [
        ("3ns", "3 is not 1, 10 or 100"),
        ("1 parsec", "not a unit"),
        ("1000 ns", "1000 is not 1, 10 or 100"),
        ("1.0 ns", "not a whole 1, 10 or 100"),
        ("-1 ns", "negative"),
        ("1", "no unit"),
        ("", "empty"),
    ]:
        cases.append(
            case(
                f"$timescale '{bad}'",
                vcd_text(_body(GOOD_TICKS), scale=bad),
                Fails(r"\$timescale must be 1, 10 or 100 followed by s, ms, us, ns, ps or fs", 2),
                f"exit 2 at line 2: $timescale {why}",
                cli=bad == "1 parsec",
            )
        )

    # --- times ---------------------------------------------------------------------------
    cases += [
        case(
            "timestamps going backwards",
            vcd_text(_body([0, 100, 200, 150, 400, 500])),
            Fails(r"timestamp #150 goes back in time after #200", 17),
            "exit 2 at the line: time goes back",
        ),
        case(
            "duplicate timestamps",
            vcd_text(
                '#0\n$dumpvars\n0!\n1"\n$end\n#100\n#100\n0"\n#200\n#200\n1!\n'
                '#300\n0!\n#300\n#400\n1"\n#500\n#500\n'
            ),
            reads_good(),
            "read; a repeated timestamp is the same instant",
            cli=False,
        ),
        case(
            "a channel changing twice at one instant",
            vcd_text(
                '#0\n$dumpvars\n0!\n1"\n$end\n#100\n0"\n#200\n0!\n1!\n#300\n1!\n0!\n'
                '#400\n1"\n#500\n'
            ),
            reads_good(rows=8),
            "read; of several values at one instant the last wins",
            cli=False,
        ),
        case(
            "negative timestamp",
            vcd_text('#0\n0!\n1"\n#-5\n'),
            Fails(r"expected a timestamp such as #100, found '#-5'", 11),
            "exit 2 at the line: expected a timestamp",
            cli=False,
        ),
        case(
            "timestamp in scientific notation",
            vcd_text('#0\n0!\n1"\n#1e3\n'),
            Fails(r"expected a timestamp such as #100, found '#1e3'", 11),
            "exit 2 at the line: expected a timestamp",
            cli=False,
        ),
        case(
            "timestamp beyond int64 picoseconds",
            vcd_text('#0\n0!\n1"\n#99999999999999999999\n1!\n'),
            Fails(r"too large to hold in picoseconds", 11),
            "exit 2 at the line: too large to hold in picoseconds",
        ),
    ]

    # --- identifiers and variables ---------------------------------------------------------
    bus = "$var wire 4 # bus [3:0] $end\n"
    cases += [
        case(
            "undeclared identifier code",
            vcd_text('#0\n0!\n1"\n#100\n1%\n'),
            Fails(r"identifier code '%' was never declared in a \$var", 12),
            "exit 2 at the line: identifier code never declared",
        ),
        case(
            "undeclared identifier in a vector change",
            vcd_text('#0\n0!\n1"\n#100\nb10 %\n'),
            Fails(r"identifier code '%' was never declared", 12),
            "exit 2 at the line: identifier code never declared",
            cli=False,
        ),
        *[
            case(
                f"$var width {shown}",
                vcd_text(_body(GOOD_TICKS), extra_vars=f"$var wire {w} # bus $end\n"),
                Fails(r"width must be a whole number of bits >= 1", 6),
                "exit 2 at the $var line: width must be a whole number >= 1",
                cli=w == "0",
            )
            for shown, w in [("0", "0"), ("-1", "-1"), ("x", "x"), ("1.5", "1.5")]
        ],
        case(
            "$var width in superscript digits",
            vcd_text(_body(GOOD_TICKS), extra_vars="$var wire \xb2 # bus $end\n").replace(
                b"\xc2\xb2", b"\xb2"
            ),
            Fails(r"width must be a whole number of bits >= 1", 6),
            "exit 2 at the $var line: width must be a whole number >= 1",
        ),
        case(
            "NUL bytes after a multi-character identifier code",
            vcd_text("#0\n0AB\n1AC\n#100\n1AB\0\0\n", codes=("AB", "AC")),
            Fails(r"identifier code 'AB\\x00\\x00' was never declared", 12),
            "exit 2 at the line: identifier code never declared",
        ),
        case(
            "one identifier code declared with two widths",
            vcd_text(
                '#0\nb0 !\n1"\n#100\nb1 !\n#200\n',
                extra_vars="$var wire 4 ! bus [3:0] $end\n",
            ),
            Fails(r"'!'.*(width|wide|bits)", 6),
            "exit 2 at the second $var line: one code, two widths",
            args=("--leg", "A=bus[0],AL"),
            read_options={"channels": ["bus[0]", "AL"]},
        ),
        case(
            "$var width that does not match its range",
            vcd_text(_body(GOOD_TICKS), extra_vars="$var wire 4 # bus [7:0] $end\n"),
            Fails(r"width 4 does not match range \[7:0\]", 6),
            "exit 2 at the $var line: width does not match the range",
            cli=False,
        ),
        case(
            "vector value wider than its $var",
            vcd_text('#0\n0!\n1"\n#100\nb10101 #\n', extra_vars=bus),
            Fails(r"has 5 bits, but '#' is declared 4 bits wide", 13),
            "exit 2 at the line: more bits than declared",
        ),
        case(
            "vector value with a bad digit",
            vcd_text('#0\n0!\n1"\n#100\nb1020 #\n', extra_vars=bus),
            Fails(r"expected a binary vector such as b1010", 13),
            "exit 2 at the line: expected a binary vector",
            cli=False,
        ),
        case(
            "value other than 0 1 x z",
            vcd_text('#0\n0!\n1"\n#100\n2!\n'),
            Fails(r"expected a timestamp \(#N\) or a value change .*found '2!'", 12),
            "exit 2 at the line: expected a value change",
        ),
        case(
            "keyword not allowed after $enddefinitions",
            vcd_text('#0\n0!\n1"\n$var wire 1 % late $end\n'),
            Fails(r"\$var is not allowed after \$enddefinitions", 11),
            "exit 2 at the line: $var not allowed after $enddefinitions",
            cli=False,
        ),
        case(
            "$upscope without $scope",
            b"$timescale 1 ns $end\n$upscope $end\n$enddefinitions $end\n#0\n",
            Fails(r"\$upscope without a matching \$scope", 2),
            "exit 2 at the line: $upscope without $scope",
            cli=False,
        ),
        case(
            "value changes before $enddefinitions",
            b"$timescale 1 ns $end\n$var wire 1 ! AH $end\n#0\n1!\n",
            Fails(r"expected a VCD header keyword .*found '#0'", 3),
            "exit 2 at the line: expected a header keyword",
            cli=False,
        ),
        # facts.md S10 [published]: vectors left-extended with 0, or with x/z when the
        # leftmost digit given is x/z (IEEE Std 1364-2005, clause 18)
        case(
            "vectors with 0, x and z left-extension, bits as channels",
            vcd_text(
                "#0\nb1 #\n#100\nbx1 #\n#200\nbz #\n#300\nb10 #\n#400\nb1000 #\n#500\n",
                extra_vars=bus,
            ),
            Reads(
                5,
                {
                    "bus[3]": (0, [(100 * NS, 2), (200 * NS, 3), (300 * NS, 0), (400 * NS, 1)]),
                    "bus[0]": (1, [(200 * NS, 3), (300 * NS, 0)]),
                },
                0,
                500 * NS,
            ),
            "read; b1 is 0001, bx1 is xxx1, bz is zzzz",
            args=("--leg", "A=bus[3],bus[0]"),
            read_options={"channels": ["bus[3]", "bus[0]"]},
        ),
        case(
            "selected bit out of range",
            vcd_text(_body(GOOD_TICKS), extra_vars=bus),
            Fails(r"channel 'bus\[7\]': pump.bus has no bit 7 \(range \[3:0\]\)", None),
            "exit 2: the variable has no such bit (its range shown)",
            args=("--leg", "A=bus[7],bus[0]"),
            read_options={"channels": ["bus[7]", "bus[0]"]},
        ),
        case(
            "unknown channel",
            GOOD_VCD,
            Fails(r"no variable 'BL' in the VCD \(variables: pump.AH, pump.AL\)", None),
            "exit 2: no such variable, the variables listed",
            args=("--leg", "A=AH,BL"),
            read_options={"channels": ["AH", "BL"]},
        ),
        case(
            "a vector named as a channel without a bit",
            vcd_text(_body(GOOD_TICKS), extra_vars=bus),
            Fails(r"channel 'bus' is 4 bits wide; select one bit", None),
            "exit 2: select one bit of a vector",
            args=("--leg", "A=bus,AL"),
            read_options={"channels": ["bus", "AL"]},
            cli=False,
        ),
        # facts.md S10 [published]: 0 1 x z in any case; x and z kept as undefined
        case(
            "x and z levels",
            vcd_text('#0\n$dumpvars\nx!\nZ"\n$end\n#100\n1"\n#200\n0!\n#300\nX!\n#400\nz"\n#500\n'),
            Reads(
                6,
                {
                    "AH": (2, [(200 * NS, 0), (300 * NS, 2)]),
                    "AL": (3, [(100 * NS, 1), (400 * NS, 3)]),
                },
                0,
                500 * NS,
            ),
            "read; x and z kept as undefined (unknown-state finding)",
        ),
        case(
            "$dumpoff and $dumpon",
            vcd_text(
                '#0\n$dumpvars\n0!\n1"\n$end\n#100\n0"\n#200\n$dumpoff\nx!\nx"\n$end\n'
                '#300\n$dumpon\n0!\n1"\n$end\n#400\n1!\n#500\n'
            ),
            Reads(
                8,
                {
                    "AH": (0, [(200 * NS, 2), (300 * NS, 0), (400 * NS, 1)]),
                    "AL": (1, [(100 * NS, 0), (200 * NS, 2), (300 * NS, 1)]),
                },
                0,
                500 * NS,
            ),
            "read; values are undefined (x) while dumping is off",
            cli=False,
        ),
        # facts.md S10 [published]: several $vars may share one identifier
        case(
            "aliased identifiers (two $var sharing one code)",
            vcd_text(_body(GOOD_TICKS), extra_vars="$var wire 1 ! AH_copy $end\n"),
            Reads(
                6,
                {
                    "AH": _edges(GOOD_TICKS, UNIT_PS["ns"])["AH"],
                    "AH_copy": _edges(GOOD_TICKS, UNIT_PS["ns"])["AH"],
                },
                0,
                500 * NS,
            ),
            "read; each name sharing the code gets the same edges",
            args=("--leg", "A=AH,AH_copy"),
            read_options={"channels": ["AH", "AH_copy"]},
        ),
        case(
            "names with markup and quotes",
            vcd_text(_body(GOOD_TICKS), names=("<b>x</b>_H", '"x"_L')),
            reads_good(
                edges={
                    "<b>x</b>_H": _edges(GOOD_TICKS, UNIT_PS["ns"])["AH"],
                    '"x"_L': _edges(GOOD_TICKS, UNIT_PS["ns"])["AL"],
                }
            ),
            "read; names are just text (escaped by XML/HTML reports)",
            args=("--leg", 'A=<b>x</b>_H,"x"_L'),
        ),
        # facts.md S10 [published]: identifier codes are printable ASCII 33-126, '#' too
        case(
            "identifier codes that include '#'",
            vcd_text(_body(GOOD_TICKS, hs="#", ls="#1"), codes=("#", "#1")),
            reads_good(),
            "read; '#' starting a code is not a timestamp",
            cli=False,
        ),
        case(
            "a vector change whose code is '#' on the next line",
            vcd_text(
                '#0\n$dumpvars\nb0\n#\n1"\n$end\n#100\n0"\n#200\nb1\n#\n#300\nb0 #\n'
                '#400\n1"\n#500\n',
                codes=("#", '"'),
            ),
            reads_good(),
            "read; a value and its code may be split over lines",
            cli=False,
        ),
        case(
            "a real change",
            vcd_text(
                _body(GOOD_TICKS).replace("#200\n", "#200\nr1.25 %\n"),
                extra_vars="$var real 64 % vbus $end\n",
            ),
            reads_good(rows=7),
            "read; real values are counted and carry no logic level",
            cli=False,
        ),
    ]
    return cases

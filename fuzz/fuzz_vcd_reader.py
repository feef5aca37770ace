"""Coverage-guided fuzzing of the VCD reader with atheris (not run in CI).

Every input is written to a scratch file and read with ``read_vcd``. The first byte picks
the options: a small read chunk (so chunk borders fall everywhere), the general line
parser instead of the numpy fast path, and a named channel selection. Crashes are:
any exception other than InputError/UsageError, any warning, an error message of more
than one line or naming no line (except the empty file, catalogued), and -- the
differential oracle -- a result that differs from the plain reading (default chunk,
fast path) of the same bytes: other edges, rows or time span, or another error line.
Each distinct crash kind is recorded once in ``<out>/crashes`` with its input.

    python fuzz/fuzz_vcd_reader.py --minutes 5 [-- -dict=fuzz/vcd.dict]
    python fuzz/fuzz_vcd_reader.py --replay fuzz/out-vcd/crashes
"""

from __future__ import annotations

import os
import sys
import warnings
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(HERE))

from _campaign import Campaign, run  # noqa: E402

SEEDS = [
    b"$timescale 1 ns $end\n$scope module pump $end\n$var wire 1 ! AH $end\n"
    b'$var wire 1 " AL $end\n$upscope $end\n$enddefinitions $end\n'
    b'#0\n$dumpvars\n0!\n1"\n$end\n#100\n0"\n#200\n1!\n#300\n0!\n#400\n1"\n#500\n',
    b"$timescale 10fs $end\n$scope module m $end\n$var wire 4 # bus [3:0] $end\n"
    b"$var wire 1 AB AH $end\n$var real 64 % v $end\n$upscope $end\n$enddefinitions $end\n"
    b"#0\nb1 #\n1AB\nr1.5 %\n#100\nbx1 #\n0AB\n#200\n$dumpoff\nx#\nxAB\n$end\n#300\n"
    b"$dumpon\nbz #\nzAB\n$end\n",
    b"$date x $end $version y $end $comment z $end $timescale 100 ps $end\r\n"
    b"$scope module top $end $var wire 1 # AH $end $var wire 1 #1 AL $end\r\n"
    b"$upscope $end $enddefinitions $end\r\n#0 0# 1#1 #5 1# 0#1 #7 b0\r\n#\r\n",
]

CAMPAIGN = Campaign(HERE / "out-vcd")
_scratch = ""


def _options(flag: int) -> dict[str, object]:
    options: dict[str, object] = {}
    if flag & 0b11:
        options["chunk_bytes"] = (1, 7, 64)[(flag & 0b11) - 1]
    if flag & 0b100:
        options["channels"] = ["AH", "bus[0]"] if flag & 0b1000 else ["AH"]
    return options


def _outcome(options: dict[str, object], fast: bool) -> tuple:
    """What one reading gives: edges and span, or the error's line and message."""
    from sequencecheck.errors import InputError, UsageError
    from sequencecheck.readers._vcd import read_vcd
    from sequencecheck.readers._vcd_body import VcdBody

    VcdBody.fast_path = fast
    try:
        tr = read_vcd(_scratch, **options)  # type: ignore[arg-type]
    except InputError as e:
        return ("error", e.line, e.message)
    except UsageError as e:
        return ("usage", str(e))
    finally:
        VcdBody.fast_path = True
    chans = {n: (c.initial, c.times.tolist(), c.levels.tolist()) for n, c in tr.channels.items()}
    return ("read", tr.rows, tr.start_ps, tr.end_ps, chans)


def test_one_input(data: bytes) -> None:
    CAMPAIGN.stats["inputs"] += 1
    flag, body = (data[0], data[1:]) if data else (0, b"")
    with open(_scratch, "wb") as f:
        f.write(body)
    options = _options(flag)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            got = _outcome(options, fast=not flag & 0b10000)
            kind = got[0]
            CAMPAIGN.stats[
                {"read": "read", "error": "input_errors", "usage": "usage_errors"}[kind]
            ] += 1
            if kind == "error":
                if "\n" in got[2]:
                    CAMPAIGN.record(AssertionError(f"multi-line error: {got[2]}"), data)
                elif (
                    got[1] is None and body and "channel" not in got[2] and "variable" not in got[2]
                ):
                    CAMPAIGN.record(AssertionError(f"error naming no line: {got[2]}"), data)
            if options.get("chunk_bytes") or flag & 0b10000:
                plain = {k: v for k, v in options.items() if k != "chunk_bytes"}
                reference = _outcome(plain, fast=True)
                if reference != got:
                    CAMPAIGN.record(
                        AssertionError(
                            f"differs from the plain reading: {_diff(got, reference)}"
                            f"{' (input holds NUL bytes)' if 0 in body else ''}"
                        ),
                        data,
                    )
        except Exception as e:  # every other exception is a crash
            CAMPAIGN.record(e, data)
    for w in caught:
        CAMPAIGN.record(AssertionError(f"{w.category.__name__}: {w.message}"), data)
    CAMPAIGN.tick()


def _diff(a: tuple, b: tuple) -> str:
    if a[0] != b[0]:
        return f"{a[0]} vs {b[0]}"
    if a[0] == "error":
        return "another error" if a[1] == b[1] else "another error line"
    return "other rows/span" if a[1:4] != b[1:4] else "other edges"


def _prepare(folder: str) -> None:
    global _scratch
    _scratch = os.path.join(folder, "input.vcd")


def _instrument() -> None:
    import sequencecheck.readers._vcd
    import sequencecheck.readers._vcd_body
    import sequencecheck.readers._vcd_header  # noqa: F401


def _seed(corpus: Path) -> None:
    for i, seed in enumerate(SEEDS):
        for flag in (0, 1, 2, 3, 4, 12, 16, 17):
            (corpus / f"seed-{i}-{flag}").write_bytes(bytes([flag]) + seed)


def main() -> None:
    run(
        CAMPAIGN,
        __doc__.splitlines()[0],
        minutes=5.0,
        out=HERE / "out-vcd",
        scratch_prefix="fuzz-vcd-",
        max_len=4096,
        prepare=_prepare,
        test_one_input=test_one_input,
        instrument=_instrument,
        seed=_seed,
    )


if __name__ == "__main__":
    main()

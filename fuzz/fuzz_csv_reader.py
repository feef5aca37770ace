"""Coverage-guided fuzzing of the CSV reader with atheris (not run in CI).

Every input is written to a scratch file and read with ``read_csv``; the first byte
picks reader options (time unit, sample rate, named time column) so those paths are
fuzzed too. Anything raised other than InputError/UsageError is a crash, and so is
any warning (it reaches the terminal as extra stderr lines), an InputError message of
more than one line, and an InputError that names no line (every problem inside a
regular file has one). The campaign keeps going after a crash: each distinct crash (exception type,
message shape and the innermost frame of sequencecheck) is recorded once in
``--crash-dir`` with the input that caused it, so one run finds many kinds.

    pip install atheris
    python fuzz/fuzz_csv_reader.py --minutes 10            # seeds from samples/ and fuzz/seeds
    python fuzz/fuzz_csv_reader.py --replay fuzz/out/crashes   # re-run recorded inputs

Extra arguments after ``--`` go to libFuzzer (e.g. ``-- -max_len=4096``).
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
    b"time_ns,AH,AL\n0,0,1\n100,0,0\n250,1,0\n400,0,0\n500,0,1\n",
    b"\xef\xbb\xbftime_ns;AH;AL\r\n0;0;1\r\n10;1;0\r\n",
    b"time (us),A_H,A_L,B_H,B_L\n0,0,1,0,1\n1.5,0,0,0,1\n2.25,1,0,1,0\n",
    b"sample,AH,AL\n0,0,1\n1,0,0\n2,1,0\n3,1,0\n",
    b't,"gate A hi",<b>x</b>\n0,0,1\n1e-9,0,0\n2e-9,1,0\n',
]

CAMPAIGN = Campaign(HERE / "out")
_scratch = ""


def _options(flag: int) -> dict[str, object]:
    options: dict[str, object] = {}
    if flag & 0b11 == 1:
        options["time_unit"] = "ns"
    elif flag & 0b11 == 2:
        options["sample_rate_hz"] = 100e6
    elif flag & 0b11 == 3:
        options["time_unit"] = "s"
    if flag & 0b100:
        options["channels"] = ["AH"]
    if flag & 0b1000:
        options["time_column"] = "t"
    return options


def test_one_input(data: bytes) -> None:
    from sequencecheck.errors import InputError, UsageError
    from sequencecheck.readers._csv import read_csv

    CAMPAIGN.stats["inputs"] += 1
    flag, body = (data[0], data[1:]) if data else (0, b"")
    with open(_scratch, "wb") as f:
        f.write(body)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            read_csv(_scratch, **_options(flag))  # type: ignore[arg-type]
            CAMPAIGN.stats["read"] += 1
        except InputError as e:
            CAMPAIGN.stats["input_errors"] += 1
            if "\n" in str(e):
                CAMPAIGN.record(AssertionError(f"multi-line error: {e!s}"), data)
            elif e.line is None:  # a regular file's error always has a line to name
                CAMPAIGN.record(AssertionError(f"error naming no line: {e.message}"), data)
        except UsageError:
            CAMPAIGN.stats["usage_errors"] += 1
        except Exception as e:  # every other exception is a crash
            CAMPAIGN.record(e, data)
    for w in caught:  # a warning reaches the user's terminal as extra stderr lines
        CAMPAIGN.record(AssertionError(f"{w.category.__name__}: {w.message}"), data)
    CAMPAIGN.tick()


def _prepare(folder: str) -> None:
    global _scratch
    _scratch = os.path.join(folder, "input.csv")


def _instrument() -> None:
    import sequencecheck.readers._csv  # noqa: F401


def _seed(corpus: Path) -> None:
    for i, seed in enumerate(SEEDS):
        for flag in (0, 1, 2, 4, 8):
            (corpus / f"seed-{i}-{flag}").write_bytes(bytes([flag]) + seed)
    for sample in sorted((ROOT / "samples").glob("*_changes.csv")):
        (corpus / f"sample-{sample.stem}").write_bytes(b"\0" + sample.read_bytes()[:4000])


def main() -> None:
    run(
        CAMPAIGN,
        __doc__.splitlines()[0],
        minutes=10.0,
        out=HERE / "out",
        scratch_prefix="fuzz-csv-",
        max_len=8192,
        prepare=_prepare,
        test_one_input=test_one_input,
        instrument=_instrument,
        seed=_seed,
    )


if __name__ == "__main__":
    main()

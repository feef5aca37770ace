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

import argparse
import hashlib
import os
import re
import shutil
import sys
import tempfile
import time
import traceback
import warnings
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(ROOT))

SEEDS = [
    b"time_ns,AH,AL\n0,0,1\n100,0,0\n250,1,0\n400,0,0\n500,0,1\n",
    b"\xef\xbb\xbftime_ns;AH;AL\r\n0;0;1\r\n10;1;0\r\n",
    b"time (us),A_H,A_L,B_H,B_L\n0,0,1,0,1\n1.5,0,0,0,1\n2.25,1,0,1,0\n",
    b"sample,AH,AL\n0,0,1\n1,0,0\n2,1,0\n3,1,0\n",
    b't,"gate A hi",<b>x</b>\n0,0,1\n1e-9,0,0\n2e-9,1,0\n',
]

_seen: dict[str, int] = {}
_out = HERE / "out"
_stats = {"inputs": 0, "input_errors": 0, "usage_errors": 0, "read": 0}
_scratch = ""
_started = time.monotonic()
_last_summary = 0.0


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


def _signature(exc: BaseException) -> str:
    frames = [f for f in traceback.extract_tb(exc.__traceback__) if "sequencecheck" in f.filename]
    where = f"{Path(frames[-1].filename).name}:{frames[-1].lineno}" if frames else "?"
    shape = re.sub(r"\d+", "N", str(exc))[:80]
    return f"{type(exc).__name__} at {where}: {shape}"


def test_one_input(data: bytes) -> None:
    from sequencecheck.errors import InputError, UsageError
    from sequencecheck.readers._csv import read_csv

    _stats["inputs"] += 1
    flag, body = (data[0], data[1:]) if data else (0, b"")
    with open(_scratch, "wb") as f:
        f.write(body)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            read_csv(_scratch, **_options(flag))  # type: ignore[arg-type]
            _stats["read"] += 1
        except InputError as e:
            _stats["input_errors"] += 1
            if "\n" in str(e):
                _record(AssertionError(f"multi-line error: {e!s}"), data)
            elif e.line is None:  # a regular file's error always has a line to name
                _record(AssertionError(f"error naming no line: {e.message}"), data)
        except UsageError:
            _stats["usage_errors"] += 1
        except Exception as e:  # every other exception is a crash
            _record(e, data)
    for w in caught:  # a warning reaches the user's terminal as extra stderr lines
        _record(AssertionError(f"{w.category.__name__}: {w.message}"), data)
    global _last_summary
    if time.monotonic() - _last_summary > 5:
        _last_summary = time.monotonic()
        _out.mkdir(parents=True, exist_ok=True)
        (_out / "summary.txt").write_text(_summary_text())


def _record(exc: BaseException, data: bytes) -> None:
    sig = _signature(exc)
    _seen[sig] = _seen.get(sig, 0) + 1
    if _seen[sig] == 1:
        crashes = _out / "crashes"
        crashes.mkdir(parents=True, exist_ok=True)
        name = hashlib.sha1(data).hexdigest()[:12]
        (crashes / f"crash-{name}.bin").write_bytes(data)
        (crashes / f"crash-{name}.txt").write_text(
            sig + "\n\n" + "".join(traceback.format_exception(exc))
        )
        print(f"\n[new crash kind #{len(_seen)}] {sig}", file=sys.stderr, flush=True)


def _summary_text() -> str:
    lines = [
        f"fuzz summary: {_stats['inputs']:,} inputs in {time.monotonic() - _started:.0f} s; "
        f"read {_stats['read']:,}, input errors {_stats['input_errors']:,}, "
        f"usage errors {_stats['usage_errors']:,}; distinct crash kinds {len(_seen)}"
    ]
    lines += [f"  {n:>8,}  {sig}" for sig, n in sorted(_seen.items(), key=lambda kv: -kv[1])]
    return "\n".join(lines) + "\n"


def main() -> None:
    global _out, _scratch, _started
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--minutes", type=float, default=10.0, help="campaign length")
    parser.add_argument("--out", default=str(HERE / "out"), help="crashes, corpus and summary")
    parser.add_argument("--replay", metavar="DIR", help="run each *.bin in DIR once and stop")
    args, extra = parser.parse_known_args()
    _out = Path(args.out)
    scratch_dir = tempfile.mkdtemp(
        prefix="fuzz-csv-", dir="/dev/shm" if os.path.isdir("/dev/shm") else None
    )
    _scratch = os.path.join(scratch_dir, "input.csv")
    _started = time.monotonic()
    try:
        if args.replay:
            for p in sorted(Path(args.replay).glob("*.bin")):
                test_one_input(p.read_bytes())
            return
        import atheris

        with atheris.instrument_imports():
            import sequencecheck.readers._csv  # noqa: F401

        corpus = _out / "corpus"
        corpus.mkdir(parents=True, exist_ok=True)
        for i, seed in enumerate(SEEDS):
            for flag in (0, 1, 2, 4, 8):
                (corpus / f"seed-{i}-{flag}").write_bytes(bytes([flag]) + seed)
        for sample in sorted((ROOT / "samples").glob("*_changes.csv")):
            (corpus / f"sample-{sample.stem}").write_bytes(b"\0" + sample.read_bytes()[:4000])
        libfuzzer = [
            sys.argv[0],
            f"-max_total_time={int(args.minutes * 60)}",
            "-max_len=8192",
            "-timeout=20",
            "-rss_limit_mb=4096",
            *[a for a in extra if a != "--"],
            str(corpus),
        ]
        atheris.Setup(libfuzzer, test_one_input)
        atheris.Fuzz()  # libFuzzer ends the process itself when time is up
    finally:
        print(_summary_text(), file=sys.stderr)
        shutil.rmtree(scratch_dir, ignore_errors=True)


if __name__ == "__main__":
    main()

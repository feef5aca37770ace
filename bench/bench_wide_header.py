"""Time per byte on wide captures: does reading stay linear in the number of columns?

Writes captures of N and 4N channels (three rows each, the last one short, so the
reader must also find and name the bad row) into bench/data/, reads each with
``read_csv`` in this process, and prints the times and their ratio. Linear work gives a
ratio near 4; quadratic work near 16.

    python bench/bench_wide_header.py            # N = 2,500
    python bench/bench_wide_header.py --n 1000
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
DATA = HERE / "data"


def write(path: Path, n: int, short_row: bool) -> None:
    names = b",".join(b"C%06d" % i for i in range(n))
    last = b"20" + b",1" * (n // 2 if short_row else n)
    path.write_bytes(
        b"time_ns," + names + b"\n0" + b",0" * n + b"\n10" + b",1" * n + b"\n" + last + b"\n"
    )


def timed_read(path: Path) -> tuple[float, str]:
    from sequencecheck.errors import InputError
    from sequencecheck.readers import read_csv

    t0 = time.perf_counter()
    try:
        read_csv(str(path))
        outcome = "read"
    except InputError as e:
        outcome = f"InputError at line {e.line} ({len(str(e)):,} characters)"
    return time.perf_counter() - t0, outcome


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--n", type=int, default=2500, help="channels in the narrower file")
    args = parser.parse_args()
    DATA.mkdir(parents=True, exist_ok=True)
    timed_read_warmup = DATA / "wide_warmup.csv"
    write(timed_read_warmup, 10, False)
    timed_read(timed_read_warmup)
    timed_read_warmup.unlink()
    for short_row in (False, True):
        times = []
        for n in (args.n, 4 * args.n):
            path = DATA / f"wide_{n}.csv"
            write(path, n, short_row)
            seconds, outcome = timed_read(path)
            times.append(seconds)
            print(
                f"{n:>7,} channels, {'short last row' if short_row else 'valid'}: {seconds:.3f} s, {outcome}"
            )
            path.unlink()
        print(f"  ratio 4N / N: {times[1] / times[0]:.1f} (linear ~4, quadratic ~16)")


if __name__ == "__main__":
    main()

"""Time, peak memory and report size on a capture full of faults (a floating probe).

Every channel of the invented pump inverter's two legs takes a random level at every
10 ns sample, so nearly every sample is an edge and a quarter of them overlap. The
script writes captures of N and 4N rows into bench/data/, runs ``sequencecheck check``
on each (JSON and text reports to files), and prints time, peak RSS, report size and
the 4N / N ratios side by side. A report whose size and memory grow with the number of
findings shows ratios near 4; a bounded report shows ratios near 1.

    python bench/bench_noisy_capture.py              # N = 250,000 rows
    python bench/bench_noisy_capture.py --rows 50000
"""

from __future__ import annotations

import argparse
import os
import re
import subprocess
import sys
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
DATA = HERE / "data"


def write(path: Path, rows: int, seed: int = 1) -> None:
    rng = np.random.default_rng(seed)
    with open(path, "w") as f:
        f.write("time_ns,AH,AL,BH,BL\n")
        for start in range(0, rows, 1_000_000):
            n = min(1_000_000, rows - start)
            t = (np.arange(start, start + n) * 10)[:, None]
            levels = rng.integers(0, 2, (n, 4))
            np.savetxt(f, np.hstack([t, levels]), fmt="%d", delimiter=",")


def run(path: Path, fmt: str) -> tuple[float, int, int]:
    """Seconds, peak RSS (KiB) and report bytes of one check."""
    out = path.with_suffix(f".{fmt}.report")
    cmd = [sys.executable, "-m", "sequencecheck", "check", str(path), "--dead-time", "500ns"]
    cmd += ["--format", fmt, "--output", str(out)]
    env = dict(os.environ, PYTHONPATH=str(ROOT), NO_COLOR="1")
    t0 = time.perf_counter()
    r = subprocess.run(["/usr/bin/time", "-v", *cmd], capture_output=True, text=True, env=env)
    seconds = time.perf_counter() - t0
    m = re.search(r"Maximum resident set size \(kbytes\): (\d+)", r.stderr)
    size = out.stat().st_size if out.exists() else -1
    out.unlink(missing_ok=True)
    return seconds, int(m.group(1)) if m else -1, size


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", type=int, default=250_000, help="rows N of the smaller capture")
    args = parser.parse_args()
    if not os.path.exists("/usr/bin/time"):
        sys.exit("needs /usr/bin/time for the peak memory of the child")
    DATA.mkdir(parents=True, exist_ok=True)
    for fmt in ("text", "json"):
        figures = []
        for rows in (args.rows, 4 * args.rows):
            path = DATA / f"noisy_{rows}.csv"
            write(path, rows)
            mb = path.stat().st_size / 1e6
            seconds, kib, size = run(path, fmt)
            path.unlink()
            figures.append((seconds, kib, size))
            print(
                f"{fmt:>4} {rows:>10,} rows ({mb:,.1f} MB): {seconds:6.2f} s, "
                f"peak RSS {kib / 1024:,.0f} MiB, report {size / 1e6:,.1f} MB"
            )
        (s1, k1, z1), (s4, k4, z4) = figures
        print(f"     ratios 4N / N: time {s4 / s1:.1f}, memory {k4 / k1:.1f}, report {z4 / z1:.1f}")


if __name__ == "__main__":
    main()

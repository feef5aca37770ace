"""Peak memory and time of ``sequencecheck check`` on a ~2 GiB sampled CSV capture.

Invented scenario: the small cart drive's H-bridge (legs A and B, 20 kHz PWM, 750 ns
dead time) sampled at 100 MS/s (10 ns). Two faults sit in the last hundredth of the
file: a 150 ns dead time on leg A and a 100 ns shoot-through on leg A, so a run that
stopped early or skipped rows cannot report them at the right instants.

The script writes the capture into bench/data/ (git-ignored), times a plain read of the
file (``cat > /dev/null``) and then ``sequencecheck check`` side by side, and prints the
ratio, the throughput and the peak resident memory of the check (``/usr/bin/time -v``
when present, else ``getrusage`` of the child). ``--keep`` keeps the file afterwards.

    python bench/bench_big_capture.py            # ~2 GiB
    python bench/bench_big_capture.py --gib 0.1  # a quick try
"""

from __future__ import annotations

import argparse
import json
import os
import re
import resource
import subprocess
import sys
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
DATA = HERE / "data"

TS_NS = 10
PERIOD_NS = 50_000
HIGH_ON_NS, HIGH_OFF_NS, LOW_ON_NS = 750, 30_000, 30_750
DIGITS = 10
ROW_BYTES = DIGITS + len(",0,0,0,0\n")
HEADER = b"time_ns,AH,AL,BH,BL\n"


def _levels(t: np.ndarray, fault_dead: int, fault_overlap: int) -> list[np.ndarray]:
    """AH, AL, BH, BL at times ``t`` (ns); leg B runs half a period behind leg A."""
    out = []
    for shift in (0, PERIOD_NS // 2):
        ts = t + shift
        period, phase = ts // PERIOD_NS, ts % PERIOD_NS
        high = (phase >= HIGH_ON_NS) & (phase < HIGH_OFF_NS)
        low = phase >= LOW_ON_NS
        if shift == 0:
            low |= (period == fault_dead) & (phase >= HIGH_OFF_NS + 150)
            low |= (period == fault_overlap) & (phase < HIGH_ON_NS + 100)
        out += [high, low]
    return out


def generate(path: Path, rows: int, chunk: int = 4_000_000) -> dict[str, int]:
    """Write ``rows`` sampled rows; return the expected fault instants in ps."""
    periods = rows * TS_NS // PERIOD_NS
    fault_dead, fault_overlap = periods - 40, periods - 20
    weights = 10 ** np.arange(DIGITS - 1, -1, -1, dtype=np.int64)
    with open(path, "wb") as f:
        f.write(HEADER)
        for start in range(0, rows, chunk):
            n = min(chunk, rows - start)
            t = (np.arange(start, start + n, dtype=np.int64)) * TS_NS
            buf = np.empty((n, ROW_BYTES), dtype=np.uint8)
            buf[:, :DIGITS] = (t[:, None] // weights) % 10 + ord("0")
            for k, level in enumerate(_levels(t, fault_dead, fault_overlap)):
                buf[:, DIGITS + 2 * k] = ord(",")
                buf[:, DIGITS + 2 * k + 1] = level.astype(np.uint8) + ord("0")
            buf[:, -1] = ord("\n")
            f.write(buf.tobytes())
    return {
        "dead_time_at_ps": (fault_dead * PERIOD_NS + HIGH_OFF_NS) * 1000,
        "shoot_through_at_ps": (fault_overlap * PERIOD_NS + HIGH_ON_NS) * 1000,
    }


_PARSE_ONLY = """
import sys, pyarrow as pa, pyarrow.csv as c
types = {"time_ns": pa.float64(), **{k: pa.int8() for k in ("AH", "AL", "BH", "BL")}}
r = c.open_csv(sys.argv[1], read_options=c.ReadOptions(block_size=4 << 20),
               convert_options=c.ConvertOptions(column_types=types))
print(sum(b.num_rows for b in r))
"""


def _peak_kib(stderr: str) -> int:
    m = re.search(r"Maximum resident set size \(kbytes\): (\d+)", stderr)
    return int(m.group(1)) if m else -1


def _timed(cmd: list[str], **kw: object) -> tuple[float, subprocess.CompletedProcess[str]]:
    t0 = time.perf_counter()
    r = subprocess.run(cmd, capture_output=True, text=True, **kw)  # type: ignore[call-overload]
    return time.perf_counter() - t0, r


def _measure(
    cmd: list[str], env: dict[str, str]
) -> tuple[float, int, subprocess.CompletedProcess[str]]:
    """Wall seconds, peak RSS (KiB) and the result of one child process."""
    timer = "/usr/bin/time" if os.path.exists("/usr/bin/time") else None
    before = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
    seconds, r = _timed([timer, "-v", *cmd] if timer else cmd, env=env)
    if timer:
        return seconds, _peak_kib(r.stderr), r
    after = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
    return seconds, after if after > before else -1, r  # -1: hidden by an earlier, larger child


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--gib", type=float, default=2.0, help="capture size in GiB")
    parser.add_argument("--keep", action="store_true", help="keep the generated capture")
    args = parser.parse_args()
    DATA.mkdir(parents=True, exist_ok=True)
    path = DATA / "big_sampled.csv"
    report = DATA / "big_report.json"
    rows = int(args.gib * 2**30) // ROW_BYTES
    t0 = time.perf_counter()
    expected = generate(path, rows)
    size = path.stat().st_size
    print(
        f"generated {path.name}: {rows:,} rows, {size / 2**30:.2f} GiB in {time.perf_counter() - t0:.1f} s"
    )
    env = dict(os.environ, PYTHONPATH=str(ROOT), NO_COLOR="1")
    try:
        cat_s, _ = _timed(["sh", "-c", f"cat '{path}' > /dev/null"])
        parse_s, parse_kib, _ = _measure([sys.executable, "-c", _PARSE_ONLY, str(path)], env)
        cmd = [
            sys.executable, "-m", "sequencecheck", "check", str(path),
            "--dead-time", "500ns", "--format", "json", "--output", str(report),
        ]  # fmt: skip
        check_s, check_kib, r = _measure(cmd, env)
        if r.returncode != 1:
            sys.exit(
                f"expected exit 1 (two planted faults), got {r.returncode}: {r.stderr[-2000:]}"
            )
        doc = json.loads(report.read_text())
        found = {v["rule"]: v["start_ps"] for v in doc["violations"]}
        summary = doc["summary"]["inputs"][0]
        ok = (
            summary["rows"] == rows
            and found.get("dead-time") == expected["dead_time_at_ps"]
            and found.get("shoot-through") == expected["shoot_through_at_ps"]
        )
        mb = size / 1e6
        print(f"plain read (cat, page cache): {cat_s:.2f} s ({mb / cat_s:,.0f} MB/s)")
        print(
            f"typed streaming parse alone (pyarrow open_csv): {parse_s:.2f} s "
            f"({mb / parse_s:,.0f} MB/s), peak RSS {parse_kib / 1024:,.0f} MiB"
        )
        print(
            f"sequencecheck check: {check_s:.2f} s ({mb / check_s:,.0f} MB/s, "
            f"{rows / check_s / 1e6:.1f} M rows/s), peak RSS {check_kib / 1024:,.0f} MiB"
        )
        print(f"ratio check / parse alone: {check_s / parse_s:.2f}x")
        print(
            f"report: rows {summary['rows']:,}, edges {summary['edges']:,}, "
            f"violations {found}; planted faults found at the right instants: {ok}"
        )
        if not ok:
            sys.exit(f"unexpected report: expected {expected}, rows {rows}")
    finally:
        if not args.keep:
            path.unlink(missing_ok=True)
            report.unlink(missing_ok=True)


if __name__ == "__main__":
    main()

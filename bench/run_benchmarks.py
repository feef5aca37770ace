"""Speed and memory of reading and checking captures, measured side by side in one run.

    python bench/run_benchmarks.py            # CSV (1 M and 10 M rows), VCD (10 M changes), jobs
    python bench/run_benchmarks.py --big      # also a 100 M-row CSV (1.9 GB) for the memory bound
    python bench/run_benchmarks.py --only csv --repeat 5

Every figure is the median of ``--repeat`` fresh processes, the contenders taking
turns so that a busy machine slows all of them alike. Ratios are what the targets
are about: end-to-end ``sequencecheck check`` over a plain read of the same file.
Inputs are generated into bench/data/ (gitignored) on first use.
"""

from __future__ import annotations

import argparse
import compileall
import json
import os
import shutil
import statistics
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

from gen_data import DATA, make_csv, make_vcd  # noqa: E402

CHECK = ["--dead-time", "500ns", "--quiet", "--format", "json"]


def measure(mode: str, path: Path, *args: str) -> dict:
    out = subprocess.run(
        [sys.executable, str(HERE / "_measure.py"), mode, str(path), *args],
        capture_output=True,
        text=True,
        check=True,
    )
    return json.loads(out.stdout.strip().splitlines()[-1])


def side_by_side(runs: dict[str, tuple], repeat: int) -> dict[str, dict]:
    """Median seconds and peak MB per contender, taking turns ``repeat`` times."""
    got: dict[str, list[dict]] = {name: [] for name in runs}
    for _ in range(repeat):
        for name, call in runs.items():
            got[name].append(measure(*call))
    return {
        name: {
            "seconds": statistics.median(r["seconds"] for r in rs),
            "best": min(r["seconds"] for r in rs),
            "peak_mb": max(r["peak_mb"] for r in rs),
            "cpu": statistics.median(r["cpu_seconds"] for r in rs),
            **{k: v for k, v in rs[0].items() if k not in ("seconds", "peak_mb", "cpu_seconds")},
        }
        for name, rs in got.items()
    }


def show(title: str, res: dict[str, dict], base: str) -> None:
    print(f"\n{title}")
    for name, r in res.items():
        ratio = r["seconds"] / res[base]["seconds"]
        print(
            f"  {name:<34} {r['seconds']:7.3f} s (best {r['best']:.3f}, cpu {r['cpu']:.3f})  "
            f"peak {r['peak_mb']:5.0f} MB  {ratio:5.2f}x {base}"
        )


def bench_csv(repeat: int, big: bool) -> None:
    sizes = [1_000_000, 10_000_000] + ([100_000_000] if big else [])
    for rows in sizes:
        path = make_csv(rows)
        mb = path.stat().st_size / 1e6
        runs = {
            "sequencecheck check (end to end)": ("check", path, *CHECK),
            "pyarrow.csv.read_csv (typed)": ("pyarrow", path),
            "read_csv (our reader alone)": ("read-csv", path),
            "numpy.fromfile (raw bytes)": ("fromfile", path),
            "raw bytes, 1 MiB blocks": ("rawread", path),
        }
        if rows > 10_000_000:
            del runs["pyarrow.csv.read_csv (typed)"]  # not bounded: would need several GB
        res = side_by_side(runs, repeat)
        check = res["sequencecheck check (end to end)"]
        assert check["exit"] == 1, "the injected faults must be found"
        show(
            f"CSV, {rows:,} sampled rows, 4 channels, {mb:.0f} MB",
            res,
            "numpy.fromfile (raw bytes)",
        )
        if "pyarrow.csv.read_csv (typed)" in res:
            pa = res["pyarrow.csv.read_csv (typed)"]["seconds"]
            pa_cpu = res["pyarrow.csv.read_csv (typed)"]["cpu"]
            print(
                f"  ratio check / pyarrow read_csv: {check['seconds'] / pa:.2f} wall, "
                f"{check['cpu'] / pa_cpu:.2f} cpu (issue 2: <= 1.5, issue 8: <= 1.0, aim 0.5)"
            )
        raw = res["raw bytes, 1 MiB blocks"]["seconds"]
        print(f"  ratio check / raw bytes in 1 MiB blocks: {check['seconds'] / raw:.2f}")
        print(
            f"  rows/s end to end: {rows / check['seconds'] / 1e6:.1f} M; "
            f"peak memory of the check: {check['peak_mb']:.0f} MB (target < 500 MB)"
        )


def bench_vcd(repeat: int) -> None:
    path = make_vcd(10_000_000)
    runs = {
        "sequencecheck check (end to end)": ("check", path, *CHECK),
        "check --states (states decoded too)": ("check", path, *CHECK, "--states"),
        "read_vcd (our reader alone)": ("read-vcd", path),
        "read_vcd, plain Python path only": ("read-vcd-general", path),
        "pywellen parse only (Rust)": ("pywellen", path),
        "pywellen parse + numpy arrays": ("pywellen-arrays", path),
        "numpy.fromfile (raw bytes)": ("fromfile", path),
    }
    res = side_by_side(runs, repeat)
    assert res["sequencecheck check (end to end)"]["exit"] == 1
    mb = path.stat().st_size / 1e6
    show(
        f"VCD, 10,000,000 value changes, 6 signals, {mb:.0f} MB", res, "pywellen parse only (Rust)"
    )
    check = res["sequencecheck check (end to end)"]["seconds"]
    rules = measure("rules", path)
    slow = sorted(
        ((k, v) for k, v in rules.items() if k not in ("seconds", "peak_mb", "cpu_seconds")),
        key=lambda kv: -kv[1],
    )[:4]
    print(
        "  rules on this trace: "
        + ", ".join(f"{k} {v:.2f} s" for k, v in slow)
        + f" (all rules {rules['seconds']:.2f} s, peak {rules['peak_mb']:.0f} MB)"
    )
    check_cpu = res["sequencecheck check (end to end)"]["cpu"]
    for name in ("pywellen parse only (Rust)", "pywellen parse + numpy arrays"):
        print(
            f"  ratio check / {name}: {check / res[name]['seconds']:.2f} wall, "
            f"{check_cpu / res[name]['cpu']:.2f} cpu (target <= 1.5)"
        )


def bench_jobs(repeat: int) -> None:
    one = make_csv(1_000_000)
    folder = DATA / "night"
    folder.mkdir(exist_ok=True)
    files = []
    for i in range(16):
        p = folder / f"soak_{i:02d}.csv"
        if not p.exists():
            shutil.copyfile(one, p)
        files.append(str(p))
    times: dict[int, list[float]] = {1: [], 2: []}
    inner: dict[int, list[float]] = {1: [], 2: []}
    for _ in range(repeat):
        for jobs in (1, 2):
            t = time.perf_counter()
            r = subprocess.run(
                [
                    sys.executable,
                    "-m",
                    "sequencecheck",
                    "check",
                    *files,
                    *CHECK,
                    "--jobs",
                    str(jobs),
                ],
                capture_output=True,
                env=dict(os.environ, PYTHONPATH=str(HERE.parent)),
            )
            times[jobs].append(time.perf_counter() - t)
            assert r.returncode == 1, r.stderr
            got = measure("check-many", folder, str(jobs))
            assert got["exit"] == 1
            inner[jobs].append(got["seconds"])
    t1, t2 = statistics.median(times[1]), statistics.median(times[2])
    i1, i2 = statistics.median(inner[1]), statistics.median(inner[2])
    print("\nMany inputs: 16 files of 1,000,000 rows")
    print(f"  command:    --jobs 1: {t1:.3f} s   --jobs 2: {t2:.3f} s   speed-up {t1 / t2:.2f}x")
    print(f"  check_many: jobs=1: {i1:.3f} s   jobs=2: {i2:.3f} s   speed-up {i1 / i2:.2f}x")
    start = statistics.median(_startup() for _ in range(max(repeat, 3)))
    work = max(t1 - start, 0.0)
    print(
        f"  start-up alone (python -m sequencecheck --version): {start:.3f} s; no pool can share "
        f"it, so even a perfect 2x on the rest gives at most {t1 / (start + work / 2):.2f}x "
        "(target >= 1.6x)"
    )
    print(f"  calibration: a pure CPU loop in 2 processes runs {_calibrate():.2f}x as fast as in 1")


def _startup() -> float:
    """Seconds for the interpreter, numpy and sequencecheck to start and exit."""
    t = time.perf_counter()
    subprocess.run(
        [sys.executable, "-m", "sequencecheck", "--version"],
        capture_output=True,
        check=True,
        env=dict(os.environ, PYTHONPATH=str(HERE.parent)),
    )
    return time.perf_counter() - t


def _spin(n: int) -> int:
    total = 0
    for i in range(n):
        total += i
    return total


def _calibrate() -> float:
    """How much two processes gain over one on this machine right now (2.0 when idle)."""
    import multiprocessing as mp
    from concurrent.futures import ProcessPoolExecutor

    n = 2_000_000
    t = time.perf_counter()
    for _ in range(8):
        _spin(n)
    serial = time.perf_counter() - t
    with ProcessPoolExecutor(2, mp_context=mp.get_context("fork")) as pool:
        pool.submit(_spin, 1).result()
        t = time.perf_counter()
        list(pool.map(_spin, [n] * 8))
        parallel = time.perf_counter() - t
    return serial / parallel


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--only", choices=["csv", "vcd", "jobs"], action="append")
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--big", action="store_true", help="add a 100 M-row CSV (1.9 GB)")
    args = ap.parse_args()
    only = set(args.only or ["csv", "vcd", "jobs"])
    # byte-code compiled once, as an installed package has it (even where the
    # environment sets PYTHONDONTWRITEBYTECODE, Python reads what compileall wrote)
    compileall.compile_dir(str(HERE.parent / "sequencecheck"), quiet=1)
    print(
        f"machine: {os.cpu_count()} cores, load {os.getloadavg()[0]:.1f}; median of {args.repeat}"
    )
    if "csv" in only:
        bench_csv(args.repeat, args.big)
    if "vcd" in only:
        bench_vcd(args.repeat)
    if "jobs" in only:
        bench_jobs(args.repeat)


if __name__ == "__main__":
    main()

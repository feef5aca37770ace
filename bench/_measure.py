"""One measurement in a fresh process; prints JSON {"seconds": s, "peak_mb": m}.

    python bench/_measure.py MODE PATH [ARGS...]

MODE is ``check`` (the whole ``sequencecheck check`` command, imports included),
``read-csv``/``read-vcd`` (our reader alone), ``read-vcd-general``
(our VCD reader with its numpy fast path off: the plain Python line parser), ``pyarrow`` (``pyarrow.csv.read_csv``
with column types declared, the call alone), ``fromfile`` (the raw bytes with
numpy, as one array), ``rawread`` (the raw bytes in 1 MiB blocks into one buffer), ``pywellen`` (pywellen's Rust parse of every signal, no export) or
``pywellen-arrays`` (the same, then every signal's change times as numpy arrays).
"""

from __future__ import annotations

import time

T0 = time.perf_counter()

import io  # noqa: E402
import json  # noqa: E402
import resource  # noqa: E402
import sys  # noqa: E402
from pathlib import Path  # noqa: E402

ROOT = Path(__file__).resolve().parent.parent


def _peak_mb() -> float:
    """High-water mark of resident memory of this process (VmHWM; ru_maxrss as fallback).

    ru_maxrss survives exec on Linux, so a child started by a big parent would report
    the parent's size; VmHWM belongs to the new address space only.
    """
    try:
        for line in Path("/proc/self/status").read_text().splitlines():
            if line.startswith("VmHWM:"):
                return int(line.split()[1]) / 1024
    except OSError:
        pass
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def _cpu() -> float:
    r = resource.getrusage(resource.RUSAGE_SELF)
    return r.ru_utime + r.ru_stime


def main() -> None:
    mode, path, *rest = sys.argv[1:]
    cpu0 = 0.0  # the check counts the whole process, imports included
    sys.path.insert(0, str(ROOT))
    from sequencecheck._heap import keep_freed_memory

    keep_freed_memory()  # every contender gets the allocator setting the command line uses
    if mode == "check":
        from sequencecheck.cli import run

        out, sys.stdout = sys.stdout, io.StringIO()
        status = run(["check", path, *rest])
        sys.stdout = out
        start = T0
        extra = {"exit": status}
    else:
        extra = {}
        if mode == "pyarrow":
            import pyarrow as pa
            import pyarrow.csv as pacsv

            with open(path) as f:
                header = f.readline().strip().split(",")
            types = {n: pa.int8() for n in header}
            types[header[0]] = pa.float64()
            start, cpu0 = time.perf_counter(), _cpu()
            table = pacsv.read_csv(path, convert_options=pacsv.ConvertOptions(column_types=types))
            extra["rows"] = table.num_rows
        elif mode == "check-many":  # PATH is a folder; rest: jobs
            import glob

            import sequencecheck as sc
            from sequencecheck.batch import check_many

            files = sorted(glob.glob(str(Path(path) / "*.csv")))
            policy = sc.Policy(dead_time=sc.DeadTime.both(500_000))
            start, cpu0 = time.perf_counter(), _cpu()
            report = check_many(files, None, policy, jobs=int(rest[0]))
            extra["exit"] = report.exit_status()
        elif mode == "rules":  # where the time of a check goes, rule by rule
            import sequencecheck as sc
            from sequencecheck.legs import guess_legs
            from sequencecheck.readers import read
            from sequencecheck.rules import RULES
            from sequencecheck.rules._base import CheckContext

            trace = read(path)
            ctx = CheckContext(
                trace,
                sc.Bridge(guess_legs(trace.channels)),
                sc.Policy(dead_time=sc.DeadTime.both(500_000), state_summary=False),
            )  # the policy `check` uses without --states
            start, cpu0 = time.perf_counter(), _cpu()
            for rule in RULES:
                t = time.perf_counter()
                rule.check(ctx)
                extra[rule.id] = time.perf_counter() - t
        elif mode == "rawread":
            start, cpu0 = time.perf_counter(), _cpu()
            block = bytearray(1 << 20)
            n = 0
            with open(path, "rb", buffering=0) as f:
                while got := f.readinto(block):
                    n += got
            extra["bytes"] = n
        elif mode == "fromfile":
            import numpy as np

            start, cpu0 = time.perf_counter(), _cpu()
            extra["bytes"] = int(np.fromfile(path, dtype=np.uint8).size)
        elif mode in ("read-csv", "read-vcd", "read-vcd-general"):
            from sequencecheck.readers import read
            from sequencecheck.readers._vcd_body import VcdBody

            VcdBody.fast_path = mode != "read-vcd-general"

            start, cpu0 = time.perf_counter(), _cpu()
            extra["edges"] = read(path).edge_count
        elif mode in ("pywellen", "pywellen-arrays"):
            import numpy as np
            import pywellen

            start, cpu0 = time.perf_counter(), _cpu()
            wave = pywellen.Waveform(path)
            n = 0
            for var in wave.all_vars():
                sig = var.signal  # loading a signal parses the body (lazily, on first access)
                if mode == "pywellen-arrays":
                    pairs = sig[0 : len(sig)]
                    t = np.fromiter((p[0] for p in pairs), dtype=np.int64, count=len(pairs))
                    v = np.fromiter((p[1] for p in pairs), dtype=object, count=len(pairs))
                    n += t.size + 0 * v.size
                else:
                    n += len(sig)
            extra["changes"] = n
        else:
            raise SystemExit(f"unknown mode {mode}")
    seconds = time.perf_counter() - start
    extra["cpu_seconds"] = _cpu() - cpu0
    peak = _peak_mb()
    print(json.dumps({"seconds": seconds, "peak_mb": peak, **extra}))


if __name__ == "__main__":
    main()

"""Parse and check a generated 100,000-line table; print lines per second.

Usage: python bench/bench_table.py [LINES]

The table is the cart drive's forward PWM written out longhand, one step per
line at absolute times (every time text is different, so nothing is cached),
with a comment every 10 periods. Target: under 3 s for 100,000 lines here.
"""

from __future__ import annotations

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

BRIDGE = """\
leg A high AH low AL
leg B high BH low BL
dead-time 500ns
"""


def write_table(folder: str, lines: int, *, relative: bool = False) -> str:
    """A table of ``lines`` lines: 4 steps per 50 us PWM period.

    Absolute times make every line different; relative times (``+750ns``) repeat
    the same four lines, as a longhand PWM table does.
    """
    Path(folder, "bench.bridge").write_text(BRIDGE)
    out = ['include "bench.bridge"', "0 AH=off AL=on BH=off BL=on"]
    period_ns, k = 50_000, 0
    pattern = ((0, "AL=off"), (750, "AH=on"), (30_000, "AH=off"), (30_750, "AL=on"))
    while len(out) < lines:
        if k % 10 == 0:
            out.append(f"# period {k}")
        previous = 0 if k == 0 else -19_250
        for offset, setting in pattern:
            if relative:
                out.append(
                    f"+{offset - previous + (1_000 if k == 0 and offset == 0 else 0)}ns {setting}"
                )
                previous = offset
            else:
                out.append(f"{k * period_ns + offset + 1_000}ns {setting}")
        k += 1
    name = "bench_relative.steps" if relative else "bench.steps"
    path = os.path.join(folder, name)
    Path(path).write_text("\n".join(out[:lines]) + "\n")
    return path


def _lark_only(path: str) -> float:
    """CPU seconds lark alone takes for the table's non-comment lines (the floor)."""
    from sequencecheck.language._loader import _parser

    parse = _parser().parse
    lines = [ln for ln in Path(path).read_text().splitlines() if ln.strip()[:1] not in ("", "#")]
    c0 = time.process_time()
    for line in lines:
        parse(line)
    return time.process_time() - c0


def main() -> None:
    lines = int(sys.argv[1]) if len(sys.argv) > 1 else 100_000
    import sequencecheck as sc
    from sequencecheck.language import read_table

    print(
        f"load average at start: {os.getloadavg()[0]:.1f} (2 cores; other work inflates wall time)"
    )
    print("table                      step      wall s   lines/s (wall)    CPU s   lines/s (CPU)")
    with tempfile.TemporaryDirectory() as folder:
        for relative in (False, True):
            path = write_table(folder, lines, relative=relative)
            c0, w0 = time.process_time(), time.perf_counter()
            trace = read_table(path)  # the first read also builds the parser (about 30 ms)
            c1, w1 = time.process_time(), time.perf_counter()
            report = sc.check_file(path)  # read again, then check: the whole job
            c2, w2 = time.process_time(), time.perf_counter()
            lark_cpu = _lark_only(path)
            w3 = time.perf_counter()
            cli = subprocess.run(
                [sys.executable, "-m", "sequencecheck", "check", path],
                capture_output=True,
                env=dict(os.environ, PYTHONPATH=str(ROOT)),
                check=False,
            )
            w4 = time.perf_counter()
            name = "relative times" if relative else "absolute times"
            for what, wall, cpu in (
                ("parse", w1 - w0, c1 - c0),
                ("parse+check", w2 - w1, c2 - c1),
                ("lark alone", None, lark_cpu),
                ("CLI process", w4 - w3, None),
            ):
                wall_s = "-" if wall is None else f"{wall:.2f}"
                wall_r = "-" if wall is None else f"{lines / wall:,.0f}"
                cpu_s = "-" if cpu is None else f"{cpu:.2f}"
                cpu_r = "-" if cpu is None else f"{lines / cpu:,.0f}"
                print(f"{name:<26} {what:<12} {wall_s:>6} {wall_r:>16} {cpu_s:>8} {cpu_r:>15}")
            assert cli.returncode == 0, cli.stderr
            print(
                f"{'':<26} {trace.edge_count:,} edges, {len(report.findings)} findings, "
                f"CLI exit status {cli.returncode}"
            )
    print("target: parse and check 100,000 lines in under 3 s")


if __name__ == "__main__":
    main()

"""Parse and check a generated 100,000-line table; print lines per second.

Usage: python bench/bench_table.py [LINES]

The table is the cart drive's forward PWM written out longhand, one step per
line at absolute times (every time text is different, so nothing is cached),
with a comment every 10 periods. Target: under 3 s for 100,000 lines here.
"""

from __future__ import annotations

import os
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


def write_table(folder: str, lines: int) -> str:
    """A table of ``lines`` lines: 4 steps per 50 us PWM period, absolute times."""
    Path(folder, "bench.bridge").write_text(BRIDGE)
    out = ['include "bench.bridge"', "0 AH=off AL=on BH=off BL=on"]
    period_ns, k = 50_000, 0
    pattern = ((0, "AL=off"), (750, "AH=on"), (30_000, "AH=off"), (30_750, "AL=on"))
    while len(out) < lines:
        if k % 10 == 0:
            out.append(f"# period {k}")
        for offset, setting in pattern:
            out.append(f"{k * period_ns + offset + 1_000}ns {setting}")
        k += 1
    path = os.path.join(folder, "bench.steps")
    Path(path).write_text("\n".join(out[:lines]) + "\n")
    return path


def main() -> None:
    lines = int(sys.argv[1]) if len(sys.argv) > 1 else 100_000
    import sequencecheck as sc
    from sequencecheck.language import read_table

    with tempfile.TemporaryDirectory() as folder:
        path = write_table(folder, lines)
        c0, w0 = time.process_time(), time.perf_counter()
        trace = read_table(path)  # first read also builds the parser (about 30 ms)
        c1, w1 = time.process_time(), time.perf_counter()
        report = sc.check_file(path)
        c2, w2 = time.process_time(), time.perf_counter()
    print(f"table: {lines:,} lines, {trace.edge_count:,} edges, {len(report.findings)} findings")
    print("                   wall s   lines/s (wall)    CPU s   lines/s (CPU)")
    for what, wall, cpu in (
        ("parse", w1 - w0, c1 - c0),
        ("parse and check", w2 - w1, c2 - c1),
    ):
        print(f"{what:<17} {wall:7.2f} {lines / wall:>12,.0f} {cpu:9.2f} {lines / cpu:>13,.0f}")
    print("target: parse and check under 3 s. Wall time counts other work on the machine;")
    print(f"CPU time does not. Load average now: {os.getloadavg()[0]:.1f}")


if __name__ == "__main__":
    main()

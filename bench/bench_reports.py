"""Render time of each report format for a report of 10,000 findings (target: < 2 s each).

Run from the repository root: ``python bench/bench_reports.py [N]``. Prints, per
format, the best of three runs and the output size, measured side by side in one run.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from sequencecheck.findings import (
    Certainty,
    DirectionStats,
    Finding,
    InputReport,
    LegStats,
    Report,
    WorstMargin,
)
from sequencecheck.model import Source
from sequencecheck.reporters import REPORTERS

TARGET_S = 2.0
PATH = "bench/pump_inverter_capture.csv"  # invented: a pump inverter's bench capture


def make_report(n: int) -> Report:
    """One input with ``n`` findings spread over three legs and both conduction rules."""
    legs = ("U", "V", "W")
    findings = []
    for k in range(n):
        leg = legs[k % 3]
        t = 50_000_000 * k + 1_000_000
        if k % 4 == 0:
            findings.append(
                Finding(
                    rule="shoot-through",
                    leg=leg,
                    channels=(f"{leg}H", f"{leg}L"),
                    start_ps=t,
                    end_ps=t + 40_000,
                    measured_ps=40_000,
                    required_ps=0,
                    input=PATH,
                    message=f"leg {leg}: {leg}H and {leg}L both on for 40 ns",
                    bounds_ps=(30_000, 50_000),
                    sources=(Source(PATH, 2 * k + 2), Source(PATH, 2 * k + 3)),
                    margin_ps=-40_000,
                )
            )
        else:
            findings.append(
                Finding(
                    rule="dead-time",
                    leg=leg,
                    channels=(f"{leg}H", f"{leg}L"),
                    start_ps=t,
                    end_ps=t + 212_000,
                    measured_ps=212_000,
                    required_ps=250_000,
                    input=PATH,
                    message=f"leg {leg}: {leg}L on 212 ns after {leg}H off; needs 250 ns",
                    certainty=Certainty.PROVEN if k % 7 else Certainty.INCONCLUSIVE,
                    bounds_ps=(202_000, 222_000),
                    sources=(Source(PATH, 2 * k + 2), Source(PATH, 2 * k + 3)),
                    detail={"direction": "high-to-low"},
                )
            )
    stats = tuple(
        LegStats(leg, DirectionStats(n, 212_000, 1_212_000), DirectionStats(n, 250_000, 2_000))
        for leg in legs
    )
    margins = tuple(
        WorstMargin("dead-time", leg, -38_000, 1_212_000, 212_000, 250_000) for leg in legs
    )
    r = InputReport(
        input=PATH,
        kind="csv-sampled",
        rows=20_000_000,
        edges=4 * n,
        end_ps=50_000_000 * n + 2_000_000,
        sample_period_ps=10_000,
        channels=tuple(f"{leg}{s}" for leg in legs for s in "HL"),
        legs=legs,
        findings=tuple(findings),
        leg_stats=stats,
        margins=margins,
    )
    return Report((r,), {"dead_time_ps": 250_000})


def main() -> None:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 10_000
    t0 = time.perf_counter()
    report = make_report(n)
    print(
        f"built a report of {len(report.findings):,} findings in {time.perf_counter() - t0:.3f} s"
    )
    print(f"{'format':<8} {'best of 3 (s)':>14} {'size (MB)':>10}  target < {TARGET_S} s")
    for name in ("text", "json", "junit", "sarif", "html"):
        times = []
        for _ in range(3):
            t0 = time.perf_counter()
            out = REPORTERS[name](report)
            times.append(time.perf_counter() - t0)
        size = len(out.encode("utf-8")) / 1e6
        verdict = "ok" if min(times) < TARGET_S else "SLOW"
        print(f"{name:<8} {min(times):>14.3f} {size:>10.2f}  {verdict}")


if __name__ == "__main__":
    main()

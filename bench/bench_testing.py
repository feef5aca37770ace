"""Cost of checking one recorded trace inside a property test.

    python bench/bench_testing.py [--edges 10000] [--runs 200]

Records a clean H-bridge trace of about ``--edges`` edges (complementary PWM on
leg A with a dead time, leg B's low side on) through a Recorder, then times:
recording it (Recorder.set calls and trace()), and checking it with
assert_safe (every registered rule, report, verdict). Prints the medians, the
check's share of the 5 ms budget and the projected cost of 1,000 examples.
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from sequencecheck.model import Bridge, DeadTime, Leg, Policy
from sequencecheck.rules import rule_ids
from sequencecheck.testing import Recorder, assert_safe

BRIDGE = Bridge((Leg("A", "AH", "AL"), Leg("B", "BH", "BL")))
POLICY = Policy(dead_time=DeadTime.both(200_000))
BUDGET_S = 0.005


def record(edges: int) -> Recorder:
    """A pump-like PWM: 20 kHz, 200 ns dead time, duty sweeping; 4 edges per period."""
    rec = Recorder(BRIDGE.channels, initial={"AL": 1, "BL": 1})
    period, dead = 50_000_000, 200_000
    for p in range(edges // 4):
        start = p * period
        on = period // 10 + (p % 80) * period // 100
        rec.set(start, AL=0)
        rec.set(start + dead, AH=1)
        rec.set(start + on, AH=0)
        rec.set(start + on + dead, AL=1)
    rec.step(period)
    return rec


def median_time(fn, runs: int) -> float:
    fn()  # warm up
    times = []
    for _ in range(runs):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--edges", type=int, default=10_000)
    ap.add_argument("--runs", type=int, default=200)
    args = ap.parse_args()

    trace = record(args.edges).trace()
    assert_safe(trace, BRIDGE, POLICY)  # clean by construction
    t_record = median_time(lambda: record(args.edges).trace(), max(args.runs // 10, 5))
    t_check = median_time(lambda: assert_safe(trace, BRIDGE, POLICY), args.runs)

    print(f"rules: {', '.join(rule_ids())}")
    print(f"trace: {trace.edge_count:,} edges, {len(trace.channels)} channels")
    print(f"check (assert_safe), median of {args.runs}: {t_check * 1e3:.3f} ms")
    print(f"  share of the {BUDGET_S * 1e3:.0f} ms budget: {t_check / BUDGET_S:.2f}")
    print(f"record (Recorder.set x {trace.rows:,} + trace()), median: {t_record * 1e3:.3f} ms")
    print(f"  record / check: {t_record / t_check:.1f}")
    print(f"1,000 examples: check {t_check * 1e3:.2f} s, record {t_record * 1e3:.2f} s")


if __name__ == "__main__":
    main()

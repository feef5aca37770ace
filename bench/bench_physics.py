"""Cost of the physical-timing checks beside the commanded ones, measured side by side.

An invented pump inverter: three legs of 20 kHz complementary PWM with 500 ns dead
time, N periods each. Prints seconds per run (best of R) and the ratio of each
configuration to the commanded-only check, on the same in-memory trace.

    python bench/bench_physics.py [periods] [repeats]
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from sequencecheck import Bridge, DeadTime, Leg, Policy, check_trace
from sequencecheck.model import BootstrapSupply, Channel, SwitchTiming, Trace
from sequencecheck.physics.bootstrap import BootstrapLimits

NS = 1_000


def pwm(periods: int, phase_ns: int) -> tuple[Channel, Channel, int]:
    period, on, dead = 50_000 * NS, 27_000 * NS, 500 * NS
    k = np.arange(periods, dtype=np.int64) * period + phase_ns * NS + period
    hs_times = np.stack([k, k + on]).T.ravel()
    ls_times = np.stack([k + on + dead, k + period - dead]).T.ravel()
    levels = np.tile(np.array([1, 0], dtype=np.int8), periods)
    end = int(k[-1] + 2 * period)
    return Channel("H", 0, hs_times, levels), Channel("L", 0, ls_times, levels), end


def main() -> None:
    periods = int(sys.argv[1]) if len(sys.argv) > 1 else 100_000
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    channels, legs, end = {}, [], 0
    for n, name in enumerate("UVW"):
        h, lo, e = pwm(periods, n * 16_000)
        channels[f"{name}H"] = Channel(f"{name}H", 0, h.times, h.levels)
        channels[f"{name}L"] = Channel(f"{name}L", 0, lo.times, lo.levels)
        legs.append(Leg(name, f"{name}H", f"{name}L"))
        end = max(end, e)
    trace = Trace(channels, 0, end)
    timing = SwitchTiming(100 * NS, 130 * NS, 11 * NS, 0, 39 * NS, 35 * NS)
    supply = BootstrapSupply(1e-6, 54e-9, 115e-6, 12.0, 0.85, 4.45, 10.0)
    policy = Policy(dead_time=DeadTime.both(400 * NS))
    configs = {
        "commanded only": (Bridge(tuple(legs)), policy),
        "+ effective (switch timing)": (
            Bridge(tuple(legs), timing={ch: timing for ch in channels}),
            policy,
        ),
        "+ effective + require-margin": (
            Bridge(tuple(legs), timing={ch: timing for ch in channels}),
            Policy(dead_time=DeadTime.both(400 * NS), require_margin_ps=10 * NS),
        ),
        "+ bootstrap-refresh": (
            Bridge(tuple(legs), bootstrap={leg.name: supply for leg in legs}),
            Policy(dead_time=DeadTime.both(400 * NS), bootstrap=BootstrapLimits(True)),
        ),
    }
    print(f"{trace.edge_count:,} edges, 3 legs, best of {repeats}")
    base = None
    for name, (bridge, pol) in configs.items():
        best = min(_time(trace, bridge, pol) for _ in range(repeats))
        base = base or best
        print(f"  {name:<32} {best:8.3f} s   x{best / base:5.2f}")


def _time(trace: Trace, bridge: Bridge, policy: Policy) -> float:
    t = time.perf_counter()
    report = check_trace(trace, bridge, policy)
    elapsed = time.perf_counter() - t
    assert not report.violations, report.violations[:3]
    return elapsed


if __name__ == "__main__":
    main()

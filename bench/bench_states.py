"""Speed of the bridge-state rules, measured side by side in one run.

Builds an invented pump-inverter capture (three legs, centre-aligned sinusoidal PWM at
20 kHz, 500 ns dead time) and prints:

- the vectorised state decoder against a plain Python walk over the same edges;
- a full check (all rules) against the conduction rules alone, so the cost the
  mode, pulse and unknown-state rules add is visible.

Run: ``python bench/bench_states.py [periods]`` (default 20000 periods, ~720k edges).
"""

from __future__ import annotations

import math
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from sequencecheck.model import Bridge, Channel, Leg, Policy, Trace
from sequencecheck.rules import RULES, run
from sequencecheck.rules._states import decode

PERIOD, DEAD = 50_000_000, 500_000
BRIDGE = Bridge(tuple(Leg(n, n + "H", n + "L") for n in "UVW"))


def capture(periods: int) -> Trace:
    k = np.arange(periods)
    chans = {}
    for j, leg in enumerate(BRIDGE.legs):
        duty = 0.5 + 0.4 * np.sin(2 * math.pi * k / 400 - 2 * math.pi * j / 3)
        high = np.round(duty * PERIOD / 1000).astype(np.int64) * 1000
        rise = k * PERIOD + (PERIOD - high) // 2
        fall = rise + high
        hi_t = np.stack([rise + DEAD, fall], axis=1).ravel()
        lo_t = np.stack([rise, fall + DEAD], axis=1).ravel()
        lv = np.tile(np.array([1, 0], dtype=np.int8), periods)
        chans[leg.high] = Channel.from_changes(leg.high, 0, hi_t, lv)
        chans[leg.low] = Channel.from_changes(leg.low, 1, lo_t, 1 - lv)
    return Trace(chans, 0, periods * PERIOD)


def python_walk(trace: Trace) -> int:
    """Plain Python: merge every edge in time order, track leg codes, count state changes."""
    events = sorted(
        (int(t), name, int(v))
        for name, ch in trace.channels.items()
        for t, v in zip(ch.times.tolist(), ch.levels.tolist(), strict=True)
    )
    level = {name: ch.initial for name, ch in trace.channels.items()}
    last, changes = None, 0
    for _, name, v in events:
        level[name] = v
        state = tuple(level[leg.high] + 2 * level[leg.low] for leg in BRIDGE.legs)
        if state != last:
            changes += 1
            last = state
    return changes


def best(fn, repeat: int = 3) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def main() -> None:
    periods = int(sys.argv[1]) if len(sys.argv) > 1 else 20_000
    trace = capture(periods)
    print(f"capture: {periods:,} periods, {trace.edge_count:,} edges")
    t_vec = best(lambda: decode(trace, BRIDGE))
    t_py = best(lambda: python_walk(trace), repeat=1)
    print(f"decode (numpy)        {t_vec:8.3f} s")
    print(f"plain Python walk     {t_py:8.3f} s   ratio {t_py / t_vec:6.1f}x slower")
    policy = Policy(min_pulse_ps=1_000_000)
    core = tuple(r for r in RULES if r.family == "conduction")
    t_core = best(lambda: run(trace, BRIDGE, policy, rules=core))
    t_all = best(lambda: run(trace, BRIDGE, policy))
    print(f"conduction rules only {t_core:8.3f} s")
    print(f"all rules             {t_all:8.3f} s   ratio {t_all / t_core:6.2f}x")


if __name__ == "__main__":
    main()

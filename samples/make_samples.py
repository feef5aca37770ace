"""Make the demo captures in samples/ (invented scenario: a small cart's drive on the bench).

The cart's H-bridge has legs A (AH, AL) and B (BH, BL), active high. Leg A runs
20 kHz complementary PWM at 60 % duty with 750 ns dead time; leg B holds its low
side on (sign-magnitude drive forward). Sampled at 20 MS/s (50 ns) for 4 ms.

The faulty capture breaks it twice on leg A: in PWM period 23 the low side turns
on only 150 ns after the high side turns off (dead time), and in period 61 the
high side turns on 100 ns before the low side turns off (shoot-through).

Run ``python samples/make_samples.py`` to regenerate every file.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
TS_NS = 50
PERIOD_NS = 50_000
DUTY = 0.6
DEAD_NS = 750
SPAN_NS = 4_000_000


def leg_a(faulty: bool) -> tuple[list[tuple[int, int]], list[tuple[int, int]]]:
    """(on, off) intervals in ns for AH and AL."""
    high, low = [], []
    for k in range(SPAN_NS // PERIOD_NS):
        t0 = k * PERIOD_NS
        h_on, h_off = t0 + DEAD_NS, t0 + int(DUTY * PERIOD_NS)
        l_on, l_off = h_off + DEAD_NS, t0 + PERIOD_NS
        if faulty and k == 23:
            l_on = h_off + 150
        if faulty and k == 61:
            # the previous period's low side is late to turn off: overlaps AH's turn-on
            low[-1] = (low[-1][0], h_on + 100)
        high.append((h_on, h_off))
        low.append((l_on, l_off))
    return high, low


def sampled(intervals: list[tuple[int, int]], n: int) -> np.ndarray:
    out = np.zeros(n, dtype=np.int8)
    for on, off in intervals:
        out[-(-on // TS_NS) : -(-off // TS_NS)] = 1  # first sample at or after each edge
    return out


def write(faulty: bool) -> None:
    n = SPAN_NS // TS_NS
    high, low = leg_a(faulty)
    cols = {
        "AH": sampled(high, n),
        "AL": sampled(low, n),
        "BH": np.zeros(n, dtype=np.int8),
        "BL": np.ones(n, dtype=np.int8),
    }
    t = np.arange(n, dtype=np.int64) * TS_NS
    name = "cart_faulty" if faulty else "cart_clean"
    data = np.column_stack([t, *cols.values()])
    header = "time_ns," + ",".join(cols)
    np.savetxt(HERE / f"{name}.csv", data, fmt="%d", delimiter=",", header=header, comments="")
    # the same capture, one row per change (as an analyzer's "changes only" export)
    keep = np.ones(n, dtype=bool)
    keep[1:] = (np.diff(np.column_stack(list(cols.values())), axis=0) != 0).any(axis=1)
    keep[-1] = True
    np.savetxt(
        HERE / f"{name}_changes.csv",
        data[keep],
        fmt="%d",
        delimiter=",",
        header=header,
        comments="",
    )


if __name__ == "__main__":
    write(faulty=False)
    write(faulty=True)
    print("wrote", ", ".join(sorted(p.name for p in HERE.glob("cart_*.csv"))))

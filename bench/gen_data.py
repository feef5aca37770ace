"""Generate benchmark inputs into bench/data/ (gitignored); files are reused when present.

Invented scenario: a pool pump's three-phase inverter on the bench. Each leg runs
20 kHz complementary PWM with 500 ns dead time and a slowly swinging duty cycle.
Leg A has one 30 ns shoot-through and leg B one 100 ns dead time, so every
benchmark run must find exactly two violations.

    python bench/gen_data.py csv 10000000      # sampled 4-channel CSV, 100 MS/s
    python bench/gen_data.py vcd 10000000      # VCD with that many value changes
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np

DATA = Path(__file__).resolve().parent / "data"
PERIOD_NS = 50_000
DEAD_NS = 500
STEP_NS = 10  # CSV sample step (100 MS/s)


def _duty(k: np.ndarray) -> np.ndarray:
    return 0.5 + 0.35 * np.sin(2 * np.pi * k / 400.0)


def leg_edges(
    n_periods: int, phase: float
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Turn-on/turn-off times (ns) of one leg's high and low side, per PWM period."""
    k = np.arange(n_periods)
    t0 = k * PERIOD_NS
    d = 0.5 + 0.35 * np.sin(2 * np.pi * k / 400.0 + phase)
    h_on = t0 + DEAD_NS
    h_off = t0 + (d * PERIOD_NS).astype(np.int64) // STEP_NS * STEP_NS
    l_on = h_off + DEAD_NS
    l_off = t0 + PERIOD_NS
    return h_on, h_off, l_on, l_off


def _faults(n_periods: int, legs: list) -> None:
    """Leg A: 30 ns shoot-through; leg B: 100 ns dead time (in place)."""
    a = n_periods // 3
    legs[0][3][a - 1] = legs[0][0][a] + 30  # low side late to turn off
    b = 2 * n_periods // 3
    legs[1][2][b] = legs[1][1][b] + 100  # low side early to turn on


def make_csv(rows: int, path: Path | None = None) -> Path:
    """Sampled capture ``time,A_H,A_L,B_H,B_L``; time in seconds with 8 decimals."""
    path = path or DATA / f"pump_{rows}.csv"
    if path.exists():
        return path
    path.parent.mkdir(parents=True, exist_ok=True)
    n_periods = rows * STEP_NS // PERIOD_NS + 1
    legs = [list(leg_edges(n_periods, ph)) for ph in (0.0, 2.0)]
    _faults(n_periods, legs)
    tmp = path.with_suffix(".tmp")
    block = 2_000_000
    with open(tmp, "wb") as f:
        f.write(b"time,A_H,A_L,B_H,B_L\n")
        for lo in range(0, rows, block):
            i = np.arange(lo, min(rows, lo + block), dtype=np.int64)
            t = i * STEP_NS  # ns
            k = t // PERIOD_NS
            cols = []
            for h_on, h_off, l_on, l_off in legs:
                kk = np.minimum(k, h_on.size - 1)
                prev = np.maximum(kk - 1, 0)
                hs = (t >= h_on[kk]) & (t < h_off[kk])
                ls = ((t >= l_on[kk]) & (t < l_off[kk])) | ((kk > 0) & (t < l_off[prev]))
                cols += [hs, ls]
            m = np.empty((i.size, 19), dtype=np.uint8)
            units = t // 10  # 10 ns units = the 8th decimal of a second
            m[:, 0] = 48 + (units // 10**8) % 10
            m[:, 1] = ord(".")
            for j in range(8):
                m[:, 2 + j] = 48 + (units // 10 ** (7 - j)) % 10
            for c, col in enumerate(cols):
                m[:, 10 + 2 * c] = ord(",")
                m[:, 11 + 2 * c] = 48 + col
            m[:, 18] = 10
            m.tofile(f)
    tmp.rename(path)
    return path


def make_vcd(changes: int, path: Path | None = None) -> Path:
    """Six 1-bit gate signals of legs A, B, C at 1 ns; about ``changes`` value changes."""
    path = path or DATA / f"pump_{changes}.vcd"
    if path.exists():
        return path
    path.parent.mkdir(parents=True, exist_ok=True)
    n_periods = changes // 12 + 1
    legs = [list(leg_edges(n_periods, ph)) for ph in (0.0, 2.0, 4.0)]
    _faults(n_periods, legs)
    ids = '!"#$%&'
    names = ["A_H", "A_L", "B_H", "B_L", "C_H", "C_L"]
    times, codes, values = [], [], []
    for li, (h_on, h_off, l_on, l_off) in enumerate(legs):
        for side, (on, off) in enumerate(((h_on, h_off), (l_on, l_off))):
            c = 2 * li + side
            times += [on, off]
            codes += [np.full(on.size, c), np.full(off.size, c)]
            values += [np.ones(on.size, np.int8), np.zeros(off.size, np.int8)]
    t = np.concatenate(times)
    c = np.concatenate(codes)
    v = np.concatenate(values)
    order = np.lexsort((c, t))
    t, c, v = t[order], c[order], v[order]
    tmp = path.with_suffix(".tmp")
    with open(tmp, "w") as f:
        f.write("$date today $end\n$version pump inverter bench generator $end\n")
        f.write("$timescale 1ns $end\n$scope module top $end\n$scope module pump $end\n")
        for code, name in zip(ids, names, strict=True):
            f.write(f"$var wire 1 {code} {name} $end\n")
        f.write("$upscope $end\n$upscope $end\n$enddefinitions $end\n")
        f.write("#0\n$dumpvars\n" + "".join(f"0{code}\n" for code in ids) + "$end\n")
        new_time = np.ones(t.size, dtype=bool)
        new_time[1:] = t[1:] != t[:-1]
        block = 1_000_000
        for lo in range(0, t.size, block):
            parts = []
            for tt, nt, cc, vv in zip(
                t[lo : lo + block].tolist(),
                new_time[lo : lo + block].tolist(),
                c[lo : lo + block].tolist(),
                v[lo : lo + block].tolist(),
                strict=True,
            ):
                if nt:
                    parts.append(f"#{tt}\n")
                parts.append(f"{vv}{ids[cc]}\n")
            f.write("".join(parts))
        f.write(f"#{int(t[-1]) + PERIOD_NS}\n")
    tmp.rename(path)
    return path


if __name__ == "__main__":
    kind, count = sys.argv[1], int(sys.argv[2])
    print({"csv": make_csv, "vcd": make_vcd}[kind](count))

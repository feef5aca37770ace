"""Make samples/pump_inverter.vcd: an invented pool-pump inverter's gate commands as a VCD.

The simulated PWM block of the pump's three-phase inverter drives legs U, V and W
(top.pump.gates.U_H/U_L, ...) at 20 kHz with 600 ns dead time for 2 ms, timescale
1 ns. Gate outputs are x until the block leaves reset at 200 ns (the unknown-state
rule reports those 200 ns); a 2-bit vector
``state`` shows the block's run state. In PWM period 17, leg V's low side turns
on only 80 ns after its high side turns off: one dead-time violation at 500 ns.

Run ``python samples/make_vcd_sample.py`` to regenerate the file.
"""

from __future__ import annotations

import math
from pathlib import Path

HERE = Path(__file__).resolve().parent
PERIOD_NS = 50_000
DEAD_NS = 600
SPAN_NS = 2_000_000
LEGS = {"U": ("!", '"', 0.0), "V": ("#", "$", 2.094), "W": ("%", "&", 4.189)}


def edges() -> list[tuple[int, str, int]]:
    """(time ns, identifier, level) of every gate change after reset."""
    out = []
    for k in range(SPAN_NS // PERIOD_NS):
        t0 = k * PERIOD_NS + 200
        for leg, (hi, lo, phase) in LEGS.items():
            duty = 0.5 + 0.4 * math.sin(2 * math.pi * k / 40 + phase)
            h_on = t0 + DEAD_NS
            h_off = t0 + int(duty * PERIOD_NS)
            l_on = h_off + (80 if leg == "V" and k == 17 else DEAD_NS)
            l_off = t0 + PERIOD_NS
            out += [(t0, lo, 0), (h_on, hi, 1), (h_off, hi, 0), (l_on, lo, 1)]
            if k == 0:
                out.append((t0, hi, 0))  # leaving reset: both sides off
            if k == SPAN_NS // PERIOD_NS - 1:
                out.append((l_off, lo, 0))
    return sorted(out)


def main() -> None:
    lines = [
        "$date invented bench run $end",
        "$version pool pump inverter, PWM block simulation $end",
        "$timescale 1 ns $end",
        "$scope module top $end",
        "$scope module pump $end",
        "$var wire 2 ' state [1:0] $end",
        "$scope module gates $end",
    ]
    for leg, (hi, lo, _) in LEGS.items():
        lines += [f"$var wire 1 {hi} {leg}_H $end", f"$var wire 1 {lo} {leg}_L $end"]
    lines += ["$upscope $end", "$upscope $end", "$upscope $end", "$enddefinitions $end"]
    lines += ["#0", "$dumpvars", "b00 '", *(f"x{c}" for h, lo, _ in LEGS.values() for c in (h, lo))]
    lines += ["$end", "#200", "b1 '"]
    now = 200
    for t, code, level in edges():
        if t != now:
            lines.append(f"#{t}")
            now = t
        lines.append(f"{level}{code}")
    lines += [f"#{now + 1000}", "b10 '", f"#{now + 2000}"]
    (HERE / "pump_inverter.vcd").write_text("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()

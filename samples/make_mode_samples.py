"""Make the mode demo capture in samples/ (invented scenario: the small cart's drive reversing).

The cart's H-bridge has legs A (AH, AL) and B (BH, BL), active high, and is driven
sign-magnitude at 20 kHz, 60 % duty, with 750 ns dead time. It drives forward for
2 ms (leg A switching, B's low side on), brakes on both low sides for only 200 us,
then drives in reverse for 2 ms (leg B switching, A's low side on). With a 1 ms
reversal dwell required, the reversal is too quick.

Run ``python samples/make_mode_samples.py`` to regenerate the file.
"""

from __future__ import annotations

from pathlib import Path

HERE = Path(__file__).resolve().parent
PERIOD_NS, HIGH_NS, DEAD_NS = 50_000, 30_000, 750
DRIVE_NS, BRAKE_NS = 2_000_000, 200_000


def rows() -> list[tuple[int, int, int, int, int]]:
    """(time_ns, AH, AL, BH, BL) at every change."""
    out = [(0, 0, 0, 0, 1)]
    state = {"AH": 0, "AL": 0, "BH": 0, "BL": 1}

    def at(t: int, **levels: int) -> None:
        state.update(levels)
        out.append((t, state["AH"], state["AL"], state["BH"], state["BL"]))

    # forward: leg A complementary PWM, BL on
    for k in range(DRIVE_NS // PERIOD_NS):
        t0 = k * PERIOD_NS
        if k:
            at(t0, AL=0)
        at(t0 + DEAD_NS, AH=1)
        at(t0 + HIGH_NS, AH=0)
        at(t0 + HIGH_NS + DEAD_NS, AL=1)
    # brake low: AL and BL on (AL is already on after the last period)
    start = DRIVE_NS + BRAKE_NS
    # reverse: leg B complementary PWM, AL on
    for k in range(DRIVE_NS // PERIOD_NS):
        t0 = start + k * PERIOD_NS
        at(t0, BL=0)
        at(t0 + DEAD_NS, BH=1)
        at(t0 + HIGH_NS, BH=0)
        at(t0 + HIGH_NS + DEAD_NS, BL=1)
    out.append((start + DRIVE_NS, *out[-1][1:]))
    return out


def main() -> None:
    lines = ["time_ns,AH,AL,BH,BL"] + [",".join(map(str, r)) for r in rows()]
    (HERE / "cart_reversal_changes.csv").write_text("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()

"""Let hypothesis find and shrink the saturation fault; print what it reports.

python -m samples.pump_controller.show_counterexample
"""

from __future__ import annotations

from hypothesis import Phase, given, settings

from sequencecheck.testing import assert_safe, command_sequences, pwm_settings

from .harness import pump_policy, record_drive
from .pump_drive import PUMP_BRIDGE
from .pump_drive_faulty import SaturatingPumpDrive


@settings(
    max_examples=500,
    derandomize=True,
    database=None,
    deadline=None,
    phases=[Phase.generate, Phase.shrink],
)
@given(
    pwm=pwm_settings(switch="mosfet"),
    commands=command_sequences(bridge=PUMP_BRIDGE, max_duration_ps=1_000_000_000),
)
def test_pump_drive_is_safe(pwm, commands):
    assert_safe(record_drive(SaturatingPumpDrive, pwm, commands), PUMP_BRIDGE, pump_policy(pwm))


def main() -> int:
    try:
        test_pump_drive_is_safe()
    except AssertionError as e:
        print("\n".join(getattr(e, "__notes__", [])))
        print()
        print(f"{type(e).__name__}: {e}")
        return 1
    print("no counterexample found")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())

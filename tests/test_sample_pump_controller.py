"""The worked sample: property tests pass on the pump drive and find its faulty variants."""

from __future__ import annotations

import re
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, Phase, find, given, settings

from samples.pump_controller import show_counterexample
from samples.pump_controller.harness import REVERSAL_DWELL_PS, pump_policy, record_drive
from samples.pump_controller.pump_drive import PUMP_BRIDGE, PumpDrive
from samples.pump_controller.pump_drive_faulty import BrakeResetPumpDrive, SaturatingPumpDrive
from sequencecheck.rules import rule_ids, run
from sequencecheck.testing import (
    Command,
    DriveMode,
    PwmSettings,
    SafetyAssertionError,
    assert_safe,
    command_sequences,
    pwm_settings,
)

PROPERTY = settings(
    max_examples=100, deadline=None, database=None, suppress_health_check=[HealthCheck.too_slow]
)
SEARCH = settings(
    max_examples=1_000,
    deadline=None,
    database=None,
    derandomize=True,
    phases=[Phase.generate, Phase.shrink],
)
COMMANDS = command_sequences(bridge=PUMP_BRIDGE, max_duration_ps=1_000_000_000)


def _unsafe(drive, pwm, commands, **policy) -> bool:
    try:
        assert_safe(record_drive(drive, pwm, commands), PUMP_BRIDGE, pump_policy(pwm, **policy))
    except SafetyAssertionError:
        return True
    return False


def test_drive_inserts_the_dead_time_it_is_given():
    pwm = PwmSettings(10_000_000, Fraction(0), 100_000)
    trace = record_drive(PumpDrive, pwm, [Command("forward", 30_000_000, Fraction(1, 2))])
    ah, al, bh, bl = (trace.channel(ch) for ch in ("AH", "AL", "BH", "BL"))
    assert ah.times.tolist() == [0, 5_000_000, 10_100_000, 15_000_000, 20_100_000, 25_000_000]
    assert al.times.tolist() == [5_100_000, 10_000_000, 15_100_000, 20_000_000, 25_100_000]
    assert bh.edge_count == 0 and bl.times.tolist() == [0] and bl.levels.tolist() == [1]
    stats = assert_safe(trace, PUMP_BRIDGE, pump_policy(pwm)).leg_stats[0]
    assert stats.high_to_low.min_gap_ps == stats.low_to_high.min_gap_ps == 100_000


def test_emergency_stop_cuts_a_period_short():
    pwm = PwmSettings(10_000_000, Fraction(0), 100_000)
    commands = [Command("forward", 2_000_000, Fraction(1, 2)), Command("stop", 5_000_000)]
    trace = record_drive(PumpDrive, pwm, commands)
    assert trace.channel("AH").times.tolist() == [0, 2_000_000]
    assert trace.channel("BL").times.tolist() == [0, 2_000_000]
    assert trace.end_ps == 7_000_000


@PROPERTY
@given(pwm=pwm_settings(switch="mosfet"), commands=COMMANDS)
def test_pump_drive_is_safe_with_mosfets(pwm, commands):
    assert_safe(record_drive(PumpDrive, pwm, commands), PUMP_BRIDGE, pump_policy(pwm))


@PROPERTY
@given(pwm=pwm_settings(switch="igbt"), commands=COMMANDS)
def test_pump_drive_is_safe_with_igbts(pwm, commands):
    assert_safe(record_drive(PumpDrive, pwm, commands), PUMP_BRIDGE, pump_policy(pwm))


def test_saturation_fault_is_found_and_shrunk():
    with pytest.raises(SafetyAssertionError) as info:
        show_counterexample.test_pump_drive_is_safe()
    notes = "\n".join(info.value.__notes__)
    # hypothesis' wording changed between versions ("Falsifying example" / "Failing test case")
    assert re.match(r"(Falsifying example|Failing test case): test_pump_drive_is_safe\(", notes)
    (finding,) = info.value.report.violations
    assert finding.rule == "dead-time" and finding.measured_ps == 0
    # shrunk to the essence: the low side on, then a saturating duty
    pwm, commands = find(
        pwm_settings(switch="mosfet").flatmap(lambda p: COMMANDS.map(lambda c: (p, c))),
        lambda pc: _unsafe(SaturatingPumpDrive, *pc),
        settings=SEARCH,
    )
    # shrunk to a few commands (exact shrinks vary with hypothesis' version and the modules
    # loaded): the low side conducts first (brake or drive), then a saturating forward duty
    assert 2 <= len(commands) <= 4, commands
    first, last = commands[0], commands[-1]
    assert first.mode in (DriveMode.BRAKE, DriveMode.FORWARD) and last.mode is DriveMode.FORWARD
    on = pwm.period_ps * last.duty.numerator // last.duty.denominator
    assert pwm.period_ps - on < 2 * pwm.dead_time_ps  # the duty saturates
    assert not _unsafe(PumpDrive, pwm, commands)  # the correct drive handles the same input


@pytest.mark.skipif(
    "mode-transition" not in rule_ids(),
    reason="needs the mode-transition rule (reversal dwell), which is not registered in rules.RULES",
)
def test_reversal_dwell_fault_is_found():
    pwm = PwmSettings(50_000_000, Fraction(0), 200_000)
    period = pwm.period_ps
    reversal = [
        Command("forward", 4 * period, Fraction(1, 2)),
        Command("brake", period),
        Command("reverse", 4 * period + REVERSAL_DWELL_PS, Fraction(1, 2)),
    ]
    assert not _unsafe(PumpDrive, pwm, reversal, reversal_dwell=True)
    assert _unsafe(BrakeResetPumpDrive, pwm, reversal, reversal_dwell=True)
    found = find(
        COMMANDS,
        lambda c: _unsafe(BrakeResetPumpDrive, pwm, c, reversal_dwell=True),
        settings=SEARCH,
    )
    # a drive one way, a brake, then a drive the other way (in either direction)
    modes = [c.mode for c in found]
    assert any(
        a.drives and b is DriveMode.BRAKE and c.drives and c is not a
        for i, a in enumerate(modes)
        for j, b in enumerate(modes[i + 1 :], i + 1)
        for c in modes[j + 1 :]
    ), found
    result = run(
        record_drive(BrakeResetPumpDrive, pwm, found),
        PUMP_BRIDGE,
        pump_policy(pwm, reversal_dwell=True),
    )
    assert {f.rule for f in result.violations} == {"mode-transition"}
    assert not _unsafe(PumpDrive, pwm, found, reversal_dwell=True)

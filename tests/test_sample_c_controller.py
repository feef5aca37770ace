"""The pump's gate logic in C, compiled during the test and driven by the same strategies."""

from __future__ import annotations

import subprocess
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, Phase, find, given, settings

from samples.pump_controller.c_drive import CPumpDrive, build, find_compiler
from samples.pump_controller.harness import pump_policy
from samples.pump_controller.pump_drive import PUMP_BRIDGE
from sequencecheck.testing import (
    Command,
    DriveMode,
    PwmSettings,
    SafetyAssertionError,
    assert_safe,
    command_sequences,
    pwm_settings,
)

COMMANDS = command_sequences(bridge=PUMP_BRIDGE, max_duration_ps=500_000_000)
PWM = pwm_settings(switch="mosfet") | pwm_settings(switch="igbt")


@pytest.fixture(scope="module")
def libraries(tmp_path_factory: pytest.TempPathFactory):
    if find_compiler() is None:
        pytest.skip("no C compiler found ($CC, cc, gcc or clang): the C example is not run")
    out = tmp_path_factory.mktemp("gate_tick")
    try:
        return build(out), build(out, full_duty_bypass=True)
    except subprocess.CalledProcessError as e:
        pytest.fail(f"gate_tick.c did not compile:\n{e.stderr}")


def _unsafe(library, pwm, commands) -> bool:
    try:
        assert_safe(CPumpDrive(library, pwm).record(commands), PUMP_BRIDGE, pump_policy(pwm))
    except SafetyAssertionError:
        return True
    return False


def test_c_drive_inserts_the_dead_time(libraries):
    pwm = PwmSettings(10_000_000, Fraction(0), 100_000)
    trace = CPumpDrive(libraries[0], pwm).record([Command("forward", 30_000_000, Fraction(1, 2))])
    assert trace.channel("AH").times.tolist() == [
        0,
        5_000_000,
        10_100_000,
        15_000_000,
        20_100_000,
        25_000_000,
    ]
    assert trace.channel("AL").times.tolist() == [
        5_100_000,
        10_000_000,
        15_100_000,
        20_000_000,
        25_100_000,
    ]
    assert trace.channel("BL").times.tolist() == [0]


@settings(
    max_examples=60, deadline=None, database=None, suppress_health_check=[HealthCheck.too_slow]
)
@given(pwm=PWM, commands=COMMANDS)
def test_c_drive_is_safe(libraries, pwm, commands):
    assert_safe(CPumpDrive(libraries[0], pwm).record(commands), PUMP_BRIDGE, pump_policy(pwm))


def test_c_full_duty_bypass_is_found_and_shrunk(libraries):
    pwm, commands = find(
        PWM.flatmap(lambda p: COMMANDS.map(lambda c: (p, c))),
        lambda pc: _unsafe(libraries[1], *pc),
        settings=settings(
            max_examples=1_000,
            deadline=None,
            database=None,
            derandomize=True,
            phases=[Phase.generate, Phase.shrink],
        ),
    )
    assert len(commands) == 2, commands
    assert commands[-1].mode is DriveMode.FORWARD and commands[-1].duty == 1
    assert not _unsafe(libraries[0], pwm, commands)  # the correct build handles the same input


def test_no_compiler_is_reported_not_crashed(tmp_path, monkeypatch):
    monkeypatch.setenv("PATH", str(tmp_path))
    monkeypatch.delenv("CC", raising=False)
    assert find_compiler() is None
    with pytest.raises(FileNotFoundError, match="no C compiler found"):
        build(tmp_path)

"""The dead-time formula, T_D' and the dead-time voltage error against worked examples."""

import json
from decimal import Decimal

import pytest
from cli_inprocess import run_here
from conftest import run_cli

from sequencecheck.errors import UsageError
from sequencecheck.physics import (
    SwitchDelays,
    dead_time_error_voltage,
    minimum_dead_time,
    parse_quantity,
    real_dead_time,
)

NS, US = 1_000, 1_000_000


def test_mosfet_leg_with_and_without_fall():
    # facts.md section 1, worked example [derived] on the S2 formula [memory, S2]:
    # td(off)=39 ns, tf=35 ns, td(on)=11 ns, driver skew 30 ns, x1.2 -> 111.6 ns / 69.6 ns
    budget = minimum_dead_time(SwitchDelays(39 * NS, 35 * NS, 11 * NS, 130 * NS, 100 * NS), "1.2")
    assert budget.minimum_ps == 111_600
    assert budget.without_fall_ps == 69_600
    assert budget.switch_term_ps == 63 * NS and budget.driver_term_ps == 30 * NS


def test_igbt_leg():
    # facts.md section 1, worked example [derived]: td(off)max 0.8 us, td(on)min 0.1 us,
    # driver spread 0.4 us, x1.2 -> 1.32 us
    budget = minimum_dead_time(SwitchDelays(800 * NS, 0, 100 * NS, 500 * NS, 100 * NS), "1.2")
    assert budget.minimum_ps == 1_320 * NS


def test_real_dead_time_at_the_devices():
    # facts.md section 1, S1 Eq. 28 [published]: T_D=2.0, t1=0.3, t2=0.2, t3=0.5, t4=0.9 us -> 1.1 us
    assert real_dead_time(2 * US, 300 * NS, 200 * NS, 500 * NS, 900 * NS) == 1_100 * NS
    # facts.md section 1 [derived]: command gap 80 ns; on path 100+11; off path 130+39+35 -> -13 ns
    assert real_dead_time(80 * NS, 100 * NS, 11 * NS, 130 * NS, 74 * NS) == -13 * NS


@pytest.mark.parametrize(
    ("bus", "td_ps", "fsw", "expected"),
    [
        (300.0, 2 * US, 10e3, 6.0),  # facts.md section 2 [derived] on dV = Vdc td fsw [memory, S11]
        (48.0, 500 * NS, 20e3, 0.48),  # facts.md section 2 [derived]
        (24.0, 200 * NS, 50e3, 0.24),  # facts.md section 2 [derived]
    ],
)
def test_dead_time_error_voltage(bus, td_ps, fsw, expected):
    assert dead_time_error_voltage(bus, td_ps, fsw) == pytest.approx(expected, rel=1e-12)


def test_rounding_is_upward_and_exact():
    budget = minimum_dead_time(SwitchDelays(1, 0, 0, 0, 0), Decimal("1.5"))
    assert budget.minimum_ps == 2  # 1.5 ps rounds up: a longer dead time is the safe side
    assert minimum_dead_time(SwitchDelays(0, 0, 50, 0, 0)).minimum_ps == 0


def test_parameter_checks():
    with pytest.raises(ValueError):
        SwitchDelays(1, 1, 1, 10, 20)
    with pytest.raises(ValueError):
        SwitchDelays(-1, 1, 1, 10, 20)
    with pytest.raises(ValueError):
        minimum_dead_time(SwitchDelays(1, 1, 1, 1, 1), "0.9")


def test_parse_quantity():
    assert parse_quantity("100nF", "F") == pytest.approx(100e-9)
    assert parse_quantity("115 uA", "A") == pytest.approx(115e-6)
    assert parse_quantity("20kHz", "Hz") == 20e3
    assert parse_quantity("10ohm", "ohm") == 10.0
    assert parse_quantity("0.85", "V") == 0.85
    for bad in ("10ns", "-1V", "abc", "5 mA"):
        with pytest.raises(UsageError):
            parse_quantity(bad, "V", what="--supply")


ARGS = (
    "deadtime", "--turn-off-delay-max", "39ns", "--fall-max", "35ns",
    "--turn-on-delay-min", "11ns", "--driver-delay-max", "130ns", "--driver-delay-min", "100ns",
)  # fmt: skip


def test_cli_prints_formula_terms_and_caution():
    r = run_cli(
        *ARGS, "--commanded", "80ns", "--bus-voltage", "48V", "--switching-frequency", "20kHz"
    )
    assert r.returncode == 0, r.stderr
    # facts.md section 1 worked examples [derived]: 111.6 ns, 69.6 ns, -13 ns
    assert "= 111.600 ns" in r.stdout
    assert "without the fall time: 69.600 ns" in r.stdout
    assert "= -13 ns at the devices (shoot-through: the switches overlap by 13 ns)" in r.stdout
    assert "63 ns" in r.stdout and "30 ns" in r.stdout
    assert "datasheet review" in r.stdout and "injure and burn" in r.stdout


def test_cli_json_voltage_error():
    r = run_here(
        "deadtime", "--turn-off-delay-max", "0.8us", "--fall-max", "0",
        "--turn-on-delay-min", "0.1us", "--driver-delay-max", "0.5us",
        "--driver-delay-min", "0.1us", "--commanded", "2us", "--bus-voltage", "300V",
        "--switching-frequency", "10kHz", "--format", "json",
    )  # fmt: skip
    assert r.returncode == 0, r.stderr
    doc = json.loads(r.stdout)
    assert doc["minimum_dead_time_ps"] == 1_320_000  # facts.md section 1 [derived]: 1.32 us
    assert doc["error_voltage_v"] == pytest.approx(6.0)  # facts.md section 2 [derived]: 6.0 V
    assert "caution" in doc


@pytest.mark.parametrize(
    "change",
    [
        ("--fall-max", "-5ns"),  # negative
        ("--fall-max", "35V"),  # not a time
        ("--driver-delay-min", "200ns"),  # min above max
        ("--safety-factor", "0.5"),
        ("--bus-voltage", "48V"),  # without a frequency
    ],
)
def test_cli_bad_input_exits_2_with_one_line(change):
    args = list(ARGS)
    if change[0] in args:
        args[args.index(change[0]) + 1] = change[1]
    else:
        args += change
    r = run_here(*args)
    assert r.returncode == 2
    assert r.stderr.count("\n") == 1 and "Traceback" not in r.stderr


def test_cli_missing_parameter_exits_2():
    r = run_here(*ARGS[:-2])
    assert r.returncode == 2
    assert "--driver-delay-min" in r.stderr and r.stderr.count("\n") == 1

"""Bootstrap supply figures, the bootstrap-refresh rule and the bootstrap command."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from cli_inprocess import run_here
from conftest import run_cli
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from sequencecheck import Bridge, Leg, Policy, check_trace
from sequencecheck.model import BootstrapSupply, Channel, Trace
from sequencecheck.physics.bootstrap import (
    BootstrapLimits,
    allowed_droop,
    longest_on_time_s,
    minimum_capacitance,
    refresh_time_s,
    switch_drop_v,
    total_charge,
    vgs_after,
)

US, MS = 1_000_000, 1_000_000_000
LEG = Leg("A", "AH", "AL")
# a small cart drive's high side (invented), using the S13 [published] figures
SUPPLY = BootstrapSupply(100e-9, 54e-9, 115e-6, 12.0, 0.85, 4.45, 10.0)


def test_charge_budget_published_example():
    # facts.md section 3, S13 [published]: 12 V, 0.85 V diode, 4.45 V UVLO -> 6.7 V allowed;
    # 54 nC + 115 uA / 20 kHz = 59.8 nC; 1 V ripple -> 59.8 nF (figures rounded there)
    assert allowed_droop(SUPPLY) == pytest.approx(6.7)
    q = total_charge(54e-9, 115e-6, 20e3)
    assert q == pytest.approx(59.75e-9) and round(q * 1e9, 1) == 59.8
    assert round(minimum_capacitance(q, 1.0) * 1e9, 1) == 59.8


def test_longest_on_time_derived_examples():
    # facts.md section 3 [derived]: 100 nF, 1 V, 54 nC, 115 uA -> 0.40 ms; 6.7 V -> 5.36 ms
    assert longest_on_time_s(100e-9, 1.0, 54e-9, 115e-6) == pytest.approx(0.40e-3, abs=0.005e-3)
    assert longest_on_time_s(100e-9, 6.7, 54e-9, 115e-6) == pytest.approx(5.36e-3, abs=0.005e-3)
    assert longest_on_time_s(10e-9, 1.0, 54e-9, 115e-6) == 0.0  # gate charge alone too much
    assert math.isinf(longest_on_time_s(100e-9, 1.0, 54e-9, 0.0))


def test_refresh_rc_law_derived_example():
    # facts.md section 3 [derived, RC law]: 10 ohm, 100 nF, 1 V droop to within 10 mV -> 4.61 us
    assert refresh_time_s(10, 100e-9, 1.0, 0.01) == pytest.approx(4.61e-6, abs=0.005e-6)
    # 3 tau -> 95 %: the droop left is e^-3 of it
    assert refresh_time_s(10, 100e-9, 1.0, math.exp(-3)) == pytest.approx(3e-6)
    assert refresh_time_s(10, 100e-9, 0.005, 0.01) == 0.0


def test_charging_switch_drop_published_example():
    # facts.md section 3, S14 [published]: 30 nC, 5 us, 125 ohm -> 0.75 V
    assert switch_drop_v(30e-9, 5e-6, 125) == pytest.approx(0.75)


def test_vgs_after_an_on_interval():
    # at the longest on-time the gate sits exactly at the minimum (facts.md section 3 [derived])
    t = longest_on_time_s(100e-9, 6.7, 54e-9, 115e-6)
    assert vgs_after(SUPPLY, t) == pytest.approx(4.45)


# --- the rule ---


def _trace(high, low, end):
    def channel(name, spans):
        times = [t for s, e in spans for t in (s, e)]
        initial = 0
        if times and times[0] == 0:  # on when the window opens: no edge there
            times, initial = times[1:], 1
        levels = [1, 0] * len(spans)
        return Channel.from_changes(
            name, initial, np.array(times, dtype=np.int64), np.array(levels[-len(times) :])
        )

    return Trace({"AH": channel("AH", high), "AL": channel("AL", low)}, 0, end)


def _findings(high, low, end, supply=SUPPLY, charged=False):
    report = check_trace(
        _trace(high, low, end),
        Bridge((LEG,), bootstrap={"A": supply}),
        Policy(bootstrap=BootstrapLimits(start_charged=charged)),
    )
    return [f for f in report.findings if f.rule == "bootstrap-refresh"], report


def test_first_turn_on_needs_a_pre_charge_pulse():
    found, _ = _findings([(10 * US, 30 * US)], [], 50 * US)
    [f] = found
    assert f.detail["check"] == "refresh" and f.measured_ps == 0
    assert "pre-charge" in f.message and "first turn-on" in f.message
    # from empty (11.15 V droop) to the droop this 20 us pulse allows (RC law, facts.md section 3)
    target = 6.7 - (54e-9 + 115e-6 * 20e-6) / 100e-9
    assert f.required_ps == math.ceil(1e-6 * math.log(11.15 / target) * 1e12)
    # a pre-charge pulse that long clears it; a shorter one does not
    ok, _ = _findings([(10 * US, 30 * US)], [(0, 9 * US)], 50 * US)
    assert ok == []
    short_pulse = f.required_ps - 1_000
    short, _ = _findings([(10 * US, 30 * US)], [(8 * US, 8 * US + short_pulse)], 50 * US)
    assert short and short[0].measured_ps == short_pulse and short[0].margin_ps < 0


def test_high_side_on_too_long_even_when_full():
    found, report = _findings([(1 * US, 6 * MS)], [], 7 * MS, charged=True)
    [f] = found
    assert f.detail["check"] == "on-time"
    assert f.required_ps == math.floor(longest_on_time_s(100e-9, 6.7, 54e-9, 115e-6) * 1e12)
    assert f.margin_ps == f.required_ps - f.measured_ps < 0
    assert any(m.rule == "bootstrap-refresh" and m.margin_ps < 0 for m in report.margins)


def test_interval_on_when_the_capture_opens_is_judged_by_length_only():
    # its past is unknown: a full capacitor is assumed, so only an over-long one is flagged
    assert _findings([(0, 1 * MS)], [], 2 * MS)[0] == []
    [f] = _findings([(0, 6 * MS)], [], 7 * MS)[0]
    assert f.detail["check"] == "on-time"


def test_long_coast_after_the_refresh_drains_the_capacitor():
    # refresh at the start, then a 30 ms coast: 115 uA x 30 ms / 100 nF = 34.5 V > budget
    found, _ = _findings([(31 * MS, 31 * MS + 10 * US)], [(0, 1 * MS)], 40 * MS)
    [f] = found
    assert f.detail["check"] == "coast" and f.measured_ps == 30 * MS
    assert f.required_ps < f.measured_ps


def test_clean_pwm_reports_a_positive_margin():
    period, on = 50 * US, 20 * US
    high = [(k * period + 5 * US, k * period + 5 * US + on) for k in range(20)]
    low = [(k * period + 27 * US, k * period + 53 * US) for k in range(-1, 19)]
    low[0] = (0, 3 * US)
    found, report = _findings(high, low, 20 * period)
    assert found == []
    [m] = [m for m in report.margins if m.rule == "bootstrap-refresh"]
    assert m.margin_ps > 0 and m.measured_ps == on


def test_unworkable_supply_is_an_input_error():
    from sequencecheck import InputError

    with pytest.raises(InputError, match="leg A: capacitance"):
        _findings([(10 * US, 30 * US)], [], 50 * US, BootstrapSupply(0, 54e-9, 0, 12, 0.85, 4.45))


# --- a step-by-step simulation of the capacitor as the independent reference ---


def _simulate_min_vgs(supply, high, low, end_ps, step_ps):
    """Lowest gate voltage seen during each high-side interval, stepping the capacitor
    equation dV/dt = (V_full - V) / RC (low side on) or -I / C (otherwise)."""
    full = supply.supply_v - supply.diode_drop_v
    tau = supply.resistance_ohm * supply.capacitance_f
    v, lows = 0.0, []
    on_h = np.zeros(end_ps // step_ps + 1, dtype=bool)
    on_l = np.zeros_like(on_h)
    for s, e in high:
        on_h[s // step_ps : e // step_ps] = True
    for s, e in low:
        on_l[s // step_ps : e // step_ps] = True
    dt = step_ps * 1e-12
    current = None
    for k in range(on_h.size - 1):
        if on_h[k] and (k == 0 or not on_h[k - 1]):
            v -= supply.gate_charge_c / supply.capacitance_f
            current = v
        if on_l[k] and not on_h[k]:
            v += (full - v) * (1 - math.exp(-dt / tau))
        else:
            v -= supply.leakage_a * dt / supply.capacitance_f
        v = max(v, 0.0)
        if on_h[k]:
            current = min(current, v)
        if on_h[k] and not on_h[k + 1]:
            lows.append(current)
    return lows


@settings(max_examples=40, deadline=None)
@given(
    st.lists(
        st.tuples(st.integers(1, 40), st.integers(1, 80), st.integers(0, 30), st.integers(1, 30)),
        min_size=1,
        max_size=6,
    )
)
def test_rule_matches_a_step_by_step_simulation(pattern):
    # each tuple: coast, low-side pulse, coast, high-side pulse (in 1 us steps)
    supply = BootstrapSupply(100e-9, 54e-9, 3e-3, 12.0, 0.85, 4.45, 10.0)
    t, high, low = 0, [], []
    for c1, lp, c2, hp in pattern:
        t += c1 * US
        low.append((t, t + lp * 100_000))  # pulses in 0.1 us steps
        t += lp * 100_000 + c2 * US
        high.append((t, t + hp * US))
        t += hp * US
    end = t + US
    lows = _simulate_min_vgs(supply, high, low, end, 1_000)
    assume(all(abs(v - supply.min_vgs_v) > 0.05 for v in lows))  # clear of the step error
    found, _ = _findings(high, low, end, supply)
    flagged = {f.start_ps for f in found}
    assert flagged == {s for (s, _), v in zip(high, lows, strict=True) if v < supply.min_vgs_v}


# --- the bootstrap command ---

BOOT = (
    "bootstrap", "--cap", "100nF", "--gate-charge", "54nC", "--leakage", "115uA",
    "--supply", "12V", "--diode", "0.85V", "--min-vgs", "4.45V", "--resistance", "10ohm",
)  # fmt: skip


def test_cli_figures_and_caution():
    r = run_cli(*BOOT, "--switching-frequency", "20kHz", "--ripple", "1V")
    assert r.returncode == 0, r.stderr
    assert "dV = V_DD - V_F - V_min = 6.7 V" in r.stdout  # S13 [published]
    assert "59.75 nC" in r.stdout and "59.75 nF" in r.stdout  # S13 [published], 59.8 rounded
    assert "t_on,max = (C dV - Q_g) / I = 5.356" in r.stdout  # facts.md section 3 [derived]
    assert "below full enhancement" in r.stdout  # at the longest on-time the gate is at 4.45 V
    assert "datasheet review" in r.stdout and "injure and burn" in r.stdout


def test_cli_json_vgs_and_refresh():
    r = run_here(*BOOT, "--on-time", "0.4ms", "--format", "json")
    doc = json.loads(r.stdout)
    # 0.4 ms draws 54 nC + 46 nC = 100 nC = 1 V from 100 nF (facts.md section 3 [derived])
    assert doc["droop_end_v"] == pytest.approx(1.0)
    assert doc["vgs_end_v"] == pytest.approx(10.15)
    assert doc["refresh_s"] == pytest.approx(4.61e-6, abs=0.005e-6)  # RC law [derived]
    assert doc["warnings"] == [] and "caution" in doc


def test_cli_warns_above_the_usual_gate_maximum():
    args = list(BOOT)
    args[args.index("12V")] = "24V"
    r = run_here(*args, "--on-time", "1ms")
    assert "above the usual +/-20 V gate-source maximum" in r.stdout


@pytest.mark.parametrize(
    ("flag", "value"),
    [
        ("--cap", "-100nF"),  # negative
        ("--cap", "100ns"),  # a time, not a capacitance
        ("--supply", "12A"),  # wrong unit
        ("--min-vgs", "11.5V"),  # nothing left above the minimum
        ("--on-time", "5V"),  # not a time
    ],
)
def test_cli_bad_input_exits_2(flag, value):
    args = list(BOOT)
    if flag in args:
        args[args.index(flag) + 1] = value
    else:
        args += [flag, value]
    r = run_here(*args)
    assert r.returncode == 2 and r.stderr.count("\n") == 1 and "Traceback" not in r.stderr


def test_cli_missing_parameter_exits_2():
    r = run_here(*BOOT[:-4])
    assert r.returncode == 2 and "--min-vgs" in r.stderr


def test_check_flag_runs_the_rule(write_csv):
    path = write_csv("time_us,AH,AL\n0,0,0\n10,1,0\n30,0,0\n40,0,0\n")
    spec = "A:cap=100nF,gate-charge=54nC,leakage=115uA,supply=12V,diode=0.85V,min-vgs=4.45V,resistance=10ohm"
    r = run_here("check", path, "--leg", "A=AH,AL", "--bootstrap", spec)
    assert r.returncode == 1 and "pre-charge" in r.stdout and "injure and burn" in r.stdout
    r = run_here(
        "check", path, "--leg", "A=AH,AL", "--bootstrap", spec, "--bootstrap-start", "charged"
    )
    assert r.returncode == 0, r.stdout
    bad = run_here("check", path, "--leg", "A=AH,AL", "--bootstrap", spec.replace("cap=100nF,", ""))
    assert bad.returncode == 2 and "missing cap" in bad.stderr

"""Bridge language, descriptions: each statement parses into the model records it means."""

from __future__ import annotations

import pytest

from sequencecheck.language import load_bridge
from sequencecheck.model import (
    All,
    Any_,
    BootstrapSupply,
    Const,
    DeadTime,
    Not,
    Side,
    SwitchOn,
    SwitchTiming,
    TransitionRule,
)

LEGS = "leg A high AH low AL\nleg B high BH low BL\n"


@pytest.fixture
def load(tmp_path):
    def _load(text: str):
        path = tmp_path / "drive.bridge"
        path.write_text(text)
        return load_bridge(str(path))

    return _load


def test_legs_and_polarity(load):
    bridge, _ = load(LEGS + "active-low AL BL\n")
    assert [(leg.name, leg.high, leg.low) for leg in bridge.legs] == [
        ("A", "AH", "AL"),
        ("B", "BH", "BL"),
    ]
    assert bridge.active_low == {"AL", "BL"}
    assert bridge.on_level("AL") == 0 and bridge.on_level("AH") == 1


def test_dead_time_everywhere_per_leg_and_per_direction(load):
    _, policy = load(
        LEGS
        + "dead-time 500ns\ndead-time A 750ns\ndead-time B high-to-low 600ns low-to-high 800ns\n"
    )
    assert policy.dead_time == DeadTime(500_000, 500_000)
    assert policy.dead_time_for("A") == DeadTime(750_000, 750_000)
    assert policy.dead_time_for("B") == DeadTime(600_000, 800_000)


def test_one_direction_keeps_the_other(load):
    _, policy = load(LEGS + "dead-time 500ns\ndead-time A low-to-high 900ns\n")
    assert policy.dead_time_for("A") == DeadTime(500_000, 900_000)


def test_limits(load):
    _, policy = load(LEGS + "min-pulse 200ns\nmin-margin 50ns\nreversal-dwell 20us\n")
    assert (policy.min_pulse_ps, policy.require_margin_ps, policy.reversal_dwell_ps) == (
        200_000,
        50_000,
        20_000_000,
    )


def test_mode_expressions_become_records_with_precedence(load):
    bridge, _ = load(
        LEGS
        + "mode forward = A.high and B.low\n"
        + "mode coast = not (AH or AL or B.high or B.low)\n"
        + "mode odd = forward or true and not false\n"
    )
    modes = {m.name: m for m in bridge.modes}
    assert modes["forward"].expr == All((SwitchOn("A", Side.HIGH), SwitchOn("B", Side.LOW)))
    assert modes["coast"].expr == Not(
        Any_(
            (
                SwitchOn("A", Side.HIGH),
                SwitchOn("A", Side.LOW),
                SwitchOn("B", Side.HIGH),
                SwitchOn("B", Side.LOW),
            )
        )
    )
    # `and` binds tighter than `or`; a mode name stands for its expression
    assert modes["odd"].expr == Any_((modes["forward"].expr, All((Const(True), Not(Const(False))))))
    assert modes["forward"].source.line == 3 and modes["forward"].source.column == 6


def test_transition_policy(load):
    _, policy = load(
        LEGS
        + "mode forward = A.high and B.low\nmode reverse = B.high and A.low\nmode brake = A.low and B.low\n"
        + "scheme locked-anti-phase\nallow forward -> brake\nforbid forward -> reverse\n"
        + "allow * -> reverse after 5us\ndwell brake 10us\n"
    )
    tp = policy.transitions
    assert tp.scheme == "locked-anti-phase"
    assert [(r.from_state, r.to_state, r.allowed, r.min_dwell_ps) for r in tp.rules] == [
        ("forward", "brake", True, None),
        ("forward", "reverse", False, None),
        ("*", "reverse", True, 5_000_000),
    ]
    assert isinstance(tp.rules[0], TransitionRule) and tp.rules[0].source.line == 7
    assert dict(tp.min_dwell_in) == {"brake": 10_000_000}


def test_no_transition_statements_leave_the_default_policy(load):
    _, policy = load(LEGS + "mode brake = A.low and B.low\n")
    assert policy.transitions is None


def test_switch_timing_for_a_channel_and_a_leg(load):
    bridge, _ = load(
        LEGS
        + "timing A driver-delay 20ns to 45ns turn-on-delay 11ns rise 8ns turn-off-delay 39ns fall 35ns\n"
        + "timing BH driver-delay 30ns\n"
    )
    expect = SwitchTiming(20_000, 45_000, 11_000, 8_000, 39_000, 35_000)
    assert bridge.timing["AH"] == expect and bridge.timing["AL"] == expect
    assert bridge.timing["BH"] == SwitchTiming(30_000, 30_000)
    assert "BL" not in bridge.timing


def test_bootstrap_supply(load):
    bridge, _ = load(
        LEGS
        + "bootstrap A capacitance 100nF gate-charge 54nC leakage 115uA supply 12V "
        + "diode-drop 0.85V min-vgs 4.45V resistance 10ohm\n"
    )
    b = bridge.bootstrap["A"]
    assert isinstance(b, BootstrapSupply)
    assert b.capacitance_f == pytest.approx(100e-9)
    assert b.gate_charge_c == pytest.approx(54e-9)
    assert b.leakage_a == pytest.approx(115e-6)
    assert (b.supply_v, b.diode_drop_v, b.min_vgs_v, b.resistance_ohm) == (12.0, 0.85, 4.45, 10.0)


def test_include_chains_and_sources(tmp_path):
    (tmp_path / "legs.bridge").write_text(LEGS)
    (tmp_path / "drive.bridge").write_text('include "legs.bridge"\ndead-time 1us\n')
    bridge, policy = load_bridge(str(tmp_path / "drive.bridge"))
    assert len(bridge.legs) == 2 and policy.dead_time == DeadTime.both(1_000_000)
    assert bridge.source == str(tmp_path / "drive.bridge")


def test_sample_bridge_loads():
    from pathlib import Path

    bridge, policy = load_bridge(
        str(Path(__file__).resolve().parent.parent / "samples" / "cart.bridge")
    )
    assert [leg.name for leg in bridge.legs] == ["A", "B"]
    assert {m.name for m in bridge.modes} == {"coast", "forward", "reverse", "brake"}
    assert policy.dead_time_for("B") == DeadTime(500_000, 600_000)

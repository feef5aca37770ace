"""The mode options of ``check``: --min-pulse, --reversal-dwell, --pwm-scheme, --states."""

import json

from conftest import run_cli

# an invented cart drive: forward, then straight to reverse after a 500 ns dead time,
# with a 30 ns on-pulse and a 70 ns off-pulse of AL while reversing
PLUGGING = (
    "time_ns,AH,AL,BH,BL\n"
    "0,1,0,0,1\n"
    "20000,0,0,0,0\n"
    "20500,0,1,1,0\n"
    "20530,0,0,1,0\n"
    "20600,0,1,1,0\n"
    "40000,0,1,1,0\n"
)


def test_reversal_dwell_and_min_pulse_json_contract(write_csv):
    path = write_csv(PLUGGING)
    r = run_cli(
        "check", path, "--reversal-dwell", "1ms", "--min-pulse", "100ns", "--format", "json"
    )
    assert r.returncode == 1, r.stderr
    doc = json.loads(r.stdout)
    assert doc["summary"]["by_rule"] == {"mode-transition": 1, "min-pulse": 2}
    [rev] = [v for v in doc["violations"] if v["rule"] == "mode-transition"]
    # start = end of forward (20 us), end = start of reverse (20.5 us)
    assert (rev["start_ps"], rev["end_ps"], rev["measured_ps"]) == (20_000_000, 20_500_000, 500_000)
    assert (rev["from"], rev["to"]) == ("forward", "reverse")
    assert rev["start_s"] == 20e-6 and rev["required_s"] == 1e-3
    pulses = sorted(
        (v["start_ps"], v["end_ps"], v["measured_s"])
        for v in doc["violations"]
        if v["rule"] == "min-pulse"
    )
    assert pulses == [(20_500_000, 20_530_000, 30e-9), (20_530_000, 20_600_000, 70e-9)]
    settings = doc["summary"]["settings"]
    assert settings["min_pulse_ps"] == 100_000 and settings["reversal_dwell_ps"] == 10**9
    assert "states" not in doc["summary"]["inputs"][0]  # only with --states


def test_states_view_text_and_json(write_csv):
    path = write_csv(PLUGGING)
    r = run_cli("check", path, "--states")
    assert r.returncode == 0, r.stderr  # nothing required: measured, not judged
    assert "bridge states" in r.stdout and "from \\ to" in r.stdout
    r = run_cli("check", path, "--states", "--format", "json")
    view = json.loads(r.stdout)["summary"]["inputs"][0]["states"]
    rows = {s["state"]: s for s in view["states"]}
    # the 500 ns dead time is counted in forward; reverse is visited twice around the
    # 70 ns with BH alone on (AL's off-pulse is not a hand-over: AL comes back on)
    assert rows["forward"]["time_ps"] == 20_500_000
    assert rows["reverse"]["visits"] == 2
    assert view["matrix"][view["names"].index("forward")][view["names"].index("reverse")] == 1


def test_locked_anti_phase_scheme_flag(write_csv):
    # 4 periods of 50 us at 70 % duty, leg B the inverse of leg A, 500 ns dead time
    rows = ["time_ns,AH,AL,BH,BL"]
    for k in range(4):
        t = k * 50_000
        rows += [
            f"{t},0,0,0,0",
            f"{t + 500},1,0,0,1",
            f"{t + 35_000},0,0,0,0",
            f"{t + 35_500},0,1,1,0",
        ]
    rows.append("200000,0,1,1,0")
    path = write_csv("\n".join(rows) + "\n")
    r = run_cli("check", path, "--reversal-dwell", "1ms")
    assert r.returncode == 1  # judged as sign-magnitude, every period reverses
    r = run_cli("check", path, "--reversal-dwell", "1ms", "--pwm-scheme", "locked-anti-phase")
    assert r.returncode == 0, r.stdout


def test_bad_durations_exit_2_with_one_line(write_csv):
    path = write_csv(PLUGGING)
    for flag in ("--min-pulse", "--reversal-dwell", "--handover-max"):
        r = run_cli("check", path, flag, "5OOns")
        assert r.returncode == 2, flag
        assert r.stderr.count("\n") == 1 and flag in r.stderr and "Traceback" not in r.stderr


def test_demo_reversal_sample():
    from conftest import SAMPLES

    path = str(SAMPLES / "cart_reversal_changes.csv")
    r = run_cli(
        "check", path, "--dead-time", "500ns", "--reversal-dwell", "1ms", "--format", "json"
    )
    assert r.returncode == 1, r.stderr
    [v] = json.loads(r.stdout)["violations"]
    # forward's last high-side pulse ends at 1.95 ms + 30 us; reverse starts when BH turns
    # on, 750 ns after the 200 us brake ends at 2.2 ms (samples/make_mode_samples.py)
    assert (v["rule"], v["start_ps"], v["end_ps"]) == (
        "mode-transition",
        1_980_000_000,
        2_200_750_000,
    )
    r = run_cli("check", path, "--dead-time", "500ns", "--reversal-dwell", "200us")
    assert r.returncode == 0, r.stdout

"""Bridge language, tables: each construct parses into the edges it means."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from sequencecheck.language import read_table

BRIDGE = "leg A high AH low AL\nleg B high BH low BL\n"


def table(tmp_path: Path, steps: str, bridge: str = BRIDGE) -> str:
    (tmp_path / "drive.bridge").write_text(bridge)
    path = tmp_path / "t.steps"
    path.write_text('include "drive.bridge"\n' + steps)
    return str(path)


def edges(trace, name: str) -> tuple[int, list[tuple[int, int, int]]]:
    ch = trace.channel(name)
    return ch.initial, list(
        zip(ch.times.tolist(), ch.levels.tolist(), ch.lines.tolist(), strict=True)
    )


def test_absolute_times_and_initial_state(tmp_path):
    tr = read_table(table(tmp_path, "0 AH=off AL=on\n10us AL=off\n10.5us AH=on\n"))
    assert edges(tr, "AL") == (1, [(10_000_000, 0, 3)])
    assert edges(tr, "AH") == (0, [(10_500_000, 1, 4)])
    assert (tr.start_ps, tr.end_ps) == (0, 10_500_000)
    assert edges(tr, "BH") == (0, []) and edges(tr, "BL") == (0, [])  # never set: off


def test_relative_times_count_from_the_previous_step(tmp_path):
    tr = read_table(table(tmp_path, "5us AL=on\n+1us AL=off\n+250ns AH=on\n+0 AH=off\n"))
    assert tr.start_ps == 5_000_000
    assert edges(tr, "AL") == (1, [(6_000_000, 0, 3)])
    # a zero-length pulse at one instant: the later setting wins, no edge
    assert edges(tr, "AH") == (0, [])


def test_units_match_parse_duration(tmp_path):
    tr = read_table(
        table(tmp_path, "0 AH=off\n1.5e3ns AH=on\n+2 us AH=off\n+40ps AH=on\n1ms AH=off\n")
    )
    assert edges(tr, "AH")[1] == [
        (1_500_000, 1, 3),
        (3_500_000, 0, 4),
        (3_500_040, 1, 5),
        (1_000_000_000, 0, 6),
    ]


def test_pin_levels_and_switch_states_with_active_low(tmp_path):
    bridge = BRIDGE + "active-low AL\n"
    tr = read_table(table(tmp_path, "0 AL=off\n1us AL=on\n2us AL=1\n3us A.low=0\n", bridge))
    # AL is active low: off is level 1, on is level 0
    assert edges(tr, "AL") == (1, [(1_000_000, 0, 3), (2_000_000, 1, 4), (3_000_000, 0, 5)])


def test_mode_steps_turn_on_the_fewest_switches(tmp_path):
    modes = BRIDGE + "mode forward = A.high and B.low\nmode coast = not (AH or AL or BH or BL)\n"
    tr = read_table(
        table(tmp_path, "0 mode coast\n1us mode forward\n2us mode coast BL=on\n", modes)
    )
    assert edges(tr, "AH") == (0, [(1_000_000, 1, 3), (2_000_000, 0, 4)])
    assert edges(tr, "BL") == (0, [(1_000_000, 1, 3)])  # kept on by the setting after the mode
    assert edges(tr, "AL") == (0, []) and edges(tr, "BH") == (0, [])


def test_repeat_every_tiles_the_pass(tmp_path):
    steps = "0 AL=on\n+10us\nrepeat 3 every 50us {\n  0 AL=off\n  +1us AH=on\n  30us AH=off\n  +1us AL=on\n}\n"
    tr = read_table(table(tmp_path, steps))
    base = 10_000_000
    ah = [
        (base + k * 50_000_000 + t, v, ln)
        for k in range(3)
        for t, v, ln in ((1_000_000, 1, 6), (30_000_000, 0, 7))
    ]
    assert edges(tr, "AH") == (0, ah)
    al = [
        (base + k * 50_000_000 + t, v, ln)
        for k in range(3)
        for t, v, ln in ((0, 0, 5), (31_000_000, 1, 8))
    ]
    assert edges(tr, "AL") == (1, al)
    assert tr.end_ps == base + 150_000_000  # time after a block with a period: N periods on


def test_repeat_without_period_chains_passes(tmp_path):
    tr = read_table(
        table(tmp_path, "0 AH=off\nrepeat 2 {\n+1us AH=on\n+2us AH=off\n}\n+5us AH=on\n")
    )
    assert edges(tr, "AH")[1] == [
        (1_000_000, 1, 4),
        (3_000_000, 0, 5),
        (4_000_000, 1, 4),
        (6_000_000, 0, 5),
        (11_000_000, 1, 7),
    ]


def test_nested_repeats(tmp_path):
    steps = "0 AH=off\nrepeat 2 every 10us {\n  repeat 2 every 2us {\n    +1us AH=on\n    +500ns AH=off\n  }\n}\n"
    tr = read_table(table(tmp_path, steps))
    times = edges(tr, "AH")[1]
    expect = [
        (o + p + d, v)
        for o in (0, 10_000_000)
        for p in (0, 2_000_000)
        for d, v in ((1_000_000, 1), (1_500_000, 0))
    ]
    assert [(t, v) for t, v, _ in times] == expect


def test_end_sets_the_window(tmp_path):
    tr = read_table(table(tmp_path, "0 AH=off\n1us AH=on\nend +4us\n"))
    assert tr.end_ps == 5_000_000
    tr = read_table(table(tmp_path, "0 AH=off\n1us AH=on\nend 9us\n"))
    assert tr.end_ps == 9_000_000


def test_comments_blank_lines_and_crlf(tmp_path):
    path = table(
        tmp_path, "# start\r\n\r\n0 AH=off   # all off\r\n   # indented comment\r\n+1us AH=on\r\n"
    )
    assert edges(read_table(path), "AH") == (0, [(1_000_000, 1, 6)])


def test_inline_bridge_without_include(tmp_path):
    path = tmp_path / "t.steps"
    path.write_text("leg A high AH low AL\ndead-time 300ns\n0 AH=off\n1us AL=on\n")
    tr = read_table(str(path))
    assert tr.meta["bridge"].legs[0].channels == ("AH", "AL")
    assert tr.meta["policy"].dead_time.high_to_low_ps == 300_000


def test_table_trace_is_exact_int64(tmp_path):
    tr = read_table(table(tmp_path, "0 AH=off\n1s AH=on\n+1ps AH=off\n"))
    ch = tr.channel("AH")
    assert ch.times.dtype == np.int64
    assert ch.times.tolist() == [10**12, 10**12 + 1]


@pytest.mark.parametrize("sample", ["cart_reversal.steps", "cart_reversal_fault.steps"])
def test_samples_read(sample):
    root = Path(__file__).resolve().parent.parent / "samples"
    tr = read_table(str(root / sample))
    assert tr.kind == "table" and tr.edge_count > 300


def test_hash_inside_a_quoted_path_is_not_a_comment(tmp_path):
    (tmp_path / "drive#2.bridge").write_text(BRIDGE)
    path = tmp_path / "t.steps"
    path.write_text('include "drive#2.bridge"   # the second drive\n0 AH=off\n1us AH=on  # go\n')
    assert edges(read_table(str(path)), "AH") == (0, [(1_000_000, 1, 3)])

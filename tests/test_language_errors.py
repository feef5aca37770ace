"""Bridge language: every load-time error, pinned with anchored patterns (path:line:column: text)."""

from __future__ import annotations

import re

import pytest

from sequencecheck.errors import InputError
from sequencecheck.language import load_bridge, read_table
from sequencecheck.language._loader import KEYWORDS

LEGS = "leg A high AH low AL\nleg B high BH low BL\n"

# (table text, line, column or None, message pattern)
CASES = {
    "unknown channel": (LEGS + "0 XH=on\n", 3, 3, r"unknown channel 'XH' \(channels: AH, AL, BH, BL\)"),
    "unknown leg in a setting": (LEGS + "0 C.high=on\n", 3, 3, r"unknown leg 'C' in 'C\.high' \(legs: A, B\)"),
    "unknown mode in a step": (LEGS + "0 mode fly\n", 3, 8, r"unknown mode 'fly' \(modes: none defined\)"),
    "channel in two legs": ("leg A high AH low AL\nleg B high AL low BL\n0 AH=on\n", 2, 12,
                            r"channel 'AL' is already in leg A \(line 1\); a channel drives one switch"),
    "leg defined twice": ("leg A high AH low AL\nleg A high BH low BL\n", 2, 5, r"leg 'A' is already defined \(line 1\)"),
    "one channel for both switches": ("leg A high AH low AH\n", 1, 19, r"leg A uses channel 'AH' for both switches"),
    "mode names a missing switch": (LEGS + "mode m = C.high\n", 3, 10, r"mode m: switch C\.high names no leg 'C' \(legs: A, B\)"),
    "mode names an unknown name": (LEGS + "mode m = XX and A.low\n", 3, 10,
                                   r"mode m: 'XX' is neither a switch channel nor an earlier mode \(channels: AH, AL, BH, BL; modes: none yet\)"),
    "mode defined twice": (LEGS + "mode m = A.low\nmode m = B.low\n", 4, 6, r"mode 'm' is already defined \(line 3\)"),
    "mode named like a channel": (LEGS + "mode AH = A.low\n", 3, 6, r"mode 'AH' has the name of a channel; choose another"),
    "time goes backwards": (LEGS + "0 AH=on\n10us AH=off\n5us AH=on\n", 5, 1,
                            r"time goes backwards: 5us is 5 us, before the previous step at 10 us"),
    "time goes backwards in a pass": (LEGS + "0 AH=on\nrepeat 2 every 10us {\n 5us AH=off\n 2us AH=on\n}\n", 6, 2,
                                      r"time goes backwards: 2us is 2 us, before the previous step at 5 us \(times in a repeat block count from the start of each pass\)"),
    "step past the period": (LEGS + "0 AH=on\nrepeat 2 every 10us {\n 12us AH=off\n}\n", 5, 2,
                             r"step at 12 us into the pass is past the repeat period 10 us"),
    "repeat count zero": (LEGS + "0 AH=on\nrepeat 0 {\n+1us AH=off\n}\n", 4, 8, r"repeat count must be at least 1, not 0"),
    "repeat never closed": (LEGS + "0 AH=on\nrepeat 2 {\n+1us AH=off\n", 4, 1, r"this repeat block is never closed with '\}'"),
    "stray closing brace": (LEGS + "0 AH=on\n}\n", 4, 1, r"'\}' closes no repeat block"),
    "empty repeat": (LEGS + "0 AH=on\nrepeat 2 {\n}\n", 4, 1, r"this repeat block holds no steps"),
    "time without a unit": (LEGS + "10 AH=on\n", 3, 1, r"a time needs a unit \(s, ms, us, ns, ps\): write 10us or similar, not 10"),
    "unknown time unit": (LEGS + "10xs AH=on\n", 3, 1, r"unknown time unit 'xs' in '10xs'; use s, ms, us, ns or ps"),
    "setting other than on/off/1/0": (LEGS + "0 AH=2\n", 3, 3, r"'AH=2': set a switch to on or off \(or a pin level to 1 or 0\), not '2'"),
    "spaces around =": (LEGS + "0 AH = on\n", 3, 3, r"write settings without spaces around '=', such as AH=on"),
    "unknown statement": (LEGS + "leggy A\n", 3, 1, r"unknown statement 'leggy'; expected a step .* or a statement such as leg, mode, dead-time, allow, repeat, include"),
    "statement cut short": ("leg A high AH\n", 1, 14, r"expected 'low', found the end of the line"),
    "wrong word": ("leg A low AL high AH\n", 1, 7, r"expected 'high', found 'low'"),
    "dead time without a unit": (LEGS + "dead-time 500\n", 3, 11, r"a time needs a unit .*not 500"),
    "dead time of an unknown leg": (LEGS + "dead-time C 500ns\n", 3, 11, r"unknown leg 'C' \(legs: A, B\)"),
    "active-low unknown channel": (LEGS + "active-low XL\n", 3, 12, r"unknown channel 'XL' \(channels: AH, AL, BH, BL\)"),
    "transition names an unknown mode": (LEGS + "allow a -> b\n", 3, 7, r"unknown mode 'a' \(modes: none yet; '\*' means any\)"),
    "forbid with after": (LEGS + "mode m = A.low\nforbid m -> m after 1us\n", 4, 21, r"'after' belongs to 'allow': a forbidden change has no dwell"),
    "dwell in an unknown mode": (LEGS + "dwell x 1us\n", 3, 7, r"unknown mode 'x' .*"),
    "timing of an unknown switch": (LEGS + "timing Q rise 1ns\n", 3, 8, r"timing names 'Q', which is neither a channel nor a leg \(channels: AH, AL, BH, BL\)"),
    "driver delays swapped": (LEGS + "timing A driver-delay 50ns to 10ns\n", 3, 31, r"driver delay: the first value is the minimum, the second the maximum"),
    "bootstrap value in the wrong unit": (LEGS + "bootstrap A capacitance 100nC gate-charge 54nC leakage 1uA supply 12V diode-drop 1V min-vgs 5V\n",
                                          3, 25, r"capacitance is in farads, such as 100nF, not '100nC'"),
    "bootstrap incomplete": (LEGS + "bootstrap A capacitance 100nF\n", 3, 1, r"bootstrap A also needs: gate-charge, leakage, supply, diode-drop, min-vgs"),
    "mode with several smallest states": (LEGS + "mode m = A.high or B.high\n0 mode m\n", 4, 8,
                                          r"mode m \(line 3\) cannot be a step: it holds in several states with 1 switch\(es\) on \(\{A\.high\} or \{B\.high\}\); set the switches explicitly"),
    "mode that never holds": (LEGS + "mode m = A.high and not A.high\n0 mode m\n", 4, 8,
                              r"mode m \(line 3\) cannot be a step: it holds in no state of the bridge's switches; set the switches explicitly"),
    "bridge statement after a step": (LEGS + "0 AH=on\nleg C high CH low CL\n", 4, 1,
                                      r"bridge statements \(leg, mode, dead-time, include\.\.\.\) come before the first step \(line 3\)"),
    "step after end": (LEGS + "0 AH=on\nend 5us\n+1us AH=off\n", 5, 1, r"nothing may follow 'end' \(line 4\) but comments"),
    "end before the last step": (LEGS + "0 AH=on\n5us AH=off\nend 1us\n", 5, 5, r"end at 1 us is before the last step at 5 us"),
    "end inside a repeat": (LEGS + "0 AH=on\nrepeat 2 {\nend 1us\n}\n", 5, 5, r"'end' belongs at the top level, not inside a repeat block"),
    "channel set twice in a step": (LEGS + "0 AH=on AH=off\n", 3, 9, r"'AH=off': channel AH is set twice in one step"),
    "time finer than 1 ps": (LEGS + "0 AH=on\n1.5ps AH=off\n", 4, 1, r"duration '1\.5ps' is finer than the tool's 1 ps resolution"),
    "setting without a value": (LEGS + "0 AH=on BL\n", 3, 9, r"'BL': set a switch to on or off \(or a pin level to 1 or 0\), such as BL=on"),
    "several things expected": (LEGS + "dead-time\n", 3, 10,
                                r"expected a direction \(high-to-low or low-to-high\), a duration such as 500ns or a name, found the end of the line"),
    "unknown timing word": (LEGS + "timing A speed 3ns\n", 3, 10,
                            r"expected a timing \(driver-delay, turn-on-delay, turn-off-delay, rise or fall\), found 'speed'"),
    "path without quotes": (LEGS + "include cart.bridge\n", 3, 9,
                            r'expected a file name in double quotes, such as "drive\.bridge", found \'cart\.bridge\''),
    "unclosed parenthesis": (LEGS + "mode m = (A.high\n", 3, 17, r"expected '\)', found the end of the line"),
    "bootstrap value without unit": (LEGS + "bootstrap A capacitance 100\n", 3, 25,
                                     r"expected a value with its unit, such as 100nF, 54nC, 115uA, 12V or 10ohm, found '100'"),
    "no legs at all": ("# nothing\n0 AH=on\n", 2, 3, r"unknown channel 'AH' \(channels: none: include a bridge or define legs first\)"),
    "table includes itself": ('include "t.steps"\n', 1, 9, r"include 't\.steps' includes itself \(directly or through another file\)"),
    "empty file": ("", 1, None, r"empty file, expected a table: an include line and steps"),
    "no steps": (LEGS, None, None, r"no steps: a table needs at least one step that sets switches, such as '0 AH=off AL=on'"),
    "no switch set": (LEGS + "0\n+1us\n", None, None, r"no switch is set: a table needs at least one step that sets switches, such as '0 AH=off AL=on'"),
}  # fmt: skip


def where(path: str, line: int | None, column: int | None) -> str:
    return re.escape(":".join(str(p) for p in (path, line, column) if p is not None))


@pytest.mark.parametrize("case", sorted(CASES))
def test_error_message(tmp_path, case):
    text, line, column, pattern = CASES[case]
    path = tmp_path / "t.steps"
    path.write_text(text)
    with pytest.raises(InputError) as info:
        read_table(str(path))
    assert re.fullmatch(rf"{where(str(path), line, column)}: {pattern}", str(info.value)), str(
        info.value
    )
    assert "\n" not in str(info.value)
    assert (info.value.line, info.value.column) == (line, column)


def test_missing_bridge_file(tmp_path):
    path = tmp_path / "t.steps"
    path.write_text('include "nope.bridge"\n0 AH=on\n')
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 1, 9)}: bridge file 'nope\.bridge' not found \(looked for .*nope\.bridge\)$",
    ):
        read_table(str(path))


def test_error_inside_an_included_file_names_that_file(tmp_path):
    (tmp_path / "drive.bridge").write_text("leg A high AH low AL\nleg B high AL low BL\n")
    path = tmp_path / "t.steps"
    path.write_text('include "drive.bridge"\n0 AH=on\n')
    with pytest.raises(
        InputError, match=rf"^{where(str(tmp_path / 'drive.bridge'), 2, 12)}: channel 'AL'"
    ):
        read_table(str(path))


def test_not_utf8(tmp_path):
    path = tmp_path / "t.steps"
    path.write_bytes(b"leg A high AH low AL\n0 AH=\xff\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 2, None)}: is not UTF-8 text \(byte 0xff\); expected a bridge description or table$",
    ):
        read_table(str(path))


def test_missing_table(tmp_path):
    with pytest.raises(InputError, match=r"^.*nothing\.steps: no such file$"):
        read_table(str(tmp_path / "nothing.steps"))


def test_steps_in_a_bridge_description(tmp_path):
    path = tmp_path / "x.bridge"
    path.write_text(LEGS + "0 AH=on\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 3, 1)}: a bridge description holds no steps; put steps in a table \(\.steps\) that includes this file$",
    ):
        load_bridge(str(path))


def test_bridge_without_legs(tmp_path):
    path = tmp_path / "x.bridge"
    path.write_text("dead-time 1us\n")
    with pytest.raises(
        InputError,
        match=rf"^{re.escape(str(path))}: no legs: expected a line such as 'leg A high AH low AL'$",
    ):
        load_bridge(str(path))


def test_empty_bridge(tmp_path):
    path = tmp_path / "x.bridge"
    path.write_text("\n\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 1, None)}: empty file, expected a bridge description: leg lines$",
    ):
        load_bridge(str(path))


def test_repeat_too_large(tmp_path):
    path = tmp_path / "t.steps"
    path.write_text(LEGS + "0 AH=on\nrepeat 100000000 every 1us {\n0 AH=off\n+1ns AH=on\n}\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 4, 1)}: this repeat expands the table to 200,000,001 switch changes, more than the 50,000,000 a table may hold$",
    ):
        read_table(str(path))


def test_every_keyword_starts_a_statement():
    """KEYWORDS (the unknown-statement check) and the grammar agree."""
    from sequencecheck.language._grammar import grammar_text

    text = grammar_text()
    for word in KEYWORDS:
        assert f'"{word}"' in text, word


@pytest.mark.parametrize(
    ("step", "column"),
    [("1e9000000ps AH=on", 1), ("+5000000000000000000ps AH=on", 1)],
)
def test_time_beyond_range(tmp_path, step, column):
    path = tmp_path / "t.steps"
    path.write_text(LEGS + "0 AH=off\n" + step + "\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 4, column)}: "
        r"('.*' is beyond the longest time a table may span \(about 53 days\)|duration '.*' is out of range)$",
    ):
        read_table(str(path))


def test_repeat_beyond_range(tmp_path):
    path = tmp_path / "t.steps"
    path.write_text(LEGS + "0 AH=off\nrepeat 40000000000 every 1ms {\n0 AH=on\n}\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 4, 1)}: this repeat runs past the longest time a table may span \(about 53 days\)$",
    ):
        read_table(str(path))


def test_mode_nested_too_deeply(tmp_path):
    path = tmp_path / "t.steps"
    path.write_text(LEGS + "mode m = " + "(A.high and " * 150 + "A.high" + ")" * 150 + "\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 3, 6)}: mode m: the expression nests deeper than 100 levels$",
    ):
        read_table(str(path))


def test_modes_of_modes_too_deep_to_evaluate(tmp_path):
    # Refused where the too-deep mode is defined: a mode used only by the checks (never
    # as a step) would otherwise overflow Python's stack while the checks evaluate it.
    lines = [LEGS + "mode m0 = " + "not " * 90 + "A.high"]
    lines += [f"mode m{i} = " + "not " * 90 + f"m{i - 1}" for i in range(1, 40)]
    path = tmp_path / "t.steps"
    path.write_text("\n".join(lines) + "\n0 mode m39\n")
    line = LEGS.count("\n") + 2
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), line, 6)}: mode m1: with the modes it uses put in place, the expression nests deeper than 100 levels$",
    ):
        read_table(str(path))


def test_modes_of_modes_too_large_to_evaluate(tmp_path):
    # each mode doubles the one before: 2**14 terms from 15 short lines
    lines = [LEGS + "mode m0 = A.high"]
    lines += [f"mode m{i} = m{i - 1} and m{i - 1}" for i in range(1, 15)]
    path = tmp_path / "t.steps"
    path.write_text("\n".join(lines) + "\n0 mode m14\n")
    line = LEGS.count("\n") + 14
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), line, 6)}: mode m13: with the modes it uses put in place, the expression grows past 10,000 terms$",
    ):
        read_table(str(path))


def test_mode_search_has_a_limit(tmp_path):
    legs = "".join(f"leg L{i} high H{i} low W{i}\n" for i in range(9))  # 18 switches
    path = tmp_path / "t.steps"
    path.write_text(legs + "mode never = L0.high and not L0.high\n0 mode never\n")
    with pytest.raises(
        InputError,
        match=rf"^{where(str(path), 11, 8)}: mode never \(line 10\) cannot be a step: its state is not found among the first 65,536 switch states; set the switches explicitly$",
    ):
        read_table(str(path))

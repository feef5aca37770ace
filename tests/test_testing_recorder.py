"""Recorder: controller code sets levels at integer picosecond times and gets a Trace."""

from __future__ import annotations

import numpy as np
import pytest

from sequencecheck.errors import UsageError
from sequencecheck.model import Level
from sequencecheck.testing import Recorder


def test_set_and_step_give_exact_edges():
    rec = Recorder(("AH", "AL"), initial={"AL": 1})
    rec.set(1_000, AL=0)
    rec.step(250, AH=1)
    rec.step(4_000, AH=0)
    rec.step(250, AL=1)
    rec.step(10)
    trace = rec.trace()
    assert (trace.start_ps, trace.end_ps) == (0, 5_510)
    assert trace.kind == "recorder" and trace.rows == 5
    ah, al = trace.channel("AH"), trace.channel("AL")
    assert ah.initial == 0 and ah.times.tolist() == [1_250, 5_250] and ah.levels.tolist() == [1, 0]
    assert al.initial == 1 and al.times.tolist() == [1_000, 5_500] and al.levels.tolist() == [0, 1]
    assert ah.times.dtype == np.int64


def test_same_instant_last_wins_and_repeats_are_dropped():
    rec = Recorder()
    rec.set(100, AH=1)
    rec.set(100, AH=0)  # last change at an instant wins: no edge at all
    rec.set(200, AH=0)  # repeat of the level held: no edge
    rec.set(300, {"A.H": 1}, AL=True)  # mapping for names that are not identifiers
    trace = rec.trace(end_ps=400)
    assert trace.channel("AH").edge_count == 0
    assert trace.channel("A.H").times.tolist() == [300]
    assert trace.channel("AL").levels.tolist() == [1]
    assert trace.end_ps == 400


def test_time_going_backwards_names_channel_and_times():
    rec = Recorder(name="pump")
    rec.set(800, AH=1)
    rec.set(900, AL=1)
    with pytest.raises(
        UsageError, match=r"^pump: channel 'AH' set at 500 ps, before its previous change at 800 ps"
    ):
        rec.set(500, AH=0, AL=0)
    # nothing of the refused call was kept
    assert rec.level("AL") == 1 and rec.level("AH") == 1
    with pytest.raises(UsageError, match=r"step of -5 ps from 900 ps would go back in time"):
        rec.step(-5, AH=0)


def test_times_must_be_exact_integers():
    rec = Recorder()
    with pytest.raises(
        UsageError, match=r"time must be an integer number of picoseconds, not 1e-09"
    ):
        rec.set(1e-9, AH=1)
    with pytest.raises(UsageError, match="not True"):
        rec.step(True, AH=1)
    rec.set(np.int64(7), AH=1)  # numpy integers are exact
    assert rec.now_ps == 7


def test_unknown_channels_levels_and_early_times_are_refused():
    rec = Recorder(("AH", "AL"), start_ps=1_000)
    with pytest.raises(UsageError, match=r"unknown channel 'BH' \(channels: AH, AL\)"):
        rec.set(1_000, BH=1)
    with pytest.raises(UsageError, match=r"channel 'AH' level must be 0 or 1"):
        rec.set(1_000, AH=5)
    with pytest.raises(UsageError, match="before the recording start 1000 ps"):
        rec.set(999, AH=1)
    rec.set(1_500, AH=Level.X)
    assert rec.trace().channel("AH").levels.tolist() == [Level.X]
    with pytest.raises(UsageError, match="end_ps 1400 ps is before the last change at 1500 ps"):
        rec.trace(end_ps=1_400)


def test_channels_must_be_a_list_of_names():
    with pytest.raises(UsageError, match="channels must be a list of names, not the string 'AH'"):
        Recorder("AH")
    with pytest.raises(UsageError, match="unknown channel 'BL'"):
        Recorder(("AH", "AL"), initial={"BL": 1})

"""The state a loader keeps while it reads a file, and the helpers every statement uses."""

from __future__ import annotations

import os
from typing import Any

from ..errors import InputError
from ..model import BootstrapSupply, DeadTime, Leg, Mode, Source, SwitchTiming, TransitionRule
from ._modes import Switch
from ._timeline import Frame
from ._values import duration_ps

__all__ = ["LoaderState"]


class LoaderState:
    """What one file (plus its includes) has said so far, and where reading is."""

    def __init__(self, path: str, *, steps_allowed: bool) -> None:
        self.path = path
        self.steps_allowed = steps_allowed
        self.line = 0
        self.column = 1
        self.includes: list[str] = []
        self.stack: list[str] = [os.path.abspath(path)]
        # bridge
        self.legs: dict[str, Leg] = {}
        self.switch_of: dict[str, Switch] = {}  # channel -> (leg, side)
        self.defined_at: dict[str, int] = {}  # leg, channel or mode name -> line
        self.active_low: set[str] = set()
        self.timing: dict[str, SwitchTiming] = {}
        self.bootstrap: dict[str, BootstrapSupply] = {}
        self.modes: dict[str, Mode] = {}
        # policy
        self.dead_time: DeadTime | None = None
        self.dead_time_by_leg: dict[str, DeadTime] = {}
        self.limits: dict[str, int] = {}
        self.rules: list[TransitionRule] = []
        self.dwell_in: dict[str, int] = {}
        self.scheme: str | None = None
        # steps
        self.frames: list[Frame] = [Frame()]
        self.channel_index: dict[str, int] = {}
        self.on_level: list[int] = []
        self.settings_cache: dict[str, tuple[tuple[int, ...], tuple[int, ...]]] = {}
        self.mode_cache: dict[str, tuple[tuple[int, ...], tuple[int, ...]]] = {}
        self.first_step_line = 0
        self.end_ps: int | None = None
        self.end_line = 0

    # ------------------------------------------------------------------ helpers

    def error(self, message: str, token: Any = None, column: int | None = None) -> InputError:
        if column is None and token is not None:
            column = getattr(token, "column", None)
        return InputError(message, path=self.path, line=self.line, column=column)

    def where(self, token: Any) -> tuple[str, int, int]:
        return (self.path, self.line, token.column)

    def duration(self, token: Any, what: str = "duration") -> int:
        return duration_ps(str(token), self.where(token), what)

    def leg_named(self, token: Any) -> Leg:
        leg = self.legs.get(str(token))
        if leg is None:
            known = ", ".join(self.legs) or "none yet"
            raise self.error(f"unknown leg {str(token)!r} (legs: {known})", token)
        return leg

    def source(self, token: Any) -> Source:
        return Source(self.path, self.line, getattr(token, "column", None))

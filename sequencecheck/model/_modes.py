"""Named bridge states (modes) and the policy for changing between them.

Mode expressions are data (a small tree), never Python source: they are
parsed by the bridge language and evaluated by the modes rules, never eval'd.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

from ._bridge import Side
from ._source import Source

__all__ = [
    "All",
    "Any_",
    "Const",
    "Mode",
    "ModeExpr",
    "Not",
    "SwitchOn",
    "TransitionPolicy",
    "TransitionRule",
]


@dataclass(frozen=True, slots=True)
class SwitchOn:
    """True when the ``side`` switch of leg ``leg`` is (commanded) on."""

    leg: str
    side: Side


@dataclass(frozen=True, slots=True)
class Not:
    operand: ModeExpr


@dataclass(frozen=True, slots=True)
class All:
    """Logical and of every operand."""

    operands: tuple[ModeExpr, ...]


@dataclass(frozen=True, slots=True)
class Any_:
    """Logical or of every operand."""

    operands: tuple[ModeExpr, ...]


@dataclass(frozen=True, slots=True)
class Const:
    value: bool


ModeExpr = SwitchOn | Not | All | Any_ | Const


@dataclass(frozen=True, slots=True)
class Mode:
    """A named bridge state: the switch states for which ``expr`` holds."""

    name: str
    expr: ModeExpr
    source: Source | None = None


@dataclass(frozen=True, slots=True)
class TransitionRule:
    """A change from ``from_state`` to ``to_state`` ("*" matches any state).

    ``allowed`` False forbids the change outright; ``min_dwell_ps`` allows it only
    after at least that long spent in intermediate (brake/coast/partial) states
    between the two, or, for ``via`` rules, in the named states.
    """

    from_state: str
    to_state: str
    allowed: bool = True
    min_dwell_ps: int | None = None
    source: Source | None = None


@dataclass(frozen=True)
class TransitionPolicy:
    """Allowed and forbidden changes between named states, and dwell times.

    ``min_dwell_in`` maps a state to the least time the bridge must stay in it
    once entered. ``scheme`` names the PWM scheme ("sign-magnitude" or
    "locked-anti-phase"), which decides what counts as a reversal.
    ``handover_max_ps`` is the longest all-off gap of a leg between its two sides
    that still counts as a hand-over, not as a state of its own (None: 5 us);
    ``neutral_band_ppm`` is how near 50 % (in millionths of a period) a locked
    anti-phase duty counts as neither direction.
    """

    rules: tuple[TransitionRule, ...] = ()
    min_dwell_in: Mapping[str, int] = field(default_factory=dict)
    scheme: str = "sign-magnitude"
    source: str | None = None
    handover_max_ps: int | None = None
    neutral_band_ppm: int = 20_000

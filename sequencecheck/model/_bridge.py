"""What is being driven: legs, channel polarity and (optionally) physics."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from enum import StrEnum

__all__ = ["Bridge", "Direction", "Leg", "Side"]


class Side(StrEnum):
    HIGH = "high"
    LOW = "low"


class Direction(StrEnum):
    """A hand-over between the two switches of a leg, named by who turns off first."""

    HIGH_TO_LOW = "high-to-low"  # high side turns off, then low side turns on
    LOW_TO_HIGH = "low-to-high"  # low side turns off, then high side turns on


@dataclass(frozen=True, slots=True)
class Leg:
    """A half-bridge leg: its name and the channels commanding each switch."""

    name: str
    high: str
    low: str

    @property
    def channels(self) -> tuple[str, str]:
        return (self.high, self.low)


@dataclass(frozen=True)
class Bridge:
    """Legs in the order given, plus the polarity of every channel.

    ``active_low`` names channels whose logic 0 commands the switch on.
    ``timing`` maps a channel to its SwitchTiming and ``bootstrap`` a leg name
    to its BootstrapSupply; ``modes`` holds named bridge states (Mode), which
    override the default state names. ``source`` is the file the bridge came from.
    """

    legs: tuple[Leg, ...]
    active_low: frozenset[str] = frozenset()
    timing: Mapping[str, object] = field(default_factory=dict)
    bootstrap: Mapping[str, object] = field(default_factory=dict)
    modes: tuple[object, ...] = ()
    source: str | None = None

    def __post_init__(self) -> None:
        seen: dict[str, str] = {}
        names: set[str] = set()
        for leg in self.legs:
            if leg.name in names:
                raise ValueError(f"leg {leg.name!r} is defined twice")
            names.add(leg.name)
            if leg.high == leg.low:
                raise ValueError(f"leg {leg.name!r} uses channel {leg.high!r} for both switches")
            for ch in leg.channels:
                if ch in seen:
                    raise ValueError(f"channel {ch!r} is in legs {seen[ch]!r} and {leg.name!r}")
                seen[ch] = leg.name

    @property
    def channels(self) -> tuple[str, ...]:
        return tuple(ch for leg in self.legs for ch in leg.channels)

    def leg(self, name: str) -> Leg:
        for leg in self.legs:
            if leg.name == name:
                return leg
        raise KeyError(name)

    def on_level(self, channel: str) -> int:
        """The logic level that commands ``channel``'s switch on."""
        return 0 if channel in self.active_low else 1

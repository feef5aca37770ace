"""Findings and reports: plain records that reporters turn into text, JSON, ..."""

from __future__ import annotations

from collections import Counter
from collections.abc import Mapping
from dataclasses import dataclass, field
from enum import StrEnum
from typing import Any

from .model import Source

__all__ = [
    "Certainty",
    "DirectionStats",
    "Finding",
    "InputReport",
    "LegStats",
    "Report",
    "Severity",
    "WorstMargin",
]


class Severity(StrEnum):
    ERROR = "error"  # a violation: fails the run
    WARNING = "warning"  # suspicious input; fails the run only with --strict
    NOTE = "note"  # information


class Certainty(StrEnum):
    PROVEN = "proven"  # even the bounds of the true value break the requirement
    INCONCLUSIVE = "inconclusive"  # the measured value breaks it, its bounds straddle it


@dataclass(frozen=True, slots=True)
class Finding:
    """One rule violation (or warning) with exact times in picoseconds.

    ``margin_ps`` is signed (negative: violated); it defaults to measured minus
    required, and rules where "more is worse" (an overlap) set it themselves. For sampled
    inputs ``bounds_ps`` holds the open interval the true value lies in.
    ``sources`` are the input places of the edges involved, earliest first.
    ``detail`` carries rule-specific fields (direction, from/to state, ...).
    """

    rule: str
    leg: str | None
    channels: tuple[str, ...]
    start_ps: int
    end_ps: int
    measured_ps: int
    required_ps: int | None
    input: str
    message: str
    severity: Severity = Severity.ERROR
    certainty: Certainty = Certainty.PROVEN
    bounds_ps: tuple[int, int] | None = None
    sources: tuple[Source, ...] = ()
    detail: Mapping[str, Any] = field(default_factory=dict)
    margin_ps: int | None = None  # default: measured - required

    def __post_init__(self) -> None:
        if self.margin_ps is None and self.required_ps is not None:
            object.__setattr__(self, "margin_ps", self.measured_ps - self.required_ps)

    @property
    def is_violation(self) -> bool:
        return self.severity is Severity.ERROR


@dataclass(frozen=True, slots=True)
class WorstMargin:
    """The smallest (most negative) margin a rule saw on a leg, and where."""

    rule: str
    leg: str
    margin_ps: int
    at_ps: int
    measured_ps: int
    required_ps: int
    kind: str = "commanded"  # or "effective" (physical timing)


@dataclass(frozen=True, slots=True)
class DirectionStats:
    """Hand-overs of one direction on a leg: how many and the smallest gap seen."""

    count: int = 0
    min_gap_ps: int | None = None
    min_gap_at_ps: int | None = None  # time of the turn-on that ended the smallest gap
    not_proven: int = 0  # clean by measurement, but the sample rate cannot prove it


@dataclass(frozen=True, slots=True)
class LegStats:
    """Per-leg statistics that exist even for a clean run."""

    leg: str
    high_to_low: DirectionStats = DirectionStats()
    low_to_high: DirectionStats = DirectionStats()
    overlap_count: int = 0


@dataclass(frozen=True)
class InputReport:
    """Everything learned from one input: what was checked and what was found.

    ``error`` is set (and nothing was checked) when the input could not be read.
    """

    input: str
    kind: str = ""
    rows: int = 0
    edges: int = 0
    start_ps: int = 0
    end_ps: int = 0
    sample_period_ps: int | None = None
    channels: tuple[str, ...] = ()
    legs: tuple[str, ...] = ()
    findings: tuple[Finding, ...] = ()
    leg_stats: tuple[LegStats, ...] = ()
    margins: tuple[WorstMargin, ...] = ()
    error: str | None = None
    extra: Mapping[str, Any] = field(default_factory=dict)
    #: leg name -> (high-side channel, low-side channel), in the legs' order
    leg_channels: Mapping[str, tuple[str, str]] = field(default_factory=dict)
    #: channels of the input that belong to no leg: read, but not checked
    unchecked_channels: tuple[str, ...] = ()
    #: (rule, leg) -> violations counted but not listed in ``findings`` (Policy.max_findings_per_rule)
    unlisted: Mapping[tuple[str, str | None], int] = field(default_factory=dict)

    @property
    def violations(self) -> tuple[Finding, ...]:
        """The violations listed; ``violation_count`` also counts the unlisted ones."""
        return tuple(f for f in self.findings if f.is_violation)

    @property
    def violation_count(self) -> int:
        """Every violation found, listed or not."""
        return len(self.violations) + sum(self.unlisted.values())

    def unlisted_by_rule(self) -> dict[str, int]:
        """Violations counted but not listed, per rule."""
        out: dict[str, int] = {}
        for (rule, _leg), n in self.unlisted.items():
            out[rule] = out.get(rule, 0) + n
        return out

    @property
    def warnings(self) -> tuple[Finding, ...]:
        return tuple(f for f in self.findings if f.severity is Severity.WARNING)


@dataclass(frozen=True)
class Report:
    """The result of one run over one or more inputs, plus the settings used."""

    inputs: tuple[InputReport, ...]
    settings: Mapping[str, Any] = field(default_factory=dict)

    @property
    def findings(self) -> tuple[Finding, ...]:
        return tuple(f for r in self.inputs for f in r.findings)

    @property
    def violations(self) -> tuple[Finding, ...]:
        """The violations listed; ``violation_count`` also counts the unlisted ones."""
        return tuple(f for f in self.findings if f.is_violation)

    @property
    def errors(self) -> tuple[InputReport, ...]:
        return tuple(r for r in self.inputs if r.error is not None)

    @property
    def violation_count(self) -> int:
        """Every violation found, listed or not."""
        return sum(r.violation_count for r in self.inputs)

    def by_rule(self) -> dict[str, int]:
        """Violations per rule, the unlisted ones included."""
        counts = Counter(f.rule for f in self.violations)
        for r in self.inputs:
            counts.update(r.unlisted_by_rule())
        return dict(counts)

    def exit_status(self, *, strict: bool = False) -> int:
        """0 clean, 1 at least one violation (or warning when strict), 2 an input failed."""
        if self.errors:
            return 2
        if self.violation_count:
            return 1
        if strict and any(r.warnings for r in self.inputs):
            return 1
        return 0

    def to_dataframe(self) -> Any:
        """Findings as a pandas DataFrame (pandas is imported only here)."""
        import pandas as pd

        from .reporters._json import finding_record

        return pd.DataFrame([finding_record(f) for f in self.findings])

"""Property-test controller code: record its gate outputs, generate its inputs, check.

    from sequencecheck.testing import Recorder, assert_safe, command_sequences

A ``Recorder`` collects the levels controller code (or a harness around it) sets
at integer picosecond times and returns a Trace without any file;
``assert_safe(trace, bridge, policy)`` runs every registered rule and raises an
AssertionError listing the findings as the text report does. The hypothesis
strategies (``command_sequences``, ``pwm_settings``, ``edge_traces``) need the
``testing`` extra (``pip install 'sequencecheck[testing]'``); hypothesis is
imported the first time one of them is used, never by ``import sequencecheck``.
A pytest plugin (``sequencecheck.testing.pytest_plugin``) adds the
``gate_recorder`` fixture and the ``gate_check`` marker.

Caution: mains and battery-powered bridges can injure and burn. Passing these
checks supports, and never replaces, a design review, measurement on the real
hardware, local codes and licensed practice.
"""

from __future__ import annotations

from typing import Any

# _assertions
from ._assertions import SafetyAssertionError, assert_safe

# _commands
from ._commands import Command, DriveMode, PwmSettings, modes_for

# _recorder
from ._recorder import Recorder

# _strategies (loaded on first use, so that hypothesis is imported only when needed)
_LAZY = ("SWITCH_RANGES", "command_sequences", "edge_traces", "pwm_settings")

__all__ = [
    "SWITCH_RANGES",
    "Command",
    "DriveMode",
    "PwmSettings",
    "Recorder",
    "SafetyAssertionError",
    "assert_safe",
    "command_sequences",
    "edge_traces",
    "modes_for",
    "pwm_settings",
]


def __getattr__(name: str) -> Any:
    if name in _LAZY:
        from . import _strategies

        value = getattr(_strategies, name)
        globals()[name] = value
        return value
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))

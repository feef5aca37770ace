"""The library entry points: check files or traces, get a Report."""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import replace
from typing import Any

from .errors import InputError
from .findings import InputReport, Report
from .legs import legs_or_guess
from .model import Bridge, Policy, Trace
from .readers import read
from .rules import run

__all__ = ["check", "check_file", "check_trace"]


def check_trace(trace: Trace, bridge: Bridge, policy: Policy | None = None) -> InputReport:
    """Run every rule over one in-memory trace."""
    return run(trace, bridge, policy)


def check_file(
    path: str,
    bridge: Bridge | None = None,
    policy: Policy | None = None,
    **read_options: Any,
) -> InputReport:
    """Read and check one input; ``bridge`` None means legs guessed from channel names.

    This is a pure function of its arguments, so a process pool (or a distributed
    engine) can call it per file unchanged. Raises InputError on bad input.
    """
    path = os.fspath(path)
    channels = list(bridge.channels) if bridge is not None and bridge.legs else None
    trace = read(path, channels=channels, **read_options)
    own_bridge = trace.meta.get("bridge")
    if isinstance(own_bridge, Bridge):  # a table brings its bridge; flags given still win
        from .language import overlay_policy

        bridge = own_bridge
        policy = overlay_policy(trace.meta.get("policy"), policy)  # type: ignore[arg-type]
    if bridge is None or not bridge.legs:
        legs = legs_or_guess((), list(trace.channels), path)
        bridge = Bridge(legs) if bridge is None else replace(bridge, legs=legs)
    return run(trace, bridge, policy)


def check(
    paths: Sequence[str] | str,
    bridge: Bridge | None = None,
    policy: Policy | None = None,
    *,
    keep_going: bool = True,
    jobs: int | None = 1,
    **read_options: Any,
) -> Report:
    """Check each input; an unreadable input becomes an InputReport with ``error`` set
    (or raises, with ``keep_going=False``). ``jobs`` > 1 checks inputs in that many
    worker processes (None: one per core); see sequencecheck.batch."""
    if isinstance(paths, str | os.PathLike):
        paths = [os.fspath(paths)]
    if jobs != 1 and keep_going:
        from .batch import check_many

        return check_many(paths, bridge, policy, jobs=jobs, **read_options)
    results = []
    for p in paths:
        try:
            results.append(check_file(p, bridge, policy, **read_options))
        except InputError as e:
            if not keep_going:
                raise
            results.append(InputReport(input=os.fspath(p), error=str(e)))
    return Report(tuple(results))

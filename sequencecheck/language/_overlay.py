"""Combining a file's policy with the command line's: flags given win."""

from __future__ import annotations

from dataclasses import fields, replace

from ..model import Policy

__all__ = ["overlay_policy"]


def overlay_policy(base: Policy | None, top: Policy | None) -> Policy | None:
    """``base`` with every field ``top`` sets (differs from Policy()'s default) replaced.

    A dead time in ``top`` applies to every leg, so it also clears ``base``'s
    per-leg dead times unless ``top`` names its own.
    """
    if base is None or top is None:
        return top if base is None else base
    default = Policy()
    changes = {
        f.name: getattr(top, f.name)
        for f in fields(Policy)
        if getattr(top, f.name) != getattr(default, f.name)
    }
    if top.dead_time is not None and not top.dead_time_by_leg:
        changes["dead_time_by_leg"] = {}
    return replace(base, **changes)

"""``check --bridge FILE``: legs, polarity and limits from a bridge description."""

from __future__ import annotations

import argparse
from dataclasses import replace

from ..errors import UsageError
from ..model import Bridge, Policy

__all__ = ["add_bridge_argument", "apply_bridge_file"]


def add_bridge_argument(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "--bridge",
        metavar="FILE",
        help="bridge description (.bridge) for captures: legs, polarity, dead time, modes; "
        "flags given on the command line override its values (tables include their own)",
    )


def apply_bridge_file(
    args: argparse.Namespace, bridge: Bridge, policy: Policy
) -> tuple[Bridge, Policy]:
    """The bridge and policy of ``--bridge``, with the flags given laid over them."""
    if getattr(args, "bridge", None) is None:
        return bridge, policy
    if bridge.legs:
        raise UsageError("give the legs either with --bridge or with --leg, not both")
    from ..language import load_bridge, overlay_policy

    file_bridge, file_policy = load_bridge(args.bridge)
    file_bridge = replace(
        file_bridge,
        active_low=file_bridge.active_low | bridge.active_low,
        timing={**file_bridge.timing, **bridge.timing},
        bootstrap={**file_bridge.bootstrap, **bridge.bootstrap},
    )
    return file_bridge, overlay_policy(file_policy, policy) or policy

"""The bridge language: bridge descriptions (``.bridge``) and timed switch-state tables (``.steps``).

The grammar is ``grammar/bridge.lark`` (LALR). A table includes the bridge it
runs on and expands into the same Trace a capture gives, with the source line
of every edge, so findings point at ``file:line:``.

>>> import os, tempfile
>>> d = tempfile.mkdtemp()
>>> _ = open(os.path.join(d, "b.bridge"), "w").write("leg A high AH low AL\\ndead-time 500ns\\n")
>>> _ = open(os.path.join(d, "t.steps"), "w").write('include "b.bridge"\\n0 AL=on\\n+1us AL=off\\n+200ns AH=on\\n')
>>> trace = read_table(os.path.join(d, "t.steps"))
>>> trace.channel("AH").times.tolist(), trace.channel("AH").lines.tolist()
([1200000], [4])

Nothing here imports lark until a file is read, so the CLI starts fast.
"""

from __future__ import annotations

from typing import Any

from ..model import Bridge, Policy, Trace
from ._overlay import overlay_policy

__all__ = ["BRIDGE_SUFFIX", "TABLE_SUFFIX", "load_bridge", "overlay_policy", "read_table"]

#: File suffixes of the two kinds of file the language has.
BRIDGE_SUFFIX = ".bridge"
TABLE_SUFFIX = ".steps"


def load_bridge(path: str) -> tuple[Bridge, Policy]:
    """Read a bridge description: its legs, polarity, modes and timing, and its policy."""
    from ._loader import load

    loaded = load(path, table=False)
    return loaded.bridge, loaded.policy


def read_table(path: str, **_options: Any) -> Trace:
    """Read a table into a Trace; ``trace.meta`` holds its ``bridge`` and ``policy``.

    Reader options meant for captures (channels, time column...) do not apply and
    are ignored: a table names its channels through the bridge it includes.
    """
    from ._loader import load

    trace = load(path, table=True).trace
    assert trace is not None
    return trace

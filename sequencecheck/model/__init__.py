"""The data model every reader produces and every rule consumes."""

# _source
# _bridge
from ._bridge import Bridge, Direction, Leg, Side

# _policy
from ._policy import DeadTime, Policy
from ._source import Source

# _trace
from ._trace import Channel, Level, Trace, normalize_edges

__all__ = [
    "Bridge",
    "Channel",
    "DeadTime",
    "Direction",
    "Leg",
    "Level",
    "Policy",
    "Side",
    "Source",
    "Trace",
    "normalize_edges",
]

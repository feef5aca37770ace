"""The data model every reader produces and every rule consumes."""

# _source
# _bridge
from ._bridge import Bridge, Direction, Leg, Side

# _modes
from ._modes import (
    All,
    Any_,
    Const,
    Mode,
    ModeExpr,
    Not,
    SwitchOn,
    TransitionPolicy,
    TransitionRule,
)

# _physics
from ._physics import BootstrapSupply, SwitchTiming

# _policy
from ._policy import DeadTime, Policy
from ._source import Source

# _trace
from ._trace import Channel, Level, Trace, normalize_edges

__all__ = [
    "All",
    "Any_",
    "BootstrapSupply",
    "Bridge",
    "Channel",
    "Const",
    "DeadTime",
    "Direction",
    "Leg",
    "Level",
    "Mode",
    "ModeExpr",
    "Not",
    "Policy",
    "Side",
    "Source",
    "SwitchOn",
    "SwitchTiming",
    "Trace",
    "TransitionPolicy",
    "TransitionRule",
    "normalize_edges",
]

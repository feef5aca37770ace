"""Physical timing: the dead-time formula, bootstrap supply figures, quantities.

Pure functions of their arguments; the rules and the calculator commands use them.
"""

# cautions
from .cautions import CAUTION

# deadtime
from .deadtime import (
    DeadTimeBudget,
    SwitchDelays,
    dead_time_error_voltage,
    minimum_dead_time,
    real_dead_time,
)

# quantities
from .quantities import parse_quantity

__all__ = [
    "CAUTION",
    "DeadTimeBudget",
    "SwitchDelays",
    "dead_time_error_voltage",
    "minimum_dead_time",
    "parse_quantity",
    "real_dead_time",
]

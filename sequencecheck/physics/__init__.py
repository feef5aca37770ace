"""Physical timing: the dead-time formula, bootstrap supply figures, quantities.

Pure functions of their arguments; the rules and the calculator commands use them.
"""

# bootstrap
from .bootstrap import (
    BootstrapLimits,
    allowed_droop,
    full_voltage,
    longest_on_time_s,
    minimum_capacitance,
    refresh_time_s,
    switch_drop_v,
    total_charge,
    vgs_after,
    walk_high_side,
)

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
    "BootstrapLimits",
    "DeadTimeBudget",
    "SwitchDelays",
    "allowed_droop",
    "dead_time_error_voltage",
    "full_voltage",
    "longest_on_time_s",
    "minimum_capacitance",
    "minimum_dead_time",
    "parse_quantity",
    "real_dead_time",
    "refresh_time_s",
    "switch_drop_v",
    "total_charge",
    "vgs_after",
    "walk_high_side",
]

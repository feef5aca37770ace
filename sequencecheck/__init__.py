"""sequencecheck: check half-bridge gate sequences for shoot-through, dead-time and mode faults.

Time inside is exact integer picoseconds. Typical use::

    import sequencecheck as sc
    report = sc.check("capture.csv", sc.Bridge((sc.Leg("A", "AH", "AL"),)),
                      sc.Policy(dead_time=sc.DeadTime.both(sc.parse_duration("500ns"))))
    report.exit_status()
"""

__version__ = "0.1.0"

# api
from .api import check, check_file, check_trace

# batch
from .batch import check_many

# errors
from .errors import InputError, SequenceCheckError, UsageError

# findings
from .findings import Certainty, Finding, InputReport, LegStats, Report, Severity, WorstMargin

# language
from .language import load_bridge, read_table

# model
from .model import (
    All,
    Any_,
    Bridge,
    Channel,
    Const,
    DeadTime,
    Direction,
    Leg,
    Level,
    Mode,
    Not,
    Policy,
    Source,
    SwitchOn,
    Trace,
    TransitionPolicy,
    TransitionRule,
)
from .model._physics import BootstrapSupply, SwitchTiming

# physics
from .physics import BootstrapLimits

# readers
from .readers import read, read_csv, read_vcd

# rules
from .rules import RULES, run

# units
from .units import format_time, parse_duration

__all__ = [
    "RULES",
    "All",
    "Any_",
    "BootstrapLimits",
    "BootstrapSupply",
    "Bridge",
    "Certainty",
    "Channel",
    "Const",
    "DeadTime",
    "Direction",
    "Finding",
    "InputError",
    "InputReport",
    "Leg",
    "LegStats",
    "Level",
    "Mode",
    "Not",
    "Policy",
    "Report",
    "SequenceCheckError",
    "Severity",
    "Source",
    "SwitchOn",
    "SwitchTiming",
    "Trace",
    "TransitionPolicy",
    "TransitionRule",
    "UsageError",
    "WorstMargin",
    "__version__",
    "check",
    "check_file",
    "check_many",
    "check_trace",
    "format_time",
    "load_bridge",
    "parse_duration",
    "read",
    "read_csv",
    "read_table",
    "read_vcd",
    "run",
]

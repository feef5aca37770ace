"""Small reports for reporter tests, built by running the real rules over hand-made traces.

The traces imitate a timing table (every edge has a line number) for an invented
pump inverter leg, with faults placed at known times.
"""

from __future__ import annotations

import numpy as np

from sequencecheck import Bridge, Channel, DeadTime, Leg, Policy, Report, Trace, check_trace
from sequencecheck.findings import InputReport

NS = 1_000

#: Edges of leg U (UH/UL) and leg V (VH/VL): (time ns, level, line) per channel.
#: Leg U: UL off at 1000, UH on at 1100 -> 100 ns dead time (needs 300 ns);
#: UH on again at 5000 while UL on since 4900 (UH off 4000, UL on 4400) -> overlap 5000..5200.
TABLE_EDGES = {
    "UH": (0, [(1_100, 1, 4), (4_000, 0, 6), (5_000, 1, 8), (9_000, 0, 10)]),
    "UL": (1, [(1_000, 0, 3), (4_400, 1, 7), (5_200, 0, 9)]),
    "VH": (0, [(2_000, 1, 12), (6_000, 0, 13)]),
    "VL": (1, [(1_500, 0, 11), (6_500, 1, 14)]),
}


def table_trace(path: str = "pump/inverter.table", names: dict[str, str] | None = None) -> Trace:
    """A trace shaped like a parsed timing table: edges carry their line numbers."""
    names = names or {}
    channels = {}
    for ch, (initial, edges) in TABLE_EDGES.items():
        name = names.get(ch, ch)
        times = np.array([t * NS for t, _, _ in edges], dtype=np.int64)
        levels = np.array([v for _, v, _ in edges], dtype=np.int8)
        lines = np.array([ln for _, _, ln in edges], dtype=np.int64)
        channels[name] = Channel(name, initial, times, levels, lines)
    return Trace(channels, 0, 10_000 * NS, path=path, rows=14, kind="table")


def table_bridge(names: dict[str, str] | None = None) -> Bridge:
    n = names or {}
    return Bridge(
        (
            Leg("U", n.get("UH", "UH"), n.get("UL", "UL")),
            Leg("V", n.get("VH", "VH"), n.get("VL", "VL")),
        )
    )


POLICY = Policy(dead_time=DeadTime.both(300 * NS))


def table_report(names: dict[str, str] | None = None, path: str = "pump/inverter.table") -> Report:
    """Two inputs: the table above (checked) and one that could not be read."""
    checked = check_trace(table_trace(path, names), table_bridge(names), POLICY)
    failed = InputReport(input="pump/missing.table", error="pump/missing.table: no such file")
    return Report((checked, failed), {"dead_time_ps": 300 * NS})


def with_extra_findings(report: Report) -> Report:
    """``report`` plus an inconclusive dead-time finding (a sampled capture) and a warning."""
    from dataclasses import replace

    from sequencecheck import Certainty, Finding, Severity

    capture = InputReport(
        input="bench/pump_capture.csv",
        kind="csv-sampled",
        rows=1000,
        edges=4,
        end_ps=10_000 * NS,
        sample_period_ps=50 * NS,
        channels=("UH", "UL"),
        legs=("U",),
        findings=(
            Finding(
                rule="dead-time",
                leg="U",
                channels=("UH", "UL"),
                start_ps=2_000 * NS,
                end_ps=2_280 * NS,
                measured_ps=280 * NS,
                required_ps=300 * NS,
                input="bench/pump_capture.csv",
                message="leg U: UL on 280 ns after UH off; needs 300 ns",
                certainty=Certainty.INCONCLUSIVE,
                bounds_ps=(230 * NS, 330 * NS),
            ),
            Finding(
                rule="odd-input",
                leg=None,
                channels=("UH",),
                start_ps=3_000 * NS,
                end_ps=3_000 * NS,
                measured_ps=0,
                required_ps=None,
                input="bench/pump_capture.csv",
                message="an unregistered rule's warning",
                severity=Severity.WARNING,
            ),
        ),
    )
    return replace(report, inputs=(*report.inputs, capture))

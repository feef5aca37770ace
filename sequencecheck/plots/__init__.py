"""Pictures of findings: timing diagrams and dead-time histograms (matplotlib, Agg).

matplotlib is imported only when something is drawn.
"""

from ._data import HandoverGaps, finding_window, handover_gaps, steps_in_window
from ._diagram import draw_timing
from ._gallery import DEFAULT_LIMIT, Figures, Picture, draw_finding, draw_report, inline_svg
from ._histogram import draw_histogram

__all__ = [
    "DEFAULT_LIMIT",
    "Figures",
    "HandoverGaps",
    "Picture",
    "draw_finding",
    "draw_histogram",
    "draw_report",
    "draw_timing",
    "finding_window",
    "handover_gaps",
    "inline_svg",
    "steps_in_window",
]

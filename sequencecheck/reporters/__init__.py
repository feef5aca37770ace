"""Reporters turn a Report into text; they compute nothing."""

from __future__ import annotations

from collections.abc import Callable

from ..findings import Report
from ._html import render_html
from ._json import render_json
from ._junit import render_junit
from ._sarif import render_sarif
from ._text import render_text

__all__ = ["REPORTERS", "render"]

#: Format name -> renderer. Renderers take the Report (and keyword options) and return str.
REPORTERS: dict[str, Callable[..., str]] = {
    "text": render_text,
    "json": render_json,
    "junit": render_junit,
    "sarif": render_sarif,
    "html": render_html,
}


def render(report: Report, fmt: str, **options: object) -> str:
    return REPORTERS[fmt](report, **options)

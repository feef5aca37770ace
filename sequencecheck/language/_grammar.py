"""Finding the grammar file and building the (cached) LALR parser.

The one copy of the grammar lives in the top-level ``grammar/`` folder of the
source tree; the wheel carries it as ``sequencecheck/grammar/`` (see setup.py).
"""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path
from typing import Any

__all__ = ["GRAMMAR_NAME", "grammar_path", "grammar_text", "line_parser"]

GRAMMAR_NAME = "bridge.lark"
_PACKAGE = Path(__file__).resolve().parent.parent


def grammar_path() -> Path:
    """The grammar file: inside the installed package, else in the source tree."""
    for folder in (_PACKAGE / "grammar", _PACKAGE.parent / "grammar"):
        path = folder / GRAMMAR_NAME
        if path.is_file():
            return path
    raise FileNotFoundError(f"grammar file {GRAMMAR_NAME} is missing from the installation")


@lru_cache(maxsize=1)
def grammar_text() -> str:
    return grammar_path().read_text(encoding="utf-8")


def line_parser(transformer: Any | None = None) -> Any:
    """An LALR parser for one line (start symbol ``line``).

    With ``transformer`` its methods run as each rule is reduced, so no tree is
    built; without it, parse() returns a tree (used for error diagnosis and tests).
    """
    from lark import Lark

    return Lark(
        grammar_text(),
        parser="lalr",
        lexer="contextual",
        start="line",
        transformer=transformer,
        maybe_placeholders=True,
    )

"""Errors the tool raises on purpose.

    SequenceCheckError
     ├── InputError (also ValueError)   bad input: file, row/line, what was expected -> exit 2
     └── UsageError (also ValueError)   bad flags or arguments -> exit 2

Findings are never errors: they are data in a Report.  An InputError prints as
``path:line:column: message`` (parts that are unknown are left out), always one
line: control characters in the path and message print as escapes (``\\x1b``).
"""

from __future__ import annotations

from ._printable import clip_middle, printable

__all__ = ["InputError", "SequenceCheckError", "UsageError"]


class SequenceCheckError(Exception):
    """Root of every error sequencecheck raises on purpose."""


class InputError(SequenceCheckError, ValueError):
    """An input file cannot be read as what it claims to be.

    ``path``, ``line`` (1-based) and ``column`` (1-based) locate the problem;
    ``message`` says what was expected.
    """

    def __init__(
        self,
        message: str,
        *,
        path: str | None = None,
        line: int | None = None,
        column: int | None = None,
    ) -> None:
        self.message = message
        self.path = path
        self.line = line
        self.column = column
        super().__init__(str(self))

    def __str__(self) -> str:
        where = [printable(p) for p in (self.path, self.line, self.column) if p is not None]
        # always one printable line of bounded length: control characters (also in the
        # path) become visible escapes, and a very long message keeps its start and end
        text = clip_middle(printable(" ".join(self.message.split())))
        return ":".join([*where, " " + text]) if where else text


class UsageError(SequenceCheckError, ValueError):
    """A command-line flag or API argument is not of the form expected."""

"""Load a bridge description or a table: parse line by line, check meaning, build the model.

One ``_Loader`` reads one file (and the files it includes). Each line is parsed
on its own by the LALR parser into a statement tuple (see _statements.py), then
handled by ``on_<statement>`` (_bridge_statements.py, _step_statements.py),
which checks it against what came before (unknown channel, a channel in two
legs, time going backwards...) and raises InputError with path, line and column.
"""

from __future__ import annotations

import os
import re
import threading
from dataclasses import dataclass, field
from typing import Any

from ..errors import InputError
from ..model import Bridge, Policy, Trace
from ._bridge_statements import BridgeStatements
from ._diagnose import syntax_error
from ._step_statements import StepStatements

__all__ = ["Loaded", "load"]

_STEP_KINDS = frozenset({"step", "repeat", "close", "end"})
#: Words that start a statement (grammar/bridge.lark). The lexer would read ``leggy``
#: as ``leg`` followed by ``gy``, so a line's first word is checked against these.
KEYWORDS = frozenset(
    [
        "include",
        "leg",
        "active-low",
        "dead-time",
        "min-pulse",
        "min-margin",
        "reversal-dwell",
        "mode",
        "allow",
        "forbid",
        "dwell",
        "scheme",
        "timing",
        "bootstrap",
        "repeat",
        "end",
    ]
)
_FIRST_WORD = re.compile(r"[A-Za-z_][\w-]*")
_SEEN_LINES = 4096  # distinct lines remembered per file
_PARSER: Any = None
_PARSER_LOCK = threading.Lock()


def _parser() -> Any:
    global _PARSER
    with _PARSER_LOCK:
        if _PARSER is None:
            from ._grammar import line_parser
            from ._statements import Statements

            _PARSER = line_parser(Statements())
        return _PARSER


@dataclass
class Loaded:
    """What a file said: its bridge, its policy, and (for a table) its trace."""

    bridge: Bridge
    policy: Policy
    trace: Trace | None = None
    includes: list[str] = field(default_factory=list)


_LINE_END = re.compile(r"\r\n|\r|\n")


def split_lines(text: str) -> list[str]:
    """Lines as an editor counts them: ends are LF, CRLF or CR, nothing else.

    (``str.splitlines`` would also split at form feeds, vertical tabs and Unicode
    separators, so line numbers would disagree with the user's editor.)
    """
    lines = _LINE_END.split(text)
    if lines and lines[-1] == "":
        lines.pop()
    return lines


def read_text(path: str) -> str:
    """The file as text; InputError (one line) if missing, a folder, or not UTF-8."""
    try:
        with open(path, "rb") as f:
            data = f.read()
    except FileNotFoundError:
        raise InputError("no such file", path=path) from None
    except IsADirectoryError:
        raise InputError("is a folder, expected a bridge description or table", path=path) from None
    except OSError as e:
        raise InputError(f"cannot be read ({e.strerror})", path=path) from None
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data[: e.start].count(b"\n") + 1
        raise InputError(
            f"is not UTF-8 text (byte 0x{data[e.start]:02x}); expected a bridge description or table",
            path=path,
            line=line,
        ) from None


class _Loader(BridgeStatements, StepStatements):
    """Statements of one file (plus its includes) turned into Bridge, Policy and steps."""

    def run(self, text: str) -> None:
        parse = _parser().parse
        from lark.exceptions import UnexpectedInput, VisitError

        handlers = {
            "step": self.on_step,
            "repeat": self.on_repeat,
            "close": self.on_close,
            "end": self.on_end,
        }
        # A line's statement depends on its text alone (columns included; token.line is
        # always 1 in a one-line parse and never used), so repeated lines parse once.
        seen: dict[str, tuple[Any, ...]] = {}
        for number, raw in enumerate(split_lines(text), start=1):
            stripped = raw.lstrip()
            if not stripped or stripped[0] == "#":
                continue
            self.line = number
            self.column = len(raw) - len(stripped) + 1
            word = _FIRST_WORD.match(stripped)
            if word is not None and word.group(0) not in KEYWORDS:
                raise self.error(
                    f"unknown statement {word.group(0)!r}; expected a step (a time such as 0 or "
                    "+750ns) or a statement such as leg, mode, dead-time, allow, repeat, include",
                    column=self.column,
                )
            if "#" in raw and '"' not in raw:  # a trailing comment: the lexer need not see it
                raw = raw[: raw.index("#")]
            statement = seen.get(raw)
            if statement is None:
                try:
                    statement = parse(raw)
                except UnexpectedInput as e:
                    raise syntax_error(e, raw, self.path, number, _parser()) from None
                except VisitError as e:  # a callback raised: surface the original error
                    raise e.orig_exc from None
                if len(seen) < _SEEN_LINES:
                    seen[raw] = statement
            kind = statement[0]
            if kind in _STEP_KINDS:
                if not self.steps_allowed:
                    raise self.error(
                        "a bridge description holds no steps; put steps in a table "
                        "(.steps) that includes this file",
                        column=self.column,
                    )
                if self.end_ps is not None:
                    raise self.error(
                        f"nothing may follow 'end' (line {self.end_line}) but comments",
                        column=self.column,
                    )
                handlers[kind](*statement[1:])
            else:
                if self.first_step_line:
                    raise self.error(
                        "bridge statements (leg, mode, dead-time, include...) come before "
                        f"the first step (line {self.first_step_line})",
                        column=self.column,
                    )
                getattr(self, "on_" + kind)(*statement[1:])
        if len(self.frames) > 1:
            frame = self.frames[-1]
            self.line = frame.line
            raise self.error("this repeat block is never closed with '}'", column=frame.column)

    def on_include(self, token: Any) -> None:
        name = str(token)[1:-1]
        target = os.path.normpath(os.path.join(os.path.dirname(self.path), name))
        if os.path.abspath(target) in self.stack:
            raise self.error(
                f"include {name!r} includes itself (directly or through another file)", token
            )
        if not os.path.isfile(target):
            raise self.error(f"bridge file {name!r} not found (looked for {target})", token)
        text = read_text(target)
        outer_path, outer_line, outer_allowed = self.path, self.line, self.steps_allowed
        self.path, self.steps_allowed = target, False
        self.stack.append(os.path.abspath(target))
        try:
            self.run(text)
        finally:
            self.stack.pop()
            self.path, self.line, self.steps_allowed = outer_path, outer_line, outer_allowed
        self.includes.append(target)


def load(path: str, *, table: bool) -> Loaded:
    """Read ``path`` as a table (``table=True``) or a bridge description."""
    path = os.fspath(path)
    text = read_text(path)
    if not text.strip():
        what = "a table: an include line and steps" if table else "a bridge description: leg lines"
        raise InputError(f"empty file, expected {what}", path=path, line=1)
    loader = _Loader(path, steps_allowed=table)
    loader.run(text)
    if not loader.legs:
        raise InputError(
            "no legs: expected a line such as 'leg A high AH low AL'"
            + (" or 'include \"drive.bridge\"'" if table else ""),
            path=path,
        )
    bridge, policy = loader.bridge_and_policy()
    trace = None
    if table:
        trace = loader.trace(len(split_lines(text)))
        trace = Trace(
            trace.channels,
            trace.start_ps,
            trace.end_ps,
            trace.path,
            None,
            trace.rows,
            trace.kind,
            {**trace.meta, "bridge": bridge, "policy": policy, "includes": tuple(loader.includes)},
        )
    return Loaded(bridge, policy, trace, loader.includes)

"""Command line: ``build_parser()`` builds it, ``run(argv)`` acts and returns the exit
status, ``main()`` joins them. Each subcommand lives in its own module and registers
itself through ``add_parser``; the CLI holds no checking logic of its own.
"""

from __future__ import annotations

import argparse
import signal
import sys
from collections.abc import Sequence

from .. import __version__
from .._heap import keep_freed_memory
from .._printable import printable
from ..errors import SequenceCheckError
from . import _bootstrap, _check, _deadtime, _plot

__all__ = ["build_parser", "main", "run"]

#: Subcommand modules, in the order ``--help`` lists them.
COMMANDS = (_check, _plot, _deadtime, _bootstrap)

EXIT_OK, EXIT_VIOLATION, EXIT_ERROR = 0, 1, 2


class _Parser(argparse.ArgumentParser):
    """argparse with one-line errors and exit status 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        self.exit(EXIT_ERROR, f"{self.prog}: error: {printable(message)} (see --help)\n")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(
        prog="sequencecheck",
        description=(
            "Check half-bridge gate sequences (bench captures and timing tables) for "
            "shoot-through, dead-time and mode faults."
        ),
        epilog=(
            "Results support, never replace, a design review, measurement on the real "
            "hardware, local codes and licensed practice: mains and battery-powered "
            "bridges can injure and burn."
        ),
    )
    parser.add_argument("--version", action="version", version=f"%(prog)s {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True
    for command in COMMANDS:
        command.add_parser(sub)
    return parser


def run(argv: Sequence[str] | None = None) -> int:
    """Parse ``argv`` and run the command; return the exit status (0, 1 or 2)."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
        return int(args.func(args))
    except SystemExit as e:  # argparse: --help, --version, usage errors
        return int(e.code or 0) if isinstance(e.code, int) else EXIT_ERROR
    except SequenceCheckError as e:
        print(f"sequencecheck: error: {printable(e)}", file=sys.stderr)  # one line
        return EXIT_ERROR


def main() -> None:
    """Console entry point: quiet on Ctrl-C and on a closed pipe (``| head``)."""
    signal.signal(signal.SIGPIPE, signal.SIG_DFL)
    keep_freed_memory()  # large arrays are reused instead of faulted in again
    try:
        status = run()
    except KeyboardInterrupt:
        print("sequencecheck: interrupted", file=sys.stderr)
        status = 130
    sys.exit(status)

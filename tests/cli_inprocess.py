"""Run the command line inside the test process (fast); conftest.run_cli runs a subprocess."""

from __future__ import annotations

import contextlib
import io
import subprocess

from sequencecheck.cli import run


def run_here(*args: str) -> subprocess.CompletedProcess[str]:
    """``sequencecheck ARGS`` in process, with stdout and stderr captured."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = run(list(args))
    return subprocess.CompletedProcess(
        ["sequencecheck", *args], code, out.getvalue(), err.getvalue()
    )

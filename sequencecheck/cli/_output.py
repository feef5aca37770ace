"""Writing a report where the user asked: stdout or a file, written atomically."""

from __future__ import annotations

import os
import sys
import tempfile

from ..errors import UsageError

__all__ = ["check_output_path", "write_output"]


def check_output_path(path: str | None) -> None:
    """Fail early (exit 2) if ``path`` cannot be written, before any work is done."""
    if path is None or path == "-":
        return
    folder = os.path.dirname(os.path.abspath(path))
    if not os.path.isdir(folder):
        raise UsageError(f"--output {path}: folder {folder} does not exist")
    if not os.access(folder, os.W_OK):
        raise UsageError(f"--output {path}: folder {folder} is not writable")
    if os.path.isdir(path):
        raise UsageError(f"--output {path}: is a folder, expected a file name")


def write_output(text: str | bytes, path: str | None) -> None:
    """Write to stdout, or to ``path`` through a temporary file and a rename."""
    if path is None or path == "-":
        if isinstance(text, bytes):
            sys.stdout.buffer.write(text)
        else:
            sys.stdout.write(text)
        sys.stdout.flush()
        return
    check_output_path(path)
    folder = os.path.dirname(os.path.abspath(path))
    fd, tmp = tempfile.mkstemp(prefix=".sequencecheck-", dir=folder)
    try:
        with os.fdopen(fd, "wb") as f:
            f.write(text.encode("utf-8") if isinstance(text, str) else text)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise

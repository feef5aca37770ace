"""Writing a report where the user asked: stdout, a device, or a file written atomically.

A regular file is written through a temporary file in the same folder and a rename, so an
interrupted run never leaves half a report; the file keeps its previous permissions (or
gets the umask's), a symbolic link is followed rather than replaced, and a device or pipe
(``/dev/null``, ``/dev/stdout``) is written directly.
"""

from __future__ import annotations

import os
import stat
import sys
import tempfile
from collections.abc import Sequence

from ..errors import UsageError

__all__ = ["check_output_path", "write_output"]


def _is_stdout(path: str | None) -> bool:
    return path is None or path == "-"


def check_output_path(path: str | None, inputs: Sequence[str] = ()) -> None:
    """Fail early (exit 2) if ``path`` cannot be written or names an input, before any work."""
    if _is_stdout(path):
        return
    assert path is not None
    real = os.path.realpath(path)
    folder = os.path.dirname(real)
    if not os.path.isdir(folder):
        raise UsageError(f"--output {path}: folder {folder} does not exist")
    if os.path.isdir(real):
        raise UsageError(f"--output {path}: is a folder, expected a file name")
    if os.path.exists(real) and not os.path.isfile(real):
        return  # a device or pipe: written in place
    if not os.access(folder, os.W_OK):
        raise UsageError(f"--output {path}: folder {folder} is not writable")
    for source in inputs:
        if os.path.exists(source) and os.path.exists(real) and os.path.samefile(source, real):
            raise UsageError(f"--output {path}: is one of the inputs; refusing to overwrite it")


def _new_file_mode(real: str) -> int:
    if os.path.exists(real):
        return stat.S_IMODE(os.stat(real).st_mode)
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask


def write_output(text: str | bytes, path: str | None) -> None:
    """Write to stdout, or to ``path`` (see the module docstring); OSError becomes exit 2."""
    if _is_stdout(path):
        if isinstance(text, bytes):
            sys.stdout.buffer.write(text)
        else:
            sys.stdout.write(text)
        sys.stdout.flush()
        return
    data = text.encode("utf-8") if isinstance(text, str) else text
    assert path is not None
    check_output_path(path)
    real = os.path.realpath(path)
    try:
        if os.path.exists(real) and not os.path.isfile(real):
            with open(real, "wb") as device:
                device.write(data)
            return
        _replace_atomically(real, data, _new_file_mode(real))
    except OSError as e:
        raise UsageError(f"--output {path}: cannot write ({e.strerror or e})") from None


def _replace_atomically(real: str, data: bytes, mode: int) -> None:
    fd, tmp = tempfile.mkstemp(prefix=".sequencecheck-", dir=os.path.dirname(real))
    try:
        with os.fdopen(fd, "wb") as f:
            f.write(data)
        os.chmod(tmp, mode)
        os.replace(tmp, real)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise

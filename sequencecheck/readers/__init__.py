"""Readers turn files into Traces; they know formats, not bridges.

``read(path, **options)`` picks a reader by the file's suffix from READERS.
"""

from __future__ import annotations

import os
from collections.abc import Callable
from typing import Any

from ..errors import InputError
from ..model import Trace
from ._csv import read_csv
from ._vcd import read_vcd

__all__ = ["READERS", "read", "read_csv", "read_vcd"]

#: Suffix -> reader. Each reader takes the path and keyword options it understands.
READERS: dict[str, Callable[..., Trace]] = {
    ".csv": read_csv,
    ".txt": read_csv,
    ".tsv": read_csv,
    ".vcd": read_vcd,
}


def read(path: str, **options: Any) -> Trace:
    """Read any supported input into a Trace, chosen by suffix (CSV by default)."""
    suffix = os.path.splitext(os.fspath(path))[1].lower()
    reader = READERS.get(suffix, read_csv)
    if not os.path.exists(path):
        raise InputError("no such file", path=os.fspath(path))
    return reader(path, **options)

"""Readers turn files into Traces; they know formats, not bridges.

``read(path, **options)`` picks a reader by the file's suffix from READERS.
"""

from __future__ import annotations

import os
from collections.abc import Callable
from typing import Any

from ..errors import InputError
from ..language import BRIDGE_SUFFIX, TABLE_SUFFIX, read_table
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
    TABLE_SUFFIX: read_table,  # the bridge language's timed switch-state tables
}


def read(path: str, **options: Any) -> Trace:
    """Read any supported input into a Trace, chosen by suffix (CSV by default)."""
    suffix = os.path.splitext(os.fspath(path))[1].lower()
    reader = READERS.get(suffix, read_csv)
    if suffix == BRIDGE_SUFFIX:
        raise InputError(
            "is a bridge description, not an input to check; pass it with --bridge "
            "or include it from a table",
            path=os.fspath(path),
        )
    if not os.path.exists(path):
        raise InputError("no such file", path=os.fspath(path))
    return reader(path, **options)

"""Keep freed memory in the process for reuse (glibc only; elsewhere nothing happens).

A check makes many short-lived arrays of tens of megabytes. By default glibc gives
every block above 32 MB its own mapping and returns it to the system when freed, so
the next array of that size is faulted in page by page again: on a 10 M-edge trace
that is most of the time a rule takes (bench/run_benchmarks.py prints the split).
Raising the mapping threshold and the trim threshold lets freed blocks be reused.
The peak stays the same; the process simply keeps it until it exits, which suits a
command-line run. The library never calls this on its own.
"""

from __future__ import annotations

import ctypes
import sys

__all__ = ["keep_freed_memory"]

_M_TRIM_THRESHOLD, _M_MMAP_THRESHOLD = -1, -3
_MMAP_THRESHOLD = 1 << 30  # blocks below 1 GiB come from the heap
_TRIM_THRESHOLD = 2**31 - 1  # keep the heap's top (the largest value mallopt takes)


def keep_freed_memory() -> bool:
    """Tune glibc's allocator as described above; True when it took effect."""
    if not sys.platform.startswith("linux"):
        return False
    try:
        mallopt = ctypes.CDLL(None).mallopt  # the C library the interpreter runs on
    except (OSError, AttributeError):  # musl and others: no mallopt
        return False
    mallopt.argtypes = [ctypes.c_int, ctypes.c_int]
    mallopt.restype = ctypes.c_int
    ok = mallopt(_M_MMAP_THRESHOLD, _MMAP_THRESHOLD)
    ok &= mallopt(_M_TRIM_THRESHOLD, _TRIM_THRESHOLD)
    return bool(ok)

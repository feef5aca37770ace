"""keep_freed_memory: large arrays come from the reusable heap, not fresh mappings."""

from __future__ import annotations

import subprocess
import sys
import textwrap

import pytest

_PROBE = textwrap.dedent(
    """
    import ctypes, sys
    import numpy as np
    from sequencecheck._heap import keep_freed_memory

    class MallInfo2(ctypes.Structure):
        _fields_ = [(n, ctypes.c_size_t) for n in (
            "arena", "ordblks", "smblks", "hblks", "hblkhd", "usmblks",
            "fsmblks", "uordblks", "fordblks", "keepcost")]

    libc = ctypes.CDLL(None)
    libc.mallinfo2.restype = MallInfo2
    took = keep_freed_memory() if sys.argv[1] == "tuned" else None
    before = libc.mallinfo2().hblks
    block = np.ones(100_000_000 // 8)  # 100 MB, above glibc's largest default threshold
    print(took, libc.mallinfo2().hblks - before)  # new mappings for the block
    """
)


def _probe(mode: str) -> list[str]:
    out = subprocess.run(
        [sys.executable, "-c", _PROBE, mode], capture_output=True, text=True, check=True
    )
    return out.stdout.split()


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="glibc's allocator only")
def test_large_arrays_come_from_the_heap_once_tuned() -> None:
    try:
        untouched = _probe("default")
    except subprocess.CalledProcessError:
        pytest.skip("this C library has no mallinfo2 (not glibc >= 2.33)")
    assert untouched == ["None", "1"]  # the control: by default the block is its own mapping
    assert _probe("tuned") == ["True", "0"]


def test_console_entry_point_tunes_the_heap(monkeypatch: pytest.MonkeyPatch) -> None:
    import sequencecheck.cli as cli

    called = []
    monkeypatch.setattr(cli, "keep_freed_memory", lambda: called.append(True))
    monkeypatch.setattr(cli, "run", lambda: 0)
    with pytest.raises(SystemExit):
        cli.main()
    assert called == [True]

"""Build gate_tick.c with the system C compiler and drive it through ctypes.

The same commands and PWM settings as the Python drive go in; the gate byte
of every tick comes out and is recorded as edges (tick n holds from
``n * tick_ps`` to ``(n + 1) * tick_ps``).
"""

from __future__ import annotations

import ctypes
import os
import shutil
import subprocess
from collections.abc import Sequence
from pathlib import Path

import numpy as np

from sequencecheck.model import Trace
from sequencecheck.testing import Command, DriveMode, PwmSettings, Recorder

from .pump_drive import PUMP_BRIDGE

__all__ = ["C_SOURCE", "CPumpDrive", "build", "find_compiler"]

C_SOURCE = Path(__file__).with_name("gate_tick.c")
_MODES = {
    DriveMode.COAST: 0,
    DriveMode.BRAKE: 1,
    DriveMode.FORWARD: 2,
    DriveMode.REVERSE: 3,
    DriveMode.STOP: 4,
}
_BITS = {"AH": 1, "AL": 2, "BH": 4, "BL": 8}


class _PumpCtl(ctypes.Structure):
    _fields_ = [
        ("period_ticks", ctypes.c_uint32),
        ("dead_ticks", ctypes.c_uint32),
        ("count", ctypes.c_uint32),
        ("gates", ctypes.c_uint8),
        ("off_for", ctypes.c_uint32 * 4),
    ]


def find_compiler() -> str | None:
    """The C compiler named by $CC, else cc, gcc or clang on PATH; None if there is none."""
    for name in (os.environ.get("CC"), "cc", "gcc", "clang"):
        if name and (path := shutil.which(name)):
            return path
    return None


def build(out_dir: Path, *, full_duty_bypass: bool = False, compiler: str | None = None) -> Path:
    """Compile gate_tick.c into a shared library in ``out_dir`` and return its path."""
    cc = compiler or find_compiler()
    if cc is None:
        raise FileNotFoundError("no C compiler found (set CC, or install cc, gcc or clang)")
    lib = Path(out_dir) / ("libgate_tick_bypass.so" if full_duty_bypass else "libgate_tick.so")
    flags = ["-DFULL_DUTY_BYPASS"] if full_duty_bypass else []
    cmd = [cc, "-std=c99", "-O2", "-Wall", "-Werror", "-shared", "-fPIC", *flags, str(C_SOURCE)]
    subprocess.run([*cmd, "-o", str(lib)], check=True, capture_output=True, text=True, timeout=120)
    return lib


class CPumpDrive:
    """The compiled gate logic, clocked at ``tick_ps`` with ``pwm``'s period and dead time."""

    def __init__(self, library: Path, pwm: PwmSettings, *, tick_ps: int = 10_000) -> None:
        self.lib = ctypes.CDLL(str(library))
        self.lib.pump_init.argtypes = [ctypes.POINTER(_PumpCtl), ctypes.c_uint32, ctypes.c_uint32]
        self.lib.pump_run.argtypes = [
            ctypes.POINTER(_PumpCtl),
            ctypes.c_int,
            ctypes.c_uint32,
            ctypes.c_uint32,
            ctypes.POINTER(ctypes.c_uint8),
        ]
        self.tick_ps = tick_ps
        self.period_ticks = pwm.period_ps // tick_ps
        self.dead_ticks = -(-pwm.dead_time_ps // tick_ps)  # round up: never less than asked

    def gate_bytes(self, commands: Sequence[Command]) -> np.ndarray:
        """The gate byte of every tick; each command starts at the tick its time falls in."""
        starts = np.cumsum([0] + [c.duration_ps for c in commands]) // self.tick_ps
        out = np.zeros(int(starts[-1]), dtype=np.uint8)
        ctl = _PumpCtl()
        self.lib.pump_init(ctypes.byref(ctl), self.period_ticks, self.dead_ticks)
        for cmd, a, b in zip(commands, starts[:-1], starts[1:], strict=True):
            compare = self.period_ticks * cmd.duty.numerator // cmd.duty.denominator
            chunk = out[a:b]
            ptr = chunk.ctypes.data_as(ctypes.POINTER(ctypes.c_uint8))
            self.lib.pump_run(ctypes.byref(ctl), _MODES[cmd.mode], compare, int(b - a), ptr)
        return out

    def record(self, commands: Sequence[Command]) -> Trace:
        gates = self.gate_bytes(commands)
        rec = Recorder(PUMP_BRIDGE.channels, name="pump drive (C)")
        changed = np.flatnonzero(np.diff(gates, prepend=np.uint8(0)))
        for n, byte in zip(changed.tolist(), gates[changed].tolist(), strict=True):
            rec.set(n * self.tick_ps, {ch: int(byte & bit != 0) for ch, bit in _BITS.items()})
        rec.set(gates.size * self.tick_ps)
        return rec.trace()

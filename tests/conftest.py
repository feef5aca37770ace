"""Shared helpers for the test suite (see tests/README.md for where tests go)."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "samples"

# pytester runs pytest in temporary projects; the plugin is also loaded by its entry point
# once the project is installed (same name, so it is registered once)
pytest_plugins = ["pytester", "sequencecheck.testing.pytest_plugin"]


def run_cli(*args: str, cwd: Path | None = None) -> subprocess.CompletedProcess[str]:
    """Run ``python -m sequencecheck`` in a subprocess with this checkout on the path."""
    env = dict(os.environ, PYTHONPATH=str(ROOT), NO_COLOR="1")
    return subprocess.run(
        [sys.executable, "-m", "sequencecheck", *args],
        capture_output=True,
        text=True,
        cwd=cwd or ROOT,
        env=env,
        timeout=120,
    )


@pytest.fixture
def write_csv(tmp_path: Path):
    """Write CSV text to a temporary file and return its path."""

    def _write(text: str, name: str = "capture.csv") -> str:
        path = tmp_path / name
        path.write_text(text)
        return str(path)

    return _write

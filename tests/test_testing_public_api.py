"""sequencecheck.testing: __all__ is complete and sorted, documented, and light to import."""

from __future__ import annotations

import inspect
import subprocess
import sys

from conftest import ROOT

import sequencecheck.testing as kit
from sequencecheck.testing import _assertions, _commands, _recorder, _strategies

MODULES = (_assertions, _commands, _recorder, _strategies)


def test_all_is_complete_and_sorted():
    public = {name for m in MODULES for name in m.__all__}
    assert set(kit.__all__) == public
    # constants, then classes, then functions, each alphabetical
    assert kit.__all__ == sorted(kit.__all__, key=lambda n: (2 - n.isupper() - n[0].isupper(), n))
    for name in kit.__all__:
        assert getattr(kit, name) is getattr(next(m for m in MODULES if name in m.__all__), name)
    assert set(dir(kit)) >= set(kit.__all__)


def test_every_public_callable_is_documented():
    for name in kit.__all__:
        obj = getattr(kit, name)
        if callable(obj):
            assert inspect.getdoc(obj), name


def test_strategies_take_keyword_only_options_and_say_what_they_shrink_toward():
    for name in ("command_sequences", "edge_traces", "pwm_settings"):
        fn = getattr(kit, name)
        params = inspect.signature(fn).parameters.values()
        assert all(p.kind is inspect.Parameter.KEYWORD_ONLY for p in params), name
        assert "Shrinks toward" in inspect.getdoc(fn), name


def test_hypothesis_is_imported_only_when_a_strategy_is_used():
    code = (
        "import sys, sequencecheck, sequencecheck.testing, sequencecheck.testing.pytest_plugin\n"
        "assert 'hypothesis' not in sys.modules, 'imported too early'\n"
        "sequencecheck.testing.command_sequences\n"
        "assert 'hypothesis' in sys.modules\n"
    )
    subprocess.run([sys.executable, "-c", code], check=True, cwd=ROOT, timeout=60)

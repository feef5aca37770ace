"""pytest plugin: the ``gate_recorder`` fixture and the ``gate_check`` marker.

Loaded automatically once sequencecheck is installed (entry point ``pytest11``),
or explicitly with ``-p sequencecheck.testing.pytest_plugin``. A test that asks
for ``gate_recorder`` gets a fresh Recorder; when the test body has passed, the
recorded trace is checked with ``assert_safe`` and the test fails with the
findings if it is not safe. Mark the test to choose what is checked::

    @pytest.mark.gate_check(bridge=PUMP_BRIDGE, policy=Policy(dead_time=DeadTime.both(200_000)))
    def test_ramp(gate_recorder):
        run_my_controller(gate_recorder)

Without ``bridge`` the legs are guessed from the channel names (``AH``/``AL``,
``A_H``/``A_L``...); without ``policy`` only the requirements every bridge has
(no shoot-through) fail the test. ``check=False`` turns the end-of-test check off.
The fixture is function-scoped: inside a hypothesis ``@given`` test, build a
``Recorder`` per example and call ``assert_safe`` instead.
"""

from __future__ import annotations

from collections.abc import Generator
from typing import Any

import pytest

from ..legs import legs_or_guess
from ..model import Bridge, Policy
from ._assertions import assert_safe
from ._recorder import Recorder

__all__ = ["gate_recorder"]

MARKER = "gate_check"
_OPTIONS = ("bridge", "policy", "check")
_STATE = pytest.StashKey[tuple[Recorder, Bridge | None, Policy | None, bool]]()


def pytest_configure(config: pytest.Config) -> None:
    config.addinivalue_line(
        "markers",
        f"{MARKER}(bridge=None, policy=None, check=True): bridge and policy the gate_recorder "
        "fixture checks the recorded trace against at the end of the test (sequencecheck)",
    )


def _options(item: pytest.Item) -> dict[str, Any]:
    marker = item.get_closest_marker(MARKER)
    if marker is None:
        return {}
    if marker.args:
        raise pytest.UsageError(
            f"{item.nodeid}: @pytest.mark.{MARKER} takes keyword arguments only "
            f"({', '.join(_OPTIONS)}), got {len(marker.args)} positional"
        )
    unknown = sorted(set(marker.kwargs) - set(_OPTIONS))
    if unknown:
        raise pytest.UsageError(
            f"{item.nodeid}: @pytest.mark.{MARKER} does not take {', '.join(unknown)} "
            f"(it takes {', '.join(_OPTIONS)})"
        )
    opts = dict(marker.kwargs)
    if opts.get("bridge") is not None and not isinstance(opts["bridge"], Bridge):
        raise pytest.UsageError(f"{item.nodeid}: {MARKER}(bridge=...) must be a Bridge")
    if opts.get("policy") is not None and not isinstance(opts["policy"], Policy):
        raise pytest.UsageError(f"{item.nodeid}: {MARKER}(policy=...) must be a Policy")
    return opts


@pytest.fixture
def gate_recorder(request: pytest.FixtureRequest) -> Recorder:
    """A Recorder whose trace is checked with assert_safe when the test body passes."""
    opts = _options(request.node)
    recorder = Recorder(name=request.node.nodeid)
    request.node.stash[_STATE] = (
        recorder,
        opts.get("bridge"),
        opts.get("policy"),
        bool(opts.get("check", True)),
    )
    return recorder


@pytest.hookimpl(wrapper=True)
def pytest_runtest_call(item: pytest.Item) -> Generator[None, None, None]:
    result = yield  # re-raises when the test body failed: that failure is reported as is
    state = item.stash.get(_STATE, None)
    if state is not None:
        recorder, bridge, policy, check = state
        if check:
            _check_recording(recorder, bridge, policy)
    return result


def _check_recording(recorder: Recorder, bridge: Bridge | None, policy: Policy | None) -> None:
    __tracebackhide__ = True
    if not recorder.channels:
        raise AssertionError(
            f"gate_recorder: nothing was recorded in {recorder.name}; "
            f"set channel levels or mark the test {MARKER}(check=False)"
        )
    trace = recorder.trace()
    if bridge is None:
        bridge = Bridge(legs_or_guess((), list(trace.channels), trace.path))
    assert_safe(trace, bridge, policy)

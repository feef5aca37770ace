"""mode-transition skips decoding exactly when nothing could be found: without a states
summary and with a policy that checks no change of state, findings, margins and counts
are those of the full decode (checked against it on the brute-force suite's traces)."""

from __future__ import annotations

from dataclasses import replace
from unittest import mock

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from test_modes_properties import cases, make_trace

from sequencecheck import Policy, check_trace
from sequencecheck.model import TransitionPolicy, TransitionRule
from sequencecheck.rules import _states, modes
from sequencecheck.rules._transitions import compile_policy


def _outcome(report):
    return (
        sorted((f.rule, f.start_ps, f.end_ps, f.message) for f in report.findings),
        sorted((m.rule, m.leg, m.margin_ps) for m in report.margins),
        dict(report.unlisted),
    )


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(cases(), st.data())
def test_skipping_changes_nothing_but_the_summary(case, data):
    bridge, spec, width, max_gap = case
    names = _states.StateNamer(bridge).possible_names()
    plain = sorted(set(names) - {"fault", "unknown"})
    banned = data.draw(st.lists(st.tuples(*[st.sampled_from(plain)] * 2), max_size=2))
    dwell_in = data.draw(st.dictionaries(st.sampled_from(plain), st.integers(1, 30), max_size=2))
    rules = tuple(TransitionRule(a, b, allowed=False) for a, b in sorted(set(banned)) if a != b)
    tp = TransitionPolicy(
        rules=rules,
        min_dwell_in=dwell_in,
        scheme=data.draw(st.sampled_from(["sign-magnitude", "locked-anti-phase"])),
        handover_max_ps=max_gap,
    )
    policy = Policy(
        reversal_dwell_ps=data.draw(st.none() | st.none() | st.integers(1, 12)),
        transitions=tp,
    )
    trace = make_trace(spec, width)
    full = check_trace(trace, bridge, policy)
    with mock.patch.object(modes, "decode", wraps=_states.decode) as decode:
        lean = check_trace(trace, bridge, replace(policy, state_summary=False))
    assert _outcome(lean) == _outcome(full)
    assert "states" in full.extra and "states" not in lean.extra
    reversal = policy.reversal_dwell_ps is not None and {"forward", "reverse"} <= set(names)
    needed = bool(rules or dwell_in or reversal)  # what the policy asks, read off directly
    assert compile_policy(policy, names, len(bridge.legs)).checks_anything() == needed
    assert decode.called == needed

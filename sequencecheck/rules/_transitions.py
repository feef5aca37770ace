"""A transition policy checked for sense and turned into arrays the mode rule can use.

Meaning of a policy (``TransitionPolicy``):

- A rule ``from -> to`` with ``allowed=False`` forbids the change; ``*`` matches any
  state. The most specific rule decides a change: the exact pair, else the rules with
  one ``*`` (if one of those forbids the change, it is forbidden), else ``* -> *``.
  A change no rule matches is allowed.
- A rule with ``min_dwell_ps`` allows ``from -> to`` only after at least that long
  between leaving ``from`` and entering ``to`` (whatever the bridge does between).
  Both states must be named.
- ``min_dwell_in[state]`` is the least time the bridge must stay in ``state``.
- Changes into or out of ``fault`` (shoot-through reports them) and ``unknown``
  (unknown-state reports them) are never reported as forbidden.

Defaults for a two-leg bridge, when ``Policy.reversal_dwell_ps`` is set: under
``sign-magnitude``, ``forward -> reverse`` and ``reverse -> forward`` need that dwell
(unless the policy has its own rule for the pair); under ``locked-anti-phase`` the
dwell is checked on the direction of each PWM period instead (see modes.py).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..model import Policy, Source, TransitionPolicy, TransitionRule
from ._states import FAULT, UNKNOWN

__all__ = ["SCHEMES", "CompiledPolicy", "DwellRule", "compile_policy"]

SCHEMES = ("sign-magnitude", "locked-anti-phase")
ANY = "*"


@dataclass(frozen=True, slots=True)
class DwellRule:
    """Least time between leaving ``from_state`` and entering ``to_state``."""

    from_state: str
    to_state: str
    min_dwell_ps: int
    source: Source | None = None
    reversal: bool = False  # the default reversal dwell of a two-leg bridge


@dataclass(frozen=True)
class CompiledPolicy:
    """A checked policy over the bridge's state names."""

    forbidden: np.ndarray  # bool matrix [from, to] over ``names``
    dwell_rules: tuple[DwellRule, ...]
    min_dwell_in: dict[str, int]
    scheme: str
    reversal_dwell_ps: int | None  # locked anti-phase: least time near 50 % duty
    neutral_band_ppm: int
    handover_max_ps: int | None

    def checks_anything(self) -> bool:
        """False when no change of state can break this policy."""
        return bool(
            self.forbidden.any()
            or self.dwell_rules
            or self.min_dwell_in
            or self.reversal_dwell_ps is not None
        )


def _error(message: str, rule: TransitionRule | None, tp: TransitionPolicy) -> InputError:
    src = None if rule is None else rule.source
    if src is not None:
        return InputError(message, path=src.path, line=src.line, column=src.column)
    return InputError(message, path=tp.source)


def _check_names(tp: TransitionPolicy, known: tuple[str, ...]) -> None:
    listing = ", ".join(known)
    for rule in tp.rules:
        for name in (rule.from_state, rule.to_state):
            if name != ANY and name not in known:
                raise _error(
                    f"transition rule names unknown state {name!r} (states: {listing})", rule, tp
                )
        if rule.from_state == rule.to_state and rule.from_state != ANY:
            raise _error(
                f"transition rule {rule.from_state} -> {rule.to_state}: a state cannot change "
                "into itself",
                rule,
                tp,
            )
        if rule.min_dwell_ps is not None:
            if rule.min_dwell_ps < 0:
                raise _error("a minimum dwell must not be negative", rule, tp)
            if ANY in (rule.from_state, rule.to_state):
                raise _error(
                    f"transition rule {rule.from_state} -> {rule.to_state}: a minimum dwell "
                    "between two states needs both states named (no '*')",
                    rule,
                    tp,
                )
    for name, ps in tp.min_dwell_in.items():
        if name not in known:
            raise _error(
                f"minimum dwell names unknown state {name!r} (states: {listing})", None, tp
            )
        if ps < 0:
            raise _error(f"minimum dwell in {name!r} must not be negative", None, tp)
    if tp.scheme not in SCHEMES:
        raise _error(
            f"unknown PWM scheme {tp.scheme!r}, expected one of {', '.join(SCHEMES)}", None, tp
        )
    if tp.handover_max_ps is not None and tp.handover_max_ps < 0:
        raise _error("the longest hand-over gap must not be negative", None, tp)
    if not 0 <= tp.neutral_band_ppm < 500_000:
        raise _error("the band around 50 % duty must be at least 0 and under 50 %", None, tp)


def _check_contradictions(tp: TransitionPolicy) -> None:
    verdict: dict[tuple[str, str], TransitionRule] = {}
    for rule in tp.rules:
        key = (rule.from_state, rule.to_state)
        earlier = verdict.get(key)
        if earlier is not None and earlier.allowed != rule.allowed:
            where = f" (see {earlier.source})" if earlier.source is not None else ""
            raise _error(
                f"transition {key[0]} -> {key[1]} is both allowed and forbidden{where}",
                rule,
                tp,
            )
        if earlier is None or not rule.allowed:
            verdict[key] = rule


def _forbidden_matrix(tp: TransitionPolicy, names: tuple[str, ...]) -> np.ndarray:
    n = len(names)
    index = {nm: i for i, nm in enumerate(names)}
    # -1 no rule, 0 allowed, 1 forbidden; one layer per specificity
    exact = np.full((n, n), -1, dtype=np.int8)
    single = np.full((n, n), -1, dtype=np.int8)
    anything = -1
    for rule in tp.rules:
        value = 0 if rule.allowed else 1
        f, t = rule.from_state, rule.to_state
        if f != ANY and t != ANY:
            exact[index[f], index[t]] = max(exact[index[f], index[t]], value)
        elif f != ANY:
            row = single[index[f], :]
            np.maximum(row, value, out=row)
        elif t != ANY:
            col = single[:, index[t]]
            np.maximum(col, value, out=col)
        else:
            anything = max(anything, value)
    decided = np.where(exact >= 0, exact, np.where(single >= 0, single, anything))
    forbidden = decided == 1
    for special in (FAULT, UNKNOWN):
        if special in index:
            forbidden[index[special], :] = False
            forbidden[:, index[special]] = False
    np.fill_diagonal(forbidden, False)
    return forbidden


def compile_policy(policy: Policy, names: tuple[str, ...], n_legs: int) -> CompiledPolicy:
    """Check the policy against the bridge's ``names`` (InputError if it makes no sense)."""
    given = policy.transitions
    if given is not None and not isinstance(given, TransitionPolicy):
        raise InputError(f"not a transition policy: {given!r}")
    tp = given if given is not None else TransitionPolicy()
    _check_names(tp, names)
    _check_contradictions(tp)
    dwell = [
        DwellRule(r.from_state, r.to_state, int(r.min_dwell_ps), r.source)
        for r in tp.rules
        if r.allowed and r.min_dwell_ps is not None
    ]
    reversal = policy.reversal_dwell_ps
    lap_dwell = None
    if n_legs == 2 and reversal is not None and {"forward", "reverse"} <= set(names):
        if tp.scheme == "sign-magnitude":
            own = {(r.from_state, r.to_state) for r in tp.rules}
            for pair in (("forward", "reverse"), ("reverse", "forward")):
                if pair not in own:
                    dwell.append(DwellRule(pair[0], pair[1], reversal, reversal=True))
        else:
            lap_dwell = reversal
    return CompiledPolicy(
        forbidden=_forbidden_matrix(tp, names),
        dwell_rules=tuple(dwell),
        min_dwell_in=dict(tp.min_dwell_in),
        scheme=tp.scheme,
        reversal_dwell_ps=lap_dwell,
        neutral_band_ppm=tp.neutral_band_ppm,
        handover_max_ps=tp.handover_max_ps,
    )

"""Exact per-group sums of int64 values, without ``np.add.at`` (slow on large arrays)."""

from __future__ import annotations

import numpy as np

__all__ = ["sum_by"]

_LOW_BITS = 26  # a float64 sum of under 2**27 values below 2**26 stays exact


def sum_by(groups: np.ndarray, values: np.ndarray, n: int) -> np.ndarray:
    """``out[g] = sum(values[groups == g])`` for ``g`` in ``range(n)``, as exact int64.

    ``values`` must be non-negative. When no sum can reach 2**53 (largest value times
    count below it), one weighted ``np.bincount`` is exact: every partial sum is an
    integer float64 holds exactly. Otherwise two, on the low and the high bits of each
    value, so that each float64 sum stays exact.
    """
    values = np.asarray(values, dtype=np.int64)
    if values.size == 0:
        return np.zeros(n, dtype=np.int64)
    negative = int(values.min()) < 0
    if not negative and int(values.max()) * values.size < 1 << 53:
        return np.bincount(groups, weights=values, minlength=n).astype(np.int64)
    if negative or values.size >= 1 << (53 - _LOW_BITS):
        out = np.zeros(n, dtype=np.int64)
        np.add.at(out, groups, values)
        return out
    low = np.bincount(groups, weights=values & ((1 << _LOW_BITS) - 1), minlength=n)
    high = np.bincount(groups, weights=values >> _LOW_BITS, minlength=n)
    return (high.astype(np.int64) << _LOW_BITS) + low.astype(np.int64)

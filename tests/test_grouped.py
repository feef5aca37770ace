"""Exact grouped sums against numpy's unbuffered ``np.add.at`` (general-purpose library)."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from sequencecheck.rules._grouped import sum_by


@settings(max_examples=200, deadline=None)
@given(
    st.integers(1, 6).flatmap(
        lambda n: st.tuples(
            st.just(n),
            st.lists(
                st.tuples(
                    st.integers(0, n - 1),
                    st.sampled_from([2**10, 2**47, 2**52, 2**62 // 64]).flatmap(
                        lambda top: st.integers(0, top)  # one bincount or two
                    ),
                ),
                max_size=60,
            ),
        )
    )
)
def test_sum_by_matches_add_at(case):
    n, pairs = case
    groups = np.array([g for g, _ in pairs], dtype=np.int64)
    values = np.array([v for _, v in pairs], dtype=np.int64)
    expected = np.zeros(n, dtype=np.int64)
    np.add.at(expected, groups, values)
    got = sum_by(groups, values, n)
    assert got.dtype == np.int64
    assert got.tolist() == expected.tolist()


def test_sum_by_stays_exact_past_float_precision():
    values = np.full(1000, 2**53 // 1000 + 12345, dtype=np.int64)
    groups = np.zeros(1000, dtype=np.int64)
    assert int(sum_by(groups, values, 1)[0]) == 1000 * (2**53 // 1000 + 12345)


def test_one_bincount_is_exact_up_to_just_below_2_to_53():
    values = np.array([2**52 - 1, 2**52 - 1, 3], dtype=np.int64)  # max * size < 2**53? no
    groups = np.zeros(3, dtype=np.int64)
    assert int(sum_by(groups, values, 1)[0]) == 2**53 + 1  # two bincounts: exact past 2**53
    values = np.array([2**52 - 1, 2**52 - 1], dtype=np.int64)  # max * size = 2**53 - 2
    assert int(sum_by(groups[:2], values, 1)[0]) == 2**53 - 2  # one bincount, exact

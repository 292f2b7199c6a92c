"""The integer sets the label and break tests use (kitgen.geometry.arrays)
give what NumPy's own set routines give (reference: ``numpy.unique`` and
``numpy.setdiff1d``, NumPy's documented results), on arrays Hypothesis
draws: duplicates, negatives, empty arrays, one element."""

from __future__ import annotations

import numpy as np
from hypothesis import given
from hypothesis import strategies as st

from kitgen.geometry.arrays import ints_not_in, unique_ints

INTS = st.lists(st.integers(min_value=-2**40, max_value=2**40), max_size=60)
SMALL = st.lists(st.integers(min_value=-5, max_value=5), max_size=30)   # many repeats


@given(st.one_of(INTS, SMALL))
def test_unique_ints_is_numpys_unique(values):
    a = np.array(values, dtype=np.int64)
    got = unique_ints(a)
    assert got.dtype == a.dtype
    assert got.tolist() == np.unique(a).tolist()


@given(st.one_of(INTS, SMALL), st.one_of(INTS, SMALL))
def test_ints_not_in_is_numpys_setdiff1d(values, taken):
    a, b = np.array(values, dtype=np.int64), np.array(taken, dtype=np.int64)
    assert ints_not_in(a, unique_ints(b)).tolist() == np.setdiff1d(a, b).tolist()


def test_a_worked_case():
    # written out by hand: the distinct values, and those not taken
    assert unique_ints(np.array([7, -1, 7, 3, -1])).tolist() == [-1, 3, 7]
    assert ints_not_in(np.array([5, 1, 5, 9, 2]), np.array([2, 5])).tolist() == [1, 9]

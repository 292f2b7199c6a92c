"""Sets of integers as sorted NumPy arrays, without NumPy's set routines.

``np.unique`` and ``np.setdiff1d`` import ``numpy.ma`` on their first
call (NumPy 2, to test for masked input): about 18 ms of every process
that draws a kit, for keys that need only a sort (#12).
"""

from __future__ import annotations

import numpy as np


def unique_ints(values) -> np.ndarray:
    """The distinct values of an integer array, ascending: what
    ``np.unique`` returns for it."""
    ordered = np.sort(np.asarray(values).ravel())
    if len(ordered) < 2:
        return ordered
    first = np.empty(len(ordered), dtype=bool)
    first[0] = True
    np.not_equal(ordered[1:], ordered[:-1], out=first[1:])
    return ordered[first]


def ints_not_in(values, taken) -> np.ndarray:
    """The distinct values of ``values`` that are not in ``taken`` (an
    ascending array of distinct integers, as :func:`unique_ints` gives),
    ascending: what ``np.setdiff1d(values, taken)`` returns."""
    distinct = unique_ints(values)
    if len(taken) == 0 or len(distinct) == 0:
        return distinct
    at = np.minimum(np.searchsorted(taken, distinct), len(taken) - 1)
    return distinct[taken[at] != distinct]

"""The pictures' sampling of their lines and the search for each leader's
clear end (#12), against their plain definitions computed by other means.

References:
* ``numpy.linspace`` (NumPy's documented evenly spaced samples): the points
  :func:`kitgen.layout.figures.sample` puts along each side of a polyline
  are ``a + t (b - a)`` at ``t = linspace(0, 1, n + 1)[1:]``, bit for bit;
* Shapely/GEOS point distances (``Point.distance(MultiPoint)``): the
  nearest other point's distance, where it is below the reach, within a
  rounding error; and bit for bit the brute-force ``numpy.hypot`` over
  every pair, which the pictures gave before (#12).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from shapely.geometry import MultiPoint, Point

from kitgen.geometry import model
from kitgen.layout.figures import _nearest_mm, sample


def _by_linspace(points, step_mm):
    out = [np.asarray(points[0], dtype=float)]
    for a, b in zip(points[:-1], points[1:]):
        n = max(1, int(math.dist(a, b) / step_mm))
        t = np.linspace(0.0, 1.0, n + 1)[1:, None]
        out += list(np.asarray(a, dtype=float) + t * (np.asarray(b, dtype=float) - np.asarray(a, dtype=float)))
    return np.array(out)


@pytest.mark.parametrize("seed", range(6))
@pytest.mark.parametrize("step_mm", [0.5, 1.0, 5.0, 0.013])
def test_a_polyline_is_sampled_as_linspace_samples_each_side(seed, step_mm):
    rng = np.random.default_rng(seed)
    points = [tuple(p) for p in rng.uniform(-80.0, 80.0, (int(rng.integers(2, 40)), 2))]
    points[1] = (round(points[1][0]), round(points[1][1]))   # integer places too
    got = sample(model.polyline("x", points, False, "light"), step_mm)
    want = _by_linspace(points, step_mm)
    assert got.shape == want.shape and got.tobytes() == want.tobytes()


def test_a_segment_is_sampled_to_its_far_end():
    got = sample(model.segment("x", (0.0, 0.0), (3.0, 4.0), "light"), 1.0)
    assert len(got) == 6 and tuple(got[-1]) == (3.0, 4.0)    # 5 mm long: 5 steps of 1 mm, numpy.linspace
    assert tuple(got[1]) == (0.6000000000000001, 0.8)         # 3 * (1 * 0.2) and 4 * (1 * 0.2) in doubles


@pytest.mark.parametrize("seed", range(8))
def test_the_nearest_other_point_within_the_reach(seed):
    rng = np.random.default_rng(seed)
    scale = (1.0, 6.0, 40.0)[seed % 3]
    pts = rng.uniform(-scale, scale, (50, 2))
    others = rng.uniform(-scale, scale, (300, 2))
    if seed % 2:   # on a half-millimetre lattice: distances of exactly the reach
        pts, others = np.round(pts * 2) / 2, np.round(others * 2) / 2
    reach = 1.5
    got = _nearest_mm(pts, others, reach)
    hull = MultiPoint([tuple(q) for q in others])
    for p, g in zip(pts, got):
        assert g == pytest.approx(min(Point(tuple(p)).distance(hull), reach), abs=1e-12)
    every = np.min(np.hypot(pts[:, None, 0] - others[None, :, 0], pts[:, None, 1] - others[None, :, 1]), axis=1)
    assert np.minimum(got, reach).tobytes() == np.minimum(every, reach).tobytes()


def test_no_other_point_leaves_the_reach():
    assert _nearest_mm(np.zeros((3, 2)), np.zeros((0, 2)), 1.5).tolist() == [1.5, 1.5, 1.5]
    assert _nearest_mm(np.zeros((1, 2)), np.array([[3.0, 4.0]]), 1.5).tolist() == [1.5]   # 5 mm off, Pythagoras
    assert _nearest_mm(np.zeros((1, 2)), np.array([[0.6, 0.8]]), 1.5).tolist() == [1.0]  # 1 mm off

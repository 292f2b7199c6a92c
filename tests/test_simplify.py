"""Polyline simplification (kitgen.geometry.simplify, #12) against
Shapely's ``simplify(tolerance, preserve_topology=False)``, the GEOS
implementation of the Ramer–Douglas–Peucker rule, and against the rule's
own bound: every dropped vertex within the tolerance of the kept line."""

from __future__ import annotations

import math

import numpy as np
import pytest
from shapely.geometry import LineString, Point

from kitgen.geometry.simplify import simplified


def _curves():
    t = np.linspace(0.0, 1.0, 400)
    yield np.stack([60 * t, 5 * np.sin(9 * t)], axis=1)                 # a wave
    a = np.radians(np.linspace(10.0, 170.0, 300))
    yield np.stack([40 * np.cos(a), 40 * np.sin(a)], axis=1)             # an arc
    r = 30 + 3 * np.cos(5 * a)
    yield np.stack([r * np.cos(a), 0.4 * r * np.sin(a)], axis=1)         # an oblique, wavy rim


@pytest.mark.parametrize("tolerance_mm", [0.005, 0.02, 0.1])
@pytest.mark.parametrize("k", range(3))
def test_as_geos(k, tolerance_mm):
    pts = list(_curves())[k]
    ours = simplified(pts, tolerance_mm)
    # Reference: Shapely 2 / GEOS DouglasPeuckerLineSimplifier.
    ref = list(LineString(pts).simplify(tolerance_mm, preserve_topology=False).coords)
    assert len(ours) < len(pts)
    if k == 1:
        # A circle's arc, evenly sampled, ties many vertices for the farthest
        # to rounding: the two may pick different ones, of equal number.
        assert abs(len(ours) - len(ref)) <= 2
    else:
        assert np.allclose(ours, ref, atol=1e-12)


@pytest.mark.parametrize("k", range(3))
def test_every_dropped_vertex_within_the_tolerance(k):
    pts = list(_curves())[k]
    kept = LineString(simplified(pts, 0.02))
    assert max(kept.distance(Point(p)) for p in pts) <= 0.02 + 1e-12
    assert tuple(kept.coords[0]) == tuple(pts[0]) and tuple(kept.coords[-1]) == tuple(pts[-1])


def test_short_lines_kept_whole():
    assert simplified([(0.0, 0.0), (1.0, 1.0)], 0.1) == [(0.0, 0.0), (1.0, 1.0)]
    assert math.isclose(simplified([(0, 0), (1, 0.001), (2, 0)], 0.01)[-1][0], 2.0)

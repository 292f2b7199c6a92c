"""The plate's stroke index (kitgen.parts.stroke_index) finds every line
that comes near a place: tested against Shapely/GEOS's distances between
the lines and random points, a general-purpose reference library (GEOS's
``distance``, exact for segments; its circles are taken as polylines of
0.05 mm chords, within a micrometre of the circle)."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from kitgen.geometry import model
from kitgen.parts.stroke_index import StrokeIndex

shapely = pytest.importorskip("shapely")
from shapely.geometry import LineString, Point  # noqa: E402

coord = st.floats(-60, 60)


def _elements(draw):
    els = []
    for _ in range(draw(st.integers(1, 8))):
        kind = draw(st.sampled_from(["circle", "arc", "segment", "polyline"]))
        if kind == "circle":
            els.append(model.circle("x", (draw(coord), draw(coord)), draw(st.floats(0.1, 80))))
        elif kind == "arc":
            a = draw(st.floats(-360, 360))
            els.append(model.arc("x", (draw(coord), draw(coord)), draw(st.floats(0.1, 80)), a,
                                 a + draw(st.floats(0.5, 359))))
        elif kind == "segment":
            els.append(model.segment("x", (draw(coord), draw(coord)), (draw(coord), draw(coord))))
        else:
            pts = [(draw(coord), draw(coord)) for _ in range(draw(st.integers(2, 6)))]
            els.append(model.polyline("x", pts, draw(st.booleans())))
    return els


def _shape(el):
    g = el.geom
    if el.shape in ("circle", "arc"):
        (cx, cy), r = g["center"], g["radius"]
        lo, hi = (0.0, 2 * math.pi) if el.shape == "circle" else (math.radians(g["start_deg"]),
                                                                 math.radians(g["end_deg"]))
        n = max(2, int((hi - lo) * r / 0.05))
        return LineString([(cx + r * math.cos(lo + (hi - lo) * k / n), cy + r * math.sin(lo + (hi - lo) * k / n))
                           for k in range(n + 1)])
    pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"])
    if el.shape == "polyline" and g["closed"]:
        pts.append(pts[0])
    return LineString(pts)


@settings(max_examples=30, deadline=None)
@given(data=st.data())
def test_every_line_within_reach_is_found(data):
    els = _elements(data.draw)
    index = StrokeIndex()
    index.enter(els)
    shapes = [_shape(el) for el in els]
    for _ in range(20):
        p = (data.draw(coord), data.draw(coord))
        reach = data.draw(st.floats(0.0, 12.0))
        found = index.near(p, reach)
        for el, shape in zip(els, shapes):
            if shape.distance(Point(p)) < reach - 0.005:
                assert id(el) in found, (el, p, reach)


def test_far_lines_are_not_returned():
    # A circle of radius 10 about the origin and a point 30 mm out: a query
    # of 2 mm reads only cells at least 20 mm from every point of it.
    circle = model.circle("x", (0.0, 0.0), 10.0)
    index = StrokeIndex()
    index.enter([circle])
    assert index.near((30.0, 0.0), 2.0) == {}
    assert id(circle) in index.near((12.0, 0.0), 2.5)

"""Whether a line runs through a label's box (kitgen.parts.breaks.meets,
with its quick tests by distances, arc angles and grid cells, #12) and
whether two boxes overlap (boxes_overlap), tested against Shapely/GEOS,
a general-purpose reference library: a line runs through a box where
GEOS finds it crossing the box shrunk by a micrometre margin, and not
where it misses the box grown by that margin (GEOS's segments are exact;
its circles are taken as polylines of chords within a tenth of a
micrometre of the circle); cases within the margin are left out."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from kitgen.geometry import model
from kitgen.parts.breaks import Box, boxes_overlap, meets

shapely = pytest.importorskip("shapely")
from shapely.geometry import Polygon  # noqa: E402

from tests.geos_lines import stroke_line  # noqa: E402

MARGIN_MM = 1e-3
coord = st.floats(-60, 60)


@st.composite
def boxes(draw):
    angle = draw(st.one_of(st.just(0.0), st.just(math.pi / 2), st.floats(-math.pi, math.pi)))
    return Box((draw(coord), draw(coord)), angle, draw(st.floats(0.05, 15)), draw(st.floats(0.05, 4)))


@st.composite
def strokes(draw, box):
    kind = draw(st.sampled_from(["circle", "arc", "segment", "polyline"]))
    if kind in ("circle", "arc"):
        center = (draw(st.one_of(st.just(0.0), coord)), draw(st.floats(-300, 300)))
        # most circles near the box, as a label's places are
        r = max(0.1, math.dist(center, box.center) + draw(st.floats(-20, 20)))
        if kind == "circle":
            return model.circle("x", center, r)
        a = draw(st.floats(-360, 360))
        return model.arc("x", center, r, a, a + draw(st.floats(0.5, 359)))
    if kind == "segment":
        return model.segment("x", (draw(coord), draw(coord)), (draw(coord), draw(coord)))
    n = draw(st.integers(2, 120))
    c, rr = (draw(coord), draw(coord)), draw(st.floats(3, 60))
    pts = [(c[0] + rr * math.cos(k / 17), c[1] + rr * math.sin(k / 23)) for k in range(n)]
    return model.polyline("x", pts, draw(st.booleans()))


def _polygon(box: Box, grow: float) -> Polygon:
    return Polygon(box.grown(grow).corners())


@settings(max_examples=600, deadline=None)
@given(st.data())
def test_meets_agrees_with_geos(data):
    box = data.draw(boxes())
    el = data.draw(strokes(box))
    line = stroke_line(el)
    sure_in = line.intersects(_polygon(box, -MARGIN_MM))
    sure_out = not line.intersects(_polygon(box, MARGIN_MM))
    if sure_in:
        assert meets(el, box)
    elif sure_out:
        assert not meets(el, box)


def test_circle_through_a_corner_meets_the_box():
    # Found by the property test above: the circle enters the box at its
    # corner (2.05, 0.05), where rounding once lost the crossing, and leaves
    # by the left edge; GEOS finds it crossing the box shrunk by 1 um.
    box, el = Box((2.0, 0.0), 0.0, 0.05, 0.05), model.circle("x", (0.05, 2.0), 2.7932955446926844)
    assert stroke_line(el).intersects(_polygon(box, -MARGIN_MM))
    assert meets(el, box)


@settings(max_examples=600, deadline=None)
@given(boxes(), st.data())
def test_boxes_overlap_agrees_with_geos(a, data):
    # the second box often near the first, as labels crowd
    b = data.draw(st.one_of(boxes(), st.builds(
        lambda dx, dy, ang, w, h: Box((a.center[0] + dx, a.center[1] + dy), ang, w, h),
        st.floats(-8, 8), st.floats(-8, 8), st.floats(-math.pi, math.pi), st.floats(0.05, 15), st.floats(0.05, 4))))
    if _polygon(a, -MARGIN_MM).intersects(_polygon(b, -MARGIN_MM)):
        assert boxes_overlap(a, b) and boxes_overlap(b, a)
    elif not _polygon(a, MARGIN_MM).intersects(_polygon(b, MARGIN_MM)):
        assert not boxes_overlap(a, b) and not boxes_overlap(b, a)

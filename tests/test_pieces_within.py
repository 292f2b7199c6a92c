"""The plate's lines drawn again in the owner's slot, clear of the name
(kitgen.parts.breaks.pieces_within, #12): checked against Shapely/GEOS,
a general-purpose reference library of plane geometry, whose
intersection and difference of a line with rectangles are exact for
straight segments (a circle is taken as a polyline of 0.02 mm chords)."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from kitgen.geometry import model
from kitgen.parts.breaks import MIN_PIECE_MM, Box, pieces_within

shapely = pytest.importorskip("shapely")
from shapely.geometry import LineString, Polygon  # noqa: E402


def _rect(box: Box) -> Polygon:
    c, s = math.cos(box.angle_rad), math.sin(box.angle_rad)
    x, y = box.center
    return Polygon([(x + c * u - s * v, y + s * u + c * v) for u, v in
                    ((-box.half_w, -box.half_h), (box.half_w, -box.half_h), (box.half_w, box.half_h),
                     (-box.half_w, box.half_h))])


def _length(el) -> float:
    g = el.geom
    if el.shape == "arc":
        return math.radians(g["end_deg"] - g["start_deg"]) * g["radius"]
    return math.dist(g["from"], g["to"])


# (no subnormal numbers: a drawing in mm has none, and the reference, shapely
# (GEOS), buffers a segment 1e-313 mm off an axis into a wrong polygon)
coord = st.floats(-20, 20, allow_subnormal=False)


@settings(max_examples=60, deadline=None)
@given(slot=st.tuples(coord, coord, st.floats(2, 15), st.floats(0.5, 4)),
       at=st.tuples(st.floats(-1, 1), st.floats(-1, 1)),
       turn=st.floats(0, math.pi), reach=st.tuples(st.floats(0.5, 30), st.floats(0.5, 30)),
       name=st.tuples(st.floats(-3, 3), st.floats(-1, 1), st.floats(0.5, 8), st.floats(0.3, 2)))
def test_a_segment_in_the_slot_less_the_name(slot, at, turn, reach, name):
    # a segment through a point of the slot, the name's box near that point
    x, y = slot[0] + at[0] * slot[2], slot[1] + at[1] * slot[3]
    p = (x - reach[0] * math.cos(turn), y - reach[0] * math.sin(turn))
    q = (x + reach[1] * math.cos(turn), y + reach[1] * math.sin(turn))
    name = (x + name[0], y + name[1], name[2], name[3])
    el = model.segment("x", p, q)
    box = Box(slot[:2], 0.0, slot[2], slot[3])
    words = Box(name[:2], 0.0, name[2], name[3])
    got = pieces_within(el, box, [words])
    # Both boxes are open (a line along an edge is outside): the reference
    # is taken with the slot a hair smaller and the name a hair larger for
    # what must be drawn, and the other way round for what may be.
    line = LineString([p, q])
    must = line.intersection(_rect(box).buffer(-1e-7, join_style=2)).difference(
        _rect(words).buffer(1e-7, join_style=2))
    may = line.intersection(_rect(box).buffer(1e-7, join_style=2)).difference(
        _rect(words).buffer(-1e-7, join_style=2))
    # every piece lies in the slot and off the name ...
    for piece in got:
        drawn_line = LineString([piece.geom["from"], piece.geom["to"]])
        assert drawn_line.difference(may.buffer(1e-6)).length < 1e-6
    # ... and together they are the expected line, less only pieces shorter
    # than a stub that end at the name on both sides
    drawn = sum(_length(x) for x in got)
    dropped = [g.length for g in getattr(must, "geoms", [must]) if g.length < MIN_PIECE_MM]
    assert must.length - sum(dropped) - 1e-6 <= drawn <= may.length + 1e-6


def test_an_arc_in_the_slot_less_the_name():
    # A circle of radius 30 about the origin through a slot under it; the
    # name's box covers the bottom of the circle in the middle of the slot.
    el = model.circle("x", (0.0, 0.0), 30.0)
    box = Box((0.0, -30.0), 0.0, 10.0, 1.0)
    words = Box((0.0, -30.0), 0.0, 3.0, 1.5)
    got = pieces_within(el, box, [words])
    n = 20000
    ring = LineString([(30 * math.cos(2 * math.pi * k / n), 30 * math.sin(2 * math.pi * k / n))
                       for k in range(n + 1)])
    expected = ring.intersection(_rect(box)).difference(_rect(words))
    assert len(got) == 2
    assert sum(_length(x) for x in got) == pytest.approx(expected.length, abs=0.01)


def test_a_named_small_plate_has_no_line_of_no_length():
    """A plate whose owner's slot an azimuth circle only grazes (64 deg 8'
    N on A5, with its place's name, found by a class set's roster) drew the circle's piece in the
    slot as an arc from an angle to the same angle, which the PDF writer
    cannot draw (reportlab's bezierArc divides by the sine of half the
    extent): every arc and segment of every part now has a length, and
    the kit's PDF is written and read back (pypdf, an independent reader)."""
    import io

    from pypdf import PdfReader

    from kitgen.kit import build_kit
    from kitgen.recipe.load import parse_recipe_text
    from kitgen.render.pdf import build_pdf

    kit = build_kit(parse_recipe_text("latitude: 64 08 N\nplace: Nordvík Field Hut\nsheet: a5\n"
                                      "owner: Halla Þórsdóttir\nepoch: 2027\n"))
    for part in kit.parts:
        for el in part.elements:
            if el.shape in ("arc", "segment"):
                assert _length(el) > 1e-6, (part.id, el.role, el.geom)
    pages, data = build_pdf(kit)
    assert len(PdfReader(io.BytesIO(data)).pages) == len(pages)

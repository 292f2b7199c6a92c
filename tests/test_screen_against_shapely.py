"""Many label places tested at once against a plate's lines, as arrays
(kitgen.parts.breaks.arcs_meet_boxes and segments_meet_boxes, and the
plate labeller's Room.screen, Screen and Places built on them, #12):
checked against Shapely/GEOS, a general-purpose reference library.  A
pair the arrays call sure to meet must cross the box grown by a
micrometre in GEOS, one they call sure to miss must not cross it shrunk
by a micrometre, and each answer is that of breaks.meets; a place's
clearance, crossings and inside test are those of the one-box tests,
which GEOS confirms where the margin is wider than its chords' error."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from kitgen.geometry import model
from kitgen.parts.breaks import MEETS, MISSES, Box, arcs_meet_boxes, meets, segments_meet_boxes
from kitgen.parts.plate_labels import Places, Room, Screen

shapely = pytest.importorskip("shapely")
from shapely.geometry import Polygon  # noqa: E402

from tests.geos_lines import stroke_line  # noqa: E402
from tests.ci import examples

MARGIN_MM = 1e-3
coord = st.floats(-40, 40)


@st.composite
def strokes(draw, near):
    kind = draw(st.sampled_from(["circle", "arc", "segment", "polyline"]))
    if kind in ("circle", "arc"):
        center = (draw(coord), draw(st.floats(-200, 200)))
        # most near the places, as a label's lines are
        r = max(0.1, math.dist(center, near) + draw(st.floats(-6, 6)))
        if kind == "circle":
            return model.circle("x", center, r, "light")
        a = draw(st.floats(-360, 360))
        return model.arc("x", center, r, a, a + draw(st.floats(0.5, 359)), "fine")
    if kind == "segment":
        return model.segment("x", (draw(coord), draw(coord)), (draw(coord), draw(coord)), "medium")
    c, rr = (draw(coord), draw(coord)), draw(st.floats(3, 40))
    n = draw(st.integers(2, 60))
    return model.polyline("x", [(c[0] + rr * math.cos(k / 11), c[1] + rr * math.sin(k / 7)) for k in range(n)],
                          draw(st.booleans()), "fine")


@st.composite
def scenes(draw):
    near = (draw(coord), draw(coord))
    n = draw(st.integers(1, 40))
    angle = draw(st.one_of(st.just(0.0), st.floats(-math.pi / 2, math.pi / 2)))
    centers = [(near[0] + draw(st.floats(-8, 8)), near[1] + draw(st.floats(-8, 8))) for _ in range(n)]
    angles = [angle if draw(st.booleans()) else draw(st.floats(-math.pi / 2, math.pi / 2)) for _ in range(n)]
    els = [draw(strokes(near)) for _ in range(draw(st.integers(1, 8)))]
    return Places(centers, angles, draw(st.floats(0.05, 6)), draw(st.floats(0.05, 2))), els


@settings(max_examples=examples(300, 100), deadline=None)
@given(scenes(), st.floats(0.0, 1.5))
def test_arrays_agree_with_geos_and_meets(scene, grow_mm):
    places, els = scene
    for el in els:
        g = el.geom
        rows = (places.x[:, None], places.y[:, None], places.cos[:, None], places.sin[:, None],
                places.half_w, places.half_h)
        if el.shape in ("circle", "arc"):
            whole = el.shape == "circle"
            lo, hi = (0.0, 2 * math.pi) if whole else (math.radians(g["start_deg"]), math.radians(g["end_deg"]))
            got = arcs_meet_boxes(rows, grow_mm, g["center"][0], g["center"][1], g["radius"], lo, hi, whole)
            got = got[:, 0]
        else:
            pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"]) + (
                [g["points"][0]] if g["closed"] else [])
            p, q = np.array(pts[:-1]), np.array(pts[1:])
            each = segments_meet_boxes(rows, grow_mm, p[:, 0], p[:, 1], q[:, 0], q[:, 1])
            got = np.where((each == MEETS).any(axis=1), MEETS, np.where((each == MISSES).all(axis=1), MISSES, 2))
        line = stroke_line(el)
        for i, verdict in enumerate(got.tolist()):
            box = places.box(i).grown(grow_mm)
            if verdict == MEETS:
                assert meets(el, box)
                assert line.intersects(Polygon(box.grown(MARGIN_MM).corners()))
            elif verdict == MISSES:
                assert not meets(el, box)
                assert not line.intersects(Polygon(box.grown(-min(MARGIN_MM, box.half_h / 2)).corners()))


@settings(max_examples=examples(200, 60), deadline=None)
@given(scenes(), st.floats(0.01, 1.5), st.floats(20, 60))
def test_screen_gives_the_one_box_answers(scene, clear_mm, disc_mm):
    places, els = scene
    room = Room(disc_mm, None)
    room._half_width.update({"light": 0.05, "fine": 0.04, "medium": 0.1})   # line widths of no kit: any will do
    room._members(els)
    idx = np.arange(len(places))
    clear, crossing = Screen(room, places, idx, els, clear_mm), Screen(room, places, idx, els, clear_mm, widths=False)
    inside = places.inside(room)
    for i in range(len(places)):
        box = places.box(i)
        assert clear.clear(i) == room.clear_of(box, els, clear_mm)
        assert crossing.crossed(i) == room.crossed(box.grown(clear_mm), els)
        assert bool(inside[i]) == room.inside(box)
        # GEOS where its chords leave no doubt: each box grown by the
        # clearance and half the line's width, less or more a micrometre
        grown = [(stroke_line(el), clear_mm + room._half_width[el.stroke]) for el in els]
        if any(line.intersects(Polygon(box.grown(by - MARGIN_MM).corners())) for line, by in grown):
            assert not clear.clear(i)
        elif not any(line.intersects(Polygon(box.grown(by + MARGIN_MM).corners())) for line, by in grown):
            assert clear.clear(i)

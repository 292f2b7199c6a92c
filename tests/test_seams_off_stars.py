"""A tiled rete's seams cut no star's dot and no number (#9).

A rete too large for the sheet is printed in overlapping pieces and cut
along a seam in each overlap (kitgen.layout.tiling).  A dot cut in two
cannot be laid back exactly, and a number cut in two reads as two (the
review's 400 mm kit on A4: a seam through Orion, a dot on it, Gemini's 20
astride it).  So, for tiled retes at two sizes on A4 and one on Letter:

- no seam line passes through a drawn star's dot;
- no seam passes through a number of the ecliptic;
- a seam crosses a word only where every place it may take in its overlap
  (kitgen.layout.tiling.SEAM_SLIDE_MM about the middle, and
  PIN_CLEAR_MM from the pin) would come as near as many: near meaning
  within the seam line's keep (SEAM_KEEP_MM) and 0.2 mm more, for the
  difference between a word's advance, measured here, and its ink,
  which the layout measures.

References: the boxes are measured with the shipped fonts' own metrics
(``Words.measure``) and turned as the PDF sets them (``text_corners_mm``),
then as the part is placed (a rotation about the pin); a straight line
across the whole part meets a convex shape exactly when it meets the
shape's extent along the line's normal (the separating-axis theorem, as in
any computational geometry text, e.g. O'Rourke, Computational Geometry in
C, 2nd ed., sec. 7.5).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from kitgen.kit import build_kit
from kitgen.layout.pages import layout_kit
from kitgen.layout.tiling import OVERLAP_MM, PIN_CLEAR_MM, SEAM_KEEP_MM, SEAM_SLIDE_MM
from kitgen.recipe.load import parse_recipe_text
from kitgen.words.measure import text_corners_mm

KITS = [
    "latitude: 47.3\nsheet: a4\ndiameter_mm: 400\n",                  # the review's kit
    "latitude: 47.3\nsheet: a4\ndiameter_mm: 600\n",
    "latitude: -33.9\nsheet: letter\ndiameter_mm: 360\nlanguage: ar\n",
]


def _turn(p, deg):
    a = math.radians(deg)
    return (math.cos(a) * p[0] - math.sin(a) * p[1], math.sin(a) * p[0] + math.cos(a) * p[1])


@pytest.fixture(scope="module", params=KITS, ids=lambda h: h.replace("\n", " ").strip())
def tiled(request):
    kit = build_kit(parse_recipe_text("epoch: 2027\n" + request.param + "parts: [rete]\n"))
    pieces = [pl for page in layout_kit(kit) for pl in page.placements
              if pl.piece is not None and pl.part.kind == "rete"]
    assert len(pieces) >= 2
    return kit, pieces


def _extents(pl, words):
    """(role, text, (xmin, ymin, xmax, ymax)) of each word and star dot of
    the placed part."""
    out = []
    for e in pl.part.elements:
        if e.shape == "text" and e.geom["text"].strip():
            ext = words.measure(e.geom["text"], e.geom["size_pt"])
            corners = [_turn(c, pl.rotation_deg) for c in
                       text_corners_mm(e.geom["at"], ext.width_mm, ext.height_mm, e.geom["angle_deg"],
                                       e.geom["anchor"])]
            xs, ys = zip(*corners)
            out.append((e.role, e.geom["text"], (min(xs), min(ys), max(xs), max(ys))))
        elif e.role == "star" and e.stroke != "none":
            (x, y), r = _turn(e.geom["at"], pl.rotation_deg), e.values["radius_mm"]
            out.append(("star", e.values["name"], (x - r, y - r, x + r, y + r)))
    return out


def _seams(pieces):
    """Each seam once: (axis index, place, its overlap's middle, the side
    of the piece laid over it)."""
    out = {}
    for pl in pieces:
        x0, y0, x1, y1 = pl.piece.window_mm
        for axis, at in pl.piece.seams_mm:
            if axis == "x":
                out[("x", round(at, 6))] = (0, at, x0 + OVERLAP_MM / 2, 1.0)
            else:
                out[("y", round(at, 6))] = (1, at, y1 - OVERLAP_MM / 2, -1.0)
    return list(out.values())


def _crossed(things, axis, at, grown_mm=0.0):
    return [(role, text) for role, text, box in things if box[axis] - grown_mm < at < box[axis + 2] + grown_mm]


def test_no_seam_through_a_dot_or_a_number(tiled):
    kit, pieces = tiled
    things = _extents(pieces[0], kit.words)
    assert sum(role == "star" for role, _, _ in things) >= 20
    seams = _seams(pieces)
    assert seams
    for axis, at, _, _ in seams:
        hit = [c for c in _crossed(things, axis, at) if c[0] in ("star", "ecliptic_number")]
        assert not hit, (axis, at, hit)


def test_a_seam_crosses_a_word_only_where_its_overlap_leaves_no_clearer_place(tiled):
    kit, pieces = tiled
    words = [t for t in _extents(pieces[0], kit.words) if t[0] != "star"]
    over, under = SEAM_SLIDE_MM
    for axis, at, middle, later in _seams(pieces):
        places = middle + later * np.arange(-under, over + 1e-9, 0.05)
        places = [t for t in places if abs(t) >= PIN_CLEAR_MM]
        best = min(len(_crossed(words, axis, t, SEAM_KEEP_MM + 0.2)) for t in places)
        assert len(_crossed(words, axis, at)) <= best, (axis, at, _crossed(words, axis, at), best)

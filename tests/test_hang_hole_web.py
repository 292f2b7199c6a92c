"""The thread's hole keeps card round it (#9, #12 review): the hole for
the plumb's thread stands far enough inside the mater's cut edge that the
strip of card between them does not tear when the plumb hangs from it.

References, all common practice with no published source:
- a doubled sewing thread is well under 1 mm across, so a hole 1.4 mm
  across takes it;
- a strip of thin card under about 1 mm wide tears under a hanging
  weight (on A5 the hole had stood 0.3 mm from the edge);
- the labels' margin, 0.3 mm, of paper between the hole's cut line and
  the ticks below it.
The mater's cut circle and the hole are read from the drawn parts
themselves, not from the dimensions that place them.
"""

from __future__ import annotations

import math

import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text

PARTS = "parts: [mater_front, mater_back]\n"


def _circles(part, role: str):
    return [e for e in part.elements if e.role == role and e.shape == "circle"]


def _edge_and_hole(kit, kind: str):
    """(the radius of the part's outer cut circle, the hole's centre y
    and radius), as drawn."""
    part = kit.part(kind)
    (hole,) = _circles(part, "hang_hole")
    edge = max(e.geom["radius"] for e in part.elements
               if e.shape == "circle" and e.stroke == "cut" and e.role != "hang_hole")
    return edge, hole.geom["center"][1], hole.geom["radius"]


@pytest.mark.parametrize("head", ["sheet: a4\nlatitude: 51.5\n", "sheet: a5\nlatitude: 48.2\n",
                                  "sheet: letter\nlatitude: -33.9\n", "sheet: a5\nlatitude: 0.4\nlanguage: es\n",
                                  "sheet: a4\nlatitude: 30.0\nlanguage: ar\ndiameter_mm: 120\n"])
def test_a_millimetre_of_card_between_the_hole_and_the_edge(head):
    """On the usual sheets there is room for both: at least 1 mm of card
    outside the hole, and the hole at least 1.4 mm across, on both faces."""
    kit = build_kit(parse_recipe_text("epoch: 2027\n" + PARTS + head))
    for kind in ("mater_front", "mater_back"):
        edge, y, r = _edge_and_hole(kit, kind)
        assert 2 * r >= 1.4 - 1e-9, (kind, r)
        assert edge - (y + r) >= 1.0 - 1e-9, (kind, edge, y, r)


@pytest.mark.parametrize("diameter_mm", [80, 100, 110, 150, 200])
def test_the_web_is_kept_before_the_hole_grows(diameter_mm):
    """Whatever the size, the ring's outer share goes first to a hole big
    enough for the thread, then to up to 1 mm of card outside it, then to
    paper between the ticks and the hole's line, and only then to a
    bigger hole; never under the labels' margin on either side."""
    kit = build_kit(parse_recipe_text(f"epoch: 2027\n{PARTS}latitude: 45\ndiameter_mm: {diameter_mm}\n"))
    edge, y, r = _edge_and_hole(kit, "mater_front")
    d = kit.dims
    r_mater = d.mater_radius_mm
    low = max(d.hour_ring_outer_mm + 0.28 * (r_mater - d.hour_ring_outer_mm),
              d.back_altitude_ring_mm + 0.45 * (r_mater - d.back_altitude_ring_mm))
    share = edge - low
    web, below, across = edge - (y + r), (y - r) - low, 2 * r
    assert web >= 0.3 - 1e-9 and below >= 0.3 - 1e-9     # the labels' margin, always
    assert across <= 3.0 + 1e-9
    if share >= 1.4 + 0.3 + 0.3:                          # the thread's hole first
        assert across >= 1.4 - 1e-9
        assert web >= min(1.0, share - 1.4 - 0.3) - 1e-9   # then the card outside it
    # then the margin as paper between the ticks' square ends and the ink
    # of the hole's cut line (0.45 mm wide at these sizes: kitgen's style
    # table, geometry/style.py)
    if share >= 1.4 + 1.0 + 0.3 + 0.45 / 2:
        assert below >= 0.3 + 0.45 / 2 - 1e-9
    assert math.isclose(edge, r_mater)

"""An azimuth whose line ends on the rim is numbered there, on small
plates too (#12 review).

On an A5 plate at 45 deg N the lines of 120, 150, 210 and 240 deg run
from the zenith out to the rim among the almucantars' numbers, 2.5 mm
apart there, and no number fitted on a line: the plate left four of its
twelve thirties unnumbered.  Their numbers now stand just beyond the
line's end, in the ring between the rim and the plate's cut, set along
the ring; that ring is at least 2.6 mm wide, room for the smallest
numbers 0.5 mm clear of the cut's ink (kitgen.sky.rete_rim.MIN_RIM_RING_MM).
Numbering every 30 degrees of azimuth is common practice on printed
plates; the margins are the labels' own (kitgen.parts.labels.MARGIN_MM).

Distances are measured with Shapely (GEOS) between the numbers' ink
outlines and the drawn lines (tests.geos_lines), not with the labeller's
own boxes.  The kits are not those of the other plate tests: north and
south, small sheets and sizes, several languages.
"""

from __future__ import annotations

import math

import pytest
from shapely.geometry import Point

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from tests.geos_lines import stroke_line, text_polygon

RECIPES = [
    {"latitude": 47.9, "language": "en", "sheet": "a5"},
    {"latitude": 52.3, "language": "it", "sheet": "a5"},
    {"latitude": 36.2, "language": "fr", "diameter_mm": 110},
    {"latitude": -43.7, "language": "ru", "sheet": "a5"},
    {"latitude": 9.8, "language": "es", "diameter_mm": 130},
    {"latitude": -19.2, "language": "el", "sheet": "a5"},
    # the horizon ends on the rim 1.3 mm from the 150 deg line's end: the
    # number keeps clear of the heaviest line that meets the rim
    {"latitude": 62.2, "language": "pt", "sheet": "a5", "twilight": "civil"},
]
#: The labels' least clear paper from a line's ink (kitgen.parts.labels.MARGIN_MM, 0.3 mm),
#: less GEOS's chords of the circle (1e-4 mm) and rounding.
MARGIN_MM = 0.3 - 0.01
#: ... and from the cut line's ink, where scissors a little inside the line
#: would nick the digits (a teacher's look: 0.35 mm was too little; a choice).
CUT_CLEAR_MM = 0.5 - 0.01
#: How far (mm) a number beyond the rim may stand from its line's end: the
#: ring's width and a slide of 1 mm along it (plate_labels.RIM_SLIDES_MM).
NEAR_END_MM = 2.6


def _plate(recipe):
    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    return kit, kit.parts_of("plate")[0]


def _ends_on_rim(el, rim_mm: float):
    """The end points of an azimuth line (an arc, a segment or a polyline) that lie on the rim."""
    g = el.geom
    if el.shape == "arc":
        (cx, cy), r = g["center"], g["radius"]
        ends = [(cx + r * math.cos(math.radians(t)), cy + r * math.sin(math.radians(t)))
                for t in (g["start_deg"], g["end_deg"])]
    else:
        ends = [g["from"], g["to"]] if el.shape == "segment" else [g["points"][0], g["points"][-1]]
    return [e for e in ends if abs(math.hypot(*e) - rim_mm) < 1e-3]


@pytest.mark.parametrize("recipe", RECIPES, ids=lambda r: f"{r['language']}-{r['latitude']}")
def test_every_thirty_ending_on_the_rim_is_numbered(recipe):
    kit, plate = _plate(recipe)
    lines = [e for e in plate.elements if e.role == "azimuth" and e.stroke != "none"]
    rim_mm = kit.dims.outer_tropic_radius_mm   # the drawing's rim, where its lines end
    at_rim = {round(e.values["azimuth_deg"]) for e in lines if _ends_on_rim(e, rim_mm)}
    owed = {a for a in at_rim if a % 30 == 0 and a % 90}
    numbered = {round(e.values["azimuth_deg"]) for e in plate.elements if e.role == "azimuth_label"}
    assert owed, "no thirty ends on the rim of this plate"
    assert owed <= numbered, sorted(owed - numbered)


@pytest.mark.parametrize("recipe", RECIPES, ids=lambda r: f"{r['language']}-{r['latitude']}")
def test_a_number_beyond_the_rim_stands_in_the_ring_by_its_line(recipe):
    kit, plate = _plate(recipe)
    lines = [e for e in plate.elements if e.role == "azimuth" and e.stroke != "none"]
    cut = next(e for e in plate.elements if e.role == "cut" and e.shape in ("arc", "circle"))
    cut_mm, rim_mm = cut.geom["radius"], kit.dims.outer_tropic_radius_mm
    half_cut_mm = stroke_width_mm("cut", kit.dims) / 2
    beyond = []
    for label in (e for e in plate.elements if e.role == "azimuth_label"):
        ink = text_polygon(label.geom, kit.words)
        inner = min(math.hypot(*p) for p in ink.exterior.coords)
        if inner < rim_mm:
            continue
        beyond.append(label)
        # inside the plate's cut, its ink clear of the cut's ink, and clear of the rim
        assert max(math.hypot(*p) for p in ink.exterior.coords) <= cut_mm - half_cut_mm - CUT_CLEAR_MM
        assert inner >= rim_mm + MARGIN_MM
        # by the end of its own line (or of that line continued below the horizon)
        own = [e for e in lines if abs(e.values["azimuth_deg"] - label.values["azimuth_deg"]) < 1e-9]
        ends = [p for e in own for p in _ends_on_rim(e, rim_mm)]
        if ends:
            assert min(ink.distance(Point(p)) for p in ends) <= NEAR_END_MM, label.geom["text"]
        # and no other line comes within the margin of it
        for e in plate.elements:
            if e.shape in ("circle", "arc", "segment", "polyline") and e.stroke not in ("none", "cut"):
                gap = ink.distance(stroke_line(e)) - stroke_width_mm(e.stroke, kit.dims) / 2
                assert gap >= MARGIN_MM, (label.geom["text"], e.role, round(gap, 3))
    assert beyond, "no number stands beyond the rim on this plate"


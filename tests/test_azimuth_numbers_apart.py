"""An azimuth's number does not stand stacked on an hour's or an
almucantar's number (#12 review).

The unequal hours' numbers are set in the middle of their bands, and near
the east and west points that is beside the azimuth lines 15 degrees off
them (105 and 255 deg north of the equator, 75 and 285 deg south), whose
numbers then stood 1.0 to 1.4 mm under "12" and "1": a pupil read the two
as one stack and could not tell which number was the line's.  Numbers of
different scales keep the names' own gap side by side, 2 mm (the usual
rule of map labelling, that unrelated labels do not touch or crowd: common
practice), 3 mm where one stands right over the other (2 mm still read as
one label there); an azimuth of no multiple of 30 degrees, numbered only where
there is room (its neighbours' numbers name it), goes unnumbered rather
than stand nearer.  Distances are measured with Shapely (GEOS) between
the numbers' ink outlines (tests.geos_lines), not with the labeller's own
boxes.  The kits are not those of the other plate tests: north and south,
near the equator, on four sheets and at two sizes.
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.parts.plate_labels import BELOW_APART_MM
from kitgen.recipe.load import validate_recipe
from tests.geos_lines import text_polygon

RECIPES = [
    {"latitude": -8.1, "language": "en"},
    {"latitude": 5.0, "language": "el"},
    {"latitude": 13.1, "language": "en", "sheet": "a5"},
    {"latitude": -15.5, "language": "pt", "sheet": "letter"},
    {"latitude": 41.5, "language": "ar", "sheet": "a5"},
    {"latitude": 48.2, "language": "de", "diameter_mm": 140},
    {"latitude": -28.0, "language": "it", "diameter_mm": 110},
    {"latitude": 52.9, "language": "ru", "sheet": "letter"},
    {"latitude": 51.5, "language": "en", "longitude": -0.13, "timezone": "Europe/London"},
]
#: ... and right over or under another number (their inks' widths
#: overlapping), where 2 mm still read as one label ("105°" 2.1 mm over
#: "12" at 51.5 N): plate_labels.STACKED_APART_MM, a choice.
STACKED_MM = 3.0


@pytest.mark.parametrize("recipe", RECIPES, ids=lambda r: f"{r['language']}-{r['latitude']}")
def test_an_optional_azimuth_number_keeps_apart_from_the_other_numbers(recipe):
    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    plate = kit.parts_of("plate")[0]
    numbers = [e for e in plate.elements if e.role in ("unequal_hour_label", "almucantar_label")]
    optional = [e for e in plate.elements if e.role == "azimuth_label" and e.values["azimuth_deg"] % 30.0]
    assert numbers and optional
    others = [text_polygon(e.geom, kit.words) for e in numbers]
    for e in optional:
        ink = text_polygon(e.geom, kit.words)
        nearest = min(ink.distance(o) for o in others)
        assert nearest >= BELOW_APART_MM - 0.05, (e.geom["text"], round(nearest, 2))
        x0, y0, x1, y1 = ink.bounds
        for o in others:
            ox0, oy0, ox1, oy1 = o.bounds
            if x0 < ox1 and ox0 < x1:   # one over the other
                assert max(oy0 - y1, y0 - oy1) >= STACKED_MM - 0.1, (e.geom["text"], round(ink.distance(o), 2))

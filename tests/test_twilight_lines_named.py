"""Every twilight line drawn on a plate is named (#12 review).

On an A5 plate with the three twilight lines (civil, nautical and
astronomical: 6, 12 and 18 degrees below the horizon, the usual
definitions, e.g. the Explanatory Supplement to the Astronomical
Almanac) the arcs run 1.5 to 2 mm apart beside the horizon, and none of
the names "Twilight −6°" ... had room; a pupil could not tell the three
lines apart.  Where the full name finds no place the line carries its
altitude alone ("−6°", with the true minus sign, which no azimuth's or
almucantar's number has), set as any curve's name: on its own line,
broken round it.  Checked here on kits not in the other plate tests: each
twilight line drawn is named, in one of the two forms, with the text of
its own altitude, and the name's middle lies nearer its own arc than any
other twilight line (Shapely/GEOS distances to the arcs as drawn).
"""

from __future__ import annotations

import pytest
import math

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.words.locale import true_minus
from tests.geos_lines import stroke_line, text_polygon
from tests.test_plate_readings import hour_share

TWILIGHTS = ["civil", "nautical", "astronomical"]
RECIPES = [
    {"latitude": 38.0, "language": "de", "sheet": "a5"},
    {"latitude": 45.0, "language": "en", "sheet": "a5"},
    {"latitude": -30.0, "language": "es", "sheet": "a5"},
    {"latitude": 52.0, "language": "fr", "diameter_mm": 110},
    {"latitude": 24.0, "language": "ar", "sheet": "a5"},
    {"latitude": 60.0, "language": "ru", "sheet": "letter"},
]


@pytest.mark.parametrize("recipe", RECIPES, ids=lambda r: f"{r['language']}-{r['latitude']}")
def test_each_twilight_line_is_named_on_its_own_arc(recipe):
    kit = build_kit(validate_recipe(dict(recipe, twilight=TWILIGHTS, epoch=2027)))
    w = kit.words
    plate = kit.parts_of("plate")[0]
    circles = {}
    for e in plate.elements:
        if e.role == "twilight":
            circles.setdefault(e.values["altitude_deg"], set()).add(
                (round(e.geom["center"][0], 6), round(e.geom["center"][1], 6), round(e.geom["radius"], 6)))
    assert sorted(circles) == [-18.0, -12.0, -6.0]
    assert all(len(c) == 1 for c in circles.values())   # the pieces of one circle
    lines = {alt: next(iter(c)) for alt, c in circles.items()}

    def off_mm(point, circle):
        x, y, r = circle
        return abs(math.hypot(point.x - x, point.y - y) - r)
    names = [e for e in plate.elements if e.role == "curve_label" and e.values.get("curve") == "twilight"]
    numbers = [e for e in plate.elements if e.role in ("almucantar_label", "unequal_hour_label", "azimuth_label")]
    assert sorted(e.values["altitude_deg"] for e in names) == sorted(lines)
    for e in names:
        alt = e.values["altitude_deg"]
        value = true_minus(w.number(alt))
        assert e.geom["text"] in (w("plate.line_twilight", altitude=value),
                                  w("plate.line_twilight_short", altitude=value))
        if e.geom["text"] == w("plate.line_twilight_short", altitude=value):
            # a bare "−6°" keeps the names' gap (2 mm, common practice) from every number, ink to
            # ink, where it had stood 1 mm over "330°" and read as one stack with it
            ink = text_polygon(e.geom, w)
            assert all(ink.distance(text_polygon(n.geom, w)) >= 2.0 - 0.05 for n in numbers), e.geom["text"]
        # set on its own line (not beside it): the line broken a dash's length (1 mm) farther at each
        # end, so that a minus sign at the name's end (a bare "−6°", or an Arabic name's left end) does
        # not read as one more dash of it ("−6°" as "6°")
        ink = text_polygon(e.geom, w)
        if off_mm(ink.centroid, lines[alt]) < 0.1:
            pieces = [stroke_line(x) for x in plate.elements
                      if x.role == "twilight" and x.values["altitude_deg"] == alt]
            assert min(ink.distance(piece) for piece in pieces) >= 1.2, e.geom["text"]
        middle = text_polygon(e.geom, w).centroid
        own = off_mm(middle, lines[alt])
        assert all(own < off_mm(middle, line) for a, line in lines.items() if a != alt), (e.geom["text"], own)


def test_the_unequal_hours_are_numbered_between_their_lines():
    """The three twilight circles run across the first and last hours'
    bands, where their numbers' middle places have no room: each number
    is now sought nearer one of its lines too (plate_labels.HOUR_SHARES),
    and stands between its own lines (Meeus, Astronomical Algorithms,
    eq. 15.1 and the unequal hours' definition: hour k lies between k - 1
    and k twelfths of the night arc of its declination; the plate's point
    read back by Snyder's inverse projection, tests.test_plate_readings).
    A number with no place at all is left out and named in the plate's
    notes.  Measured on these six kits: 14 hour numbers left out before
    (1, 2, 11 and 12 on the German plate), 1 after (12 on the Spanish)."""
    left_out = 0
    for recipe in RECIPES:
        kit = build_kit(validate_recipe(dict(recipe, twilight=TWILIGHTS, epoch=2027)))
        plate = kit.parts_of("plate")[0]
        lat = recipe["latitude"]
        R = kit.dims.equator_radius_mm
        hours = [e for e in plate.elements if e.role == "unequal_hour_label"]
        missing = set(range(1, 13)) - {e.values["hour"] for e in hours}
        assert {kit.words.number(k) for k in missing} <= set(plate.values.get("labels_left_out", ()))
        left_out += len(missing)
        for e in hours:
            share = hour_share(e.geom["at"], lat, R)
            assert e.values["hour"] - 1 < share < e.values["hour"], (recipe, e.values["hour"], share)
    assert left_out <= 1

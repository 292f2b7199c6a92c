"""A plate's named circles carry their names on them or just beside them
(#12 review): "Tropic of Cancer" had floated halfway to the equator on
an 85 mm plate, and a tropic's name 2 to 4 mm off its circle on A4 and
A5 plates in five languages, where a pupil cannot tell which of two
circles it names.

Read from the exported geometry (kitgen's JSON) as a user of it would.

References:

* A name set along its line, on it or close beside it and nearer it than
  any other line of its kind, is common practice in map lettering (no
  source); "just beside" is the name's half height and the labels'
  margin off the line's ink, as kitgen sets any label beside a line
  (kitgen.parts.plate_labels, curve_name).
* The circles' centres and radii are kitgen's own exported geometry,
  checked against Snyder's stereographic formulas elsewhere
  (tests/test_plate_readings.py); distances here are plain Euclidean.
"""

from __future__ import annotations

import json
import math

import pytest

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.json_export import render_json

#: The named circles of a plate (JSON roles) and the value that tells
#: one of a role from another.
NAMED = {"tropic": "declination_deg", "equator": None, "twilight": "altitude_deg", "horizon": None}

PLATES = [
    {"latitude": 45.0, "language": "en", "sheet": "a5", "diameter_mm": 85},
    {"latitude": 48.1, "language": "de", "sheet": "a5"},
    {"latitude": 40.1, "language": "es", "sheet": "a5"},
    {"latitude": 0.5, "language": "fr", "sheet": "a4"},
    {"latitude": 60.2, "language": "ru", "sheet": "a4"},
    {"latitude": 23.0, "language": "el", "sheet": "letter"},
    {"latitude": -12.0, "language": "pt", "sheet": "a5"},
    {"latitude": -33.9, "language": "ar", "sheet": "a5", "diameter_mm": 100},
    {"latitude": 28.6, "language": "hi", "sheet": "a4"},
]


def _circles(plate: dict) -> dict:
    """Each named circle's (centre, radius, stroke), by (role, value)."""
    out = {}
    for el in plate["elements"]:
        if el["role"] in NAMED and el["shape"] in ("circle", "arc"):
            key = (el["role"], el.get(NAMED[el["role"]]) if NAMED[el["role"]] else None)
            out[key] = (tuple(el["center"]), el["radius"], el["stroke"])
    return out


@pytest.mark.parametrize("recipe", PLATES, ids=lambda r: f"{r['language']}-{r['latitude']}-{r['sheet']}")
def test_a_circles_name_stands_on_it_or_just_beside_it(recipe):
    kit = build_kit(validate_recipe({**recipe, "epoch": 2027}))
    plate = next(p for p in json.loads(render_json(kit))["parts"] if p["kind"] == "plate")
    circles = _circles(plate)
    names = [el for el in plate["elements"] if el["role"] == "curve_label" and el["curve"] in NAMED]
    assert names
    for el in names:
        role = el["curve"]
        key = (role, el.get(NAMED[role]) if NAMED[role] else None)
        if key not in circles:
            continue   # a line drawn as a polyline: the test is for circles
        (cx, cy), r, stroke = circles[key]
        x, y = el["at"]
        off = math.hypot(x - cx, y - cy) - r   # > 0 outside the circle
        height = kit.words.measure(el["text"], el["size_pt"]).height_mm
        beside = height / 2 + 0.3 + stroke_width_mm(stroke, kit.dims) / 2 + 0.05   # MARGIN_MM beside its ink
        if off > 0:   # outside: a straight name touches the circle at its middle, just beside it
            assert off <= beside + 1e-6, (recipe, el["text"], round(off, 2), round(beside, 2))
        # and nearer its own circle than any other named circle
        own = abs(off)
        for other, ((ox, oy), orad, _) in circles.items():
            if other != key:
                assert own < abs(math.hypot(x - ox, y - oy) - orad), (recipe, el["text"], other)

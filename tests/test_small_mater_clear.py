"""A small mater keeps its lines off its words (#12 read-through): on a
mater 80 to 100 mm across, the hour ring is narrower than a two-figure
numeral near the horizontal is deep along its ray past the ticks' tips,
and the clock ring's caption sits low enough on the back to reach the
pin's mark.  A random kit of the no-word-crossed test found both: an
hour tick's tip touching the "2" of "20" (Arabic, 80 mm) and a Greek
descender on the pin's upper arm (81 and 82 mm).

Read from the exported geometry (kitgen's JSON) as a user of it would.

References:

* Shapely/GEOS for the geometry: each word's box a polygon from its ink
  (tests/geos_lines.py, measured with the shipped fonts), each tick a
  line buffered by half its printed width (kitgen.geometry.style) with
  square ends, as a PDF's butt caps draw it (ISO 32000-1:2008, 8.4.3.3).
* The pin's mark as the page draws it: an upright cross whose arms reach
  2 mm, or 1 mm past the hole where the hole is wider (kitgen.render.ink),
  in the medium line weight.
* That a tick points at its figure and stops short of it, and that a word
  is never crossed by a line, are common practice on printed scales (no
  source).
"""

from __future__ import annotations

import json
import math

import pytest
from shapely.geometry import LineString

from kitgen.geometry.style import pin_hole_radius_mm, pin_mark_reach_mm, stroke_width_mm
from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.json_export import render_json
from tests.geos_lines import stroke_line, text_polygon

FLAT = 2   # shapely's square-less flat cap: the line ends where the tick ends


class _Line:
    def __init__(self, el: dict):
        self.shape, self.geom = el["shape"], el


def _kit(latitude: float, language: str, diameter: float, **extra):
    kit = build_kit(validate_recipe({"latitude": latitude, "language": language, "sheet": "a5",
                                     "diameter_mm": diameter, "epoch": 2027, **extra}))
    return kit, {p["kind"]: p for p in json.loads(render_json(kit))["parts"]}


#: Paper (mm) an hour tick keeps from its numeral's ink box: a tick's end
#: closer than about a line's width reads as touching the figure at 5 pt
#: (common practice on printed scales, no source; kitgen.parts.mater_front).
TIP_CLEAR_MM = 0.15


def _ticks_and_numerals(kit, front):
    numerals = [el for el in front["elements"] if el["role"] == "hour_label"]
    boxes = {el["hour"]: text_polygon(el, kit.words) for el in numerals}
    ticks = [el for el in front["elements"] if el["role"] == "hour_tick" and el["stroke"] != "none"]
    return boxes, ticks


@pytest.mark.parametrize("language,latitude", [("ar", 0.0), ("en", 20.0), ("hi", -35.0), ("el", 51.0)])
@pytest.mark.parametrize("diameter", [80.0, 82.0, 82.5, 86.0, 90.0, 100.0, 120.0])
def test_no_hour_tick_comes_near_a_numeral(language, latitude, diameter):
    kit, parts = _kit(latitude, language, diameter)
    boxes, ticks = _ticks_and_numerals(kit, parts["mater_front"])
    assert len(boxes) == 24 and len(ticks) >= 24
    for tick in ticks:
        ink = stroke_line(_Line(tick)).buffer(stroke_width_mm(tick["stroke"], kit.dims) / 2, cap_style=FLAT)
        near = {h: round(box.distance(ink), 3) for h, box in boxes.items() if box.distance(ink) < TIP_CLEAR_MM - 1e-6}
        assert not near, (language, diameter, tick.get("hour"), near)


def test_an_hour_tick_is_shortened_only_as_far_as_its_numeral_needs():
    # Where every numeral stands clear of the tips (130 mm and more), every
    # hour tick is as long as the others.  On a small mater a tick stops
    # short only where its whole length would come within TIP_CLEAR_MM of
    # its numeral, and then no farther from it than needs be; never by more than a
    # quarter of its length, so that an hour's tick stays longer than a
    # half hour's (0.30 of the ring against 0.42: kitgen.parts.mater_front).
    for latitude in (40.0, -40.0):
        for diameter in (80.0, 90.0, 100.0, 130.0, 180.0):
            kit, parts = _kit(latitude, "en", diameter)
            boxes, ticks = _ticks_and_numerals(kit, parts["mater_front"])
            hours = [el for el in ticks if el["hour"] % 1 == 0]
            lengths = {el["hour"]: LineString([el["from"], el["to"]]).length for el in hours}
            full = max(lengths.values())
            half_hour = max(LineString([el["from"], el["to"]]).length for el in ticks if el["hour"] % 1 == 0.5)
            for el in hours:
                ink = stroke_line(_Line(el)).buffer(stroke_width_mm(el["stroke"], kit.dims) / 2, cap_style=FLAT)
                gap = boxes[int(el["hour"])].distance(ink)
                if lengths[el["hour"]] < full - 1e-9:
                    # kept that far along the ray and across it: up to sqrt(2) times it off a corner
                    assert TIP_CLEAR_MM - 1e-6 <= gap <= TIP_CLEAR_MM * math.sqrt(2) + 0.01, \
                        (latitude, diameter, el["hour"], gap)
                    assert lengths[el["hour"]] > 0.75 * full and lengths[el["hour"]] > half_hour
            if diameter >= 130.0:
                assert min(lengths.values()) == pytest.approx(full), (latitude, diameter)


@pytest.mark.parametrize("language", ["el", "en", "fr", "ru", "de"])
@pytest.mark.parametrize("diameter", [80.0, 81.0, 82.0, 84.0, 88.0, 90.0, 95.0])
def test_the_clock_caption_keeps_off_the_pin(language, diameter):
    kit, parts = _kit(20.0, language, diameter)
    back = parts["mater_back"]
    reach = pin_mark_reach_mm(kit.dims, pin_hole_radius_mm("centre"))
    assert reach == 2.0   # the default 1.8 mm hole: the 2 mm arms
    half = stroke_width_mm("medium", kit.dims) / 2
    arms = (LineString([(-reach, 0.0), (reach, 0.0)]).union(LineString([(0.0, -reach), (0.0, reach)]))
            .buffer(half, cap_style=FLAT))
    captions = [el for el in back["elements"] if el["role"] == "clock_caption"]
    for el in captions:
        assert not text_polygon(el, kit.words).intersects(arms), (language, diameter, el["text"])
    if diameter >= 88.0:   # where the room exists the caption is there (#9: a small back keeps it)
        assert captions, (language, diameter)


def test_a_wider_pin_hole_lifts_the_caption():
    # A 6 mm hole: the arms reach 1 mm past it, 4 mm from the centre, and
    # the caption keeps above them.
    kit, parts = _kit(20.0, "en", 120.0, pin_hole_mm=6.0)
    assert pin_mark_reach_mm(kit.dims, pin_hole_radius_mm("centre", 6.0)) == 4.0
    captions = [el for el in parts["mater_back"]["elements"] if el["role"] == "clock_caption"]
    assert captions   # at 120 mm there is room above the wider mark
    for el in captions:
        assert text_polygon(el, kit.words).bounds[1] > 4.0 + stroke_width_mm("medium", kit.dims) / 2

"""Numbers of the back's clock ring that read as another when turned are
underlined (a teacher's look: "+9" beside the horizontal line stands
sideways, reading from the other side than "+6" above it, and reads "6+",
a correction 3 minutes wrong on the worked example's date).

References: which digits read as digits turned half a turn (0, 1, 8 as
themselves, 6 and 9 as each other) is the symmetry of the shipped
fonts' Western digits, and underlining 6 and 9 where a scale may be read
from either side is common practice on dials and tiles (no source).  The
ring's geometry is checked against its own edges (kitgen's drawing
rule: every label 0.3 mm clear of other ink, common practice).
"""

from __future__ import annotations

import math

import pytest

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.parts.turned_numbers import reads_as_another_turned
from kitgen.recipe.load import validate_recipe


@pytest.mark.parametrize("text, turned", [
    ("+9", True), ("\u22126", True), ("16", True), ("+18", True), ("6", True), ("+19", True),
    ("+60", True), ("90", True), ("\u2068+9\u2069", True), ("\u200f\u22126", True),
    ("+8", False), ("11", False), ("69", False), ("10", False), ("+10", False), ("80", False), ("0", False),
    ("+3", False), ("\u221214", False), ("96", False), ("\u2068+10\u2069", False),
])
def test_which_numbers_read_as_another_turned(text, turned):
    assert reads_as_another_turned(text) is turned


@pytest.mark.parametrize("recipe", [
    {"latitude": 48.14, "language": "de", "longitude": 11.58, "timezone": "Europe/Berlin"},
    {"latitude": -34.6, "language": "es", "sheet": "a5"},
    {"latitude": 24.7, "language": "ar", "sheet": "letter"},
    {"latitude": 40.7, "language": "en", "longitude": -74.0, "timezone": "America/New_York"},
])
def test_turned_numbers_of_the_clock_ring_are_underlined(recipe):
    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    back = next(p for p in kit.parts if p.kind == "mater_back")
    numbers = [e for e in back.elements if e.role == "clock_number"]
    marks = [e for e in back.elements if e.role == "clock_number_underline"]
    assert numbers
    inner = min(e.geom["radius"] for e in back.elements if e.role == "clock_edge")
    edge_half = stroke_width_mm("light", kit.dims) / 2
    # the inner ends of the ring's ticks (the heavy bars cross it whole; numbers keep clear of them)
    tick_ends = min(math.hypot(*e.geom["from"]) for e in back.elements if e.role == "clock_tick")
    tick_half = stroke_width_mm("light", kit.dims) / 2
    underlined = {}
    for mark in marks:
        key = (mark.values["month"], mark.values["day"])
        assert key not in underlined
        underlined[key] = mark
    for label in numbers:
        key = (label.values["month"], label.values["day"])
        text = label.geom["text"]
        assert (key in underlined) == reads_as_another_turned(text), text
        if key not in underlined:
            continue
        mark = underlined[key]
        (px, py), (qx, qy) = mark.geom["from"], mark.geom["to"]
        a = math.radians(label.geom["angle_deg"])
        down = (math.sin(a), -math.cos(a))
        ax, ay = label.geom["at"]
        mid = ((px + qx) / 2 - ax, (py + qy) / 2 - ay)
        height = kit.words.measure(text, label.geom["size_pt"]).height_mm
        # below the digits' ink, along the text's own down, and as long as the digits' ink is wide
        assert mid[0] * down[0] + mid[1] * down[1] > height / 2
        assert abs(mid[0] * math.cos(a) + mid[1] * math.sin(a)) < 0.3
        width = kit.words.measure(text, label.geom["size_pt"]).width_mm
        assert 0.5 * width < math.dist((px, py), (qx, qy)) <= width + 1e-9
        # the underline's ink keeps clear of the ring's inner edge and of the ticks' ends
        half = stroke_width_mm(mark.stroke, kit.dims) / 2
        nearest = min(math.hypot(px, py), math.hypot(qx, qy), math.hypot(*((px + qx) / 2, (py + qy) / 2)))
        farthest = max(math.hypot(px, py), math.hypot(qx, qy))
        assert nearest - half - (inner + edge_half) >= 0.17
        assert tick_ends - tick_half - (farthest + half) >= 0.17


@pytest.mark.parametrize("recipe", [
    {"latitude": 48.14, "language": "de"},
    {"latitude": -34.6, "language": "es", "sheet": "a5"},
    {"latitude": 24.7, "language": "ar", "sheet": "letter", "diameter_mm": 80},
])
def test_turned_numbers_of_the_front_degree_ring_are_underlined(recipe):
    """The front's degree ring: 60 and 90 (09 and 06 turned; 90 stands on
    its side at the ring's edge) underlined towards the centre, between
    the number and the ticks' tips, clear of both; no other number.  On
    an 80 mm kit the ring leaves no room between them: none there."""
    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    front = next(p for p in kit.parts if p.kind == "mater_front")
    marks = {e.values["degree"]: e for e in front.elements if e.role == "degree_label_underline"}
    assert sorted(marks) == ([] if recipe.get("diameter_mm") == 80 else [60, 90])
    tips = max(math.hypot(*e.geom["to"]) for e in front.elements if e.role == "degree_tick" and e.stroke != "none")
    half = stroke_width_mm("light", kit.dims) / 2
    for label in (e for e in front.elements if e.role == "degree_label" and e.values["degree"] in marks):
        mark = marks[label.values["degree"]]
        ends = [math.hypot(*mark.geom["from"]), math.hypot(*mark.geom["to"])]
        height = kit.words.measure(label.geom["text"], label.geom["size_pt"]).height_mm
        inner_ink = math.hypot(*label.geom["at"]) - height / 2
        assert max(ends) + half < inner_ink and min(ends) - half - (tips + half) >= 0.12 - 1e-9

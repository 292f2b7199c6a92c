"""The instructions say how fine the scales are, so that a pupil reads
between their marks (a teacher's look: nothing said a small tick of the
hour ring is 5 minutes, and read only to the nearest tick the Sun's time
came out up to 5 to 14 minutes wrong in ``kitgen check``).

References (common practice, no source): the hour ring turns 360 deg in
24 hours, 15 deg to the hour; the altitude scale's degrees are angles at
the mater's centre.  The steps are measured on the drawn ticks' places,
not read from the code's settings.
"""

from __future__ import annotations

import math

import pytest

from kitgen.kit import build_kit
from kitgen.layout.instructions import reading_between_blocks
from kitgen.recipe.load import validate_recipe


def _kit(**more):
    return build_kit(validate_recipe({"latitude": 41.1, "epoch": 2027, **more}))


def _angles_deg(part, role):
    """The drawn ticks' angles round the centre, from where each stands."""
    return sorted({round(math.degrees(math.atan2(e.values["at"][1], e.values["at"][0])) % 360.0, 4)
                   for e in part.elements if e.role == role and e.stroke != "none"})


def _finest_deg(angles):
    return min(b - a for a, b in zip(angles, angles[1:]))


@pytest.mark.parametrize("more", ({}, {"sheet": "a5", "language": "fr"}, {"diameter_mm": 80, "language": "de"},
                                  {"altitude_step_deg": 2, "language": "es"}))
def test_the_steps_said_are_the_steps_drawn(more):
    kit = _kit(**more)
    (block,) = reading_between_blocks(kit)
    w = kit.words
    minutes = _finest_deg(_angles_deg(kit.parts_of("mater_front")[0], "hour_tick")) / 15.0 * 60.0
    degrees = _finest_deg(_angles_deg(kit.parts_of("mater_back")[0], "altitude_tick"))
    circles = sorted({e.values["altitude_deg"] for e in kit.parts_of("plate")[0].elements
                      if e.role == "almucantar"})
    step = min(b - a for a, b in zip(circles, circles[1:]))
    assert w("instructions.read_between", minutes=w.number(round(minutes)), degrees=w.number(round(degrees)),
             step=w.number(round(step))) == block.text


def test_said_only_with_the_scales():
    assert reading_between_blocks(_kit())
    assert reading_between_blocks(_kit(parts=["plate", "rete", "rule"])) == []

"""The glossary explains the degree ring of the mater's front (a
teacher's look: "15 … 345" was never explained, and its 0 is under the
hole for the thread), and the front draws it so: a number every 15
degrees, the turning of the sky in one hour (360 degrees in 24 hours: an
hour of hour angle is 15 degrees, common practice, no source), counted round
from the top, where the hole stands in place of the 0; mirrored on a
southern kit as its hours are.
"""

from __future__ import annotations

import math

import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe


@pytest.mark.parametrize("latitude, sense", [(48.1, 1), (-34.6, -1)])
def test_the_degree_ring_counts_from_the_hole_at_the_top(latitude, sense):
    kit = build_kit(validate_recipe({"latitude": latitude, "epoch": 2027}))
    front = next(p for p in kit.parts if p.kind == "mater_front")
    labels = {int(e.geom["text"]): e.geom["at"] for e in front.elements if e.role == "degree_label"}
    assert sorted(labels) == list(range(15, 360, 15))   # no 0: the hole stands there
    for n, (x, y) in labels.items():
        seen_deg = math.degrees(math.atan2(sense * x, y)) % 360.0   # clockwise from the top (north)
        assert seen_deg == pytest.approx(n, abs=0.5)
    (hole,) = [e for e in front.elements if e.role == "hang_hole"]
    x, y = hole.geom["center"]
    assert x == 0.0 and kit.dims.hour_ring_outer_mm < y < kit.dims.mater_radius_mm
    (zero,) = [e for e in front.elements if e.role == "degree_tick" and abs(e.geom["from"][0]) < 1e-6
               and e.geom["from"][1] > 0]   # the 0's tick, straight below the hole
    assert abs(zero.geom["to"][0]) < 1e-6 and zero.geom["to"][1] < y - hole.geom["radius"]
    hours = {e.geom["text"]: e.geom["at"] for e in front.elements if e.role == "hour_label"}
    assert hours["12"][0] == pytest.approx(0.0, abs=1e-6) and hours["12"][1] > 0   # noon at the top, by the 0
    item = kit.words.items("instructions.glossary")[0]
    assert "a ring of degrees measures the sky's turning, 15° to an hour, counted round from the top, beside 12" in item
    assert "its 0 is not printed, and its tick stands just under the hole for the thread" in item

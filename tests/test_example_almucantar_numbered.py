"""The almucantar a worked example reads is numbered where the example's
body stands on it (#12 review: a Greek A5 plate numbered its 30 degree
circle on the north side alone, where the star example set Rigel on it
west of the meridian; a pupil following the example found no "30" there).

Where the body stands: its azimuth at the measured altitude from the
spherical triangle of pole, zenith and body (Meeus, *Astronomical
Algorithms*, 2nd ed., eq. 13.5 solved for the azimuth: cos A = (sin dec
- sin h sin phi) / (cos h cos phi), from the north), east of the meridian
or west as the example says; on the plate by the kit's stereographic
projection (tested against Snyder 1987 in test_projection). "Where it
stands" is within one radius of the circle (about a third of its way
round), the rule the plate keeps (plate_labels.EXAMPLE_NEAR_RADII); yet
not under the body's place, which the rete's dot covers once the example
is set (at least 1 mm of paper; the plate keeps 1.5 mm,
plate_labels.EXAMPLE_CLEAR_MM).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from kitgen.kit import build_kit
from kitgen.projection.stereographic import horizontal_vector, project_vectors
from kitgen.recipe.load import parse_recipe_text
from kitgen.sky.worked_example import sun_place_rad


def _body_mm(kit, alt_deg, dec_rad, east):
    phi, h = math.radians(kit.plan.site.latitude_deg), math.radians(alt_deg)
    cos_a = (math.sin(dec_rad) - math.sin(h) * math.sin(phi)) / (math.cos(h) * math.cos(phi))
    a = math.acos(max(-1.0, min(1.0, cos_a)))
    v = horizontal_vector(np.array([h]), np.array([a if east else 2 * math.pi - a]), phi)
    return project_vectors(v, kit.plan.hemisphere_sign, kit.dims.equator_radius_mm)[0]


@pytest.mark.parametrize("head", [
    "latitude: 35.3\nlanguage: el\nsheet: a5\n",      # the review's kit
    "latitude: 42.7\nlanguage: en\nsheet: a5\n",
    "latitude: -31.9\nlanguage: es\nsheet: letter\n",
    "latitude: 50.1\nlanguage: de\ndiameter_mm: 140\n",
    "latitude: 8.5\nlanguage: hi\n",
    "latitude: 58\nlanguage: ru\nsheet: a5\n",
])
def test_the_examples_almucantar_is_numbered_where_the_body_stands(head):
    kit = build_kit(parse_recipe_text("epoch: 2027\n" + head))
    plate = kit.part("plate")
    ex = kit.plan.examples
    reads = []
    if ex.sun is not None:
        reads.append((ex.sun.altitude_deg, sun_place_rad(ex.sun.sun_longitude_deg, kit.sky.obliquity_rad)[1], True))
    if ex.star is not None:
        reads.append((ex.star.altitude_deg, math.radians(kit.sky.stars[ex.star.star_index].dec_deg), ex.star.east))
    assert reads
    for alt_deg, dec, east in reads:
        circle = [e for e in plate.with_role("almucantar") if abs(e.values["altitude_deg"] - alt_deg) < 1e-9]
        assert circle, alt_deg
        radius = min(e.geom["radius"] for e in circle)
        p = _body_mm(kit, alt_deg, dec, east)
        if math.hypot(*p) >= kit.dims.outer_tropic_radius_mm:
            continue   # off the plate's drawing: nothing to number there
        near = [e for e in plate.with_role("almucantar_label")
                if abs(e.values["altitude_deg"] - alt_deg) < 1e-9 and math.dist(e.geom["at"], p) < radius]
        assert near, (alt_deg, "east" if east else "west", [round(float(x), 1) for x in p])
        # and none lies under the body's place, where the rete's dot covers it when the example is set
        for e in near:
            m = kit.words.measure(e.geom["text"], e.geom["size_pt"])
            gap = math.hypot(max(abs(p[0] - e.geom["at"][0]) - m.width_mm / 2, 0.0),
                             max(abs(p[1] - e.geom["at"][1]) - m.height_mm / 2, 0.0))
            assert gap >= 1.0, (alt_deg, round(gap, 2))

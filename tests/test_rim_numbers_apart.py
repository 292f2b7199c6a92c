"""An azimuth's number at its line's end on the rim keeps 5 mm from the
almucantars' and unequal hours' numbers there (#12 review: "150°" stood
1.3 mm over the almucantar's "20" at the rim of a plate at 0.4 deg N, and
the two read as one stack).

Which azimuths end on the rim: those whose horizon point (altitude 0 at
that azimuth, by the usual horizontal-to-equatorial rotation, Meeus
ch. 13, and the kit's stereographic projection, tested against Snyder
1987 in test_projection) lies outside the plate's drawing.  The 5 mm is
the kit's own choice (plate_labels.STACK_APART_MM): common practice in
lettering keeps labels of different things further apart than those of
one; the boxes are the shipped fonts' ink as the PDF sets them.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from kitgen.kit import build_kit
from kitgen.projection.stereographic import horizontal_vector, project_vectors
from kitgen.recipe.load import parse_recipe_text

APART_MM = 5.0


def _box(kit, e):
    m = kit.words.measure(e.geom["text"], e.geom["size_pt"])
    (x, y) = e.geom["at"]
    return (x - m.width_mm / 2, y - m.height_mm / 2, x + m.width_mm / 2, y + m.height_mm / 2)


@pytest.mark.parametrize("head", [
    "latitude: 0.4\nlanguage: en\nsheet: letter\n",   # the review's kit
    "latitude: -0.5\nlanguage: fr\n",
    "latitude: 9\nlanguage: it\nsheet: letter\n",
    "latitude: 5\nlanguage: en\n",
])
def test_a_rim_number_stands_apart_from_the_other_numbers(head):
    kit = build_kit(parse_recipe_text(head + "parts: [plate]\n"))
    plate = kit.part("plate")
    phi = math.radians(kit.plan.site.latitude_deg)
    disc = kit.dims.outer_tropic_radius_mm
    numbers = [_box(kit, e) for e in plate.elements if e.role in ("almucantar_label", "unequal_hour_label")]
    at_rim = 0
    for e in plate.with_role("azimuth_label"):
        a = math.radians(e.values["azimuth_deg"])
        p = project_vectors(horizontal_vector(np.array([0.0]), np.array([a]), phi), kit.plan.hemisphere_sign,
                            kit.dims.equator_radius_mm)[0]
        if np.all(np.isfinite(p)) and math.hypot(*p) < disc:
            continue   # its line meets the horizon on the plate: numbered there
        at_rim += 1
        b = _box(kit, e)
        gap = min(math.hypot(max(n[0] - b[2], b[0] - n[2], 0.0), max(n[1] - b[3], b[1] - n[3], 0.0))
                  for n in numbers)
        assert gap >= APART_MM, (e.geom["text"], round(gap, 2))
    assert at_rim >= 2

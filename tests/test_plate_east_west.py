"""Near the equator the horizon is the east-west line: at 0 degrees the
horizon projects to the plate's horizontal diameter itself, and a little
off the equator it stays within a millimetre of it, so the two drawn
printed as one line doubled (a review's "printing fault" at 0.5 N).  The
plate draws the east-west line only where the horizon lies at least
plate.EAST_WEST_APART_MM from it somewhere inside the drawing.

Reference: Snyder, "Map Projections: A Working Manual" (USGS PP 1395,
1987), polar stereographic, eq. 21-33: rho = 2 R k0 tan(pi/4 - phi/2),
with 2 R k0 the equator's radius on the plate.  The horizon crosses the
meridian at declinations 90 - lat (north point) and lat - 90 (south
point), on either side of the centre (a fact of spherical astronomy:
the celestial pole stands at the latitude's altitude); it is the circle
through those two points, symmetric about the meridian.
"""

from __future__ import annotations

import importlib
import math

import numpy as np
import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe

plate_module = importlib.import_module("kitgen.parts.plate")   # the package exports the function by that name


def _snyder_rho(equator_mm: float, declination_deg: float) -> float:
    return equator_mm * math.tan(math.pi / 4 - math.radians(declination_deg) / 2)


def _snyder_gap_mm(lat_deg: float, equator_mm: float, disc_mm: float) -> float:
    """Greatest distance of the horizon from the horizontal diameter
    inside the disc, from Snyder's two meridian points."""
    a = abs(lat_deg)
    if a == 0.0:
        return 0.0
    near, far = _snyder_rho(equator_mm, 90.0 - a), _snyder_rho(equator_mm, a - 90.0)
    centre, radius = (far - near) / 2.0, (far + near) / 2.0
    x = np.linspace(-disc_mm, disc_mm, 200001)
    y = centre - np.sqrt(np.maximum(radius ** 2 - x ** 2, 0.0))
    inside = np.hypot(x, y) <= disc_mm
    return float(np.abs(y[inside]).max())


def _drawing_radius_mm(part) -> float:
    """The radius the plate's lines are drawn to: the meridian's ends
    (its pieces, where words break it)."""
    return max(abs(y) for e in part.elements if e.role == "meridian" for _, y in (e.geom["from"], e.geom["to"]))


# -1.3 on A4: a review's wedge, 2.2 mm apart at the rim, read as the horizon drawn twice
@pytest.mark.parametrize("lat_deg, sheet", [(0.0, "a4"), (0.5, "a4"), (-0.5, "a4"), (1.2, "a4"), (-1.3, "a4"),
                                            (2.5, "a4"), (-3.0, "a4"), (0.5, "a5"), (3.0, "a5"), (40.0, "a4")])
def test_the_east_west_line_is_drawn_only_apart_from_the_horizon(lat_deg, sheet):
    kit = build_kit(validate_recipe({"latitude": lat_deg, "sheet": sheet, "epoch": 2027}))
    part = kit.parts_of("plate")[0]
    equator_mm = next(e.geom["radius"] for e in part.elements if e.role == "equator")
    disc_mm = _drawing_radius_mm(part)
    gap_mm = _snyder_gap_mm(lat_deg, equator_mm, disc_mm)
    drawn = any(e.role == "east_west" for e in part.elements)
    assert drawn == (gap_mm >= plate_module.EAST_WEST_APART_MM), (gap_mm, drawn)
    horizon = [e for e in part.elements if e.role == "horizon"]
    assert horizon
    if lat_deg and gap_mm < 50.0:   # the horizon drawn where Snyder puts it, as an arc of that circle
        near, far = _snyder_rho(equator_mm, 90.0 - abs(lat_deg)), _snyder_rho(equator_mm, abs(lat_deg) - 90.0)
        for e in horizon:
            assert abs(abs(e.geom["center"][1]) - (far - near) / 2.0) < 1e-6 * far
            assert abs(e.geom["radius"] - (far + near) / 2.0) < 1e-6 * far


def test_at_half_a_degree_the_two_would_print_as_one_line():
    """The case the threshold is for: at 0.5 N on A4 the horizon keeps
    within a millimetre of the diameter, meeting it at the east and west
    points and drawing away from it towards the rim (0.83 mm)."""
    kit = build_kit(validate_recipe({"latitude": 0.5, "epoch": 2027}))
    part = kit.parts_of("plate")[0]
    equator_mm = next(e.geom["radius"] for e in part.elements if e.role == "equator")
    disc_mm = _drawing_radius_mm(part)
    assert 0.5 < _snyder_gap_mm(0.5, equator_mm, disc_mm) < 1.2

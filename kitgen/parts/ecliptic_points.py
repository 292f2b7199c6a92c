"""Points of the ecliptic on the rete, by their longitudes.

Shared by the rete, which draws the ecliptic, and the legibility rule,
which measures the room between its degree ticks.
"""

from __future__ import annotations

import numpy as np

from ..projection.stereographic import project
from ..sky.ecliptic import ecliptic_to_equatorial_rad


def ecliptic_points_mm(longitude_deg, obliquity_rad, sign, equator_radius_mm):
    """Rete coordinates (mm) of ecliptic longitudes (degrees)."""
    ra, dec = ecliptic_to_equatorial_rad(np.radians(longitude_deg), obliquity_rad)
    return project(-ra, dec, sign, equator_radius_mm)

"""Ecliptic to equatorial coordinates (Meeus 1998, ch. 13, eq. 13.3 and
13.4, for points on the ecliptic, latitude 0).  Radians."""

from __future__ import annotations

import numpy as np


def ecliptic_to_equatorial_rad(longitude_rad, obliquity_rad):
    """Right ascension (0..2pi) and declination of ecliptic longitude(s) at
    ecliptic latitude 0 for the obliquity ``obliquity_rad``."""
    lam = np.asarray(longitude_rad, dtype=float)
    eps = float(obliquity_rad)
    ra = np.arctan2(np.sin(lam) * np.cos(eps), np.cos(lam)) % (2 * np.pi)
    dec = np.arcsin(np.sin(eps) * np.sin(lam))
    return ra, dec

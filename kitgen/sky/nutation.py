"""Nutation in longitude and in obliquity, to 0.5" and 0.1".

Meeus, *Astronomical Algorithms* (2nd ed., 1998), ch. 22, p. 144: the
four largest terms of the IAU 1980 series, from the longitude of the
Moon's ascending node Omega and the mean longitudes of the Sun (L) and of
the Moon (L').  Radians in and out.
"""

from __future__ import annotations

import numpy as np

from .constants import ARCSEC_TO_RAD


def _arguments_rad(t_centuries_tt):
    """Omega, L and L' (radians) at ``t_centuries_tt`` Julian centuries of
    TT from J2000.0 (Meeus 1998, p. 144)."""
    t = np.asarray(t_centuries_tt, dtype=float)
    omega = np.radians(125.04452 - 1934.136261 * t)
    sun = np.radians(280.4665 + 36000.7698 * t)
    moon = np.radians(218.3165 + 481267.8813 * t)
    return omega, sun, moon


def nutation_in_longitude_rad(t_centuries_tt):
    """Delta psi (radians): -17.20" sin Omega - 1.32" sin 2L - 0.23" sin 2L'
    + 0.21" sin 2 Omega (Meeus 1998, p. 144; accurate to 0.5")."""
    omega, sun, moon = _arguments_rad(t_centuries_tt)
    arcsec = (-17.20 * np.sin(omega) - 1.32 * np.sin(2 * sun) - 0.23 * np.sin(2 * moon)
              + 0.21 * np.sin(2 * omega))
    return arcsec * ARCSEC_TO_RAD


def nutation_in_obliquity_rad(t_centuries_tt):
    """Delta epsilon (radians): 9.20" cos Omega + 0.57" cos 2L + 0.10" cos 2L'
    - 0.09" cos 2 Omega (Meeus 1998, p. 144; accurate to 0.1")."""
    omega, sun, moon = _arguments_rad(t_centuries_tt)
    arcsec = 9.20 * np.cos(omega) + 0.57 * np.cos(2 * sun) + 0.10 * np.cos(2 * moon) - 0.09 * np.cos(2 * omega)
    return arcsec * ARCSEC_TO_RAD

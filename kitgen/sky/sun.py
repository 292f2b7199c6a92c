"""The Sun's apparent ecliptic longitude.

Meeus, *Astronomical Algorithms* (2nd ed., 1998), ch. 25, "Solar
coordinates", the method of lower accuracy (geometric mean longitude, mean
anomaly, equation of the centre; nutation in longitude and aberration by
the -0.00569 - 0.00478 sin(Omega) correction), which Meeus gives as
accurate to 0.01 deg.  Compared with DE421 in tests/test_against_de421.py.
"""

from __future__ import annotations

import numpy as np

from .timescale import days_of_year, julian_centuries_tt, julian_date_tt, julian_date_ut


def apparent_longitude_rad(t_centuries_tt):
    """Apparent geocentric ecliptic longitude of the Sun (radians, 0..2pi),
    referred to the true equinox of date, at ``t_centuries_tt`` Julian
    centuries of TT from J2000.0 (Meeus 1998, eq. 25.2-25.4 and p. 164)."""
    t = np.asarray(t_centuries_tt, dtype=float)
    l0 = 280.46646 + t * (36000.76983 + t * 0.0003032)
    m = np.radians(357.52911 + t * (35999.05029 - t * 0.0001537))
    c = ((1.914602 - t * (0.004817 + t * 0.000014)) * np.sin(m)
         + (0.019993 - t * 0.000101) * np.sin(2 * m)
         + 0.000289 * np.sin(3 * m))
    omega = np.radians(125.04 - 1934.136 * t)
    lam = l0 + c - 0.00569 - 0.00478 * np.sin(omega)
    return np.radians(lam % 360.0)


def apparent_obliquity_correction_rad(t_centuries_tt):
    """Meeus (1998) p. 165: the obliquity to use with the apparent longitude
    is the mean obliquity + 0.00256 deg cos(Omega)."""
    t = np.asarray(t_centuries_tt, dtype=float)
    return np.radians(0.00256 * np.cos(np.radians(125.04 - 1934.136 * t)))


def longitude_at_noon_ut_deg(year: int, month: int, day: int) -> float:
    """The Sun's apparent longitude (degrees) at 12:00 UT of a date."""
    t = julian_centuries_tt(julian_date_tt(julian_date_ut(year, month, day, 12.0)))
    return float(np.degrees(apparent_longitude_rad(t)))


def calendar_longitudes_deg(year: int, site_longitude_deg: float | None = None):
    """[(month, day, longitude_deg)] for every date of ``year``: the Sun's
    longitude at 12:00 UT, or, given the site's longitude (degrees, east
    positive), at the site's local mean noon, 12 h - longitude/15 of UT
    (#10).  (Apparent noon differs by the equation of time, at most 16
    minutes, in which the Sun moves 0.011 deg: a hair on any calendar.)"""
    dates = days_of_year(year)
    noon_ut_h = 12.0 - (site_longitude_deg or 0.0) / 15.0
    jd = np.array([julian_date_ut(year, m, d, noon_ut_h) for m, d in dates])
    lam = np.degrees(apparent_longitude_rad(julian_centuries_tt(julian_date_tt(jd))))
    return [(m, d, float(x)) for (m, d), x in zip(dates, lam)]

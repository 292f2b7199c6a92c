"""Calendar dates to Julian Dates, and the TT - UT difference (Delta T).

Angles play no part here; times are Julian Dates (days) or seconds.
"""

from __future__ import annotations

import datetime as _dt

import numpy as np

from .constants import DAYS_PER_JULIAN_CENTURY, J2000_JD, JD_OF_ORDINAL_ZERO_MIDNIGHT


def julian_date_ut(year: int, month: int, day: int, hour_ut: float = 0.0) -> float:
    """Julian Date (UT) of a proleptic Gregorian calendar date and hour.

    Equivalent to Meeus, *Astronomical Algorithms* (2nd ed., 1998), ch. 7,
    eq. 7.1, for Gregorian dates; computed from Python's day ordinal.
    """
    return _dt.date(year, month, day).toordinal() + JD_OF_ORDINAL_ZERO_MIDNIGHT + hour_ut / 24.0


#: (first year, end year, origin year, coefficients of (y - origin)^0..n) of
#: the Espenak and Meeus (2006) polynomials for 1900-2050.
_DELTA_T_PIECES = (
    (1900.0, 1920.0, 1900.0, (-2.79, 1.494119, -0.0598939, 0.0061966, -0.000197)),
    (1920.0, 1941.0, 1920.0, (21.20, 0.84493, -0.076100, 0.0020936)),
    (1941.0, 1961.0, 1950.0, (29.07, 0.407, -1.0 / 233.0, 1.0 / 2547.0)),
    (1961.0, 1986.0, 1975.0, (45.45, 1.067, -1.0 / 260.0, -1.0 / 718.0)),
    (1986.0, 2005.0, 2000.0, (63.86, 0.3345, -0.060374, 0.0017275, 0.000651814, 0.00002373599)),
    (2005.0, 2050.0, 2000.0, (62.92, 0.32217, 0.005589)),
)


def delta_t_s(decimal_year):
    """TT - UT in seconds, from the polynomial expressions of Espenak and
    Meeus (*Five Millennium Canon of Solar Eclipses*, NASA TP-2006-214141,
    2006): their polynomials for 1900-2050, then the long-term parabola of
    Morrison and Stephenson (2004), -20 + 32 u^2, less 0.5628 (2150 - y)
    up to 2150 so that it joins the 2005-2050 piece, and the bare parabola
    elsewhere.  Coefficients from memory of that publication (checked
    against Skyfield's Delta T table in tests/test_against_erfa.py); an
    error of a minute in Delta T moves the Sun by 0.0007 deg, far below
    what a kit can show.
    """
    y = np.asarray(decimal_year, dtype=float)
    u = (y - 1820.0) / 100.0
    out = -20.0 + 32.0 * u * u
    out = np.where((y >= 2050.0) & (y < 2150.0), out - 0.5628 * (2150.0 - y), out)
    for first, end, origin, coeffs in _DELTA_T_PIECES:
        t = y - origin
        value = sum(c * t ** k for k, c in enumerate(coeffs))
        out = np.where((y >= first) & (y < end), value, out)
    return out


def julian_date_tt(jd_ut):
    """Julian Date in TT for a Julian Date in UT (adds Delta T)."""
    jd_ut = np.asarray(jd_ut, dtype=float)
    year = 2000.0 + (jd_ut - J2000_JD) / 365.25
    return jd_ut + delta_t_s(year) / 86400.0


def julian_centuries_tt(jd_tt):
    """Julian centuries of TT since J2000.0."""
    return (np.asarray(jd_tt, dtype=float) - J2000_JD) / DAYS_PER_JULIAN_CENTURY


def days_of_year(year: int):
    """Every (month, day) of the Gregorian calendar ``year``, in order."""
    d = _dt.date(year, 1, 1)
    out = []
    while d.year == year:
        out.append((d.month, d.day))
        d += _dt.timedelta(days=1)
    return out

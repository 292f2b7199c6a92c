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


def delta_t_s(decimal_year):
    """TT - UT in seconds, from the polynomial expressions of Espenak and
    Meeus (*Five Millennium Canon of Solar Eclipses*, NASA TP-2006-214141,
    2006): the 2005-2050 polynomial inside that span, and the long-term
    parabola of Morrison and Stephenson (2004), -20 + 32 u^2, outside it.
    Coefficients from memory of that publication; an error of a minute in
    Delta T moves the Sun by 0.0007 deg, far below what a kit can show.
    """
    y = np.asarray(decimal_year, dtype=float)
    t = y - 2000.0
    u = (y - 1820.0) / 100.0
    modern = 62.92 + 0.32217 * t + 0.005589 * t * t
    long_term = -20.0 + 32.0 * u * u
    return np.where((y >= 2005.0) & (y <= 2050.0), modern, long_term)


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

"""The equation of time: apparent minus mean solar time.

Meeus, *Astronomical Algorithms* (2nd ed., 1998), ch. 28, eq. 28.3:

    E = L0 - 0.0057183 deg - alpha + Delta psi cos(epsilon)

with L0 the Sun's mean longitude (eq. 28.2, VSOP87), alpha the Sun's
apparent right ascension, Delta psi the nutation in longitude and epsilon
the true obliquity.  alpha comes from the apparent longitude of
:mod:`kitgen.sky.sun` (Meeus ch. 25, 0.01 deg, i.e. about 2.4 s of time)
and the obliquity of :mod:`kitgen.sky.obliquity` corrected as Meeus
p. 165 says.  E is positive when the Sun is ahead of the mean Sun, as
in early November (about +16 min), and the clock correction of
:mod:`kitgen.sky.clock` subtracts it.  Compared with DE421 in
tests/test_clock_against_skyfield.py.

Radians inside; minutes of time only in :func:`equation_of_time_min`.
"""

from __future__ import annotations

import numpy as np

from .nutation import nutation_in_longitude_rad, nutation_in_obliquity_rad
from .obliquity import mean_obliquity_rad
from .sun import apparent_longitude_rad, apparent_obliquity_correction_rad
from .timescale import julian_centuries_tt, julian_date_tt

#: Minutes of time in one radian of hour angle (24 h = 2 pi).
MINUTES_PER_RAD = 1440.0 / (2.0 * np.pi)


def mean_longitude_rad(t_centuries_tt):
    """The Sun's mean longitude L0 (radians, 0..2pi) referred to the mean
    equinox of date, Meeus (1998) eq. 28.2, tau in Julian millennia:
    280.4664567 + 360007.6982779 tau + 0.03032028 tau^2 + tau^3/49931
    - tau^4/15300 - tau^5/2000000 degrees."""
    tau = np.asarray(t_centuries_tt, dtype=float) / 10.0
    deg = (280.4664567 + tau * (360007.6982779 + tau * (0.03032028 + tau * (1.0 / 49931.0
           + tau * (-1.0 / 15300.0 - tau / 2000000.0)))))
    return np.radians(deg % 360.0)


def apparent_right_ascension_rad(t_centuries_tt):
    """The Sun's apparent right ascension (radians, -pi..pi) from its
    apparent longitude (latitude neglected, under 1.2"), Meeus (1998)
    eq. 25.6 with the obliquity of p. 165."""
    lam = apparent_longitude_rad(t_centuries_tt)
    eps = mean_obliquity_rad(t_centuries_tt) + apparent_obliquity_correction_rad(t_centuries_tt)
    return np.arctan2(np.cos(eps) * np.sin(lam), np.cos(lam))


def equation_of_time_rad(t_centuries_tt):
    """E (radians of hour angle, wrapped to -pi..pi) at ``t_centuries_tt``
    Julian centuries of TT from J2000.0, Meeus (1998) eq. 28.3."""
    t = np.asarray(t_centuries_tt, dtype=float)
    eps = mean_obliquity_rad(t) + nutation_in_obliquity_rad(t)
    e = (mean_longitude_rad(t) - np.radians(0.0057183) - apparent_right_ascension_rad(t)
         + nutation_in_longitude_rad(t) * np.cos(eps))
    return (e + np.pi) % (2.0 * np.pi) - np.pi


def equation_of_time_min(jd_ut):
    """E in minutes of time at the Julian Date(s) ``jd_ut`` (UT):
    apparent solar time minus mean solar time."""
    return equation_of_time_rad(julian_centuries_tt(julian_date_tt(jd_ut))) * MINUTES_PER_RAD

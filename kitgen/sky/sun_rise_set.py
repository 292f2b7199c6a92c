"""Sunrise and sunset for a place and a date, and the day's length.

Meeus, *Astronomical Algorithms* (2nd ed., 1998), ch. 15, "Rising,
transit and setting": the Sun rises or sets when its altitude is
h0 = -0.833 deg (-0 deg 50', refraction at the horizon of 34' and the
Sun's semi-diameter of 16'), at the hour angle H0 with

    cos H0 = (sin h0 - sin(phi) sin(delta)) / (cos(phi) cos(delta))   (eq. 15.1).

No real H0 (|cos H0| > 1) means the Sun stays above h0 all day (polar
day) or below it (polar night).  The event is found by successive
approximation, as ch. 15 does: the Sun's declination delta and the
equation of time are taken again at each new estimate of the instant, and
the instant is apparent noon -+ H0, apparent noon being 12 h - E -
longitude/15 of UT.  Three rounds bring it to well under a second.

Radians inside; the longitude in degrees (east positive) and times in
minutes at the edges.
"""

from __future__ import annotations

import math

import numpy as np

from .equation_of_time import equation_of_time_rad
from .obliquity import mean_obliquity_rad
from .sun import apparent_longitude_rad, apparent_obliquity_correction_rad
from .timescale import julian_centuries_tt, julian_date_tt, julian_date_ut

#: The Sun's altitude at rising and setting (Meeus 1998, ch. 15, h0).
STANDARD_ALTITUDE_DEG = -0.833
#: Rounds of successive approximation.
ROUNDS = 3

POLAR_DAY = "polar_day"
POLAR_NIGHT = "polar_night"


def declination_rad(t_centuries_tt):
    """The Sun's apparent declination (radians), Meeus (1998) eq. 25.7,
    from its apparent longitude and the obliquity of p. 165."""
    lam = apparent_longitude_rad(t_centuries_tt)
    eps = mean_obliquity_rad(t_centuries_tt) + apparent_obliquity_correction_rad(t_centuries_tt)
    return np.arcsin(np.sin(eps) * np.sin(lam))


def cos_hour_angle(latitude_rad: float, declination, altitude_rad: float):
    """cos H0 of Meeus (1998) eq. 15.1, for one declination (radians) or
    an array; outside -1..1 when the Sun does not reach ``altitude_rad``
    (above 1) or never goes below it (below -1)."""
    return ((math.sin(altitude_rad) - math.sin(latitude_rad) * np.sin(declination))
            / (math.cos(latitude_rad) * np.cos(declination)))


def _sun_at(jd_ut):
    """(declination rad, equation of time rad) at UT Julian Dates (an
    array, or one date)."""
    t = julian_centuries_tt(julian_date_tt(jd_ut))
    return declination_rad(t), equation_of_time_rad(t)


def sun_events_jd(year: int, dates, latitude_deg: float, longitude_deg: float,
                  altitude_deg: float = STANDARD_ALTITUDE_DEG) -> list[tuple[float | None, float | None, str | None]]:
    """For each (month, day) of ``dates`` in ``year``: (UT Julian Date of
    the Sun's rising, of its setting, None), or (None, None,
    ``"polar_day"`` or ``"polar_night"``), on the date whose local mean
    noon at ``longitude_deg`` is 12 h - longitude/15 of UT that day.

    Every date and both events are approximated together, one array each
    round (the same rounds as one date alone; #12: a site's table of 24
    dates took 190 evaluations of the Sun one by one).  At the poles
    themselves (|latitude| within 1e-9 deg of 90) the Sun's hour angle
    plays no part: it is up all day when its declination exceeds h0 in
    the pole's hemisphere."""
    phi = math.radians(latitude_deg)
    h0 = math.radians(altitude_deg)
    noon_jd = np.array([julian_date_ut(year, m, d, 12.0) for m, d in dates]) - longitude_deg / 360.0
    delta, _ = _sun_at(noon_jd)
    if abs(latitude_deg) > 90.0 - 1e-9:
        up = math.copysign(1.0, latitude_deg) * delta > h0
        return [(None, None, POLAR_DAY if u else POLAR_NIGHT) for u in up.tolist()]
    c = cos_hour_angle(phi, delta, h0)
    why = [POLAR_NIGHT if x > 1.0 else POLAR_DAY if x < -1.0 else None for x in c.tolist()]
    noon2 = np.concatenate([noon_jd, noon_jd])
    sign = np.repeat([-1.0, 1.0], len(noon_jd))
    jd = noon2
    for _ in range(ROUNDS):
        delta, e = _sun_at(jd)
        h = np.arccos(np.clip(cos_hour_angle(phi, delta, h0), -1.0, 1.0))
        jd = noon2 + (sign * h - e) / (2.0 * math.pi)
    n = len(noon_jd)
    return [(None, None, w) if w else (rise, setting, None)
            for w, rise, setting in zip(why, jd[:n].tolist(), jd[n:].tolist())]


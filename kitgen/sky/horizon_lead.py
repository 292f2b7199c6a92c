"""How many minutes the almanac's sunrise comes before the astrolabe's
(and its sunset after), at the site, over the epoch year.

The plate's horizon is the circle of altitude 0 deg for the Sun's point,
its centre; almanacs reckon sunrise and sunset for the centre at
h0 = -0.833 deg (34' of refraction at the horizon and the Sun's 16'
semi-diameter: J. Meeus, *Astronomical Algorithms*, 2nd ed. 1998, ch. 15),
and the kit's table does too (:mod:`kitgen.sky.sun_rise_set`).  On a day
of declination dec the two differ by H(h0) - H(0) in hour angle
(Meeus eq. 15.1 for each), at 4 minutes of time a degree, the Sun's
mean rate of 15 deg an hour.  Towards the polar circles the difference
grows large round midsummer and midwinter (the Sun crosses the horizon
at a shallow slant): 3 to 4 minutes at the equator, 5 to 8 at 52.2 N, 7
to 26 at 64.8 N, where "a few minutes" had told pupils their readings
were wrong (#12 review).  Degrees at the edges, radians inside.
"""

from __future__ import annotations

import math

import numpy as np

from .almanac import SkyForKit, calendar_declinations_rad
from .sun_rise_set import STANDARD_ALTITUDE_DEG, cos_hour_angle

#: Minutes of time in which the Sun's hour angle grows by a degree.
MIN_PER_DEG = 4.0


def horizon_lead_min(latitude_deg: float, sky: SkyForKit) -> tuple[int, int] | None:
    """The least and the most minutes (whole, rounded outwards, the most
    at least a minute more than the least) by which sunrise at the
    standard altitude comes before the Sun's centre reaches the horizon,
    and sunset after, over the calendar's dates on which both happen;
    None where none does (a pole).  Each event takes the Sun's declination
    of its own hour, moved from the calendar's noon by the day's change
    in proportion: near the polar circles, where the lead grows fastest,
    the noon's had put the most 9 minutes too high at 69.6 N."""
    phi = math.radians(latitude_deg)
    dec = calendar_declinations_rad(sky)
    per_day = np.gradient(dec)
    day_part = np.nan_to_num(_hour_angle(phi, dec, 0.0)) / (2.0 * math.pi)   # of a day, noon to the event
    leads = []
    for side in (-1.0, 1.0):   # the morning's event before noon, the evening's after
        at_event = dec + side * per_day * day_part
        std, geo = _hour_angle(phi, at_event, math.radians(STANDARD_ALTITUDE_DEG)), _hour_angle(phi, at_event, 0.0)
        both = np.isfinite(std) & np.isfinite(geo)
        leads.append(np.degrees(std[both] - geo[both]) * MIN_PER_DEG)
    lead = np.concatenate(leads)
    if not len(lead):
        return None
    low = int(math.floor(float(lead.min())))
    return low, max(int(math.ceil(float(lead.max()))), low + 1)


def _hour_angle(phi: float, dec: np.ndarray, altitude: float) -> np.ndarray:
    """|H| (radians) at which the Sun of each declination ``dec`` stands
    at ``altitude`` (kitgen.sky.sun_rise_set.cos_hour_angle, Meeus eq.
    15.1), NaN where it never does."""
    with np.errstate(divide="ignore", invalid="ignore"):
        c = cos_hour_angle(phi, dec, altitude)
    return np.where(np.abs(c) <= 1.0, np.arccos(np.clip(c, -1.0, 1.0)), np.nan)

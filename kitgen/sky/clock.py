"""The clock correction: minutes to add to the instrument's reading to get
the time on a clock.

An astrolabe reads local apparent solar time T.  Local mean time is
T - E (E the equation of time, apparent minus mean, Meeus 1998 ch. 28),
universal time is that less the longitude (4 min a degree, east
positive), and zone time is universal time plus the zone's offset, summer
time included (IANA time zone database).  So

    clock time = T - E + offset - 4 min/deg x longitude
               = T + [mean - apparent] + (zone meridian - longitude) x 4 min
                   + summer time,

the zone meridian being 15 deg a standard hour of offset, and the
longitude as the clocks count it (:func:`clock_longitude_deg`): a place
whose zone lies across the date line from it (the Chatham Islands at
176.5 deg W keep UTC+12:45, Samoa at 171.8 deg W UTC+13) has clocks a day
and some minutes ahead of its local mean time, and its correction is
those minutes (+31 at Chatham), never a day and more (+1471).  Without a
longitude (or a zone) there is no clock to set: the correction is -E
alone, which gives local mean time.  One value a day, for the instant of
12:00 on the zone's clock (E changes by at most 0.5 min a day).
"""

from __future__ import annotations

import numpy as np

from .equation_of_time import equation_of_time_min
from .timescale import days_of_year, julian_date_ut
from .zone import offset_at_noon_min


def clock_correction_min(year: int, longitude_deg: float | None = None, timezone: str | None = None):
    """[(month, day, minutes)] for every date of ``year``: the minutes to
    add to local apparent solar time to get the clock time of ``timezone``
    at ``longitude_deg`` (east positive), or local mean time when either
    is ``None``."""
    dates = days_of_year(year)
    if longitude_deg is None or timezone is None:
        jd = np.array([julian_date_ut(year, m, d, 12.0) for m, d in dates])
        minutes = -equation_of_time_min(jd)
    else:
        offsets = np.array([offset_at_noon_min(timezone, year, m, d)[0] for m, d in dates])
        jd = np.array([julian_date_ut(year, m, d, 12.0) for m, d in dates]) - offsets / 1440.0
        minutes = -equation_of_time_min(jd) + offsets - 4.0 * clock_longitude_deg(year, longitude_deg, timezone)
    return [(m, d, float(x)) for (m, d), x in zip(dates, minutes)]


def clock_longitude_deg(year: int, longitude_deg: float | None, timezone: str | None) -> float | None:
    """The site's longitude (degrees, east positive) as the clocks of
    ``timezone`` count it: its own, moved by whole turns where the zone
    lies across the date line from it (the Chatham Islands' -176.55
    becomes 183.45), so that its local mean time is within half a day of
    the clocks' and its dates are the clocks'.  The clock correction, the
    almanac's dates and the calendar's ticks (local mean noon of each
    date) are all worked out for it; it is its own clock longitude.
    ``None`` without a longitude."""
    if longitude_deg is None or timezone is None:
        return longitude_deg
    offset_min, _ = offset_at_noon_min(timezone, year, 1, 1)
    return longitude_deg + 360.0 * round((offset_min - 4.0 * longitude_deg) / 1440.0)

"""What a kit tells about its site's clock and Sun, for the epoch year,
as plain frozen data: the clock correction for every day and sunrise,
sunset and day length on the 1st and 16th of every month.

Times are on the zone's clock when the site has a longitude and an IANA
time zone (``time`` = ``"zone"``), otherwise local mean time
(``"local_mean"``: the correction is the equation of time alone, and
sunrise and sunset are reckoned for longitude 0 deg, which moves them by
under a minute).  The methods are those of :mod:`kitgen.sky.clock` and
:mod:`kitgen.sky.sun_rise_set`.
"""

from __future__ import annotations

from dataclasses import dataclass

from .clock import clock_correction_min, clock_longitude_deg
from .sun_rise_set import POLAR_DAY, sun_events_jd
from .zone import changes_offset, local_clock_min

#: Days of the month of the sunrise and sunset table (by half month).
TABLE_DAYS = (1, 16)
#: The Julian Date of 1970-01-01 00:00 UT.
UNIX_EPOCH_JD = 2440587.5

ZONE_TIME = "zone"
LOCAL_MEAN_TIME = "local_mean"


@dataclass(frozen=True)
class SunRiseSet:
    """One date's sunrise and sunset on the almanac's clock, minutes after
    local midnight (``None`` in polar day or night, ``reason`` saying
    which), and the day's length in minutes (1440 in polar day, 0 in
    polar night)."""

    month: int
    day: int
    rise_min: float | None
    set_min: float | None
    day_length_min: float
    reason: str | None = None

    @property
    def rise(self) -> str | None:
        """Sunrise as ``HH:MM`` to the nearest minute."""
        return hh_mm(self.rise_min)

    @property
    def set(self) -> str | None:
        """Sunset as ``HH:MM`` to the nearest minute."""
        return hh_mm(self.set_min)

    @property
    def day_length_whole_min(self) -> int:
        """The day's length in whole minutes as the printed times give it:
        sunset's minute less sunrise's, so that a reader who subtracts the
        table's two times finds the table's length (each is rounded on its
        own, and the true length can lie a minute either way)."""
        whole = int(round(self.day_length_min))
        if self.rise_min is None or self.set_min is None:
            return whole
        printed = (int(round(self.set_min)) - int(round(self.rise_min))) % 1440
        return printed if abs(printed - self.day_length_min) < 2.0 else whole


@dataclass(frozen=True)
class Almanac:
    """The site's almanac for one year; see the module docstring."""

    year: int
    time: str                                             # ZONE_TIME or LOCAL_MEAN_TIME
    clock_correction: tuple[tuple[int, int, float], ...]  # (month, day, minutes to add to the reading)
    sun_rise_set: tuple[SunRiseSet, ...]
    #: Whether the zone's clocks change their offset in the year (summer
    #: time, by the zone database); False for local mean time.
    summer_time: bool = False


def hh_mm(minutes: float | None) -> str | None:
    """Minutes after midnight as ``HH:MM`` (rounded to the minute, taken
    round the clock), or ``None``."""
    if minutes is None:
        return None
    whole = int(round(minutes)) % 1440
    return f"{whole // 60:02d}:{whole % 60:02d}"


def _clock_min(jd_ut: float, longitude_deg: float, timezone: str | None) -> float:
    """Minutes after midnight of the event's UT instant on the almanac's
    clock: the zone's, or local mean time (UT + 4 min/deg x longitude)."""
    if timezone is not None:
        return local_clock_min(timezone, (jd_ut - UNIX_EPOCH_JD) * 86400.0)[1]
    return ((jd_ut - UNIX_EPOCH_JD) * 1440.0 + 4.0 * longitude_deg) % 1440.0


def sun_rise_set_table(year: int, dates, latitude_deg: float, longitude_deg: float | None = None,
                       timezone: str | None = None) -> tuple[SunRiseSet, ...]:
    """Sunrise, sunset and day length on each (month, day) of ``dates``
    (see :class:`Almanac` for the clock)."""
    zoned = longitude_deg is not None and timezone is not None
    lon = longitude_deg if zoned else 0.0
    tz = timezone if zoned else None
    out = []
    for (month, day), (rise, setting, why) in zip(dates, sun_events_jd(year, dates, latitude_deg, lon)):
        if why:
            out.append(SunRiseSet(month, day, None, None, 1440.0 if why == POLAR_DAY else 0.0, why))
        else:
            out.append(SunRiseSet(month, day, _clock_min(rise, lon, tz), _clock_min(setting, lon, tz),
                                  (setting - rise) * 1440.0))
    return tuple(out)


def almanac_for_site(year: int, latitude_deg: float, longitude_deg: float | None = None,
                     timezone: str | None = None) -> Almanac:
    """The clock correction for every date of ``year`` and the sunrise and
    sunset table for the 1st and 16th of each month, at the site."""
    zoned = longitude_deg is not None and timezone is not None
    if zoned:   # its dates the clock's, across the date line too
        longitude_deg = clock_longitude_deg(year, longitude_deg, timezone)
    correction = clock_correction_min(year, longitude_deg if zoned else None, timezone if zoned else None)
    table = sun_rise_set_table(year, [(m, d) for m in range(1, 13) for d in TABLE_DAYS],
                               latitude_deg, longitude_deg, timezone)
    return Almanac(year, ZONE_TIME if zoned else LOCAL_MEAN_TIME, tuple(correction), table,
                   zoned and changes_offset(timezone, year))

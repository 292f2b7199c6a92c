"""Worked examples for the instructions (#10, #9): telling the time by the
Sun and by a star at the kit's own site in its epoch year, with the numbers
a pupil sees at each step.

The examples are worked with the kit's own astronomy, as its parts draw
it: the Sun's longitude of the calendar (at the site's noon), the epoch's
obliquity of the rete, the stars' places at the epoch, and the printed
clock correction rounded to the whole minute the ring shows.  So the
time an example gives is the time the paper instrument gives, to the
rounding of the printed numbers.  The spherical triangle is the usual one
(Smart, *Textbook on Spherical Astronomy*, 6th ed. 1977, ch. II):

    sin h = sin(phi) sin(delta) + cos(phi) cos(delta) cos(H),

H the hour angle, west positive; local apparent solar time is
12 h + H(Sun), and the sidereal time H(star) + RA(star) = H(Sun) + RA(Sun).

Each measured altitude is that of the nearest almucantar the plates draw
(a multiple of 10 deg with the usual steps), as a pupil would set it.
The Sun's example is a morning in the epoch year when the Sun stands
between 15 and 60 deg at 10:00 local apparent time; the star's, an evening
at 21:00 (20:00 or 22:00) on the almanac's clock when the Sun is at
least 12 deg below the horizon, with the brightest named star of the rete
between 20 and 70 deg, at least two hours from the meridian.  The
unequal hours' example is a morning of the Sun's example's date (or the
next month that suits) on an almucantar where the Sun's point opposite
stands well inside one of the plate's unequal hours.  Degrees at the
edges, radians inside, times in hours.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .almanac import SkyForKit
from .site_almanac import Almanac

#: Months tried for the examples, those of the school year first.
MONTH_ORDER = (3, 10, 4, 9, 5, 11, 2, 1, 12, 6, 8, 7)
#: The day of the month of an example.
EXAMPLE_DAY = 15
#: The Sun's hour angle of the morning example: 10:00 apparent time.
SUN_HOUR_ANGLE_DEG = -30.0
SUN_ALTITUDE_RANGE_DEG = (15.0, 60.0)
#: Clock times tried for the star's example (hours), the Sun's greatest
#: altitude then (nautical twilight over) and the star's room.
EVENING_HOURS = (21.0, 22.0, 20.0)
DARK_SUN_DEG = -12.0
STAR_ALTITUDE_RANGE_DEG = (20.0, 70.0)
STAR_MIN_HOUR_ANGLE_DEG = 30.0


@dataclass(frozen=True)
class SunExample:
    """The instructions' worked example by the Sun: a date, the altitude
    measured, the solar time the instrument reads and, with the ring's
    correction, the clock time."""

    month: int
    day: int
    sun_longitude_deg: float     # as the calendar gives it
    altitude_deg: float          # the measured altitude (on an almucantar)
    solar_hours: float           # local apparent solar time the instrument reads
    correction_min: int          # the ring's number on that date
    clock_hours: float           # solar time + correction


@dataclass(frozen=True)
class StarExample:
    """The instructions' worked example by a star: a night, the star and
    its measured altitude east or west, the Sun's place that night, and
    the solar and clock times the instrument gives."""

    month: int
    day: int
    star_index: int              # which of the sky's placed stars
    altitude_deg: float          # the measured altitude (on an almucantar)
    east: bool                   # the star rises (east of the meridian)
    sun_longitude_deg: float
    solar_hours: float
    correction_min: int
    clock_hours: float


@dataclass(frozen=True)
class UnequalExample:
    """The instructions' worked example of the unequal hours: a morning's
    measured altitude, the Sun's place, the unequal hour the point of the
    ecliptic opposite it shows among the plate's lines, and how long that
    day's unequal hours last."""

    month: int
    day: int
    sun_longitude_deg: float
    altitude_deg: float          # the measured altitude (on an almucantar), east of the meridian
    hour: int                    # 1 to 12: the unequal hour of the day, counted from sunrise
    hour_minutes: float          # the length of each of that day's unequal hours


@dataclass(frozen=True)
class WorkedExamples:
    """The instructions' worked examples, each None where none suits."""

    sun: SunExample | None       # None where the Sun never stands right (polar night all year)
    star: StarExample | None     # None where no night or no star suits
    unequal: UnequalExample | None = None   # None where no day has a morning that suits


def _altitude_rad(phi: float, dec: float, hour_angle: float) -> float:
    return math.asin(max(-1.0, min(1.0, math.sin(phi) * math.sin(dec)
                                   + math.cos(phi) * math.cos(dec) * math.cos(hour_angle))))


def hour_angle_rad(phi: float, dec: float, altitude: float) -> float | None:
    """|H| (radians) at which a body of declination ``dec`` stands at
    ``altitude`` seen from latitude ``phi``, or None if it never does."""
    denominator = math.cos(phi) * math.cos(dec)
    if abs(denominator) < 1e-9:
        return None
    c = (math.sin(altitude) - math.sin(phi) * math.sin(dec)) / denominator
    return math.acos(c) if -1.0 <= c <= 1.0 else None


def sun_place_rad(longitude_deg: float, obliquity_rad: float) -> tuple[float, float]:
    """(right ascension, declination) of the Sun at ecliptic longitude
    ``longitude_deg``, latitude 0 (Smart 1977, ch. II)."""
    lam = math.radians(longitude_deg)
    ra = math.atan2(math.cos(obliquity_rad) * math.sin(lam), math.cos(lam)) % (2 * math.pi)
    return ra, math.asin(math.sin(obliquity_rad) * math.sin(lam))


def _day(sky: SkyForKit, almanac: Almanac, month: int, day: int) -> tuple[float, int]:
    """The calendar's Sun longitude and the ring's whole-minute correction."""
    lon = next(x for m, d, x in sky.calendar if (m, d) == (month, day))
    corr = next(x for m, d, x in almanac.clock_correction if (m, d) == (month, day))
    return lon, int(round(corr))


def altitude_grid_deg(altitude_step_deg: float) -> float:
    """The altitudes the examples measure: multiples of 10 deg where the
    plates' almucantars fall on them (steps of 1, 2, 5 or 10 deg), else of
    the step itself, so that the example's almucantar is one drawn."""
    return 10.0 if abs(10.0 / altitude_step_deg - round(10.0 / altitude_step_deg)) < 1e-9 else altitude_step_deg


def _measured(altitude_deg: float, grid_deg: float) -> float:
    return float(round(altitude_deg / grid_deg) * grid_deg)


def sun_example(latitude_deg: float, sky: SkyForKit, almanac: Almanac, grid_deg: float = 10.0) -> SunExample | None:
    """A morning measurement of the Sun, on an almucantar of the grid, and
    the clock time it gives."""
    phi = math.radians(latitude_deg)
    for month in MONTH_ORDER:
        lon, corr = _day(sky, almanac, month, EXAMPLE_DAY)
        _, dec = sun_place_rad(lon, sky.obliquity_rad)
        alt = math.degrees(_altitude_rad(phi, dec, math.radians(SUN_HOUR_ANGLE_DEG)))
        if not SUN_ALTITUDE_RANGE_DEG[0] <= alt <= SUN_ALTITUDE_RANGE_DEG[1]:
            continue
        measured = _measured(alt, grid_deg)
        h = hour_angle_rad(phi, dec, math.radians(measured))
        if h is None or measured <= 0.0:  # at a pole the Sun's altitude tells no time
            continue
        solar = 12.0 - math.degrees(h) / 15.0
        return SunExample(month, EXAMPLE_DAY, lon, measured, solar, corr, solar + corr / 60.0)
    return None


def star_example(latitude_deg: float, sky: SkyForKit, almanac: Almanac, grid_deg: float = 10.0) -> StarExample | None:
    """An evening measurement of a bright named star and the clock time it
    gives."""
    phi = math.radians(latitude_deg)
    order = sorted((k for k, s in enumerate(sky.stars) if s.star.name), key=lambda k: sky.stars[k].star.mag)
    for month in MONTH_ORDER:
        lon, corr = _day(sky, almanac, month, EXAMPLE_DAY)
        sun_ra, sun_dec = sun_place_rad(lon, sky.obliquity_rad)
        for clock in EVENING_HOURS:
            solar = clock - corr / 60.0
            sun_h = math.radians((solar - 12.0) * 15.0)
            if math.degrees(_altitude_rad(phi, sun_dec, sun_h)) > DARK_SUN_DEG:
                continue
            sidereal = sun_ra + sun_h
            for k in order:
                st = sky.stars[k]
                ra, dec = math.radians(st.ra_deg), math.radians(st.dec_deg)
                h_star = (sidereal - ra + math.pi) % (2 * math.pi) - math.pi
                alt = math.degrees(_altitude_rad(phi, dec, h_star))
                if not (STAR_ALTITUDE_RANGE_DEG[0] <= alt <= STAR_ALTITUDE_RANGE_DEG[1]
                        and abs(math.degrees(h_star)) >= STAR_MIN_HOUR_ANGLE_DEG):
                    continue
                measured = _measured(alt, grid_deg)
                east = h_star < 0
                h = hour_angle_rad(phi, dec, math.radians(measured))
                if h is None:
                    continue
                star_h = -h if east else h
                read_sun_h = ra + star_h - sun_ra
                read = (12.0 + math.degrees(read_sun_h) / 15.0) % 24.0
                return StarExample(month, EXAMPLE_DAY, k, measured, east, lon, read, corr, read + corr / 60.0)
    return None


#: How far inside its unequal hour (a share of the hour from either of
#: its lines) the example's point stands, so that a pupil's reading on a
#: paper plate is not one line off.
UNEQUAL_INSIDE = 0.25
SUN_FROM_NOON_RAD = math.radians(30.0)


def unequal_hour(phi: float, dec: float, hour_angle: float) -> float | None:
    """The unequal hours of daylight passed since sunrise (0 to 12) when
    the Sun, at declination ``dec``, stands at ``hour_angle`` (radians,
    west positive) seen from latitude ``phi``, the horizon the
    astronomical one (no refraction, as the plate draws it); None on a
    day without sunrise and sunset.  The day's 12 hours are its arc
    above the horizon, from hour angle -H0 to H0, cos H0 = -tan(phi)
    tan(dec) (Meeus 1998, eq. 15.1, with h0 = 0): the plate's unequal hour
    line k (kitgen.parts.plate) is where the Sun's opposite point stands
    k/12 of the way along its own night arc, which is the Sun's day."""
    h0 = hour_angle_rad(phi, dec, 0.0)
    if h0 is None or not 0.0 < h0 < math.pi:
        return None
    return (hour_angle + h0) / (2 * h0) * 12.0


def unequal_example(latitude_deg: float, sky: SkyForKit, first_month: int | None = None,
                    grid_deg: float = 10.0) -> UnequalExample | None:
    """A morning on which the Sun measured on an almucantar of the grid
    puts its opposite point at least :data:`UNEQUAL_INSIDE` of an hour
    inside one of the plate's unequal hours, two hours or more before
    noon (where the Sun's altitude still changes fast enough to set the
    rete by): the Sun's example's month first (``first_month``), then the
    others in :data:`MONTH_ORDER`, on the almucantar that puts it nearest
    the middle of its hour (the lower of two as near); None where no
    morning suits (no sunrise, or the Sun never high enough)."""
    phi = math.radians(latitude_deg)
    months = ([first_month] if first_month else []) + [m for m in MONTH_ORDER if m != first_month]
    for month in months:
        lon = next(x for m, d, x in sky.calendar if (m, d) == (month, EXAMPLE_DAY))
        _, dec = sun_place_rad(lon, sky.obliquity_rad)
        top = math.degrees(_altitude_rad(phi, dec, 0.0))
        found = []
        for k in range(1, int(top // grid_deg) + 1):
            h = hour_angle_rad(phi, dec, math.radians(k * grid_deg))
            passed = None if h is None or h < SUN_FROM_NOON_RAD else unequal_hour(phi, dec, -h)
            if passed is not None and UNEQUAL_INSIDE <= passed % 1.0 <= 1.0 - UNEQUAL_INSIDE:
                found.append((abs(passed % 1.0 - 0.5), k * grid_deg, passed))
        if found:
            _, altitude, passed = min(found)
            day_min = 2 * hour_angle_rad(phi, dec, 0.0) / (2 * math.pi) * 1440.0   # sunrise to sunset
            return UnequalExample(month, EXAMPLE_DAY, lon, altitude, int(passed) + 1, day_min / 12.0)
    return None


def worked_examples(latitude_deg: float, sky: SkyForKit, almanac: Almanac,
                    altitude_step_deg: float = 5.0) -> WorkedExamples:
    """The examples for the site (see the module docstring), measured on
    almucantars the plates draw at ``altitude_step_deg``."""
    grid = altitude_grid_deg(altitude_step_deg)
    sun = sun_example(latitude_deg, sky, almanac, grid)
    return WorkedExamples(sun, star_example(latitude_deg, sky, almanac, grid),
                          unequal_example(latitude_deg, sky, sun.month if sun else None, grid))

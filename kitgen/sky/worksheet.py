"""A worksheet for the class (#10): questions computed for the kit's site
and epoch, with the answers a pupil finds on the instrument.

Worked, like the instructions' examples (kitgen.sky.worked_example), with
the kit's own calendar, obliquity and star places and the whole-minute
correction its ring prints, so that the answer key gives what the paper
instrument gives.  The spherical triangle is the usual one (Smart 1977,
ch. II); the Sun and the stars rise here on the kit's horizon line (no
refraction: the astrolabe's horizon), and the Sun's noon altitude is
90 deg - |latitude - declination|.  A building's height is the shadow
square's ratio times the distance plus the eyes' height (common
practice).  Degrees and hours at the edges.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .almanac import SkyForKit
from .site_almanac import Almanac
from .worked_example import MONTH_ORDER, hour_angle_rad, sun_place_rad

#: The shadow square's ratio, the distance (m) and the eyes' height (m) of
#: the height question; the ratio is one the square carries labelled.
HEIGHT_RATIO, HEIGHT_DISTANCE_M, EYE_HEIGHT_M = 0.8, 25.0, 1.5
#: The altitude of the afternoon question (a multiple of 10 deg, on a
#: drawn almucantar), tried in this order.
AFTERNOON_ALTITUDES_DEG = (30.0, 20.0, 40.0, 10.0)
QUESTION_DAY = 20


@dataclass(frozen=True)
class Question:
    """One question: ``kind`` names its words (``worksheet.q_<kind>`` and
    ``worksheet.a_<kind>``), ``values`` its numbers and dates, raw: the
    layout writes them in the kit's language."""

    kind: str
    values: tuple[tuple[str, object], ...]


def _day(sky: SkyForKit, almanac: Almanac, month: int, day: int) -> tuple[float, int]:
    lon = next(x for m, d, x in sky.calendar if (m, d) == (month, day))
    return lon, int(round(next(x for m, d, x in almanac.clock_correction if (m, d) == (month, day))))


def _q(kind: str, **values) -> Question:
    return Question(kind, tuple(values.items()))


def zenith_dates(latitude_deg: float, sky: SkyForKit) -> tuple[tuple[int, int], ...]:
    """The calendar's dates (month, day) on which the Sun stands nearest
    the zenith at noon: where its declination passes the latitude, one
    date for each crossing of the year (two between the tropics, none
    beyond them).  Of the two noons around a crossing, the one with the
    declination nearer the latitude (degrees at the edge)."""
    gap_deg = [math.degrees(sun_place_rad(lon, sky.obliquity_rad)[1]) - latitude_deg for _, _, lon in sky.calendar]
    out = []
    for k, here in enumerate(gap_deg):
        after = gap_deg[(k + 1) % len(gap_deg)]
        if (here < 0.0) != (after < 0.0):
            near = k if abs(here) <= abs(after) else (k + 1) % len(gap_deg)
            out.append(sky.calendar[near][:2])
    return tuple(sorted(set(out)))


def _first_question(latitude_deg: float, sky: SkyForKit) -> Question:
    """Between the tropics, the two dates of the overhead noon Sun; beyond
    them (or where both crossings fall on one date, at a tropic), the
    date of the longest day and highest noon Sun: the Sun's place nearest
    the summer solstice of the site's hemisphere."""
    dates = zenith_dates(latitude_deg, sky)
    if len(dates) == 2:
        (m, d), (m2, d2) = dates
        return _q("zenith_days", month=m, day=d, month2=m2, day2=d2)
    solstice = 90.0 if latitude_deg >= 0 else 270.0
    m, d, _ = min(sky.calendar, key=lambda c: abs((c[2] - solstice + 180.0) % 360.0 - 180.0))
    return _q("longest_day", month=m, day=d)


def worksheet_questions(latitude_deg: float, sky: SkyForKit, almanac: Almanac) -> tuple[Question, ...]:
    """Six to eight questions for the site (fewer where the Sun or the
    stars do not allow one, as in polar day)."""
    phi = math.radians(latitude_deg)
    out = []
    out.append(_first_question(latitude_deg, sky))
    # 2. The Sun's noon altitude and 3. sunrise and day length, on the
    #    20th of a school month where the Sun rises and sets.
    for month in MONTH_ORDER:
        lon, corr = _day(sky, almanac, month, QUESTION_DAY)
        _, dec = sun_place_rad(lon, sky.obliquity_rad)
        noon = 90.0 - abs(latitude_deg - math.degrees(dec))
        h0 = hour_angle_rad(phi, dec, 0.0)
        if h0 is None or noon <= 0.0:
            continue
        rise = 12.0 - math.degrees(h0) / 15.0
        out.append(_q("noon_altitude", month=month, day=QUESTION_DAY, altitude_deg=noon))
        # The length from the minute the key prints: sunset mirrors sunrise
        # about noon on the hour ring, and the two add up for the reader.
        out.append(_q("sunrise", month=month, day=QUESTION_DAY, solar_hours=rise, correction_min=corr,
                      day_length_hours=2.0 * (12.0 - round(rise * 60.0) / 60.0)))
        break
    # 4. The clock correction, and 5. the time from an afternoon altitude,
    #    on the 20th of another month.
    for month in MONTH_ORDER[1:]:
        lon, corr = _day(sky, almanac, month, QUESTION_DAY)
        _, dec = sun_place_rad(lon, sky.obliquity_rad)
        for alt in AFTERNOON_ALTITUDES_DEG:
            h = hour_angle_rad(phi, dec, math.radians(alt))
            if h is not None and math.degrees(h) >= 15.0:
                break
        else:
            continue
        out.append(_q("correction", month=month, day=QUESTION_DAY, correction_min=corr))
        solar = 12.0 + math.degrees(h) / 15.0
        out.append(_q("afternoon", month=month, day=QUESTION_DAY, altitude_deg=alt, solar_hours=solar,
                      correction_min=corr))
        break
    # 6. A building's height from a paced distance.
    out.append(_q("height", ratio=HEIGHT_RATIO, distance_m=HEIGHT_DISTANCE_M, eye_m=EYE_HEIGHT_M,
                  height_m=HEIGHT_RATIO * HEIGHT_DISTANCE_M + EYE_HEIGHT_M))
    # 7. A bright star's rising in the evening (between 18 h and midnight
    #    of solar time), on the 20th of a school month.
    named = [k for k, s in enumerate(sky.stars) if s.star.name]
    for month in MONTH_ORDER:
        lon, corr = _day(sky, almanac, month, QUESTION_DAY)
        sun_ra, _ = sun_place_rad(lon, sky.obliquity_rad)
        found = None
        for k in sorted(named, key=lambda k: sky.stars[k].star.mag):
            st = sky.stars[k]
            h0 = hour_angle_rad(phi, math.radians(st.dec_deg), 0.0)
            if h0 is None:
                continue
            solar = (12.0 + math.degrees(math.radians(st.ra_deg) - h0 - sun_ra) / 15.0) % 24.0
            if 18.0 <= solar < 23.5:
                found = (k, solar)
                break
        if found:
            out.append(_q("star_rise", month=month, day=QUESTION_DAY, star_index=found[0], solar_hours=found[1],
                          correction_min=corr))
            break
    return tuple(out)

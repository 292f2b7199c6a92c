"""The time read from the kit's exported geometry plus the exported clock
correction gives the time on the zone's clocks (#10).

A user reads local apparent solar time from the JSON alone
(tests/reading.py: calendar tick, rete, almucantar, hour ring), then adds
the day's ``almanac.clock_correction``.  The truth: the instant Skyfield
with DE421 (skyfield-data, no download) finds the Sun's apparent centre at
that altitude, on the zone's clock by the IANA database (zoneinfo).
Issue #10 asks for 1 minute, at sites east and west of their zone
meridian, north and south, in and out of summer time.
"""

from __future__ import annotations

import datetime as dt
import zoneinfo

import pytest
from skyfield.api import wgs84

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.json_export import geometry_dict

from .reading import read_time
from .skyfield_reference import ephemeris

TOLERANCE_MIN = 1.0

#: (latitude, east longitude, zone, date, altitude, morning)
CASES = [
    (40.42, -3.70, "Europe/Madrid", dt.date(2027, 1, 20), 20.0, True),       # 18.7 deg west of its meridian
    (40.42, -3.70, "Europe/Madrid", dt.date(2027, 7, 10), 45.0, False),      # and in summer time
    (-33.87, 151.21, "Australia/Sydney", dt.date(2027, 1, 15), 40.0, True),  # south, summer time
    (-33.87, 151.21, "Australia/Sydney", dt.date(2027, 6, 15), 20.0, False),
    (22.57, 88.36, "Asia/Kolkata", dt.date(2027, 11, 3), 30.0, True),        # east of its meridian
    (39.74, -104.99, "America/Denver", dt.date(2027, 8, 1), 35.0, False),    # west, US summer time
    (-34.60, -58.38, "America/Argentina/Buenos_Aires", dt.date(2027, 3, 30), 25.0, True),
]


def _clock_minutes_when_sun_at(lat, lon, zone, day, altitude_deg, morning, days_ahead: int = 0) -> float:
    """Minutes after local midnight on the zone's clock when the Sun's
    apparent centre reaches ``altitude_deg`` on the local solar date
    ``day`` (DE421, bisection); the clock's date is ``days_ahead`` later
    (a zone across the date line from its place)."""
    ts, eph = ephemeris()
    site = eph["earth"] + wgs84.latlon(lat, lon)
    base = dt.datetime(day.year, day.month, day.day, tzinfo=dt.timezone.utc)
    noon_ut_h = 12.0 - lon / 15.0

    def alt(hours):
        t = ts.from_datetime(base + dt.timedelta(hours=hours))
        return site.at(t).observe(eph["sun"]).apparent().altaz()[0].degrees - altitude_deg

    lo, hi = (noon_ut_h - 8.0, noon_ut_h) if morning else (noon_ut_h, noon_ut_h + 8.0)
    f_lo = alt(lo)
    assert f_lo * alt(hi) < 0
    for _ in range(40):
        mid = (lo + hi) / 2
        if alt(mid) * f_lo <= 0:
            hi = mid
        else:
            lo, f_lo = mid, alt(mid)
    local = (base + dt.timedelta(hours=(lo + hi) / 2)).astimezone(zoneinfo.ZoneInfo(zone))
    assert local.date() == day + dt.timedelta(days=days_ahead)
    return local.hour * 60 + local.minute + local.second / 60 + local.microsecond / 6e7


@pytest.mark.parametrize("lat,lon,zone,day,alt,morning", CASES)
def test_reading_plus_correction_is_clock_time(lat, lon, zone, day, alt, morning):
    recipe = parse_recipe_text(f"latitude: {lat}\nlongitude: {lon}\ntimezone: {zone}\nepoch: {day.year}\n")
    geom = geometry_dict(build_kit(recipe))
    assert geom["site"]["timezone"] == zone
    correction = next(c["minutes"] for c in geom["almanac"]["clock_correction"]
                      if (c["month"], c["day"]) == (day.month, day.day))
    read_min = read_time(geom, day.month, day.day, alt, morning) * 60.0
    truth_min = _clock_minutes_when_sun_at(lat, lon, zone, day, alt, morning)
    error = (read_min + correction - truth_min + 720.0) % 1440.0 - 720.0
    assert abs(error) < TOLERANCE_MIN, f"{zone} {day}: {error:+.2f} min"
    assert geom["almanac"]["time"] == "zone"


#: Places whose zone lies across the date line from them, so their clocks
#: run a day and some minutes ahead of local mean time (coordinates as
#: commonly given, from memory; the zones' offsets from zoneinfo):
#: (latitude, east longitude, zone, the clock's date, altitude, morning).
ACROSS_THE_DATE_LINE = [
    (-43.95, -176.55, "Pacific/Chatham", dt.date(2027, 2, 10), 30.0, True),   # UTC+13:45 in summer time
    (-43.95, -176.55, "Pacific/Chatham", dt.date(2027, 6, 20), 15.0, False),  # UTC+12:45
    (-13.83, -171.76, "Pacific/Apia", dt.date(2027, 9, 5), 40.0, True),       # UTC+13
]


@pytest.mark.parametrize("lat,lon,zone,day,alt,morning", ACROSS_THE_DATE_LINE)
def test_across_the_date_line_the_correction_is_the_days_minutes(lat, lon, zone, day, alt, morning):
    """The correction is the minutes of the day the clock runs ahead
    (+31 at Chatham), not a day and more (+1471): every day's within two
    hours.  And the calendar's dates are the clock's: the time read with
    the alidade on the clock's date, plus that date's correction, is the
    clock's time (DE421 and zoneinfo) within the tolerance, the Sun's
    local solar date being the day before."""
    recipe = parse_recipe_text(f"latitude: {lat}\nlongitude: {lon}\ntimezone: {zone}\nepoch: {day.year}\n")
    geom = geometry_dict(build_kit(recipe))
    assert all(abs(c["minutes"]) < 120 for c in geom["almanac"]["clock_correction"])
    correction = next(c["minutes"] for c in geom["almanac"]["clock_correction"]
                      if (c["month"], c["day"]) == (day.month, day.day))
    read_min = read_time(geom, day.month, day.day, alt, morning) * 60.0
    truth_min = _clock_minutes_when_sun_at(lat, lon, zone, day - dt.timedelta(days=1), alt, morning, days_ahead=1)
    assert abs(read_min + correction - truth_min) < TOLERANCE_MIN, f"{zone} {day}"

"""A sunset of the sunrise table that falls after midnight is marked as
the next day's (#12 review: "June: 1: 3:32–0:08" at 64.8 N on Alaska's
clock read as a sunset before the sunrise, and a pupil adding the
correction got "24:44").

Reference: Skyfield 1.4x with JPL's DE421 (from the skyfield-data
package, no download): ``almanac.find_settings`` with
``horizon_degrees=-0.8333`` gives the sunset, and the IANA time zone
database (Python's ``zoneinfo``) its date on the zone's clock.
"""

from __future__ import annotations

import datetime as dt
from zoneinfo import ZoneInfo

import pytest
from skyfield import almanac as sf_almanac
from skyfield.api import wgs84

from kitgen.kit import build_kit
from kitgen.layout.instructions import NEXT_DAY_MARK, sunrise_blocks
from kitgen.recipe.load import validate_recipe

from .skyfield_reference import ephemeris

#: (latitude, longitude, zone): far west in its zone with summer time;
#: a town whose sunsets all fall before midnight.
SITES = ((64.8, -147.7, "America/Anchorage"), (69.6, 19.0, "Europe/Oslo"), (52.2, 0.1, "Europe/London"))


def _sunset_next_day(latitude_deg, longitude_deg, zone, month, day) -> bool | None:
    """Whether the sunset after the sunrise of the zone's date falls on
    the next date (Skyfield, DE421); None with no sunset that day."""
    ts, eph = ephemeris()
    observer = eph["earth"] + wgs84.latlon(latitude_deg, longitude_deg)
    tz = ZoneInfo(zone)
    start = dt.datetime(2027, month, day, tzinfo=tz)
    t0, t1 = ts.from_datetime(start), ts.from_datetime(start + dt.timedelta(days=1, hours=12))
    rises, r_ok = sf_almanac.find_risings(observer, eph["sun"], t0, t1, horizon_degrees=-0.8333)
    sets, s_ok = sf_almanac.find_settings(observer, eph["sun"], t0, t1, horizon_degrees=-0.8333)
    rise = [t for t, ok in zip(rises, r_ok) if ok][:1]
    if not rise:
        return None
    after = [t for t, ok in zip(sets, s_ok) if ok and t.tt > rise[0].tt]
    if not after:
        return None
    return after[0].utc_datetime().astimezone(tz).date() > start.date()


@pytest.mark.parametrize("latitude_deg, longitude_deg, zone", SITES)
def test_sunsets_after_midnight_are_marked(latitude_deg, longitude_deg, zone):
    kit = build_kit(validate_recipe({"latitude": latitude_deg, "longitude": longitude_deg, "timezone": zone,
                                     "epoch": 2027, "language": "en"}))
    w = kit.words
    blocks = sunrise_blocks(kit)
    rows = " ".join(b.text for b in blocks if b.row)
    marked = 0
    for r in kit.plan.almanac.sun_rise_set:
        if r.reason:
            continue
        expected = _sunset_next_day(latitude_deg, longitude_deg, zone, r.month, r.day)
        if expected is None:
            continue
        sunset = f"{int(round(r.set_min)) % 1440 // 60}:{int(round(r.set_min)) % 60:02d}"
        assert (sunset + NEXT_DAY_MARK in rows) == expected, (r.month, r.day, sunset)
        marked += expected
    note = [b.text for b in blocks if b.text.startswith(NEXT_DAY_MARK + " ")]
    assert note == ([NEXT_DAY_MARK + " " + w("almanac.after_midnight")] if marked else [])
    if latitude_deg == 64.8:
        assert marked >= 3   # June 1 and 16, July 1 (Skyfield: 0:08, 0:44, 0:35 on the zone's clock)

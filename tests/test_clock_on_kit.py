"""Clock time from the kit as printed (#10), against Skyfield with the DE421
ephemeris (JPL; the copy the skyfield-data package carries, so nothing is
downloaded) and the IANA time zone database (Python's zoneinfo with the
tzdata package).

* A time read from the exported geometry (tests/reading.py, as a user reads
  the paper instrument) plus the clock correction read from the back's
  inner ring at the same date tick gives the zone time at which DE421 puts
  the Sun at the measured altitude, within 2 minutes: at sites east and west
  of their zone's meridian, north and south, in and out of summer time.
* With a longitude, every calendar tick stands at DE421's apparent ecliptic
  longitude of the Sun at the site's local mean noon.
* The worked examples of the instructions give the times that
  tests/reading.py reads from the geometry and DE421 confirms.
"""

from __future__ import annotations

import datetime as dt
import math
import zoneinfo

import pytest
from babel.dates import get_timezone_location

from kitgen.kit import build_kit
from kitgen.layout.instructions import clock_text, signed, story
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.json_export import geometry_dict

from .reading import _angle, _part, read_time
from .skyfield_reference import ephemeris

TOLERANCE_MIN = 2.0
EPOCH = 2027

# (latitude, east longitude, IANA zone): the zone meridian is 15 deg an hour
# of standard offset (Vienna 15 E, Lisbon 0, Sydney 150 E, Buenos Aires 45 W,
# Los Angeles 120 W, Madrid 15 E: offsets from the zone database).
SITES = {
    "east_of_meridian_north": (48.21, 16.37, "Europe/Vienna"),
    "west_of_meridian_north": (38.72, -9.14, "Europe/Lisbon"),
    "far_west_of_meridian": (40.42, -3.70, "Europe/Madrid"),
    "east_of_meridian_south": (-33.87, 151.21, "Australia/Sydney"),
    "west_of_meridian_south": (-34.60, -58.38, "America/Argentina/Buenos_Aires"),
    "east_of_meridian_west": (34.05, -118.24, "America/Los_Angeles"),
}

# (site, date, altitude, morning): dates in and out of summer time where
# the zone keeps it (Europe 28 Mar to 31 Oct 2027, Sydney to 4 Apr and from
# 3 Oct 2027, Los Angeles 14 Mar to 7 Nov 2027, by zoneinfo), and the day
# after a switch.
CASES = [
    ("east_of_meridian_north", dt.date(2027, 1, 20), 15.0, True),
    ("east_of_meridian_north", dt.date(2027, 6, 21), 45.0, False),
    ("east_of_meridian_north", dt.date(2027, 3, 29), 25.0, True),
    ("west_of_meridian_north", dt.date(2027, 11, 5), 20.0, True),
    ("west_of_meridian_north", dt.date(2027, 8, 14), 40.0, False),
    ("far_west_of_meridian", dt.date(2027, 7, 2), 30.0, True),
    ("far_west_of_meridian", dt.date(2027, 12, 10), 15.0, False),
    ("east_of_meridian_south", dt.date(2027, 1, 10), 50.0, True),
    ("east_of_meridian_south", dt.date(2027, 7, 2), 20.0, False),
    ("west_of_meridian_south", dt.date(2027, 2, 14), 35.0, False),
    ("west_of_meridian_south", dt.date(2027, 9, 1), 25.0, True),
    ("east_of_meridian_west", dt.date(2027, 4, 2), 40.0, True),
    ("east_of_meridian_west", dt.date(2027, 12, 22), 20.0, False),
]


def _recipe(site: str) -> str:
    lat, lon, tz = SITES[site]
    return f"latitude: {lat}\nlongitude: {lon}\ntimezone: {tz}\nepoch: {EPOCH}\naltitude_step_deg: 5\n"


@pytest.fixture(scope="module")
def kits():
    cache = {}

    def get(site):
        if site not in cache:
            kit = build_kit(parse_recipe_text(_recipe(site)))
            cache[site] = (kit, geometry_dict(kit))
        return cache[site]

    return get


def ring_correction_min(geom, month: int, day: int) -> int:
    """The number the back's inner ring shows where the alidade laid on the
    date's calendar tick crosses it (the run of the ring in that direction)."""
    back = _part(geom, "mater_back")
    tick = next(e for e in back["elements"] if e["role"] == "calendar_tick" and e["month"] == month
                and e["day"] == day)
    direction = _angle(tick["at"]) % 360.0
    for run in (e for e in back["elements"] if e["role"] == "clock_run"):
        if (direction - run["start_deg"]) % 360.0 < run["end_deg"] - run["start_deg"]:
            return run["minutes"]
    raise AssertionError("no run of the ring at that date")


def _sun_at_altitude_utc(lat, lon, day: dt.date, altitude_deg: float, morning: bool) -> dt.datetime:
    """The UT instant on ``day`` at which DE421 puts the Sun's apparent
    (unrefracted) centre at ``altitude_deg``, before or after local noon."""
    from skyfield.api import wgs84

    ts, eph = ephemeris()
    site = eph["earth"] + wgs84.latlon(lat, lon)
    base = dt.datetime(day.year, day.month, day.day, tzinfo=dt.timezone.utc)
    noon_h = 12.0 - lon / 15.0

    def alt(hours):
        t = ts.from_datetime(base + dt.timedelta(hours=hours))
        return site.at(t).observe(eph["sun"]).apparent().altaz()[0].degrees - altitude_deg

    lo, hi = (noon_h - 9.0, noon_h) if morning else (noon_h, noon_h + 9.0)
    f_lo = alt(lo)
    assert f_lo * alt(hi) < 0, "the Sun does not reach that altitude in this half-day"
    for _ in range(40):
        mid = (lo + hi) / 2
        f_mid = alt(mid)
        if f_mid * f_lo <= 0:
            hi = mid
        else:
            lo, f_lo = mid, f_mid
    return base + dt.timedelta(hours=(lo + hi) / 2)


def _zone_hours(utc: dt.datetime, tz: str) -> float:
    local = utc.astimezone(zoneinfo.ZoneInfo(tz))
    return local.hour + local.minute / 60.0 + (local.second + local.microsecond / 1e6) / 3600.0


def _minutes_apart(a_h: float, b_h: float) -> float:
    return abs((a_h - b_h + 12.0) % 24.0 - 12.0) * 60.0


@pytest.mark.parametrize("site,day,alt,morning", CASES)
def test_reading_plus_printed_correction_is_zone_time(kits, site, day, alt, morning):
    lat, lon, tz = SITES[site]
    _, geom = kits(site)
    solar_h = read_time(geom, day.month, day.day, alt, morning)
    clock_h = solar_h + ring_correction_min(geom, day.month, day.day) / 60.0
    truth_h = _zone_hours(_sun_at_altitude_utc(lat, lon, day, alt, morning), tz)
    off = _minutes_apart(clock_h, truth_h)
    assert off < TOLERANCE_MIN, f"kit {clock_h:.4f} h, zone time {truth_h:.4f} h: {off:.2f} min"


def test_ring_and_exported_correction_agree(kits):
    """Every day's run of the ring is the almanac's correction rounded to the
    whole minute (the JSON's almanac.clock_correction)."""
    _, geom = kits("east_of_meridian_south")
    for row in geom["almanac"]["clock_correction"][::3]:
        assert ring_correction_min(geom, row["month"], row["day"]) == round(row["minutes"])


@pytest.mark.parametrize("lon", [140.0, -120.0])
def test_calendar_ticks_at_local_noon_against_de421(lon):
    """With a longitude, each day's tick direction on the back gives DE421's
    apparent longitude of the Sun (true ecliptic and equinox of date) at
    12 h - longitude/15 of UT, within 0.01 deg (Meeus's low-accuracy solar
    longitude is good to 0.01 deg; a day's motion at 140 deg is 0.38 deg)."""
    from skyfield.framelib import ecliptic_frame

    ts, eph = ephemeris()
    kit = build_kit(parse_recipe_text(f"latitude: 35\nlongitude: {lon}\ntimezone: UTC\nepoch: {EPOCH}\n"))
    back = _part(geometry_dict(kit), "mater_back")
    ticks = [e for e in back["elements"] if e["role"] == "calendar_tick"][::9]
    worst = 0.0
    for e in ticks:
        printed = (180.0 - _angle(e["at"])) % 360.0
        t = ts.utc(EPOCH, e["month"], e["day"], 12.0 - lon / 15.0)
        lat_, lon_, _ = eph["earth"].at(t).observe(eph["sun"]).apparent().frame_latlon(ecliptic_frame)
        worst = max(worst, abs((printed - lon_.degrees + 180.0) % 360.0 - 180.0))
    assert worst < 0.01, f"worst {worst:.4f} deg"


@pytest.mark.parametrize("site", ["west_of_meridian_north", "east_of_meridian_south", "east_of_meridian_west"])
def test_sun_worked_example_agrees_with_reading_and_de421(kits, site):
    lat, lon, tz = SITES[site]
    kit, geom = kits(site)
    ex = kit.plan.examples.sun
    assert ex is not None
    # The numbers the pupil sees: the reading and the ring's correction.
    solar_h = read_time(geom, ex.month, ex.day, ex.altitude_deg, True)
    assert _minutes_apart(solar_h, ex.solar_hours) < 1.0
    assert ring_correction_min(geom, ex.month, ex.day) == ex.correction_min
    # The example's clock time is when DE421 puts the Sun at that altitude.
    truth_h = _zone_hours(_sun_at_altitude_utc(lat, lon, dt.date(EPOCH, ex.month, ex.day), ex.altitude_deg,
                                               True), tz)
    assert _minutes_apart(ex.clock_hours, truth_h) < TOLERANCE_MIN
    # And the instructions print those numbers.
    text = " ".join(b.text for b in _story(kit))
    w = kit.words
    shown_solar_min = round(ex.solar_hours * 60)
    assert clock_text(w, shown_solar_min / 60) in text
    assert clock_text(w, (shown_solar_min + ex.correction_min) / 60) in text
    assert signed(w, ex.correction_min) in text


@pytest.mark.parametrize("site", ["east_of_meridian_north", "west_of_meridian_south"])
def test_star_worked_example_against_de421(kits, site):
    """At the example's clock time the star stands at the measured altitude
    on the side the example says, by DE421 and the catalogue place
    (Hipparcos, proper motion applied by Skyfield) within 2 minutes."""
    from skyfield.api import Star, wgs84

    lat, lon, tz = SITES[site]
    kit, _ = kits(site)
    ex = kit.plan.examples.star
    assert ex is not None
    st = kit.sky.stars[ex.star_index].star
    star = Star(ra_hours=st.ra_deg / 15.0, dec_degrees=st.dec_deg, ra_mas_per_year=st.pm_ra_cosdec_mas_yr,
                dec_mas_per_year=st.pm_dec_mas_yr)
    ts, eph = ephemeris()
    observer = eph["earth"] + wgs84.latlon(lat, lon)
    local = dt.datetime(EPOCH, ex.month, ex.day, tzinfo=zoneinfo.ZoneInfo(tz)) + dt.timedelta(hours=ex.clock_hours)

    def alt_at(minutes):
        t = ts.from_datetime(local + dt.timedelta(minutes=minutes))
        return observer.at(t).observe(star).apparent().altaz()[0].degrees

    # The star's altitude changes by (alt(+1) - alt(-1))/2 a minute: the
    # example's error in minutes is its altitude error over that rate.
    rate = (alt_at(1.0) - alt_at(-1.0)) / 2.0
    assert (rate > 0) == ex.east, "the star rises in the east and sets in the west"
    off_min = abs(alt_at(0.0) - ex.altitude_deg) / abs(rate)
    assert off_min < TOLERANCE_MIN, f"{off_min:.2f} min"


def test_without_a_longitude_the_kit_says_local_mean_time():
    """No longitude: the ring carries minus the equation of time (JSON
    almanac time 'local_mean') and the instructions say what is missing,
    in the template's words."""
    kit = build_kit(parse_recipe_text(f"latitude: 52.2\nepoch: {EPOCH}\n"))
    geom = geometry_dict(kit)
    assert geom["almanac"]["time"] == "local_mean" and geom["site"]["longitude_deg"] is None
    back = _part(geom, "mater_back")
    assert any(e["role"] == "clock_run" for e in back["elements"])
    caption = " ".join(e["text"] for e in back["elements"] if e["role"] == "clock_caption")
    assert caption == kit.words("clock_scale.caption_mean")
    text = " ".join(b.text for b in _story(kit))
    assert kit.words("almanac.clock_step_mean") in text
    # Minus the equation of time stays within its known range, about -14.3
    # to +16.4 minutes (Meeus 1998, ch. 28).
    minutes = [round(r["minutes"]) for r in geom["almanac"]["clock_correction"]]
    assert -17 <= min(minutes) <= -15 and 13 <= max(minutes) <= 15


def _story(kit):
    return story(kit, layout_kit(kit))


@pytest.mark.parametrize("twilight,expected", [
    ("civil", [-6.0]), ("[nautical, astronomical]", [-18.0, -12.0]), ("none", []), ("false", []),
    ("true", [-18.0]), ("[astronomical, civil, civil]", [-18.0, -6.0])])
def test_twilight_circles_asked_for(twilight, expected):
    """twilight: draws one circle per twilight, at the Sun's altitudes of
    the Explanatory Supplement (1992): civil -6, nautical -12, astronomical
    -18; each the stereographic image of its almucantar, centre R cos(phi) /
    (sin(phi) + sin(h)) from the pole and radius R cos(h) / (sin(phi) +
    sin(h)) (the classical almucantar; Snyder 1987, eq. 21-33 on the
    sphere, worked as in tests/test_plate_geometry.py)."""
    kit = build_kit(parse_recipe_text(f"latitude: 48\nepoch: {EPOCH}\ntwilight: {twilight}\n"))
    plate = kit.part("plate")
    circles = [e for e in plate.elements if e.role == "twilight"]
    assert sorted({e.values["altitude_deg"] for e in circles}) == expected
    R = kit.dims.equator_radius_mm
    phi = math.radians(48.0)
    for e in circles:
        h = math.radians(e.values["altitude_deg"])
        centre = R * math.cos(phi) / (math.sin(phi) + math.sin(h))
        radius = R * math.cos(h) / (math.sin(phi) + math.sin(h))
        assert abs(abs(e.geom["center"][1]) - centre) < 1e-6 and abs(e.geom["radius"] - radius) < 1e-6


def test_a_kit_too_small_for_the_ring_points_to_the_table():
    """On an 80 mm kit with a long title the back has no room for the ring
    (the title keeps its 8 pt, tests/test_legibility.py): no run is drawn,
    and the time-telling steps end with the table's correction instead, in
    the template's words."""
    kit = build_kit(parse_recipe_text(f"latitude: 52.2\nlongitude: 0.1\ntimezone: Europe/London\nepoch: {EPOCH}\n"
                                      "diameter_mm: 80\ntitle: Larkspur Valley School\n"))
    assert not any(e.role == "clock_run" for e in kit.part("mater_back").elements)
    w = kit.words
    text = [b.text for b in _story(kit)]
    # The zone named by its city in the kit's language (CLDR through Babel).
    city = get_timezone_location("Europe/London", locale="en", return_city=True)
    assert w("almanac.clock_step_table", heading=w("almanac.correction_heading"),
             clock_name=w("almanac.clock_zone", zone=city)) in text


# -- the worked example's numbers to the nearest tick and minute (#9) -----------
# A pupil reads the Sun's place at the nearest degree tick of the back's
# ecliptic ring and the time at the nearest minute: the example prints the
# numbers so read, rounded, never cut short (24.9 deg is 25, 9:56.6 is
# 9:57).  The places and times are read from the exported geometry by
# tests/reading.py, and the time checked against DE421's local apparent
# solar time of the Sun at that altitude (kits without a longitude keep
# 12:00 UT as noon, so apparent time is Greenwich's).

ROUNDING_KITS = ["latitude: 24.5\nepoch: 2026\n", "latitude: 3.1\nsheet: letter\nepoch: 2026\n",
                 "latitude: 40.6\nlanguage: el\nepoch: 2026\n", "latitude: 26.9\nlanguage: hi\nsheet: a5\nepoch: 2026\n"]


def _apparent_solar_minutes_de421(lat: float, day: dt.date, altitude_deg: float) -> float:
    """Greenwich apparent solar time (minutes) at which DE421 puts the
    Sun's centre at ``altitude_deg`` in the morning, seen from latitude
    ``lat`` on the prime meridian: 12 h plus the Sun's hour angle."""
    from skyfield.api import wgs84

    ts, eph = ephemeris()
    t = ts.from_datetime(_sun_at_altitude_utc(lat, 0.0, day, altitude_deg, True))
    hour_angle, _, _ = (eph["earth"] + wgs84.latlon(lat, 0.0)).at(t).observe(eph["sun"]).apparent().hadec()
    return (12.0 + hour_angle.hours) * 60.0


def test_worked_example_prints_the_nearest_degree_and_minute():
    from kitgen.layout.instructions import sun_place

    from .reading import hour_from_front, sun_longitude_from_back, sun_point_on_rete, turned_to_almucantar

    half_up_place = half_up_minute = 0
    for recipe in ROUNDING_KITS:
        kit = build_kit(parse_recipe_text(recipe))
        w, ex, geom = kit.words, kit.plan.examples.sun, geometry_dict(kit)
        plate = kit.plan.plates[0].id
        text = " ".join(b.text for b in _story(kit))
        # The place: the date's tick read on the ecliptic ring, to the nearest degree.
        lon = sun_longitude_from_back(geom, ex.month, ex.day)
        nearest = round(lon) % 360
        half_up_place += lon % 1.0 >= 0.5
        assert w("almanac.sun_place", degrees=w.number(nearest % 30),
                 sign=w.items("zodiac.signs")[nearest // 30]) in text
        assert sun_place(w, ex.sun_longitude_deg) in text
        # The time: the reading, to the nearest minute.
        solar_min = read_time(geom, ex.month, ex.day, ex.altitude_deg, True, plate) * 60.0
        half_up_minute += solar_min % 1.0 >= 0.5
        shown = round(solar_min)
        assert clock_text(w, shown / 60.0) in text
        # Set as printed, the Sun's place at the whole degree gives that minute too,
        assert abs(hour_from_front(geom, turned_to_almucantar(geom, sun_point_on_rete(geom, float(nearest)),
                                                              ex.altitude_deg, True, plate)) * 60.0 - shown) <= 1.0
        # ... and DE421 puts the Sun at that altitude within the minute.
        truth = _apparent_solar_minutes_de421(kit.plan.site.latitude_deg, dt.date(2026, ex.month, ex.day),
                                              ex.altitude_deg)
        assert abs(truth - shown) <= 1.0, (recipe, truth, shown)
    # The kits include numbers a truncation would print one lower.
    assert half_up_place and half_up_minute

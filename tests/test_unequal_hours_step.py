"""The unequal hours' step (#12 review: the plate draws and numbers the
unequal hours and the glossary names them, but no step used them).

References:
- Skyfield 1.4x with JPL's DE421 (from the skyfield-data package, no
  download): ``almanac.find_risings`` / ``find_settings`` with
  ``horizon_degrees`` give the times the Sun's centre crosses the
  astronomical horizon (0 deg, no refraction, as the plate draws it) and
  rises through the example's altitude.  The day from sunrise to sunset
  in twelve equal parts is the definition of the unequal (temporal)
  hours (common practice).
- J. P. Snyder, *Map Projections: A Working Manual* (USGS Professional
  Paper 1395, 1987), eq. 21-4: on the plate, projected from the pole
  opposite the plate's, a circle of declination dec has radius
  R tan((90 deg - s dec) / 2), R the equator's radius, s the hemisphere's
  sign; the Sun's opposite point runs along that circle of its own
  declination, its angle round the centre turning evenly with the hour.
"""

from __future__ import annotations

import datetime as dt
import math

import numpy as np
import pytest
from skyfield import almanac as sf_almanac
from skyfield.api import wgs84

from kitgen.kit import build_kit
from kitgen.layout.instructions import unequal_blocks
from kitgen.recipe.load import validate_recipe
from kitgen.sky.worked_example import sun_place_rad

from .skyfield_reference import ephemeris

#: Sites (latitude, sheet): north, south, near the equator, near and beyond the polar circles.
SITES = ((51.5, "a4"), (41.1, "a4"), (-33.9, "a4"), (0.2, "letter"), (60.2, "a4"), (-45.0, "a5"), (69.6, "a4"),
         (-70.0, "a5"))
LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")


def _kit(latitude_deg: float, sheet: str = "a4", **more):
    return build_kit(validate_recipe({"latitude": latitude_deg, "epoch": 2027, "sheet": sheet,
                                      **more}))


def _skyfield_day(latitude_deg: float, month: int, day: int, altitude_deg: float):
    """(sunrise, the morning's crossing of ``altitude_deg``, sunset) at
    longitude 0 on the UT date, as days (Skyfield, DE421), the horizon
    and the altitude those of the Sun's centre without refraction."""
    ts, eph = ephemeris()
    observer = eph["earth"] + wgs84.latlon(latitude_deg, 0.0)
    t0, t1 = ts.utc(2027, month, day), ts.utc(2027, month, day + 1)

    def first(found):
        times, ok = found
        return float(times[ok][0].tt)

    rise = first(sf_almanac.find_risings(observer, eph["sun"], t0, t1, horizon_degrees=0.0))
    up = first(sf_almanac.find_risings(observer, eph["sun"], t0, t1, horizon_degrees=altitude_deg))
    down = first(sf_almanac.find_settings(observer, eph["sun"], t0, t1, horizon_degrees=0.0))
    return rise, up, down


@pytest.mark.parametrize("latitude_deg, sheet", SITES)
def test_example_hour_against_skyfield(latitude_deg, sheet):
    """The example's unequal hour is the one the Sun is in at the morning
    time it rises through the measured altitude, and each hour lasts a
    twelfth of that day, to a minute (Skyfield, DE421)."""
    ex = _kit(latitude_deg, sheet).plan.examples.unequal
    assert ex is not None
    rise, up, down = _skyfield_day(latitude_deg, ex.month, ex.day, ex.altitude_deg)
    passed = (up - rise) / (down - rise) * 12.0
    assert int(passed) + 1 == ex.hour
    assert 0.15 < passed % 1.0 < 0.85, "the example stands well inside its hour"
    assert ex.hour_minutes == pytest.approx((down - rise) * 24 * 60 / 12, abs=1.0)


def _angle(p) -> float:
    return math.atan2(p[1], p[0])


def _crossing_angle(pieces, radius_mm: float) -> float:
    """The angle round the plate's centre where a drawn line (its
    polylines ``pieces``, in order along it, joined across the gaps left
    round a word) crosses the circle of ``radius_mm`` about the centre."""
    pts = np.concatenate([np.asarray(points, dtype=float) for points in pieces])
    r = np.hypot(pts[:, 0], pts[:, 1]) - radius_mm
    found = np.nonzero(np.sign(r[:-1]) != np.sign(r[1:]))[0].tolist()
    assert len(found) == 1, "an unequal hour line crosses each circle of declination once"
    i = found[0]
    t = r[i] / (r[i] - r[i + 1])
    return _angle(pts[i] + t * (pts[i + 1] - pts[i]))


@pytest.mark.parametrize("latitude_deg, sheet", SITES)
def test_example_point_between_the_drawn_lines(latitude_deg, sheet):
    """The Sun's opposite point, where Skyfield puts the Sun in its day,
    lies between the plate's drawn lines ``hour - 1`` and ``hour`` (the
    horizon being lines 0 and 12) on the circle of its declination
    (Snyder eq. 21-4): the space the example names is the one a pupil
    sees the point in."""
    kit = _kit(latitude_deg, sheet)
    ex = kit.plan.examples.unequal
    plate = kit.parts_of("plate")[0]
    s = 1 if latitude_deg >= 0 else -1
    eq = next(e for e in plate.elements if e.role == "equator")
    radius_r = eq.geom["radius"]
    _, dec_sun = sun_place_rad(ex.sun_longitude_deg, kit.sky.obliquity_rad)
    r_mm = radius_r * math.tan((math.pi / 2 - s * -dec_sun) / 2)
    lines = {}
    for e in plate.elements:
        if e.role == "unequal_hour":
            lines.setdefault(e.values["hour"], []).append(e.geom["points"])
    crossing = {k: _crossing_angle(pieces, r_mm) for k, pieces in lines.items()}
    horizon = next(e for e in plate.elements if e.role == "horizon")
    (cx, cy), rh = horizon.geom["center"], horizon.geom["radius"]
    d = math.hypot(cx, cy)   # the horizon's and the declination circle's meeting points
    a = (r_mm ** 2 - rh ** 2 + d ** 2) / (2 * d)
    h = math.sqrt(r_mm ** 2 - a ** 2)
    base = (a * cx / d, a * cy / d)
    meets = [_angle((base[0] + h * cy / d, base[1] - h * cx / d)), _angle((base[0] - h * cy / d, base[1] + h * cx / d))]

    def turn(a_rad, b_rad):   # from a to b, the short way, signed
        return (b_rad - a_rad + math.pi) % (2 * math.pi) - math.pi

    west = min(meets, key=lambda m: abs(turn(m, crossing[1])))
    east = next(m for m in meets if m is not west)
    sense = 1 if turn(west, crossing[1]) > 0 else -1
    whole = (sense * (east - west)) % (2 * math.pi)
    share = {0: 0.0, 12: 1.0, **{k: ((sense * (c - west)) % (2 * math.pi)) / whole for k, c in crossing.items()}}
    assert all(share[k] < share[k + 1] for k in range(12)), "the lines follow one another"
    rise, up, down = _skyfield_day(latitude_deg, ex.month, ex.day, ex.altitude_deg)
    day_share = (up - rise) / (down - rise)
    assert share[ex.hour - 1] < day_share < share[ex.hour]


@pytest.mark.parametrize("latitude_deg, sheet", ((67.0, "a4"), (69.6, "a5"), (-70.0, "a4"), (75.0, "a4")))
def test_every_hour_numbered_beyond_the_polar_circle(latitude_deg, sheet):
    """Beyond a polar circle the lines are drawn for the days with a
    sunrise and a sunset (Meeus eq. 15.1), and numbered as elsewhere:
    each hour's number is on the plate or named in the build's notes
    (they had been drawn without numbers, and the step reads a number)."""
    kit = _kit(latitude_deg, sheet)
    plate = kit.parts_of("plate")[0]
    assert any(e.role == "unequal_hour" for e in plate.elements)
    numbered = {e.values["hour"] for e in plate.elements if e.role == "unequal_hour_label"}
    left_out = set(plate.values.get("labels_left_out", ()))
    assert all(k in numbered or kit.words.number(k) in left_out for k in range(1, 13))
    assert len(numbered) >= 11


def test_steps_only_with_the_lines():
    """No unequal hours' step where the plate leaves the lines out."""
    assert unequal_blocks(_kit(45.0))
    assert not unequal_blocks(_kit(45.0, unequal_hours=False))


@pytest.mark.parametrize("language", LANGUAGES)
def test_example_says_its_numbers(language):
    """The example names the hour, the minutes and both points' degrees,
    in the kit's own digits, in every language."""
    kit = _kit(51.5, language=language)
    ex = kit.plan.examples.unequal
    blocks = unequal_blocks(kit)
    text = blocks[-1].text
    w = kit.words
    assert text.count(w.number(ex.hour)) >= 2
    assert w.number(round(ex.hour_minutes)) in text
    degrees = round(ex.sun_longitude_deg) % 30
    assert text.count(w.number(degrees) + "°") >= 2   # the Sun's place and the point opposite
    assert len(blocks) == 5   # the heading, three steps, the example

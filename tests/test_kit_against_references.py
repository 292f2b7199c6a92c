"""The exported geometry of whole kits against independent computations.

- Ecliptic graduations on the rete: ERFA's IAU 2006 obliquity (erfa.obl06)
  and ecliptic-to-equatorial rotation, then the stereographic formula
  rho = R tan(pi/4 - delta/2) of Snyder (USGS PP 1395, 1987, polar aspect),
  written out here independently: within 0.02 mm.
- Stars on the rete: PyEphem's own star list, computed as astrometric
  places for the epoch (ephem's a_ra/a_dec with epoch=the epoch): within
  0.02 mm.
- Calendar ticks on the back: the Sun's apparent longitude at 12:00 UT of
  each date from Skyfield with DE421 (skyfield-data): within 0.1 deg.
"""

from __future__ import annotations

import math

import erfa
import numpy as np
import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.json_export import geometry_dict

from .reading import sun_longitude_from_back
from .skyfield_reference import ephemeris

# Sites, epochs and sheets: north, south, equator, high latitude.
KITS = [(47.6, 2026, "a4"), (-37.8, 2033, "letter"), (0.0, 2041, "a3"), (71.0, 1998, "tabloid")]


@pytest.fixture(scope="module", params=KITS, ids=lambda k: f"lat{k[0]}-{k[1]}-{k[2]}")
def kit_geometry(request):
    lat, epoch, sheet = request.param
    stars = "[Vega, Sirius, Arcturus, Capella, Rigel, Procyon, Altair, Aldebaran, Spica, Pollux, Deneb, Regulus]"
    if lat < 0:
        stars = "[Sirius, Canopus, Achernar, Rigel, Procyon, Altair, Aldebaran, Spica, Antares, Fomalhaut, Regulus]"
    recipe = parse_recipe_text(f"latitude: {lat}\nepoch: {epoch}\nsheet: {sheet}\nstars: {stars}\n")
    return recipe, geometry_dict(build_kit(recipe))


def _part(geom, kind):
    return next(p for p in geom["parts"] if p["kind"] == kind)


def _equator_radius_mm(geom, sign):
    """The plate's equator circle gives the scale R of the projection."""
    eq = next(e for e in _part(geom, "plate")["elements"] if e["role"] == "equator")
    return eq["radius"]


def _snyder_xy(ra_rad, dec_rad, sign, R):
    """Rete coordinates from Snyder's polar stereographic formula: radius
    R tan(pi/4 - s dec/2), at right ascension ra counter-clockwise from +y
    seen from the north (clockwise seen from the south)."""
    rho = R * np.tan(np.pi / 4 - sign * dec_rad / 2)
    return np.stack([-sign * rho * np.sin(ra_rad), rho * np.cos(ra_rad)], axis=-1)


def test_ecliptic_graduations_against_erfa(kit_geometry):
    recipe, geom = kit_geometry
    sign = 1 if recipe.latitude_deg >= 0 else -1
    R = _equator_radius_mm(geom, sign)
    ticks = [e for e in _part(geom, "rete")["elements"] if e["role"] == "ecliptic_tick"]
    assert len({round(t["longitude_deg"]) for t in ticks}) == 360
    # ERFA OBL06 at the middle of the epoch year (TT ~ the kit's epoch + 0.5).
    d1, d2 = erfa.cal2jd(recipe.epoch, 7, 2)
    eps = erfa.obl06(d1, d2)
    lam = np.radians([t["longitude_deg"] for t in ticks])
    ra = np.arctan2(np.sin(lam) * math.cos(eps), np.cos(lam))
    dec = np.arcsin(math.sin(eps) * np.sin(lam))
    expected = _snyder_xy(ra, dec, sign, R)
    got = np.array([t["at"] for t in ticks])
    assert np.max(np.hypot(*(got - expected).T)) < 0.02


def test_stars_against_pyephem(kit_geometry):
    import ephem

    recipe, geom = kit_geometry
    sign = 1 if recipe.latitude_deg >= 0 else -1
    R = _equator_radius_mm(geom, sign)
    stars = [e for e in _part(geom, "rete")["elements"] if e["role"] == "star"]
    assert len(stars) >= 10
    epoch = ephem.date(f"{recipe.epoch}/7/2")
    for s in stars:
        body = ephem.star(s["name"])
        body.compute(epoch, epoch=epoch)
        expected = _snyder_xy(float(body.a_ra), float(body.a_dec), sign, R)
        assert math.dist(s["at"], expected) < 0.02, s["name"]
        assert abs(s["dec_deg"] - math.degrees(body.a_dec)) < 1.0 / 3600


def test_calendar_against_de421(kit_geometry):
    recipe, geom = kit_geometry
    if recipe.epoch > 2053:
        pytest.skip("DE421 ends in 2053")
    from skyfield.framelib import ecliptic_frame

    ts, eph = ephemeris()
    ticks = [e for e in _part(geom, "mater_back")["elements"] if e["role"] == "calendar_tick"]
    days = 366 if recipe.epoch % 4 == 0 and (recipe.epoch % 100 or recipe.epoch % 400 == 0) else 365
    assert len(ticks) == days
    sample = ticks[::7]
    t = ts.utc(recipe.epoch, [e["month"] for e in sample], [e["day"] for e in sample], 12)
    lat, lon, _ = eph["earth"].at(t).observe(eph["sun"]).apparent().frame_latlon(ecliptic_frame)
    for e, truth in zip(sample, lon.degrees):
        read = sun_longitude_from_back(geom, e["month"], e["day"])
        assert abs((read - truth + 180) % 360 - 180) < 0.1, (e["month"], e["day"])


def test_hour_ring_noon_and_direction(kit_geometry):
    """Noon at the top; hours advance clockwise seen from the front of a
    northern instrument and counter-clockwise on a southern one (the
    direction of the Sun's daily motion seen from the visible pole: common
    practice, and what the projection gives)."""
    recipe, geom = kit_geometry
    sign = 1 if recipe.latitude_deg >= 0 else -1
    ticks = {e["hour"]: e["at"] for e in _part(geom, "mater_front")["elements"] if e["role"] == "hour_tick"}
    assert len(ticks) >= 96
    noon, six_pm = ticks[12.0], ticks[18.0]
    assert abs(noon[0]) < 1e-9 and noon[1] > 0
    assert math.copysign(1, six_pm[0]) == sign and abs(six_pm[1]) < 1e-9

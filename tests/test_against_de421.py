"""The Sun's apparent ecliptic longitude on the kit's calendar scale
against JPL's DE421 ephemeris, and against ERFA where DE421 ends.

References:
- Skyfield with the JPL DE421 ephemeris shipped in the skyfield-data
  package (Folkner et al. 2008, IPN Progress Report 42-178), and
  Skyfield's built-in time scale: the apparent geocentric place of the
  Sun (light time, aberration, deflection) in ``ecliptic_frame``, the true
  ecliptic and equinox of date.
- DE421 covers 1899-07-29 to 2053-10-09 only.  For 2099 the reference is
  built from ERFA (pyerfa) alone: ``epv00`` (Earth's heliocentric and
  barycentric position and velocity, a fit to JPL DE405 good to a few km
  over 1900-2100), ``ab`` (aberration), ``pnm06a`` (ICRS to the true
  equator and equinox of date, IAU 2006/2000A), ``obl06`` + ``nut06a``
  (true obliquity).  That reference is itself checked against DE421 below.

Requirement (issue 2): on every date of 1950, 2000, 2026, 2050 and 2099 at
12:00 UT, the kit's longitude is within 0.01 deg of the reference; Meeus,
*Astronomical Algorithms* (2nd ed., 1998), ch. 25, gives 0.01 deg as the
accuracy of the method kitgen uses.  Measured worst cases (deg): 1950
0.0077, 2000 0.0072, 2026 0.0097, 2050 0.0082 (DE421); 2099 0.0062 (ERFA).
"""

from __future__ import annotations

import math
import os

import erfa
import numpy as np
import pytest
import skyfield.iokit
import skyfield_data
from skyfield.api import Loader
from skyfield.framelib import ecliptic_frame

from kitgen.sky.sun import calendar_longitudes_deg

REQUIRED_DEG = 0.01
DE421_YEARS = (1950, 2000, 2026, 2050)
ERFA_YEARS = (2099,)
#: Light speed in au per day (IAU 2012 au; ERFA's DC).
C_AU_PER_DAY = erfa.DC


def _no_download(*args, **kwargs):
    raise AssertionError("the test tried to download a file; DE421 must come from skyfield-data")


@pytest.fixture(scope="module")
def sky():
    """Skyfield's time scale and DE421, from files installed with the
    skyfield-data and skyfield packages; any attempt to download fails."""
    folder = skyfield_data.get_skyfield_data_path()
    if not os.path.isfile(os.path.join(folder, "de421.bsp")):
        pytest.fail(f"de421.bsp is missing from skyfield-data ({folder}); "
                    "install the test extra: pip install -e .[test]")
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(skyfield.iokit, "download", _no_download)
        load = Loader(folder, verbose=False)
        ts = load.timescale(builtin=True)
        eph = load("de421.bsp")
    return ts, eph


def _kit_year(year):
    cal = calendar_longitudes_deg(year)
    months = np.array([m for m, _, _ in cal])
    days = np.array([d for _, d, _ in cal])
    return months, days, np.array([lam for _, _, lam in cal])


def _wrap_deg(a):
    return (np.asarray(a) + 180.0) % 360.0 - 180.0


def _de421_longitudes_deg(sky, t):
    _, eph = sky
    lat, lon, _ = eph["earth"].at(t).observe(eph["sun"]).apparent().frame_latlon(ecliptic_frame)
    return lon.degrees


def _erfa_longitudes_deg(jd_tt):
    """Apparent geocentric ecliptic longitude of the Sun, true ecliptic and
    equinox of date, from ERFA alone (see the module docstring)."""
    jd_tt = np.asarray(jd_tt, dtype=float)
    pvh, pvb = erfa.epv00(jd_tt, 0.0)
    # Geocentric Sun = -(heliocentric Earth); the light left the Sun tau
    # earlier, when the Sun stood back along its barycentric velocity
    # (Earth's barycentric minus heliocentric velocity).
    sun = -pvh["p"]
    dist_au = np.linalg.norm(sun, axis=1)
    tau_d = dist_au / C_AU_PER_DAY
    sun = sun - tau_d[:, None] * (pvb["v"] - pvh["v"])
    v = pvb["v"] / C_AU_PER_DAY
    bm1 = np.sqrt(1.0 - np.sum(v * v, axis=1))
    _, unit = erfa.pn(sun)
    apparent = erfa.ab(unit, v, dist_au, bm1)
    _, deps = erfa.nut06a(jd_tt, 0.0)
    true_obliquity = erfa.obl06(jd_tt, 0.0) + deps
    to_ecliptic = erfa.rx(true_obliquity, np.broadcast_to(np.eye(3), (len(jd_tt), 3, 3)))
    w = np.einsum("nij,njk,nk->ni", to_ecliptic, erfa.pnm06a(jd_tt, 0.0), apparent)
    return np.degrees(np.arctan2(w[:, 1], w[:, 0])) % 360.0


@pytest.mark.parametrize("year", DE421_YEARS)
def test_sun_longitude_every_date_against_de421(sky, year):
    ts, _ = sky
    months, days, ours = _kit_year(year)
    assert len(ours) == (366 if year % 4 == 0 and (year % 100 or year % 400 == 0) else 365)
    t = ts.ut1(year, months, days, 12)
    diff = _wrap_deg(ours - _de421_longitudes_deg(sky, t))
    worst = float(np.max(np.abs(diff)))
    assert worst < REQUIRED_DEG, f"{year}: worst {worst:.5f} deg"


@pytest.mark.parametrize("year", ERFA_YEARS)
def test_sun_longitude_every_date_against_erfa_beyond_de421(sky, year):
    # 12:00 UT1 with Skyfield's extrapolated Delta T; in 2099 nobody knows
    # Delta T to better than minutes, and a minute moves the Sun 0.0007 deg.
    ts, _ = sky
    months, days, ours = _kit_year(year)
    t = ts.ut1(year, months, days, 12)
    diff = _wrap_deg(ours - _erfa_longitudes_deg(t.tt))
    worst = float(np.max(np.abs(diff)))
    assert worst < REQUIRED_DEG, f"{year}: worst {worst:.5f} deg"


@pytest.mark.parametrize("year", DE421_YEARS)
def test_erfa_reference_agrees_with_de421(sky, year):
    # The ERFA-only reference used for 2099, against DE421 where both
    # exist: measured 0.009" at worst; 0.05" is 1/700 of the requirement.
    ts, _ = sky
    months, days, _ = _kit_year(year)
    t = ts.ut1(year, months, days, 12)
    diff = _wrap_deg(_erfa_longitudes_deg(t.tt) - _de421_longitudes_deg(sky, t)) * 3600.0
    assert np.max(np.abs(diff)) < 0.05


def test_calendar_runs_once_round_the_ecliptic(sky):
    # The Sun crosses the March equinox (longitude 0) near March 20 in
    # these years (a fact of the Gregorian calendar; DE421 confirms the day).
    ts, _ = sky
    for year in DE421_YEARS:
        months, days, ours = _kit_year(year)
        steps = _wrap_deg(np.diff(ours))
        assert np.all((steps > 0.95) & (steps < 1.03))  # 360/365.25 = 0.9856 deg a day, +-1.7% (eccentricity)
        i = int(np.argmax(np.diff(ours) < -300.0))  # the wrap from ~359.x to ~0.x
        ref = _de421_longitudes_deg(sky, ts.ut1(year, months[i:i + 2], days[i:i + 2], 12))
        assert ref[0] > 350.0 and ref[1] < 10.0
        assert months[i] == 3 and 19 <= days[i] <= 21
        assert math.isclose(_wrap_deg(ours[i + 1] - ref[1]), 0.0, abs_tol=REQUIRED_DEG)

"""The sky layer's time scales, obliquity, precession and ecliptic-to-
equatorial conversion against outside references.

References:
- ERFA (pyerfa), the open copy of the IAU's SOFA library: ``obl06``
  (IAU 2006 mean obliquity), ``p06e`` (IAU 2006 precession angles),
  ``bp06`` and ``pmat06`` (IAU 2006 precession and bias-precession
  matrices), ``eceq06`` (ecliptic of date to ICRS), ``rx``/``s2c``/``c2s``
  (rotations and spherical coordinates), ``cal2jd`` (Gregorian calendar to
  Julian Date).
- Skyfield's built-in Delta T table (``load.timescale(builtin=True)``:
  IERS values for the recent past, Morrison and Stephenson's for earlier
  years), for TT - UT1.
- Meeus, *Astronomical Algorithms* (2nd ed., 1998), example 7.a (from
  memory), for one Julian Date worked by hand.
"""

from __future__ import annotations

import math

import erfa
import numpy as np
import pytest
import skyfield_data
from skyfield.api import Loader

from kitgen.sky.ecliptic import ecliptic_to_equatorial_rad
from kitgen.sky.obliquity import mean_obliquity_rad
from kitgen.sky.precession import precession_angles_rad, precession_matrix
from kitgen.sky.timescale import delta_t_s, julian_date_ut

ARCSEC_PER_RAD = 180.0 / math.pi * 3600.0
J2000_JD = 2451545.0

#: 401 TT dates, 1900 January 0.5 to 2100 January 1.5 (the recipe's epochs).
DATES_JD_TT = np.linspace(2415020.0, 2488070.0, 401)
CENTURIES = (DATES_JD_TT - J2000_JD) / 36525.0


def _sample_vectors(n=64, seed=2006):
    v = np.random.default_rng(seed).normal(size=(n, 3))
    return v / np.linalg.norm(v, axis=1, keepdims=True)


def _separation_arcsec(a, b):
    """Angle between unit vectors (rows), by atan2 of |a x b| and a.b:
    accurate for tiny angles, where arccos of the dot product is not."""
    cross = np.linalg.norm(np.cross(a, b), axis=-1)
    return np.arctan2(cross, np.sum(a * b, axis=-1)) * ARCSEC_PER_RAD


# -- obliquity ---------------------------------------------------------------

def test_mean_obliquity_matches_erfa_obl06():
    # ERFA obl06 evaluates the same IAU 2006 polynomial (Capitaine et al.
    # 2003, eq. 39); only rounding may differ: 1e-14 rad is 2 microarcsec.
    ours = mean_obliquity_rad(CENTURIES)
    ref = erfa.obl06(DATES_JD_TT, 0.0)
    assert np.max(np.abs(ours - ref)) < 1e-14


def test_obliquity_at_j2000_is_erfa_eps0():
    # ERFA p06e returns eps0, the IAU 2006 obliquity at J2000.0 (84381.406").
    eps0 = erfa.p06e(J2000_JD, 0.0)[0]
    assert abs(float(mean_obliquity_rad(0.0)) - eps0) < 1e-15
    assert abs(eps0 * ARCSEC_PER_RAD - 84381.406) < 1e-6


# -- precession --------------------------------------------------------------

def _p06e_angles(jd_tt):
    """zeta_A, z_A, theta_A from ERFA p06e, whose outputs in order are
    eps0, psia, oma, bpa, bqa, pia, bpia, epsa, chia, za, zetaa, thetaa,
    pa, gam, phi, psi (ERFA/SOFA documentation of p06e)."""
    out = erfa.p06e(jd_tt, 0.0)
    za, zetaa, thetaa = out[9], out[10], out[11]
    return zetaa, za, thetaa


def test_precession_angles_match_erfa_p06e():
    # The same IAU 2006 series (Capitaine et al. 2003, eq. 40); rounding only.
    zeta, z, theta = precession_angles_rad(CENTURIES)
    ref_zeta, ref_z, ref_theta = _p06e_angles(DATES_JD_TT)
    assert np.max(np.abs(zeta - ref_zeta)) < 1e-14
    assert np.max(np.abs(z - ref_z)) < 1e-14
    assert np.max(np.abs(theta - ref_theta)) < 1e-14


def test_precession_angles_grow_at_the_general_precession_rate():
    # A check that the comparison above is not of two zeros: at J2000 the
    # rate of zeta_A + z_A is the precession in right ascension m, and that
    # of theta_A the precession in declination n; IAU 2006 values about
    # 4612.16" and 2004.19" per century (Explanatory Supplement to the
    # Astronomical Almanac, 3rd ed., 2013, ch. 6; from memory).
    h = 1e-3
    plus, minus = precession_angles_rad(h), precession_angles_rad(-h)
    m = (plus[0] + plus[1] - minus[0] - minus[1]) / (2 * h) * ARCSEC_PER_RAD
    n = (plus[2] - minus[2]) / (2 * h) * ARCSEC_PER_RAD
    assert abs(m - 4612.16) < 0.05
    assert abs(n - 2004.19) < 0.05


def test_precession_matrix_matches_erfa_precession_only_matrix():
    # ERFA bp06 returns (rb, rp, rbp): frame bias, precession, and both.
    # Our matrix is precession alone, built from the equatorial angles;
    # ERFA's rp is built from the Fukushima-Williams angles of the same
    # model.  Measured agreement over 1900-2100: 5e-7"; the tolerance of
    # 1e-5" (10 microarcsec) leaves room for the two parameterisations only.
    v = _sample_vectors()
    worst = 0.0
    for jd, t in zip(DATES_JD_TT, CENTURIES):
        _, rp, _ = erfa.bp06(jd, 0.0)
        worst = max(worst, float(np.max(_separation_arcsec(v @ precession_matrix(t).T, v @ rp.T))))
    assert worst < 1e-5


def test_precession_matrix_against_erfa_pmat06_differs_by_the_frame_bias_only():
    # ERFA pmat06 also holds the ICRS-to-J2000 frame bias, about 23 mas
    # (IERS Conventions 2010, ch. 5), which kitgen neglects on purpose.
    v = _sample_vectors()
    worst = 0.0
    for jd, t in zip(DATES_JD_TT, CENTURIES):
        worst = max(worst, float(np.max(_separation_arcsec(v @ precession_matrix(t).T,
                                                            v @ erfa.pmat06(jd, 0.0).T))))
    assert 0.015 < worst < 0.03


def test_precession_over_a_century_moves_the_equinox_by_the_known_amount():
    # The J2000 equinox seen in the frame of 2100: its right ascension has
    # moved by about -(zeta_A + z_A), i.e. roughly 1.28 deg (IAU 2006).
    t = 1.0
    rp = erfa.bp06(J2000_JD + 36525.0, 0.0)[1]
    ours = precession_matrix(t) @ np.array([1.0, 0.0, 0.0])
    ra_ours, _ = erfa.c2s(ours)
    ra_ref, _ = erfa.c2s(rp @ np.array([1.0, 0.0, 0.0]))
    assert abs(ra_ours - ra_ref) * ARCSEC_PER_RAD < 1e-5
    assert abs(math.degrees(ra_ours) - 1.281) < 0.01


# -- ecliptic to equatorial ----------------------------------------------------

LONGITUDES_RAD = np.linspace(0.0, 2.0 * math.pi, 721)


@pytest.mark.parametrize("jd_tt", DATES_JD_TT[::40])
def test_ecliptic_to_equatorial_matches_erfa_eceq06(jd_tt):
    # ERFA eceq06 takes ecliptic coordinates of date (IAU 2006) to the ICRS;
    # pmat06 then carries ICRS to the mean equator and equinox of date, the
    # frame kitgen works in.  Measured agreement: 3e-10"; the tolerance of
    # 1e-6" allows rounding in the chain of ERFA's matrices.
    eps = erfa.obl06(jd_tt, 0.0)
    ra, dec = ecliptic_to_equatorial_rad(LONGITUDES_RAD, eps)
    ra_icrs, dec_icrs = erfa.eceq06(jd_tt, 0.0, LONGITUDES_RAD, np.zeros_like(LONGITUDES_RAD))
    ref = erfa.s2c(ra_icrs, dec_icrs) @ erfa.pmat06(jd_tt, 0.0).T
    assert np.max(_separation_arcsec(erfa.s2c(ra, dec), ref)) < 1e-6
    # Documented range 0..2pi; 2pi itself can come out of the floating-point
    # modulo of a longitude a hair below 2pi.
    assert np.all((ra >= 0.0) & (ra <= 2.0 * math.pi))


def test_ecliptic_to_equatorial_is_the_rotation_about_the_equinox():
    # The same conversion as ERFA's rotation about x by -eps (rx), with the
    # right ascension and declination read by ERFA's c2s.
    for jd_tt in DATES_JD_TT[::50]:
        eps = erfa.obl06(jd_tt, 0.0)
        ra, dec = ecliptic_to_equatorial_rad(LONGITUDES_RAD, eps)
        ecl = erfa.s2c(LONGITUDES_RAD, np.zeros_like(LONGITUDES_RAD))
        ra_ref, dec_ref = erfa.c2s(ecl @ erfa.rx(-eps, np.eye(3)).T)
        dra = (ra - ra_ref + math.pi) % (2.0 * math.pi) - math.pi
        assert np.max(np.abs(dra)) < 1e-12
        assert np.max(np.abs(dec - dec_ref)) < 1e-12
    # The solstices lie at declination +-eps (a known fact of the ecliptic).
    eps = erfa.obl06(J2000_JD, 0.0)
    _, dec = ecliptic_to_equatorial_rad(np.array([math.pi / 2, 3 * math.pi / 2]), eps)
    assert np.allclose(dec, [eps, -eps], atol=1e-15)


# -- calendar and Delta T ------------------------------------------------------

def test_julian_date_matches_erfa_cal2jd():
    # Every 7th day of 1900-2100 (all months, leap and century years) and
    # the leap days themselves, at several hours of the day.
    import datetime as dt

    day = dt.date(1900, 1, 1)
    dates = []
    while day.year <= 2100:
        dates.append(day)
        day += dt.timedelta(days=7)
    dates += [dt.date(y, 2, 29) for y in range(1904, 2101, 4) if y != 2100]
    dates += [dt.date(1900, 2, 28), dt.date(1900, 3, 1), dt.date(2100, 2, 28), dt.date(2100, 3, 1)]
    worst = 0.0
    for d in dates:
        djm0, djm = erfa.cal2jd(d.year, d.month, d.day)
        for hour in (0.0, 6.5, 12.0, 23.75):
            ours = julian_date_ut(d.year, d.month, d.day, hour)
            worst = max(worst, abs(ours - (djm0 + djm + hour / 24.0)))
    # Julian Dates near 2.45e6 carry about 5e-10 day of rounding.
    assert worst < 1e-8


def test_julian_date_worked_examples():
    # J2000.0 is 2000 January 1, 12:00 TT = JD 2451545.0 (IAU definition).
    assert julian_date_ut(2000, 1, 1, 12.0) == J2000_JD
    # Meeus (1998), example 7.a (from memory): 1957 October 4.81 = JD 2436116.31.
    assert abs(julian_date_ut(1957, 10, 4, 0.81 * 24.0) - 2436116.31) < 1e-6


@pytest.fixture(scope="module")
def skyfield_timescale():
    # The built-in tables ship inside Skyfield: nothing is downloaded.
    return Loader(skyfield_data.get_skyfield_data_path(), verbose=False).timescale(builtin=True)


#: (first year, end year, tolerance s).  Espenak and Meeus fitted their
#: polynomials to the observed Delta T up to 2005 (about 1 s); after 2005
#: theirs was a 2006 prediction, which the Earth's rotation has since
#: outrun by about 6 s (measured 5.8 s at 2025).  Measured worst cases:
#: 1.1 s (1900-1950), 0.7 s (1950-2005), 5.8 s (2005-2026).
DELTA_T_SPANS = ((1900.0, 1950.0, 1.5), (1950.0, 2005.0, 1.0), (2005.0, 2026.0, 6.5))


@pytest.mark.parametrize("first, end, tolerance_s", DELTA_T_SPANS)
def test_delta_t_against_skyfield_builtin_table(skyfield_timescale, first, end, tolerance_s):
    years = np.arange(first, end, 0.1)
    jd = J2000_JD + (years - 2000.0) * 365.25
    ref = skyfield_timescale.ut1_jd(jd).delta_t
    assert np.max(np.abs(delta_t_s(years) - ref)) < tolerance_s


def test_delta_t_pieces_join():
    # Espenak and Meeus (2006) chose their pieces, and the -0.5628 (2150 - y)
    # term after 2050, so that Delta T runs on without a jump; a seam of
    # more than 0.1 s would be a wrong coefficient.
    for year in (1920.0, 1941.0, 1961.0, 1986.0, 2005.0, 2050.0, 2150.0):
        before, after = delta_t_s(year - 1e-6), delta_t_s(year)
        assert abs(after - before) < 0.1, year
    years = np.arange(2026.0, 2100.0, 0.5)
    assert np.all(np.diff(delta_t_s(years)) > 0.0)

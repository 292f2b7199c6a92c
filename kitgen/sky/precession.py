"""Precession of the equator and equinox, IAU 2006 (P03), and the linear
proper motion of stars, to carry J2000 catalogue places to the epoch.

Angles in radians inside; degrees only at :func:`mean_place_deg`.
"""

from __future__ import annotations

import numpy as np

from .constants import ARCSEC_TO_RAD, MAS_TO_RAD


def _poly_arcsec(t, coeffs):
    out = np.zeros_like(np.asarray(t, dtype=float))
    for c in reversed(coeffs):
        out = out * t + c
    return out


def precession_angles_rad(t_centuries_tt):
    """Equatorial precession angles zeta_A, z_A, theta_A (radians) of the
    IAU 2006 precession, Capitaine, Wallace & Chapront (2003), A&A 412, 567,
    eq. 40 (also IERS Conventions 2010, eq. 5.40)."""
    t = np.asarray(t_centuries_tt, dtype=float)
    zeta = _poly_arcsec(t, [2.650545, 2306.083227, 0.2988499, 0.01801828, -0.000005971, -0.0000003173])
    z = _poly_arcsec(t, [-2.650545, 2306.077181, 1.0927348, 0.01826837, -0.000028596, -0.0000002904])
    theta = _poly_arcsec(t, [0.0, 2004.191903, -0.4294934, -0.04182264, -0.000007089, -0.0000001274])
    return zeta * ARCSEC_TO_RAD, z * ARCSEC_TO_RAD, theta * ARCSEC_TO_RAD


def _r2(a):
    c, s = np.cos(a), np.sin(a)
    return np.array([[c, 0.0, -s], [0.0, 1.0, 0.0], [s, 0.0, c]])


def _r3(a):
    c, s = np.cos(a), np.sin(a)
    return np.array([[c, s, 0.0], [-s, c, 0.0], [0.0, 0.0, 1.0]])


def precession_matrix(t_centuries_tt: float):
    """Rotation matrix from the mean equator and equinox of J2000.0 to those
    of date: P = R3(-z_A) R2(theta_A) R3(-zeta_A) (Lieske et al. 1977
    construction with the IAU 2006 angles).  The 23 mas frame bias between
    ICRS and J2000 mean is neglected: it is 1e-5 mm on the largest rete."""
    zeta, z, theta = precession_angles_rad(float(t_centuries_tt))
    return _r3(-z) @ _r2(theta) @ _r3(-zeta)


def unit_vector(ra_rad, dec_rad):
    """Cartesian unit vector(s), shape (..., 3), of right ascension and declination."""
    ra = np.asarray(ra_rad, dtype=float)
    dec = np.asarray(dec_rad, dtype=float)
    return np.stack([np.cos(dec) * np.cos(ra), np.cos(dec) * np.sin(ra), np.sin(dec)], axis=-1)


def apply_proper_motion(ra_rad, dec_rad, pm_ra_cosdec_mas_yr, pm_dec_mas_yr, years):
    """Unit vectors after ``years`` of linear motion across the sky.

    The position moves along the tangent plane by the proper motion (mu_alpha*
    = mu_alpha cos delta, mu_delta) times the interval and is renormalised:
    the rigorous space motion of e.g. ERFA's PMSAFE without parallax and
    radial velocity, whose effect over a century is below 0.01" for stars
    brighter than 3.5 mag.
    """
    ra = np.asarray(ra_rad, dtype=float)
    dec = np.asarray(dec_rad, dtype=float)
    p = unit_vector(ra, dec)
    e_ra = np.stack([-np.sin(ra), np.cos(ra), np.zeros_like(ra)], axis=-1)
    e_dec = np.stack([-np.sin(dec) * np.cos(ra), -np.sin(dec) * np.sin(ra), np.cos(dec)], axis=-1)
    mu_a = np.asarray(pm_ra_cosdec_mas_yr, dtype=float) * MAS_TO_RAD * years
    mu_d = np.asarray(pm_dec_mas_yr, dtype=float) * MAS_TO_RAD * years
    v = p + mu_a[..., None] * e_ra + mu_d[..., None] * e_dec
    return v / np.linalg.norm(v, axis=-1, keepdims=True)


def mean_place_deg(ra_j2000_deg, dec_j2000_deg, pm_ra_cosdec_mas_yr, pm_dec_mas_yr, epoch_year: float):
    """Mean right ascension and declination (degrees) at the mean equator
    and equinox of ``epoch_year`` (a Julian epoch in TT) of stars given at
    J2000.0: proper motion, then IAU 2006 precession."""
    years = float(epoch_year) - 2000.0
    v = apply_proper_motion(np.radians(ra_j2000_deg), np.radians(dec_j2000_deg),
                            pm_ra_cosdec_mas_yr, pm_dec_mas_yr, years)
    v = v @ precession_matrix(years / 100.0).T
    ra = np.degrees(np.arctan2(v[..., 1], v[..., 0])) % 360.0
    dec = np.degrees(np.arcsin(np.clip(v[..., 2], -1.0, 1.0)))
    return ra, dec

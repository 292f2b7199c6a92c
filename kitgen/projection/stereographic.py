"""Polar stereographic projection of the celestial sphere onto the equator.

The astrolabe projects the sky from the celestial pole *opposite* the user's
hemisphere onto the plane of the equator (Snyder, *Map Projections - A
Working Manual*, USGS Professional Paper 1395, 1987, ch. 21, polar aspect,
eq. 21-33 to 21-35 with k0 chosen so that the equator has radius
``equator_radius_mm``): a northern instrument projects from the south pole
and is seen from the north; a southern one projects from the north pole and
is seen from the south.  Latitude 0 is drawn as a northern instrument.

Frames.  A direction on the sky is a unit vector in the *equatorial frame of
the place*: x towards hour angle +90 deg (the west point), y towards hour
angle 0 (the upper meridian), z towards the north celestial pole.  On the
drawn part, +y is the noon side of the meridian and the x axis is mirrored
for southern instruments, so that the view is always from the visible pole
(daily motion clockwise in the north, counter-clockwise in the south).

All angles are radians inside this module; arrays broadcast.
"""

from __future__ import annotations

import numpy as np


def hemisphere_sign(latitude_deg: float) -> int:
    """+1 for a northern (or equatorial) instrument, -1 for a southern one."""
    return 1 if latitude_deg >= 0.0 else -1


def equatorial_vector(hour_angle_rad, declination_rad):
    """Unit vector(s) of the equatorial frame of the place, shape (..., 3)."""
    h = np.asarray(hour_angle_rad, dtype=float)
    d = np.asarray(declination_rad, dtype=float)
    cd = np.cos(d)
    return np.stack(np.broadcast_arrays(cd * np.sin(h), cd * np.cos(h), np.sin(d)), axis=-1)


def horizontal_vector(altitude_rad, azimuth_rad, latitude_rad):
    """Unit vector(s), in the equatorial frame of the place, of the direction
    at altitude ``altitude_rad`` and azimuth ``azimuth_rad`` (from north
    through east) for an observer at geographic latitude ``latitude_rad``.

    Built from the local zenith, north and east unit vectors (the usual
    horizontal-to-equatorial rotation, e.g. Meeus, *Astronomical
    Algorithms*, 2nd ed., ch. 13, written as vectors so that the poles need
    no special case).
    """
    a = np.asarray(altitude_rad, dtype=float)
    A = np.asarray(azimuth_rad, dtype=float)
    phi = float(latitude_rad)
    zenith = np.array([0.0, np.cos(phi), np.sin(phi)])
    north = np.array([0.0, -np.sin(phi), np.cos(phi)])
    east = np.array([-1.0, 0.0, 0.0])
    ca = np.cos(a)[..., None]
    return (ca * np.cos(A)[..., None] * north + ca * np.sin(A)[..., None] * east
            + np.sin(a)[..., None] * zenith)


def to_view_frame(vectors, sign: int):
    """Mirror an equatorial-frame vector into the frame seen from the visible
    pole: x and z change sign for a southern instrument (``sign`` = -1)."""
    v = np.asarray(vectors, dtype=float)
    return v * np.array([sign, 1.0, sign])


def project_vectors(vectors, sign: int, equator_radius_mm: float):
    """Stereographic projection of unit vectors to (x, y) in mm on the part.

    Snyder (1987) eq. 21-33/34 for the polar aspect, rho = 2 R k0 tan(pi/4 -
    phi/2) with 2 R k0 = ``equator_radius_mm``; in vector form
    (x, y) = R (vx, vy) / (1 + vz) in the view frame.  The projection point
    itself (vz = -1) maps to infinity.
    """
    v = to_view_frame(vectors, sign)
    with np.errstate(divide="ignore", invalid="ignore"):
        scale = equator_radius_mm / (1.0 + v[..., 2])
        return np.stack([v[..., 0] * scale, v[..., 1] * scale], axis=-1)


def project(hour_angle_rad, declination_rad, sign: int, equator_radius_mm: float):
    """Project points given by hour angle and declination; returns (..., 2) mm."""
    return project_vectors(equatorial_vector(hour_angle_rad, declination_rad), sign, equator_radius_mm)


def unproject(xy_mm, sign: int, equator_radius_mm: float):
    """Inverse projection: (x, y) mm on the part to unit vectors of the
    equatorial frame of the place (Snyder 1987, eq. 21-37 in vector form)."""
    p = np.asarray(xy_mm, dtype=float) / equator_radius_mm
    q = np.sum(p * p, axis=-1)
    v = np.stack([2 * p[..., 0], 2 * p[..., 1], 1.0 - q], axis=-1) / (1.0 + q)[..., None]
    return to_view_frame(v, sign)

"""Exact images of circles on the sphere under the stereographic projection.

The stereographic projection maps every circle on the sphere to a circle in
the plane, or to a straight line when the circle passes through the point of
projection (Snyder, *Map Projections - A Working Manual*, USGS PP 1395,
1987, p. 154: "circles on the globe ... are shown as circles or straight
lines").  A circle on the sphere is given by its pole ``n`` (unit vector,
equatorial frame of the place) and angular radius ``rho`` (radians).  By
symmetry its image is symmetric about the plane holding the projection axis
and ``n``, so the two points of the circle in that plane project to the ends
of a diameter of the image circle.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .stereographic import to_view_frame

#: A circle is drawn as the straight line it nearly is when cos((theta +
#: rho) / 2) falls below this.  Its image radius is then above R / (2 x
#: 2.5e-7), two million equator radii, and across a disc of two equator
#: radii the circle departs from the line by less than 4 R x 2.5e-7 =
#: 1e-6 R (under 0.2 micrometre for the largest kit), far below anything a
#: printer shows; a nearer threshold would leave arcs so flat that no
#: reader of the geometry can handle them with ordinary floating point.
_LINE_TOLERANCE = 2.5e-7


@dataclass(frozen=True)
class PlaneCircle:
    """A circle of the drawing: its centre and radius in mm."""

    center_mm: tuple[float, float]
    radius_mm: float


@dataclass(frozen=True)
class PlaneLine:
    """The line through ``point_mm`` with unit direction ``direction``."""

    point_mm: tuple[float, float]
    direction: tuple[float, float]


def project_circle(pole, radius_rad: float, sign: int, equator_radius_mm: float):
    """Image of the circle of angular radius ``radius_rad`` about ``pole``.

    Returns a :class:`PlaneCircle` or, for a circle through the point of
    projection, a :class:`PlaneLine`.  Let theta be the angle of the pole
    from the visible celestial pole; the circle's points in the meridian
    plane of the pole lie at polar angles theta - rho and theta + rho, and a
    point at polar angle t projects to the signed distance R tan(t/2)
    (Snyder 1987, eq. 21-33).
    """
    n = to_view_frame(np.asarray(pole, dtype=float), sign)
    n = n / np.linalg.norm(n)
    theta = float(np.arccos(np.clip(n[2], -1.0, 1.0)))
    horiz = float(np.hypot(n[0], n[1]))
    u = np.array([n[0], n[1]]) / horiz if horiz > 1e-15 else np.array([0.0, 1.0])
    R = equator_radius_mm
    d1 = R * np.tan((theta - radius_rad) / 2.0)
    half_sum = (theta + radius_rad) / 2.0
    if abs(np.cos(half_sum)) < _LINE_TOLERANCE:
        p = u * d1
        return PlaneLine((float(p[0]), float(p[1])), (float(-u[1]), float(u[0])))
    d2 = R * np.tan(half_sum)
    c = u * (d1 + d2) / 2.0
    return PlaneCircle((float(c[0]), float(c[1])), float(abs(d2 - d1) / 2.0))

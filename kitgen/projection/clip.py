"""Plane geometry for clipping projected curves to the disc of a part.

Pure plane geometry (no astronomy): the parts of a circle or line inside a
disc centred on the pin, arcs through three points, and polylines cut at a
disc.  Angles in degrees at the edges (as the geometry model stores them),
radians inside.
"""

from __future__ import annotations

import math

import numpy as np


#: Tolerance (mm) for a circle lying on the disc's edge.
_EDGE_MM = 1e-9


def _norm_deg(a: float) -> float:
    return a % 360.0


def circle_inside_disc(center, radius_mm: float, disc_radius_mm: float):
    """Angular ranges (start_deg, end_deg), counter-clockwise with
    end > start, of the circle (``center``, ``radius_mm``) that lie inside
    the disc of ``disc_radius_mm`` about the origin.

    Returns ``[]`` when the circle is wholly outside, ``None`` when it is
    wholly inside (draw it whole).
    """
    cx, cy = float(center[0]), float(center[1])
    d = math.hypot(cx, cy)
    r, R = radius_mm, disc_radius_mm
    # A circle that reaches the edge to within rounding is inside: the outer
    # tropic *is* the disc's edge, and computed twice it may come out a few
    # ulps larger; without the tolerance it would vanish or become an arc.
    if d + r <= R + _EDGE_MM:
        return None
    if d >= r + R or d + R <= r:
        return []
    # Angle g at the circle's centre between the direction to the origin
    # and the intersection points, by the law of cosines written in its
    # half-angle form, sin^2(g/2) = (R - (d - r)) (R + (d - r)) / (4 r d):
    # the plain form (r^2 + d^2 - R^2) / (2 r d) loses every digit for the
    # huge, nearly straight image circles near a degenerate latitude.
    e = d - r
    sin_half_sq = (R - e) * (R + e) / (4.0 * r * d)
    g = math.degrees(2.0 * math.asin(math.sqrt(max(0.0, min(1.0, sin_half_sq)))))
    towards_origin = math.degrees(math.atan2(-cy, -cx))
    return [(_norm_deg(towards_origin - g), _norm_deg(towards_origin - g) + 2 * g)]


def line_inside_disc(point, direction, disc_radius_mm: float):
    """The chord of the line (``point``, unit ``direction``) inside the disc
    about the origin, as two end points, or ``None``."""
    p = np.asarray(point, dtype=float)
    u = np.asarray(direction, dtype=float)
    b = float(p @ u)
    c = float(p @ p) - disc_radius_mm ** 2
    disc = b * b - c
    if disc <= 0:
        return None
    s = math.sqrt(disc)
    return (tuple(p + u * (-b - s)), tuple(p + u * (-b + s)))


def polyline_inside_disc(points, disc_radius_mm: float):
    """Split a polyline (N, 2) into the runs that lie inside the disc,
    ending each run exactly on the disc's edge."""
    pts = np.asarray(points, dtype=float)
    inside = np.hypot(pts[:, 0], pts[:, 1]) <= disc_radius_mm
    runs, current = [], []

    def edge_point(p, q):
        # Point on segment p->q at distance disc_radius_mm from the origin.
        d = q - p
        a, b, c = d @ d, 2 * p @ d, p @ p - disc_radius_mm ** 2
        disc = max(b * b - 4 * a * c, 0.0)
        roots = [(-b - math.sqrt(disc)) / (2 * a), (-b + math.sqrt(disc)) / (2 * a)]
        t = min((r for r in roots if -1e-12 <= r <= 1 + 1e-12), default=0.0, key=lambda r: abs(r - 0.5))
        return p + t * d

    for i, p in enumerate(pts):
        if inside[i]:
            if not current and i > 0:
                current.append(edge_point(pts[i - 1], p))
            current.append(p)
        elif current:
            current.append(edge_point(pts[i - 1], p))
            runs.append(np.array(current))
            current = []
        elif i > 0:
            chord = _segment_chord(pts[i - 1], p, disc_radius_mm)
            if chord is not None:
                runs.append(np.array(chord))
    if current:
        runs.append(np.array(current))
    return [r for r in runs if len(r) >= 2]


def _segment_chord(p, q, disc_radius_mm: float):
    """The part inside the disc of a segment whose two ends lie outside it."""
    d = q - p
    a, b, c = d @ d, 2 * p @ d, p @ p - disc_radius_mm ** 2
    disc = b * b - 4 * a * c
    if a == 0 or disc <= 0:
        return None
    t0, t1 = (-b - math.sqrt(disc)) / (2 * a), (-b + math.sqrt(disc)) / (2 * a)
    if t1 <= 0 or t0 >= 1:
        return None
    return [p + max(t0, 0.0) * d, p + min(t1, 1.0) * d]

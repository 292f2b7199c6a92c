"""Turn circles and curves of the sky into clipped elements of a part.

Shared by the plate and the rete: a whole circle of the sphere becomes a
circle or arcs (or a segment, where the projection gives a line) inside the
part's drawing disc; a piece of a circle between two points becomes an arc;
a curve that is no circle becomes a polyline of exactly computed points.
"""

from __future__ import annotations

import math

import numpy as np

from ..geometry import model
from ..projection import clip
from ..projection.circles import PlaneCircle, PlaneLine, project_circle
from ..projection.stereographic import project_vectors


def whole_circle(role, pole, radius_rad, sign, equator_radius_mm, disc_radius_mm, stroke="medium", **values):
    """Elements for a whole circle of the sphere, clipped to the disc."""
    image = project_circle(pole, radius_rad, sign, equator_radius_mm)
    if isinstance(image, PlaneLine):
        chord = clip.line_inside_disc(image.point_mm, image.direction, disc_radius_mm)
        return [] if chord is None else [model.segment(role, chord[0], chord[1], stroke, **values)]
    ranges = clip.circle_inside_disc(image.center_mm, image.radius_mm, disc_radius_mm)
    if ranges is None:
        return [model.circle(role, image.center_mm, image.radius_mm, stroke, **values)]
    return [model.arc(role, image.center_mm, image.radius_mm, a0, a1, stroke, **values) for a0, a1 in ranges]


def circle_piece(role, pole, radius_rad, vectors, sign, equator_radius_mm, disc_radius_mm,
                 stroke="medium", **values):
    """Elements for the piece of a circle of the sphere that runs through
    the sample directions ``vectors`` (N, 3; in order, N >= 3, all on the
    circle), clipped to the disc.  The samples fix which way the piece runs
    and where it ends; the drawn shape is the exact image circle (or line).
    """
    image = project_circle(pole, radius_rad, sign, equator_radius_mm)
    pts = project_vectors(vectors, sign, equator_radius_mm)
    finite = np.all(np.isfinite(pts), axis=1) & (np.hypot(pts[:, 0], pts[:, 1]) < 1e6 * disc_radius_mm)
    out = []
    for run in clip.polyline_inside_disc(pts[finite], disc_radius_mm):
        if isinstance(image, PlaneLine):
            out.append(model.segment(role, run[0], run[-1], stroke, **values))
            continue
        c = np.asarray(image.center_mm)
        ang = np.unwrap(np.arctan2(run[:, 1] - c[1], run[:, 0] - c[0]))
        a0, a1 = math.degrees(ang[0]), math.degrees(ang[-1])
        a0 = _snap(a0, run[0], image, disc_radius_mm)
        a1 = _snap(a1, run[-1], image, disc_radius_mm)
        lo, hi = min(a0, a1), max(a0, a1)
        if hi - lo < 1e-9:
            continue
        start = lo % 360.0
        out.append(model.arc(role, image.center_mm, image.radius_mm, start, start + (hi - lo), stroke, **values))
    return out


#: How far (mm, along the circle) an interpolated end may be moved onto
#: the exact crossing with the disc's edge: far more than the chord-to-arc
#: error between two samples, far less than any drawn feature.
_SNAP_MM = 0.5


def _snap(angle_deg, end_mm, image: PlaneCircle, disc_radius_mm):
    """Move an arc end found by interpolation between samples onto the
    exact crossing of the circle with the disc's edge, when it is one: only
    an end that the clipping cut on the edge (``end_mm`` on the edge), and
    only by up to :data:`_SNAP_MM` along the circle.  (An angular limit
    would let a true end of a huge, nearly straight image circle, such as
    an azimuth near a pole, jump across the plate.)"""
    if abs(math.hypot(end_mm[0], end_mm[1]) - disc_radius_mm) > 1e-6:
        return angle_deg
    ranges = clip.circle_inside_disc(image.center_mm, image.radius_mm, disc_radius_mm)
    if not ranges:
        return angle_deg
    for exact in ranges[0]:
        delta = (exact - angle_deg + 180.0) % 360.0 - 180.0
        if abs(math.radians(delta)) * image.radius_mm < _SNAP_MM:
            return angle_deg + delta
    return angle_deg


def curve(role, vectors, sign, equator_radius_mm, disc_radius_mm, stroke="medium", **values):
    """Polylines through exactly projected points of a curve that is not a
    circle (the unequal-hour lines), cut at the disc's edge."""
    pts = project_vectors(vectors, sign, equator_radius_mm)
    pts = pts[np.all(np.isfinite(pts), axis=1)]
    return [model.polyline(role, run, False, stroke, **values)
            for run in clip.polyline_inside_disc(pts, disc_radius_mm)]


def radial_tick(role, angle_deg, r_inner_mm, r_outer_mm, at_radius_mm, stroke="light", center=(0.0, 0.0),
                **values):
    """A tick along the ray at ``angle_deg`` (ccw from +x) about ``center``;
    ``at`` is the point of the ray at ``at_radius_mm``."""
    a = math.radians(angle_deg)
    u = (math.cos(a), math.sin(a))
    cx, cy = center
    p0 = (cx + u[0] * r_inner_mm, cy + u[1] * r_inner_mm)
    p1 = (cx + u[0] * r_outer_mm, cy + u[1] * r_outer_mm)
    at = (cx + u[0] * at_radius_mm, cy + u[1] * at_radius_mm)
    return model.segment(role, p0, p1, stroke, at=at, **values)


def ring_text(role, string, angle_deg, radius_mm, size_pt, center=(0.0, 0.0), upright=True, **values):
    """Text centred on the ray at ``angle_deg``, set along the ring (its
    baseline tangent), turned so that it reads from outside the ring at the
    top and from inside at the bottom when ``upright``."""
    a = math.radians(angle_deg)
    at = (center[0] + radius_mm * math.cos(a), center[1] + radius_mm * math.sin(a))
    rot = angle_deg - 90.0
    if upright and math.sin(a) < -1e-9:
        rot += 180.0
    return model.text(role, at, string, size_pt, (rot + 180.0) % 360.0 - 180.0, **values)

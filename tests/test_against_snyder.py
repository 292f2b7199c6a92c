"""The stereographic projection and its circle images against the published
formulas and against plane and solid geometry.

References:
- Snyder, *Map Projections - A Working Manual*, USGS Professional Paper
  1395 (1987), ch. 21 (stereographic projection), polar aspect on the
  sphere: rho = 2 R k0 tan(pi/4 - phi/2), x = rho sin(lon - lon0),
  y = -rho cos(lon - lon0) (north polar aspect); rho = 2 R k0 tan(pi/4 +
  phi/2), y = +rho cos(lon - lon0) (south polar aspect); scale factor
  k = 2 k0 / (1 + sin phi) (north).  The formulas are the standard ones
  of that chapter; the equation number 21-33 quoted in kitgen's docstrings
  is from memory and has not been checked against the book.
- Snyder (1987), ch. 21: the projection is conformal and maps circles on
  the sphere to circles, or to straight lines through the circles that
  pass through the point of projection (a classical theorem, e.g. also
  in Hilbert and Cohn-Vossen, *Geometry and the Imagination*, 1932).
- Solid geometry: the image of a point is where the line from the point
  of projection through it meets the equatorial plane.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from kitgen.projection import clip
from kitgen.projection.circles import PlaneCircle, PlaneLine, project_circle
from kitgen.projection.stereographic import (equatorial_vector, horizontal_vector, project, project_vectors,
                                             unproject)

R_MM = 50.0          # equator radius on the part: Snyder's 2 R k0 with R = 25 mm, k0 = 1
TOL_MM = 1e-9
SIGNS = (1, -1)


def _random_points(rng, n, min_polar_from_projection_pole_rad=0.2):
    """Hour angles and declinations uniform on the sphere, away from both
    poles by a little (the projection pole maps to infinity)."""
    h = rng.uniform(-math.pi, math.pi, n)
    dec = np.arcsin(rng.uniform(-1.0, 1.0, n))
    keep = np.abs(dec) < math.pi / 2 - min_polar_from_projection_pole_rad
    return h[keep], dec[keep]


# -- the projection of points --------------------------------------------------

def _snyder_xy(h, dec, sign):
    """Snyder's polar stereographic formulas, written out here.

    kitgen's plane has +y towards hour angle 0 and, for a northern
    instrument, +x towards hour angle +90 deg (seen from the north pole).
    Snyder's north polar aspect puts the central meridian lon0 along -y and
    longitude increases counter-clockwise: so hour angle h (westward) is
    longitude lon = -h with lon0 = 180 deg, giving lon - lon0 = pi - h.
    The south polar aspect (seen from the south pole) has the central
    meridian along +y: lon - lon0 = -h.
    """
    two_r_k0 = R_MM
    if sign > 0:
        phi, dlon = dec, math.pi - h
        rho = two_r_k0 * np.tan(math.pi / 4 - phi / 2)
        return np.stack([rho * np.sin(dlon), -rho * np.cos(dlon)], axis=-1)
    phi, dlon = dec, -h
    rho = two_r_k0 * np.tan(math.pi / 4 + phi / 2)
    return np.stack([rho * np.sin(dlon), rho * np.cos(dlon)], axis=-1)


@pytest.mark.parametrize("sign", SIGNS)
def test_project_matches_snyder_polar_formulas(sign):
    rng = np.random.default_rng(1987)
    h, dec = _random_points(rng, 5000)
    ours = project(h, dec, sign, R_MM)
    assert np.max(np.abs(ours - _snyder_xy(h, dec, sign))) < TOL_MM


def test_south_plate_is_the_mirror_of_the_north_plate():
    # Seen from the south pole the sky is the mirror image (x -> -x) of the
    # northern construction with declinations reversed.
    rng = np.random.default_rng(7)
    h, dec = _random_points(rng, 2000)
    south = project(h, dec, -1, R_MM)
    north = project(h, -dec, 1, R_MM)
    assert np.max(np.abs(south - north * np.array([-1.0, 1.0]))) < TOL_MM


@pytest.mark.parametrize("sign", SIGNS)
def test_project_matches_the_line_through_the_point_of_projection(sign):
    # Solid geometry, independent of any formula of the projection: the
    # line from the point of projection P = (0, 0, -sign) through the point
    # v on the unit sphere meets the plane z = 0 at P + t (v - P) with
    # t = 1 / (1 + sign * v_z).  Seen from the visible pole (+z for a
    # northern plate, -z for a southern one) the x axis is mirrored for the
    # south.  The unit sphere's equator maps to itself, so scale by R_MM.
    rng = np.random.default_rng(3)
    h, dec = _random_points(rng, 3000)
    v = equatorial_vector(h, dec)
    pole = np.array([0.0, 0.0, -float(sign)])
    t = -pole[2] / (v[:, 2] - pole[2])
    meet = pole + t[:, None] * (v - pole)
    assert np.max(np.abs(meet[:, 2])) < 1e-12
    expected = R_MM * meet[:, :2] * np.array([float(sign), 1.0])
    assert np.max(np.abs(project_vectors(v, sign, R_MM) - expected)) < TOL_MM


def test_equator_has_the_equator_radius_and_the_visible_pole_is_the_pin():
    h = np.linspace(0.0, 2 * math.pi, 37)
    for sign in SIGNS:
        eq = project(h, np.zeros_like(h), sign, R_MM)
        assert np.allclose(np.hypot(eq[:, 0], eq[:, 1]), R_MM, atol=TOL_MM)
        assert np.allclose(project(0.3, sign * math.pi / 2, sign, R_MM), 0.0, atol=TOL_MM)
        # The upper meridian (hour angle 0) lies along +y (noon side).
        p = project(0.0, sign * 0.2, sign, R_MM)
        assert abs(p[0]) < TOL_MM and p[1] > 0.0


# -- conformality and scale ------------------------------------------------------

def _jacobian(h, dec, sign, step=1e-6):
    """d(x, y)/d(h, dec) by central differences, shape (2, 2)."""
    dh = (project(h + step, dec, sign, R_MM) - project(h - step, dec, sign, R_MM)) / (2 * step)
    dd = (project(h, dec + step, sign, R_MM) - project(h, dec - step, sign, R_MM)) / (2 * step)
    return np.stack([dh, dd], axis=-1)


@pytest.mark.parametrize("sign", SIGNS)
def test_angles_are_preserved_and_the_scale_is_snyders(sign):
    # On the sphere a direction at angle a from the parallel (eastward in
    # h) has components (cos a / cos dec, sin a) in (h, dec) per unit arc.
    # Conformal: the image directions meet at the same angle, and the scale
    # is the same in every direction, Snyder's k = 2 k0 / (1 + sin phi)
    # (with phi = sign * dec) in units of the globe radius R = R_MM / 2.
    rng = np.random.default_rng(21)
    h, dec = _random_points(rng, 300, min_polar_from_projection_pole_rad=0.3)
    dec = np.clip(dec, -1.3, 1.3)
    worst_angle = worst_scale = 0.0
    for hi, di in zip(h, dec):
        J = _jacobian(hi, di, sign)
        a1, a2 = rng.uniform(0, 2 * math.pi, 2)
        images = []
        for a in (a1, a2):
            images.append(J @ np.array([math.cos(a) / math.cos(di), math.sin(a)]))
        u, w = images
        cos_img = float(u @ w / (np.linalg.norm(u) * np.linalg.norm(w)))
        sphere_angle = math.acos(math.cos(a2 - a1))
        worst_angle = max(worst_angle, abs(math.acos(max(-1.0, min(1.0, cos_img))) - sphere_angle))
        k = 2.0 / (1.0 + math.sin(sign * di))
        for img in images:
            worst_scale = max(worst_scale, abs(np.linalg.norm(img) / (R_MM / 2) - k) / k)
    # Measured 3e-10 for both (the error of the central differences).
    assert worst_angle < 1e-8
    assert worst_scale < 1e-8


# -- inverse -------------------------------------------------------------------------

@pytest.mark.parametrize("sign", SIGNS)
def test_unproject_round_trips(sign):
    rng = np.random.default_rng(11)
    h, dec = _random_points(rng, 3000)
    v = equatorial_vector(h, dec)
    back = unproject(project_vectors(v, sign, R_MM), sign, R_MM)
    assert np.max(np.abs(back - v)) < 1e-12
    xy = rng.uniform(-5 * R_MM, 5 * R_MM, (3000, 2))
    w = unproject(xy, sign, R_MM)
    assert np.allclose(np.linalg.norm(w, axis=1), 1.0, atol=1e-14)
    assert np.max(np.abs(project_vectors(w, sign, R_MM) - xy)) < 1e-9


# -- images of circles ------------------------------------------------------------------

def _circle_points(pole, radius_rad, n=200, skip_near=None, skip_rad=0.05):
    """n points on the sphere circle of angular radius radius_rad about pole."""
    pole = pole / np.linalg.norm(pole)
    helper = np.array([1.0, 0.0, 0.0]) if abs(pole[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
    e1 = np.cross(pole, helper)
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(pole, e1)
    t = np.linspace(0.0, 2 * math.pi, n, endpoint=False)
    pts = (math.cos(radius_rad) * pole + math.sin(radius_rad)
           * (np.cos(t)[:, None] * e1 + np.sin(t)[:, None] * e2))
    if skip_near is not None:
        pts = pts[pts @ skip_near < math.cos(skip_rad)]
    return pts


def _random_unit(rng):
    v = rng.normal(size=3)
    return v / np.linalg.norm(v)


@pytest.mark.parametrize("sign", SIGNS)
def test_circle_images_hold_every_projected_point(sign):
    # Random circles that keep 20 deg clear of the point of projection, so
    # that the image stays within about 6 equator radii.
    rng = np.random.default_rng(1395)
    projection_pole = np.array([0.0, 0.0, -float(sign)])
    done = worst = 0
    while done < 300:
        pole = _random_unit(rng)
        radius = rng.uniform(0.02, math.pi / 2)
        to_projection_pole = math.acos(float(pole @ projection_pole))
        if abs(to_projection_pole - radius) < math.radians(20.0):
            continue
        image = project_circle(pole, radius, sign, R_MM)
        assert isinstance(image, PlaneCircle)
        xy = project_vectors(_circle_points(pole, radius), sign, R_MM)
        off = np.abs(np.hypot(xy[:, 0] - image.center_mm[0], xy[:, 1] - image.center_mm[1]) - image.radius_mm)
        worst = max(worst, float(off.max()))
        done += 1
    assert worst < TOL_MM


def _line_distance(xy, image: PlaneLine):
    p = np.asarray(image.point_mm)
    u = np.asarray(image.direction)
    d = xy - p
    return np.abs(d[:, 0] * u[1] - d[:, 1] * u[0])


@pytest.mark.parametrize("sign", SIGNS)
def test_circles_through_the_point_of_projection_become_lines(sign):
    projection_pole = np.array([0.0, 0.0, -float(sign)])
    cases = []
    # The horizon at latitude 0 passes through both celestial poles: it is
    # the straight east-west line y = 0 (common knowledge of the astrolabe).
    zenith = horizontal_vector(math.pi / 2, 0.0, 0.0)
    cases.append((zenith, math.pi / 2))
    # Any hour circle (a great circle through the poles) is a straight
    # line through the pin.
    cases.append((equatorial_vector(math.radians(30.0) + math.pi / 2, 0.0), math.pi / 2))
    # Random small circles built to pass through the point of projection.
    rng = np.random.default_rng(33)
    while len(cases) < 100:
        pole = _random_unit(rng)
        radius = math.acos(float(pole @ projection_pole))
        if 0.1 < radius < math.pi - 0.1:
            cases.append((pole, radius))
    for pole, radius in cases:
        image = project_circle(pole, radius, sign, R_MM)
        assert isinstance(image, PlaneLine)
        assert math.isclose(math.hypot(*image.direction), 1.0, abs_tol=1e-12)
        xy = project_vectors(_circle_points(pole, radius, skip_near=projection_pole), sign, R_MM)
        xy = xy[np.hypot(xy[:, 0], xy[:, 1]) < 100 * R_MM]
        assert len(xy) > 100
        assert float(_line_distance(xy, image).max()) < TOL_MM
    horizon = project_circle(zenith, math.pi / 2, sign, R_MM)
    pts = project_vectors(_circle_points(zenith, math.pi / 2, skip_near=projection_pole), sign, R_MM)
    assert np.max(np.abs(pts[:, 1])) < TOL_MM
    assert abs(horizon.direction[1]) < 1e-12 and abs(horizon.point_mm[1]) < TOL_MM


# -- clipping to the disc ---------------------------------------------------------------------

def test_circle_inside_disc_ranges_end_on_both_circles():
    # Plane geometry: an end of a range lies on the circle (by construction
    # from its angle) and on the disc's edge; the middle of a range inside.
    rng = np.random.default_rng(5)
    disc = 40.0
    seen_ranges = seen_inside = seen_outside = 0
    for _ in range(2000):
        c = rng.uniform(-100.0, 100.0, 2)
        r = rng.uniform(1.0, 120.0)
        ranges = clip.circle_inside_disc(c, r, disc)
        a = np.linspace(0.0, 2 * math.pi, 721)
        ring = c + r * np.stack([np.cos(a), np.sin(a)], axis=-1)
        dist = np.hypot(ring[:, 0], ring[:, 1])
        if ranges is None:
            assert np.all(dist <= disc + 1e-9)
            seen_inside += 1
            continue
        if not ranges:
            assert np.all(dist >= disc - 1e-9)
            seen_outside += 1
            continue
        for start, end in ranges:
            assert start < end <= start + 360.0
            for ang in (start, end):
                p = c + r * np.array([math.cos(math.radians(ang)), math.sin(math.radians(ang))])
                assert abs(math.hypot(*p) - disc) < 1e-9
            mid = math.radians((start + end) / 2)
            assert math.hypot(*(c + r * np.array([math.cos(mid), math.sin(mid)]))) < disc
            seen_ranges += 1
    assert min(seen_ranges, seen_inside, seen_outside) > 20


def test_polyline_inside_disc_ends_runs_on_the_edge():
    rng = np.random.default_rng(9)
    disc = 30.0
    cut_ends = 0
    for _ in range(200):
        pts = np.cumsum(rng.normal(scale=8.0, size=(80, 2)), axis=0) + rng.uniform(-30, 30, 2)
        inside = np.hypot(pts[:, 0], pts[:, 1]) <= disc
        runs = clip.polyline_inside_disc(pts, disc)
        for run in runs:
            r = np.hypot(run[:, 0], run[:, 1])
            assert np.all(r <= disc + 1e-9)
            for end in (run[0], run[-1]):
                is_vertex = np.any(np.all(np.abs(pts - end) < 1e-12, axis=1))
                if not is_vertex:
                    assert abs(math.hypot(*end) - disc) < 1e-9
                    cut_ends += 1
        # Every vertex inside the disc is kept in some run.
        kept = np.concatenate(runs) if runs else np.empty((0, 2))
        for p in pts[inside]:
            assert np.any(np.all(np.abs(kept - p) < 1e-12, axis=1))
    assert cut_ends > 100


def test_polyline_segment_crossing_disc_with_both_ends_outside():
    """A chord through a disc (plane geometry, no reference needed beyond
    Pythagoras): the segment (-50, 0)-(50, 0) crosses the disc of radius 30
    from (-30, 0) to (30, 0); a segment at y = 40 misses it."""
    from kitgen.projection.clip import polyline_inside_disc

    runs = polyline_inside_disc([(-50.0, 0.0), (50.0, 0.0)], 30.0)
    assert len(runs) == 1
    np.testing.assert_allclose(runs[0], [[-30.0, 0.0], [30.0, 0.0]], atol=1e-12)
    assert polyline_inside_disc([(-50.0, 40.0), (50.0, 40.0)], 30.0) == []

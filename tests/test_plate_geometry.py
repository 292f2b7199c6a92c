"""The plate's circles against the classical construction of the astrolabe
plate, derived here from first principles of the stereographic projection.

Derivation (northern plate, latitude phi > 0, equator radius R).  Every
point of the meridian plane is fixed by its angle psi from the north
celestial pole, counted positive towards the upper meridian (hour angle 0)
and negative towards the lower one.  The polar stereographic projection
from the south pole puts it on the meridian line of the plate at
y = R tan(psi / 2) (Snyder, *Map Projections - A Working Manual*, USGS PP
1395, 1987, ch. 21, polar aspect: rho = 2 R k0 tan(pi/4 - dec/2) with
psi = 90 deg - dec and 2 R k0 = R); +y is the upper meridian, the noon
side.  The zenith is at psi_z = 90 deg - phi.

An almucantar of altitude a is the circle of angular radius 90 deg - a
about the zenith.  It is symmetric about the meridian plane, so its image
(a circle, by the circle-preserving property of the projection) is
symmetric about the meridian line, and the two points where the sphere
circle crosses the meridian, psi_1 = psi_z - (90 - a) = a - phi and
psi_2 = psi_z + (90 - a) = 180 - phi - a, project to the ends of a
diameter:

    y_1 = R tan((a - phi) / 2),   y_2 = R cot((a + phi) / 2),
    centre (0, (y_1 + y_2) / 2),  radius |y_2 - y_1| / 2.

With tan A + cot B = cos(A - B) / (cos A sin B) and 2 cos A sin B =
sin(A + B) - sin(A - B) this reduces to the closed forms

    centre y = R cos(phi) / (sin(phi) + sin(a)),
    radius  = R cos(a) / (sin(phi) + sin(a)),

so the horizon (a = 0) has centre R cot(phi) and radius R / sin(phi): the
classical rule of the astrolabe maker (common practice).  A circle of
declination d is centred on the pin with radius R tan(45 deg - d/2).  At
phi = 0 the horizon passes through both poles, one of them the point of
projection, and its image is the straight east-west line y = 0; at a pole
every almucantar is a circle of declination, centred on the pin.

A southern plate is projected from the north pole and seen from the south:
in that view it is the northern construction for |phi| with x mirrored,
which leaves circles centred on the meridian line unchanged.

The obliquity that fixes the tropics is taken from ERFA's ``obl06``
(IAU 2006), at the middle of the epoch year as kitgen documents.
"""

from __future__ import annotations

import math

import erfa
import numpy as np
import pytest

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.parts.labels import MARGIN_MM
from kitgen.recipe.load import parse_recipe_text
from kitgen.words.measure import text_corners_mm

LATITUDES_DEG = (51.5, -33.9, 0.0, 23.4, 66.6, 89.0, -90.0)
EPOCH = 2026
#: The issue asks for 0.01 mm; both sides are exact formulas, so the
#: measured agreement is about 1e-13 mm and the check is far tighter.
TOL_MM = 1e-6


def _kit(latitude_deg, epoch=EPOCH):
    return build_kit(parse_recipe_text(f"latitude: {latitude_deg}\nepoch: {epoch}\n"))


def _meridian_y_mm(psi_deg, R):
    """Image on the meridian line of the meridian point psi_deg from the
    visible pole (see the module docstring)."""
    return R * math.tan(math.radians(psi_deg) / 2.0)


def _almucantar_from_meridian_points(phi_deg, alt_deg, R):
    """(centre y, radius) of the almucantar's image, from its two meridian
    points; phi_deg is the latitude seen from the visible pole (|phi|)."""
    zenith_psi = 90.0 - phi_deg
    y1 = _meridian_y_mm(zenith_psi - (90.0 - alt_deg), R)
    y2 = _meridian_y_mm(zenith_psi + (90.0 - alt_deg), R)
    return (y1 + y2) / 2.0, abs(y2 - y1) / 2.0


def _almucantar_closed_form(phi_deg, alt_deg, R):
    p, a = math.radians(phi_deg), math.radians(alt_deg)
    return R * math.cos(p) / (math.sin(p) + math.sin(a)), abs(R * math.cos(a) / (math.sin(p) + math.sin(a)))


def _circles(part, role):
    """[(centre, radius, values)] of the circles and arcs of ``role``: one
    for each circle, however many pieces it is drawn in (a line is broken
    round the labels set on it, #9)."""
    out = {}
    for e in part.elements:
        if e.role == role and e.shape in ("circle", "arc"):
            key = (e.geom["center"], e.geom["radius"], tuple(sorted(e.values.items())))
            out.setdefault(key, (e.geom["center"], e.geom["radius"], e.values))
    return list(out.values())


def _at_a_label_gap(part, kit, point, stroke):
    """Whether ``point`` is where a line stops short of a label: the
    clearance (labels.MARGIN_MM, 0.3 mm, common practice) and half the
    line's width from a text element's measured box (the shipped font's
    extent, turned as set, reaching along the line to any ink that stands
    past the advance: #9)."""
    gap = MARGIN_MM + stroke_width_mm(stroke, kit.dims) / 2
    for e in part.elements:
        if e.shape != "text":
            continue
        g = e.geom
        ext = kit.words.measure(g["text"], g["size_pt"])
        left, right = kit.words.ink_span_mm(g["text"], g["size_pt"])
        corners = np.array(text_corners_mm(g["at"], ext.width_mm, ext.height_mm, g["angle_deg"], g["anchor"]))
        u = (corners[1] - corners[0]) / ext.width_mm
        c = corners.mean(axis=0) + u * ((left + right) / 2 - ext.width_mm / 2)
        d = np.asarray(point) - c
        du, dv = abs(d @ u) - (right - left) / 2, abs(d @ np.array([-u[1], u[0]])) - ext.height_mm / 2
        dist = math.hypot(max(du, 0.0), max(dv, 0.0))
        if abs(dist - gap) < 1e-6:
            return True
    return False


def _meets_disc(centre_y, radius, disc):
    d = abs(centre_y)
    return not (d >= radius + disc or d + disc <= radius)


@pytest.fixture(scope="module", params=LATITUDES_DEG)
def plate(request):
    kit = _kit(request.param)
    return request.param, kit, kit.part("plate")


def test_the_two_derivations_agree():
    # The meridian-point construction and its closed form, for many cases.
    for phi in (0.5, 10.0, 33.9, 51.5, 66.6, 89.0, 90.0):
        for alt in (-18.0, 0.0, 5.0, 30.0, 60.0, 85.0):
            if abs(math.sin(math.radians(phi)) + math.sin(math.radians(alt))) < 1e-6:
                continue
            a = _almucantar_from_meridian_points(phi, alt, 100.0)
            b = _almucantar_closed_form(phi, alt, 100.0)
            assert a == pytest.approx(b, abs=1e-9)


def test_horizon_is_the_classical_circle(plate):
    lat, kit, part = plate
    R, disc = kit.dims.equator_radius_mm, kit.dims.outer_tropic_radius_mm
    phi = abs(lat)
    if phi == 0.0:
        segs = [e for e in part.elements if e.role == "horizon"]
        assert segs and all(e.shape == "segment" for e in segs)
        ends = [p for e in segs for p in (e.geom["from"], e.geom["to"])]
        assert all(abs(y) < TOL_MM for _, y in ends)
        xs = [x for x, _ in ends]
        assert [min(xs), max(xs)] == pytest.approx([-disc, disc], abs=TOL_MM)
        return
    yc, r = _almucantar_from_meridian_points(phi, 0.0, R)
    assert yc == pytest.approx(R / math.tan(math.radians(phi)), abs=TOL_MM)
    assert r == pytest.approx(R / math.sin(math.radians(phi)), abs=TOL_MM)
    found = _circles(part, "horizon")
    assert found, "no horizon on the plate"
    for centre, radius, _ in found:
        assert abs(centre[0]) < TOL_MM and abs(centre[1] - yc) < TOL_MM
        assert abs(radius - r) < TOL_MM
    for e in part.elements:
        if e.role == "horizon" and e.shape == "arc":
            (cx, cy), radius = e.geom["center"], e.geom["radius"]
            for ang in (e.geom["start_deg"], e.geom["end_deg"]):
                a = math.radians(ang)
                end = (cx + radius * math.cos(a), cy + radius * math.sin(a))
                assert abs(math.hypot(*end) - disc) < TOL_MM or _at_a_label_gap(part, kit, end, e.stroke)


def test_almucantars_and_twilight_are_the_classical_circles(plate):
    lat, kit, part = plate
    R, disc = kit.dims.equator_radius_mm, kit.dims.outer_tropic_radius_mm
    phi = abs(lat)
    drawn = {}
    for centre, radius, values in _circles(part, "almucantar") + _circles(part, "twilight"):
        drawn.setdefault(round(values["altitude_deg"], 6), []).append((centre, radius))
    step = kit.plan.drawing.altitude_step_deg
    expected_alts = list(np.arange(step, 90.0 - 1e-9, step)) + [-18.0]
    checked = 0
    for alt in expected_alts:
        alt = float(alt)
        if abs(math.sin(math.radians(phi)) + math.sin(math.radians(alt))) < 1e-9:
            continue  # the circle through the point of projection: a line
        yc, r = _almucantar_from_meridian_points(phi, alt, R)
        if not _meets_disc(yc, r, disc):
            assert round(alt, 6) not in drawn
            continue
        assert round(alt, 6) in drawn, f"altitude {alt} missing at latitude {lat}"
        for centre, radius in drawn[round(alt, 6)]:
            assert abs(centre[0]) < TOL_MM and abs(centre[1] - yc) < TOL_MM, (lat, alt)
            assert abs(radius - r) < TOL_MM, (lat, alt)
            checked += 1
    assert checked >= 10


def test_equator_and_tropics(plate):
    lat, kit, part = plate
    R = kit.dims.equator_radius_mm
    epoch_jd = 2451545.0 + (EPOCH + 0.5 - 2000.0) * 365.25
    eps_deg = math.degrees(erfa.obl06(epoch_jd, 0.0))
    eq = _circles(part, "equator")
    assert len(eq) == 1 and eq[0][0] == pytest.approx((0.0, 0.0), abs=TOL_MM)
    assert eq[0][1] == pytest.approx(_meridian_y_mm(90.0, R), abs=TOL_MM)
    # Seen from the visible pole the tropic on that side (declination
    # +eps north, -eps south) is the inner one, radius R tan(45 - eps/2).
    radii = sorted(r for c, r, _ in _circles(part, "tropic"))
    assert radii == pytest.approx([R * math.tan(math.radians(45.0 - eps_deg / 2.0)),
                                   R * math.tan(math.radians(45.0 + eps_deg / 2.0))], abs=TOL_MM)
    for c, r, values in _circles(part, "tropic"):
        assert c == pytest.approx((0.0, 0.0), abs=TOL_MM)
        sign = 1.0 if lat >= 0.0 else -1.0
        assert r == pytest.approx(R * math.tan(math.radians(45.0 - sign * values["declination_deg"] / 2.0)),
                                  abs=TOL_MM)
    # The drawing's edge (the rete's rim) is the outer tropic, or lies
    # beyond it where the rim takes in more of the other hemisphere (#9).
    if abs(abs(kit.sky.rim_deg) - eps_deg) < 1e-6:
        assert radii[1] == pytest.approx(kit.dims.outer_tropic_radius_mm, abs=TOL_MM)
    else:
        assert radii[1] < kit.dims.outer_tropic_radius_mm


def test_zenith_point(plate):
    lat, kit, part = plate
    R = kit.dims.equator_radius_mm
    (z,) = [e.geom["at"] for e in part.elements if e.role == "zenith"]
    assert z[0] == pytest.approx(0.0, abs=TOL_MM)
    assert z[1] == pytest.approx(_meridian_y_mm(90.0 - abs(lat), R), abs=TOL_MM)


@pytest.mark.parametrize("lat", (89.0, -90.0))
def test_near_and_at_the_pole_almucantars_are_about_the_pin(lat):
    # At a pole the almucantar of altitude a is the circle of declination
    # +-a: radius R tan(45 - a/2), centred on the pin.  One degree from the
    # pole the centres stay within R cos(phi) / sin(phi) (the horizon's
    # offset, the largest) of the pin and the radii within that of the
    # declination circles.
    kit = _kit(lat)
    R = kit.dims.equator_radius_mm
    off_max = R * math.cos(math.radians(abs(lat))) / math.sin(math.radians(abs(lat)))
    circles = _circles(kit.part("plate"), "almucantar")
    assert len(circles) == 17
    for centre, radius, values in circles:
        a = values["altitude_deg"]
        assert abs(centre[0]) < TOL_MM
        assert abs(centre[1]) <= off_max + TOL_MM
        assert abs(radius - R * math.tan(math.radians(45.0 - a / 2.0))) <= off_max + TOL_MM
    if lat == -90.0:
        assert max(abs(c[1]) for c, _, _ in circles) < TOL_MM


@pytest.mark.parametrize("epoch", (1900, 2100))
def test_tropics_follow_the_epoch_obliquity(epoch):
    # The obliquity falls by about 47" per century (IAU 2006), so the
    # ratio of the tropic radii changes with the epoch as ERFA says.
    kit = _kit(51.5, epoch)
    eps = erfa.obl06(2451545.0 + (epoch + 0.5 - 2000.0) * 365.25, 0.0)
    radii = sorted(r for c, r, _ in _circles(kit.part("plate"), "tropic"))
    assert radii[1] / radii[0] == pytest.approx(math.tan(math.pi / 4 + eps / 2) / math.tan(math.pi / 4 - eps / 2),
                                                rel=1e-12)

"""Every latitude from -90 to 90 and every sheet builds a correct kit.

A property test (hypothesis) walks the whole range, with the places where
the plate degenerates always included and approached to within 1e-9 deg:
the poles, the equator, the tropics and the polar circles (both at the
rounded 23.44 / 66.56 and at the epoch's own obliquity from ERFA's
``obl06``, IAU 2006), and +-18 deg, where the -18 deg twilight circle passes
through the point of projection and its image becomes a straight line (as
the horizon does at the equator).

Every drawn circle of the plate is checked against first principles, not
against kitgen's own projection code:

* A drawn point is taken back to the sphere by the inverse of the polar
  stereographic projection written out here (Snyder, *Map Projections - A
  Working Manual*, USGS PP 1395, 1987, ch. 21, polar aspect: a point at
  distance rho from the pin has polar angle 2 atan(rho / R), R the equator
  radius), in the frames documented in DEVELOPERS.md.
* Its altitude and azimuth come from the spherical-astronomy formulas of
  Meeus, *Astronomical Algorithms* (2nd ed., 1998), eq. 13.5 and 13.6, and
  the unequal hours from the semi-diurnal arc, eq. 15.1.
* Each curve is also checked to be *complete*: every point of the true
  horizon, twilight circle, almucantar, equator and tropic that falls
  inside the drawing disc lies on a drawn element.

And the degenerate cases are checked for what they really are (standard
spherical astronomy, common knowledge of the astrolabe): at a pole the
horizon is the equator and every almucantar a circle about the pin, the
azimuths straight lines through the pin; at the equator the horizon is the
straight east-west line through the pin; at every latitude the horizon
passes through the east and west points, which lie on the celestial
equator, so at the equator's radius on the east-west line.
"""

from __future__ import annotations

import math

import erfa
import numpy as np
import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from kitgen.kit import build_kit
from kitgen.layout.pages import layout_kit
from kitgen.paper import content_area_mm
from kitgen.geometry.style import stroke_width_mm
from kitgen.parts.breaks import MIN_PIECE_MM
from kitgen.parts.labels import MARGIN_MM
from kitgen.recipe.load import validate_recipe
from kitgen.recipe.schema import SHEETS
from kitgen.words.measure import text_corners_mm
from tests.ci import examples

EPOCH = 2027


def _obliquity_deg(year: int) -> float:
    """Mean obliquity at the middle of ``year`` (ERFA obl06, IAU 2006)."""
    jd = 2451545.0 + (year + 0.5 - 2000.0) * 365.25
    return math.degrees(erfa.obl06(jd, 0.0))


EPS_DEG = _obliquity_deg(EPOCH)
#: The places where the plate degenerates or changes its character.
SPECIAL_DEG = sorted({0.0, 90.0, -90.0, 23.44, -23.44, 66.56, -66.56, EPS_DEG, -EPS_DEG,
                      90.0 - EPS_DEG, EPS_DEG - 90.0, 18.0, -18.0})
#: Near a special latitude: offsets up to 1e-9 deg, the smallest included.
OFFSETS = st.one_of(st.sampled_from([0.0, 1e-9, -1e-9, 1e-12, -1e-12, 5e-324, -5e-324]),
                    st.floats(-1e-9, 1e-9, allow_nan=False))


def _clamp(lat: float) -> float:
    return max(-90.0, min(90.0, lat))



LATITUDES = st.one_of(
    st.floats(-90.0, 90.0, allow_nan=False),
    st.builds(lambda base, off: _clamp(base + off), st.sampled_from(SPECIAL_DEG), OFFSETS),
)

#: Angular agreement asked of every drawn point, degrees.  The image of a
#: circle is drawn as a straight line only when it departs from one by less
#: than 1e-6 equator radii (about 6e-5 deg); everywhere else the drawing is
#: exact to rounding.  1e-4 deg is under 0.001 mm on the largest plate.
TOL_DEG = 1e-4
#: Distance from the true curve to the drawing, mm, for completeness.
TOL_MM = 1e-3


# -- first principles ------------------------------------------------------------

def unproject(xy, latitude_deg: float, R: float) -> np.ndarray:
    """Plate point(s) (mm) to unit vectors of the equatorial frame of the
    place (x to hour angle +90 deg, y to hour angle 0, z to the north pole).

    Inverse polar stereographic projection (Snyder 1987, ch. 21): with
    p = (x, y) / R and q = |p|^2, the point of the sphere is
    (2 p, 1 - q) / (1 + q) in the frame seen from the visible pole; a
    southern plate (projected from the north pole, seen from the south)
    mirrors x and z (DEVELOPERS.md, "Projection point")."""
    p = np.atleast_2d(np.asarray(xy, dtype=float)) / R
    q = np.sum(p * p, axis=1)
    v = np.stack([2 * p[:, 0], 2 * p[:, 1], 1.0 - q], axis=1) / (1.0 + q)[:, None]
    if latitude_deg < 0:
        v = v * np.array([-1.0, 1.0, -1.0])
    return v


def project(v, latitude_deg: float, R: float) -> np.ndarray:
    """The forward projection of the same chapter: (x, y) = R (vx, vy) /
    (1 + vz) in the frame seen from the visible pole."""
    v = np.atleast_2d(np.asarray(v, dtype=float))
    if latitude_deg < 0:
        v = v * np.array([-1.0, 1.0, -1.0])
    with np.errstate(divide="ignore", invalid="ignore"):
        return R * v[:, :2] / (1.0 + v[:, 2])[:, None]


def hour_angle_and_declination(v):
    """Hour angle H and declination d (radians) of frame vectors."""
    v = np.atleast_2d(v)
    return np.arctan2(v[:, 0], v[:, 1]), np.arcsin(np.clip(v[:, 2], -1.0, 1.0))


def altitude_deg(v, phi: float) -> np.ndarray:
    """Meeus (1998) eq. 13.6: sin h = sin phi sin d + cos phi cos d cos H."""
    H, d = hour_angle_and_declination(v)
    return np.degrees(np.arcsin(np.clip(np.sin(phi) * np.sin(d) + np.cos(phi) * np.cos(d) * np.cos(H), -1, 1)))


def azimuth_from_north_deg(v, phi: float) -> np.ndarray:
    """Meeus (1998) eq. 13.5, tan A = sin H / (cos H sin phi - tan d cos phi),
    A from the south westwards (numerator and denominator multiplied by
    cos d, which keeps it defined at the poles); +180 deg gives the azimuth
    from the north through the east that kitgen uses."""
    H, d = hour_angle_and_declination(v)
    A = np.arctan2(np.cos(d) * np.sin(H), np.cos(d) * np.cos(H) * np.sin(phi) - np.sin(d) * np.cos(phi))
    return (np.degrees(A) + 180.0) % 360.0


def sphere_circle(pole, radius_rad: float, n: int = 3601) -> np.ndarray:
    """Points of the small circle of angular radius ``radius_rad`` about
    the unit vector ``pole``: plain vector geometry."""
    pole = np.asarray(pole, dtype=float)
    a = np.cross(pole, [1.0, 0.0, 0.0] if abs(pole[0]) < 0.9 else [0.0, 1.0, 0.0])
    a /= np.linalg.norm(a)
    b = np.cross(pole, a)
    t = np.linspace(0.0, 2 * math.pi, n, endpoint=False)[:, None]
    return math.cos(radius_rad) * pole + math.sin(radius_rad) * (np.cos(t) * a + np.sin(t) * b)


def zenith_vector(phi: float) -> np.ndarray:
    """The zenith lies on the upper meridian at declination phi."""
    return np.array([0.0, math.cos(phi), math.sin(phi)])


# -- plane geometry of the drawn elements -------------------------------------------

def samples(el, n: int = 181) -> np.ndarray:
    g = el.geom
    if el.shape == "circle":
        t = np.linspace(0.0, 2 * math.pi, n, endpoint=False)
    elif el.shape == "arc":
        t = np.radians(np.linspace(g["start_deg"], g["end_deg"], n))
    elif el.shape == "segment":
        s = np.linspace(0.0, 1.0, n)[:, None]
        return (1 - s) * np.asarray(g["from"]) + s * np.asarray(g["to"])
    elif el.shape == "polyline":
        return np.asarray(g["points"], dtype=float)
    else:
        return np.atleast_2d(np.asarray(g["at"], dtype=float))
    c = np.asarray(g["center"])
    return c + g["radius"] * np.stack([np.cos(t), np.sin(t)], axis=1)


def extreme_points(el) -> list:
    """Points that bound an element: the ends, and where a circle or arc
    reaches furthest along x and y."""
    g = el.geom
    if el.shape == "segment":
        return [g["from"], g["to"]]
    if el.shape == "polyline":
        return list(g["points"])
    if el.shape == "point":
        return [g["at"]]
    (cx, cy), r = g["center"], g["radius"]
    if el.shape == "circle":
        angles = [0.0, 90.0, 180.0, 270.0]
    else:
        angles = [g["start_deg"], g["end_deg"]] + [a for a in (0.0, 90.0, 180.0, 270.0, 360.0, 450.0, 540.0, 630.0)
                                                   if g["start_deg"] <= a <= g["end_deg"]]
    return [(cx + r * math.cos(math.radians(a)), cy + r * math.sin(math.radians(a))) for a in angles]


def distance_to(el, pts) -> np.ndarray:
    """Distance (mm) from each point to a circle, arc or segment."""
    pts = np.atleast_2d(pts)
    g = el.geom
    if el.shape == "segment":
        a, b = np.asarray(g["from"]), np.asarray(g["to"])
        ab = b - a
        s = np.clip(((pts - a) @ ab) / max(ab @ ab, 1e-300), 0.0, 1.0)
        return np.hypot(*(pts - (a + s[:, None] * ab)).T)
    c, r = np.asarray(g["center"]), g["radius"]
    d = pts - c
    radial = np.abs(np.hypot(d[:, 0], d[:, 1]) - r)
    if el.shape == "circle":
        return radial
    ang = np.degrees(np.arctan2(d[:, 1], d[:, 0]))
    within = (ang - g["start_deg"]) % 360.0 <= (g["end_deg"] - g["start_deg"]) + 1e-9
    ends = samples(el, 2)
    to_end = np.min(np.hypot(pts[:, None, 0] - ends[None, :, 0], pts[:, None, 1] - ends[None, :, 1]), axis=1)
    return np.where(within, radial, to_end)


def distance_to_all(elements, pts) -> np.ndarray:
    if not elements:
        return np.full(len(np.atleast_2d(pts)), np.inf)
    return np.min([distance_to(el, pts) for el in elements], axis=0)


def outside_label_gaps(plate, kit, pts, stroke: str):
    """The points not in the gap a line leaves round a label (#9): farther
    than the clearance (kitgen.parts.labels.MARGIN_MM, common practice),
    half the line's width and the shortest piece drawn
    (kitgen.parts.breaks.MIN_PIECE_MM, a shorter stub is left out) from
    every text element's box, measured with the shipped fonts."""
    pts = np.atleast_2d(np.asarray(pts, dtype=float))
    gap = MARGIN_MM + stroke_width_mm(stroke, kit.dims) / 2 + MIN_PIECE_MM + 1e-6
    keep = np.ones(len(pts), dtype=bool)
    for e in plate.elements:
        if e.shape != "text":
            continue
        g = e.geom
        ext = kit.words.measure(g["text"], g["size_pt"])
        corners = np.array(text_corners_mm(g["at"], ext.width_mm, ext.height_mm, g["angle_deg"], g["anchor"]))
        c, a = corners.mean(axis=0), math.radians(g["angle_deg"])
        u, v = np.array([math.cos(a), math.sin(a)]), np.array([-math.sin(a), math.cos(a)])
        d = pts - c
        du = np.maximum(np.abs(d @ u) - ext.width_mm / 2, 0.0)
        dv = np.maximum(np.abs(d @ v) - ext.height_mm / 2, 0.0)
        keep &= np.hypot(du, dv) > gap
    return pts[keep]


def line_offset_from_pin(el) -> float:
    """Distance (mm) from the pin to the line through a segment."""
    (x0, y0), (x1, y1) = el.geom["from"], el.geom["to"]
    return abs(x0 * y1 - x1 * y0) / math.hypot(x1 - x0, y1 - y0)


def _numbers(value):
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        yield float(value)
    elif isinstance(value, (tuple, list)):
        for v in value:
            yield from _numbers(v)
    elif isinstance(value, dict):
        for v in value.values():
            yield from _numbers(v)


# -- the checks ------------------------------------------------------------------

def check_all_finite_and_inside(kit) -> None:
    for part in kit.parts:
        x0, y0, x1, y1 = part.bounds_mm
        assert all(math.isfinite(v) for v in part.bounds_mm), part.kind
        for el in part.elements:
            assert all(math.isfinite(v) for v in _numbers(el.geom)), (part.kind, el.role)
            assert all(math.isfinite(v) for v in _numbers(el.values)), (part.kind, el.role)
            if el.shape == "text":
                continue
            for x, y in extreme_points(el):
                assert x0 - 1e-6 <= x <= x1 + 1e-6 and y0 - 1e-6 <= y <= y1 + 1e-6, (part.kind, el.role)


def check_plate(kit) -> None:
    lat = kit.plan.latitude_deg
    phi = math.radians(lat)
    plate = kit.part("plate")
    equator = plate.with_role("equator")
    # One circle about the pin, in pieces where labels are set on it (#9).
    assert equator and all(e.shape in ("circle", "arc") for e in equator)
    R = equator[0].geom["radius"]
    assert all(e.geom["radius"] == R for e in equator)
    assert all(np.allclose(e.geom["center"], (0.0, 0.0), atol=1e-9) for e in equator)
    disc = kit.dims.outer_tropic_radius_mm

    # Every drawn point of a circle of equal altitude has that altitude.
    for role in ("horizon", "almucantar", "twilight"):
        for el in plate.with_role(role):
            alt = altitude_deg(unproject(samples(el), lat, R), phi)
            assert np.max(np.abs(alt - el.values["altitude_deg"])) < TOL_DEG, (role, el.values)
    # Every drawn point of an azimuth curve has that azimuth.
    for el in plate.with_role("azimuth"):
        az = azimuth_from_north_deg(unproject(samples(el), lat, R), phi)
        off = (az - el.values["azimuth_deg"] + 180.0) % 360.0 - 180.0
        assert np.max(np.abs(off)) < TOL_DEG, el.values
    # The equator and the tropics lie at their declinations.
    for el in plate.with_role("tropic") + equator:
        _, d = hour_angle_and_declination(unproject(samples(el), lat, R))
        assert np.max(np.abs(np.degrees(d) - el.values["declination_deg"])) < TOL_DEG
    # Unequal hour k: the point's hour angle is k/12 of the way along its
    # declination's night arc, from setting (H0, Meeus eq. 15.1) to rising.
    # Compared as angles: where the night arc shrinks to nothing (at the
    # polar circles) every line meets at one point and the fraction itself
    # is undetermined.
    for el in plate.with_role("unequal_hour"):
        H, d = hour_angle_and_declination(unproject(samples(el), lat, R))
        H0 = np.arccos(np.clip(-math.tan(phi) * np.tan(d), -1.0, 1.0))
        expected = H0 + el.values["hour"] * (2 * math.pi - 2 * H0) / 12.0
        off = (H - expected + math.pi) % (2 * math.pi) - math.pi
        assert np.max(np.abs(off)) < 1e-6, el.values

    # Completeness: the true curves inside the disc are all drawn.
    zen = zenith_vector(phi)
    wanted = [("horizon", 0.0)]
    wanted += [("twilight", t) for t in kit.plan.drawing.twilight_deg]
    # The layout may thin the almucantars to keep them legible at this size
    # (never closer than asked): every multiple of the step drawn is drawn.
    drawn_alts = sorted({e.values["altitude_deg"] for e in plate.with_role("almucantar")})
    assert drawn_alts, "no almucantar"
    step = drawn_alts[0]
    assert step >= kit.plan.drawing.altitude_step_deg - 1e-9
    wanted += [("almucantar", float(a)) for a in np.arange(step, 90.0 - 1e-9, step)]
    for role, alt in wanted:
        true = project(sphere_circle(zen, math.radians(90.0 - alt)), lat, R)
        inside = true[np.hypot(true[:, 0], true[:, 1]) < disc - 0.01]
        drawn = [e for e in plate.with_role(role) if e.values["altitude_deg"] == pytest.approx(alt)]
        if drawn:
            inside = outside_label_gaps(plate, kit, inside, drawn[0].stroke)
        if len(inside):
            assert np.max(distance_to_all(drawn, inside)) < TOL_MM, (role, alt)
    for dec in (0.0, EPS_DEG, -EPS_DEG):
        # Circles about the pin: the outer tropic is the disc's own edge.
        true = project(sphere_circle([0.0, 0.0, 1.0], math.radians(90.0 - dec)), lat, R)
        inside = true[np.hypot(true[:, 0], true[:, 1]) < disc + 1e-6]
        assert len(inside) == len(true)
        drawn = [e for e in plate.with_role("tropic") + equator
                 if abs(e.values["declination_deg"] - dec) < 0.01]
        inside = outside_label_gaps(plate, kit, inside, drawn[0].stroke)
        assert np.max(distance_to_all(drawn, inside)) < TOL_MM, dec

    horizon = plate.with_role("horizon")
    # The east and west points of the horizon are on the celestial equator,
    # at hour angles -90 and +90 deg: on the plate at (+-R, 0).  (Within a
    # few 1e-7 R where the horizon is drawn as the line it nearly is.)
    east_west = outside_label_gaps(plate, kit, [(R, 0.0), (-R, 0.0)], horizon[0].stroke)
    assert len(east_west) == 0 or np.max(distance_to_all(horizon, east_west)) < 3e-7 * R + 1e-9

    if abs(lat) >= 90.0 - 1e-9:
        # At a pole the zenith is the pole: the horizon is the equator ...
        assert horizon and all(e.shape in ("circle", "arc") for e in horizon)
        for e in horizon:
            assert np.allclose(e.geom["center"], (0.0, 0.0), atol=1e-6)
            assert e.geom["radius"] == pytest.approx(R, abs=1e-6)
        # ... every almucantar a circle of declination about the pin ...
        for el in plate.with_role("almucantar"):
            assert el.shape in ("circle", "arc") and np.allclose(el.geom["center"], (0.0, 0.0), atol=1e-6)
        # ... and the azimuths are straight lines through the pin.
        azimuths = plate.with_role("azimuth")
        assert azimuths and all(el.shape == "segment" for el in azimuths)
        assert max(line_offset_from_pin(el) for el in azimuths) < 1e-6
        directions = {round(math.degrees(math.atan2(el.geom["to"][1] - el.geom["from"][1],
                                                    el.geom["to"][0] - el.geom["from"][0])) % 180.0, 6) % 180.0
                      for el in azimuths}
        # One line per azimuth drawn (the layout may thin them), each in its
        # own direction (their azimuths were checked against Meeus above).
        assert len(directions) == len({round(el.values["azimuth_deg"] % 180.0, 6) for el in azimuths})
    if abs(lat) <= 1e-9:
        # At the equator the horizon passes through both poles, one of them
        # the point of projection: it is the straight east-west line,
        # drawn across the whole disc.
        # (in pieces where labels are set on it, #9)
        assert horizon and all(e.shape == "segment" for e in horizon)
        ends = [p for e in horizon for p in (e.geom["from"], e.geom["to"])]
        assert max(abs(y) for _, y in ends) < 1e-6
        xs = [x for x, _ in ends]
        assert [min(xs), max(xs)] == pytest.approx([-disc, disc], abs=1e-6)


def check_layout(kit) -> None:
    for page in layout_kit(kit):
        ax0, ay0, ax1, ay1 = content_area_mm(page.sheet, page.landscape)
        for placement in page.placements:
            bx0, by0, bx1, by1 = placement.box_mm
            assert ax0 - 1e-6 <= bx0 and bx1 <= ax1 + 1e-6 and ay0 - 1e-6 <= by0 and by1 <= ay1 + 1e-6


def build(lat: float, sheet: str = "a4", **more):
    return build_kit(validate_recipe({"latitude": lat, "epoch": EPOCH, "sheet": sheet, **more}))


# -- the tests -------------------------------------------------------------------

@pytest.mark.parametrize("lat", SPECIAL_DEG + [s + d for s in SPECIAL_DEG for d in (-1e-9, 1e-9) if abs(s + d) <= 90])
def test_special_latitudes(lat):
    kit = build(lat)
    check_all_finite_and_inside(kit)
    check_plate(kit)


# fewer examples in CI (tests/ci.py): a kit's labels take most of a second to place
@settings(max_examples=examples(50, 12), deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(lat=LATITUDES, sheet=st.sampled_from(SHEETS))
@example(lat=90.0, sheet="a4").via("the north pole")
@example(lat=-90.0, sheet="letter").via("the south pole")
@example(lat=0.0, sheet="a3").via("the equator")
@example(lat=-1e-9, sheet="tabloid").via("just south of the equator")
@example(lat=3e-7, sheet="a4").via("a horizon once clipped to nothing")
@example(lat=1e-5, sheet="a4").via("a horizon drawn as the line it nearly is")
@example(lat=18.0 - 3e-7, sheet="a4").via("a twilight circle once clipped short")
@example(lat=89.0, sheet="a4").via("azimuths once drawn across the zenith")
@example(lat=-33.9, sheet="a4").via("a southern outer tropic once lost")
def test_every_latitude_every_sheet(lat, sheet):
    kit = build(lat, sheet)
    check_all_finite_and_inside(kit)
    check_plate(kit)
    check_layout(kit)


@settings(max_examples=examples(25, 6), deadline=None)
@given(lat=LATITUDES, alt_step=st.sampled_from([1.0, 7.5, 30.0]), az_step=st.sampled_from([5.0, 40.0, 90.0]),
       twilight=st.booleans(), unequal=st.booleans())
def test_every_latitude_with_other_steps(lat, alt_step, az_step, twilight, unequal):
    kit = build(lat, altitude_step_deg=alt_step, azimuth_step_deg=az_step, twilight=twilight,
                unequal_hours=unequal)
    check_all_finite_and_inside(kit)
    check_plate(kit)


def test_sweep_builds_everywhere():
    """The whole range in steps of 5 degrees, on the default sheet: every kit
    is finite, inside its bounds and has a horizon (the property tests
    above fill in between)."""
    for lat in np.arange(-90.0, 90.0 + 1e-9, 5.0):
        kit = build(float(lat))
        check_all_finite_and_inside(kit)
        assert kit.part("plate").with_role("horizon"), lat


def test_the_checks_can_fail():
    """The first-principles checks catch a wrong plate: the horizon of one
    latitude does not pass as the horizon of another."""
    kit = build(40.0)
    other = build(41.0)
    from dataclasses import replace
    swapped = replace(kit, parts=tuple(other.part("plate") if p.kind == "plate" else p for p in kit.parts))
    with pytest.raises(AssertionError):
        check_plate(swapped)

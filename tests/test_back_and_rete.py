"""The mater's back and the rete read without counting (#9): the calendar's
days numbered beside their ticks, the 10 and 20 of every zodiac sign
numbered on the back and on the rete's ecliptic alike, and no tick drawn
over those numbers.

References: the lengths of the months from Python's ``calendar`` module
(the proleptic Gregorian calendar); the ticks' own ``at`` from the JSON
contract (whose places are checked against DE421 in
test_reading_against_de421.py and test_kit_against_references.py); the
numbers' boxes measured with the shipped fonts' outlines
(``Words.measure``) and turned as the PDF sets them.
The separation of Rigil Kentaurus and Hadar from PyEphem's star list
(Hipparcos places).
"""

from __future__ import annotations

import calendar
import dataclasses
import math

import ephem
import ephem.stars
import pytest

from kitgen.geometry.style import MIN_DOT_RADIUS_MM, star_radius_mm
from kitgen.kit import build_kit
from kitgen.parts.dimensions import MIN_NAMED_RING_MM
from kitgen.parts.ring_numbers import ring_needed_mm
from kitgen.recipe.load import parse_recipe_text
from kitgen.words.measure import text_corners_mm
from kitgen.words.templates import load_words

LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")
NOT_PLATE = "parts: [rete, mater_front, mater_back, rule, alidade]\n"


def kit_of(text: str):
    return build_kit(parse_recipe_text("epoch: 2027\n" + text))


@pytest.fixture(scope="module", params=[("latitude: 52.2\n", 180), ("latitude: -33.9\n", 80),
                                        ("latitude: 0.5\nlanguage: ar\n", 120)],
                ids=["north-180", "south-80", "equator-ar-120"])
def kit(request):
    head, diameter = request.param
    return kit_of(head + f"diameter_mm: {diameter}\n" + NOT_PLATE)


def _box(el, words):
    ext = words.measure(el.geom["text"], el.geom["size_pt"])
    return text_corners_mm(el.geom["at"], ext.width_mm, ext.height_mm, el.geom["angle_deg"], el.geom["anchor"])


def _segment_meets_box(p, q, corners) -> bool:
    """Whether segment pq meets the turned box (Liang-Barsky clipping in
    the box's own frame)."""
    (x0, y0), (x1, y1), _, (x3, y3) = corners
    ux, uy = x1 - x0, y1 - y0
    vx, vy = x3 - x0, y3 - y0
    lu, lv = math.hypot(ux, uy), math.hypot(vx, vy)
    ux, uy, vx, vy = ux / lu, uy / lu, vx / lv, vy / lv

    def local(pt):
        dx, dy = pt[0] - x0, pt[1] - y0
        return dx * ux + dy * uy, dx * vx + dy * vy

    (a0, b0), (a1, b1) = local(p), local(q)
    t0, t1 = 0.0, 1.0
    for d, lo, hi, start in ((a1 - a0, 0.0, lu, a0), (b1 - b0, 0.0, lv, b0)):
        if abs(d) < 1e-12:
            if start < lo or start > hi:
                return False
            continue
        ta, tb = (lo - start) / d, (hi - start) / d
        t0, t1 = max(t0, min(ta, tb)), min(t1, max(ta, tb))
        if t0 > t1:
            return False
    return True


def test_days_10_and_20_of_every_month_numbered_beside_their_ticks(kit):
    back, w = kit.part("mater_back"), kit.words
    ticks = {(e.values["month"], e.values["day"]): e for e in back.elements if e.role == "calendar_tick"}
    numbers = {(e.values["month"], e.values["day"]): e for e in back.elements if e.role == "day_label"}
    for month in range(1, 13):
        # Python's calendar: the month's length in the proleptic Gregorian calendar
        days = calendar.monthrange(kit.plan.epoch, month)[1]
        assert sum(m == month for m, _ in ticks) == days
        assert ticks[(month, 1)].stroke != "none"  # the month's boundary is drawn
        for day in (10, 20):
            label, tick = numbers[(month, day)], ticks[(month, day)]
            assert label.geom["text"] == w.number(day)
            # beside its tick: within 4 mm of the point it marks
            assert math.dist(label.geom["at"], tick.values["at"]) < 4.0, (month, day)
    # every 5 where there is room: at 180 mm there is (5-day pitch ~6 mm, a number ~2.6 mm)
    if 2 * kit.dims.mater_radius_mm >= 180:
        assert {d for _, d in numbers} == {5, 10, 15, 20, 25}


def _sign_numbers(part, role, words):
    out = {}
    for e in part.elements:
        if e.role == role:
            lon = e.values["longitude_deg"]
            out[int(round(lon))] = e
            assert e.geom["text"] == words.number(int(round(lon)) % 30)
    return out


def test_zodiac_10_and_20_numbered_on_back_and_rete_alike(kit):
    w = kit.words
    back = _sign_numbers(kit.part("mater_back"), "zodiac_number", w)
    wanted = {30 * k + n for k in range(12) for n in (10, 20)}
    assert set(back) == wanted
    ticks = {int(round(e.values["longitude_deg"])): e for e in kit.part("mater_back").elements
             if e.role == "zodiac_tick"}
    for lon, label in back.items():
        assert math.dist(label.geom["at"], ticks[lon].values["at"]) < 4.0
    rete = _sign_numbers(kit.part("rete"), "ecliptic_number", w)
    rticks = {int(round(e.values["longitude_deg"])): e for e in kit.part("rete").elements
              if e.role == "ecliptic_tick"}
    for lon, label in rete.items():
        assert math.dist(label.geom["at"], rticks[lon].values["at"]) < 4.0
    # The same numbers for the same longitudes; on the rete, a number too
    # crowded to print near the pin, or where a star's dot lies, is said in
    # the notes.
    assert set(rete) <= wanted
    said = [int(x.value) for n in kit.notes if n.key in ("notes.ecliptic_numbers", "notes.ecliptic_numbers_under_stars")
            for x in n.values["longitudes"]]
    assert sorted(said) == sorted(wanted - set(rete))


def test_the_default_rete_numbers_every_sign():
    kit = kit_of("latitude: 52.2\n" + NOT_PLATE)
    rete = {e.values["longitude_deg"] for e in kit.part("rete").elements if e.role == "ecliptic_number"}
    assert len(rete) == 24


def test_no_tick_over_the_numbers(kit):
    w = kit.words
    for kind, number_role, tick_roles in (("mater_back", ("day_label", "zodiac_number"),
                                            ("calendar_tick", "zodiac_tick", "scale_edge")),
                                           ("rete", ("ecliptic_number",), ("ecliptic_tick",))):
        part = kit.part(kind)
        segs = [e for e in part.elements if e.shape == "segment" and e.role in tick_roles and e.stroke != "none"]
        for label in (e for e in part.elements if e.role in number_role):
            corners = _box(label, w)
            hit = [s for s in segs if _segment_meets_box(s.geom["from"], s.geom["to"], corners)]
            assert not hit, (kind, label.values, [s.values for s in hit][:3])


@pytest.mark.parametrize("language", LANGUAGES)
def test_named_rings_hold_numbers_and_names_at_the_minimum_size(language):
    """The back's narrowest named ring holds the ticks, the digits and the
    tallest sign or month name at 5 pt, measured in every language."""
    w = load_words(language)
    names = list(w.items("zodiac.signs")) + list(w.items("calendar.months")) + list(w.items("calendar.months_short"))
    tallest = max(w.measure(n, 5.0).height_mm for n in names)
    assert ring_needed_mm(w, 5.0, tallest) <= MIN_NAMED_RING_MM


def _drawn_pieces(part):
    """Every drawn line of a part as short straight pieces (arcs and
    circles cut into chords of at most 0.2 mm sagitta-free length)."""
    for e in part.elements:
        if e.stroke in ("none", None) or e.shape == "text":
            continue
        g = e.geom
        if e.shape == "segment":
            yield g["from"], g["to"]
        elif e.shape == "polyline":
            pts = list(g["points"]) + ([g["points"][0]] if g.get("closed") else [])
            yield from zip(pts, pts[1:])
        elif e.shape in ("circle", "arc"):
            (cx, cy), r = g["center"], g["radius"]
            a0, a1 = (0.0, 360.0) if e.shape == "circle" else (g["start_deg"], g["end_deg"])
            n = max(8, int(math.radians(a1 - a0) * r / 0.2) + 1)
            pts = [(cx + r * math.cos(math.radians(a0 + (a1 - a0) * k / n)),
                    cy + r * math.sin(math.radians(a0 + (a1 - a0) * k / n))) for k in range(n + 1)]
            yield from zip(pts, pts[1:])


OWNER = "Mira Quellstone"  # an invented pupil


@pytest.mark.parametrize("head", ["latitude: 52.2\n", "latitude: -33.9\ndiameter_mm: 100\n",
                                  "latitude: 0.5\nlanguage: hi\n"])
def test_the_owner_on_every_part(head):
    """The owner's name, whole, at the legible minimum or larger, inside the
    part, crossed by no drawn line and over no star's dot (on the plate, a
    line under its latitude, where there is room: at these sizes there is)."""
    kit = kit_of(head + f"owner: {OWNER}\n")
    w = kit.words
    for part in kit.parts:
        owners = [e for e in part.elements if e.role == "owner"]
        assert [e.geom["text"] for e in owners] == [OWNER], part.id
        label = owners[0]
        assert label.geom["size_pt"] >= 5.0
        corners = _box(label, w)
        x0, y0, x1, y1 = part.bounds_mm
        assert all(x0 <= x <= x1 and y0 <= y <= y1 for x, y in corners)
        hit = [(p, q) for p, q in _drawn_pieces(part) if _segment_meets_box(p, q, corners)]
        assert not hit, (part.id, hit[:2])
        for star in (e for e in part.elements if e.role == "star"):
            (sx, sy), r = star.values["at"] if "at" in star.values else star.geom["at"], 0.0
            assert not _segment_meets_box((sx - 0.6, sy), (sx + 0.6, sy), corners), star.values["name"]
    without = kit_of(head)
    assert not [e for p in without.parts for e in p.elements if e.role == "owner"]


def _distance_to_segment(c, p, q) -> float:
    (cx, cy), (px, py), (qx, qy) = c, p, q
    dx, dy = qx - px, qy - py
    t = 0.0 if dx == dy == 0 else max(0.0, min(1.0, ((cx - px) * dx + (cy - py) * dy) / (dx * dx + dy * dy)))
    return math.hypot(cx - px - t * dx, cy - py - t * dy)


@pytest.mark.parametrize("head", ["latitude: 52.2\ndiameter_mm: 80\n", "latitude: -33.9\n",
                                  "latitude: 0.5\nlanguage: ar\ndiameter_mm: 300\n"])
def test_hang_hole_on_the_meridian_clear_of_every_scale(head):
    """A hole for the plumb's thread at the top of the mater, on the
    meridian, the same point through both faces (the back, seen from
    behind, is the front turned about the vertical axis: (x, y) behind
    (-x, y)), big enough for a thread (a doubled sewing thread is well
    under 1 mm across: common practice), and 0.3 mm or more from every
    other drawn line and word (the labels' margin)."""
    kit = kit_of(head)
    holes = {}
    for kind in ("mater_front", "mater_back"):
        part = kit.part(kind)
        (hole,) = [e for e in part.elements if e.role == "hang_hole"]
        assert hole.shape == "circle" and hole.stroke == "cut"
        (x, y), r = hole.geom["center"], hole.geom["radius"]
        assert x == 0.0 and y > 0.0          # on the meridian, at the top
        assert 2 * r >= 1.4
        assert y + r < kit.dims.mater_radius_mm  # inside the mater's cut
        holes[kind] = ((x, y), r)
        others = [e for e in part.elements if e is not hole]
        for p, q in _drawn_pieces(dataclasses.replace(part, elements=tuple(others))):
            if math.hypot(*p) >= kit.dims.mater_radius_mm - 1e-6 and math.hypot(*q) >= kit.dims.mater_radius_mm - 1e-6:
                continue  # the mater's own cut circle
            assert _distance_to_segment((x, y), p, q) >= r + 0.3 - 1e-9, (kind, p, q)
        for label in (e for e in others if e.shape == "text"):
            corners = _box(label, kit.words)
            xs, ys = [c[0] for c in corners], [c[1] for c in corners]
            nx, ny = min(max(x, min(xs)), max(xs)), min(max(y, min(ys)), max(ys))
            assert math.hypot(nx - x, ny - y) >= r + 0.3 - 1e-9, (kind, label.geom["text"])
    (fx, fy), fr = holes["mater_front"]
    (bx, by), br = holes["mater_back"]
    assert (-fx, fy, fr) == pytest.approx((bx, by, br))


@pytest.mark.parametrize("head", ["latitude: 0.5\n", "latitude: 52.2\ndiameter_mm: 80\n",
                                  "latitude: -33.9\ndiameter_mm: 120\nlanguage: ru\n"])
def test_star_names_beside_their_dots_and_off_the_zodiac(head):
    """Every drawn star is named beside its dot, or farther out with a leader
    line from its dot to its name, or said in the notes to be unnamed; no
    name meets the ecliptic's band, its words or another star's dot; no two
    drawn dots touch (stars that close are one dot, named for all)."""
    kit = kit_of(head + "parts: [rete]\n")
    rete, w = kit.part("rete"), kit.words
    stars = [e for e in rete.elements if e.role == "star"]
    drawn = [e for e in stars if e.stroke != "none"]
    labels = {e.values["name"]: e for e in rete.elements if e.role == "star_label"}
    leaders = {e.values["name"]: e for e in rete.elements if e.role == "star_leader"}
    unnamed = " ".join(n.text(w) for n in kit.notes if n.key.startswith("notes.unnamed_stars"))
    offset = kit.dims.tick_mm * 1.3
    words = [e for e in rete.elements if e.role in ("zodiac_label", "ecliptic_number")]
    (band,) = [e for e in rete.elements if e.role == "ecliptic_band"]
    ecliptic = next(e for e in rete.elements if e.role == "ecliptic")   # one circle, or its pieces round dots
    c, r_in, r_out = band.geom["center"], band.geom["radius"], ecliptic.geom["radius"]
    for star in drawn:
        name, at = star.values["name"], star.geom["at"]
        radius = star.values["radius_mm"]
        if name not in labels:
            assert w.star_name(name) in unnamed, name
            continue
        label = labels[name]
        corners = _box(label, w)
        xs, ys = [p[0] for p in corners], [p[1] for p in corners]
        near = (min(max(at[0], min(xs)), max(xs)), min(max(at[1], min(ys)), max(ys)))
        gap = math.dist(at, near)
        if name in leaders:
            a, b = leaders[name].geom["from"], leaders[name].geom["to"]
            assert math.dist(a, at) <= radius + 0.5 and math.dist(b, near) <= 0.5, name
        else:
            assert gap <= 2.8 * offset + 0.5, name   # beside its dot
        for other in drawn:
            if other is not star:
                o = other.geom["at"]
                ro = other.values["radius_mm"]
                assert not (min(xs) - ro < o[0] < max(xs) + ro and min(ys) - ro < o[1] < max(ys) + ro), (name, other.values["name"])
        for word in words:
            assert not any(_segment_meets_box(p, q, corners) for p, q in zip(_box(word, w), _box(word, w)[1:])), name
        # off the band: every corner and edge midpoint outside the annulus
        for p in corners + [((corners[k][0] + corners[k - 1][0]) / 2, (corners[k][1] + corners[k - 1][1]) / 2)
                            for k in range(4)]:
            d = math.dist(p, c)
            assert not (r_in < d < r_out), name
    for a in drawn:
        for b in drawn:
            if a is not b:
                ra, rb = (e.values["radius_mm"] for e in (a, b))
                assert math.dist(a.geom["at"], b.geom["at"]) >= ra + rb


def test_doubles_are_one_dot_named_once():
    """Rigil Kentaurus and Toliman (alpha Centauri A and B, 0.005 deg apart
    in the shipped catalogue and in Hipparcos) print as one dot, named once
    for both."""
    kit = kit_of("latitude: 0.5\ndiameter_mm: 300\nparts: [rete]\n")  # a rim far enough south to hold them
    rete, w = kit.part("rete"), kit.words
    stars = {e.values["name"]: e for e in rete.elements if e.role == "star"}
    a, b = stars["Rigil Kentaurus"], stars["Toliman"]
    assert a.stroke != "none" and b.stroke == "none" and b.values["merged_into"] == "Rigil Kentaurus"
    (label,) = [e for e in rete.elements if e.role == "star_label" and e.values["name"] == "Rigil Kentaurus"]
    assert w.star_name("Toliman") in label.geom["text"] and w.star_name("Rigil Kentaurus") in label.geom["text"]
    assert not [e for e in rete.elements if e.role == "star_label" and e.values["name"] == "Toliman"]


@pytest.mark.parametrize("head", ["latitude: -33.9\nsheet: a5\n", "latitude: -33.9\ndiameter_mm: 80\n",
                                  "latitude: 10\ndiameter_mm: 80\nrete_limit_deg: -70\n"])
def test_only_stars_closer_than_a_dot_are_merged(head):
    """Stars are one dot only when their centres are closer than the
    smallest printed dot is wide; Hadar, 4.4 deg from Rigil Kentaurus by
    PyEphem's places (Hipparcos), keeps its own dot and is never named in
    another star's label; dots that would touch are drawn smaller, never
    under the smallest dot (#9)."""
    a, b = ephem.stars.star("Rigil Kentaurus"), ephem.stars.star("Hadar")
    a.compute("2027/7/2"), b.compute("2027/7/2")
    assert math.degrees(ephem.separation(a, b)) > 4.0
    kit = kit_of(head + "parts: [rete]\n")
    rete, w = kit.part("rete"), kit.words
    stars = {e.values["name"]: e for e in rete.elements if e.role == "star"}
    assert stars["Hadar"].stroke != "none" and "merged_into" not in stars["Hadar"].values
    assert not [e for e in rete.elements if e.role == "star_label" and w.star_name("Hadar") in e.geom["text"]
                and e.values["name"] != "Hadar"]
    for name, star in stars.items():
        if "merged_into" in star.values:
            into = stars[star.values["merged_into"]]
            assert math.dist(star.geom["at"], into.geom["at"]) < 2 * MIN_DOT_RADIUS_MM, name
    drawn = [e for e in stars.values() if e.stroke != "none"]
    for e in drawn:
        assert MIN_DOT_RADIUS_MM - 1e-9 <= e.values["radius_mm"] <= star_radius_mm(e.values["mag"], kit.dims) + 1e-9
    for i, e in enumerate(drawn):
        for f in drawn[i + 1:]:
            assert math.dist(e.geom["at"], f.geom["at"]) >= 2 * MIN_DOT_RADIUS_MM  # farther apart than a dot is wide
            assert math.dist(e.geom["at"], f.geom["at"]) >= e.values["radius_mm"] + f.values["radius_mm"] - 1e-9

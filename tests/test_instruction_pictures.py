"""The instructions' two pictures (#9): the plate with each kind of line
named, and the parts on the pin, drawn from the kit's own parts.

References:
* Snyder, J. P. (1987), *Map Projections: A Working Manual*, USGS
  Professional Paper 1395, polar stereographic projection (eqs. 21-33,
  21-34), written out below as in tests/test_against_snyder.py: the
  picture's horizon and almucantar, unscaled, are the circles through the
  images of their two points on the meridian;
* the shipped fonts measured as the PDF sets them (``Words.measure``, as
  tests/test_plate_readings.py measures labels): no name's box meets a
  drawn line, each line sampled every 0.05 mm with its ink's half width;
* the assembly steps of the instructions (kitgen.layout.instructions's
  STACK_ITEM_PARTS, the templates' ``instructions.stack``): the layers of
  the stack's picture bottom to top in their order;
* the PDF read back with pypdf: the figure's words in the page's text
  (an ActualText span for a right-to-left line, ISO 32000-1:2008, 14.9.4).
"""

from __future__ import annotations

import io
import math

import numpy as np
import pytest

from kitgen.geometry.style import dot_radius_mm, stroke_width_mm
from kitgen.kit import build_kit
from kitgen.layout.figures import LineScale, kit_figures
from kitgen.layout.instructions import STACK_ITEM_PARTS, column_mm, story
from kitgen.layout.pages import layout_kit
from kitgen.words.locale import true_minus
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.pdf import render_pdf
from kitgen.words.measure import text_corners_mm

from .test_plate_readings import distance_to_box, text_box   # labels measured as the plate's tests measure them

pypdf = pytest.importorskip("pypdf")

RECIPES = {
    "north": "latitude: 52.2\nepoch: 2027\n",
    "south": "latitude: -33.9\nepoch: 2027\nlanguage: es\n",
    "equator": "latitude: 0.5\nepoch: 2027\ntwilight: [civil, nautical, astronomical]\n",
    "ar": "latitude: 24.5\nepoch: 2027\nsheet: letter\nlanguage: ar\n",
    "a5": "latitude: 28.6\nepoch: 2027\nsheet: a5\nlanguage: hi\n",
    "duplex": "latitude: 37.9\nepoch: 2027\nsheet: a5\nlanguage: el\nduplex: long_edge\ndiameter_mm: 110\n",
}
_KITS: dict = {}


def kit_and_figures(name):
    if name not in _KITS:
        kit = build_kit(parse_recipe_text(RECIPES[name]))
        pages = layout_kit(kit)
        _KITS[name] = (kit, pages, kit_figures(kit, column_mm(pages)))
    return _KITS[name]


# -- Snyder's polar stereographic formulas ----------------------------------------------

def snyder_xy(h_rad, dec_rad, sign, R):
    """kitgen's plane from Snyder's polar aspects (see tests/test_against_snyder.py):
    rho = R tan(45 deg - sign * phi / 2), hour angle h as longitude pi - h
    (north) or -h (south)."""
    if sign > 0:
        rho, dlon = R * math.tan(math.pi / 4 - dec_rad / 2), math.pi - h_rad
        return np.array([rho * math.sin(dlon), -rho * math.cos(dlon)])
    rho, dlon = R * math.tan(math.pi / 4 + dec_rad / 2), -h_rad
    return np.array([rho * math.sin(dlon), rho * math.cos(dlon)])


def altitude_circle(alt_deg, lat_deg, sign, R):
    """(centre, radius) of the image of the altitude circle: the two points
    of the meridian at zenith distance 90 - alt from the zenith are the ends
    of a diameter (the image is symmetric about the meridian)."""
    ends = []
    for dec in (lat_deg - (90.0 - alt_deg), lat_deg + (90.0 - alt_deg)):
        h = 0.0
        if dec > 90.0:
            h, dec = math.pi, 180.0 - dec
        elif dec < -90.0:
            h, dec = math.pi, -180.0 - dec
        ends.append(snyder_xy(h, math.radians(dec), sign, R))
    return (ends[0] + ends[1]) / 2, float(np.hypot(*(ends[1] - ends[0]))) / 2


@pytest.mark.parametrize("name", ["north", "south", "equator"])
def test_the_plate_picture_is_the_plate_scaled(name):
    kit, _, (plate, _) = kit_and_figures(name)
    lat, sign, R = kit.plan.plates[0].latitude_deg, kit.plan.hemisphere_sign, kit.dims.equator_radius_mm
    k, pin = plate.values["scale"], np.array(plate.values["pin_mm"])
    assert 0.1 < k < 1.0
    for role, alt in (("horizon", 0.0), ("almucantar", 30.0)):
        centre, radius = altitude_circle(alt, lat, sign, R)
        drawn = [e for e in plate.elements if e.role == role and e.values.get("altitude_deg") == alt]
        assert drawn, role
        for e in drawn:
            assert e.shape in ("circle", "arc")
            c = (np.array(e.geom["center"]) - pin) / k
            assert np.hypot(*(c - centre)) < 1e-6 * max(1.0, radius), (role, c, centre)
            assert abs(e.geom["radius"] / k - radius) < 1e-6 * max(1.0, radius), (role, e.geom["radius"] / k, radius)
    # The plate's equator, whole in the picture, at the kit's equator radius.
    eq = [e for e in plate.elements if e.role == "equator"]
    assert len(eq) == 1 and eq[0].shape == "circle"
    assert abs(eq[0].geom["radius"] / k - R) < 1e-9


# -- leaders and names ----------------------------------------------------------------------

def distance_to(el, p) -> float:
    """Distance (mm) from the point p to the drawn element, exactly."""
    g, p = el.geom, np.asarray(p, dtype=float)
    if el.shape == "point":
        return float(np.hypot(*(p - g["at"])))
    if el.shape in ("circle", "arc"):
        c, r = np.asarray(g["center"]), g["radius"]
        if el.shape == "circle":
            return abs(float(np.hypot(*(p - c))) - r)
        a = math.degrees(math.atan2(p[1] - c[1], p[0] - c[0]))
        if (a - g["start_deg"]) % 360.0 <= g["end_deg"] - g["start_deg"]:
            return abs(float(np.hypot(*(p - c))) - r)
        ends = [c + r * np.array([math.cos(math.radians(t)), math.sin(math.radians(t))])
                for t in (g["start_deg"], g["end_deg"])]
        return min(float(np.hypot(*(p - q))) for q in ends)
    pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"])
    best = math.inf
    for a, b in zip(pts, pts[1:]):
        a, b = np.asarray(a), np.asarray(b)
        t = np.clip(np.dot(p - a, b - a) / max(np.dot(b - a, b - a), 1e-300), 0.0, 1.0)
        best = min(best, float(np.hypot(*(p - (a + t * (b - a))))))
    return best


#: The template word naming each kind of line (the plate's own names where it has them).
NAME_KEYS = {"horizon": "plate.line_horizon", "equator": "plate.line_equator", "azimuth": "instructions.figure_azimuth",
             "unequal_hour": "instructions.figure_unequal_hours", "zenith": "instructions.figure_zenith",
             "meridian": "instructions.figure_meridian", "east_west": "instructions.figure_east_west"}


def expected_name(kit, values) -> str:
    w, curve = kit.words, values["curve"]
    if curve == "almucantar":
        return w("instructions.figure_almucantar", altitude=w.number(values["altitude_deg"]))
    if curve == "twilight":
        return w("plate.line_twilight", altitude=true_minus(w.number(values["altitude_deg"])))
    if curve == "tropic":
        return w("plate.line_tropic_cancer" if values["declination_deg"] > 0 else "plate.line_tropic_capricorn")
    return w(NAME_KEYS[curve])


@pytest.mark.parametrize("name", sorted(RECIPES))
def test_every_kind_of_line_named_with_a_leader_ending_on_it(name):
    kit, _, (plate, _) = kit_and_figures(name)
    leaders = [e for e in plate.elements if e.role == "figure_leader"]
    texts = [e for e in plate.elements if e.role == "figure_name"]
    named = {e.values["curve"] for e in leaders}
    # Every kind of line the plate draws is named.
    drawn = {e.role for e in kit.part("plate-1").elements}
    kinds = {"horizon", "almucantar", "azimuth", "equator", "tropic", "twilight", "unequal_hour", "zenith",
             "meridian", "east_west"} & drawn
    assert named == kinds, kinds ^ named
    tropics = {e.values["declination_deg"] for e in leaders if e.values["curve"] == "tropic"}
    assert tropics == {e.values["declination_deg"] for e in kit.part("plate-1").with_role("tropic")}
    assert {e.values["altitude_deg"] for e in leaders if e.values["curve"] == "twilight"} == set(
        kit.plan.drawing.twilight_deg)
    k = plate.values["scale"]
    for leader in leaders:
        v = leader.values
        curve = [e for e in plate.elements if e.role == v["curve"]
                 and all(e.values.get(key) == val for key, val in v.items() if key != "curve")]
        assert curve, v
        # within 0.2 mm of the very line it names, in the picture
        assert min(distance_to(e, leader.geom["to"]) for e in curve) <= 0.2, v
        # and not on the plate's edge, where lines end together (but for
        # the circle that is the edge: the outer tropic, where the rim is it)
        rim = kit.dims.outer_tropic_radius_mm
        if all(e.shape == "circle" and abs(e.geom["radius"] / k - rim) < 1e-6 for e in curve):
            continue
        assert np.hypot(*(np.array(leader.geom["to"]) - plate.values["pin_mm"])) / k < rim
        words = " ".join(t.geom["text"] for t in texts if t.values == v)
        assert words == expected_name(kit, v), (words, v)


def samples(el, step_mm=0.05):
    g = el.geom
    if el.shape == "point":
        return np.array([g["at"]])
    if el.shape in ("circle", "arc"):
        c, r = np.array(g["center"]), g["radius"]
        lo, hi = (0.0, 2 * math.pi) if el.shape == "circle" else (math.radians(g["start_deg"]),
                                                                 math.radians(g["end_deg"]))
        # the part of a huge circle that can reach the picture only
        t = np.linspace(lo, hi, int(min((hi - lo) * r, 2000.0) / step_mm) + 2)
        if (hi - lo) * r > 2000.0:
            mid = math.atan2(-c[1], -c[0])
            t = np.arange(mid - 1000.0 / r, mid + 1000.0 / r, step_mm / r)
            t = t[(lo + (t - lo) % (2 * math.pi)) <= hi]
        return c + r * np.stack([np.cos(t), np.sin(t)], axis=1)
    pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"])
    out = []
    for p, q in zip(pts, pts[1:]):
        p, q = np.array(p), np.array(q)
        n = max(2, int(np.hypot(*(q - p)) / step_mm) + 2)
        out.append(p + np.linspace(0.0, 1.0, n)[:, None] * (q - p))
    return np.concatenate(out)


def ink(figure):
    """Every drawn point of the picture with its ink's half width (mm)."""
    pts, half = [], []
    for e in figure.elements:
        if e.shape == "text" or e.stroke == "none":
            continue
        s = samples(e)
        pts.append(s)
        r = dot_radius_mm(LineScale()) if e.shape == "point" else stroke_width_mm(e.stroke, LineScale()) / 2
        half.append(np.full(len(s), r))
    return np.concatenate(pts), np.concatenate(half)


@pytest.mark.parametrize("name", sorted(RECIPES))
def test_no_name_meets_a_line_and_all_fit_the_column(name):
    kit, pages, figures = kit_and_figures(name)
    width = column_mm(pages)
    for fig in figures:
        assert fig is not None and fig.width_mm <= width + 1e-9
        pts, half = ink(fig)
        assert pts[:, 0].min() >= 0.0 and pts[:, 0].max() <= fig.width_mm
        assert pts[:, 1].min() >= 0.0 and pts[:, 1].max() <= fig.height_mm
        names = [e for e in fig.elements if e.shape == "text"]
        assert names and all(e.geom["size_pt"] >= 9.0 for e in names)   # the instructions' smallest size
        boxes = [text_box(e, kit.words) for e in names]
        for e, box in zip(names, boxes):
            assert np.all(distance_to_box(pts, box) >= half), (name, e.geom["text"])
            corners = np.array(text_corners_mm(e.geom["at"], 2 * box[2], 2 * box[3], 0.0, e.geom["anchor"]))
            assert corners[:, 0].min() >= 0.0 and corners[:, 0].max() <= fig.width_mm, e.geom["text"]
            assert corners[:, 1].min() >= 0.0 and corners[:, 1].max() <= fig.height_mm, e.geom["text"]
        for i, a in enumerate(boxes):   # and no name on another
            for b in boxes[i + 1:]:
                assert (abs(a[0][1] - b[0][1]) >= a[3] + b[3] - 1e-9
                        or abs(a[0][0] - b[0][0]) >= a[2] + b[2] - 1e-9)


# -- the stack -------------------------------------------------------------------------------

def stack_order(kit):
    printed = set(kit.plan.parts)
    return [kinds[0] for kinds in STACK_ITEM_PARTS if printed & set(kinds)]


@pytest.mark.parametrize("name", ["north", "ar", "duplex"])
def test_the_stack_picture_follows_the_assembly_steps(name):
    kit, _, (_, stack) = kit_and_figures(name)
    layers = [e for e in stack.elements if e.role == "figure_layer"]
    heights = {}
    for e in layers:
        heights.setdefault(e.values["layer"], []).extend(y for _, y in e.geom["points"])
    bottom_up = sorted(heights, key=lambda k: np.mean(heights[k]))
    assert bottom_up == stack_order(kit)
    # each layer's leader ends on its own outline, and its name is the
    # part's name in the kit's language
    w = kit.words
    for leader in (e for e in stack.elements if e.role == "figure_leader"):
        own = [e for e in stack.elements if e.shape != "text" and e.role in ("figure_layer", "figure_pin")
               and e.values.get("layer", "pin") == leader.values["layer"]]
        assert min(distance_to(e, leader.geom["to"]) for e in own) <= 0.2, leader.values
    names = {e.values["layer"]: e.geom["text"] for e in stack.elements if e.role == "figure_name"}
    assert names["rule"] == w("rule.title") and names["alidade"] == w("alidade.title")
    assert names["mater_front"] == w("instructions.figure_mater") and names["pin"] == w("instructions.figure_pin")
    # The names stand in the same order as the layers.
    name_y = {e.values["layer"]: e.geom["at"][1] for e in stack.elements if e.role == "figure_name"}
    assert sorted(bottom_up, key=name_y.get) == bottom_up
    # Real proportions: the widths of the outlines as the parts' radii.
    width = {k: max(x for e in layers if e.values["layer"] == k for x, _ in e.geom["points"])
             - min(x for e in layers if e.values["layer"] == k for x, _ in e.geom["points"]) for k in heights}
    assert width["mater_front"] / width["rete"] == pytest.approx(
        kit.dims.mater_radius_mm / kit.part("rete").bounds_mm[2], rel=0.01)
    assert width["mater_front"] / width["plate"] == pytest.approx(
        kit.dims.mater_radius_mm / kit.dims.plate_radius_mm, rel=0.01)


def test_only_the_printed_parts_are_stacked():
    kit = build_kit(parse_recipe_text("latitude: 52.2\nepoch: 2027\nparts: [plate, rete, rule]\n"))
    pages = layout_kit(kit)
    _, stack = kit_figures(kit, column_mm(pages))
    layers = [e.values["layer"] for e in stack.elements if e.role == "figure_name"]
    assert sorted(layers) == sorted(["plate", "rete", "rule", "pin"])
    blocks = [b for b in story(kit, pages) if b.kind == "figure"]
    assert [b.figure for b in blocks] == list(kit_figures(kit, column_mm(pages)))[::-1]


# -- on the printed page ---------------------------------------------------------------------

def page_words(pdf_bytes, number):
    """The page's text as pypdf extracts it, and its ActualText spans."""
    reader = pypdf.PdfReader(io.BytesIO(pdf_bytes))
    page = reader.pages[number - 1]
    spans = []
    for operands, op in pypdf.generic.ContentStream(page.get_contents(), reader).operations:
        if op == b"BDC" and len(operands) == 2 and hasattr(operands[1], "get"):
            text = operands[1].get("/ActualText")
            if text is not None:
                spans.append(str(text))
    return page.extract_text() + "\n" + "\n".join(spans)


@pytest.mark.parametrize("name", ["north", "ar"])
def test_the_pictures_words_are_printed_on_an_instructions_page(name):
    kit, pages, (plate, stack) = kit_and_figures(name)
    data = render_pdf(kit, pages)
    w = kit.words
    for fig, caption in ((plate, "instructions.figure_plate"), (stack, "instructions.figure_stack")):
        page = next(p for p in pages if any(f.figure is fig for f in p.figures))
        assert page.kind == "instructions"
        text = " ".join(page_words(data, page.number).split())
        for e in fig.elements:
            if e.role == "figure_name":
                assert e.geom["text"] in text, e.geom["text"]
        assert w(caption) in text
        assert " ".join(w("plate.line_horizon").split()) in text or fig is stack

"""Duplex: the mater's front and back on the two sides of one sheet.

A sheet turned over on its long edge (a portrait page turned about its
vertical axis) puts the back page's point (u, v) behind the front page's
point (W - u, v); turned over on its short edge, behind (u, H - v)
(common practice of duplex printing: "flip on long edge" and "flip on
short edge").  The mater's back, seen from behind, is its front turned
about the vertical axis: the back's point (x, y) lies behind the front's
(-x, y) (DEVELOPERS.md, frames).  So, with p x CTM the page point of a
part point p (ISO 32000-1:2008, 8.3.4, row vectors; see pdf_paths.py),
CTM_back x Flip = Mirror x CTM_front, read from the PDF itself.
"""

from __future__ import annotations

import io
import math
from collections import Counter

import pytest

pypdf = pytest.importorskip("pypdf")

from kitgen.errors import UserError  # noqa: E402
from kitgen.kit import build_kit  # noqa: E402
from kitgen.recipe.load import parse_recipe_text  # noqa: E402
from kitgen.render.pdf import build_pdf  # noqa: E402

from .pdf_paths import IDENTITY, mul, read_page  # noqa: E402
from .printed import page_text  # noqa: E402

PT_PER_MM = 72.0 / 25.4
RECIPE = "latitude: 52.2\nepoch: 2027\nsheet: a4\ntitle: Larkspur Valley School\n"
MIRROR = (-1.0, 0.0, 0.0, 1.0, 0.0, 0.0)


def printed(extra: str):
    kit = build_kit(parse_recipe_text(RECIPE + extra))
    pages, pdf = build_pdf(kit)
    reader = pypdf.PdfReader(io.BytesIO(pdf))
    return kit, pages, reader


def _part_ctm(reader, k):
    """The transform most of the page's paths are drawn under: the mater's
    (its thousands of ticks), as the PDF says it."""
    paths, _ = read_page(reader, reader.pages[k])
    ctm, _ = Counter(tuple(round(v, 4) for v in p.ctm) for p in paths if p.ctm != IDENTITY).most_common(1)[0]
    return ctm, paths


@pytest.mark.parametrize("mode", ["long_edge", "short_edge"])
def test_front_and_back_register_through_the_sheet(mode):
    kit, pages, reader = printed(f"duplex: {mode}\n")
    k = next(i for i, p in enumerate(pages) if p.duplex == "front")
    front, back = pages[k], pages[k + 1]
    assert back.duplex == "back" and not front.landscape and not back.landscape
    assert [pl.part.kind for pl in front.placements] == ["mater_front"]
    assert [pl.part.kind for pl in back.placements] == ["mater_back"]
    w_pt = float(reader.pages[k].mediabox.width)
    h_pt = float(reader.pages[k].mediabox.height)
    flip = (-1.0, 0.0, 0.0, 1.0, w_pt, 0.0) if mode == "long_edge" else (1.0, 0.0, 0.0, -1.0, 0.0, h_pt)
    ctm_front, front_paths = _part_ctm(reader, k)
    ctm_back, back_paths = _part_ctm(reader, k + 1)
    assert mul(ctm_back, flip) == pytest.approx(mul(MIRROR, ctm_front), abs=2e-3)

    # The registration marks: each cross of the back lies, through the
    # sheet, on the centre of a pair of scales of the front.
    def centres(paths, half_mm):
        """Centres of the marks: horizontal strokes 2 x half_mm long, drawn
        on the page itself (no part's transform)."""
        out = set()
        for p in paths:
            pts = p.device_points()
            if p.ctm == IDENTITY and len(pts) == 2 and abs(pts[0][1] - pts[1][1]) < 1e-6 \
                    and abs(abs(pts[1][0] - pts[0][0]) - 2 * half_mm * PT_PER_MM) < 1e-3:
                out.add(((pts[0][0] + pts[1][0]) / 2, pts[0][1]))
        return out

    fronts = centres(front_paths, 5.0)
    backs = centres(back_paths, 6.0)
    assert len(fronts) >= 2 and len(fronts) == len(backs) == len(front.marks) == len(back.marks)
    through = [(w_pt - x, y) if mode == "long_edge" else (x, h_pt - y) for x, y in backs]
    for x, y in through:   # to 0.01 pt (reportlab writes 1e-4 pt)
        assert sum(abs(x - fx) < 0.01 and abs(y - fy) < 0.01 for fx, fy in fronts) == 1
    # ... and every mark keeps to the margins and clear of the footer, on both sides.
    for page in (front, back):
        m = page.sheet.margin_mm
        for mark in page.marks:
            assert m + 14.0 + 6.0 <= mark.y_mm <= page.height_mm - m - 6.0
            assert m + 6.0 <= mark.x_mm <= page.width_mm - m - 6.0


def test_the_first_page_says_which_pages_go_double_sided():
    kit, pages, reader = printed("duplex: long_edge\n")
    k = next(p.number for p in pages if p.duplex == "front")
    text = page_text(reader, 0)
    assert f"Print pages {k} and {k + 1} on the two sides of one sheet of card, turning it over on the long edge" \
        in text


def test_no_duplex_by_default():
    _, pages, _ = printed("")
    assert all(p.duplex == "" and not p.marks for p in pages)


@pytest.mark.parametrize("extra", ["duplex: long_edge\ndiameter_mm: 230\n",
                                   "duplex: short_edge\nfilm_parts: [mater_back]\n"])
def test_duplex_that_cannot_be_done_is_one_line_naming_the_key(extra):
    with pytest.raises(UserError) as info:
        printed(extra)
    assert "'duplex'" in str(info.value) and "\n" not in str(info.value)


@pytest.mark.parametrize("mode", ["long_edge", "short_edge"])
def test_registration_marks_are_squares_never_circles(mode):
    """The pupils pierce the circles with a cross (the pins' marks); a
    duplex mark must not look like one (#9): on both sides, every path of
    a mark is straight (no Bezier curve: a circle is drawn with curves,
    ISO 32000-1:2008, 8.5.2.2) and each mark has its square frame."""
    kit, pages, reader = printed(f"duplex: {mode}\n")
    k = next(i for i, p in enumerate(pages) if p.duplex == "front")
    for side in (k, k + 1):
        paths, _ = read_page(reader, reader.pages[side])
        for mark in pages[side].marks:
            cx, cy = mark.x_mm * PT_PER_MM, mark.y_mm * PT_PER_MM
            near = [p for p in paths if p.ctm == IDENTITY
                    and all(abs(x - cx) <= 7 * PT_PER_MM and abs(y - cy) <= 7 * PT_PER_MM
                            for x, y in p.device_points())]
            assert near
            assert all(len(p.points) == len(p.nodes) for p in near)   # lines only, no curve
            squares = [p for p in near if len(p.nodes) == 4
                       and len({round(x, 3) for x, _ in p.device_nodes()}) == 2
                       and len({round(y, 3) for _, y in p.device_nodes()}) == 2
                       and abs((max(x for x, _ in p.device_nodes()) - min(x for x, _ in p.device_nodes()))
                               - (max(y for _, y in p.device_nodes()) - min(y for _, y in p.device_nodes()))) < 1e-3]
            assert len(squares) == 1, (side, mark)


# -- a duplex card has no slot (#9) ---------------------------------------------
# A cut goes through the whole card: a line cut in the front, seen from
# behind, runs through whatever the back prints at that point.  The key
# slot of a glued mater opens into the pocket between the two cards; on a
# duplex card it cut the back's zodiac and calendar rings (~18-25 Dec).
# Geometry below is read from the parts and their placements on the pages,
# and the crossings are found by Shapely/GEOS, a library outside kitgen.

shapely = pytest.importorskip("shapely")
from shapely.geometry import LineString, Polygon  # noqa: E402

from kitgen.geometry.style import stroke_width_mm  # noqa: E402
from kitgen.layout.instructions import story  # noqa: E402
from kitgen.layout.pages import _duplex_pages, layout_kit  # noqa: E402
from kitgen.parts.breaks import text_box  # noqa: E402
from kitgen.words.templates import load_words  # noqa: E402

DUPLEX_KITS = ["latitude: 40.6\nlanguage: el\nsheet: a4\nduplex: long_edge\n",
               "latitude: -33.9\nlanguage: ar\nsheet: letter\nduplex: short_edge\n",
               RECIPE + "duplex: long_edge\n"]


def _line_mm(el, step_mm=0.2):
    """The points (mm, part frame) along a drawn element."""
    g = el.geom
    if el.shape == "segment":
        return [g["from"], g["to"]]
    if el.shape == "polyline":
        pts = list(g["points"])
        return pts + pts[:1] if g["closed"] else pts
    if el.shape in ("circle", "arc"):
        (cx, cy), r = g["center"], g["radius"]
        a0, a1 = (0.0, 360.0) if el.shape == "circle" else (g["start_deg"], g["end_deg"])
        n = max(8, int(math.radians(a1 - a0) * r / step_mm))
        return [(cx + r * math.cos(math.radians(a0 + (a1 - a0) * k / n)),
                 cy + r * math.sin(math.radians(a0 + (a1 - a0) * k / n))) for k in range(n + 1)]
    return []


def _front_cuts_on_back(on_front, on_back, page, mode):
    """The front's cut lines other than its outline (which the back shares),
    carried through the sheet into the back part's frame: the page point
    (u, v) of the front lies behind (W - u, v) of the back page turned on
    its long edge, behind (u, H - v) turned on its short edge (common
    practice of duplex printing, as in the test above)."""
    w_mm, h_mm = page.width_mm, page.height_mm
    a = math.radians(on_back.rotation_deg)
    out = []
    front = on_front.part
    r_out = front.bounds_mm[2]
    for el in front.elements:
        if el.stroke != "cut" or (el.shape == "circle" and el.geom["center"] == (0.0, 0.0)
                                  and abs(el.geom["radius"] - r_out) < 1e-9):
            continue
        pts = []
        for x, y in _line_mm(el):
            u, v = on_front.to_page(x, y)
            u, v = (w_mm - u, v) if mode == "long_edge" else (u, h_mm - v)
            du, dv = u - on_back.x_mm, v - on_back.y_mm
            pts.append((math.cos(a) * du + math.sin(a) * dv, -math.sin(a) * du + math.cos(a) * dv))
        out.append((el, LineString(pts)))
    return out


def _back_ink(kit, back):
    """The back's drawn lines, each as wide as it is printed, and its
    words' boxes (the measure the fitter uses, kitgen.parts.breaks)."""
    out = []
    for el in back.elements:
        if el.shape == "text":
            out.append((el, Polygon(text_box(el, kit.words).corners())))
        elif el.stroke not in ("none", "cut") and el.shape != "point":
            out.append((el, LineString(_line_mm(el)).buffer(stroke_width_mm(el.stroke, kit.dims) / 2)))
    return out


def _crossings(kit, on_front, on_back, page, mode):
    ink = _back_ink(kit, on_back.part)
    return [(cut.role, el.role) for cut, line in _front_cuts_on_back(on_front, on_back, page, mode)
            for el, shape in ink if line.distance(shape) < 0.1]


@pytest.mark.parametrize("recipe", DUPLEX_KITS)
def test_no_cut_of_the_duplex_front_crosses_the_back(recipe):
    kit = build_kit(parse_recipe_text(recipe))
    pages = layout_kit(kit)
    k = next(i for i, p in enumerate(pages) if p.duplex == "front")
    (on_front,), (on_back,) = pages[k].placements, pages[k + 1].placements
    mode = kit.plan.printing.duplex
    cuts = _front_cuts_on_back(on_front, on_back, pages[k], mode)
    assert any(c.role == "hang_hole" for c, _ in cuts)     # the thread hole is checked too
    assert _crossings(kit, on_front, on_back, pages[k], mode) == []
    # No slot, and so no key on the plate: its cut line is its circle alone.
    assert not [e for e in kit.part("mater_front").elements if e.values.get("purpose") == "key_slot"]
    assert not kit.part("mater_front").with_role("key_slot_label")
    for plate in kit.parts_of("plate"):
        cut = [e for e in plate.elements if e.stroke == "cut"]
        assert [e.shape for e in cut] == ["circle"] and not plate.with_role("key")
        assert cut[0].geom["radius"] == pytest.approx(kit.dims.plate_radius_mm)


def test_the_check_finds_a_slot_through_the_card():
    """The same check on the glued kit's front and back, put on one sheet
    as duplex puts them, finds the key slot across the back's rings: the
    check above can fail."""
    kit = build_kit(parse_recipe_text("latitude: 40.6\nlanguage: el\nsheet: a4\n"))
    page = layout_kit(kit)[-1]
    (on_front, _), (on_back, _) = _duplex_pages(kit.part("mater_front"), kit.part("mater_back"), page.sheet,
                                                page.print_scale, "long_edge")
    crossed = _crossings(kit, on_front, on_back, page, "long_edge")
    assert crossed and {c for c, _ in crossed} == {"cut"}
    assert {"zodiac_tick", "calendar_tick"} & {e for _, e in crossed}


#: Template keys whose English wording speaks of the key slot; in every
#: language their words must be absent from a duplex kit's instructions.
SLOT_KEYS = ("plate.plates_intro", "mater_front.key_slot", "instructions.need_knife",
             "instructions.cut_key_slot", "instructions.cut_key_slot_unglued")


@pytest.mark.parametrize("language", ["en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi"])
def test_duplex_instructions_speak_of_no_slot(language):
    english = load_words("en")
    for key in SLOT_KEYS:   # the list is the whole list of the slot's words
        assert "slot" in english.template(key)
    assert "slot" in english.items("instructions.stack")[2]
    kit = build_kit(parse_recipe_text(f"plates: [40.6, 52.2]\nlanguage: {language}\nduplex: long_edge\n"))
    w = kit.words
    texts = [b.text for b in story(kit, layout_kit(kit))]
    label = w("mater_front.key_slot")
    slot_words = [w(k, label=label) for k in SLOT_KEYS] + [w.items("instructions.stack")[2]]
    assert not [s for s in slot_words for t in texts if s in t]
    if language == "en":
        assert not [t for t in texts if "slot" in t.lower() or " key " in t.lower()]
    # ... and they say how the plate is set instead.
    noon = w.number(12)
    assert w("instructions.stack_plate_duplex", noon=noon) in texts
    assert w("plate.plates_intro_duplex", noon=noon) in texts

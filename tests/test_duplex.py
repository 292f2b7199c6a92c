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

"""The printed kit: pages, sheet sizes, fonts, furniture and determinism.

Each sheet's kit is built, laid out and rendered once per module; the PDF is
read back with pypdf (an independent PDF reader) and checked against the
published paper sizes and the PDF specification.
"""

from __future__ import annotations

import io
import math
import subprocess
import sys

import pytest

pypdf = pytest.importorskip("pypdf")
from pypdf.generic import ContentStream  # noqa: E402

from kitgen.kit import build_kit  # noqa: E402
from kitgen.layout.pages import check_bar_mm  # noqa: E402
from kitgen.paper import FOOTER_MM, TITLE_BAND_MM  # noqa: E402
from kitgen.recipe.load import parse_recipe_text  # noqa: E402
from kitgen.render.pdf import build_pdf, render_pdf  # noqa: E402

PT_PER_IN = 72.0          # PDF 32000-1:2008, 8.3.2.3: default user space unit is 1/72 inch
MM_PER_IN = 25.4          # exact, by the 1959 international yard and pound agreement
PT_PER_MM = PT_PER_IN / MM_PER_IN

#: Portrait sheet sizes in points, from the standards themselves (not from
#: kitgen.paper): ISO 216 gives A4 and A3 in mm, ANSI/ASME Y14.1
#: gives Letter (ANSI A) and Tabloid (ANSI B) in inches.
SHEETS_PT = {
    "a5": (148 * PT_PER_MM, 210 * PT_PER_MM),        # ISO 216: A5 = 148 x 210 mm
    "a4": (210 * PT_PER_MM, 297 * PT_PER_MM),        # ISO 216: A4 = 210 x 297 mm
    "a3": (297 * PT_PER_MM, 420 * PT_PER_MM),        # ISO 216: A3 = 297 x 420 mm
    "letter": (8.5 * PT_PER_IN, 11 * PT_PER_IN),     # ANSI/ASME Y14.1: Letter = 8.5 x 11 in
    "legal": (8.5 * PT_PER_IN, 14 * PT_PER_IN),      # common North American practice (not in Y14.1): 8.5 x 14 in
    "tabloid": (11 * PT_PER_IN, 17 * PT_PER_IN),     # ANSI/ASME Y14.1: Tabloid = 11 x 17 in
}

#: The 14 standard Type 1 fonts: PDF 32000-1:2008, 9.6.2.2.
STANDARD_14 = {
    "Times-Roman", "Times-Bold", "Times-Italic", "Times-BoldItalic",
    "Helvetica", "Helvetica-Bold", "Helvetica-Oblique", "Helvetica-BoldOblique",
    "Courier", "Courier-Bold", "Courier-Oblique", "Courier-BoldOblique",
    "Symbol", "ZapfDingbats",
}

RECIPE = "latitude: 48.2\nepoch: 2026\nsheet: {sheet}\ntitle: Larkspur Valley Astronomy Club\n"


class Rendered:
    def __init__(self, sheet: str):
        self.sheet = sheet
        self.kit = build_kit(parse_recipe_text(RECIPE.format(sheet=sheet)))
        self.pages, self.pdf = build_pdf(self.kit)
        self.reader = pypdf.PdfReader(io.BytesIO(self.pdf))


@pytest.fixture(scope="module", params=sorted(SHEETS_PT))
def rendered(request) -> Rendered:
    return Rendered(request.param)


@pytest.fixture(scope="module")
def a4() -> Rendered:
    return Rendered("a4")


def _flat(text: str) -> str:
    return " ".join(text.split())


# -- sheet sizes ------------------------------------------------------------------

def test_every_mediabox_is_the_sheet(rendered):
    """Mediabox = the sheet, in points to 0.01 pt; ISO 216 / ANSI/ASME Y14.1."""
    w0, h0 = SHEETS_PT[rendered.sheet]
    assert len(rendered.reader.pages) == len(rendered.pages)
    for pdf_page, page in zip(rendered.reader.pages, rendered.pages):
        box = pdf_page.mediabox
        assert float(box.left) == pytest.approx(0.0, abs=0.01)
        assert float(box.bottom) == pytest.approx(0.0, abs=0.01)
        want = (h0, w0) if page.landscape else (w0, h0)
        assert float(box.width) == pytest.approx(want[0], abs=0.01), (rendered.sheet, page.number)
        assert float(box.height) == pytest.approx(want[1], abs=0.01), (rendered.sheet, page.number)


def test_page_count_and_numbers(rendered):
    """Page count = layout; each page says 'k of N' (the template's
    page.number in English)."""
    n = len(rendered.pages)
    assert len(rendered.reader.pages) == n
    assert [p.number for p in rendered.pages] == list(range(1, n + 1))
    for k, pdf_page in enumerate(rendered.reader.pages, start=1):
        assert f"{k} of {n}" in pdf_page.extract_text(), (rendered.sheet, k)


# -- fonts: all embedded, none of the standard 14 ----------------------------------

def _fonts_of(resources, seen):
    resources = resources.get_object() if resources is not None else {}
    for ref in resources.get("/Font", {}).values():
        font = ref.get_object()
        yield font
        for d in font.get("/DescendantFonts", []):
            yield d.get_object()
    for ref in resources.get("/XObject", {}).values():
        xo = ref.get_object()
        if id(xo) not in seen and xo.get("/Subtype") == "/Form":
            seen.add(id(xo))
            yield from _fonts_of(xo.get("/Resources"), seen)


def test_every_font_is_embedded_and_not_standard_14(rendered):
    """PDF 32000-1:2008, 9.8 and 9.9: an embedded TrueType program is the
    descriptor's FontFile2, a CFF/OpenType one FontFile3; for a Type0 font the
    program hangs off its descendant CIDFont.  9.6.2.2: standard-14 fonts
    need not be embedded, so none may appear at all."""
    count = 0
    for pdf_page in rendered.reader.pages:
        for font in _fonts_of(pdf_page.get("/Resources"), set()):
            count += 1
            base = str(font.get("/BaseFont", "")).lstrip("/")
            assert base.split("+", 1)[-1] not in STANDARD_14, base
            if font.get("/Subtype") == "/Type0":
                continue  # checked through its descendant
            assert font.get("/Subtype") != "/Type3", base
            desc = font["/FontDescriptor"].get_object()
            assert "/FontFile2" in desc or "/FontFile3" in desc, base
    assert count > 0


def test_vector_only_no_images(rendered):
    """No image XObjects anywhere (PDF 32000-1:2008, 8.9.5)."""
    for pdf_page in rendered.reader.pages:
        xobjects = pdf_page.get("/Resources", {}).get("/XObject", {})
        assert all(x.get_object().get("/Subtype") != "/Image" for x in xobjects.values())


# -- instructions and page furniture -------------------------------------------------

def test_instructions_page_holds_cautions_and_print_plan(rendered):
    """Page 1: the cautions the project's rules require, and which pages
    go on card and which on film."""
    text = _flat(rendered.reader.pages[0].extract_text())
    assert rendered.pages[0].kind == "instructions"
    for needed in ("Never look at the Sun, through the sights or otherwise.",
                   "Use blades and pins only with an adult's supervision.",
                   "Follow your school's local rules.",
                   "brass paper fastener"):
        assert needed in text
    card = ", ".join(str(p.number) for p in rendered.pages if p.kind == "card")
    film = ", ".join(str(p.number) for p in rendered.pages if p.kind == "film")
    assert f"pages {card} on card" in text
    assert f"page {film} on transparency film" in text


def test_material_note_and_titles_on_part_pages(rendered):
    for pdf_page, page in zip(rendered.reader.pages, rendered.pages):
        text = _flat(pdf_page.extract_text())
        assert "Larkspur Valley Astronomy Club" in text
        if page.kind == "card":
            assert "Print this page on card" in text
        if page.kind == "film":
            assert "Print this page on transparency film" in text
        for placed in page.placements:
            assert placed.part.title in text


# -- the 100 mm check bar -------------------------------------------------------------

def _stroked_segments(pdf_page, reader):
    """Every straight stroked piece (x0, y0, x1, y1) in default user space
    (points), following q/Q/cm as PDF 32000-1:2008, 8.4.4 and 8.3.4 define."""
    ctm = [1.0, 0.0, 0.0, 1.0, 0.0, 0.0]
    stack, path, out = [], [], []
    current = None

    def apply(m, x, y):
        a, b, c, d, e, f = m
        return (a * x + c * y + e, b * x + d * y + f)

    def mul(m, n):  # m then n (m x n, row-vector convention of the PDF spec)
        a, b, c, d, e, f = m
        A, B, C, D, E, F = n
        return [a * A + b * C, a * B + b * D, c * A + d * C, c * B + d * D,
                e * A + f * C + E, e * B + f * D + F]

    for operands, op in ContentStream(pdf_page.get_contents(), reader).operations:
        op = op.decode() if isinstance(op, bytes) else op
        if op == "q":
            stack.append(list(ctm))
        elif op == "Q":
            ctm = stack.pop()
        elif op == "cm":
            ctm = mul([float(v) for v in operands], ctm)
        elif op == "m":
            current = apply(ctm, float(operands[0]), float(operands[1]))
        elif op == "l":
            p = apply(ctm, float(operands[0]), float(operands[1]))
            path.append((*current, *p))
            current = p
        elif op in ("S", "s", "B", "b", "f", "F", "n", "B*", "b*", "f*"):
            if op in ("S", "s", "B", "b", "B*", "b*"):
                out += path
            path = []
    return out


def test_check_bar_geometry_is_100_mm(rendered):
    """The bar the layout defines is 100.0 mm long."""
    for page in rendered.pages:
        (x0, y0), (x1, y1) = check_bar_mm(page)
        assert math.hypot(x1 - x0, y1 - y0) == pytest.approx(100.0, abs=1e-9)
        assert y0 == y1
        assert x0 >= page.sheet.margin_mm and x1 <= page.width_mm - page.sheet.margin_mm


def test_check_bar_drawn_283_46_pt_with_end_ticks(rendered):
    """Each page's content stream strokes a horizontal line 100 mm =
    283.46 pt long (1 in = 25.4 mm = 72 pt) at the bar's place, with a
    vertical tick through each end."""
    for pdf_page, page in zip(rendered.reader.pages, rendered.pages):
        segs = _stroked_segments(pdf_page, rendered.reader)
        (bx0, by0), (bx1, _) = check_bar_mm(page)
        bars = [s for s in segs if abs(s[1] - s[3]) < 1e-3 and abs(abs(s[2] - s[0]) - 283.46) < 0.01]
        assert bars, page.number
        bar = next(s for s in bars if abs(min(s[0], s[2]) - bx0 * PT_PER_MM) < 0.01)
        assert bar[1] == pytest.approx(by0 * PT_PER_MM, abs=0.01)
        assert max(bar[0], bar[2]) == pytest.approx(bx1 * PT_PER_MM, abs=0.01)
        for x_end in (bar[0], bar[2]):
            ticks = [s for s in segs if abs(s[0] - x_end) < 0.01 and abs(s[2] - x_end) < 0.01
                     and min(s[1], s[3]) < bar[1] < max(s[1], s[3])]
            assert ticks, (page.number, x_end)


def test_line_widths_stay_legible(rendered):
    """Every line width set is at least 0.1 mm = 0.283 pt (common practice
    for office printers and film; see kitgen.geometry.style)."""
    for pdf_page in rendered.reader.pages:
        widths = [float(ops[0]) for ops, op in ContentStream(pdf_page.get_contents(), rendered.reader).operations
                  if op == b"w"]
        assert widths
        assert min(widths) >= 0.1 * PT_PER_MM - 1e-3


# -- layout -----------------------------------------------------------------------------

#: The margin every page keeps clear (the brief's 10 mm; common practice:
#: office printers leave 3-5 mm of the edge unprinted).
MARGIN_MM = 10.0


def test_layout_places_every_part_once_inside_the_margins(rendered):
    """Every part once; film pages hold film parts only; no part (nor its
    title band) crosses the 10 mm margins or the footer band, and no two
    parts' boxes overlap."""
    placed = [pl.part.kind for page in rendered.pages for pl in page.placements]
    assert sorted(placed) == sorted(p.kind for p in rendered.kit.parts)
    assert rendered.pages[0].kind == "instructions"
    assert all(not p.placements for p in rendered.pages if p.kind == "instructions")
    for page in (p for p in rendered.pages if p.kind != "instructions"):
        assert page.placements
        assert {pl.part.material for pl in page.placements} == {page.kind}
        boxes = [pl.box_mm for pl in page.placements]
        for x0, y0, x1, y1 in boxes:
            assert MARGIN_MM <= x0 and x1 <= page.width_mm - MARGIN_MM
            assert MARGIN_MM + FOOTER_MM <= y0 and y1 + TITLE_BAND_MM <= page.height_mm - MARGIN_MM
        for i, a in enumerate(boxes):
            for b in boxes[i + 1:]:
                assert a[2] <= b[0] or b[2] <= a[0] or a[3] <= b[1] or b[3] <= a[1], page.number
    kinds = [p.kind for p in rendered.pages]
    assert kinds.index("film") > max(i for i, k in enumerate(kinds) if k == "card")


def _text_origins(pdf_page):
    """(string, x_pt, y_pt) of every piece of text, in default user space."""
    out = []

    def visit(text, cm, tm, font, size):
        if text.strip():
            a, b, c, d, e, f = cm
            x, y = tm[4], tm[5]
            out.append((text.strip(), a * x + c * y + e, b * x + d * y + f))

    pdf_page.extract_text(visitor_text=visit)
    return out


def test_footer_text_stays_in_its_band_and_part_text_above_it(rendered):
    """The page number, the check-bar note, the material note and the kit
    line start inside the margins and the footer band; every other string
    (parts, titles, instructions) starts above the band."""
    n = len(rendered.pages)
    band_top_pt = (MARGIN_MM + FOOTER_MM) * PT_PER_MM
    for pdf_page, page in zip(rendered.reader.pages, rendered.pages):
        only_footer = {f"{page.number} of {n}", "Print this page on card", "Print this page on transparency film"}
        in_band = []
        for string, x, y in _text_origins(pdf_page):
            assert MARGIN_MM * PT_PER_MM - 0.01 <= x <= (page.width_mm - MARGIN_MM) * PT_PER_MM, string
            if y < band_top_pt:
                assert y >= MARGIN_MM * PT_PER_MM - 3.0, string  # a descender may dip 1 mm
                in_band.append(string)
            else:
                assert string not in only_footer and not string.startswith("Before cutting"), (page.number, string)
        assert f"{page.number} of {n}" in in_band
        assert any(s.startswith("Before cutting") for s in in_band)
        assert any(s.startswith("Larkspur Valley Astronomy Club") for s in in_band)
        if page.kind != "instructions":
            assert any(s.startswith("Print this page on") for s in in_band)
            assert len(in_band) == 4, in_band


def test_turned_parts_keep_their_size(a4):
    """A turned part is turned by a quarter turn about its pin: its box is
    the part's bounds with width and height swapped."""
    for page in a4.pages:
        for pl in page.placements:
            x0, y0, x1, y1 = pl.box_mm
            if pl.rotation_deg % 180 == 90:
                assert (x1 - x0, y1 - y0) == pytest.approx((pl.part.height_mm, pl.part.width_mm))
            else:
                assert (x1 - x0, y1 - y0) == pytest.approx((pl.part.width_mm, pl.part.height_mm))


# -- determinism ------------------------------------------------------------------------

def test_same_input_same_bytes(a4):
    """Rendering again, in this process and in a fresh one, gives the same bytes."""
    assert render_pdf(a4.kit, a4.pages) == a4.pdf
    assert build_pdf(a4.kit)[1] == a4.pdf
    code = ("import sys; from kitgen.kit import build_kit;"
            "from kitgen.recipe.load import parse_recipe_text; from kitgen.render.pdf import build_pdf;"
            f"k = build_kit(parse_recipe_text({RECIPE.format(sheet='a4')!r}));"
            "sys.stdout.buffer.write(build_pdf(k)[1])")
    fresh = subprocess.run([sys.executable, "-c", code], check=True, capture_output=True, timeout=120).stdout
    assert fresh == a4.pdf


def test_no_word_printed_upside_down(rendered):
    """Turning a long part must not leave its words upside down: every
    text's direction on the page is within a quarter turn of upright."""
    for page in rendered.pages:
        for pl in page.placements:
            for el in pl.part.elements:
                if el.shape == "text":
                    a = (el.geom["angle_deg"] + pl.rotation_deg + 180.0) % 360.0 - 180.0
                    assert -90.0 - 1e-6 <= a <= 90.0 + 1e-6, (pl.part.kind, el.role, a)

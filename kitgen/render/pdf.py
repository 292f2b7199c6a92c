"""The PDF renderer: the laid-out pages, drawn with reportlab, vector only.

Every element of every placed part is drawn as the geometry model says
(mm, counter-clockwise angles, text centred vertically on its point); the
page furniture (check bar, page number, kit title, material note, part
titles) and the instructions page come from the language template.  Only
the DejaVu fonts shipped in ``kitgen/fonts`` are used, and all of them are
embedded (as subsets); no standard-14 font is referenced, so the print
looks the same on every reader.  The canvas is made with ``invariant=1``,
which fixes the creation date and document id: the same kit and pages give
the same bytes.
"""

from __future__ import annotations

import io
from importlib import resources
from xml.sax.saxutils import escape

from reportlab.lib.styles import ParagraphStyle
from reportlab.lib.units import mm
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont
from reportlab.pdfgen.canvas import Canvas
from reportlab.platypus import Frame, Paragraph

from ..layout.pages import (CHECK_BAR_MM, FOOTER_MM, TITLE_PT, Page, check_bar_mm, content_area_mm)
from ..parts.format import latitude_text
from . import style

FONT = "KitSans"
FONT_BOLD = "KitSans-Bold"
FONT_CONDENSED = "KitSansCondensed"
_FONT_FILES = {FONT: "DejaVuSans.ttf", FONT_BOLD: "DejaVuSans-Bold.ttf", FONT_CONDENSED: "DejaVuSansCondensed.ttf"}

#: Text roles set in bold on the parts.
_BOLD_ROLES = {"title"}

#: Sizes (pt) of the page furniture.
FOOTER_PT = 7.0
PAGE_NUMBER_PT = 9.0
NOTE_PT = 9.0
MIN_FURNITURE_PT = 5.0


def register_fonts() -> None:
    """Register the shipped TTF fonts with reportlab (once per process)."""
    registered = set(pdfmetrics.getRegisteredFontNames())
    folder = resources.files("kitgen").joinpath("fonts")
    for name, filename in _FONT_FILES.items():
        if name not in registered:
            with resources.as_file(folder.joinpath(filename)) as path:
                pdfmetrics.registerFont(TTFont(name, str(path)))
    pdfmetrics.registerFontFamily(FONT, normal=FONT, bold=FONT_BOLD, italic=FONT, boldItalic=FONT_BOLD)


def kit_title(kit) -> str:
    return kit.recipe.title or kit.words("kit.default_title")


# -- parts ---------------------------------------------------------------------

class _Pen:
    """Sets the canvas's line style for a stroke class, only when it changes
    (a part has thousands of elements in a few classes)."""

    def __init__(self, c: Canvas, dims):
        self.c, self.dims, self.current = c, dims, None

    def use(self, stroke: str) -> None:
        if stroke == self.current:
            return
        st = style.stroke_style(stroke, self.dims)
        self.c.setLineWidth(st.width_mm * mm)
        self.c.setStrokeGray(st.grey)
        self.c.setDash([d * mm for d in st.dash_mm] if st.dash_mm else [], 0)
        self.current = stroke


def _text(c: Canvas, x_mm, y_mm, string, size_pt, font, anchor="middle", angle_deg=0.0) -> None:
    """Text whose line is centred vertically on (x, y): the baseline sits
    half the font's ascent-plus-descent below the point."""
    ascent, descent = pdfmetrics.getAscentDescent(font, size_pt)
    c.saveState()
    c.translate(x_mm * mm, y_mm * mm)
    if angle_deg:
        c.rotate(angle_deg)
    c.setFont(font, size_pt)
    c.setFillGray(0.0)
    base = -(ascent + descent) / 2.0
    if anchor == "start":
        c.drawString(0, base, string)
    elif anchor == "end":
        c.drawRightString(0, base, string)
    else:
        c.drawCentredString(0, base, string)
    c.restoreState()


def _point(c: Canvas, pen: _Pen, el) -> None:
    dims = pen.dims
    x, y = (v * mm for v in el.geom["at"])
    c.setFillGray(0.0)
    if el.role == "pin":
        pen.use("medium")
        c.circle(x, y, style.pin_hole_radius_mm(dims) * mm, stroke=1, fill=0)
        h = style.pin_cross_half_mm(dims) * mm
        c.line(x - h, y, x + h, y)
        c.line(x, y - h, x, y + h)
    elif el.role == "star":
        c.circle(x, y, style.star_radius_mm(el.values.get("mag", 2.0), dims) * mm, stroke=0, fill=1)
    else:
        c.circle(x, y, style.dot_radius_mm(dims) * mm, stroke=0, fill=1)


def draw_element(c: Canvas, pen: _Pen, el) -> None:
    """One element, in the part's frame (the canvas is at the part's pin)."""
    g = el.geom
    if el.shape == "text":
        font = FONT_BOLD if el.role in _BOLD_ROLES else FONT_CONDENSED
        _text(c, g["at"][0], g["at"][1], g["text"], g["size_pt"], font, g["anchor"], g["angle_deg"])
        return
    if el.shape == "point":
        _point(c, pen, el)
        return
    if el.stroke == "none":
        return
    pen.use(el.stroke)
    if el.shape == "circle":
        cx, cy = g["center"]
        c.circle(cx * mm, cy * mm, g["radius"] * mm, stroke=1, fill=0)
    elif el.shape == "arc":
        cx, cy = g["center"]
        r = g["radius"]
        p = c.beginPath()
        p.arc((cx - r) * mm, (cy - r) * mm, (cx + r) * mm, (cy + r) * mm,
              startAng=g["start_deg"], extent=g["end_deg"] - g["start_deg"])
        c.drawPath(p, stroke=1, fill=0)
    elif el.shape == "segment":
        (x0, y0), (x1, y1) = g["from"], g["to"]
        c.line(x0 * mm, y0 * mm, x1 * mm, y1 * mm)
    elif el.shape == "polyline":
        pts = g["points"]
        p = c.beginPath()
        p.moveTo(pts[0][0] * mm, pts[0][1] * mm)
        for x, y in pts[1:]:
            p.lineTo(x * mm, y * mm)
        if g["closed"]:
            p.close()
        c.drawPath(p, stroke=1, fill=0)


def _draw_placement(c: Canvas, placement, dims) -> None:
    c.saveState()
    c.translate(placement.x_mm * mm, placement.y_mm * mm)
    if placement.rotation_deg:
        c.rotate(placement.rotation_deg)
    c.setLineCap(0)
    c.setLineJoin(1)
    pen = _Pen(c, dims)
    for el in placement.part.elements:
        draw_element(c, pen, el)
    c.restoreState()
    if placement.part.title:
        x, y = placement.title_at_mm
        c.setFont(FONT_BOLD, TITLE_PT)
        c.setFillGray(0.0)
        c.drawString(x * mm, y * mm, placement.part.title)


# -- page furniture ------------------------------------------------------------

def _fitted_pt(string: str, font: str, size_pt: float, width_mm: float) -> float:
    """The size, at most ``size_pt``, at which ``string`` fits ``width_mm``."""
    w_pt = pdfmetrics.stringWidth(string, font, size_pt)
    if w_pt <= width_mm * mm:
        return size_pt
    return max(MIN_FURNITURE_PT, size_pt * width_mm * mm / w_pt)


def draw_check_bar(c: Canvas, page: Page) -> None:
    """The check bar: a line exactly CHECK_BAR_MM long with a tick at each
    end, butt caps so the ink ends where the line ends."""
    (x0, y0), (x1, y1) = check_bar_mm(page)
    tick = 1.5
    c.saveState()
    c.setLineCap(0)
    c.setDash([], 0)
    c.setStrokeGray(0.0)
    c.setLineWidth(0.3 * mm)
    c.line(x0 * mm, y0 * mm, x1 * mm, y1 * mm)
    for x in (x0, x1):
        c.line(x * mm, (y0 - tick) * mm, x * mm, (y0 + tick) * mm)
    c.restoreState()


def _footer(c: Canvas, kit, page: Page) -> None:
    w = kit.words
    m = page.sheet.margin_mm
    right = page.width_mm - m
    usable = page.width_mm - 2 * m
    draw_check_bar(c, page)
    (_, bar_y), _ = check_bar_mm(page)

    number = w("page.number", k=page.number, n=page.total)
    c.setFillGray(0.0)
    c.setFont(FONT_BOLD, PAGE_NUMBER_PT)
    c.drawRightString(right * mm, (bar_y - 1.0) * mm, number)

    bar_note = w("page.check_bar", length=w.number(CHECK_BAR_MM))
    size = _fitted_pt(bar_note, FONT, FOOTER_PT, usable)
    c.setFont(FONT, size)
    c.drawString(m * mm, (bar_y + 3.0) * mm, bar_note)

    note = ""
    if page.kind == "card":
        note = w("page.on_card")
    elif page.kind == "film":
        note = w("page.on_film")
    note_w_mm = 0.0
    if note:
        c.setFont(FONT_BOLD, NOTE_PT)
        c.drawRightString(right * mm, (m + FOOTER_MM - 3.0) * mm, note)
        note_w_mm = pdfmetrics.stringWidth(note, FONT_BOLD, NOTE_PT) / mm + 5.0
    line = w("page.kit_line", title=kit_title(kit), latitude=latitude_text(w, kit.recipe.latitude_deg),
             year=kit.recipe.epoch)
    size = _fitted_pt(line, FONT, 8.0, usable - note_w_mm)
    c.setFont(FONT, size)
    c.drawString(m * mm, (m + FOOTER_MM - 3.0) * mm, line)


# -- the instructions page ------------------------------------------------------

def _page_list(words, pages, kind) -> tuple[int, str]:
    numbers = [str(p.number) for p in pages if p.kind == kind]
    return len(numbers), words("page.list_separator").join(numbers)


def _story(kit, pages, size_pt: float) -> list:
    w = kit.words
    lead = size_pt * 1.25
    body = ParagraphStyle("body", fontName=FONT, fontSize=size_pt, leading=lead, spaceAfter=size_pt * 0.3)
    item = ParagraphStyle("item", parent=body, leftIndent=size_pt * 1.8, bulletIndent=size_pt * 0.4,
                          bulletFontName=FONT_BOLD, spaceAfter=size_pt * 0.15)
    head = ParagraphStyle("head", parent=body, fontName=FONT_BOLD, fontSize=size_pt * 1.2,
                          leading=size_pt * 1.5, spaceBefore=size_pt * 0.7, spaceAfter=size_pt * 0.2)
    title = ParagraphStyle("title", parent=body, fontName=FONT_BOLD, fontSize=size_pt * 1.8,
                           leading=size_pt * 2.2, spaceAfter=size_pt * 0.4)
    caution = ParagraphStyle("caution", parent=item, fontName=FONT_BOLD)
    length = w.number(CHECK_BAR_MM)

    def para(s, st=body, bullet=None):
        return Paragraph(escape(s), st, bulletText=bullet)

    out = [para(w("instructions.title"), title),
           para(w("page.kit_line", title=kit_title(kit), latitude=latitude_text(w, kit.recipe.latitude_deg),
                  year=kit.recipe.epoch)),
           para(w("instructions.cautions_heading"), head)]
    out += [para(s, caution, "!") for s in w.items("instructions.cautions")]
    out.append(para(w("instructions.print_heading"), head))
    for kind, key in (("card", "instructions.print_card"), ("film", "instructions.print_film")):
        n, listed = _page_list(w, pages, kind)
        if n:
            out.append(para(w(key + ("_one" if n == 1 else "_many"), pages=listed), item, "\u2022"))
    out.append(para(w("instructions.print_scale", length=length), item, "\u2022"))
    out += [para(w("instructions.cut_heading"), head), para(w("instructions.cut"))]
    out += [para(w("instructions.stack_heading"), head), para(w("instructions.stack_intro"))]
    out += [para(s, item, f"{k}.") for k, s in enumerate(w.items("instructions.stack"), start=1)]
    out.append(para(w("instructions.fastener")))
    out.append(para(w("instructions.time_heading"), head))
    out += [para(s, item, f"{k}.") for k, s in enumerate(w.items("instructions.time_steps"), start=1)]
    out.append(para(w("instructions.time_note")))
    out.append(para(w("instructions.height_heading"), head))
    out += [para(s, item, f"{k}.") for k, s in enumerate(w.items("instructions.height_steps"), start=1)]
    return out


def _story_height_pt(story, width_pt: float) -> float:
    total = 0.0
    for k, f in enumerate(story):
        _, h = f.wrap(width_pt, 1e6)
        total += h + f.getSpaceAfter() + (f.getSpaceBefore() if k else 0.0)
    return total


def _instructions(c: Canvas, kit, page: Page, pages) -> None:
    x0, y0, x1, y1 = content_area_mm(page.sheet, page.landscape)
    width, height = (x1 - x0) * mm, (y1 - y0) * mm
    size = 10.5
    story = _story(kit, pages, size)
    while size > 6.0 and _story_height_pt(story, width) > height:
        size -= 0.5
        story = _story(kit, pages, size)
    frame = Frame(x0 * mm, y0 * mm, width, height, leftPadding=0, rightPadding=0, topPadding=0,
                  bottomPadding=0, showBoundary=0)
    frame.addFromList(story, c)
    if story:
        raise ValueError("the instructions do not fit on one page")


# -- the document ----------------------------------------------------------------

def render_pdf(kit, pages) -> bytes:
    """The kit's pages as one PDF document (bytes)."""
    register_fonts()
    buf = io.BytesIO()
    first = pages[0]
    c = Canvas(buf, pagesize=(first.width_mm * mm, first.height_mm * mm), invariant=1, pageCompression=1,
               initialFontName=FONT, initialFontSize=10, lang=kit.words.language)
    c.setTitle(kit_title(kit))
    c.setSubject(latitude_text(kit.words, kit.recipe.latitude_deg))
    c.setAuthor("")
    c.setCreator("kitgen")
    for page in pages:
        c.setPageSize((page.width_mm * mm, page.height_mm * mm))
        if page.kind == "instructions":
            _instructions(c, kit, page, pages)
        for placement in page.placements:
            _draw_placement(c, placement, kit.dims)
        _footer(c, kit, page)
        c.showPage()
    c.save()
    return buf.getvalue()

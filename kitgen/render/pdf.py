"""The PDF renderer: the laid-out pages, drawn with reportlab, vector only.

Every element of every placed part is drawn as the geometry model says
(mm, counter-clockwise angles, text centred vertically on its point); the
page furniture (check bar, page number, kit title, material note, part
titles) and the instructions page come from the language template.  All
text is drawn by :mod:`kitgen.render.pdf_text` (fonts, shaping, direction)
with the fonts shipped in ``kitgen/fonts`` only, all embedded (as
subsets); no standard-14 font is referenced, so the print looks the same
on every reader.  The canvas is made with ``invariant=1``,
which fixes the creation date and document id: the same kit and pages give
the same bytes.
"""

from __future__ import annotations

import io

from reportlab.lib.rl_accel import fp_str
from reportlab.lib.units import mm
from reportlab.pdfgen.canvas import Canvas
from reportlab.pdfgen.pdfgeom import bezierArc

from ..geometry import style
from ..kept import kept_for
from ..layout.bounds import element_box_mm, meets, turn_box
from ..layout.instructions import kit_latitudes, kit_line, kit_title
from ..layout.pages import TITLE_PT, Page, check_bar_mm, layout_kit, shared_pages
from ..layout.paragraphs import wrap
from ..paper import CHECK_BAR_MM, FOOTER_MM
from . import pdf_marks, pdf_owner, pdf_text
from .ink import Holes, holes_of, inks
from .pdf_canvas import new_canvas, pt_texts

FONT = "KitSans"

#: Text roles set in bold on the parts.
_BOLD_ROLES = {"title", "caution"}

#: Sizes (pt) of the page furniture.
FOOTER_PT = 7.0
PAGE_NUMBER_PT = 9.0
NOTE_PT = 9.0
#: The least size of the stock's note ("Print this page on film"), where
#: a long kit line shares its row, and the gap between them (mm).
MIN_NOTE_PT = 7.0
NOTE_GAP_MM = 5.0
#: The size of the kit's line in the footer, where it has the room.
LINE_PT = 8.0
MIN_FURNITURE_PT = 5.0
#: The check bar's note goes onto two rows of TWO_ROWS_PT, ROW_MM apart,
#: where one row would need type smaller than TWO_ROWS_BELOW_PT; the two
#: rows fit between the bar and the kit's line in the footer band.
TWO_ROWS_BELOW_PT = 6.0
TWO_ROWS_PT = 6.0
ROW_MM = 2.4


def ask_actual_size(c: Canvas) -> None:
    """Ask viewers to print at actual size: the catalog's
    ``/ViewerPreferences`` with ``/PrintScaling /None`` (ISO 32000-1:2008,
    12.2, table 150), so a print dialog does not start at "fit to page"
    and shrink every scale."""
    c.setViewerPreference("PrintScaling", "None")


def register_fonts() -> None:
    """Register the shipped TTF fonts with reportlab (once per process)."""
    pdf_text.register_fonts()


# -- parts ---------------------------------------------------------------------

class _Pen:
    """Sets the canvas's line style for a stroke class (and, in a colour
    kit, the role's accent), only when it changes (a part has thousands of
    elements in a few classes).  Each class's width and dash, and each
    class and role's colour, are looked up once per pen."""

    def __init__(self, c: Canvas, dims, words=None, colour: bool = False):
        self.c, self.dims, self.current, self.words, self.colour = c, dims, None, words, colour
        self.states: dict[tuple[str, str], tuple] = {}
        self.lines: dict[str, tuple[float, str]] = {}

    def use(self, stroke: str, role: str = "") -> None:
        state = self.states.get((stroke, role))
        if state is None:
            state = self.states[(stroke, role)] = (stroke, style.line_colour(stroke, role, self.colour))
        current = self.current
        if state == current:
            return
        if current is None or stroke != current[0]:
            width_pt, dash = self.lines.get(stroke) or self._line(stroke)
            self.c.setLineWidth(width_pt)
            self.c.addLiteral(dash)
        ink = state[1]
        if current is None or ink != current[1]:
            if ink[0] == "rgb":
                self.c.setStrokeColorRGB(*ink[1])
            else:
                self.c.setStrokeGray(ink[1])
        self.current = state

    def _line(self, stroke: str) -> tuple[float, str]:
        """A class's width (pt) and its dash operator, as the canvas's
        ``setDash`` writes it."""
        st = style.stroke_style(stroke, self.dims)
        dash_pt = [d * mm for d in st.dash_mm] if st.dash_mm else []
        line = self.lines[stroke] = (st.width_mm * mm, "[%s] %s d" % (fp_str(dash_pt), 0))
        return line


def _text(c: Canvas, x_mm, y_mm, string, size_pt, words, text_style, anchor="middle", angle_deg=0.0) -> None:
    """Text whose line is centred vertically on (x, y) (see pdf_text.draw_text)."""
    pdf_text.draw_text(c, x_mm, y_mm, string, size_pt, words, text_style, anchor, angle_deg)


def draw_ink(c: Canvas, pen: _Pen, ink) -> None:
    """A text ink (kitgen.render.ink), in the part's frame (the canvas is
    at the part's pin); lines and dots are written as kept operators
    (:func:`draw_elements`)."""
    g = ink.geom
    text_style = "bold" if ink.role in _BOLD_ROLES else "label"
    _text(c, g["at"][0], g["at"][1], g["text"], g["size_pt"], pen.words, text_style, g["anchor"], g["angle_deg"])


def draw_elements(c: Canvas, pen: _Pen, elements, holes: Holes = Holes(), part_id: str = "") -> None:
    """Elements, each as its inks (none for a line thinned away).  A
    line's or dot's PDF operators are kept with the element
    (:func:`_drawn`), so the parts a class set's kits share (#12) are
    turned into operators once, and with a whole part's elements
    (``part_id``) for the next kit's part of that id
    (:func:`_part_drawn`); the pen is asked for a line's style only when
    the style differs from the last line's."""
    add = c._code.append
    last = None
    drawn_elements = _part_drawn(part_id, elements, pen.dims, holes) if part_id else _drawn(elements, pen.dims, holes)
    for drawn in drawn_elements:
        for style_key, code, ink in drawn:
            if code is None:
                draw_ink(c, pen, ink)
                continue
            if style_key is None:
                c.setFillGray(0.0)
            elif style_key is not last:
                pen.use(*style_key)
                last = style_key
            add(code)


#: Each drawn element's inks with their operators, per hole sizes and
#: line weights, by the element's identity:
#: ``(holes, id(dims)) -> (dims, {id: (element, ((style key, code, ink), ...))})``
#: (:func:`_made`).
_DRAWN: dict[tuple, tuple] = {}
#: The most elements kept (a few kits' worth; then the store starts afresh).
_DRAWN_MOST = 12_000


def _drawn(elements, dims, holes: Holes) -> list[tuple]:
    """Each element's inks with their operators (:func:`_made`), those
    not kept yet made together."""
    store = _DRAWN.get((holes, id(dims)))
    if store is None or store[0] is not dims:
        store = _DRAWN[(holes, id(dims))] = (dims, {})
    kept = store[1]
    out, missing = [], []
    for el in elements:
        got = kept.get(id(el))
        if got is None or got[0] is not el:
            got = (el, ())
            missing.append(len(out))
        out.append(got[1])
    if missing:
        if sum(len(s[1]) for s in _DRAWN.values()) + len(missing) > _DRAWN_MOST:
            _DRAWN.clear()
            _DRAWN[(holes, id(dims))] = (dims, kept)
            kept.clear()
        made = _made([elements[i] for i in missing], dims, holes)
        for i, drawn in zip(missing, made):
            out[i] = drawn
            kept[id(elements[i])] = (elements[i], drawn)
    return out


#: The last drawn elements of each part, by its id and the hole sizes:
#: ``(elements, their inks with operators, indices of the points)``.
_PARTS: dict[tuple, tuple] = {}
_PARTS_MOST = 32


def _part_drawn(part_id: str, elements, dims, holes: Holes) -> list[tuple]:
    """:func:`_drawn` of a whole part's elements, or those kept for the
    last part of that id where the two are equal element for element and
    each point gives the same inks with these line weights (a point's
    inks are the only ones that depend on them): a school's mater, rule
    and alidade at another latitude are the same but for being made
    again (#12).  A kept text element draws as the equal new one would:
    the same string, place, size and turn."""
    kept = _PARTS.get((part_id, holes))
    if kept is not None and kept[0] == elements and all(
            tuple(ink for _, _, ink in kept[1][i]) == inks(elements[i], dims, holes) for i in kept[2]):
        return kept[1]
    drawn = _drawn(elements, dims, holes)
    if len(_PARTS) >= _PARTS_MOST:
        _PARTS.clear()
    _PARTS[(part_id, holes)] = (elements, drawn, [i for i, el in enumerate(elements) if el.shape == "point"])
    return drawn


#: The style keys of :func:`_made`, one object per (stroke, role), so that
#: :func:`draw_elements` can tell a change of style by identity.
_STYLE_KEYS: dict[tuple[str, str], tuple[str, str]] = {}


def _made(elements, dims, holes: Holes) -> list[tuple]:
    """Each element's inks, each as ``(style key, code, ink)``: a line's
    ``(stroke, role)`` key and operators, a dot's None key and operators,
    text's None code (text is drawn through the fonts each time).  A line
    element is its own ink (:func:`kitgen.render.ink.inks` makes an ink
    of the same shape, geometry, stroke and role), so only points are
    turned into inks; every number is written in one pass
    (:func:`kitgen.render.pdf_canvas.pt_texts`)."""
    keys = _STYLE_KEYS
    each, numbers, counts = [], [], []
    for el in elements:
        shape = el.shape
        if shape == "text":
            el_inks = (el,)
        elif el.stroke == "none":
            el_inks = ()
        elif shape == "segment":
            g = el.geom
            (x0, y0), (x1, y1) = g["from"], g["to"]
            numbers += (x0 * mm, y0 * mm, x1 * mm, y1 * mm)
            each.append((el,))
            continue
        else:
            el_inks = inks(el, dims, holes) if shape == "point" else (el,)
            for ink in el_inks:
                ink_numbers = _ink_numbers_pt(ink)
                numbers += ink_numbers
                if ink.shape != "segment":
                    counts.append(len(ink_numbers))
        each.append(el_inks)
    texts = pt_texts(numbers)
    out, k, count_of = [], 0, iter(counts)
    for el_inks in each:
        drawn = []
        for ink in el_inks:
            shape = ink.shape
            if shape == "text":
                drawn.append((None, None, ink))
                continue
            if shape == "segment":
                code = "n %s %s m %s %s l S" % (texts[k], texts[k + 1], texts[k + 2], texts[k + 3])
                k += 4
            else:
                count = next(count_of)
                code = _ink_operators(ink, texts[k:k + count])
                k += count
            if shape == "dot":
                drawn.append((None, code, ink))
            else:
                key = (ink.stroke, ink.role)
                drawn.append((keys.setdefault(key, key), code, ink))
        out.append(tuple(drawn))
    return out


def _ink_numbers_pt(ink) -> list[float]:
    """The numbers (pt) of a line's or dot's path, in the order its
    operators write them (none for text)."""
    shape, g = ink.shape, ink.geom
    if shape == "segment":
        (x0, y0), (x1, y1) = g["from"], g["to"]
        return [x0 * mm, y0 * mm, x1 * mm, y1 * mm]
    if shape == "polyline":
        return [n * mm for point in g["points"] for n in point]
    if shape in ("dot", "circle"):
        (cx, cy), r = g["center"], g["radius"]
        x, y, d = (cx - r) * mm, (cy - r) * mm, 2 * r * mm
        return _arc_numbers(x, y, x + d, y + d, 0, 360)
    if shape == "arc":
        (cx, cy), r = g["center"], g["radius"]
        return _arc_numbers((cx - r) * mm, (cy - r) * mm, (cx + r) * mm, (cy + r) * mm,
                            g["start_deg"], g["end_deg"] - g["start_deg"])
    return []


def _arc_numbers(x0_pt: float, y0_pt: float, x1_pt: float, y1_pt: float, start_deg: float, extent_deg: float) -> list:
    """The start and the Bézier curves' points of reportlab's arc through
    the box (:func:`reportlab.pdfgen.pdfgeom.bezierArc`), in a row."""
    curves = bezierArc(x0_pt, y0_pt, x1_pt, y1_pt, start_deg, extent_deg)
    return [curves[0][0], curves[0][1], *(n for curve in curves for n in curve[2:])]


def _ink_operators(ink, texts: list[str]) -> str | None:
    """The PDF path operators of a line or dot ink, its numbers
    (:func:`_ink_numbers_pt`) written to the thousandth of a point
    (``texts``, :func:`kitgen.render.pdf_canvas.pt_text`): the bytes the
    canvas's ``circle``, ``line`` and ``drawPath`` would write (the canvas
    joins its operators with newlines, a path object its own with spaces,
    and fills even-odd unless told otherwise), written here rather than
    through reportlab's path objects and then rewritten (#12); None for
    text, which is drawn through the fonts each time."""
    shape = ink.shape
    if shape == "segment":
        return "n %s %s m %s %s l S" % tuple(texts)
    if shape == "polyline":
        return _path(texts, "l", ink.geom["closed"]) + "\nS"
    if shape == "arc":
        return _path(texts, "c") + "\nS"
    if shape in ("dot", "circle"):
        # The canvas's ellipse writes each operator on a line of its own.
        code = _path(texts, "c").replace(" m ", " m\n").replace(" c ", " c\n").replace("n ", "n\n", 1)
        return code + ("\nf*" if shape == "dot" else "\nS")
    return None


def _path(texts: list[str], ops: str, closed: bool = False) -> str:
    """A path object's operators (reportlab's ``PDFPathObject`` joins
    them with spaces): a moveto to the first two numbers, then an
    operator ``ops`` for each group of the rest (``l`` with two numbers,
    ``c`` with six), then ``h`` if ``closed``."""
    group = 2 if ops == "l" else 6
    code = ("n %s %s m" + (" %s" * group + " " + ops) * ((len(texts) - 2) // group)) % tuple(texts)
    return code + " h" if closed else code


def _draw_placement(c: Canvas, placement, dims, words, printing, only=None) -> None:
    """A placed part, or the window of it that a piece shows (clipped to
    the window; elements wholly outside it are left out), in a marked-content
    sequence tagged ``/KitPart`` whose properties name the part's id
    (ISO 32000-1:2008, 14.6), so a reader can tell the parts apart.  With
    ``only`` (a test of an element), just those elements, without the
    part's title or a piece's marks."""
    piece = placement.piece
    c.addLiteral(f"/KitPart <</Part ({placement.part.id})>> BDC")
    c.saveState()
    c.translate(placement.x_mm * mm, placement.y_mm * mm)
    if piece is not None:
        x0, y0, x1, y1 = piece.window_mm
        clip = c.beginPath()
        clip.rect(x0 * mm, y0 * mm, (x1 - x0) * mm, (y1 - y0) * mm)
        c.clipPath(clip, stroke=0, fill=0)
    if placement.rotation_deg:
        c.rotate(placement.rotation_deg)
    c.setLineCap(0)
    c.setLineJoin(1)
    elements = placement.part.elements
    if only is not None:
        elements = [el for el in elements if only(el)]
    if piece is not None:
        turn, window = placement.rotation_deg, piece.window_mm
        elements = [el for el in elements if meets(turn_box(element_box_mm(el), turn), window)]
    whole = placement.part.id if only is None and piece is None else ""
    draw_elements(c, _Pen(c, dims, words, printing.colour), elements, holes_of(printing), whole)
    c.restoreState()
    c.addLiteral("EMC")
    if only is not None:
        return
    if piece is not None:
        label = words("tile.piece", name=piece.name, count=words.number(piece.count))
        pdf_marks.draw_piece_marks(c, placement, words, label)
    elif placement.part.title:
        x, y = placement.title_at_mm
        c.setFillGray(0.0)
        pdf_text.draw_at_baseline(c, x * mm, y * mm, placement.part.title, TITLE_PT, words, "bold",
                                  "right" if placement.rtl else "left")


# -- page furniture ------------------------------------------------------------

def _fitted_pt(string: str, words, text_style: str, size_pt: float, width_mm: float) -> float:
    """The size, at most ``size_pt``, at which ``string`` fits ``width_mm``."""
    return pdf_text.fitted_pt(string, size_pt, width_mm * mm, words, text_style, MIN_FURNITURE_PT)


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

    number = w("page.number", k=w.number(page.number), n=w.number(page.total))
    c.setFillGray(0.0)
    pdf_text.draw_at_baseline(c, right * mm, (bar_y - 1.0) * mm, number, PAGE_NUMBER_PT, w, "bold", "right")

    bar_note = w("page.check_bar", length=w.number(CHECK_BAR_MM), percent=w.number(100))
    size = _fitted_pt(bar_note, w, "body", FOOTER_PT, usable)
    rows = [bar_note]
    if size < TWO_ROWS_BELOW_PT:
        # A narrow sheet in a long-worded language (Russian on A5): two
        # rows rather than type too small or running off the page (#9).
        rows = _even_rows(bar_note, usable * mm, w)
        size = min(_fitted_pt(row, w, "body", TWO_ROWS_PT, usable) for row in rows)
    # The words start where the page's language starts a line: at the
    # right margin in a right-to-left language, the note at the other end.
    start_x, start, end_x, end = (right, "right", m, "left") if w.rtl else (m, "left", right, "right")
    for k, row in enumerate(reversed(rows)):
        pdf_text.draw_at_baseline(c, start_x * mm, (bar_y + 2.8 + k * ROW_MM) * mm, row, size, w, "body", start)

    note = _STOCK_NOTES.get(page.kind)
    note = w(note) if note else ""
    top = (m + FOOTER_MM - 3.0) * mm
    if not note:   # an instructions page: the row is the line's own
        line = kit_line(kit, lambda t: pdf_text.width_pt(t, MIN_FURNITURE_PT, w, "body") <= usable * mm)
        size = _fitted_pt(line, w, "body", LINE_PT, usable)
        pdf_text.draw_at_baseline(c, start_x * mm, top, line, size, w, "body", start)
        return
    note_pt, line, line_pt = _noted_row(kit, usable)
    pdf_text.draw_at_baseline(c, end_x * mm, top, note, note_pt, w, "bold", end)
    pdf_text.draw_at_baseline(c, start_x * mm, top, line, line_pt, w, "body", start)


def _even_rows(note: str, width_pt: float, w) -> list[str]:
    """The note wrapped onto two rows of TWO_ROWS_PT as even as its words
    allow: at the narrowest width, from half ``width_pt`` up to all of it,
    at which it still takes two rows (found by halving the interval to
    within a point), so that no word or two stand alone on the second row
    (the French note had left « page ». there on A5).  A note that takes
    more rows even at the whole width is wrapped at the whole width."""
    rows = wrap(note, width_pt, TWO_ROWS_PT, w, "body")
    if len(rows) != 2:
        return rows
    low, high = width_pt / 2.0, width_pt
    while high - low > 1.0:
        middle = (low + high) / 2.0
        tried = wrap(note, middle, TWO_ROWS_PT, w, "body")
        if len(tried) == 2:
            high, rows = middle, tried
        else:
            low = middle
    return rows


#: The stock's note of a page of each kind, on the footer's top row.
_STOCK_NOTES = {"card": "page.on_card", "film": "page.on_film"}


def _noted_row(kit, usable_mm: float) -> tuple[float, str, float]:
    """The footer's top row on a card or film page: the note's size, the
    kit's line and its size, the same on every such page of the kit (the
    room left by the wider of the two notes), so that a stack's pages all carry one
    line to sort them by (#12).  The note gives way first, down to
    MIN_NOTE_PT, for the line at LINE_PT; the line then takes the rest,
    down to MIN_FURNITURE_PT, and only where even that does not fit is
    its title shortened with "…"."""
    w = kit.words
    widest = max((w(key) for key in _STOCK_NOTES.values()), key=lambda n: pdf_text.width_pt(n, NOTE_PT, w, "bold"))
    wanted_mm = pdf_text.width_pt(kit_line(kit), LINE_PT, w, "body") / mm
    note_pt = pdf_text.fitted_pt(widest, NOTE_PT, (usable_mm - wanted_mm - NOTE_GAP_MM) * mm, w, "bold",
                                 MIN_NOTE_PT)
    room_mm = usable_mm - pdf_text.width_pt(widest, note_pt, w, "bold") / mm - NOTE_GAP_MM
    line = kit_line(kit, lambda s: pdf_text.width_pt(s, MIN_FURNITURE_PT, w, "body") <= room_mm * mm)
    return note_pt, line, _fitted_pt(line, w, "body", LINE_PT, room_mm)


# -- the instructions page ------------------------------------------------------

def draw_set_lines(c: Canvas, lines, words) -> None:
    """Text lines as the layout set them (kitgen.layout.paragraphs)."""
    for line in lines:
        pdf_text.draw_at_baseline(c, line.x_mm * mm, line.baseline_mm * mm, line.text, line.size_pt, words,
                                  line.style, line.align)


def draw_figures(c: Canvas, figures, words, colour: bool) -> None:
    """The instructions' pictures as the layout set them
    (kitgen.layout.paragraphs.SetFigure): each figure's elements drawn
    like a part's, at the figure's corner, in its own line weights."""
    for placed in figures:
        fig = placed.figure
        c.saveState()
        c.translate(placed.x_mm * mm, placed.y_mm * mm)
        c.setLineCap(0)
        c.setLineJoin(1)
        draw_elements(c, _Pen(c, fig.dims, words, colour), fig.elements)
        c.restoreState()


# -- the document ----------------------------------------------------------------

def page_transform(c: Canvas, page: Page, mirror: bool = True) -> None:
    """From the page as it measures in print (mm, the layout's page) to the
    PDF's page: mirrored left to right for a mirrored film page (so the ink
    lies under the film once it is turned over; ``mirror=False`` for the
    footer, which is read as the page comes out of the printer), then drawn
    at 1 / scale in each direction so that a printer that prints at
    ``print_scale`` gives true sizes."""
    sx, sy = page.print_scale
    if page.mirrored and mirror:
        c.transform(-1.0, 0.0, 0.0, 1.0, page.media_mm[0] * mm, 0.0)
    if (sx, sy) != (1.0, 1.0):
        c.scale(1.0 / sx, 1.0 / sy)


def build_pdf(kit):
    """The kit laid out and rendered: ``(pages, pdf_bytes)``; the layout
    sets the instructions on as few pages as their words need."""
    pages = layout_kit(kit)
    return pages, render_pdf(kit, pages)


def render_pdf(kit, pages) -> bytes:
    """The kit's pages (:func:`kitgen.layout.pages.layout_kit`) as one PDF
    document (bytes).  A named kit laid out on its nameless kit's pages
    is that kit's PDF (kept for the last few) with the name laid over
    (:mod:`kitgen.render.pdf_owner`), so that a school's pupils share it."""
    return render_layers(kit, pages).pdf


def render_layers(kit, pages) -> pdf_owner.Layers:
    """:func:`render_pdf`'s document with the layers it was made of: the
    shared PDF and the name's, where the kit has them (a class set's
    print files share the shared one's pages among a school's pupils)."""
    shared = shared_pages(kit, pages)
    if shared is None or pdf_marks.seams_break_round_names(pages, shared, kit.words):
        return pdf_owner.Layers(_render(kit, pages))
    indices, overlay = pdf_owner.owner_pages(kit, pages, _draw_placement, page_transform, FONT)
    base = _shared_pdf(kit.nameless, shared)
    return pdf_owner.Layers(pdf_owner.lay_over(base, indices, overlay), base, tuple(indices), overlay)


#: The PDFs of the last few nameless kits, by the kit's identity: (kit, bytes).
_SHARED_PDFS: dict[int, tuple] = {}


def _shared_pdf(nameless, pages) -> bytes:
    return kept_for(_SHARED_PDFS, nameless, lambda: _render(nameless, pages), 4)


def _render(kit, pages) -> bytes:
    """The pages drawn, every element of every part."""
    register_fonts()
    buf = io.BytesIO()
    first = pages[0]
    c = new_canvas(buf, (first.media_mm[0] * mm, first.media_mm[1] * mm),
                   initialFontName=FONT, initialFontSize=10, lang=kit.words.language)
    c.setTitle(kit_title(kit))
    c.setSubject(kit_latitudes(kit))
    c.setAuthor("")
    c.setCreator("kitgen")
    ask_actual_size(c)
    for page in pages:
        media_w, media_h = page.media_mm
        c.setPageSize((media_w * mm, media_h * mm))
        c.saveState()
        page_transform(c, page)
        draw_set_lines(c, page.lines, kit.words)
        draw_figures(c, page.figures, kit.words, kit.plan.printing.colour)
        for placement in page.placements:
            _draw_placement(c, placement, kit.dims, kit.words, kit.plan.printing)
        for mark in page.marks:
            pdf_marks.draw_registration(c, mark)
        c.restoreState()
        c.saveState()
        page_transform(c, page, mirror=False)   # the footer reads the right way round as printed (#9)
        _footer(c, kit, page)
        c.restoreState()
        c.showPage()
    c.save()
    return buf.getvalue()

"""A page's footer never prints one word over another (#12).

On a card or film page the footer's top row holds the kit's line (its
title, latitude and year) and, at the right, the stock's note ("Print
this page on film"). On A5 a German kit's long title ran the line under
the bold note, its year printed over by "Transparentfolie". A title of
the most characters a recipe takes cannot fit beside the note at all.

Read back from the PDF alone (tests/pdf_ink.py: each glyph's ink box from
the page's content stream and the embedded fonts' 'glyf' boxes, ISO
32000-1:2008), on every page of A5 kits in seven languages and four
scripts, with a long title and with the longest one: no glyph of the
page's footer (outside every part, below the footer's top) overlaps a glyph of another line
by more than the reader's 0.1 mm tolerance, and none reaches past the
sheet's margins.
"""

from __future__ import annotations

import io

import pypdf
import pytest

from kitgen.kit import build_kit
from kitgen.paper import FOOTER_MM
from kitgen.recipe.load import validate_recipe
from kitgen.recipe.schema import MAX_TEXT_CHARS
from kitgen.render.pdf import build_pdf

from . import pdf_ink

MM = 72.0 / 25.4
#: An invented school's long name, and one of the most characters a
#: title may have.
LONG = "Nordlicht-Schule Falkenbucht am Großen See"
LONGEST = ("Gemeinschaftsschule " * 7)[:MAX_TEXT_CHARS].strip()


def _lines(glyphs) -> list[int]:
    """Each glyph's drawn line, numbered: glyphs drawn one after another
    on one row, each within 3 mm of what the line has drawn so far (a
    word space is under 2 mm at the footer's sizes). A shaped line
    (Arabic, Devanagari) is shown as several strings, right to left in
    any order, whose joined letters and marks overlap by design; they are
    one line here."""
    out, line, extent = [], 0, None
    for g in glyphs:
        x0, y0 = g.box.min(axis=0)
        x1, y1 = g.box.max(axis=0)
        if extent is not None:
            ex0, ey0, ex1, ey1 = extent
            same_row = min(y1, ey1) - max(y0, ey0) > 0.25 * min(y1 - y0, ey1 - ey0)
            if same_row and x0 <= ex1 + 3.0 * MM and x1 >= ex0 - 3.0 * MM:
                extent = (min(x0, ex0), min(y0, ey0), max(x1, ex1), max(y1, ey1))
                out.append(line)
                continue
            line += 1
        extent = (x0, y0, x1, y1)
        out.append(line)
    return out


def _overlap_pt(a, b) -> float:
    """How far (pt) two glyphs' axis-aligned ink boxes reach into each
    other, the smaller of the two directions (0 where they do not meet)."""
    ax0, ay0 = a.box.min(axis=0)
    ax1, ay1 = a.box.max(axis=0)
    bx0, by0 = b.box.min(axis=0)
    bx1, by1 = b.box.max(axis=0)
    return max(0.0, min(min(ax1, bx1) - max(ax0, bx0), min(ay1, by1) - max(ay0, by0)))


@pytest.mark.parametrize("title", [LONG, LONGEST])
@pytest.mark.parametrize("language", ["de", "en", "ru", "el", "fr", "ar", "hi"])
def test_footer_words_never_overlap_nor_leave_the_margins(language, title):
    kit = build_kit(validate_recipe({"latitude": 64.1, "sheet": "a5", "language": language, "epoch": 2027,
                                     "title": title}))
    pages, data = build_pdf(kit)
    reader = pypdf.PdfReader(io.BytesIO(data))
    tolerance = pdf_ink.TOLERANCE_MM * MM
    for number, (page, pdf_page) in enumerate(zip(pages, reader.pages), start=1):
        margin, width = page.sheet.margin_mm * MM, page.width_mm * MM
        band = margin + FOOTER_MM * MM   # the footer: the margin's edge up to the footer's top
        glyphs = [g for g in pdf_ink.read_page_ink(reader, pdf_page).glyphs
                  if not g.part and g.box[:, 1].min() < band]
        for g in glyphs:
            x0, x1 = g.box[:, 0].min(), g.box[:, 0].max()
            assert x0 >= margin - tolerance and x1 <= width - margin + tolerance, (number, g.text)
        lines = _lines(glyphs)
        for k, a in enumerate(glyphs):
            for j in range(k + 1, len(glyphs)):
                if lines[j] != lines[k]:
                    assert _overlap_pt(a, glyphs[j]) <= tolerance, (number, a.text, glyphs[j].text)


@pytest.mark.parametrize("language, title", [
    ("ru", "Клуб «Северная звезда юных астрономов у озера Ясное и их друзей»"),
    ("de", "Sternwarte „Falkenbucht am Großen See der Nordlicht-Schule“"),
])
def test_a_shortened_title_is_one_line_on_every_card_and_film_page(language, title):
    """Every card and film page of a kit carries the same kit line, so a
    stack of them sorts by one line (they had shortened the title by the
    room their own note left: one title on the card pages, a shorter one
    on the film page); a title cut inside quotation marks has them closed
    (common practice of typesetting, no published source). Read back with
    pypdf's text extraction."""
    kit = build_kit(validate_recipe({"latitude": 55.7, "sheet": "a5", "language": language, "epoch": 2027,
                                     "title": title}))
    pages, data = build_pdf(kit)
    reader = pypdf.PdfReader(io.BytesIO(data))
    notes = {kit.words("page.on_card"), kit.words("page.on_film")}
    lines = set()
    for page, pdf_page in zip(pages, reader.pages):
        if page.kind in ("card", "film"):
            text = pdf_page.extract_text().split("\n")
            lines |= {row for row in text if row.endswith("2027") and "\u00b7" in row and row not in notes}
    (line,) = lines
    assert "\u2026" in line   # shortened on A5 beside the note, inside the quotation marks
    for opening, closing in (("«", "»"), ("„", "“")):
        assert line.count(opening) == line.count(closing)
    assert "\u2026»" in line or "\u2026“" in line


@pytest.mark.parametrize("language", ["ar", "en"])
def test_the_footer_starts_where_the_language_starts_a_line(language):
    """In Arabic, written right to left, the footer's kit line and the
    check bar's note end at the right margin, where a reader starts
    (Unicode Standard Annex #9: a right-to-left paragraph is set from the
    right); in English they start at the left. The stock's note stands at
    the other end. Read back from the PDF's glyphs (tests/pdf_ink.py) on
    the first page (instructions) and a card page."""
    kit = build_kit(validate_recipe({"latitude": 24.7, "sheet": "a5", "language": language, "epoch": 2027,
                                     "title": "Sky Valley Club"}))
    pages, data = build_pdf(kit)
    reader = pypdf.PdfReader(io.BytesIO(data))
    card = next(k for k, p in enumerate(pages) if p.kind == "card")
    for k in (0, card):
        page = pages[k]
        margin, width = page.sheet.margin_mm * MM, page.width_mm * MM
        band = margin + FOOTER_MM * MM
        glyphs = [g for g in pdf_ink.read_page_ink(reader, reader.pages[k]).glyphs
                  if not g.part and g.box[:, 1].min() < band]
        lines = _lines(glyphs)
        rows = {}
        for g, n in zip(glyphs, lines):
            x0, x1 = g.box[:, 0].min(), g.box[:, 0].max()
            lo, hi = rows.get(n, (x0, x1))
            rows[n] = (min(lo, x0), max(hi, x1))
        # The kit line and the bar's note, the rows over 30 mm long but the stock's note.
        wide = [span for span in rows.values() if span[1] - span[0] > 30 * MM]
        if language == "ar":
            started = [(lo, hi) for lo, hi in wide if hi >= width - margin - 1.5 * MM]
        else:
            started = [(lo, hi) for lo, hi in wide if lo <= margin + 1.5 * MM]
        assert len(started) >= 2, (k, [(lo / MM, hi / MM) for lo, hi in wide])

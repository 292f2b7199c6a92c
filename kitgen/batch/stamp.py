"""The small stamp on every page of a set's print files: the kit's number
and its owner (or title), so a printed stack can be sorted (#12).

The stamp is drawn once per kit by reportlab, with the kit's own words
and fonts (:mod:`kitgen.render.pdf_text`, so an Arabic or Hindi name is
shaped as on the kit), in invariant mode so that the same kit gives the
same bytes.  It is then laid on each page of the kit as a form XObject
(ISO 32000-1:2008, 8.10) in the top margin, right-aligned at the content
area's edge, after the page's own content wrapped in ``q``/``Q``; the
page's content stream itself is left as it is.
"""

from __future__ import annotations

import io

from reportlab.lib.units import mm

from ..render import pdf_text
from ..render.pdf_canvas import new_canvas
from ..words import fonts

STAMP_PT = 6.0
#: The stamp's baseline above the top edge of the content area (mm); its
#: text stays in the margin, which is at least 6 mm.
STAMP_RISE_MM = 1.0
_PAD_PT = 2.0
#: The name of the stamp's form in a page's resources.
STAMP_FORM = b"/KitgenStamp"


def stamp_pdf(kit, number: int, name: str) -> bytes:
    """A one-page PDF holding only the stamp, its baseline at
    ``_PAD_PT`` above the page's foot and its left end at 0."""
    pdf_text.register_fonts()
    w = kit.words
    text = w("batch.stamp", number=w.number(number), name=name)
    width = pdf_text.width_pt(text, STAMP_PT, w, "body")
    buf = io.BytesIO()
    c = new_canvas(buf, (width + _PAD_PT, STAMP_PT + 2 * _PAD_PT),
                   lang=w.language, initialFontName=fonts.DEJAVU["body"].name, initialFontSize=STAMP_PT)
    c.setCreator("kitgen")
    c.setFillGray(0.0)
    pdf_text.draw_at_baseline(c, 0.0, _PAD_PT, text, STAMP_PT, w, "body")
    c.showPage()
    c.save()
    return buf.getvalue()


def stamp_at(media_box_pt, form_width_pt: float, margin_mm: float) -> tuple[float, float]:
    """Where the stamp's form (its lower left corner) goes on a page of
    media box ``media_box_pt`` (x0, y0, x1, y1): right-aligned at the
    content area's edge, its baseline :data:`STAMP_RISE_MM` above it."""
    x0, y0, x1, y1 = media_box_pt
    return x1 - margin_mm * mm - form_width_pt, y1 - margin_mm * mm + STAMP_RISE_MM * mm - _PAD_PT

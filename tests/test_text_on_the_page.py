"""Every printed character lies inside the printable area of its page (#9):
no footer, note or label runs off the sheet, in any shipped language, on
the smallest and the largest sheets.

Read from the PDF's own glyphs by tests/pdf_ink.py (ISO 32000-1:2008, 9.4
text objects, 9.2.4 glyph positioning; each glyph's ink box from the
TrueType 'glyf' header), against the page's MediaBox (ISO 32000-1:2008,
14.11.2) less the sheet's margin, which office printers leave blank
(common practice), with 1 mm to spare: the tall marks of an Arabic line
may reach a little above the line's ascent, and the unprintable band of
an office printer is 4 to 5 mm of a margin of at least 6 mm (common
practice, from memory).  Nothing comes from kitgen's geometry model.
"""

from __future__ import annotations

import io

import numpy as np
import pypdf
import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf

from . import pdf_ink

PT_PER_MM = 72.0 / 25.4
SPARE_MM = 1.0


@pytest.mark.parametrize("language, sheet", [(code, "a5") for code in
                                              ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")]
                         + [("de", "tabloid"), ("ar", "letter")])
def test_every_glyph_inside_the_printable_area(language, sheet):
    kit = build_kit(validate_recipe({"latitude": 61.0, "language": language, "sheet": sheet, "worksheet": True,
                                     "title": "Northwind Valley Science Club", "owner": "Ilse Varga"}))
    pages, pdf = build_pdf(kit)
    reader = pypdf.PdfReader(io.BytesIO(pdf))
    margin_pt = pages[0].sheet.margin_mm * PT_PER_MM
    for k, page in enumerate(reader.pages):
        x0, y0, x1, y1 = (float(v) for v in page.mediabox)
        ink = pdf_ink.read_page_ink(reader, page)
        assert ink.glyphs
        for g in ink.glyphs:
            box = np.asarray(g.box)
            spare = SPARE_MM * PT_PER_MM
            assert box[:, 0].min() >= x0 + margin_pt - spare and box[:, 0].max() <= x1 - margin_pt + spare, \
                (language, sheet, k + 1, g.text)
            assert box[:, 1].min() >= y0 + margin_pt - spare and box[:, 1].max() <= y1 - margin_pt + spare, \
                (language, sheet, k + 1, g.text)

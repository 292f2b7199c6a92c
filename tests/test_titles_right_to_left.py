"""A part's title, and a tiled piece's name, stand at the right end of
the band above the part in a kit whose words run right to left (Arabic),
where its reader begins, and at the left end in a left-to-right kit
(common practice of right-to-left and left-to-right print).  Where the
words are drawn is read back from the PDF as PDFium renders it (the ink
of the band's lines, at 300 dpi; its text boxes do not hold the shaped
runs' places); the part's box and band are the layout's.  Schools
invented."""

from __future__ import annotations

import numpy as np
import pytest
from reportlab.lib.units import mm

from kitgen.kit import build_kit
from kitgen.layout.pages import piece_label_width_mm, title_width_mm
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf

pdfium = pytest.importorskip("pypdfium2")

#: How near (mm) the words' drawn end must come to the band's end.
END_MM = 0.5

CASES = {
    "whole parts": {"latitude": 24.71, "title": "مدرسة الواحة"},
    "duplex mater": {"latitude": 30.04, "title": "مدرسة النخيل", "duplex": "long_edge"},
    "tiled pieces": {"latitude": 21.5, "title": "مدرسة الساحل", "diameter_mm": 300, "sheet": "a5"},
}


#: Pixels a millimetre of the rendered page (300 dpi).
PX_PER_MM = 300 / 25.4


def _ink(page) -> np.ndarray:
    """Where the page is inked: a boolean array, row 0 at the top."""
    grey = np.asarray(page.render(scale=PX_PER_MM / mm).to_pil().convert("L"))
    return grey < 128


def _ends(ink, y_mm: float, window: tuple[float, float]) -> tuple[float, float]:
    """The least and greatest x (mm) inked on the line whose baseline is
    at ``y_mm`` (0.8 mm below it to 2.6 mm above), within ``window``."""
    height_mm = ink.shape[0] / PX_PER_MM
    rows = slice(int((height_mm - y_mm - 2.6) * PX_PER_MM), int((height_mm - y_mm + 0.8) * PX_PER_MM))
    cols = slice(max(0, int(window[0] * PX_PER_MM)), int(window[1] * PX_PER_MM))
    xs = np.nonzero(ink[rows, cols].any(axis=0))[0]
    assert len(xs), "no ink on the title's line"
    return (cols.start + xs[0]) / PX_PER_MM, (cols.start + xs[-1] + 1) / PX_PER_MM


@pytest.mark.parametrize("case", CASES)
@pytest.mark.parametrize("language", ["ar", "en"])
def test_the_band_is_set_from_the_readers_side(case, language):
    recipe = validate_recipe({"epoch": 2027, "language": language, **CASES[case]})
    kit = build_kit(recipe)
    pages, pdf = build_pdf(kit)
    doc = pdfium.PdfDocument(pdf)
    checked = 0
    for index, page in enumerate(pages):
        if page.mirrored:   # read through the film
            continue
        ink = _ink(doc[index])
        for placement in page.placements:
            if not placement.part.title:
                continue
            x0, _, x1, y1 = placement.box_mm
            assert placement.rtl is (language == "ar")
            words = [placement.title_at_mm]
            width = title_width_mm(placement.part.title)
            if placement.piece is not None:
                words.append(placement.piece_label_at_mm)
                piece = placement.piece
                label = kit.words("tile.piece", name=piece.name, count=kit.words.number(piece.count))
                width = max(width, piece_label_width_mm(label, piece))
            for _, y in words:
                end = placement.band_end_mm(width)
                if language == "ar":   # the words end at the band's end, the box's right side or beyond it
                    _, right = _ends(ink, y, (end - width, end + 1.0))
                    assert right == pytest.approx(end, abs=END_MM)
                else:   # they begin at the box's left side
                    left, _ = _ends(ink, y, (x0 - 1.0, x0 + width))
                    assert left == pytest.approx(x0, abs=END_MM)
                checked += 1
    assert checked >= 2

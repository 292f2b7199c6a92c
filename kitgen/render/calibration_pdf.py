"""The calibration page as PDF: four check bars and how to read them.

Drawn at exactly 100 %, with no print_scale, so that what the bars
measure on paper is the printer's own scale.  Lines are black with butt
caps, so each bar's ink ends where the bar ends; its ticks are centred on
their true places.  Its words are written by :func:`kitgen.layout.calibration.calibration_story`.
"""

from __future__ import annotations

import io

from reportlab.lib.units import mm
from reportlab.pdfgen.canvas import Canvas

from . import pdf_text
from ..layout.calibration import calibration_story
from ..layout.paragraphs import fitting_size, set_blocks
from .pdf import ask_actual_size, draw_set_lines
from .pdf_canvas import new_canvas

#: Line widths (mm): the bar itself and its ticks.
BAR_LINE_MM = 0.2
TICK_LINE_MM = 0.15
NUMBER_PT = 6.5
NAME_PT = 8.0


def _bar(c: Canvas, bar, words) -> None:
    x0, y0 = bar.start_mm
    c.setLineWidth(BAR_LINE_MM * mm)
    x1, y1 = bar.end_mm
    c.line(x0 * mm, y0 * mm, x1 * mm, y1 * mm)
    c.setLineWidth(TICK_LINE_MM * mm)
    for d, length, label in bar.ticks():
        if bar.axis == "x":
            x = x0 + d
            c.line(x * mm, y0 * mm, x * mm, (y0 - length) * mm)
            if label is not None:
                pdf_text.draw_text(c, x, y0 - 6.0 - 2.2, words.number(label), NUMBER_PT, words, "label")
        else:
            y = y0 + d
            c.line(x0 * mm, y * mm, (x0 + length) * mm, y * mm)
            if label is not None:
                pdf_text.draw_text(c, x0 + 7.0, y, words.number(label), NUMBER_PT, words, "label", "start")
    unit = words("calibrate.mm" if bar.unit == "mm" else "calibrate.inch",
                 length=words.number(bar.length_mm if bar.unit == "mm" else bar.length))
    direction = words("calibrate.across" if bar.axis == "x" else "calibrate.down")
    name = f"{direction} \u00b7 {unit}"
    if bar.axis == "x":
        pdf_text.draw_text(c, x0, y0 + 2.2, name, NAME_PT, words, "bold", "start")
    else:
        pdf_text.draw_text(c, x0 - 2.5, y0, name, NAME_PT, words, "bold", "start", 90.0)


def render_calibration_pdf(page, words) -> bytes:
    """The calibration page (a :class:`kitgen.layout.calibration.CalibrationPage`)
    as a one-page PDF (bytes), the same bytes for the same page and words."""
    pdf_text.register_fonts()
    buf = io.BytesIO()
    c = new_canvas(buf, (page.width_mm * mm, page.height_mm * mm),
                   lang=words.language)
    c.setTitle(words("calibrate.title"))
    c.setAuthor("")
    c.setCreator("kitgen")
    ask_actual_size(c)
    c.setLineCap(0)
    c.setStrokeGray(0.0)
    c.setFillGray(0.0)
    for bar in page.bars:
        _bar(c, bar, words)
    blocks = calibration_story(page, words)
    size = fitting_size(blocks, page.text_box_mm, words)
    draw_set_lines(c, set_blocks(blocks, page.text_box_mm, words, size), words)
    c.showPage()
    c.save()
    return buf.getvalue()

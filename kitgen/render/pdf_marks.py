"""Page marks of the PDF that belong to no part: the furniture of a piece
of a tiled part (its window's frame, the seams to cut along, the alignment
marks and the band with its title, name and assembly map) and the duplex
registration marks.  Everything here is black, so that it prints the same
on every printer and carries no meaning by colour; positions come from the
layout (:mod:`kitgen.layout.pages`, :mod:`kitgen.layout.tiling`).
"""

from __future__ import annotations

from reportlab.lib.units import mm

from ..layout.pages import PIECE_LABEL_PT, TITLE_PT, map_cell_mm, piece_label_width_mm, title_width_mm
from ..layout.seams import seam_stretches_mm
from ..layout.tiling import MARK_HALF_MM
from . import pdf_text

#: Line widths (mm) of the marks: thin enough to place precisely, at least
#: the legible minimum of kitgen.geometry.style (0.10 mm).
MARK_LINE_MM = 0.15
FRAME_LINE_MM = 0.12
SEAM_LINE_MM = 0.25
SEAM_DASH_MM = (4.0, 1.0, 0.6, 1.0)  # dash-dot: never mistaken for a dashed fold
#: Clearance (mm) between a seam's line and the words it is broken round,
#: the labels' margin of kitgen.parts.labels.
SEAM_CLEAR_MM = 0.3
FRAME_GREY = 0.45
#: Duplex marks: the half length (mm) of the front's scales (and the half
#: side of their square frame), their tick step (mm) and the half length
#: of the back's cross.
DUPLEX_SCALE_HALF_MM = 5.0
DUPLEX_TICK_STEP_MM = 0.5
DUPLEX_CROSS_HALF_MM = 6.0
#: Half side (mm) of the square about the back's cross.
DUPLEX_BACK_SQUARE_HALF_MM = 3.0


def _line(c, x0, y0, x1, y1) -> None:
    c.line(x0 * mm, y0 * mm, x1 * mm, y1 * mm)


def alignment_mark(c, x_mm: float, y_mm: float) -> None:
    """A diamond (a square on its corner) centred on a seam, outside the
    part (kitgen.layout.tiling): cut along the seam, each piece keeps a
    triangle whose tips lie on the seam, and the tips meet when the pieces
    lie as they should.  Nothing like the circled cross of a pin, so it is
    never pierced."""
    h = MARK_HALF_MM
    p = c.beginPath()
    p.moveTo((x_mm + h) * mm, y_mm * mm)
    p.lineTo(x_mm * mm, (y_mm + h) * mm)
    p.lineTo((x_mm - h) * mm, y_mm * mm)
    p.lineTo(x_mm * mm, (y_mm - h) * mm)
    p.close()
    c.drawPath(p, stroke=1, fill=0)


def seam_lines_mm(placement, words):
    """The stretches of a tiled piece's seams as drawn: broken round the
    part's words with :data:`SEAM_CLEAR_MM` of paper beside the line."""
    return seam_stretches_mm(placement, words, SEAM_CLEAR_MM + SEAM_LINE_MM / 2)


def seams_break_round_names(pages, shared_pages, words) -> bool:
    """Whether a seam on ``pages`` (a named kit's) breaks where the same
    seam on ``shared_pages`` (its nameless kit's, placed alike) does not:
    the owner's name lies across it, and the pages cannot be the shared
    ones with the name laid over them, whose seam would run through the
    name (kitgen.render.pdf.render_layers)."""
    for page, base in zip(pages, shared_pages):
        for placed, nameless in zip(page.placements, base.placements):
            if placed.piece is not None and placed.piece.seams_mm and \
                    seam_lines_mm(placed, words) != seam_lines_mm(nameless, words):
                return True
    return False


def draw_piece_marks(c, placement, words, label: str) -> None:
    """The frame, seams and alignment marks of a piece (page coordinates,
    the canvas in mm-as-printed), and its band: title, name and map."""
    piece = placement.piece
    ox, oy = placement.x_mm, placement.y_mm
    x0, y0, x1, y1 = placement.box_mm
    c.saveState()
    c.setLineCap(0)
    c.setDash([], 0)
    c.setLineWidth(FRAME_LINE_MM * mm)
    c.setStrokeGray(FRAME_GREY)
    c.rect(x0 * mm, y0 * mm, (x1 - x0) * mm, (y1 - y0) * mm, stroke=1, fill=0)
    c.setStrokeGray(0.0)
    c.setLineWidth(SEAM_LINE_MM * mm)
    c.setDash([d * mm for d in SEAM_DASH_MM], 0)
    # Broken round the part's words, which the seam would run over (#9).
    for (sx0, sy0), (sx1, sy1) in seam_lines_mm(placement, words):
        _line(c, sx0, sy0, sx1, sy1)
    c.setDash([], 0)
    c.setLineWidth(MARK_LINE_MM * mm)
    for mx, my in piece.marks_mm:
        alignment_mark(c, ox + mx, oy + my)
    # The band: title, then the piece's name and the map of all pieces.
    c.setFillGray(0.0)
    (tx, ty), (lx, ly) = placement.title_at_mm, placement.piece_label_at_mm
    cell = map_cell_mm(piece)
    if placement.rtl:   # all three from the band's right end: title, name, then the map to the name's left
        tx = lx = placement.band_end_mm(max(title_width_mm(placement.part.title), piece_label_width_mm(label, piece)))
    align = "right" if placement.rtl else "left"
    pdf_text.draw_at_baseline(c, tx * mm, ty * mm, placement.part.title, TITLE_PT, words, "bold", align)
    used_pt = pdf_text.draw_at_baseline(c, lx * mm, ly * mm, label, PIECE_LABEL_PT, words, "body", align)
    left = lx - used_pt / mm - 2.0 - cell * piece.columns if placement.rtl else lx + used_pt / mm + 2.0
    top = ly - 0.7 + cell * piece.rows
    c.setLineWidth(MARK_LINE_MM * mm)
    for j in range(piece.rows):
        for i in range(piece.columns):
            here = (i, j) == (piece.column, piece.row)
            c.rect((left + i * cell) * mm, (top - (j + 1) * cell) * mm, cell * mm, cell * mm,
                   stroke=1, fill=1 if here else 0)
    c.restoreState()


def draw_registration(c, mark) -> None:
    """A duplex mark.  The front carries two short scales crossing at the
    mark, ticked every 0.5 mm with a longer tick each millimetre, in a
    square frame; the back, behind it, a plain cross in a smaller square.
    Held against the light, the back's cross shows on the front's scales
    how far the two sides are apart.  Squares, never a circle: a circled
    cross is a pin's mark, the one that pupils pierce (#9)."""
    x, y = mark.x_mm, mark.y_mm
    c.saveState()
    c.setLineCap(0)
    c.setDash([], 0)
    c.setStrokeGray(0.0)
    c.setLineWidth(MARK_LINE_MM * mm)
    if mark.kind == "duplex_back":
        h = DUPLEX_CROSS_HALF_MM
        _line(c, x - h, y, x + h, y)
        _line(c, x, y - h, x, y + h)
        q = DUPLEX_BACK_SQUARE_HALF_MM
        c.rect((x - q) * mm, (y - q) * mm, 2 * q * mm, 2 * q * mm, stroke=1, fill=0)
    else:
        h = DUPLEX_SCALE_HALF_MM
        _line(c, x - h, y, x + h, y)
        _line(c, x, y - h, x, y + h)
        c.rect((x - h) * mm, (y - h) * mm, 2 * h * mm, 2 * h * mm, stroke=1, fill=0)
        steps = int(round(h / DUPLEX_TICK_STEP_MM))
        for k in range(-steps, steps + 1):
            if k == 0:
                continue
            d = k * DUPLEX_TICK_STEP_MM
            t = 0.9 if k % 2 == 0 else 0.45
            _line(c, x + d, y - t, x + d, y + t)
            _line(c, x - t, y + d, x + t, y + d)
    c.restoreState()

"""Measure text with the real fonts, so parts can fit their labels.

Widths come from the shipped fonts themselves: hmtx advances read with
fontTools for plain runs, HarfBuzz advances for shaped runs (see
:mod:`kitgen.words.shaping`); the height of a line is its fonts' hhea
ascent plus descent.  Parts import this module, never a drawing library.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from . import fonts
from .shaping import Line, set_line

MM_PER_PT = 25.4 / 72.0


@dataclass(frozen=True)
class Extent:
    """A line's width and the height of its ink (mm), and how far the
    baseline sits below the middle of that ink (mm), at one size."""

    width_mm: float
    height_mm: float
    baseline_below_middle_mm: float


def line_extent(line: Line, size_pt: float) -> Extent:
    em = size_pt * MM_PER_PT
    return Extent(line.width_em * em, 2 * line.half_height_em * em, line.ink_middle_em * em)


def extent(text: str, size_pt: float, script: str = "Latn", style: str = "label", rtl: bool = False) -> Extent:
    """The extent of one line of ``text`` at ``size_pt``."""
    return line_extent(set_line(text, script, style, rtl), size_pt)


def text_corners_mm(at, width_mm: float, height_mm: float, angle_deg: float, anchor: str):
    """The four corners (mm) of a text box whose line's middle height sits
    on ``at``, turned ``angle_deg`` counter-clockwise about ``at``;
    ``anchor`` (``start``, ``middle``, ``end``) is where ``at`` falls along
    the line, left to right as the line is seen."""
    x0 = {"start": 0.0, "middle": -width_mm / 2, "end": -width_mm}[anchor]
    a = math.radians(angle_deg)
    c, s = math.cos(a), math.sin(a)
    out = []
    for dx, dy in ((x0, -height_mm / 2), (x0 + width_mm, -height_mm / 2),
                   (x0 + width_mm, height_mm / 2), (x0, height_mm / 2)):
        out.append((at[0] + c * dx - s * dy, at[1] + s * dx + c * dy))
    return out


def ink_span_em(line: Line) -> tuple[float, float]:
    """Leftmost and rightmost ink of a set line (em, from its left end),
    taken with its advance: a glyph's outline may reach past its advance
    (an Arabic tail, a Devanagari vowel sign below), so a box that must
    hold a label's ink (kitgen.parts.breaks) spans both.  From the
    outlines' bounds, the glyphs placed as they are drawn: shaped runs by
    their HarfBuzz advances and offsets, plain runs by their advances."""
    left, right = 0.0, line.width_em
    start = 0.0
    for run in line.runs:
        x = start
        if run.shaped:
            for g in run.glyphs:
                box = fonts.glyph_bounds_em(run.face, g.gid)
                if box is not None:
                    left, right = min(left, x + g.x_offset_em + box[0]), max(right, x + g.x_offset_em + box[2])
                x += g.x_advance_em
        else:
            for ch in run.text:
                box = fonts.char_bounds_em(run.face, ch) if fonts.has_char(run.face, ch) else None
                if box is not None:
                    left, right = min(left, x + box[0]), max(right, x + box[2])
                x += fonts.advance_em(run.face, ch) if fonts.has_char(run.face, ch) else 0.0
        start += run.width_em
    return left, right

"""The calibration page: check bars across and down, in mm and in inches.

The page is drawn at exactly 100 % (no print_scale: it measures the
printer), portrait.  Each bar is as long as the sheet allows in whole
centimetres or whole inches, since a longer bar gives the scale to more
places: a bar of 180 mm read to 0.5 mm gives the scale to 0.3 %.

Page coordinates: mm, origin at the bottom-left corner, x right, y up.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..paper import MM_PER_INCH, Sheet
from .paragraphs import Block

#: Room (mm) kept for the bars: the column for the two bars down the
#: right-hand side, the band for the two bars across the foot.
COLUMN_MM = 40.0
BAND_MM = 34.0
#: From the bar's line: tick lengths (mm) by division, and the end ticks.
END_TICK_MM = 6.0


@dataclass(frozen=True)
class Bar:
    """A check bar from ``start_mm`` along +x (``axis`` "x", across) or +y
    ("y", down the page) ``length`` whole ``unit`` s ("mm" counts in
    centimetres, "in" in inches) long; ``divisions`` ticks per unit of
    labelling (10 per cm, 8 per inch)."""

    axis: str
    unit: str
    start_mm: tuple[float, float]
    length: int          # in cm for "mm" bars, in inches for "in" bars
    divisions: int

    @property
    def unit_mm(self) -> float:
        return 10.0 if self.unit == "mm" else MM_PER_INCH

    @property
    def length_mm(self) -> float:
        return self.length * self.unit_mm

    @property
    def end_mm(self) -> tuple[float, float]:
        x, y = self.start_mm
        return (x + self.length_mm, y) if self.axis == "x" else (x, y + self.length_mm)

    def ticks(self):
        """(distance from the start in mm, tick length in mm, labelled
        number or None) of every tick."""
        n = self.length * self.divisions
        out = []
        for k in range(n + 1):
            d = k * self.unit_mm / self.divisions
            if k in (0, n):
                length = END_TICK_MM
            elif k % self.divisions == 0:
                length = 4.0
            elif self.divisions == 10 and k % 5 == 0:
                length = 2.6
            elif self.divisions == 8 and k % 4 == 0:
                length = 3.0
            elif self.divisions == 8 and k % 2 == 0:
                length = 2.2
            else:
                length = 1.5
            label = k // self.divisions if k % self.divisions == 0 else None
            if label is not None and self.unit == "mm":
                label *= 10
            out.append((d, length, label))
        return out


@dataclass(frozen=True)
class CalibrationPage:
    sheet: Sheet
    bars: tuple[Bar, ...]
    text_box_mm: tuple[float, float, float, float]

    @property
    def width_mm(self) -> float:
        return self.sheet.width_mm

    @property
    def height_mm(self) -> float:
        return self.sheet.height_mm


def calibration_page(sheet: Sheet) -> CalibrationPage:
    """Where the four bars and the text go on a portrait page of ``sheet``."""
    w, h, m = sheet.width_mm, sheet.height_mm, sheet.margin_mm
    across = w - 2 * m - 4.0
    down = h - 2 * m - BAND_MM - 8.0
    cm_x, in_x = int(across // 10), int(math.floor(across / MM_PER_INCH))
    cm_y, in_y = int(down // 10), int(math.floor(down / MM_PER_INCH))
    bottom = m + BAND_MM + 4.0
    column = w - m - COLUMN_MM
    # Ticks run down from the bars across and right from the bars down;
    # numbers beyond the ticks, each bar's name on its other side.
    bars = (
        Bar("x", "mm", (m + 2.0, m + 28.0), cm_x, 10),
        Bar("x", "in", (m + 2.0, m + 12.0), in_x, 8),
        Bar("y", "mm", (column + 5.0, bottom), cm_y, 10),
        Bar("y", "in", (column + 24.0, bottom), in_y, 8),
    )
    return CalibrationPage(sheet, bars, (m, bottom, column - 4.0, h - m))


def calibration_story(page, words) -> list[Block]:
    """The calibration page's words, as paragraphs (``calibrate.*`` of the
    language template), with a worked example of a 97 % printer."""
    across = next(b for b in page.bars if b.axis == "x" and b.unit == "mm")
    measured = across.length_mm * 0.97
    return [Block("title", words("calibrate.title")),
            Block("body", words("calibrate.intro", percent=words.number(100))),
            Block("body", words("calibrate.how")),
            Block("item", "print_scale: {x: " + words.number(0.97, 3).replace(",", ".") + ", y: "
                  + words.number(0.985, 3).replace(",", ".") + "}", "\u2022"),
            Block("body", words("calibrate.example", length=words.number(across.length_mm),
                                measured=words.number(measured, 1), ratio=words.number(0.97, 3))),
            Block("body", words("calibrate.exact"))]

"""Paper sheets and their printable area.

Sizes: ISO 216 (A3 297 x 420 mm, A4 210 x 297 mm) and ANSI/ASME Y14.1
(Letter / ANSI A 8.5 x 11 in, Tabloid / ANSI B 11 x 17 in).
"""

from __future__ import annotations

from dataclasses import dataclass

MM_PER_INCH = 25.4

#: (width_mm, height_mm) in portrait.
SHEET_SIZES_MM = {
    "a4": (210.0, 297.0),
    "a3": (297.0, 420.0),
    "letter": (8.5 * MM_PER_INCH, 11.0 * MM_PER_INCH),
    "tabloid": (11.0 * MM_PER_INCH, 17.0 * MM_PER_INCH),
}

#: Margin kept clear of the printer's unprintable edge (common practice:
#: office printers leave 3-5 mm unprinted; 10 mm leaves room for marks).
DEFAULT_MARGIN_MM = 10.0


@dataclass(frozen=True)
class Sheet:
    name: str
    width_mm: float
    height_mm: float
    margin_mm: float = DEFAULT_MARGIN_MM

    @property
    def usable_width_mm(self) -> float:
        return self.width_mm - 2 * self.margin_mm

    @property
    def usable_height_mm(self) -> float:
        return self.height_mm - 2 * self.margin_mm


def sheet(name: str) -> Sheet:
    w, h = SHEET_SIZES_MM[name]
    return Sheet(name, w, h)


def default_diameter_mm(name: str) -> float:
    """The largest mater, in whole 5 mm, that fits the sheet's short side
    inside the margins with room for the cut line and labels."""
    s = sheet(name)
    room = min(s.usable_width_mm, s.usable_height_mm) - 6.0
    return float(int(room // 5) * 5)

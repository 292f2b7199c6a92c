"""Paper sheets, their margins and the recipe's ``sheet`` value.

Named sizes, portrait, as the standards give them:

* ISO 216: A3 297 x 420 mm, A4 210 x 297 mm, A5 148 x 210 mm;
* ANSI/ASME Y14.1: Letter (ANSI A) 8.5 x 11 in, Tabloid (ANSI B) 11 x 17 in;
  Legal, 8.5 x 14 in, is the North American office size of the same family
  (common practice; it has no ANSI letter of its own).

A custom sheet is a mapping of its two sides in millimetres
(``{width_mm: 250, height_mm: 350}``) or in inches (``{width_in: 9,
height_in: 12}``).  Which way up a sheet is printed (portrait or landscape)
is chosen page by page by the layout, so a sheet is only its two sides.

The margin kept clear on every side stays out of the printer's unprintable
edge.  Office laser and inkjet printers leave 3 to 5 mm unprinted (common
practice, from printer data sheets seen over the years; from memory), so the
margin may not go below 6 mm; the default, 10 mm, also keeps room for marks
and for a little misfeed.
"""

from __future__ import annotations

from dataclasses import dataclass

from .errors import KeyedError, Message, bound, short_of, shown, typed

MM_PER_INCH = 25.4  # exact, by the 1959 international yard and pound agreement

#: (width_mm, height_mm) in portrait.
SHEET_SIZES_MM = {
    "a5": (148.0, 210.0),
    "a4": (210.0, 297.0),
    "a3": (297.0, 420.0),
    "letter": (8.5 * MM_PER_INCH, 11.0 * MM_PER_INCH),
    "legal": (8.5 * MM_PER_INCH, 14.0 * MM_PER_INCH),
    "tabloid": (11.0 * MM_PER_INCH, 17.0 * MM_PER_INCH),
}

#: Margin kept clear of the printer's unprintable edge, and its limits (mm).
DEFAULT_MARGIN_MM = 10.0
MIN_MARGIN_MM = 6.0
MAX_MARGIN_MM = 30.0

#: Room (mm) across the sheet, inside the margins, for the check bar and
#: the page number beside it.
MIN_USABLE_MM = 120.0
#: Limits on a custom sheet's sides (mm): the short side must hold the
#: 100 mm check bar and the page number inside the least margins (132 mm:
#: a US half-letter sheet, 5.5 x 8.5 in, is 139.7 mm across); the long side
#: stays within what roll plotters take (A0 is 841 x 1189 mm).
MIN_SIDE_MM = MIN_USABLE_MM + 2 * MIN_MARGIN_MM
MAX_SIDE_MM = 1500.0


class SheetError(KeyedError, ValueError):
    """A sheet value that cannot be used; the message is one line, a key
    of the templates' ``errors`` section and its values."""


@dataclass(frozen=True)
class Sheet:
    """A sheet of paper: its name, its two sides (mm, portrait) and the
    margin (mm) kept clear on every side."""

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


def _number(value, what: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or value != value \
            or value in (float("inf"), float("-inf")):
        raise SheetError("errors.sheet_side_not_number", key=what, value=shown(value))
    return float(value)


def parse_sheet(value):
    """The recipe's ``sheet`` value, checked: a sheet name (lower case) or
    a ``(width_mm, height_mm)`` pair for a custom sheet.  Raises
    :class:`SheetError` with a one-line message naming the sub-key."""
    names = list(SHEET_SIZES_MM)
    if isinstance(value, str):
        name = value.strip().lower()
        if name not in SHEET_SIZES_MM:
            raise SheetError("errors.sheet_unknown", value=shown(value), names=names)
        return name
    if not isinstance(value, dict):
        raise SheetError("errors.sheet_not_name_or_sides", names=names, value=shown(value))
    keys = set(value)
    for unit, factor in (("mm", 1.0), ("in", MM_PER_INCH)):
        wanted = {f"width_{unit}", f"height_{unit}"}
        if keys == wanted:
            sides = []
            for k in (f"width_{unit}", f"height_{unit}"):
                v = _number(value[k], k) * factor
                if not MIN_SIDE_MM - 1e-9 <= v <= MAX_SIDE_MM + 1e-9:
                    low, high = MIN_SIDE_MM / factor, MAX_SIDE_MM / factor
                    raise SheetError("errors.sheet_side_range", key=k, value=typed(value[k]), low=bound(low, "low"),
                                     high=bound(high, "high"), unit=unit)
                sides.append(v)
            return (sides[0], sides[1])
    unknown = sorted(str(k) for k in keys - {"width_mm", "height_mm", "width_in", "height_in"})
    if unknown:
        raise SheetError("errors.sheet_unknown_key", name=shown(unknown[0]))
    for unit in ("mm", "in"):
        if keys < {f"width_{unit}", f"height_{unit}"}:
            raise SheetError("errors.sheet_needs_both", unit=unit)
    raise SheetError("errors.sheet_one_unit")


def sheet_name(value) -> str:
    """A short name of the recipe's sheet value, for messages."""
    if isinstance(value, str):
        return value
    return f"{value[0]:g} x {value[1]:g} mm sheet"


def sheet_words(sheet: Sheet):
    """The sheet as a message names it: its name, or its sides in mm."""
    if sheet.name in SHEET_SIZES_MM:
        return sheet.name
    return Message("errors.sheet_custom", width=f"{sheet.width_mm:g}", height=f"{sheet.height_mm:g}")


def make_sheet(value, margin_mm: float = DEFAULT_MARGIN_MM) -> Sheet:
    """The :class:`Sheet` for a checked ``sheet`` value and margin.  Raises
    :class:`SheetError` when the margin leaves too little room."""
    if isinstance(value, str):
        w, h = SHEET_SIZES_MM[value]
        name = value
    else:
        w, h = value
        name = sheet_name(value)
    s = Sheet(name, float(min(w, h)), float(max(w, h)), float(margin_mm))
    if s.usable_width_mm < MIN_USABLE_MM - 1e-9:
        told = name if isinstance(value, str) else Message("errors.sheet_custom", width=f"{value[0]:g}",
                                                            height=f"{value[1]:g}")
        raise SheetError("errors.sheet_margin", key="'margin_mm'", margin=typed(margin_mm),
                         usable=short_of(s.usable_width_mm, MIN_USABLE_MM), sheet=told, needed=f"{MIN_USABLE_MM:g}")
    return s


def sheet(name: str, margin_mm: float = DEFAULT_MARGIN_MM) -> Sheet:
    """A named sheet (``a4``, ``letter`` ...)."""
    return make_sheet(name, margin_mm)


def parse_sheet_option(text: str):
    """A sheet given on the command line: a name (``a4``) or the two sides
    with their unit, ``250x350mm`` or ``9x12in``; checked as
    :func:`parse_sheet` checks a recipe's value."""
    t = text.strip().lower().replace(" ", "")
    for unit in ("mm", "in"):
        if t.endswith(unit) and "x" in t:
            w, _, h = t[: -len(unit)].partition("x")
            try:
                sides = {f"width_{unit}": float(w), f"height_{unit}": float(h)}
            except ValueError:
                break
            return parse_sheet(sides)
    if t and t[0].isdigit() or t.strip() not in SHEET_SIZES_MM:
        # the hint in command-line syntax (250x350mm), not the recipe's YAML
        raise SheetError("errors.sheet_option_unreadable", value=shown(text), names=list(SHEET_SIZES_MM))
    return parse_sheet(text)


# -- the printable area of a page ------------------------------------------------------------

#: Points to the millimetre: a point is 1/72 inch (PDF 32000-1:2008, 8.3.2.3),
#: an inch 25.4 mm.
PT_PER_MM = 72.0 / MM_PER_INCH
MM_PER_PT = MM_PER_INCH / 72.0
#: Height (mm) of the footer band above the bottom margin.
FOOTER_MM = 14.0
#: Space (mm) between parts, and between the parts and the footer: room for
#: the blade between two cut lines.
GAP_MM = 4.0
#: Length (mm) of the check bar printed on every page.
CHECK_BAR_MM = 100.0
#: The band (mm) kept above each part for its title.
TITLE_BAND_MM = 5.0


def page_size_mm(sheet: Sheet, landscape: bool, scale=(1.0, 1.0)) -> tuple[float, float]:
    """Width and height (mm) of the page as printed, times ``scale``."""
    w, h = sheet.width_mm, sheet.height_mm
    w, h = (h, w) if landscape else (w, h)
    return (w * scale[0], h * scale[1])


def content_area_mm(sheet: Sheet, landscape: bool, scale=(1.0, 1.0)) -> tuple[float, float, float, float]:
    """``(xmin, ymin, xmax, ymax)`` where parts may go: inside the margins,
    above the footer band and the gap over it."""
    w, h = page_size_mm(sheet, landscape, scale)
    m = sheet.margin_mm
    return (m, m + FOOTER_MM + GAP_MM, w - m, h - m)


def default_diameter_mm(sheet: Sheet, scale=(1.0, 1.0)) -> float:
    """The largest mater, in whole 5 mm from 80 to 600 mm, that fits one
    page of the sheet (printed at ``scale``) with its title and 3 mm to
    spare on each side (room for the cut line's ink and a little misfeed)."""
    room = 0.0
    for landscape in (False, True):
        x0, y0, x1, y1 = content_area_mm(sheet, landscape, scale)
        room = max(room, min(x1 - x0, y1 - y0 - TITLE_BAND_MM) - 6.0)
    return float(min(600, max(80, int(room // 5) * 5)))

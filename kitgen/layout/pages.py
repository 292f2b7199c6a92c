"""Pages of the kit: which part goes where on which sheet.

:func:`layout_kit` is a pure function of the kit.  The first page holds the
instructions; then come the pages printed on card, then the pages printed
on transparency film (a film page never carries a card part, so each sheet
goes through the printer on one material).

Packing is a first-fit shelf packing (the "first fit decreasing height"
rule for strip packing, Coffman, Garey, Johnson and Tarjan, SIAM J. Comput.
9, 1980), run over as many pages as needed: parts are taken longest first,
each goes on the first shelf of the first page where it fits, else on a new
shelf, else on a new page.  A long part may be turned a quarter turn where
that fits (or takes less height on a new shelf), in the direction that
keeps its words readable.  A new page is portrait unless
the part only fits in landscape.

Page coordinates: mm, origin at the bottom-left corner of the page as it
is printed (landscape pages turned), x to the right, y up.  Every page
keeps the sheet's margin clear and keeps a footer band above the bottom
margin for the check bar, the page number, the kit's title and the note of
the material.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from ..errors import UserError
from ..geometry.model import Part
from .sheets import Sheet, sheet as sheet_named

#: Height (mm) of the footer band above the bottom margin.
FOOTER_MM = 14.0
#: Space (mm) between parts, and between the parts and the footer: room for
#: the blade between two cut lines.
GAP_MM = 4.0
#: Size (pt) of the part titles printed above each part, and the band (mm)
#: kept for them.
TITLE_PT = 8.0
TITLE_BAND_MM = 5.0
#: A generous estimate of the advance of one character, in em, for the
#: width kept for a title (DejaVu Sans Bold averages below 0.65 em for Latin
#: text; from its metrics).
TITLE_EM_PER_CHAR = 0.65
#: Length (mm) of the check bar printed on every page.
CHECK_BAR_MM = 100.0
#: Where the check bar sits: its left end and height (mm) from the
#: bottom-left corner of the printable area.
CHECK_BAR_RISE_MM = 3.0
#: A part is "long", and may be turned, when one side is this many times
#: the other.
LONG_RATIO = 1.5

PT_PER_MM = 72.0 / 25.4


@dataclass(frozen=True)
class Placement:
    """A part on a page: its pin at ``(x_mm, y_mm)`` (page coordinates),
    turned ``rotation_deg`` counter-clockwise about the pin."""

    part: Part
    x_mm: float
    y_mm: float
    rotation_deg: float

    @property
    def box_mm(self) -> tuple[float, float, float, float]:
        """The part's bounds on the page ``(xmin, ymin, xmax, ymax)``."""
        x0, y0, x1, y1 = turned_bounds(self.part.bounds_mm, self.rotation_deg)
        return (x0 + self.x_mm, y0 + self.y_mm, x1 + self.x_mm, y1 + self.y_mm)

    @property
    def title_at_mm(self) -> tuple[float, float]:
        """Start of the baseline of the part's title, above its box."""
        x0, _, _, y1 = self.box_mm
        return (x0, y1 + 0.3 * TITLE_BAND_MM)


@dataclass(frozen=True)
class Page:
    number: int
    total: int
    kind: str  # "instructions", "card" or "film"
    sheet: Sheet
    landscape: bool
    placements: tuple[Placement, ...]

    @property
    def width_mm(self) -> float:
        return page_size_mm(self.sheet, self.landscape)[0]

    @property
    def height_mm(self) -> float:
        return page_size_mm(self.sheet, self.landscape)[1]


def page_size_mm(sheet: Sheet, landscape: bool) -> tuple[float, float]:
    """Width and height (mm) of the page as printed."""
    w, h = sheet.width_mm, sheet.height_mm
    return (h, w) if landscape else (w, h)


def content_area_mm(sheet: Sheet, landscape: bool) -> tuple[float, float, float, float]:
    """``(xmin, ymin, xmax, ymax)`` where parts may go: inside the margins,
    above the footer band and the gap over it."""
    w, h = page_size_mm(sheet, landscape)
    m = sheet.margin_mm
    return (m, m + FOOTER_MM + GAP_MM, w - m, h - m)


def check_bar_mm(page: Page) -> tuple[tuple[float, float], tuple[float, float]]:
    """The two ends (mm, page coordinates) of the page's check bar, exactly
    :data:`CHECK_BAR_MM` apart, in the footer band."""
    m = page.sheet.margin_mm
    y = m + CHECK_BAR_RISE_MM
    return ((m, y), (m + CHECK_BAR_MM, y))


def turned_bounds(bounds_mm, rotation_deg: float) -> tuple[float, float, float, float]:
    """Bounds of a part turned about its pin by a multiple of 90 degrees."""
    x0, y0, x1, y1 = bounds_mm
    quarter = int(round(rotation_deg / 90.0)) % 4
    if quarter == 0:
        return (x0, y0, x1, y1)
    if quarter == 1:   # (x, y) -> (-y, x)
        return (-y1, x0, -y0, x1)
    if quarter == 2:
        return (-x1, -y1, -x0, -y0)
    return (y0, -x1, y1, -x0)   # (x, y) -> (y, -x)


def title_width_mm(title: str) -> float:
    """Width (mm) kept for a part's title: a generous estimate from the
    number of characters, so layout needs no font file."""
    return len(title) * TITLE_EM_PER_CHAR * TITLE_PT / PT_PER_MM


# -- packing ------------------------------------------------------------------

@dataclass
class _Shelf:
    top_mm: float        # from the top of the content area, downwards
    height_mm: float
    used_mm: float = 0.0
    items: list = field(default_factory=list)  # (part, rotation_deg, x_mm, box_w_mm, box_h_mm)


@dataclass
class _Bin:
    landscape: bool
    width_mm: float
    height_mm: float
    shelves: list


def _box(part: Part, rotation_deg: float) -> tuple[float, float]:
    """Width and height (mm) a part takes on a shelf, its title included."""
    x0, y0, x1, y1 = turned_bounds(part.bounds_mm, rotation_deg)
    return (max(x1 - x0, title_width_mm(part.title)), (y1 - y0) + TITLE_BAND_MM)


def reading_turn_deg(part: Part) -> float:
    """The quarter turn (90 or 270 degrees ccw) that leaves a part's text
    most readable: upright best, read from the bottom up next, never
    upside down where the other turn avoids it."""
    angles = [math.radians(e.geom["angle_deg"]) for e in part.elements if e.shape == "text"]

    def score(turn_deg: float) -> float:
        t = math.radians(turn_deg)
        return round(sum(math.cos(a + t) + 0.5 * math.sin(a + t) for a in angles), 9)

    return max((90.0, 270.0), key=lambda turn: (score(turn), -turn))


def _turns(part: Part) -> tuple[float, ...]:
    w, h = part.width_mm, part.height_mm
    return (0.0, reading_turn_deg(part)) if max(w, h) >= LONG_RATIO * min(w, h) else (0.0,)


def _area(sheet: Sheet, landscape: bool) -> tuple[float, float]:
    x0, y0, x1, y1 = content_area_mm(sheet, landscape)
    return (x1 - x0, y1 - y0)


def _on_shelf(b: _Bin, part: Part) -> bool:
    for shelf in b.shelves:
        for rot in _turns(part):
            w, h = _box(part, rot)
            x = shelf.used_mm + (GAP_MM if shelf.items else 0.0)
            if h <= shelf.height_mm + 1e-9 and x + w <= b.width_mm + 1e-9:
                shelf.items.append((part, rot, x, w, h))
                shelf.used_mm = x + w
                return True
    return False


def _new_shelf(b: _Bin, part: Part) -> bool:
    top = 0.0
    if b.shelves:
        last = b.shelves[-1]
        top = last.top_mm + last.height_mm + GAP_MM
    fits = []
    for rot in _turns(part):
        w, h = _box(part, rot)
        if w <= b.width_mm + 1e-9 and top + h <= b.height_mm + 1e-9:
            fits.append((h, rot, w))
    if not fits:
        return False
    h, rot, w = min(fits)
    b.shelves.append(_Shelf(top, h, w, [(part, rot, 0.0, w, h)]))
    return True


def _pack(parts: list[Part], sheet: Sheet, order: dict[str, int]) -> list[_Bin]:
    items = sorted(parts, key=lambda p: (-max(p.width_mm, p.height_mm), order[p.kind]))
    bins: list[_Bin] = []
    for part in items:
        if any(_on_shelf(b, part) or _new_shelf(b, part) for b in bins):
            continue
        for landscape in (False, True):
            b = _Bin(landscape, *_area(sheet, landscape), [])
            if _new_shelf(b, part):
                bins.append(b)
                break
        else:
            raise UserError(f"the {part.kind} ({part.width_mm:.0f} x {part.height_mm:.0f} mm) does not fit "
                            f"on the {sheet.name} sheet; choose a larger sheet or a smaller diameter_mm")
    return bins


def _placements(b: _Bin, sheet: Sheet, order: dict[str, int]) -> tuple[Placement, ...]:
    """Page positions of a bin's parts; each shelf centred across the page."""
    ax0, _, _, ay1 = content_area_mm(sheet, b.landscape)
    out = []
    for shelf in b.shelves:
        left = ax0 + (b.width_mm - shelf.used_mm) / 2.0
        for part, rot, x, w, h in shelf.items:
            bx0, by0, bx1, by1 = turned_bounds(part.bounds_mm, rot)
            box_left = left + x
            box_top = ay1 - shelf.top_mm - TITLE_BAND_MM
            out.append(Placement(part, box_left - bx0, box_top - by1, rot))
    return tuple(sorted(out, key=lambda p: order[p.part.kind]))


def layout_kit(kit) -> tuple[Page, ...]:
    """The kit's pages in print order: instructions, card pages, film pages."""
    sh = sheet_named(kit.recipe.sheet)
    order = {p.kind: i for i, p in enumerate(kit.parts)}
    drafts: list[tuple[str, bool, tuple[Placement, ...]]] = [("instructions", False, ())]
    for material in ("card", "film"):
        parts = [p for p in kit.parts if p.material == material]
        pages = [(b.landscape, _placements(b, sh, order)) for b in _pack(parts, sh, order)]
        pages.sort(key=lambda lp: min(order[p.part.kind] for p in lp[1]))
        drafts += [(material, landscape, placed) for landscape, placed in pages]
    total = len(drafts)
    return tuple(Page(k, total, kind, sh, landscape, placed)
                 for k, (kind, landscape, placed) in enumerate(drafts, start=1))

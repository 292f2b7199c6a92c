"""Pages of the kit: which part, or piece of a part, goes where on which sheet.

:func:`layout_kit` is a pure function of the kit.  The first page holds the
instructions; then come the pages printed on card, then the pages printed
on transparency film.  A film page never carries a card part, so each sheet
goes through the printer on one material.

A part that fits a page is placed whole; a larger one is cut into
overlapping pieces (:mod:`kitgen.layout.tiling`).  Parts and pieces are then
packed onto as few pages as possible (:mod:`kitgen.layout.packing`), each
page portrait or landscape as fits best.  A long part (the rule, the
alidade) may be turned a quarter turn, in the direction that keeps its
words readable.

Page coordinates: mm as the print will measure them, origin at the
bottom-left corner of the page as it reads (landscape pages turned; a film
page as it reads once the film is turned over), x to the right, y up.  When
the recipe gives a ``print_scale`` the page is the sheet times that scale
(the area the printer really puts the page on); the PDF renderer draws it
at 1 / scale so that the print measures true.  Every page keeps the sheet's
margin clear and keeps a footer band above the bottom margin for the check
bar, the page number, the kit's title and the note of the material.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from itertools import product

from ..errors import UserError
from ..geometry.model import Part
from ..kept import kept_for
from .instructions import story
from .packing import Box, Packer, extent, place
from ..paper import CHECK_BAR_MM, GAP_MM, PT_PER_MM, TITLE_BAND_MM, Sheet, content_area_mm, page_size_mm, sheet_words
from .paragraphs import TextOverflow, set_page, split_blocks
from .seams import keep_clear
from .tiling import MARK_CLEAR_MM, PIECE_BAND_MM, Piece, outside_box, tile

#: Size (pt) of the part titles printed above each part (the band kept for
#: them is kitgen.paper.TITLE_BAND_MM).
TITLE_PT = 8.0
#: A generous estimate of the advance of one character, in em, for the
#: width kept for a title (DejaVu Sans Bold averages below 0.65 em for Latin
#: text; from its metrics).
TITLE_EM_PER_CHAR = 0.65
#: Size (pt) of a piece's name in its band, and the largest cell (mm) of
#: the assembly map beside it.
PIECE_LABEL_PT = 7.0
MAP_CELL_MM = 3.0
MAP_HEIGHT_MM = 6.5
#: Where the check bar sits: its left end and height (mm) from the
#: bottom-left corner of the printable area.
CHECK_BAR_RISE_MM = 3.0
#: A part is "long", and may be turned, when one side is this many times
#: the other.
LONG_RATIO = 1.5
#: Duplex registration marks: inset (mm) from the corners of the content
#: area, and the room (mm) they keep from the mater.
REGISTRATION_INSET_MM = 8.0
REGISTRATION_CLEAR_MM = 8.0
#: Half the size (mm) of a registration mark as drawn (the front's scales
#: 5 mm, the back's cross 6 mm: kitgen.render.pdf_marks), kept clear of
#: the parts' titles (#9: no line over a word).
REGISTRATION_REACH_MM = 6.0


@dataclass(frozen=True)
class Placement:
    """A part on a page: its pin at ``(x_mm, y_mm)`` (page coordinates),
    turned ``rotation_deg`` counter-clockwise about the pin.  A ``piece``
    shows only its window of the part."""

    part: Part
    x_mm: float
    y_mm: float
    rotation_deg: float
    piece: Piece | None = None
    #: The kit's words run right to left: the band above the box is set
    #: from its right end (its title, a piece's name and map), where a
    #: reader of Arabic begins (common practice of right-to-left print).
    rtl: bool = False

    @property
    def box_mm(self) -> tuple[float, float, float, float]:
        """What the placement shows, on the page ``(xmin, ymin, xmax, ymax)``:
        the part's bounds, or the piece's window."""
        if self.piece is not None:
            x0, y0, x1, y1 = self.piece.window_mm
        else:
            x0, y0, x1, y1 = turned_bounds(self.part.bounds_mm, self.rotation_deg)
        return (x0 + self.x_mm, y0 + self.y_mm, x1 + self.x_mm, y1 + self.y_mm)

    @property
    def band_mm(self) -> float:
        """Height (mm) of the band above the box for the title (and, for a
        piece, its name and map)."""
        return PIECE_BAND_MM if self.piece is not None else TITLE_BAND_MM

    @property
    def title_at_mm(self) -> tuple[float, float]:
        """Where the baseline of the part's title, above its box, is set
        from: its left end, or with ``rtl`` its right end (:meth:`band_end_mm`)."""
        x0, _, _, y1 = self.box_mm
        x = self.band_end_mm(title_width_mm(self.part.title)) if self.rtl else x0
        if self.piece is not None:
            return (x, y1 + PIECE_BAND_MM - 3.5)
        return (x, y1 + 0.3 * TITLE_BAND_MM)

    @property
    def piece_label_at_mm(self) -> tuple[float, float]:
        """Start of the baseline of a piece's name, under its title (with
        ``rtl``, the band's end that kitgen.render.pdf_marks works out
        from the name's width is its right end)."""
        x0, _, _, y1 = self.box_mm
        return (x0, y1 + 1.5)

    def band_end_mm(self, width_mm: float) -> float:
        """The right end of the band above the box for words ``width_mm``
        wide set from its left end: the box's right side, or their end
        where they run beyond it (the packing keeps that width free)."""
        x0, _, x1, _ = self.box_mm
        return max(x1, x0 + width_mm)

    def title_span_mm(self) -> tuple[float, float]:
        """Left and right ends (page x, mm) of the room the title may take."""
        tx, _ = self.title_at_mm
        w = title_width_mm(self.part.title)
        return (tx - w, tx) if self.rtl else (tx, tx + w)

    def to_page(self, x_mm: float, y_mm: float) -> tuple[float, float]:
        """Page coordinates of the point ``(x, y)`` of the part."""
        a = math.radians(self.rotation_deg)
        c, s = _exact_cos_sin(a, self.rotation_deg)
        return (self.x_mm + c * x_mm - s * y_mm, self.y_mm + s * x_mm + c * y_mm)


def _exact_cos_sin(a: float, deg: float) -> tuple[float, float]:
    quarter = deg / 90.0
    if abs(quarter - round(quarter)) < 1e-12:
        return ((1.0, 0.0), (0.0, 1.0), (-1.0, 0.0), (0.0, -1.0))[int(round(quarter)) % 4]
    return (math.cos(a), math.sin(a))


@dataclass(frozen=True)
class Mark:
    """A page mark that belongs to no part: ``duplex_front`` (the scales
    read on the mater's front) or ``duplex_back`` (the cross printed behind
    them), centred at ``(x_mm, y_mm)``."""

    kind: str
    x_mm: float
    y_mm: float


@dataclass(frozen=True)
class Page:
    """One printed page: its number among ``total``, its kind and sheet, the
    parts placed on it (and, for instructions, its set lines), with the
    marks, mirroring and print-scale correction it is drawn with."""

    number: int
    total: int
    kind: str  # "instructions", "card" or "film"
    sheet: Sheet
    landscape: bool
    placements: tuple[Placement, ...]
    mirrored: bool = False
    print_scale: tuple[float, float] = (1.0, 1.0)
    marks: tuple[Mark, ...] = ()
    duplex: str = ""  # "front" or "back" of a duplex pair
    #: An instructions page's text, set (kitgen.layout.paragraphs.SetLine).
    lines: tuple = ()
    #: An instructions page's pictures, set (kitgen.layout.paragraphs.SetFigure).
    figures: tuple = ()

    @property
    def width_mm(self) -> float:
        return page_size_mm(self.sheet, self.landscape, self.print_scale)[0]

    @property
    def height_mm(self) -> float:
        return page_size_mm(self.sheet, self.landscape, self.print_scale)[1]

    @property
    def media_mm(self) -> tuple[float, float]:
        """The sheet as the PDF's page (mm): width and height as printed."""
        return page_size_mm(self.sheet, self.landscape)


def page_content_mm(page: Page) -> tuple[float, float, float, float]:
    return content_area_mm(page.sheet, page.landscape, page.print_scale)


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


def title_width_mm(title: str, size_pt: float = TITLE_PT) -> float:
    """Width (mm) kept for a title: a generous estimate from the number of
    characters, so layout needs no font file."""
    return len(title) * TITLE_EM_PER_CHAR * size_pt / PT_PER_MM


def map_cell_mm(piece: Piece) -> float:
    """Side (mm) of one cell of a piece's assembly map."""
    return min(MAP_CELL_MM, MAP_HEIGHT_MM / piece.rows, 30.0 / piece.columns)


def piece_label_width_mm(label: str, piece: Piece) -> float:
    """Width (mm) of a piece's name and its map, side by side."""
    return title_width_mm(label, PIECE_LABEL_PT) + 2.0 + map_cell_mm(piece) * piece.columns


# -- what to pack ------------------------------------------------------------------

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


@dataclass(frozen=True)
class _Item:
    """A whole part (``piece`` None) or one piece, with the ways it may lie:
    ``(box_w, box_h, rotation_deg)``, title band included."""

    part: Part
    options: tuple[tuple[float, float, float], ...]
    piece: Piece | None = None
    label: str = ""


def _whole_item(part: Part, areas) -> _Item | None:
    options = []
    for rot in _turns(part):
        x0, y0, x1, y1 = turned_bounds(part.bounds_mm, rot)
        w, h = max(x1 - x0, title_width_mm(part.title)), (y1 - y0) + TITLE_BAND_MM
        if any(w <= aw + 1e-9 and h <= ah + 1e-9 for aw, ah in areas):
            options.append((w, h, rot))
    return _Item(part, tuple(options)) if options else None


def outside_part(part: Part, rotation_deg: float):
    """The ``outside(x, y, r)`` test of :func:`kitgen.layout.tiling.tile`
    for a part turned ``rotation_deg``: beyond the rim of a round part (its
    cut circle about the pin that reaches its box) by MARK_CLEAR_MM, else
    outside its box."""
    box = turned_bounds(part.bounds_mm, rotation_deg)
    reach = max(abs(v) for v in box)
    rims = [e.geom["radius"] for e in part.elements if e.shape == "circle" and e.stroke == "cut"
            and max(abs(c) for c in e.geom["center"]) < 1e-9 and e.geom["radius"] >= reach - 1e-6]
    if not rims:
        return outside_box(box)
    rim = max(rims) + MARK_CLEAR_MM
    return lambda x, y, r: math.hypot(x, y) - r > rim


def _tilings(part: Part, areas, words) -> list[tuple[_Item, ...]]:
    """For each way the part may be turned, its fewest pieces (over the page
    orientations), as items to pack."""
    out = []
    for rot in _turns(part):
        ext = turned_bounds(part.bounds_mm, rot)
        clear = keep_clear(part, rot, words)
        best = None
        for aw, ah in areas:
            pieces = tile(ext, aw, ah - PIECE_BAND_MM, outside=outside_part(part, rot), keep_clear=clear)
            area = sum(p.width_mm * p.height_mm for p in pieces)
            if best is None or (len(pieces), area) < (len(best), sum(p.width_mm * p.height_mm for p in best)):
                best = pieces
        items = []
        for piece in best:
            label = words("tile.piece", name=piece.name, count=piece.count)
            w = max(piece.width_mm, title_width_mm(part.title), piece_label_width_mm(label, piece))
            items.append(_Item(part, ((w, piece.height_mm + PIECE_BAND_MM, rot),), piece, label))
        out.append(tuple(items))
    return out


def _candidates(parts, areas, words) -> list[list[_Item]]:
    """Every combination of the ways the tiled parts may be turned."""
    choices = []
    for part in parts:
        whole = _whole_item(part, areas)
        choices.append([(whole,)] if whole is not None else _tilings(part, areas, words))
    return [[item for group in combo for item in group] for combo in product(*choices)]


def _areas(sheet: Sheet, scale) -> list[tuple[float, float]]:
    out = []
    for landscape in (False, True):
        x0, y0, x1, y1 = content_area_mm(sheet, landscape, scale)
        out.append((x1 - x0, y1 - y0))
    return out


def _pack(items: list[_Item], sheet: Sheet, scale, rtl: bool = False) -> list[tuple[bool, tuple[Placement, ...]]]:
    areas = _areas(sheet, scale)
    packer = Packer([Box(it.options) for it in items], areas, GAP_MM)
    pages = []
    for members in packer.pack():
        area_index, (_, _, tree) = packer.fitting(members)
        landscape = area_index == 1
        ax0, _, ax1, ay1 = content_area_mm(sheet, landscape, scale)
        spots: list = []
        sizes = lambda i, k: items[i].options[k][:2]  # noqa: E731
        _, used_h = extent(tree, sizes, GAP_MM)
        place(tree, ax0, 0.0, ax1 - ax0, used_h, GAP_MM, sizes, spots)
        placed = []
        for i, k, left, top in spots:
            it = items[i]
            w, h, rot = it.options[k]
            if it.piece is not None:
                bx0, by0, bx1, by1 = it.piece.window_mm
                band = PIECE_BAND_MM
            else:
                bx0, by0, bx1, by1 = turned_bounds(it.part.bounds_mm, rot)
                band = TITLE_BAND_MM
            box_top = ay1 - top - band
            placed.append(Placement(it.part, left - bx0, box_top - by1, rot, it.piece, rtl))
        pages.append((landscape, tuple(placed)))
    return pages


def _order_key(order):
    def key(pl: Placement):
        piece = pl.piece
        return (order[pl.part.id], piece.row if piece else 0, piece.column if piece else 0)
    return key


def _layout_material(parts, sheet, scale, order, words):
    """Placements of one material's parts, on the fewest pages found."""
    if not parts:
        return []
    try:
        candidates = _candidates(parts, _areas(sheet, scale), words)
    except ValueError:
        raise UserError("errors.tile_sheet_too_small", sheet=sheet_words(sheet)) from None
    best = None
    for items in candidates:
        pages = _pack(items, sheet, scale, words.rtl)
        if best is None or len(pages) < len(best):
            best = pages
    key = _order_key(order)
    best = [(landscape, tuple(sorted(placed, key=key))) for landscape, placed in best]
    best.sort(key=lambda lp: key(lp[1][0]))
    return best


# -- duplex ---------------------------------------------------------------------------

def _duplex_pages(front: Part, back: Part, sheet: Sheet, scale, mode: str, rtl: bool = False):
    """The mater's front and back on the two sides of one sheet.

    Turned over about its long edge (portrait), a sheet's point (x, y) lies
    behind (W - x, y) of the back page as it reads; about its short edge,
    behind (x, H - y).  The mater's back, seen from behind, is its front
    turned about the vertical axis: its point (x, y) lies behind the
    front's (-x, y).  So the back's pin goes at the mirror of the front's
    pin, upright for the long edge and turned half a turn for the short."""
    w, h = page_size_mm(sheet, False, scale)
    ax0, ay0, ax1, ay1 = content_area_mm(sheet, False, scale)
    cx, cy = w / 2.0, h / 2.0
    r = max(front.bounds_mm[2], -front.bounds_mm[0], front.bounds_mm[3], -front.bounds_mm[1])
    title_w = max(title_width_mm(front.title), title_width_mm(back.title))
    if (2 * r > ax1 - ax0 + 1e-9 or cy - r < ay0 - 1e-9 or cy + r + TITLE_BAND_MM > ay1 + 1e-9
            or cx - r + title_w > ax1):
        raise UserError("errors.duplex_mater", sheet=sheet_words(sheet))
    if mode == "long_edge":
        bx, by, rot = w - cx, cy, 0.0
    else:
        bx, by, rot = cx, h - cy, 180.0
    # The marks go near the corners of the content area, where both a mark
    # and its mirror image on the other side keep clear of the margins and
    # the footer, and of both parts' titles.
    i = REGISTRATION_INSET_MM
    xs = (max(ax0 + i, w - ax1 + i), min(ax1 - i, w - ax0 - i))
    ys = (max(ay0 + i, h - ay1 + i), min(ay1 - i, h - ay0 - i))
    on_front, on_back = Placement(front, cx, cy, 0.0, rtl=rtl), Placement(back, bx, by, rot, rtl=rtl)

    def behind(x, y):
        return (w - x, y) if mode == "long_edge" else (x, h - y)

    def clear_of_title(placement, x, y):
        (left, right), (_, ty) = placement.title_span_mm(), placement.title_at_mm
        q = REGISTRATION_REACH_MM
        return (x + q <= left or x - q >= right
                or y + q <= ty - 0.3 * TITLE_PT / PT_PER_MM or y - q >= ty + TITLE_PT / PT_PER_MM)

    fronts = []
    for x in xs:
        for y in ys:
            if (math.hypot(x - cx, y - cy) >= r + REGISTRATION_CLEAR_MM and clear_of_title(on_front, x, y)
                    and clear_of_title(on_back, *behind(x, y))):
                fronts.append((x, y))
    backs = [behind(x, y) for x, y in fronts]
    return ((on_front, tuple(Mark("duplex_front", x, y) for x, y in fronts)),
            (on_back, tuple(Mark("duplex_back", x, y) for x, y in backs)))


# -- the kit ----------------------------------------------------------------------------

def layout_kit(kit, instruction_pages: int | None = None) -> tuple[Page, ...]:
    """The kit's pages in print order: instructions, card pages (the duplex
    pair first), film pages.  The instructions are set here on as few pages
    as their words need at no less than :data:`paragraphs.MIN_BODY_PT`
    (more on small sheets and in long-worded languages, up to
    :data:`MAX_INSTRUCTION_PAGES`), or on exactly ``instruction_pages``;
    :class:`paragraphs.TextOverflow` when they do not fit."""
    if kit.nameless is not None and not instruction_pages:
        pages = _same_pages(kit, _nameless_pages(kit.nameless))
        if pages is not None:
            return pages
    counts = [instruction_pages] if instruction_pages else range(1, MAX_INSTRUCTION_PAGES + 1)
    parts = _part_drafts(kit)   # laid out once, whatever the instructions take
    for n in counts:
        pages = _draft_pages(kit, n, parts)
        split = instructions_split(kit, pages)
        if split is not None:
            return _with_instructions(kit, pages, split)
    raise TextOverflow(f"the instructions need more than {counts[-1]} page(s)")


#: The most pages the instructions may take.
MAX_INSTRUCTION_PAGES = 16

#: The pages of the last few kits drawn without an owner's name, by the
#: kit's identity: (kit, pages).  A class set's pupils of one school
#: share them (#12).
_NAMELESS_PAGES: dict[int, tuple] = {}


def _nameless_pages(nameless) -> tuple[Page, ...]:
    return kept_for(_NAMELESS_PAGES, nameless, lambda: layout_kit(nameless), 4)


def shared_pages(kit, pages) -> tuple[Page, ...] | None:
    """The nameless kit's pages when ``pages`` are those pages with the
    named kit's parts (as :func:`layout_kit` lays a named kit out), else
    None."""
    if kit.nameless is None:
        return None
    shared = _nameless_pages(kit.nameless)
    return shared if _same_pages(kit, shared) == tuple(pages) else None


def _same_pages(kit, pages) -> tuple[Page, ...] | None:
    """``pages`` with each placed part swapped for ``kit``'s part of the
    same id, or None when a part's bounds differ (then the kit is laid
    out afresh)."""
    by_id = {p.id: p for p in kit.parts}
    out = []
    for page in pages:
        placements = []
        for pl in page.placements:
            part = by_id.get(pl.part.id)
            if part is None or part.bounds_mm != pl.part.bounds_mm or part.material != pl.part.material:
                return None
            placements.append(replace(pl, part=part))
        out.append(replace(page, placements=tuple(placements)))
    if {pl.part.id for page in pages for pl in page.placements} != set(by_id):
        return None
    return tuple(out)


def instructions_split(kit, pages):
    """``(size_pt, chunks)`` of the instructions on the pages' instruction
    pages (:func:`kitgen.layout.paragraphs.split_blocks`), or ``None`` when
    they need more pages."""
    mine = [p for p in pages if p.kind == "instructions"]
    x0, y0, x1, y1 = page_content_mm(mine[0])
    return split_blocks(story(kit, pages), (x1 - x0) * PT_PER_MM, (y1 - y0) * PT_PER_MM, kit.words, len(mine))


def _with_instructions(kit, pages, split) -> tuple[Page, ...]:
    size, chunks = split
    out, k = [], 0
    for page in pages:
        if page.kind == "instructions":
            chunk = chunks[k] if k < len(chunks) else []
            lines, figures = set_page(chunk, page_content_mm(page), kit.words, size)
            page = replace(page, lines=lines, figures=figures)
            k += 1
        out.append(page)
    return tuple(out)


def _draft_pages(kit, instruction_pages: int, parts: list[tuple] | None = None) -> tuple[Page, ...]:
    """The pages with ``instruction_pages`` pages kept for the instructions,
    then the parts' pages (``parts``, :func:`_part_drafts`, laid out here
    where not given)."""
    printing = kit.plan.printing
    if parts is None:
        parts = _part_drafts(kit)
    # (kind, landscape, placements, marks, duplex side)
    drafts: list[tuple] = [("instructions", False, (), (), "")] * max(1, int(instruction_pages)) + parts
    total = len(drafts)
    return tuple(Page(k, total, kind, printing.sheet, landscape, placed, kind == "film" and printing.film_mirror,
                      tuple(printing.print_scale), marks, side)
                 for k, (kind, landscape, placed, marks, side) in enumerate(drafts, start=1))


def _part_drafts(kit) -> list[tuple]:
    """The card pages (the duplex pair first) and the film pages, each as
    (kind, landscape, placements, marks, duplex side)."""
    printing = kit.plan.printing
    sh = printing.sheet
    scale = tuple(printing.print_scale)
    order = {p.id: i for i, p in enumerate(kit.parts)}
    drafts: list[tuple] = []
    card = [p for p in kit.parts if p.material == "card"]
    kinds = {p.kind for p in card}
    if printing.duplex != "none" and not {"mater_front", "mater_back"} <= kinds:
        raise UserError("errors.duplex_parts")
    if printing.duplex != "none":
        front, back = kit.part("mater_front"), kit.part("mater_back")
        (fp, fm), (bp, bm) = _duplex_pages(front, back, sh, scale, printing.duplex, kit.words.rtl)
        drafts += [("card", False, (fp,), fm, "front"), ("card", False, (bp,), bm, "back")]
        card = [p for p in card if p.kind not in ("mater_front", "mater_back")]
    for landscape, placed in _layout_material(card, sh, scale, order, kit.words):
        drafts.append(("card", landscape, placed, (), ""))
    film = [p for p in kit.parts if p.material == "film"]
    for landscape, placed in _layout_material(film, sh, scale, order, kit.words):
        drafts.append(("film", landscape, placed, (), ""))
    return drafts



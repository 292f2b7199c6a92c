"""A 400 mm kit on A4: its pieces, laid over each other as their marks
say, draw exactly the part that a sheet large enough prints whole.

Both PDFs are read back with pypdf and followed by the PDF specification's
transformation rules (ISO 32000-1:2008, 8.3 and 8.4; see pdf_paths.py):
every point a piece draws inside what is left of it after trimming is
compared with the whole part's drawing, after moving the piece only by the
shift that sets its alignment marks on its neighbour's.
"""

from __future__ import annotations

import math

import pytest

pypdf = pytest.importorskip("pypdf")

from kitgen.layout.pages import outside_part, turned_bounds  # noqa: E402
from kitgen.layout.tiling import MARK_BAND_MM, MARK_HALF_MM, OVERLAP_MM, PIN_CLEAR_MM, SEAM_SLIDE_MM  # noqa: E402

from .pdf_paths import mul  # noqa: E402
from .printed import PrintedKit  # noqa: E402

PT_PER_MM = 72.0 / 25.4   # PDF 32000-1:2008, 8.3.2.3: 1/72 in; 25.4 mm an inch
TOL_MM = 2e-3             # reportlab writes coordinates to 1e-4 pt (3.5e-5 mm)

RECIPE = "latitude: 52.2\nepoch: 2027\ntitle: Larkspur Valley School\ndiameter_mm: 400\nsheet: {sheet}\n"


class Printed(PrintedKit):
    def __init__(self, sheet: str):
        super().__init__(RECIPE.format(sheet=sheet))
        self.drawn = [paths for paths, _ in self.read]


@pytest.fixture(scope="module")
def tiled():
    return Printed("a4")


@pytest.fixture(scope="module")
def whole():
    return Printed("{width_mm: 1000, height_mm: 1000}")


def _placement_ctm(pl):
    """reportlab's translate then rotate (8.3.4: each cm premultiplies)."""
    a = math.radians(pl.rotation_deg)
    c, s = round(math.cos(a), 12), round(math.sin(a), 12)
    return mul((c, s, -s, c, 0.0, 0.0), (1.0, 0.0, 0.0, 1.0, pl.x_mm * PT_PER_MM, pl.y_mm * PT_PER_MM))


def _same(m, n, tol=1e-3):
    return all(abs(a - b) <= tol for a, b in zip(m, n))


def part_paths(printed, page_index, pl):
    """The paths drawn in the placement's own frame (the part's frame, in
    pt): those painted under exactly the placement's transform."""
    ctm = _placement_ctm(pl)
    return [p for p in printed.drawn[page_index] if not p.clip and _same(p.ctm, ctm)]


def _key(x_mm, y_mm):
    return (round(x_mm / TOL_MM), round(y_mm / TOL_MM))


class Points:
    """A set of points (mm) that answers "is there one within TOL_MM?"."""

    def __init__(self, pts=()):
        self.cells = {}
        for p in pts:
            self.add(*p)

    def add(self, x, y):
        self.cells.setdefault(_key(x, y), []).append((x, y))

    def __contains__(self, p):
        kx, ky = _key(*p)
        return any(math.hypot(x - p[0], y - p[1]) <= TOL_MM
                   for dx in (-1, 0, 1) for dy in (-1, 0, 1) for x, y in self.cells.get((kx + dx, ky + dy), ()))

    def __iter__(self):
        for pts in self.cells.values():
            yield from pts


def _turn(x, y, deg):
    a = math.radians(deg)
    c, s = round(math.cos(a), 12), round(math.sin(a), 12)
    return (c * x - s * y, s * x + c * y)


def pieces_of(printed, kind):
    out = []
    for k, page in enumerate(printed.pages):
        for pl in page.placements:
            if pl.part.kind == kind and pl.piece is not None:
                out.append((k, pl))
    return out


TILED_KINDS = ("mater_front", "mater_back", "plate", "rete", "alidade")


def test_the_large_parts_are_tiled_and_every_piece_fits_its_page(tiled):
    for kind in TILED_KINDS:
        pieces = pieces_of(tiled, kind)
        assert len(pieces) >= 2, kind
        first = pieces[0][1].piece
        assert len(pieces) == first.count == first.rows * first.columns
        assert sorted(pl.piece.name for _, pl in pieces) == sorted({pl.piece.name for _, pl in pieces})
    for page in tiled.pages:
        for pl in page.placements:
            x0, y0, x1, y1 = pl.box_mm
            m = page.sheet.margin_mm
            assert m - 1e-9 <= x0 and x1 <= page.width_mm - m + 1e-9
            assert y1 + pl.band_mm <= page.height_mm - m + 1e-9


def test_neighbours_overlap_and_share_their_marks(tiled):
    """Neighbours overlap by the stated overlap; their seam lies in the
    overlap, off its middle by at most SEAM_SLIDE_MM (towards the piece
    laid over it, towards the piece under it), and every piece's alignment
    marks lie, whole diamonds, inside its window (none pokes into the band
    with the piece's name above it); the marks on their seam are
    at the same point of the part on both, on the seam; every piece but
    A1 shares marks with a piece laid before it; and no seam runs within
    PIN_CLEAR_MM of the pin."""
    for kind in TILED_KINDS:
        pieces = {(pl.piece.column, pl.piece.row): pl.piece for _, pl in pieces_of(tiled, kind)}
        for (i, j), p in pieces.items():
            for axis, at in p.seams_mm:
                assert abs(at) >= PIN_CLEAR_MM - 1e-9
            x0, y0, x1, y1 = p.window_mm
            for mx, my in p.marks_mm:
                assert x0 <= mx - MARK_HALF_MM and mx + MARK_HALF_MM <= x1, (kind, p.name)
                assert y0 <= my - MARK_HALF_MM and my + MARK_HALF_MM <= y1, (kind, p.name)
            for (di, dj) in ((1, 0), (0, 1)):
                q = pieces.get((i + di, j + dj))
                if q is None:
                    continue
                over, under = SEAM_SLIDE_MM
                if di:
                    overlap = p.window_mm[2] - q.window_mm[0]
                    middle, later = q.window_mm[0] + OVERLAP_MM / 2, 1.0   # q, on the right, is laid over p
                else:
                    overlap = q.window_mm[3] - p.window_mm[1]
                    middle, later = q.window_mm[3] - OVERLAP_MM / 2, -1.0  # q, below, is laid over p
                assert overlap == pytest.approx(OVERLAP_MM, abs=1e-9)
                seam = next(at for axis, at in q.seams_mm if axis == ("x" if di else "y"))
                assert -under - 1e-9 <= (seam - middle) * later <= over + 1e-9
                shared = set(p.marks_mm) & set(q.marks_mm)
                for m in shared:
                    assert m[0 if di else 1] == pytest.approx(seam, abs=1e-9)


def test_every_piece_is_matched_to_one_laid_before(tiled):
    """Laid in reading order, each piece after A1 shares a mark with a
    piece laid before it (the assembly test below then lays it there)."""
    for kind in TILED_KINDS:
        pieces = sorted((pl.piece for _, pl in pieces_of(tiled, kind)), key=lambda p: (p.row, p.column))
        for k, p in enumerate(pieces[1:], start=1):
            assert any(set(p.marks_mm) & set(q.marks_mm) for q in pieces[:k]), (kind, p.name)


def test_marks_lie_off_the_finished_part(tiled):
    """Every alignment mark, its whole diamond, lies outside the part: beyond
    a round part's cut rim (the distance from the pin, less the mark's half
    diagonal, more than the rim's radius), or outside the box of any other
    part; so it is cut away with the waste (#9)."""
    count = 0
    for kind in TILED_KINDS:
        for _, pl in pieces_of(tiled, kind):
            part = pl.part
            x0, y0, x1, y1 = turned_bounds(part.bounds_mm, pl.rotation_deg)
            rims = [e.geom["radius"] for e in part.elements if e.shape == "circle" and e.stroke == "cut"
                    and e.geom["center"] == (0.0, 0.0) and e.geom["radius"] >= x1 - 1e-6]
            for mx, my in pl.piece.marks_mm:
                count += 1
                if rims:   # a round part: its cut rim reaches its box
                    assert math.hypot(mx, my) - MARK_HALF_MM > max(rims), (kind, mx, my)
                else:
                    assert (mx + MARK_HALF_MM < x0 or mx - MARK_HALF_MM > x1
                            or my + MARK_HALF_MM < y0 or my - MARK_HALF_MM > y1), (kind, mx, my)
                assert outside_part(part, pl.rotation_deg)(mx, my, MARK_HALF_MM)
    assert count > 0


def test_marks_are_drawn_where_the_layout_says(tiled):
    """Each alignment mark is a diamond whose corners lie at its half
    diagonal from its centre, across and along the page (page coordinates,
    pt)."""
    for k, page in enumerate(tiled.pages):
        nodes = {_key(x / PT_PER_MM, y / PT_PER_MM) for p in tiled.drawn[k] if _same(p.ctm, (1, 0, 0, 1, 0, 0))
                 for x, y in p.device_nodes()}
        for pl in page.placements:
            for mx, my in (pl.piece.marks_mm if pl.piece else ()):
                x, y = pl.x_mm + mx, pl.y_mm + my
                for dx, dy in ((MARK_HALF_MM, 0), (0, MARK_HALF_MM), (-MARK_HALF_MM, 0), (0, -MARK_HALF_MM)):
                    assert _key(x + dx, y + dy) in nodes, (page.number, pl.piece.name)


@pytest.mark.parametrize("kind", TILED_KINDS)
def test_pieces_laid_as_the_marks_say_draw_the_whole_part(tiled, whole, kind):
    """Assemble the pieces as a person would: A1 where it lies; each next
    piece (reading order) moved, without turning, so that its marks lie on
    the same marks of a piece already laid; cut along its seams, so it shows
    only what lies right of its left seam and below its top seam; and lying
    over the pieces before it.  Every point drawn by the piece on top at a
    place is a point of the whole part there, and every point of the whole
    part is drawn by the piece on top."""
    pieces = sorted(pieces_of(tiled, kind), key=lambda kp: (kp[1].piece.row, kp[1].piece.column))
    (k0, a1), = [kp for kp in pieces if kp[1].piece.name == "A1"]
    shift = {}       # piece name -> (dx, dy) from its page to the assembly (A1's page), mm
    laid = {}        # piece name -> (page-frame marks)
    for k, pl in pieces:
        marks_on_page = {m: (pl.x_mm + m[0], pl.y_mm + m[1]) for m in pl.piece.marks_mm}
        if pl.piece.name == "A1":
            d = (0.0, 0.0)
        else:
            moves = []
            for name, (other_pl, other_shift) in laid.items():
                for m, (x, y) in marks_on_page.items():
                    for m2 in other_pl.piece.marks_mm:
                        # the person sees two halves of one mark: the same mark of the part
                        if m2 == m:
                            ox = other_pl.x_mm + m2[0] + other_shift[0]
                            oy = other_pl.y_mm + m2[1] + other_shift[1]
                            moves.append((ox - x, oy - y))
            assert moves, pl.piece.name
            d = moves[0]
            for mv in moves:  # one shift sets every shared mark: no turn, no stretch
                assert mv == pytest.approx(d, abs=1e-9)
        shift[pl.piece.name] = d
        laid[pl.piece.name] = (pl, d)

    def visible(pl, x_page, y_page, inset):
        """Whether the point (in its own page's mm) is on what is left of
        the piece after cutting along its seams, by at least ``inset`` (a
        point on an edge is left to the other tests: the PDF's rounding
        decides on which side it falls)."""
        x, y = x_page - pl.x_mm, y_page - pl.y_mm
        wx0, wy0, wx1, wy1 = pl.piece.window_mm
        if not (wx0 + inset < x < wx1 - inset and wy0 + inset < y < wy1 - inset):
            return False
        for axis, at in pl.piece.seams_mm:
            if (axis == "x" and x < at + inset) or (axis == "y" and y > at - inset):
                return False
        return True

    def on_top(x_asm, y_asm, inset=TOL_MM):
        top = None
        for k, pl in pieces:
            dx, dy = shift[pl.piece.name]
            if visible(pl, x_asm - dx, y_asm - dy, inset):
                top = (k, pl)
        return top

    # What each piece draws, in the assembly's frame.
    drawn = {}
    for k, pl in pieces:
        dx, dy = shift[pl.piece.name]
        pts = Points()
        for p in part_paths(tiled, k, pl):
            for x, y in p.device_nodes():
                xa, ya = x / PT_PER_MM + dx, y / PT_PER_MM + dy
                if visible(pl, xa - dx, ya - dy, -TOL_MM):
                    pts.add(xa, ya)
        drawn[pl.piece.name] = pts
    # The whole part, moved to where A1 says the part lies in the assembly.
    (kw, wpl), = [(k, pl) for k, page in enumerate(whole.pages) for pl in page.placements if pl.part.kind == kind]
    reference = []
    for p in part_paths(whole, kw, wpl):
        for x, y in p.nodes:   # the part's own frame, pt
            px, py = _turn(x / PT_PER_MM, y / PT_PER_MM, a1.rotation_deg)
            reference.append((a1.x_mm + px, a1.y_mm + py))
    assert len(reference) > 50
    covered = 0
    for x, y in reference:
        top = on_top(x, y)
        if top is None:
            continue   # on an edge, within the rounding of the PDF
        covered += 1
        assert (x, y) in drawn[top[1].piece.name], (kind, top[1].piece.name, x, y)
    ref = Points(reference)
    for k, pl in pieces:
        for x, y in drawn[pl.piece.name]:
            if on_top(x, y) is not None and on_top(x, y)[1] is pl:
                assert (x, y) in ref, (kind, pl.piece.name, x, y)
    # Only points on a window's edge or a seam (within 2 um) escape the checks.
    assert covered >= 0.99 * len(reference), (covered, len(reference))


@pytest.mark.parametrize("kind", TILED_KINDS)
def test_trimmed_pieces_cover_the_part_box_without_gaps(tiled, kind):
    """After cutting along the seams, the pieces' windows meet edge to edge
    and cover the part's whole box (in the placed frame)."""
    pieces = [pl for _, pl in pieces_of(tiled, kind)]
    pl0 = pieces[0]
    bx0, by0, bx1, by1 = turned_bounds(pl0.part.bounds_mm, pl0.rotation_deg)
    b = MARK_BAND_MM   # the grid covers the box grown by the marks' band
    bx0, by0, bx1, by1 = bx0 - b, by0 - b, bx1 + b, by1 + b
    cols = sorted({pl.piece.column for pl in pieces})
    rows = sorted({pl.piece.row for pl in pieces})
    left = {pl.piece.column: next((a for ax, a in pl.piece.seams_mm if ax == "x"), pl.piece.window_mm[0])
            for pl in pieces}
    top = {pl.piece.row: next((a for ax, a in pl.piece.seams_mm if ax == "y"), pl.piece.window_mm[3])
           for pl in pieces}
    assert left[cols[0]] == pytest.approx(bx0) and top[rows[0]] == pytest.approx(by1)
    for pl in pieces:
        i, j = pl.piece.column, pl.piece.row
        right = left[i + 1] if i + 1 in left else bx1
        bottom = top[j + 1] if j + 1 in top else by0
        # what is left of the piece reaches the next piece's seam, which lies inside its window
        assert pl.piece.window_mm[2] > right + 1e-9 or right == pytest.approx(bx1)
        assert pl.piece.window_mm[1] < bottom - 1e-9 or bottom == pytest.approx(by0)
    assert max(pl.piece.window_mm[2] for pl in pieces) == pytest.approx(bx1)
    assert min(pl.piece.window_mm[1] for pl in pieces) == pytest.approx(by0)

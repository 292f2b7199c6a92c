"""Cut a part too large for one page into overlapping pieces.

The part's box (in the frame it is placed in: turned, pin at the origin) is
divided into a grid of equal windows, ``columns`` across and ``rows`` down,
as few as fit the page, each window overlapping its neighbours by
:data:`OVERLAP_MM`.  Every piece shows the part's own geometry through its
window, at the part's own coordinates, so the overlap is printed twice,
identically.

Assembly (common practice for posters printed in tiles): a piece that is
not in the first column is cut along its left *seam*, the middle of the
overlap, and one not in the first row along its top seam; it is then laid
over its neighbours so that the halves of each alignment mark on the seam
meet, and taped at the back.  Laid in reading order (A1, B1, ..., A2, B2,
...), each point of the part shows the last piece laid there, and every
piece shows the same geometry at that point, so the taped pieces make the
part exactly.

The alignment marks stay off the finished part (#9): the grid covers the
part's box grown by :data:`MARK_BAND_MM` on every side, and a mark goes
only where it lies wholly outside the part (the caller's ``outside`` test:
beyond a round part's rim, or in the band), on card that is cut away when
the part is cut out.  A mark is a diamond with a stroke across the seam,
unlike the circled cross of a pin, so nobody pierces it.  A seam stretch
with no room outside the part (inside a grid of three or more pieces each
way) has no mark: that piece is matched by its other seams and by the
part's own lines, which run on across the seam.

The seams need not cut the part's box evenly: where the page leaves room,
all of a direction's seams move together (the first and last windows
taking up the difference), and each seam may leave the very middle of its
overlap by :data:`SEAM_SLIDE_MM`; each runs where it crosses the fewest of
the part's star dots and words (the caller's ``keep_clear``), so that no
dot is cut in two and no number straddles a cut (#9), the middle where
several places are as good.

Pieces are named by column letter and row number, ``A1`` at the top left.
Lengths in mm.
"""

from __future__ import annotations

import math
import string
from dataclasses import dataclass

import numpy as np

#: Overlap (mm) between neighbouring pieces: room for a half alignment mark
#: on each side of the seam, and for tape.
OVERLAP_MM = 12.0
#: Band (mm) above each piece for its title, its name and the assembly map.
PIECE_BAND_MM = 12.0
#: Alignment mark: a diamond (a square on its corner) of this half
#: diagonal, centred on the seam, with a stroke across the seam as long.
MARK_HALF_MM = 2.5
#: Room (mm) added around the part's box for the marks, and the least gap
#: (mm) between a mark and the part.
MARK_BAND_MM = 7.0
MARK_CLEAR_MM = 1.0
#: No seam passes nearer than this (mm) to the pin, so the pin's hole and
#: the fastener's head sit on whole card.
PIN_CLEAR_MM = 10.0
#: How far (mm) a seam may move from the middle of its overlap to keep off
#: a star's dot or a word (#9), ``(towards the piece laid over it, towards
#: the piece under it)``: as far as leaves the alignment marks' whole
#: diamonds inside both pieces' windows, with half a millimetre to spare
#: (a diamond poking out of the window would run into the piece's band,
#: its name and map, above it).
SEAM_SLIDE_MM = (OVERLAP_MM / 2.0 - MARK_HALF_MM - 0.5,) * 2
#: Paper (mm) a seam keeps from the things it keeps off: the seam line's
#: half width and a little more (kitgen.render.pdf_marks draws it).
SEAM_KEEP_MM = 0.3
#: The steps (mm) in which a seam's place is searched.
SEAM_STEP_MM = 0.1


@dataclass(frozen=True)
class Piece:
    """One piece of a tiled part.

    ``window_mm`` is ``(xmin, ymin, xmax, ymax)`` in the part's placed frame
    (the part turned as placed, its pin at the origin); ``seams_mm`` are the
    lines the piece is cut along, ``("x", x)`` for a left seam (a vertical
    line) and ``("y", y)`` for a top seam; ``marks_mm`` the centres of the
    alignment marks that lie in this piece's window.
    """

    column: int
    row: int
    columns: int
    rows: int
    window_mm: tuple[float, float, float, float]
    seams_mm: tuple[tuple[str, float], ...]
    marks_mm: tuple[tuple[float, float], ...]

    @property
    def name(self) -> str:
        return f"{column_letters(self.column)}{self.row + 1}"

    @property
    def count(self) -> int:
        return self.columns * self.rows

    @property
    def width_mm(self) -> float:
        return self.window_mm[2] - self.window_mm[0]

    @property
    def height_mm(self) -> float:
        return self.window_mm[3] - self.window_mm[1]


def column_letters(k: int) -> str:
    """A, B, ..., Z, AA, AB, ... for columns 0, 1, ..."""
    letters = string.ascii_uppercase
    out = ""
    k += 1
    while k:
        k, r = divmod(k - 1, 26)
        out = letters[r] + out
    return out


def pieces_needed(length_mm: float, room_mm: float, overlap_mm: float = OVERLAP_MM) -> int:
    """Fewest windows of at most ``room_mm`` that cover ``length_mm`` with
    ``overlap_mm`` between neighbours."""
    if length_mm <= room_mm + 1e-9:
        return 1
    if room_mm <= overlap_mm:
        raise ValueError("the page is too small to tile on")
    return math.ceil((length_mm - overlap_mm) / (room_mm - overlap_mm) - 1e-9)


def _spans(lo: float, hi: float, n: int, overlap_mm: float, room_mm: float,
           crossings=None) -> list[tuple[float, float]] | None:
    """``n`` windows from ``lo`` to ``hi``, each overlapping the next by
    ``overlap_mm``: equal, unless a seam would pass within
    :data:`PIN_CLEAR_MM` of the pin (the origin) or, given
    ``crossings`` (seam places -> the weight each meets, see
    :func:`seam_crossings`), unless moving the seams meets less; then every
    seam is moved by the same amount, the least that clears the pin and
    meets least, the first and last windows taking up the difference, as
    far as ``room_mm`` allows; ``None`` when it does not allow it."""
    if n == 1:
        return [(lo, hi)]
    length = (hi - lo + (n - 1) * overlap_mm) / n
    step = length - overlap_mm
    seams = np.array([lo + k * step + overlap_mm / 2.0 for k in range(1, n)])
    reach = room_mm - length
    shifts = {0.0} | {side * PIN_CLEAR_MM - sm for sm in seams for side in (1.0, -1.0)}
    if crossings is not None and reach > 0:
        shifts |= set(np.arange(-reach, reach, SEAM_STEP_MM).tolist())
    shifts = np.array(sorted(d for d in shifts if abs(d) <= reach + 1e-9
                             and all(abs(sm + d) >= PIN_CLEAR_MM - 1e-9 for sm in seams)))
    if not len(shifts):
        return None   # no room to move the seams off the pin: the caller takes one window more
    cost = np.zeros(len(shifts)) if crossings is None else sum(crossings(sm + shifts) for sm in seams)
    d = float(shifts[np.lexsort((np.abs(shifts), cost))[0]])
    cuts = [float(sm) + d for sm in seams]
    starts = [lo] + [c - overlap_mm / 2.0 for c in cuts]
    ends = [c + overlap_mm / 2.0 for c in cuts] + [hi]
    return list(zip(starts, ends))


def outside_box(extent_mm):
    """The ``outside`` test of a part that fills its box: a disc of radius
    ``r`` at (x, y) is outside when it clears the box by MARK_CLEAR_MM."""
    x0, y0, x1, y1 = extent_mm
    c = MARK_CLEAR_MM

    def outside(x: float, y: float, r: float) -> bool:
        return x + r < x0 - c or x - r > x1 + c or y + r < y0 - c or y - r > y1 + c
    return outside


def _mark_positions(lo: float, hi: float, on_seam) -> list[float]:
    """Where marks go along a seam's free stretch ``lo..hi``: the nearest
    place to each end where ``on_seam(t)`` says a mark is wholly outside
    the part (searched in 0.5 mm steps); one mark on a short stretch, none
    where no place is outside."""
    a, b = lo + MARK_HALF_MM, hi - MARK_HALF_MM
    if b < a:
        return []
    steps = int((b - a) / 0.5)
    ts = [a + 0.5 * k for k in range(steps + 1)]
    first = next((t for t in ts if on_seam(t)), None)
    last = next((t for t in reversed(ts) if on_seam(t)), None)
    if first is None:
        return []
    if last - first < 4 * MARK_HALF_MM:
        return [first]
    return [first, last]


def seam_crossings(at_mm, axis: int, keep_clear):
    """The weight of the ``keep_clear`` boxes ``((xmin, ymin, xmax, ymax),
    weight)`` that a seam line ``at_mm`` across the whole part meets
    (``axis`` 0: a vertical seam at x, 1: a horizontal one at y), each
    grown by :data:`SEAM_KEEP_MM`; for an array of places, an array.  A
    box's extent along the axis is that of the turned shape it holds, so a
    line across the whole part meets the shape exactly when it meets this
    extent."""
    return _crossings(axis, keep_clear)(at_mm)


def _crossings(axis: int, keep_clear):
    """:func:`seam_crossings` for one axis, as a function of the places."""
    lo = np.array([box[axis] for box, _ in keep_clear], dtype=float) - SEAM_KEEP_MM
    hi = np.array([box[axis + 2] for box, _ in keep_clear], dtype=float) + SEAM_KEEP_MM
    weight = np.array([w for _, w in keep_clear], dtype=float)

    def crossings(at_mm):
        t = np.asarray(at_mm, dtype=float)[..., None]
        return ((lo < t) & (t < hi)) @ weight
    return crossings


def _slide(middle_mm: float, crossings, later_sign: float) -> float:
    """The seam's place within :data:`SEAM_SLIDE_MM` of ``middle_mm``
    (the piece laid over it lies on the side ``later_sign``, +1 or -1)
    and :data:`PIN_CLEAR_MM` from the pin that meets the least weight
    (``crossings``, see :func:`seam_crossings`), nearest the middle among
    equals."""
    if crossings is None:
        return middle_mm
    over, under = (int(round(m / SEAM_STEP_MM)) for m in SEAM_SLIDE_MM)
    places = middle_mm + later_sign * SEAM_STEP_MM * np.arange(-under, over + 1)
    places = places[np.abs(places) >= PIN_CLEAR_MM - 1e-9]
    if not len(places):
        return middle_mm
    best = np.lexsort((np.abs(places - middle_mm), crossings(places)))[0]
    return float(places[best])


def tile(extent_mm, room_w_mm: float, room_h_mm: float, overlap_mm: float = OVERLAP_MM,
         outside=None, keep_clear=()) -> tuple[Piece, ...]:
    """The pieces of a part whose placed box is ``extent_mm`` (xmin, ymin,
    xmax, ymax), grown by MARK_BAND_MM for the marks, each window at most
    ``room_w_mm`` x ``room_h_mm``; in reading order (the top row first,
    left to right).  ``outside(x, y, r)`` says whether a disc lies wholly
    outside the part (default: outside its box).  ``keep_clear`` are the
    boxes ``((xmin, ymin, xmax, ymax), weight)`` (in the placed frame) of
    what the seams should not cut (see :func:`seam_crossings`)."""
    outside = outside or outside_box(extent_mm)
    b = MARK_BAND_MM
    x0, y0, x1, y1 = extent_mm[0] - b, extent_mm[1] - b, extent_mm[2] + b, extent_mm[3] + b
    nx = pieces_needed(x1 - x0, room_w_mm, overlap_mm)
    ny = pieces_needed(y1 - y0, room_h_mm, overlap_mm)
    cross_x, cross_y = (_crossings(0, keep_clear), _crossings(1, keep_clear)) if keep_clear else (None, None)
    xs, ys = _spans(x0, x1, nx, overlap_mm, room_w_mm, cross_x), _spans(y0, y1, ny, overlap_mm, room_h_mm, cross_y)
    while xs is None:
        nx += 1
        xs = _spans(x0, x1, nx, overlap_mm, room_w_mm, cross_x)
    while ys is None:
        ny += 1
        ys = _spans(y0, y1, ny, overlap_mm, room_h_mm, cross_y)
    ys = list(reversed(ys))   # row 0 at the top
    seam_x = [_slide(xs[i][0] + overlap_mm / 2.0, cross_x, 1.0) for i in range(1, nx)]   # left seam of column i
    seam_y = [_slide(ys[j][1] - overlap_mm / 2.0, cross_y, -1.0) for j in range(1, ny)]  # top seam of row j
    marks = []
    for i, x in enumerate(seam_x, start=1):
        for j, (lo, hi) in enumerate(ys):
            free_lo = lo + (overlap_mm if j < ny - 1 else 0.0)
            free_hi = hi - (overlap_mm if j > 0 else 0.0)
            marks += [(x, y) for y in _mark_positions(free_lo, free_hi, lambda t: outside(x, t, MARK_HALF_MM))]
    for j, y in enumerate(seam_y, start=1):
        for i, (lo, hi) in enumerate(xs):
            free_lo = lo + (overlap_mm if i > 0 else 0.0)
            free_hi = hi - (overlap_mm if i < nx - 1 else 0.0)
            marks += [(x, y) for x in _mark_positions(free_lo, free_hi, lambda t: outside(t, y, MARK_HALF_MM))]
    out = []
    for j, (wy0, wy1) in enumerate(ys):
        for i, (wx0, wx1) in enumerate(xs):
            seams = []
            if i > 0:
                seams.append(("x", seam_x[i - 1]))
            if j > 0:
                seams.append(("y", seam_y[j - 1]))
            inside = tuple(m for m in marks if wx0 - 1e-9 <= m[0] <= wx1 + 1e-9 and wy0 - 1e-9 <= m[1] <= wy1 + 1e-9)
            out.append(Piece(i, j, nx, ny, (wx0, wy0, wx1, wy1), tuple(seams), inside))
    return tuple(out)

"""Which drawn lines pass near a place: a uniform grid over a part's strokes.

A label is tried at hundreds of places and each place is tested against
the part's lines (:func:`kitgen.parts.breaks.meets`); testing every line
every time made a plate's labels cost seconds (#12).  Each stroke (circle,
arc, segment, polyline) is entered in the cells of a square grid that the
points sampled along it, every :data:`STEP_MM`, fall in; a query returns
the strokes entered in the cells that a disc round the place, widened by
half a step, touches.  Every point of a stroke is within half a step of a
sample, so every stroke that comes within the disc is returned (with some
that do not): the exact test then decides, and the answers are those of
testing every line.  (Uniform grids for proximity queries: Bentley and
Friedman, "Data structures for range searching", ACM Computing Surveys 11,
1979.)  Lengths in mm; angles in degrees at the edges (as the geometry
model stores them), radians inside.
"""

from __future__ import annotations

import math

#: Side of a grid cell (mm): about a label's height at A4, so that a
#: query reads a few cells.
CELL_MM = 4.0
#: Distance (mm) between the points sampled along a stroke.
STEP_MM = 1.0


class StrokeIndex:
    """The strokes entered so far, by grid cell; a stroke is entered once
    (by identity), however often it is offered."""

    def __init__(self):
        self.cells: dict[tuple[int, int], list] = {}
        self.entered: set[int] = set()
        self._kept: list = []   # the entered elements, so that their ids stay theirs

    def enter(self, elements) -> None:
        """Enter every stroke of ``elements`` not yet entered."""
        for el in elements:
            if id(el) in self.entered or el.shape not in ("circle", "arc", "segment", "polyline"):
                continue
            self.entered.add(id(el))
            self._kept.append(el)
            for cell in {(math.floor(x / CELL_MM), math.floor(y / CELL_MM)) for x, y in _samples(el)}:
                self.cells.setdefault(cell, []).append(el)

    def near(self, center, radius_mm: float) -> dict:
        """The entered strokes that may come within ``radius_mm`` of
        ``center`` (by id; each once), a superset of those that do."""
        return self.in_span(self.span(center, radius_mm))

    @staticmethod
    def span(center, radius_mm: float) -> tuple[int, int, int, int]:
        """The cells (first and last column, first and last row) that
        :meth:`near` reads for a disc: places with the same span have the
        same strokes near them."""
        reach = radius_mm + STEP_MM / 2 + 1e-9
        x, y = center
        return (math.floor((x - reach) / CELL_MM), math.floor((x + reach) / CELL_MM),
                math.floor((y - reach) / CELL_MM), math.floor((y + reach) / CELL_MM))

    def in_span(self, span) -> dict:
        """The entered strokes in the cells of ``span`` (by id; each once)."""
        i0, i1, j0, j1 = span
        out: dict[int, object] = {}
        for i in range(i0, i1 + 1):
            for j in range(j0, j1 + 1):
                for el in self.cells.get((i, j), ()):
                    out[id(el)] = el
        return out


class BoxIndex:
    """Boxes (anything with a ``center`` and a ``radius`` that its whole
    lies within) by grid cell, for finding the labels set near a place.
    A box is entered in the cells its bounding disc's square touches,
    widened by :data:`SLACK_MM`; two discs that overlap have squares that
    overlap, so they share a cell (a cell's index, the floor of the
    coordinate over the side, never falls as the coordinate grows)."""

    def __init__(self):
        self.cells: dict[tuple[int, int], list] = {}
        self.aside: list = []   # boxes too large to enter cell by cell
        self.count = 0
        self._found: dict = {}   # the answers by span, until a box is entered

    def add(self, box) -> None:
        """Enter one more box."""
        self.count += 1
        self._found.clear()
        i0, i1, j0, j1 = _square(box.center, box.radius)
        if (i1 - i0 + 1) * (j1 - j0 + 1) > MAX_CELLS:
            self.aside.append(box)
            return
        for i in range(i0, i1 + 1):
            for j in range(j0, j1 + 1):
                self.cells.setdefault((i, j), []).append(box)

    def near(self, center, radius_mm: float) -> list:
        """The boxes whose bounding discs may overlap the disc of
        ``radius_mm`` about ``center`` (each once), a superset of those
        that do."""
        span = _square(center, radius_mm)
        found = self._found.get(span)
        if found is not None:
            return found
        i0, i1, j0, j1 = span
        if (i1 - i0 + 1) * (j1 - j0 + 1) > MAX_CELLS:
            out = {id(b): b for row in self.cells.values() for b in row}
        else:
            out = {}
            for i in range(i0, i1 + 1):
                for j in range(j0, j1 + 1):
                    for b in self.cells.get((i, j), ()):
                        out[id(b)] = b
        found = self._found[span] = list(out.values()) + self.aside
        return found


#: Widening (mm) of a box's square in :class:`BoxIndex`, far above any
#: rounding of the coordinates.
SLACK_MM = 1e-6
#: A box (or a query) spanning more cells than this is not entered cell by cell.
MAX_CELLS = 400


def _square(center, radius_mm: float) -> tuple[int, int, int, int]:
    reach = radius_mm + SLACK_MM
    x, y = center
    return (math.floor((x - reach) / CELL_MM), math.floor((x + reach) / CELL_MM),
            math.floor((y - reach) / CELL_MM), math.floor((y + reach) / CELL_MM))


def _samples(el):
    """Points along a stroke, no more than :data:`STEP_MM` apart, its ends
    included."""
    g = el.geom
    if el.shape in ("circle", "arc"):
        (cx, cy), r = g["center"], g["radius"]
        lo, hi = (0.0, 2 * math.pi) if el.shape == "circle" else \
            (math.radians(g["start_deg"]), math.radians(g["end_deg"]))
        n = max(1, math.ceil((hi - lo) * r / STEP_MM))
        return [(cx + r * math.cos(lo + (hi - lo) * k / n), cy + r * math.sin(lo + (hi - lo) * k / n))
                for k in range(n + 1)]
    pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"])
    if el.shape == "polyline" and g["closed"]:
        pts.append(pts[0])
    out = [tuple(pts[0])]
    for (x0, y0), (x1, y1) in zip(pts, pts[1:]):
        n = max(1, math.ceil(math.hypot(x1 - x0, y1 - y0) / STEP_MM))
        out += [(x0 + (x1 - x0) * k / n, y0 + (y1 - y0) * k / n) for k in range(1, n + 1)]
    return out

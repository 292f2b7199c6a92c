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
        reach = radius_mm + STEP_MM / 2 + 1e-9
        x, y = center
        out: dict[int, object] = {}
        for i in range(math.floor((x - reach) / CELL_MM), math.floor((x + reach) / CELL_MM) + 1):
            for j in range(math.floor((y - reach) / CELL_MM), math.floor((y + reach) / CELL_MM) + 1):
                for el in self.cells.get((i, j), ()):
                    out[id(el)] = el
        return out


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

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

import numpy as np

from ..geometry.arrays import unique_ints

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
            for cell in _cells(el):
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
    """Points along a stroke (x and y as arrays), no more than
    :data:`STEP_MM` apart, its ends included."""
    g = el.geom
    if el.shape in ("circle", "arc"):
        (cx, cy), r = g["center"], g["radius"]
        lo, hi = (0.0, 2 * math.pi) if el.shape == "circle" else \
            (math.radians(g["start_deg"]), math.radians(g["end_deg"]))
        n = max(1, math.ceil((hi - lo) * r / STEP_MM))
        t = lo + (hi - lo) * np.arange(n + 1) / n
        return cx + r * np.cos(t), cy + r * np.sin(t)
    pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"])
    if el.shape == "polyline" and g["closed"]:
        pts.append(pts[0])
    p = np.asarray(pts, dtype=float)
    d = p[1:] - p[:-1]
    n = np.maximum(1, np.ceil(np.hypot(d[:, 0], d[:, 1]) / STEP_MM)).astype(int)
    # each segment's points k / n of the way along, k = 1 .. n, after the first point
    seg = np.repeat(np.arange(len(d)), n)
    k = np.arange(len(seg)) - np.repeat(np.cumsum(n) - n, n) + 1
    f = k / n[seg]
    return (np.concatenate([p[:1, 0], p[seg, 0] + d[seg, 0] * f]),
            np.concatenate([p[:1, 1], p[seg, 1] + d[seg, 1] * f]))


def _cells(el) -> list[tuple[int, int]]:
    """The grid cells (column, row) the samples of a stroke fall in, each
    once, worked out as arrays (#12)."""
    x, y = _samples(el)
    i, j = np.floor(x / CELL_MM).astype(int), np.floor(y / CELL_MM).astype(int)
    i0, j0, rows = i.min(), j.min(), j.max() - j.min() + 1
    key = unique_ints((i - i0) * rows + (j - j0))   # one number a cell
    return list(zip((key // rows + i0).tolist(), (key % rows + j0).tolist()))


#: A polyline's segments are looked for by the bounds of runs this long.
SEGMENT_RUN = 16


class StrokeArrays:
    """The strokes entered so far as NumPy arrays, for testing many boxes
    at once (#12): the circles and arcs (centre, radius, angles in
    radians, whether whole) and the segments, a polyline's among them,
    each with the position of its stroke; the segments also in runs of
    up to :data:`SEGMENT_RUN` of one stroke, with their bounds, so that
    a box's segments are found among the runs whose bounds come near it."""

    def __init__(self):
        self.elements: list = []
        self.position: dict[int, int] = {}   # by id: the elements are kept, their ids stay theirs
        self._built = None
        self._half = None

    def enter(self, elements) -> None:
        """Enter every stroke of ``elements`` not yet entered."""
        for el in elements:
            if id(el) not in self.position and el.shape in ("circle", "arc", "segment", "polyline"):
                self.position[id(el)] = len(self.elements)
                self.elements.append(el)
                self._built = None

    def arrays(self) -> tuple[dict, dict]:
        """(arcs, segments) of every stroke entered, as dicts of arrays."""
        if self._built is None:
            self._built = (self._arcs(), self._segments())
        return self._built

    def half_widths(self, half_mm: dict) -> np.ndarray:
        """Half the line's width (``half_mm`` by stroke) of every stroke entered."""
        got = self._half
        if got is None or len(got) != len(self.elements):
            got = self._half = np.array([half_mm[el.stroke] for el in self.elements], dtype=float)
        return got

    def _arcs(self) -> dict:
        els = [(k, el) for k, el in enumerate(self.elements) if el.shape in ("circle", "arc")]
        whole = [el.shape == "circle" for _, el in els]
        return {"owner": np.array([k for k, _ in els], dtype=int),
                "x": np.array([el.geom["center"][0] for _, el in els], dtype=float),
                "y": np.array([el.geom["center"][1] for _, el in els], dtype=float),
                "r": np.array([el.geom["radius"] for _, el in els], dtype=float),
                "lo": np.array([0.0 if w else math.radians(el.geom["start_deg"]) for (_, el), w in zip(els, whole)]),
                "hi": np.array([2 * math.pi if w else math.radians(el.geom["end_deg"])
                                for (_, el), w in zip(els, whole)]),
                "whole": np.array(whole, dtype=bool)}

    def _segments(self) -> dict:
        ends, owner = [np.zeros((0, 4))], [np.zeros(0, dtype=int)]
        for k, el in enumerate(self.elements):
            g = el.geom
            if el.shape == "segment":
                pts = [g["from"], g["to"]]
            elif el.shape == "polyline":
                pts = list(g["points"]) + ([g["points"][0]] if g["closed"] else [])
            else:
                continue
            xy = np.array(pts, dtype=float).reshape(-1, 2)   # each stroke's ends as arrays at once (#12)
            if len(xy) < 2:
                continue
            ends.append(np.hstack([xy[:-1], xy[1:]]))
            owner.append(np.full(len(xy) - 1, k, dtype=int))
        e = np.concatenate(ends)
        owner = np.concatenate(owner)
        # runs of SEGMENT_RUN segments of one stroke
        first = np.ones(len(owner), dtype=bool)
        first[1:] = owner[1:] != owner[:-1]
        run = np.cumsum(first) - 1
        at = np.arange(len(owner)) - np.nonzero(first)[0][run]
        start = np.nonzero(at % SEGMENT_RUN == 0)[0]
        lox, hix = np.minimum(e[:, 0], e[:, 2]), np.maximum(e[:, 0], e[:, 2])
        loy, hiy = np.minimum(e[:, 1], e[:, 3]), np.maximum(e[:, 1], e[:, 3])
        reduce = (lambda f, a: f.reduceat(a, start)) if len(start) else (lambda f, a: a[:0])
        return {"owner": owner, "px": e[:, 0], "py": e[:, 1], "qx": e[:, 2], "qy": e[:, 3],
                "start": start, "size": np.diff(np.append(start, len(owner))),
                "lox": reduce(np.minimum, lox), "hix": reduce(np.maximum, hix),
                "loy": reduce(np.minimum, loy), "hiy": reduce(np.maximum, hiy), "run_owner": owner[start]}

"""Finding fast which boxes meet or stand near others.

The rete's names are placed one after another, each tried at hundreds of
places against every box, leader and dot placed before (#12: a class's
kits took seconds each).  Two tools give the same answers as testing
every pair, in a fraction of the time:

- :func:`meets_any` tests many boxes against many others at once, as
  arrays (the same comparisons of the same numbers, made by NumPy);
- :class:`BoxGrid` bins boxes by square cells, so that a box is tested
  only against those in the cells it touches (a uniform grid, the
  simplest spatial index of computational geometry).  Two closed boxes
  that meet share a point, and that point's cell is one of each box's
  cells, since the cell of a coordinate (its floor after division by the
  cell's side) never decreases as it grows.  So a search returns every
  box that meets the searched one, and maybe a few more, which the
  caller's exact test then turns down.

Boxes are (xmin, ymin, xmax, ymax) in mm.
"""

from __future__ import annotations

import math

import numpy as np

#: A box spanning more cells than this along either axis (or not finite)
#: is kept aside and returned by every search, rather than binned.
MAX_SPAN_CELLS = 256


class BoxGrid:
    """Items held by key, each with its box, binned by square cells of
    ``cell_mm``."""

    def __init__(self, cell_mm: float):
        self.cell_mm = cell_mm
        self._cells = {}    # (i, j) -> {key: item}
        self._where = {}    # key -> the cells it is in, or None when aside
        self._aside = {}    # key -> item, for boxes too big to bin

    def _span(self, box):
        """The ranges of cell indices along x and y that a box touches,
        or None when it spans too many (or is not finite)."""
        c = self.cell_mm
        try:
            i0, i1 = math.floor(box[0] / c), math.floor(box[2] / c)
            j0, j1 = math.floor(box[1] / c), math.floor(box[3] / c)
        except (OverflowError, ValueError):   # an infinite or NaN side
            return None
        if i1 - i0 > MAX_SPAN_CELLS or j1 - j0 > MAX_SPAN_CELLS:
            return None
        return range(i0, i1 + 1), range(j0, j1 + 1)

    def add(self, key, box, item) -> None:
        """Hold ``item`` under ``key`` (which must be new), in the cells
        that ``box`` touches."""
        span = self._span(box)
        if span is None:
            self._aside[key] = item
            self._where[key] = None
            return
        cells = [(i, j) for i in span[0] for j in span[1]]
        for cell in cells:
            self._cells.setdefault(cell, {})[key] = item
        self._where[key] = cells

    def remove(self, key) -> None:
        """Drop the item held under ``key``, if any."""
        if key not in self._where:
            return
        cells = self._where.pop(key)
        if cells is None:
            del self._aside[key]
            return
        for cell in cells:
            held = self._cells[cell]
            del held[key]
            if not held:
                del self._cells[cell]

    def near(self, box, grow_mm: float = 0.0) -> dict:
        """{key: item} of every item whose box meets ``box`` grown by
        ``grow_mm`` on every side (and maybe of a few more)."""
        c, g, cells = self.cell_mm, grow_mm, self._cells
        found = dict(self._aside) if self._aside else {}
        try:
            i0, i1 = math.floor((box[0] - g) / c), math.floor((box[2] + g) / c)
            j0, j1 = math.floor((box[1] - g) / c), math.floor((box[3] + g) / c)
        except (OverflowError, ValueError):   # an infinite or NaN side
            i0, i1, j0, j1 = 0, math.inf, 0, math.inf
        if (i1 - i0 + 1) * (j1 - j0 + 1) > len(cells):
            for held in cells.values():
                found.update(held)
            return found
        for i in range(i0, i1 + 1):
            for j in range(j0, j1 + 1):
                held = cells.get((i, j))
                if held:
                    found.update(held)
        return found


def segment_box(p, q):
    """The axis-aligned box (xmin, ymin, xmax, ymax) of the segment pq."""
    return (min(p[0], q[0]), min(p[1], q[1]), max(p[0], q[0]), max(p[1], q[1]))


def meets_any(boxes, others):
    """For each row of ``boxes`` (an array n x 4), whether it overlaps
    (open boxes: touching is not meeting) any row of ``others`` (m x 4)."""
    boxes, others = np.asarray(boxes, dtype=float), np.asarray(others, dtype=float)
    if len(boxes) == 0 or len(others) == 0:
        return np.zeros(len(boxes), dtype=bool)
    a, b = boxes[:, None, :], others[None, :, :]
    return ((a[..., 0] < b[..., 2]) & (b[..., 0] < a[..., 2])
            & (a[..., 1] < b[..., 3]) & (b[..., 1] < a[..., 3])).any(axis=1)

"""Pack boxes onto as few pages as possible.

Two layers:

* :func:`arrangements` finds, for a set of boxes, every smallest envelope
  (width x height) into which they can be set in a *guillotine* pattern: the
  set is split by one straight cut, across the whole envelope, into two
  smaller sets, and so on down to single boxes (Gilmore and Gomory,
  "Multistage cutting stock problems of two and more dimensions",
  Operations Research 13, 1965).  The search is exhaustive over all
  guillotine patterns, so whether a set fits a page is decided exactly for
  those patterns; every arrangement of up to three boxes is one of them.
* :func:`pack` assigns boxes to pages by branch and bound (Martello and
  Toth, "Knapsack Problems", 1990, ch. 8, for the bin-packing search):
  boxes largest first, each tried on every open page and then on a new
  page.  The first assignment found is first fit decreasing; the search
  stops as soon as it meets a lower bound (a set of boxes no two of which
  share a page, or the total area), or after a fixed number of steps or
  of tests of a page.

Everything runs in a fixed order, so the result is a pure function of the
input.  Lengths in mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

#: Steps the page search may take before it keeps the best assignment found.
MAX_SEARCH_STEPS = 20000
#: Tests of whether a box joins a page that the search may make once it
#: has an assignment, before it keeps the best found: a step tries every
#: open page, and a 600 mm mater tiled on a square sheet (175 pieces, as
#: many pages) had made 1.8 million tests, 1.5 s a packing; a kit on a
#: usual sheet makes at most about 10 000.
MAX_SEARCH_TESTS = 200000


@dataclass(frozen=True)
class Box:
    """A box to pack: the ``(width_mm, height_mm, turn)`` ways it may lie
    (``turn`` is the caller's label of that way, e.g. a rotation)."""

    options: tuple[tuple[float, float, float], ...]

    @property
    def area_mm2(self) -> float:
        w, h, _ = self.options[0]
        return w * h


# An arrangement: (width, height, tree).  A tree is ("box", index, option)
# or ("row", left, right) (side by side) or ("column", upper, lower).


def _pareto(entries):
    """Keep the arrangements no other one beats in both width and height."""
    entries = sorted(entries, key=lambda e: (e[0], e[1]))
    out, best_h = [], math.inf
    for e in entries:
        if e[1] < best_h - 1e-9:
            out.append(e)
            best_h = e[1]
    return out


class Packer:
    """Packs :class:`Box` es onto pages of the given content areas.

    ``areas`` are the ``(width_mm, height_mm)`` of the content area of a
    page in each orientation it may take; ``gap_mm`` is kept between boxes.
    """

    def __init__(self, boxes, areas, gap_mm: float):
        self.boxes = tuple(boxes)
        self.areas = tuple(areas)
        self.gap = float(gap_mm)
        self._arr = lru_cache(maxsize=None)(self._arrangements)

    def _could_fit(self, w: float, h: float) -> bool:
        return any(w <= aw + 1e-9 and h <= ah + 1e-9 for aw, ah in self.areas)

    def _arrangements(self, members: frozenset):
        ids = sorted(members)
        if len(ids) == 1:
            i = ids[0]
            return tuple(_pareto([(w, h, ("box", i, k)) for k, (w, h, _) in enumerate(self.boxes[i].options)
                                  if self._could_fit(w, h)]))
        first, rest = ids[0], ids[1:]
        found = []
        # Every split into two non-empty sets, the first one holding ids[0].
        for mask in range(2 ** len(rest) - 1):
            a = frozenset([first] + [r for k, r in enumerate(rest) if mask >> k & 1])
            b = members - a
            for wa, ha, ta in self._arr(a):
                for wb, hb, tb in self._arr(b):
                    for e in ((wa + self.gap + wb, max(ha, hb), ("row", ta, tb)),
                              (max(wa, wb), ha + self.gap + hb, ("column", ta, tb))):
                        if self._could_fit(e[0], e[1]):
                            found.append(e)
        return tuple(_pareto(found))

    def fitting(self, members) -> tuple[int, tuple] | None:
        """``(area_index, arrangement)`` of the first page orientation that
        holds all ``members``, preferring the smallest arrangement; or None."""
        arr = self._arr(frozenset(members))
        for k, (aw, ah) in enumerate(self.areas):
            fits = [e for e in arr if e[0] <= aw + 1e-9 and e[1] <= ah + 1e-9]
            if fits:
                return k, min(fits, key=lambda e: (e[0] * e[1], e[1], e[0]))
        return None

    def _lower_bound(self, order) -> int:
        clique = []
        for i in order:
            if all(self.fitting((i, j)) is None for j in clique):
                clique.append(i)
        biggest = max(aw * ah for aw, ah in self.areas)
        by_area = math.ceil(sum(self.boxes[i].area_mm2 for i in order) / biggest - 1e-9)
        return max(len(clique), by_area)

    def pack(self) -> list[tuple[int, ...]]:
        """The boxes' indices grouped by page, fewest pages found first."""
        n = len(self.boxes)
        for i in range(n):
            if not self._arr(frozenset([i])):
                raise ValueError(f"box {i} fits no page")
        order = sorted(range(n), key=lambda i: (-self.boxes[i].area_mm2, i))
        bound = self._lower_bound(order)
        best: list = [None]
        steps = [0]
        tests = [0]   # made since the first assignment

        def search(k: int, pages: list[list[int]]) -> bool:
            steps[0] += 1
            if best[0] is not None:
                if steps[0] > MAX_SEARCH_STEPS:
                    return True
                if len(pages) >= len(best[0]):
                    return False
            if k == n:
                best[0] = [tuple(p) for p in pages]
                return len(pages) <= bound
            i = order[k]
            for page in pages:
                if best[0] is not None:
                    tests[0] += 1
                    if tests[0] > MAX_SEARCH_TESTS:
                        return True
                if self.fitting(page + [i]) is not None:
                    page.append(i)
                    done = search(k + 1, pages)
                    page.pop()
                    if done:
                        return True
            pages.append([i])
            done = search(k + 1, pages)
            pages.pop()
            return done

        search(0, [])
        return [tuple(sorted(p)) for p in best[0]]


def place(tree, x_mm: float, top_mm: float, width_mm: float, height_mm: float, gap_mm: float, sizes, out) -> None:
    """Positions of an arrangement's boxes: each box's ``(index, option,
    left, top)`` (top measured downwards from the content area's top) into
    ``out``, the tree set in the rectangle given, each part of a split
    centred across it."""
    kind = tree[0]
    if kind == "box":
        _, i, k = tree
        w, h = sizes(i, k)
        out.append((i, k, x_mm + (width_mm - w) / 2.0, top_mm + (height_mm - h) / 2.0))
        return
    a, b = tree[1], tree[2]
    wa, ha = extent(a, sizes, gap_mm)
    wb, hb = extent(b, sizes, gap_mm)
    if kind == "row":
        used = wa + gap_mm + wb
        left = x_mm + (width_mm - used) / 2.0
        place(a, left, top_mm, wa, height_mm, gap_mm, sizes, out)
        place(b, left + wa + gap_mm, top_mm, wb, height_mm, gap_mm, sizes, out)
    else:
        used = ha + gap_mm + hb
        top = top_mm + (height_mm - used) / 2.0
        place(a, x_mm, top, width_mm, ha, gap_mm, sizes, out)
        place(b, x_mm, top + ha + gap_mm, width_mm, hb, gap_mm, sizes, out)


def extent(tree, sizes, gap_mm: float) -> tuple[float, float]:
    """Width and height (mm) of an arrangement tree."""
    if tree[0] == "box":
        return sizes(tree[1], tree[2])
    wa, ha = extent(tree[1], sizes, gap_mm)
    wb, hb = extent(tree[2], sizes, gap_mm)
    if tree[0] == "row":
        return (wa + gap_mm + wb, max(ha, hb))
    return (max(wa, wb), ha + gap_mm + hb)

"""Fewer vertices for a polyline, within a stated distance of it.

The Ramer–Douglas–Peucker rule (U. Ramer, Computer Graphics and Image
Processing 1, 1972; D. H. Douglas and T. K. Peucker, The Canadian
Cartographer 10(2), 1973): keep both ends; find the vertex farthest from
the chord between them; if it is farther than the tolerance, keep it and
treat each half alike, else drop every vertex between.  Every dropped
vertex then lies within the tolerance of the kept polyline.  The
instructions' pictures (kitgen.layout.figures) use it so that curves
sampled finely for the parts do not carry thousands of points into a
picture a few centimetres wide (#12: bytes per kit).
"""

from __future__ import annotations

import numpy as np


def simplified(points, tolerance_mm: float) -> list[tuple[float, float]]:
    """The vertices of ``points`` (a sequence of (x, y) mm) that the rule
    keeps at ``tolerance_mm``, in order, both ends included."""
    pts = np.asarray(points, dtype=float)
    n = len(pts)
    if n < 3:
        return [tuple(map(float, p)) for p in pts]
    keep = np.zeros(n, dtype=bool)
    keep[0] = keep[-1] = True
    spans = [(0, n - 1)]
    while spans:
        i, j = spans.pop()
        if j - i < 2:
            continue
        a, b = pts[i], pts[j]
        inner = pts[i + 1:j]
        d = _distances_mm(inner, a, b)
        k = int(np.argmax(d))
        if d[k] > tolerance_mm:
            m = i + 1 + k
            keep[m] = True
            spans += [(i, m), (m, j)]
    return [tuple(map(float, p)) for p in pts[keep]]


def _distances_mm(pts, a, b):
    """Each point's distance to the segment from ``a`` to ``b`` (to ``a``
    itself when the two coincide, as at a closed curve's ends)."""
    ab = b - a
    length2 = float(ab @ ab)
    if length2 == 0.0:
        return np.hypot(*(pts - a).T)
    t = np.clip((pts - a) @ ab / length2, 0.0, 1.0)
    return np.hypot(*(pts - (a + t[:, None] * ab)).T)

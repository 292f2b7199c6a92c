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
    keeps at ``tolerance_mm``, in order, both ends included.  The spans
    of one depth are worked out together, as arrays (each span's
    farthest vertex the first of the farthest): the rule's vertices in
    far fewer steps (#12); where two lie equally far within rounding, as
    on a closed curve, either may be the one kept."""
    pts = np.asarray(points, dtype=float)
    n = len(pts)
    if n < 3:
        return [tuple(map(float, p)) for p in pts]
    keep = np.zeros(n, dtype=bool)
    keep[0] = keep[-1] = True
    first, last = np.array([0]), np.array([n - 1])
    while len(first):
        inner = last - first - 1
        first, last, inner = first[inner > 0], last[inner > 0], inner[inner > 0]
        if not len(first):
            break
        starts = np.cumsum(inner) - inner
        span = np.repeat(np.arange(len(first)), inner)
        at = np.repeat(first + 1 - starts, inner) + np.arange(int(inner.sum()))
        d = _distances_mm(pts[at], pts[first][span], pts[last][span])
        farthest = np.maximum.reduceat(d, starts)
        # the first vertex of each span at its farthest
        k = np.minimum.reduceat(np.where(d == farthest[span], at, n), starts)
        split = farthest > tolerance_mm
        keep[k[split]] = True
        first, last = np.concatenate([first[split], k[split]]), np.concatenate([k[split], last[split]])
    return [tuple(p) for p in pts[keep].tolist()]


def _distances_mm(pts, a, b):
    """Each point's distance to the segment from its ``a`` to its ``b``
    (rows of the same length; to ``a`` itself where the two coincide, as
    at a closed curve's ends)."""
    abx, aby = b[:, 0] - a[:, 0], b[:, 1] - a[:, 1]
    px, py = pts[:, 0] - a[:, 0], pts[:, 1] - a[:, 1]
    length2 = abx * abx + aby * aby
    t = np.clip((px * abx + py * aby) / np.where(length2 == 0.0, 1.0, length2), 0.0, 1.0)
    t = np.where(length2 == 0.0, 0.0, t)
    return np.hypot(pts[:, 0] - (a[:, 0] + t * abx), pts[:, 1] - (a[:, 1] + t * aby))

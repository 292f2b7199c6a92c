"""A kit's stroke element as a Shapely line, for tests that take GEOS
(Shapely) as the outside reference for the label search (#12)."""

from __future__ import annotations

import math

from shapely.geometry import LineString


def stroke_line(el) -> LineString:
    """The stroke for GEOS: segments and polylines exact, circles and arcs
    as chords within 1e-4 mm of the curve (r (1 - cos(step / 2)) <= 1e-4)."""
    g = el.geom
    if el.shape in ("circle", "arc"):
        (cx, cy), r = g["center"], g["radius"]
        lo, hi = (0.0, 2 * math.pi) if el.shape == "circle" else (math.radians(g["start_deg"]),
                                                                  math.radians(g["end_deg"]))
        step = 2 * math.acos(max(-1.0, 1 - 1e-4 / r))
        n = max(2, math.ceil((hi - lo) / step) + 1)
        return LineString([(cx + r * math.cos(lo + (hi - lo) * k / (n - 1)),
                            cy + r * math.sin(lo + (hi - lo) * k / (n - 1))) for k in range(n)])
    if el.shape == "segment":
        return LineString([g["from"], g["to"]])
    return LineString(list(g["points"]) + ([g["points"][0]] if g["closed"] else []))

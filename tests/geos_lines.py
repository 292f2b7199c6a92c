"""A kit's stroke element as a Shapely line, and a text element's ink
box as a Shapely polygon, for tests that take GEOS (Shapely) as the
outside reference for the label search (#12)."""

from __future__ import annotations

import math

from shapely.geometry import LineString, Polygon


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


def text_polygon(el: dict, words, style: str = "label") -> Polygon:
    """The ink box of a text element of the JSON: along the line from its
    leftmost to its rightmost ink (its anchor at ``at``), its height
    centred on ``at``, turned by ``angle_deg``."""
    text, size = el["text"], el["size_pt"]
    ext = words.measure(text, size, style)
    left, right = words.ink_span_mm(text, size, style)
    start = {"start": 0.0, "middle": -ext.width_mm / 2, "end": -ext.width_mm}[el["anchor"]]
    a = math.radians(el["angle_deg"])
    (x, y), h = el["at"], ext.height_mm / 2
    corners = [(start + u, v) for u, v in ((left, -h), (right, -h), (right, h), (left, h))]
    return Polygon([(x + u * math.cos(a) - v * math.sin(a), y + u * math.sin(a) + v * math.cos(a))
                    for u, v in corners])

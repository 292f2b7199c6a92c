"""Boxes round the elements of a part, for drawing only what a piece shows.

Each box is generous (a whole circle for an arc, a text's box from a
character-count estimate of 0.7 em per character and its full size, a
point's largest dot), so an element whose box misses a piece's window
surely draws nothing there.  Lengths in mm, in the part's frame.
"""

from __future__ import annotations

from ..paper import MM_PER_PT as PT_TO_MM

#: Room (mm) round a point for its largest mark (a pin's crosshair, a
#: bright star's dot).
POINT_ROOM_MM = 3.0


def element_box_mm(el) -> tuple[float, float, float, float]:
    """``(xmin, ymin, xmax, ymax)`` that holds everything the element draws."""
    g = el.geom
    if el.shape in ("circle", "arc"):
        (cx, cy), r = g["center"], g["radius"]
        return (cx - r, cy - r, cx + r, cy + r)
    if el.shape == "segment":
        (x0, y0), (x1, y1) = g["from"], g["to"]
        return (min(x0, x1), min(y0, y1), max(x0, x1), max(y0, y1))
    if el.shape == "polyline":
        xs = [p[0] for p in g["points"]]
        ys = [p[1] for p in g["points"]]
        return (min(xs), min(ys), max(xs), max(ys))
    x, y = g["at"]
    if el.shape == "point":
        room = POINT_ROOM_MM
    else:
        room = (len(g["text"]) * 0.7 + 1.0) * g["size_pt"] * PT_TO_MM
    return (x - room, y - room, x + room, y + room)


def turn_box(box, rotation_deg: float) -> tuple[float, float, float, float]:
    """A box turned about the origin by a multiple of 90 degrees."""
    x0, y0, x1, y1 = box
    quarter = int(round(rotation_deg / 90.0)) % 4
    if quarter == 0:
        return box
    if quarter == 1:
        return (-y1, x0, -y0, x1)
    if quarter == 2:
        return (-x1, -y1, -x0, -y0)
    return (y0, -x1, y1, -x0)


def meets(a, b) -> bool:
    """Whether two boxes overlap or touch."""
    return a[0] <= b[2] and b[0] <= a[2] and a[1] <= b[3] and b[1] <= a[3]

"""Place labels beside points so that they do not collide.

A greedy placement (common practice in map labelling: try a few positions
around each point, keep the first that is free, most important points
first).  Text extents are estimated from the character count; the estimate
is generous (0.6 em a character) so that real glyphs fit inside it.
"""

from __future__ import annotations

PT_TO_MM = 25.4 / 72.0
EM_PER_CHAR = 0.6


def text_box_mm(at, text: str, size_pt: float, anchor: str):
    """(xmin, ymin, xmax, ymax) of horizontal text set at ``at``."""
    w = len(text) * EM_PER_CHAR * size_pt * PT_TO_MM
    h = size_pt * PT_TO_MM
    x, y = at
    x0 = {"start": x, "middle": x - w / 2, "end": x - w}[anchor]
    return (x0, y - h / 2, x0 + w, y + h / 2)


def _overlap(a, b) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def _meets_ring(box, ring) -> bool:
    """Whether a box meets the annulus ``ring`` = (center, r_inner, r_outer)."""
    (cx, cy), r0, r1 = ring
    nx = min(max(cx, box[0]), box[2]) - cx
    ny = min(max(cy, box[1]), box[3]) - cy
    near = (nx * nx + ny * ny) ** 0.5
    far = max(((x - cx) ** 2 + (y - cy) ** 2) ** 0.5 for x in (box[0], box[2]) for y in (box[1], box[3]))
    return near < r1 and far > r0


def place_labels(points, texts, size_pt: float, offset_mm: float, keep_out=(), inside_radius_mm=None,
                 keep_out_rings=()):
    """For each point (in order of importance) the (at, anchor) of its
    label: right, left, above or below the point, the first of these whose
    box meets no label placed before, no ``keep_out`` box, no ring of
    ``keep_out_rings`` ((center, r_inner, r_outer)) and stays inside
    ``inside_radius_mm``; the first that avoids the labels alone when none
    is wholly free, else the right-hand place."""
    placed = list(keep_out)
    out = []
    for (x, y), text in zip(points, texts):
        h = size_pt * PT_TO_MM
        candidates = [((x + offset_mm, y), "start"), ((x - offset_mm, y), "end"),
                      ((x, y + offset_mm + h / 2), "middle"), ((x, y - offset_mm - h / 2), "middle")]
        choice = fallback = None
        for at, anchor in candidates:
            box = text_box_mm(at, text, size_pt, anchor)
            if inside_radius_mm is not None and max(abs(box[0]), abs(box[2])) ** 2 + \
                    max(abs(box[1]), abs(box[3])) ** 2 > inside_radius_mm ** 2:
                continue
            if not any(_overlap(box, other) for other in placed):
                if not any(_meets_ring(box, ring) for ring in keep_out_rings):
                    choice = (at, anchor, box)
                    break
                fallback = fallback or (at, anchor, box)
        choice = choice or fallback
        if choice is None:
            at, anchor = candidates[0]
            choice = (at, anchor, text_box_mm(at, text, size_pt, anchor))
        placed.append(choice[2])
        out.append(choice[:2])
    return out

"""Where a tiled piece's seams are drawn: along the seam, with a gap
wherever it would run over a word of the part.

A piece is cut along its seams (kitgen.layout.tiling), and the seam's
dash-dot line stays, in part, along the cut edge on the finished part; so
it is broken round every text element the seam crosses, as the plate's
lines are broken round their labels (kitgen.parts.breaks), and a pupil
cutting along it follows the line across the gap.  The boxes are the
words' measured extents (``Words.measure``), turned as they are set and as
the part is placed (#9: no line over a word).

:func:`keep_clear` gives kitgen.layout.tiling what the seams themselves
should keep off, so that they run clear of dots and words where the
overlap allows.

Lengths in mm; the seam's ends and the gaps in the page's frame (the
placed part's pin at ``placement.x_mm``, ``placement.y_mm``).
"""

from __future__ import annotations

import math

from ..parts import breaks

#: Text roles set in bold on the parts (as kitgen.render.pdf draws them).
BOLD_ROLES = frozenset({"title", "caution"})


def _placed(box: breaks.Box, rotation_deg: float) -> breaks.Box:
    """A part-frame box turned about the pin as the part is placed."""
    a = math.radians(rotation_deg)
    c, s = math.cos(a), math.sin(a)
    x, y = box.center
    return breaks.Box((c * x - s * y, s * x + c * y), box.angle_rad + a, box.half_w, box.half_h)


#: How much more a seam through a star's dot costs than one through a word
#: (kitgen.layout.tiling.seam_crossings): a dot cut in two loses its
#: place, a word's halves still meet along the cut.
DOT_WEIGHT = 4.0


def keep_clear(part, rotation_deg: float, words):
    """What a seam should not cut, as ``((xmin, ymin, xmax, ymax),
    weight)`` in the frame the part is placed in (turned
    ``rotation_deg`` about its pin): each drawn star's dot (its disc, of
    the radius the geometry gives) and each word's measured box (#9: a
    seam through Orion's belt and across a number)."""
    a = math.radians(rotation_deg)
    c, s = math.cos(a), math.sin(a)
    out = []
    for el in part.elements:
        if el.shape == "text" and el.geom["text"].strip():
            box = _placed(breaks.text_box(el, words, "bold" if el.role in BOLD_ROLES else "label"), rotation_deg)
            xs, ys = zip(*box.corners())
            out.append(((min(xs), min(ys), max(xs), max(ys)), 1.0))
        elif el.role == "star" and el.stroke not in (None, "none"):
            x, y = el.geom["at"]
            r = el.values["radius_mm"]
            px, py = c * x - s * y, s * x + c * y
            out.append(((px - r, py - r, px + r, py + r), DOT_WEIGHT))
    return out


def seam_stretches_mm(placement, words, clearance_mm: float):
    """The stretches ``((x0, y0), (x1, y1))`` of the piece's seams that
    keep ``clearance_mm`` from every word of the part (the clearance
    should hold the seam line's half width)."""
    piece = placement.piece
    ox, oy = placement.x_mm, placement.y_mm
    x0, y0, x1, y1 = placement.box_mm
    boxes = [_placed(breaks.text_box(el, words, "bold" if el.role in BOLD_ROLES else "label"),
                     placement.rotation_deg).grown(clearance_mm)
             for el in placement.part.elements if el.shape == "text" and el.geom["text"].strip()]
    out = []
    for axis, at in piece.seams_mm:
        if axis == "x":
            p, q = (at, y0 - oy), (at, y1 - oy)
        else:
            p, q = (x0 - ox, at), (x1 - ox, at)
        cuts = []
        for b in boxes:
            if abs((at - b.center[0]) if axis == "x" else (at - b.center[1])) >= b.radius:
                continue
            t = breaks.segment_inside(p, q, b)
            if t is not None:
                cuts.append(t)
        at_t = 0.0
        for a, b in sorted(cuts) + [(1.0, 1.0)]:
            if a > at_t:
                out.append(((ox + p[0] + (q[0] - p[0]) * at_t, oy + p[1] + (q[1] - p[1]) * at_t),
                            (ox + p[0] + (q[0] - p[0]) * a, oy + p[1] + (q[1] - p[1]) * a)))
            at_t = max(at_t, b)
    return out

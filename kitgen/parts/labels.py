"""Place labels so that they fit their room and do not collide.

Every label is measured with the real font (``Words.measure``, from the
shipped fonts' own metrics through fontTools and HarfBuzz; see
:mod:`kitgen.words.measure`), never estimated from its number of
characters.  A label with a fixed room (a ring between its ticks, a vane,
the width of the rule) is fitted to it by the rule of
:mod:`kitgen.words.fit`: smaller down to 5 pt, then the shorter form,
then two lines.  Labels beside points (the stars) are placed greedily, a
common practice in map labelling: try a few positions around each point,
keep the first that is free, most important points first.
"""

from __future__ import annotations

import math

from ..geometry import model
from ..words.fit import line_offsets_mm
from ..words.measure import text_corners_mm
from . import curves

#: Clearance (mm) kept between a label and the lines that bound its room
#: (common practice: about a third of a millimetre reads as "apart" in print).
MARGIN_MM = 0.3


def text_box_mm(at, text: str, size_pt: float, anchor: str, measure):
    """(xmin, ymin, xmax, ymax) of horizontal text set at ``at``, from its
    measured extent (``measure(text, size_pt)``)."""
    ext = measure(text, size_pt)
    w, h = ext.width_mm, ext.height_mm
    x, y = at
    x0 = {"start": x, "middle": x - w / 2, "end": x - w}[anchor]
    return (x0, y - h / 2, x0 + w, y + h / 2)


def _overlap(a, b) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def boxes_meet(a, b) -> bool:
    """Whether two boxes (xmin, ymin, xmax, ymax) overlap."""
    return _overlap(a, b)


def meets_ring(box, ring) -> bool:
    """Whether a box meets the annulus ``ring`` = (center, r_inner, r_outer)."""
    return _meets_ring(box, ring)


def _meets_ring(box, ring) -> bool:
    """Whether a box meets the annulus ``ring`` = (center, r_inner, r_outer)."""
    (cx, cy), r0, r1 = ring
    nx = min(max(cx, box[0]), box[2]) - cx
    ny = min(max(cy, box[1]), box[3]) - cy
    near = (nx * nx + ny * ny) ** 0.5
    far = max(((x - cx) ** 2 + (y - cy) ** 2) ** 0.5 for x in (box[0], box[2]) for y in (box[1], box[3]))
    return near < r1 and far > r0


#: How far from its point a label may stand, in units of the offset: the
#: nearest free place wins, a farther one only when the near ones are taken
#: (a label a few millimetres off still reads as its star's on a rete).
NEAR_FIRST = (1.0, 1.8, 2.8)


def place_labels(points, texts, size_pt: float, offset_mm: float, keep_out=(), inside_radius_mm=None,
                 keep_out_rings=(), *, measure):
    """For each point (in order of importance) the (at, anchor) of its
    label: right, left, above, below the point or at a corner, at the
    offset or (when those are taken) farther out, the first of these whose
    measured box meets no label placed before, no
    ``keep_out`` box, no ring of ``keep_out_rings`` ((center, r_inner,
    r_outer)) and stays inside ``inside_radius_mm``; else ``None`` (the
    label is left out rather than printed over another, over a scale or
    off the part)."""
    placed = list(keep_out)
    out = []
    for (x, y), text in zip(points, texts):
        h = measure(text, size_pt).height_mm
        candidates = []
        for reach in NEAR_FIRST:
            o = offset_mm * reach
            d = o * 0.75
            candidates += [((x + o, y), "start"), ((x - o, y), "end"),
                           ((x, y + o + h / 2), "middle"), ((x, y - o - h / 2), "middle"),
                           ((x + d, y + d + h / 2), "start"), ((x - d, y + d + h / 2), "end"),
                           ((x + d, y - d - h / 2), "start"), ((x - d, y - d - h / 2), "end")]
        choice = None
        for at, anchor in candidates:
            box = text_box_mm(at, text, size_pt, anchor, measure)
            if inside_radius_mm is not None and max(abs(box[0]), abs(box[2])) ** 2 + \
                    max(abs(box[1]), abs(box[3])) ** 2 > inside_radius_mm ** 2:
                continue
            if not any(_overlap(box, other) for other in placed) and \
                    not any(_meets_ring(box, ring) for ring in keep_out_rings):
                choice = (at, anchor, box)
                break
        if choice is None:
            out.append(None)
            continue
        placed.append(choice[2])
        out.append(choice[:2])
    return out


def fitted_text(role, at, string: str, size_pt: float, words, max_width_mm: float,
                max_height_mm: float | None = None, angle_deg: float = 0.0, anchor: str = "middle",
                short: str | None = None, style: str = "label", **values) -> list[model.Element]:
    """Text elements for ``string`` fitted to a room ``max_width_mm`` long
    (along the text) and ``max_height_mm`` high around ``at``: one element
    per line, the lines stacked across the text's direction about ``at``.
    Each element carries ``full_text`` (the whole label) in its values
    when the label was shortened or broken."""
    fitted = words.fit(string, size_pt, max_width_mm, max_height_mm, short, style)
    if len(fitted.lines) == 1 and fitted.lines[0] == string:
        return [model.text(role, at, string, fitted.size_pt, angle_deg, anchor, **values)]
    h = words.measure(fitted.lines[0], fitted.size_pt, style).height_mm
    a = math.radians(angle_deg)
    normal = (-math.sin(a), math.cos(a))
    out = []
    for line, off in zip(fitted.lines, line_offsets_mm(len(fitted.lines), h)):
        p = (at[0] + normal[0] * off, at[1] + normal[1] * off)
        out.append(model.text(role, p, line, fitted.size_pt, angle_deg, anchor, full_text=string, **values))
    return out


def ring_label(role, string: str, angle_deg: float, radius_mm: float, size_pt: float, words,
               max_width_mm: float, max_height_mm: float | None = None, center=(0.0, 0.0),
               short: str | None = None, **values) -> list[model.Element]:
    """A label set along a ring (see :func:`kitgen.parts.curves.ring_text`)
    and fitted to the room between its ticks."""
    el = curves.ring_text(role, string, angle_deg, radius_mm, size_pt, center=center, **values)
    return fitted_text(role, el.geom["at"], string, size_pt, words, max_width_mm, max_height_mm,
                       el.geom["angle_deg"], "middle", short, **values)


def chord_mm(radius_mm: float, span_deg: float) -> float:
    """Length (mm) of the chord under ``span_deg`` of a circle."""
    return 2.0 * radius_mm * math.sin(math.radians(min(span_deg, 180.0)) / 2.0)


def element_box_mm(el, words, style: str = "label"):
    """The axis-aligned box (mm) that holds a text element's measured,
    turned extent."""

    ext = words.measure(el.geom["text"], el.geom["size_pt"], style)
    pts = text_corners_mm(el.geom["at"], ext.width_mm, ext.height_mm, el.geom["angle_deg"], el.geom["anchor"])
    xs, ys = [p[0] for p in pts], [p[1] for p in pts]
    return (min(xs), min(ys), max(xs), max(ys))

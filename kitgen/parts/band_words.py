"""The words of the rete's ecliptic band kept off the stars' dots (#9).

A star's dot is fixed by the sky, a word of the band is not: a sign's
name may stand anywhere between its sign's bounds, a number a little to
either side of its tick.  So a word whose measured ink box (the shipped
fonts' metrics, :mod:`kitgen.words.measure`, turned as the PDF sets it)
comes within a word space (:data:`DOT_CLEARANCE_EM`) of a dot slides along the band,
turned about the ecliptic's centre, to the nearest place where it meets no
dot, no drawn tick and no other word of the band (common practice in map
labelling: the name gives way to the feature).  A sign's name with no
such place is written as its Unicode sign (the fitting rule's short form,
kitgen.words.symbols) and tried again; a number with none is left out
(it is one of two in its sign, and the ticks still count the degrees).

Each exact test of a word's turned box (against a dot, a tick, another
word) is made only where the boxes' axis-aligned bounds come within reach
(#12): a turned box lies inside its bounds, so a thing beyond them by more
than the test's reach cannot fail it, and the answers are those of testing
every pair.  The turns of a sliding word that surely bring it onto a dot
are found for all its turns at once and skipped (:func:`_surely_near_dot`).

Angles in degrees about the ecliptic's centre; lengths in mm.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from ..words.measure import MM_PER_PT, text_corners_mm
from . import labels
from .box_grid import segment_box

#: Clearance kept between a word of the band and a star's dot, in ems of
#: the word's size: a word space of the shipped sans (651 of 2048 units,
#: DejaVu Sans' own metrics), and never less than the labels' margin
#: (kitgen.parts.labels.MARGIN_MM).  Nearer than a word space, a dot reads
#: as a mark of the word (#12 review: Aldebaran's dot 0.4 mm before
#: "Géminis" on a Spanish rete; common practice in lettering, where
#: different things stand further apart than the words of one phrase).
DOT_CLEARANCE_EM = 0.32

#: How far a number may slide from its tick, in degrees of longitude: less
#: than half the 5-degree ticks' spacing, so it still reads as its tick's.
NUMBER_SLIDE_DEG = 2.0

#: The step (degrees about the ecliptic's centre) of the search for a place.
STEP_DEG = 0.1

def _frame(corners):
    (x0, y0), (x1, y1), _, (x3, y3) = corners
    lu, lv = math.hypot(x1 - x0, y1 - y0), math.hypot(x3 - x0, y3 - y0)
    return (x0, y0), ((x1 - x0) / lu, (y1 - y0) / lu), ((x3 - x0) / lv, (y3 - y0) / lv), lu, lv


def _local(frame, pt):
    (x0, y0), u, v, _, _ = frame
    dx, dy = pt[0] - x0, pt[1] - y0
    return dx * u[0] + dy * u[1], dx * v[0] + dy * v[1]


def disc_gap_mm(corners, center, radius_mm: float) -> float:
    """How far (mm) a disc lies from a turned box (negative or zero: they
    meet)."""
    f = _frame(corners)
    a, b = _local(f, center)
    na, nb = min(max(a, 0.0), f[3]), min(max(b, 0.0), f[4])
    return math.hypot(a - na, b - nb) - radius_mm


def segment_meets(corners, p, q) -> bool:
    """Whether segment pq meets a turned box (Liang-Barsky clipping in the
    box's own frame)."""
    f = _frame(corners)
    (a0, b0), (a1, b1) = _local(f, p), _local(f, q)
    t0, t1 = 0.0, 1.0
    for d, hi, start in ((a1 - a0, f[3], a0), (b1 - b0, f[4], b0)):
        if abs(d) < 1e-12:
            if start < 0.0 or start > hi:
                return False
            continue
        ta, tb = -start / d, (hi - start) / d
        t0, t1 = max(t0, min(ta, tb)), min(t1, max(ta, tb))
        if t0 > t1:
            return False
    return True


def boxes_meet(a, b) -> bool:
    """Whether two turned boxes meet (separating axes of both)."""
    for box in (a, b):
        f = _frame(box)
        for axis in (3, 4):
            along = [_local(f, p)[axis - 3] for p in (a if box is b else b)]
            if max(along) <= 0.0 or min(along) >= f[axis]:
                return False
    return True


def bounds_of(corners):
    """The axis-aligned box (xmin, ymin, xmax, ymax) of a turned box's
    corners."""
    xs, ys = [p[0] for p in corners], [p[1] for p in corners]
    return (min(xs), min(ys), max(xs), max(ys))


def near_rows(bounds, box, reach_mm: float) -> list[int]:
    """The indices of the rows of ``bounds`` (an array n x 4 of
    axis-aligned boxes) that come within ``reach_mm`` of ``box`` (closed
    boxes: touching is near)."""
    return np.flatnonzero((bounds[:, 0] <= box[2] + reach_mm) & (bounds[:, 2] >= box[0] - reach_mm)
                          & (bounds[:, 1] <= box[3] + reach_mm) & (bounds[:, 3] >= box[1] - reach_mm)).tolist()


def corners_of(el, words):
    """The turned box (four corners, mm) of a text element's measured ink."""
    ext = words.measure(el.geom["text"], el.geom["size_pt"])
    return text_corners_mm(el.geom["at"], ext.width_mm, ext.height_mm, el.geom["angle_deg"], el.geom["anchor"])


def turned(el, center, delta_deg: float):
    """The text element turned ``delta_deg`` about ``center``."""
    at, angle_deg = _turned_at(el.geom, center, delta_deg)
    return dataclasses.replace(el, geom=dict(el.geom, at=at, angle_deg=angle_deg))


def _turned_at(geom, center, delta_deg: float):
    """(at, angle_deg) of a text's ``geom`` turned ``delta_deg`` about
    ``center``."""
    a = math.radians(delta_deg)
    c, s = math.cos(a), math.sin(a)
    dx, dy = geom["at"][0] - center[0], geom["at"][1] - center[1]
    return (center[0] + c * dx - s * dy, center[1] + s * dx + c * dy), \
        (geom["angle_deg"] + delta_deg + 180.0) % 360.0 - 180.0


def _turned_corners(geom, ext, center, delta_deg: float):
    """The corners of :func:`corners_of` for a text's ``geom`` of measured
    extent ``ext`` turned ``delta_deg`` about ``center``: those of the
    element :func:`turned` would give."""
    at, angle_deg = _turned_at(geom, center, delta_deg)
    return text_corners_mm(at, ext.width_mm, ext.height_mm, angle_deg, geom["anchor"])


def _offsets(low_deg: float, high_deg: float):
    """0, then alternately either way by :data:`STEP_DEG`, within [low, high]."""
    yield 0.0
    n = int(max(abs(low_deg), abs(high_deg)) / STEP_DEG) + 1
    for k in range(1, n + 1):
        for d in (k * STEP_DEG, -k * STEP_DEG):
            if low_deg <= d <= high_deg:
                yield d


#: How much nearer a dot than the clearance (mm) a word's box must come,
#: in :func:`_surely_near_dot`'s quick reckoning, to be surely too near:
#: far above that reckoning's rounding error, far below anything printed.
SURELY_MM = 1e-6


def _surely_near_dot(boxes, deltas_deg, center, dots, clearance_mm: float) -> list[bool]:
    """For each turn of ``deltas_deg`` about ``center``, whether one of the
    turned boxes surely comes within ``clearance_mm`` of a dot (#12): the
    gaps of all turns reckoned at once, each dot turned back instead of the
    box (the same gap, rounded a little differently from
    :func:`disc_gap_mm`'s), and counted only where short of the clearance
    by :data:`SURELY_MM`, so that each turn found is one the exact test
    turns down too.  Only the dots about as far from ``center`` as a box's
    corners are reckoned with (the others cannot come near a turned box,
    and leaving one out only leaves a turn to the exact test)."""
    if not dots or not deltas_deg:
        return [False] * len(deltas_deg)
    a = np.radians(-np.asarray(deltas_deg, dtype=float))[:, None]
    cos, sin = np.cos(a), np.sin(a)
    cx, cy = center
    xy = np.array([c for c, r in dots], dtype=float) - (cx, cy)
    radius = np.array([r for c, r in dots], dtype=float)
    far = np.hypot(xy[:, 0], xy[:, 1])
    out = np.zeros(len(deltas_deg), dtype=bool)
    for box in boxes:
        reach = [math.hypot(x - cx, y - cy) for x, y in box]
        side = math.hypot(box[1][0] - box[0][0], box[1][1] - box[0][1]) + \
            math.hypot(box[3][0] - box[0][0], box[3][1] - box[0][1])
        keep = (far + radius + clearance_mm >= min(reach) - side) & (far - radius - clearance_mm <= max(reach))
        if not keep.any():
            continue
        x, y, r = xy[keep, 0], xy[keep, 1], radius[keep]
        (x0, y0), u, v, lu, lv = _frame(box)
        tx, ty = cx + cos * x - sin * y - x0, cy + sin * x + cos * y - y0
        along, across = tx * u[0] + ty * u[1], tx * v[0] + ty * v[1]
        gap = np.hypot(along - np.clip(along, 0.0, lu), across - np.clip(across, 0.0, lv)) - r
        out |= (gap < clearance_mm - SURELY_MM).any(axis=1)
    return out.tolist()


def dot_clearance_mm(size_pt: float) -> float:
    """The clearance (mm) a word of the band of ``size_pt`` keeps from a
    star's dot: :data:`DOT_CLEARANCE_EM`, at least the labels' margin."""
    return max(labels.MARGIN_MM, DOT_CLEARANCE_EM * size_pt * MM_PER_PT)


def clear_of_dots(elements, dots, center, words, slide_range, short_forms=None):
    """The rete's elements with the band's words (roles ``zodiac_label``
    and ``ecliptic_number``) moved off the stars' dots: ``dots`` are
    (center, radius_mm); ``slide_range(el)`` gives the (low, high) degrees
    about ``center`` a word may turn through; ``short_forms`` maps a
    sign's longitude to its short form.  A sign's name of several lines
    moves as one."""
    els = list(elements)
    ticks = [(e.geom["from"], e.geom["to"]) for e in els if e.role == "ecliptic_tick" and e.stroke != "none"]
    band = [k for k, e in enumerate(els) if e.role in ("zodiac_label", "ecliptic_number")]
    groups: dict[tuple, list[int]] = {}
    for k in band:
        groups.setdefault((els[k].role, els[k].values.get("longitude_deg")), []).append(k)
    boxes = {k: corners_of(els[k], words) for k in band}
    dot_bounds = np.array([(c[0] - r, c[1] - r, c[0] + r, c[1] + r) for c, r in dots], dtype=float).reshape(-1, 4)
    tick_bounds = np.array([segment_box(p, q) for p, q in ticks], dtype=float).reshape(-1, 4)

    def near_dot(box_list, clearance):
        """Whether a box comes within ``clearance`` of a dot."""
        return any(disc_gap_mm(b, *dots[j]) < clearance for b in box_list
                   for j in near_rows(dot_bounds, bounds_of(b), clearance + labels.SEARCH_SLACK_MM))

    def blocked(box_list, clearance, others, other_bounds):
        """Whether a box comes within ``clearance`` of a dot, meets a box
        of ``others`` or a drawn tick."""
        if near_dot(box_list, clearance):
            return True
        spans = [bounds_of(b) for b in box_list]
        return any(boxes_meet(b, others[j]) for b, span in zip(box_list, spans)
                   for j in near_rows(other_bounds, span, labels.SEARCH_SLACK_MM)) or \
            any(segment_meets(b, *ticks[j]) for b, span in zip(box_list, spans)
                for j in near_rows(tick_bounds, span, labels.SEARCH_SLACK_MM))

    dropped = set()
    for key, members in groups.items():
        clear_mm = dot_clearance_mm(els[members[0]].geom["size_pt"])
        if not near_dot([boxes[k] for k in members], clear_mm):
            continue
        others = [boxes[k] for k in band if k not in members and k not in dropped]
        other_bounds = np.array([bounds_of(o) for o in others], dtype=float).reshape(-1, 4)
        low, high = slide_range(els[members[0]])
        tries = [[els[k] for k in members]]
        if key[0] == "zodiac_label" and short_forms is not None and key[1] in short_forms:
            lead = els[members[len(members) // 2]]
            one = dataclasses.replace(lead, values=dict(lead.values, full_text=lead.values.get("full_text",
                                                                                          lead.geom["text"])))
            mid = _middle(els[k] for k in members)
            tries.append([dataclasses.replace(one, geom=dict(one.geom, at=mid, text=short_forms[key[1]]))])
        found = None
        # (a sign's name, which has no other place, at last nearer; a
        # number is left out rather than set on a dot, and the notes say so)
        for clearance in (clear_mm, 0.05) if key[0] == "zodiac_label" else (clear_mm,):
            for start in tries:
                # (the words' boxes turned; the elements only for the place found)
                exts = [words.measure(e.geom["text"], e.geom["size_pt"]) for e in start]
                deltas = list(_offsets(low, high))
                sure = _surely_near_dot([corners_of(e, words) for e in start], deltas, center, dots, clearance)
                for delta in (d for d, near in zip(deltas, sure) if not near):
                    mb = [_turned_corners(e.geom, ext, center, delta) for e, ext in zip(start, exts)]
                    if blocked(mb, clearance, others, other_bounds):
                        continue
                    found = ([turned(e, center, delta) for e in start], mb)
                    break
                if found:
                    break
            if found:
                break
        if found is None:
            dropped.update(members)
            continue
        moved, mb = found
        for j, k in enumerate(members):
            if j < len(moved):
                els[k], boxes[k] = moved[j], mb[j]
            else:
                dropped.add(k)
    return [e for k, e in enumerate(els) if k not in dropped]


def _middle(elements):
    pts = [e.geom["at"] for e in elements]
    return (sum(p[0] for p in pts) / len(pts), sum(p[1] for p in pts) / len(pts))


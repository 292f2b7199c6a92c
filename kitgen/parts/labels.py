"""Place labels so that they fit their room and do not collide.

Every label is measured with the real font (``Words.measure``, from the
shipped fonts' own metrics through fontTools and HarfBuzz; see
:mod:`kitgen.words.measure`), never estimated from its number of
characters.  A label with a fixed room (a ring between its ticks, a vane,
the width of the rule) is fitted to it by the rule of
:mod:`kitgen.words.fit`: smaller down to 5 pt, then the shorter form,
then two lines.  Labels beside points (the stars) are placed greedily, a
common practice in map labelling: try a few positions around each point,
keep the first that is free, most important points first, then let a
point left without a place take a neighbour's that can move.
"""

from __future__ import annotations

import math

from ..geometry import model
from ..words.fit import line_offsets_mm
from ..words.measure import text_corners_mm
from . import curves
from .dimensions import MIN_TEXT_PT

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
#: Farther places, each joined to its point by a leader line (common
#: practice in map labelling), tried when the near ones are all taken.
WITH_LEADER = (3.2, 4.0, 4.8, 5.5, 6.5, 7.5, 8.7, 10.0, 12.0)
#: The directions round the point tried at each of those reaches (dense
#: enough that a crowded group, Orion's on an equatorial A4 rete, finds
#: room for leaders that cross no other leader and pass no other dot).
LEADER_DIRECTIONS = 32
#: Where labels may have leaders, a label with none stands at most this
#: many offsets from its point (its box within 1.06 times that of the
#: point: the diagonal places) and nearer its own dot than any other
#: point's, by a margin, so that it reads as that point's name (#9; the
#: usual rule of map labelling, that a name must not be closer to a
#: neighbour's symbol than to its own).  Any other place takes a leader.
ALONE_REACH = 1.8
#: Clear paper (mm) a leader keeps from every other dot: that between
#: neighbouring lines (kitgen.parts.legibility.MIN_CLEAR_GAP_MM), so that
#: it never seems to start from a neighbour.
LEADER_CLEAR_MM = 0.4
#: Clear paper (mm) between two names beside points, so that each reads as
#: a word of its own (#9: on an Arabic rete "Pollux" ran into Sirius's
#: name; about a letter's width at 5 pt, common practice in map labelling).
NAME_GAP_MM = 1.0
#: How much nearer (mm) its own dot a name without a leader stands than
#: any other dot, so that it is *clearly* that dot's (#9).
NEARER_BY_MM = 0.5
#: A name with a leader keeps this many offsets (and :data:`NAME_GAP_MM`
#: at least) from every other dot, so that it never reads as that dot's
#: name (#9: Bellatrix's name, at the end of its leader, stood beside
#: Betelgeuse's dot).
LEADER_NAME_CLEAR = 0.75
#: How many placed labels nearest an unplaced point's are tried for a swap
#: (:func:`place_labels`' repair step).
REPAIR_NEIGHBOURS = 6


def _segment_meets_box(p, q, box) -> bool:
    """Whether segment pq meets an axis-aligned box (Liang-Barsky)."""
    t0, t1 = 0.0, 1.0
    for d, lo, hi, start in ((q[0] - p[0], box[0], box[2], p[0]), (q[1] - p[1], box[1], box[3], p[1])):
        if abs(d) < 1e-12:
            if start < lo or start > hi:
                return False
            continue
        ta, tb = (lo - start) / d, (hi - start) / d
        t0, t1 = max(t0, min(ta, tb)), min(t1, max(ta, tb))
        if t0 > t1:
            return False
    return True


def _segment_meets_ring(p, q, ring) -> bool:
    """Whether segment pq meets the annulus ``ring`` (sampled every
    0.1 mm: far finer than any line it keeps apart)."""
    (cx, cy), r0, r1 = ring
    n = max(2, int(((q[0] - p[0]) ** 2 + (q[1] - p[1]) ** 2) ** 0.5 / 0.1) + 1)
    for k in range(n + 1):
        x, y = p[0] + (q[0] - p[0]) * k / n, p[1] + (q[1] - p[1]) * k / n
        if r0 <= ((x - cx) ** 2 + (y - cy) ** 2) ** 0.5 <= r1:
            return True
    return False


def leader_ends(point, box, start_mm: float, gap_mm: float = MARGIN_MM):
    """The leader from a point to a label's box: from ``start_mm`` out of
    the point (past its dot) towards the box's nearest point, stopping
    ``gap_mm`` short of it; None when the box is nearer than that."""
    x, y = point
    nx, ny = min(max(x, box[0]), box[2]), min(max(y, box[1]), box[3])
    dx, dy = nx - x, ny - y
    dist = (dx * dx + dy * dy) ** 0.5
    if dist <= start_mm + gap_mm + 0.2:
        return None
    ux, uy = dx / dist, dy / dist
    return ((x + ux * start_mm, y + uy * start_mm), (nx - ux * gap_mm, ny - uy * gap_mm))


def place_labels(points, texts, size_pt: float, offset_mm: float, keep_out=(), inside_radius_mm=None,
                 keep_out_rings=(), *, measure, leaders_from_mm=None, own_boxes=None):
    """For each point (in order of importance) the (at, anchor) of its
    label: right, left, above, below the point or at a corner, at the
    offset or (when those are taken) farther out, the first of these whose
    measured box meets no label placed before, no
    ``keep_out`` box, no ring of ``keep_out_rings`` ((center, r_inner,
    r_outer)) and stays inside ``inside_radius_mm``; else ``None`` (the
    label is left out rather than printed over another, over a scale or
    off the part).

    With ``leaders_from_mm`` (the radius of each point's dot, a list), the
    result is (at, anchor, leader) and places farther still
    (:data:`WITH_LEADER`) are tried, each with a leader line from the dot
    to the label that crosses no box or ring kept out and no label or
    leader placed before (``leader`` is None for a label near its dot).
    ``own_boxes`` (one per point, e.g. its dot) are left out of the
    leader's own point's test.  With leaders, a label without one stands
    within :data:`ALONE_REACH` offsets of its point and nearer its own dot
    than any other point's, by :data:`NEARER_BY_MM`; every other place,
    near or far, takes a leader, keeps :data:`LEADER_NAME_CLEAR` offsets
    (and :data:`NAME_GAP_MM` at least) from every other dot, and its
    leader crosses no other leader and keeps :data:`LEADER_CLEAR_MM` from
    every other dot.  Labels keep :data:`NAME_GAP_MM` from each other, no
    leader passes between another label and its point (#9: Hadar's name
    cut off from its dot by Rigil Kentaurus's leader), and a label with no
    free place may take that of one of its :data:`REPAIR_NEIGHBOURS`
    nearest labels if that one then finds another."""
    with_leaders = leaders_from_mm is not None
    reaches = NEAR_FIRST + (WITH_LEADER if with_leaders else ())
    chosen = {}   # point index -> (at, anchor, box, leader)

    def choose(k, across_rings=False):
        """The first free place of point k's label, given those chosen;
        its leader crosses a ring kept out (from a point on it) only
        ``across_rings``."""
        (x, y), text = points[k], texts[k]
        others = [c for j, c in chosen.items() if j != k]
        placed = list(keep_out) + [c[2] for c in others]
        names = [c[2] for c in others]
        lines = [c[3] for c in others if c[3] is not None]
        links = [_link(points[j], c[2]) for j, c in chosen.items() if j != k]
        h = measure(text, size_pt).height_mm
        for (at, anchor), reach, needs_leader in _candidates(x, y, h, offset_mm, reaches, with_leaders):
            box = text_box_mm(at, text, size_pt, anchor, measure)
            if inside_radius_mm is not None and max(abs(box[0]), abs(box[2])) ** 2 + \
                    max(abs(box[1]), abs(box[3])) ** 2 > inside_radius_mm ** 2:
                continue
            if any(_overlap(box, other) for other in placed) or \
                    any(_meets_ring(box, ring) for ring in keep_out_rings) or \
                    any(_segment_meets_box(a, b, box) for a, b in lines):
                continue
            if with_leaders:
                g = NAME_GAP_MM
                if any(_overlap((box[0] - g, box[1] - g, box[2] + g, box[3] + g), other) for other in names):
                    continue
                if not needs_leader and (not _nearest_own(box, k, points, leaders_from_mm)
                                         or any(_segments_cross(a, b, p, q) for a, b in lines
                                                for p, q in _link((x, y), box))):
                    continue
                if needs_leader and _beside_another(box, k, points, leaders_from_mm,
                                                    max(offset_mm * LEADER_NAME_CLEAR, NAME_GAP_MM)):
                    continue
            leader = None
            if needs_leader:
                leader = leader_ends((x, y), box, leaders_from_mm[k] + MARGIN_MM)
                if leader is None:
                    continue
                own = own_boxes[k] if own_boxes is not None else None
                if any(_segment_meets_box(leader[0], leader[1], other) for other in placed if other is not own) \
                        or any(_segment_meets_ring(leader[0], leader[1], ring) for ring in keep_out_rings
                               if not (across_rings and _segment_meets_ring((x, y), (x, y), ring))) \
                        or any(_segments_cross(leader[0], leader[1], a, b) for a, b in lines) \
                        or any(_segments_cross(leader[0], leader[1], p, q) for link in links for p, q in link) \
                        or _passes_another(leader, k, points, leaders_from_mm, LEADER_CLEAR_MM):
                    # (a dot on a ring must cross it; two leaders never cross,
                    # nor pass between another label and its point)
                    continue
            return (at, anchor, box, leader)
        return None

    def first_free(k):
        # a leader across a scale's band from a point on it only where
        # there is no other place (#9: Kaus Australis's across the band)
        return choose(k) or choose(k, across_rings=True)

    for k in range(len(points)):
        choice = first_free(k)
        if choice is not None:
            chosen[k] = choice
    if with_leaders:
        # A label with no free place may take a neighbour's, if the
        # neighbour then finds another (a step of repair after the greedy
        # pass, common practice in map labelling).
        for k in range(len(points)):
            if k in chosen:
                continue
            near = sorted(chosen, key=lambda j: _box_gap_mm(chosen[j][2], points[k], 0.0))[:REPAIR_NEIGHBOURS]
            for j in near:
                kept = chosen.pop(j)
                mine = first_free(k)
                if mine is not None:
                    chosen[k] = mine
                    theirs = first_free(j)
                    if theirs is not None:
                        chosen[j] = theirs
                        break
                    del chosen[k]
                chosen[j] = kept
    out = []
    for k in range(len(points)):
        c = chosen.get(k)
        out.append(None if c is None else c[:2] if not with_leaders else (c[0], c[1], c[3]))
    return out


def _candidates(x, y, h, offset_mm, reaches, with_leaders):
    """The places tried for a label of height ``h`` beside the point (x, y),
    nearest first: ``((at, anchor), reach, needs_leader)``."""
    candidates = []
    for reach in reaches:
        o = offset_mm * reach
        d = o * 0.75
        if reach > NEAR_FIRST[-1]:  # far out, with a leader: directions all round the point
            for j in range(LEADER_DIRECTIONS):
                a = 2 * math.pi * j / LEADER_DIRECTIONS
                ca, sa = math.cos(a), math.sin(a)
                anchor = "start" if ca > 0.3 else "end" if ca < -0.3 else "middle"
                lift = (h / 2) * (1 if sa > 0 else -1) if anchor == "middle" else 0.0
                candidates.append((((x + o * ca, y + o * sa + lift), anchor), reach))
            continue
        candidates += [(((x + o, y), "start"), reach), (((x - o, y), "end"), reach),
                       (((x, y + o + h / 2), "middle"), reach), (((x, y - o - h / 2), "middle"), reach),
                       (((x + d, y + d + h / 2), "start"), reach), (((x - d, y + d + h / 2), "end"), reach),
                       (((x + d, y - d - h / 2), "start"), reach), (((x - d, y - d - h / 2), "end"), reach)]
        # then beside the point but raised or lowered by half the name's
        # height, and above or below it to one side (the places of map
        # labelling between those eight)
        candidates += [(((x + o, y + s * h / 2), "start"), reach) for s in (1, -1)] + \
                      [(((x - o, y + s * h / 2), "end"), reach) for s in (1, -1)] + \
                      [(((x + o / 2, y + s * (o + h / 2)), anchor), reach)
                       for s in (1, -1) for anchor in ("start", "end")]
    if with_leaders:
        # First the places a name reads from alone, then every place with a leader.
        return ([(c, reach, False) for c, reach in candidates if reach <= ALONE_REACH]
                + [(c, reach, True) for c, reach in candidates])
    return [(c, reach, False) for c, reach in candidates]


def _box_gap_mm(box, point, radius_mm: float) -> float:
    """Paper (mm) between a dot of ``radius_mm`` at ``point`` and a box."""
    x, y = point
    return math.hypot(x - min(max(x, box[0]), box[2]), y - min(max(y, box[1]), box[3])) - radius_mm


def _link(point, box):
    """The segments from a point to its label's box: to each corner and to
    the box's nearest point.  A line that passes between the label and its
    point (through the shape they span) crosses one of them."""
    x, y = point
    near = (min(max(x, box[0]), box[2]), min(max(y, box[1]), box[3]))
    return [((x, y), c) for c in ((box[0], box[1]), (box[2], box[1]), (box[2], box[3]), (box[0], box[3]), near)]


def _nearest_own(box, k: int, points, radii_mm) -> bool:
    """Whether the box lies nearer point ``k``'s dot than any other
    point's, by :data:`NEARER_BY_MM` at least."""
    own = _box_gap_mm(box, points[k], radii_mm[k])
    return all(own + NEARER_BY_MM < _box_gap_mm(box, p, r)
               for j, (p, r) in enumerate(zip(points, radii_mm)) if j != k)


def _segments_cross(p, q, a, b) -> bool:
    """Whether segments pq and ab cross (the signs of the orientations of
    each one's ends about the other, the usual test of computational
    geometry)."""
    def side(o, u, v):
        return (u[0] - o[0]) * (v[1] - o[1]) - (u[1] - o[1]) * (v[0] - o[0])
    return side(p, q, a) * side(p, q, b) < 0 and side(a, b, p) * side(a, b, q) < 0


def _passes_another(leader, k: int, points, radii_mm, near_mm: float) -> bool:
    """Whether the leader passes within ``near_mm`` of a dot other than
    point ``k``'s, where it could be read as that dot's."""
    (ax, ay), (bx, by) = leader
    dx, dy = bx - ax, by - ay
    n2 = dx * dx + dy * dy
    for j, ((x, y), r) in enumerate(zip(points, radii_mm)):
        if j == k:
            continue
        t = min(max(((x - ax) * dx + (y - ay) * dy) / n2, 0.0), 1.0) if n2 > 0 else 0.0
        if math.hypot(x - ax - t * dx, y - ay - t * dy) - r < near_mm:
            return True
    return False


def _beside_another(box, k: int, points, radii_mm, near_mm: float) -> bool:
    """Whether the box stands within ``near_mm`` of a dot other than point
    ``k``'s, where it would read as that dot's name, leader or not."""
    return any(_box_gap_mm(box, p, r) < near_mm for j, (p, r) in enumerate(zip(points, radii_mm)) if j != k)


def fitted_text(role, at, string: str, size_pt: float, words, max_width_mm: float,
                max_height_mm: float | None = None, angle_deg: float = 0.0, anchor: str = "middle",
                short: str | None = None, style: str = "label", min_pt: float = MIN_TEXT_PT,
                fallbacks: tuple[str, ...] = (), optional: bool = False, **values) -> list[model.Element]:
    """Text elements for ``string`` fitted to a room ``max_width_mm`` long
    (along the text) and ``max_height_mm`` high around ``at``, made no
    smaller than ``min_pt`` before it is broken into lines: one element
    per line, the lines stacked across the text's direction about ``at``.
    Each element carries ``full_text`` (the whole label) in its values
    when the label was shortened or broken.

    Where the fitting rule would have to cut the words short with "…",
    each of ``fallbacks`` (shorter texts that still say the essential, such
    as the year alone) is tried in turn; an ``optional`` label (one that
    the instructions also explain) is then left out rather than cut short
    (#11: no shipped language reaches the "…")."""
    fitted = words.fit(string, size_pt, max_width_mm, max_height_mm, short, style, min_pt)
    if any(line.endswith("\u2026") for line in fitted.lines):
        for other in fallbacks:
            if other and other != string:
                return fitted_text(role, at, other, size_pt, words, max_width_mm, max_height_mm, angle_deg, anchor,
                                   None, style, min_pt, fallbacks[fallbacks.index(other) + 1:], optional, **values)
        if optional:
            return []
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


def owner_near(owner: str, lines, others, disc_mm: float, size_pt: float, words, keep_out=()):
    """The owner's name (#9) set as one more line under the label ``lines``
    (or over them, or mirrored across the meridian), left-aligned with
    them, at the first of these places that stays inside ``disc_mm`` and
    keeps :data:`MARGIN_MM` from the boxes of the text elements
    ``others`` and the boxes ``keep_out``; no element where none does (or
    without an owner)."""
    if not owner or not lines:
        return []
    m = MARGIN_MM
    ext = words.measure(owner, size_pt)
    taken = [element_box_mm(e, words) for e in others] + list(keep_out)
    top = max(element_box_mm(e, words)[3] for e in lines)
    bottom = min(element_box_mm(e, words)[1] for e in lines)
    x = lines[0].geom["at"][0]
    for y in (bottom - m - ext.height_mm / 2, top + m + ext.height_mm / 2):
        for at, anchor in (((x, y), "start"), ((-x, y), "end")):
            box = text_box_mm(at, owner, size_pt, anchor, words.measure)
            grown = (box[0] - m, box[1] - m, box[2] + m, box[3] + m)
            corners = [(box[i], box[j]) for i in (0, 2) for j in (1, 3)]
            if max((cx * cx + cy * cy) ** 0.5 for cx, cy in corners) > disc_mm - m:
                continue
            if any(_overlap(grown, t) for t in taken):
                continue
            return [model.text("owner", at, owner, size_pt, 0.0, anchor)]
    return []

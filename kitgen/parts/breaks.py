"""Lines broken around labels: no drawn line crosses a printed character.

A label is a turned rectangle (:class:`Box`): the measured extent of its
text (``Words.measure``, the shipped fonts' advances and outlines), grown
by a clearance.  Every stroke of a part (circle, arc, segment, polyline)
that passes through such a box is cut there and drawn as the pieces
outside it, each exact: a circle's pieces are arcs of the same circle, a
segment's and a polyline's pieces run along the same lines.  Leaving a gap
in the lines round a number or a name is common practice on printed scales
and maps.

Pure plane geometry in mm; angles in degrees at the edges (as the geometry
model stores them), radians inside.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from ..geometry import model
from ..geometry.arrays import unique_ints
from ..kept import keep_last

#: Pieces a break leaves shorter than this (mm) are dropped: a stub
#: between a label and the rim, a line's end or another label reads as a
#: stray tick or a minus sign, not as the end of its line (#9).  Stopping
#: a line at a number rather than leaving a scrap of it is common practice
#: of lettering on printed scales and maps; the value is ours, about four
#: widths of the heaviest plate line at A4.  A line that no label cuts is
#: kept whole, however short.
MIN_PIECE_MM = 1.5
#: A piece shorter than this (mm) is no line at all, wherever it ends: a
#: circle that only grazes a box leaves, by rounding, a piece of no length
#: (an arc from an angle to the same angle, which no renderer can draw).
NO_PIECE_MM = 1e-6


@dataclass(frozen=True)
class Box:
    """A rectangle centred on ``center``, its long side along the unit
    vector (cos a, sin a) with ``angle_rad`` = a, ``half_w`` along it and
    ``half_h`` across it (mm)."""

    center: tuple[float, float]
    angle_rad: float
    half_w: float
    half_h: float
    radius: float = field(init=False, repr=False, compare=False)
    # cos and sin of the angle, worked out once for every test of the box (#12)
    cos: float = field(init=False, repr=False, compare=False)
    sin: float = field(init=False, repr=False, compare=False)

    def grown(self, by_mm: float) -> "Box":
        # The same box as Box(...) would make, its angle's cos and sin
        # taken over rather than worked out again (#12).
        out = object.__new__(Box)
        hw, hh = self.half_w + by_mm, self.half_h + by_mm
        out.__dict__.update(center=self.center, angle_rad=self.angle_rad, half_w=hw, half_h=hh,
                            radius=math.hypot(hw, hh), cos=self.cos, sin=self.sin)
        return out

    def moved(self, center) -> "Box":
        """The same box centred on ``center``, as Box(...) would make it,
        its radius and its angle's cos and sin taken over (#12)."""
        out = object.__new__(Box)
        out.__dict__.update(center=center, angle_rad=self.angle_rad, half_w=self.half_w, half_h=self.half_h,
                            radius=self.radius, cos=self.cos, sin=self.sin)
        return out

    def local(self, x: float, y: float) -> tuple[float, float]:
        """(x, y) in the box's own frame (its centre at 0, its side along x)."""
        dx, dy = x - self.center[0], y - self.center[1]
        c, s = self.cos, self.sin
        return (c * dx + s * dy, -s * dx + c * dy)

    def corners(self):
        got = self.__dict__.get("_corners")
        if got is not None:
            return list(got)
        c, s = self.cos, self.sin
        out = []
        for dx, dy in ((-self.half_w, -self.half_h), (self.half_w, -self.half_h),
                       (self.half_w, self.half_h), (-self.half_w, self.half_h)):
            out.append((self.center[0] + c * dx - s * dy, self.center[1] + s * dx + c * dy))
        self.__dict__["_corners"] = tuple(out)   # a box never changes: its corners kept
        return out

    def contains(self, x: float, y: float) -> bool:
        u, v = self.local(x, y)
        return abs(u) < self.half_w and abs(v) < self.half_h

    def __post_init__(self):
        # Half of the diagonal: every point of the box is this close to its centre.
        object.__setattr__(self, "radius", math.hypot(self.half_w, self.half_h))
        object.__setattr__(self, "cos", math.cos(self.angle_rad))
        object.__setattr__(self, "sin", math.sin(self.angle_rad))


def text_box(el, words, style: str = "label") -> Box:
    """The box of a text element: its measured extent, turned as it is set
    (the line's middle height on ``at``, see :mod:`kitgen.geometry.model`),
    along the line from its leftmost to its rightmost ink, advance
    included (an Arabic tail or a Devanagari vowel sign may reach past
    the advance: #9)."""
    g = el.geom
    ext = words.measure(g["text"], g["size_pt"], style)
    left, right = words.ink_span_mm(g["text"], g["size_pt"], style)
    a = math.radians(g["angle_deg"])
    start = {"start": 0.0, "middle": -ext.width_mm / 2, "end": -ext.width_mm}[g["anchor"]]
    shift = start + (left + right) / 2
    c = (g["at"][0] + math.cos(a) * shift, g["at"][1] + math.sin(a) * shift)
    return Box(c, a, (right - left) / 2, ext.height_mm / 2)


def boxes_overlap(a: Box, b: Box) -> bool:
    """Whether two boxes overlap (separating-axis test for convex polygons)."""
    if a.angle_rad == 0.0 and b.angle_rad == 0.0:   # both upright: their sides are the axes
        return (abs(a.center[0] - b.center[0]) < a.half_w + b.half_w
                and abs(a.center[1] - b.center[1]) < a.half_h + b.half_h)
    # Decided by the boxes' extents where they clear rounding (#12).
    sure = _overlap_by_extents(a, b)
    if sure is not None:
        return sure
    pa, pb = a.corners(), b.corners()
    for ux, uy in _axes(a) + _axes(b):
        ra = [x * ux + y * uy for x, y in pa]
        rb = [x * ux + y * uy for x, y in pb]
        if max(ra) <= min(rb) or max(rb) <= min(ra):
            return False
    return True


def _overlap_by_extents(a: Box, b: Box):
    """The separating-axis test worked from each box's half extent along
    the four axes (its half sides times the cosines between the boxes'
    sides) rather than from the corners: False where an axis separates
    the boxes, True where every axis finds them overlapping, each by
    :data:`SURE_MM`, far above any rounding; else None (#12)."""
    if not (a.half_w > 0.0 and a.half_h > 0.0 and b.half_w > 0.0 and b.half_h > 0.0):
        return None
    ca, sa, cb, sb = a.cos, a.sin, b.cos, b.sin
    cos_ab = abs(ca * cb + sa * sb)
    sin_ab = abs(sa * cb - ca * sb)
    dx, dy = b.center[0] - a.center[0], b.center[1] - a.center[1]
    least = math.inf
    for gap, reach in ((abs(dx * ca + dy * sa), a.half_w + b.half_w * cos_ab + b.half_h * sin_ab),
                       (abs(dy * ca - dx * sa), a.half_h + b.half_w * sin_ab + b.half_h * cos_ab),
                       (abs(dx * cb + dy * sb), b.half_w + a.half_w * cos_ab + a.half_h * sin_ab),
                       (abs(dy * cb - dx * sb), b.half_h + a.half_w * sin_ab + a.half_h * cos_ab)):
        if gap > reach + SURE_MM:
            return False
        least = min(least, reach - gap)
    return True if least > SURE_MM else None


def _axes(box: Box):
    """The unit vectors along the box's sides (kept with the box)."""
    got = box.__dict__.get("_axes")
    if got is None:
        a = box.angle_rad
        got = box.__dict__["_axes"] = ((box.cos, box.sin), (math.cos(a + math.pi / 2), math.sin(a + math.pi / 2)))
    return got


# -- where a stroke runs inside a box ---------------------------------------------

def segment_inside(p, q, box: Box):
    """The parameter interval (t0, t1) of the segment p + t (q - p), 0 <= t
    <= 1, inside the box, or None (Liang and Barsky's clipping, 1984)."""
    # Written out (the box's frame, then x, then y) for speed, every
    # operation as before (#12).
    c, s = box.cos, box.sin
    bx, by = box.center
    dx, dy = p[0] - bx, p[1] - by
    x0, y0 = c * dx + s * dy, -s * dx + c * dy
    dx, dy = q[0] - bx, q[1] - by
    x1, y1 = c * dx + s * dy, -s * dx + c * dy
    t0, t1 = 0.0, 1.0
    hw = box.half_w
    d = x1 - x0
    if abs(d) < 1e-15:
        if x0 <= -hw or x0 >= hw:
            return None
    else:
        a, b = (-hw - x0) / d, (hw - x0) / d
        if a > b:
            a, b = b, a
        if a > t0:
            t0 = a
        if b < t1:
            t1 = b
        if t0 >= t1:
            return None
    hh = box.half_h
    d = y1 - y0
    if abs(d) < 1e-15:
        if y0 <= -hh or y0 >= hh:
            return None
    else:
        a, b = (-hh - y0) / d, (hh - y0) / d
        if a > b:
            a, b = b, a
        if a > t0:
            t0 = a
        if b < t1:
            t1 = b
        if t0 >= t1:
            return None
    return (t0, t1)


#: How far past a box's corner an edge's crossing still counts (mm).
_CORNER_MM = 1e-9


def circle_inside(center, radius_mm: float, box: Box):
    """The angular ranges (a, b) in radians, counter-clockwise from +x about
    ``center``, b > a, of the circle inside the box."""
    cx, cy = box.local(*center)
    r = radius_mm
    if math.hypot(cx, cy) - r > box.radius:
        return []
    hits = []
    for edge, half, other in ((box.half_w, box.half_h, 0), (-box.half_w, box.half_h, 0),
                              (box.half_h, box.half_w, 1), (-box.half_h, box.half_w, 1)):
        # Edge x = edge (other == 0) or y = edge (other == 1), |along| <= half.
        d = edge - (cx if other == 0 else cy)
        room = (r - d) * (r + d)   # r^2 - d^2 without cancellation
        if room < 0.0:
            continue
        for along in (math.sqrt(room), -math.sqrt(room)):
            centre_along = cy if other == 0 else cx
            # A crossing at a corner is kept from both its edges (within
            # _CORNER_MM): one lost to rounding would leave an odd count.
            if abs(centre_along + along) <= half + _CORNER_MM:
                hits.append(math.atan2(along, d) if other == 0 else math.atan2(d, along))
    if not hits:
        return [(0.0, 2 * math.pi)] if _inside_local(box, cx + r, cy) else []
    hits = sorted(set(h % (2 * math.pi) for h in hits))
    out = []
    for i, a in enumerate(hits):
        b = hits[(i + 1) % len(hits)]
        if b <= a:
            b += 2 * math.pi
        m = (a + b) / 2
        if _inside_local(box, cx + r * math.cos(m), cy + r * math.sin(m)):
            out.append((a + box.angle_rad, b + box.angle_rad))
    return out


def _inside_local(box: Box, u: float, v: float) -> bool:
    return abs(u) < box.half_w and abs(v) < box.half_h


def meets(el, box: Box) -> bool:
    """Whether the stroke element ``el`` runs through ``box``.

    A circle or an arc is first tested by its distances to the box, a
    polyline's segments by the grid cells they span; where those tests
    decide by a margin far above any rounding, their answer is that of
    the exact tests below, which decide the rest (#12)."""
    return may_meet(el, box) and meets_near(el, box)


def meets_near(el, box: Box) -> bool:
    """:func:`meets` for a box that :func:`may_meet` does not rule out:
    the rest of its tests, for a caller that has made that one already
    (#12)."""
    g = el.geom
    shape = el.shape
    if shape == "circle" or shape == "arc":
        center, r = g["center"], g["radius"]
        crosses = _circle_crosses(center, r, box.center, box.cos, box.sin, box.half_w, box.half_h)
        if shape == "circle":
            return crosses if crosses is not None else bool(circle_inside(center, r, box))
        if crosses is False:
            return False
        lo, hi = math.radians(g["start_deg"]), math.radians(g["end_deg"])
        if crosses:   # the box within the arc's angles or outside them
            within = _within_arc(center, box.center, box.radius, lo, hi)
            if within is not None:
                return within
        return bool(_clip_to_range(circle_inside(center, r, box), lo, hi))
    if shape == "segment":
        return segment_inside(g["from"], g["to"], box) is not None
    if shape == "polyline":
        pts, near = _polyline_near(g, box)
        for i in near:
            if segment_inside(pts[i], pts[i + 1], box) is not None:
                return True
        return False
    return False


def ring_meets_grown(el, box: Box, by_mm: float, radius_mm: float, lo: float, hi: float) -> bool:
    """:func:`meets_near` of a circle or an arc (its angles ``lo`` to
    ``hi`` in radians) and ``box`` grown by ``by_mm`` (``radius_mm``
    the grown box's radius): the quick tests worked from the grown
    box's figures, the grown box made only where they leave the
    answer in doubt (the same answer, #12)."""
    center = el.geom["center"]
    crosses = _circle_crosses(center, el.geom["radius"], box.center, box.cos, box.sin, box.half_w + by_mm,
                              box.half_h + by_mm)
    if crosses is False:
        return False
    if crosses:
        if el.shape == "circle":
            return True
        within = _within_arc(center, box.center, radius_mm, lo, hi)
        if within is not None:
            return within
    return meets_near(el, box.grown(by_mm))


#: The margin (mm) by which a quick test must decide, far above the
#: rounding of the plate's coordinates (about 1e-13 mm), else the exact
#: test decides; and the same in radians for an arc's ends.
SURE_MM = 1e-6
SURE_RAD = 1e-9


def _circle_crosses(center, radius_mm: float, at, c: float, s: float, hw: float, hh: float):
    """Whether the circle runs through the box centred ``at``, its side
    along (``c``, ``s``), ``hw`` by ``hh`` half (a :class:`Box`'s
    figures, taken one by one so that a caller need not make the box,
    #12), from the nearest and the
    farthest point of the box to the circle's centre: True where the
    nearest is inside the circle and the farthest outside, False where
    both are on one side, each by :data:`SURE_MM` (grown with the
    radius); else None.  None too where a corner is as near the circle,
    or the circle as near touching a side: there the exact test's
    rounding decides, and it is left to decide."""
    if not (hw > 0.0 and hh > 0.0):
        return None
    dx, dy = center[0] - at[0], center[1] - at[1]
    ax, ay = abs(c * dx + s * dy), abs(-s * dx + c * dy)
    r = radius_mm
    ex, ey = ax - hw, ay - hh
    nearest = math.hypot(ex if ex > 0.0 else 0.0, ey if ey > 0.0 else 0.0)
    farthest = math.hypot(ax + hw, ay + hh)
    m = SURE_MM + 1e-9 * r
    if nearest > r + m or farthest < r - m:
        return False
    if not (nearest < r - m and farthest > r + m):
        return None
    # the other three corners, and the four sides' lines where the circle
    # would touch them within the side
    if (abs(math.hypot(ex, ey) - r) <= m or abs(math.hypot(ax + hw, ey) - r) <= m
            or abs(math.hypot(ex, ay + hh) - r) <= m):
        return None
    if ay <= hh + m and (abs(abs(ex) - r) <= m or abs(ax + hw - r) <= m):
        return None
    if ax <= hw + m and (abs(abs(ey) - r) <= m or abs(ay + hh - r) <= m):
        return None
    return True


def _within_arc(center, at, radius_mm: float, lo: float, hi: float):
    """Whether the directions from ``center`` to the points of a box
    centred ``at`` all lie within the arc's angles [lo, hi] (True) or all
    outside them (False), by :data:`SURE_RAD`; else None.  The box lies
    within its bounding disc (of ``radius_mm``), which subtends
    asin(radius / distance) either side of its centre."""
    dx, dy = at[0] - center[0], at[1] - center[1]
    dist = math.hypot(dx, dy)
    if dist <= radius_mm + SURE_MM:
        return None
    half = math.asin(radius_mm / dist)
    rel = (math.atan2(dy, dx) - lo) % (2 * math.pi)
    span = hi - lo
    if rel - half >= SURE_RAD and rel + half <= span - SURE_RAD:
        return True
    if rel - half >= span + SURE_RAD and rel + half <= 2 * math.pi - SURE_RAD:
        return False
    return None


#: What :func:`arcs_meet_boxes` says of a box and a circle or an arc.
MISSES, MEETS, UNSURE = 0, 1, 2


def arcs_meet_boxes(boxes, grow_mm, center_x, center_y, radius_mm, lo_rad, hi_rad, whole):
    """Whether each box of ``boxes`` (rows), grown by ``grow_mm`` (one
    value a column), meets each circle or arc (columns: centres, radii,
    angles, ``whole`` true for a circle), all at once as NumPy arrays:
    :data:`MISSES` or :data:`MEETS` where the quick tests of :func:`meets`
    (:func:`_circle_crosses`, :func:`_within_arc`) decide by their
    margins, far above any rounding, so that the answer is that of
    :func:`meets`; :data:`UNSURE` where its exact test must decide (#12).
    ``boxes`` is (x, y, cos, sin, half width, half height) of column
    arrays, one row a box."""
    bx, by, c, s, hw0, hh0 = boxes
    hw, hh = hw0 + grow_mm, hh0 + grow_mm
    whole = np.asarray(whole, dtype=bool)
    dx, dy = center_x - bx, center_y - by
    ax, ay = np.abs(c * dx + s * dy), np.abs(c * dy - s * dx)
    r = radius_mm
    ex, ey = ax - hw, ay - hh
    fx, fy = ax + hw, ay + hh
    nearest = np.hypot(np.maximum(ex, 0.0), np.maximum(ey, 0.0))
    farthest = np.hypot(fx, fy)
    m = SURE_MM + 1e-9 * r
    miss = (nearest > r + m) | (farthest < r - m)
    cross = (nearest < r - m) & (farthest > r + m)
    # a corner as near the circle, or the circle as near touching a side
    touch = ((np.abs(np.hypot(ex, ey) - r) <= m) | (np.abs(np.hypot(fx, ey) - r) <= m)
             | (np.abs(np.hypot(ex, fy) - r) <= m)
             | ((ay <= hh + m) & ((np.abs(np.abs(ex) - r) <= m) | (np.abs(fx - r) <= m)))
             | ((ax <= hw + m) & ((np.abs(np.abs(ey) - r) <= m) | (np.abs(fy - r) <= m))))
    cross &= ~touch
    # an arc: the box's bounding disc seen from the centre within its angles, or outside them
    rb = np.hypot(hw, hh)
    dist = np.hypot(dx, dy)
    far = dist > rb + SURE_MM
    half = np.arcsin(np.where(far, rb / np.where(far, dist, 1.0), 0.0))
    rel = np.mod(np.arctan2(-dy, -dx) - lo_rad, 2 * math.pi)
    span = hi_rad - lo_rad
    within = whole | (far & (rel - half >= SURE_RAD) & (rel + half <= span - SURE_RAD))
    outside = ~whole & far & (rel - half >= span + SURE_RAD) & (rel + half <= 2 * math.pi - SURE_RAD)
    out = np.full(miss.shape, UNSURE, dtype=np.int8)
    out[cross & within] = MEETS
    out[miss | (cross & outside)] = MISSES
    return out


def segments_meet_boxes(boxes, grow_mm, p_x, p_y, q_x, q_y):
    """Whether each box of ``boxes`` (rows, as in :func:`arcs_meet_boxes`),
    grown by ``grow_mm`` (one value a column), meets each segment p q
    (columns), all at once as NumPy arrays, by the separating-axis test
    (the box's two sides and the segment's normal): :data:`MISSES` where
    an axis parts them by :data:`SURE_MM`, :data:`MEETS` where along every
    axis either would have to move twice that to part them (they then meet within the
    box shrunk by more than SURE_MM / sqrt 2 all round, far above the
    rounding of :func:`segment_inside`), else :data:`UNSURE` (#12)."""
    bx, by, c, s, hw0, hh0 = boxes
    hw, hh = hw0 + grow_mm, hh0 + grow_mm
    gaps = []
    for ux, uy, half in ((c, s, hw), (-s, c, hh)):   # along the box's sides
        mid, a, b = ux * bx + uy * by, ux * p_x + uy * p_y, ux * q_x + uy * q_y
        # how far either would have to move along the axis to part them
        gaps.append(np.minimum(mid + half - np.minimum(a, b), np.maximum(a, b) - (mid - half)))
    dx, dy = q_x - p_x, q_y - p_y
    length = np.hypot(dx, dy)
    nx, ny = -dy / np.where(length > 0, length, 1.0), dx / np.where(length > 0, length, 1.0)
    reach = hw * np.abs(nx * c + ny * s) + hh * np.abs(ny * c - nx * s)
    gaps.append(reach - np.abs(nx * (bx - p_x) + ny * (by - p_y)))
    least = np.minimum(np.minimum(gaps[0], gaps[1]), gaps[2])
    out = np.full(least.shape, UNSURE, dtype=np.int8)
    out[(least > 2 * SURE_MM) & (length > 1e-6)] = MEETS
    out[(gaps[0] < -SURE_MM) | (gaps[1] < -SURE_MM) | ((gaps[2] < -SURE_MM) & (length > 1e-6))] = MISSES
    return out


#: Side (mm) of the grid cells by which a polyline's segments are found.
POLY_CELL_MM = 4.0
#: A query spanning more cells than this reads every segment's bounds instead.
POLY_MAX_CELLS = 64
_POLY_GRIDS: dict = {}
#: How many polylines' grids (:func:`_polyline_near`), and how many point
#: tuples' bounds (:func:`_segment_bounds`, :func:`_line_bounds`), are kept,
#: the oldest let go first: a kit of one plate enters about 10 polylines
#: and 35 tuples of points, one of eight plates 85 and 170, so these hold
#: the largest kit whole and the last several small ones.  Kept by the
#: thousand, they held every kit's polylines of a class set alive, a
#: worker growing by 2 MB a kit of its own latitude (#12).  A new kit
#: lets them all go (:func:`let_go`).
POLYLINES_KEPT = 128
POINTS_KEPT = 512


def let_go() -> None:
    """Let every kept polyline grid and point tuple's bounds go
    (:data:`POLYLINES_KEPT`), as a new kit is about to be drawn: they
    serve one kit's label search and its owners' names, and another
    kit's points are never the same tuples.  Left to fill up to the caps
    over a class set's schools, they kept about 14 kits' polylines alive
    in a worker, 20 MB of its peak; a name set again with them gone
    costs about 0.5 ms more (#12)."""
    _POLY_GRIDS.clear()
    _BOUNDS.clear()
    _LINE_BOUNDS.clear()


def _polyline_near(g, box: Box):
    """The polyline's points (closed: the first again at the end) and the
    indices, in order (as an iterator), of its segments that may meet
    the box: those whose bounding box, grown by the box's radius, holds
    the box's centre (for an upright box, those whose bounding box
    overlaps it), looked for only among the segments in the grid cells
    the box's bounding square spans (a segment's bounds lie in the cells
    it is entered in; #12)."""
    points, closed = g["points"], g["closed"]
    kept = _POLY_GRIDS.get(id(points))
    if kept is None or kept[0] is not points or kept[1] != closed:
        pts = tuple(points) + ((points[0],) if closed else ())
        lo, hi = _segment_bounds(pts)
        cells = _segment_cells(lo, hi)
        bounds = (lo[:, 0].tolist(), hi[:, 0].tolist(), lo[:, 1].tolist(), hi[:, 1].tolist())
        # the points kept: their id stays theirs
        kept = keep_last(_POLY_GRIDS, id(points), (points, closed, pts, cells, bounds, {}), POLYLINES_KEPT)
    pts, cells, (lox, hix, loy, hiy), spans = kept[2], kept[3], kept[4], kept[5]
    reach = box.radius + SURE_MM
    x, y = box.center
    i0, i1 = math.floor((x - reach) / POLY_CELL_MM), math.floor((x + reach) / POLY_CELL_MM)
    j0, j1 = math.floor((y - reach) / POLY_CELL_MM), math.floor((y + reach) / POLY_CELL_MM)
    if (i1 - i0 + 1) * (j1 - j0 + 1) > POLY_MAX_CELLS:
        lo, hi = _segment_bounds(pts)
        rr = box.radius
        return pts, np.nonzero((lo[:, 0] - rr <= x) & (x <= hi[:, 0] + rr)
                               & (lo[:, 1] - rr <= y) & (y <= hi[:, 1] + rr))[0]
    near = spans.get((i0, i1, j0, j1))
    if near is None:   # the segments in these cells, kept by span (neighbouring places share it)
        found = set()
        for ci in range(i0, i1 + 1):
            for cj in range(j0, j1 + 1):
                found.update(cells.get((ci, cj), ()))
        if len(spans) > 4096:
            spans.clear()
        near = spans[(i0, i1, j0, j1)] = sorted(found)
    if box.angle_rad == 0.0:
        # An upright box's frame is the plane's shifted (cos 1, sin 0): a
        # segment whose bounds, less the box's centre, end at or beyond a
        # side is one segment_inside finds outside (its ends' local
        # coordinates are those very differences), so it is left out (#12).
        hw, hh = box.half_w, box.half_h
        return pts, (i for i in near if hix[i] - x > -hw and lox[i] - x < hw and hiy[i] - y > -hh and loy[i] - y < hh)
    rr = box.radius   # of those, the ones the bounds test above keeps, as they are asked for
    return pts, (i for i in near if lox[i] - rr <= x <= hix[i] + rr and loy[i] - rr <= y <= hiy[i] + rr)


def _segment_cells(lo, hi) -> dict:
    """{(column, row): the indices, in order, of the segments whose bounds
    (corners ``lo`` and ``hi``, arrays) reach into that grid cell of side
    :data:`POLY_CELL_MM`}: each segment's cells found as arrays, the floors
    of its bounds over the side (#12)."""
    i0, j0 = np.floor(lo / POLY_CELL_MM).astype(int).T
    i1, j1 = np.floor(hi / POLY_CELL_MM).astype(int).T
    cells: dict = {}
    for k, a, b, c, d in zip(range(len(i0)), i0.tolist(), i1.tolist(), j0.tolist(), j1.tolist()):
        for ci in range(a, b + 1):
            for cj in range(c, d + 1):
                cells.setdefault((ci, cj), []).append(k)
    return cells


_BOUNDS: dict = {}


def _segment_bounds(points):
    """Lower and upper corners of each segment's bounding box, as arrays
    (kept for the points' tuple, which the cache holds, so its id is not reused)."""
    hit = _BOUNDS.get(id(points))
    if hit is not None and hit[0] is points:
        return hit[1]
    p = np.asarray(points, dtype=float)
    out = (np.minimum(p[:-1], p[1:]), np.maximum(p[:-1], p[1:]))
    keep_last(_BOUNDS, id(points), (points, out), POINTS_KEPT)
    return out


def _clip_to_range(ranges, lo: float, hi: float):
    """The parts of angular ranges (radians, any turn) within [lo, hi]."""
    out = []
    for a, b in ranges:
        w = b - a
        a = lo + (a - lo) % (2 * math.pi)
        for start in (a - 2 * math.pi, a):
            s, e = max(lo, start), min(hi, start + w)
            if e > s:
                out.append((s, e))
    return out


def _complement(cuts, lo: float, hi: float):
    """[lo, hi] less the union of the intervals ``cuts`` (which may reach
    beyond it: a name's box across a slot's edge)."""
    out, at = [], lo
    for a, b in sorted(cuts):
        if a > at and at < hi:
            out.append((at, min(a, hi)))
        at = max(at, b)
    if at < hi:
        out.append((at, hi))
    return out


# -- breaking ------------------------------------------------------------------------

def break_element(el, boxes) -> list:
    """The pieces of the stroke element ``el`` outside every box of
    ``boxes`` (already grown by the clearance and half the line's width)."""
    g = el.geom
    near = [b for b in boxes if may_meet(el, b)]
    if not near:
        return [el]
    if el.shape in ("circle", "arc"):
        c, r = g["center"], g["radius"]
        if el.shape == "circle":
            lo, hi = 0.0, 2 * math.pi
        else:
            lo, hi = math.radians(g["start_deg"]), math.radians(g["end_deg"])
        cuts = [x for b in near for x in _clip_to_range(circle_inside(c, r, b), lo, hi)]
        if not cuts:
            return [el]
        keep = _complement(cuts, lo, hi)
        if el.shape == "circle" and len(keep) > 1 and keep[0][0] == lo and keep[-1][1] == hi:
            keep = [(keep[-1][0], keep[0][1] + 2 * math.pi)] + keep[1:-1]
        return [model.arc(el.role, c, r, math.degrees(a), math.degrees(b), el.stroke, **el.values)
                for a, b in keep if (b - a) * r >= MIN_PIECE_MM]
    if el.shape == "segment":
        p, q = g["from"], g["to"]
        cuts = [t for t in (segment_inside(p, q, b) for b in near) if t is not None]
        if not cuts:
            return [el]
        length = math.dist(p, q)
        return [model.segment(el.role, _lerp(p, q, a), _lerp(p, q, b), el.stroke, **el.values)
                for a, b in _complement(cuts, 0.0, 1.0) if (b - a) * length >= MIN_PIECE_MM]
    if el.shape == "polyline":
        return _break_polyline(el, near)
    return [el]


def may_meet(el, box: Box) -> bool:
    """A quick test that rules out most far boxes."""
    g = el.geom
    if el.shape not in ("circle", "arc", "segment", "polyline"):
        return False
    x, y = box.center
    if el.shape in ("circle", "arc"):
        return abs(math.dist(g["center"], (x, y)) - g["radius"]) <= box.radius
    rr = box.radius
    if el.shape == "segment":
        (x0, y0), (x1, y1) = g["from"], g["to"]
        return min(x0, x1) - rr <= x <= max(x0, x1) + rr and min(y0, y1) - rr <= y <= max(y0, y1) + rr
    x0, x1, y0, y1 = _line_bounds(g["points"])
    return x0 - rr <= x <= x1 + rr and y0 - rr <= y <= y1 + rr


def reach_of(el) -> tuple:
    """The figures by which :func:`may_meet` rules a box out, worked out
    once for a stroke that is tested against many boxes (#12): (True,
    centre x, centre y, radius, 0.0) for a circle or an arc, which a box
    may meet only where its centre is within the box's radius of the
    circle; else (False, least x, greatest x, least y, greatest y) of the
    segments' bounds, which the box's centre must be within its radius of."""
    g = el.geom
    if el.shape in ("circle", "arc"):
        return (True, g["center"][0], g["center"][1], g["radius"], 0.0)
    if el.shape == "segment":
        (x0, y0), (x1, y1) = g["from"], g["to"]
        return (False, min(x0, x1), max(x0, x1), min(y0, y1), max(y0, y1))
    return (False,) + _line_bounds(g["points"])


_LINE_BOUNDS: dict = {}


def _line_bounds(points):
    """The least and greatest x and y of a polyline's segments' bounds
    (those :func:`may_meet` read), kept for the points' tuple."""
    hit = _LINE_BOUNDS.get(id(points))
    if hit is not None and hit[0] is points:
        return hit[1]
    lo, hi = _segment_bounds(points)
    out = (float(lo[:, 0].min()), float(hi[:, 0].max()), float(lo[:, 1].min()), float(hi[:, 1].max()))
    keep_last(_LINE_BOUNDS, id(points), (points, out), POINTS_KEPT)
    return out


def _lerp(p, q, t):
    return (p[0] + (q[0] - p[0]) * t, p[1] + (q[1] - p[1]) * t)


def _break_polyline(el, boxes) -> list:
    """A polyline through exact points keeps exact points: a segment that
    runs through a box is left out whole (the points are a fraction of a
    millimetre apart, so the gap grows by at most that)."""
    pts = list(el.geom["points"])
    if el.geom["closed"]:
        pts.append(pts[0])
    lo, hi = _segment_bounds(tuple(pts))
    rr = np.array([b.radius for b in boxes])
    cx = np.array([b.center[0] for b in boxes])
    cy = np.array([b.center[1] for b in boxes])
    near = (lo[:, 0:1] - rr <= cx) & (cx <= hi[:, 0:1] + rr) & (lo[:, 1:2] - rr <= cy) & (cy <= hi[:, 1:2] + rr)
    # the boxes near each segment, as lists, only for the segments with any (#12)
    near_boxes = dict.fromkeys(range(len(pts) - 1), ())
    i, j = np.nonzero(near)
    for k in unique_ints(i).tolist():
        near_boxes[k] = j[i == k].tolist()
    runs, run = [], []
    for i, (p, q) in enumerate(zip(pts, pts[1:])):
        if any(segment_inside(p, q, boxes[j]) is not None for j in near_boxes[i]):
            if run:
                runs.append(run)
            run = []
            continue
        if not run:
            run = [p]
        run.append(q)
    if run:
        runs.append(run)
    out = []
    for r in runs:
        if len(r) >= 2 and sum(math.dist(a, b) for a, b in zip(r, r[1:])) >= MIN_PIECE_MM:
            out.append(model.polyline(el.role, r, False, el.stroke, **el.values))
    return out


def break_around(elements, boxes, clearance_mm: float, width_of) -> list:
    """Every element of ``elements``, strokes cut where they run through a
    box of ``boxes`` grown by ``clearance_mm`` and half the stroke's width
    (``width_of(stroke)``, mm); cut lines, folds, points, text and undrawn
    strokes are kept as they are."""
    out = []
    grown: dict[str, list] = {}   # the boxes grown for each kind of stroke, once (#12)
    for el in elements:
        if el.shape == "text" or el.shape == "point" or el.stroke in ("none", "cut", "fold"):
            out.append(el)
            continue
        if el.stroke not in grown:
            grow = clearance_mm + width_of(el.stroke) / 2
            grown[el.stroke] = [b.grown(grow) for b in boxes]
        out += break_element(el, grown[el.stroke])
    return out


def pieces_within(el, box: Box, boxes) -> list:
    """The pieces of the stroke element ``el`` that lie inside ``box`` and
    outside every box of ``boxes`` (all grown already), exact as in
    :func:`break_element`.  A piece shorter than :data:`MIN_PIECE_MM` is
    dropped only where it ends at a box of ``boxes`` on both sides; one
    that reaches ``box``'s edge goes on outside it (drawn separately),
    so it is no stub, unless it has no length (:data:`NO_PIECE_MM`).
    Polylines go by whole segments, as there: those that meet ``box``
    and no box of ``boxes``."""
    g = el.geom
    if not may_meet(el, box):
        return []
    if el.shape in ("circle", "arc"):
        c, r = g["center"], g["radius"]
        lo, hi = (0.0, 2 * math.pi) if el.shape == "circle" else (math.radians(g["start_deg"]),
                                                                  math.radians(g["end_deg"]))
        out = []
        for a, b in _clip_to_range(circle_inside(c, r, box), lo, hi):
            cuts = [x for o in boxes if may_meet(el, o) for x in _clip_to_range(circle_inside(c, r, o), a, b)]
            for s, e in _complement(cuts, a, b):
                if (e - s) * r >= MIN_PIECE_MM or ((s == a or e == b) and (e - s) * r > NO_PIECE_MM):
                    out.append(model.arc(el.role, c, r, math.degrees(s), math.degrees(e), el.stroke, **el.values))
        return out
    if el.shape == "segment":
        p, q = g["from"], g["to"]
        inside = segment_inside(p, q, box)
        if inside is None:
            return []
        a, b = inside
        cuts = [t for t in (segment_inside(p, q, o) for o in boxes) if t is not None]
        length = math.dist(p, q)
        return [model.segment(el.role, _lerp(p, q, s), _lerp(p, q, e), el.stroke, **el.values)
                for s, e in _complement(cuts, a, b)
                if (e - s) * length >= MIN_PIECE_MM or ((s == a or e == b) and (e - s) * length > NO_PIECE_MM)]
    if el.shape == "polyline":
        pts = list(g["points"])
        if g["closed"]:
            pts.append(pts[0])
        runs, run = [], []
        for p, q in zip(pts, pts[1:]):
            if segment_inside(p, q, box) is not None and all(segment_inside(p, q, o) is None for o in boxes):
                run = run or [p]
                run.append(q)
            elif run:
                runs.append(run)
                run = []
        if run:
            runs.append(run)
        return [model.polyline(el.role, r, False, el.stroke, **el.values) for r in runs]
    return []

"""The instructions' pictures, drawn from the kit's own parts (#9).

Two figures, each a small drawing of geometry elements
(:mod:`kitgen.geometry.model`) in millimetres, built for the width of the
instructions' column and set by :mod:`kitgen.layout.paragraphs` like a
paragraph that is never split across pages:

* :func:`plate_figure`: the kit's first plate, scaled down, its lines as
  the plate part draws them (whole again where the plate breaks them round
  its numbers and names), with each kind of line named in the kit's
  language beside the disc and a thin leader to a point on that line;
* :func:`stack_figure`: the parts on the pin, an exploded oblique view of
  each part's cut outline at its real size ratio, from the back (below) to
  the front (above) in the order of the assembly steps, each layer named.

Names are set at :data:`FIGURE_PT` (the instructions' smallest body size),
outside the drawing, so that no line crosses them; the backend draws the
elements through the same path as the parts' (kitgen.render.ink).

Figure frame: mm, origin at the bottom-left corner of the figure's box,
x to the right, y up.  Angles in degrees at the edges, radians inside.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from itertools import chain
from typing import Any

import numpy as np

from ..geometry import model
from ..geometry.simplify import simplified
from ..kept import keep_last
from ..words.locale import true_minus
from .paragraphs import line_words

#: Size (pt) of the names in the pictures: the instructions' smallest body
#: size (kitgen.layout.paragraphs.MIN_BODY_PT), never smaller.
FIGURE_PT = 9.0
#: Line height of a name of several lines, in sizes (common practice).
NAME_LEADING = 1.2
#: Room (mm) between the drawing and the column of names, where the
#: leaders start, and between two names of a column.
COLUMN_GAP_MM = 6.0
NAME_GAP_MM = 1.2
#: Gap (mm) between a name's box and the start of its leader.
LEADER_GAP_MM = 0.8
#: Largest radius (mm) of the plate's picture, and the share of the column
#: a column of names may take before its names are broken into lines.
MAX_PLATE_RADIUS_MM = 42.0
NAME_COLUMN_SHARE = 0.26
#: Largest width (mm) of the stack's picture, and the depth's foreshortening
#: of its oblique view (a plan's y shrinks by this factor: common practice
#: for exploded views, where flat parts read best seen from a low angle).
MAX_STACK_WIDTH_MM = 70.0
OBLIQUE_DEPTH = 0.3
#: Room (mm) between two layers of the stack's picture.
LAYER_GAP_MM = 3.0


@dataclass(frozen=True)
class LineScale:
    """The line weights of a picture: those of the A4 default at every
    size of kit (kitgen.geometry.style reads ``scale``), since the picture
    is printed at the same size whatever the instrument's."""

    scale: float = 1.0


@dataclass(frozen=True)
class Figure:
    """A picture: its elements in the figure frame, its box (mm) and, in
    ``values``, what a reader needs to go back to the parts (``kind``; for
    the plate, ``scale`` and ``pin_mm``: the picture is the plate's point
    (x, y) at ``pin_mm + scale * (x, y)``)."""

    elements: tuple[model.Element, ...]
    width_mm: float
    height_mm: float
    values: dict[str, Any] = field(default_factory=dict)
    dims: LineScale = LineScale()


# -- names and leaders ---------------------------------------------------------------

def name_lines(words, text: str, width_mm: float) -> list[str]:
    """``text`` broken at spaces into lines no wider than ``width_mm`` at
    :data:`FIGURE_PT` (a word wider than that stands alone)."""
    lines: list[str] = []
    for word in line_words(text):
        trial = f"{lines[-1]} {word}" if lines else word
        if lines and words.measure(trial, FIGURE_PT).width_mm <= width_mm:
            lines[-1] = trial
        else:
            lines.append(word)
    return lines or [text]


def _line_height_mm(words) -> float:
    return words.measure("Ag", FIGURE_PT).height_mm * NAME_LEADING


@dataclass
class _Name:
    """A name to set in a column, with the point its leader ends on."""

    lines: list[str]
    target: tuple[float, float]
    values: dict
    height_mm: float = 0.0
    y_mm: float = 0.0   # the middle of the name's block


def _stack_column(names: list[_Name], bottom_mm: float, top_mm: float) -> None:
    """Each name's middle as near its target's height as the names allow,
    one under the other in the order of their targets, none beyond
    ``bottom_mm`` .. ``top_mm`` unless the column needs more (then it grows
    downwards)."""
    names.sort(key=lambda n: -n.target[1])
    y = top_mm
    for n in names:   # top down: each at most at its target, below the one above
        n.y_mm = min(n.target[1], y - n.height_mm / 2)
        y = n.y_mm - n.height_mm / 2 - NAME_GAP_MM
    y = bottom_mm
    for n in reversed(names):   # bottom up: none below the bottom, each above the one below
        n.y_mm = max(n.y_mm, y + n.height_mm / 2)
        y = n.y_mm + n.height_mm / 2 + NAME_GAP_MM


def _name_elements(words, name: _Name, x_mm: float, anchor: str, role: str) -> list[model.Element]:
    """A name's lines (``anchor`` ``end`` for a column on the left, set
    flush against the drawing; ``start`` on the right) and its leader,
    from beside the name to its target."""
    lh = _line_height_mm(words)
    top = name.y_mm + (len(name.lines) - 1) * lh / 2
    out = [model.text(role, (x_mm, top - k * lh), line, FIGURE_PT, 0.0, anchor, **name.values)
           for k, line in enumerate(name.lines)]
    start = (x_mm + LEADER_GAP_MM if anchor == "end" else x_mm - LEADER_GAP_MM, name.y_mm)
    out.append(model.segment("figure_leader", start, name.target, "light", **name.values))
    out.append(model.point("figure_target", name.target, "light", **name.values))
    return out


def _uncross(names: list[_Name], x_mm: float) -> None:
    """Swap the heights of two names of a column whose leaders cross, so
    that no leader crosses another (a few passes suffice for a column)."""
    for _ in range(len(names)):
        swapped = False
        for i in range(len(names)):
            for j in range(i + 1, len(names)):
                a, b = names[i], names[j]
                if abs(a.height_mm - b.height_mm) < 1e-9 and _crosses((x_mm, a.y_mm), a.target, (x_mm, b.y_mm), b.target):
                    a.y_mm, b.y_mm = b.y_mm, a.y_mm
                    swapped = True
        if not swapped:
            return


def _crosses(p, q, r, s) -> bool:
    def side(a, b, c):
        return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])
    return side(p, q, r) * side(p, q, s) < 0 and side(r, s, p) * side(r, s, q) < 0


# -- the plate's lines, whole again ---------------------------------------------------

#: The plate's roles drawn in its picture, and the circles of the sphere
#: among them (a gap inside the drawing disc between two pieces of one of
#: these is a break round a word, never the circle's own end).
PLATE_ROLES = ("equator", "tropic", "horizon", "almucantar", "twilight", "azimuth", "unequal_hour",
               "meridian", "east_west", "zenith", "cut", "key")
WHOLE_CIRCLES = {"equator", "tropic", "horizon", "almucantar", "twilight", "meridian", "east_west"}
#: The longest gap (mm on the plate) bridged on a line that is no whole
#: circle (an azimuth, an unequal hour): a word's width, far less than the
#: line's own missing part.
MAX_BRIDGE_MM = 12.0
#: How near the drawing disc's edge (mm) an end counts as cut there.
RIM_TOL_MM = 1e-3


def _key(el) -> tuple:
    return (el.role, tuple(sorted((k, v) for k, v in el.values.items() if k != "at")))


def _inside(p, disc_mm: float) -> bool:
    return math.hypot(p[0], p[1]) < disc_mm - RIM_TOL_MM


def _arc_point(c, r, deg):
    a = math.radians(deg)
    return (c[0] + r * math.cos(a), c[1] + r * math.sin(a))


def _merge_arcs(els, disc_mm: float, whole: bool) -> list[model.Element]:
    """Arcs of one circle joined across the gaps a word left in them: a
    gap whose two ends lie inside the drawing disc (an end cut by the disc
    lies on its edge), and for a line that is no whole circle only a gap
    shorter than :data:`MAX_BRIDGE_MM`."""
    e0 = els[0]
    c, r = e0.geom["center"], e0.geom["radius"]
    if any(e.shape == "circle" for e in els):
        return [e0]
    spans = sorted((e.geom["start_deg"] % 360.0, e.geom["start_deg"] % 360.0 + e.geom["end_deg"] - e.geom["start_deg"])
                   for e in els)
    n = len(spans)

    def bridged(i):   # the gap after span i
        a_end, b_start = spans[i][1], spans[(i + 1) % n][0] + (360.0 if i == n - 1 else 0.0)
        gap_deg = b_start - a_end
        if gap_deg < 0:
            return True
        if whole:   # a circle cut by the disc runs outside it between its pieces
            mid = _arc_point(c, r, (a_end + b_start) / 2.0)
            return math.hypot(*mid) <= disc_mm + RIM_TOL_MM
        if not (_inside(_arc_point(c, r, a_end), disc_mm) and _inside(_arc_point(c, r, b_start), disc_mm)):
            return False
        return math.radians(gap_deg) * r <= MAX_BRIDGE_MM

    open_gaps = [i for i in range(n) if not bridged(i)]
    if not open_gaps:
        return [model.circle(e0.role, c, r, e0.stroke, **e0.values)]
    out = []
    for k, g in enumerate(open_gaps):
        first = (g + 1) % n
        last = open_gaps[(k + 1) % len(open_gaps)]
        start = spans[first][0]
        end = spans[last][1] + (360.0 if last < first else 0.0)
        out.append(model.arc(e0.role, c, r, start, max(end, start + 1e-9), e0.stroke, **e0.values))
    return out


def _merge_segments(els, disc_mm: float, whole: bool) -> list[model.Element]:
    """Pieces of one straight line joined as :func:`_merge_arcs` joins arcs."""
    e0 = els[0]
    p0 = np.asarray(e0.geom["from"])
    d = np.asarray(e0.geom["to"]) - p0
    d = d / np.hypot(*d)
    spans = sorted(tuple(sorted((float(np.dot(np.asarray(e.geom[k]) - p0, d)) for k in ("from", "to"))))
                   for e in els)
    runs = [list(spans[0])]
    for lo, hi in spans[1:]:
        a, b = p0 + runs[-1][1] * d, p0 + lo * d
        if lo <= runs[-1][1] or (_inside(a, disc_mm) and _inside(b, disc_mm)
                                 and (whole or lo - runs[-1][1] <= MAX_BRIDGE_MM)):
            runs[-1][1] = max(runs[-1][1], hi)
        else:
            runs.append([lo, hi])
    return [model.segment(e0.role, p0 + lo * d, p0 + hi * d, e0.stroke, **e0.values) for lo, hi in runs]


def _merge_polylines(els, disc_mm: float) -> list[model.Element]:
    """Pieces of one curve, in the plate's order, joined across a word's gap."""
    e0 = els[0]
    runs = [list(els[0].geom["points"])]
    for e in els[1:]:
        pts = list(e.geom["points"])
        a, b = runs[-1][-1], pts[0]
        if _inside(a, disc_mm) and _inside(b, disc_mm) and math.dist(a, b) <= MAX_BRIDGE_MM:
            runs[-1] += pts
        else:
            runs.append(pts)
    return [model.polyline(e0.role, run, False, e0.stroke, **e0.values) for run in runs]


def whole_lines(part, disc_mm: float, keep=lambda el: True) -> list[model.Element]:
    """The plate's lines of :data:`PLATE_ROLES` that ``keep`` accepts, each
    whole again: the pieces of one line (same role and values, same circle
    or straight line) joined across the gaps the plate leaves round its
    words, in the plate's frame."""
    groups: dict[tuple, list] = {}
    for el in part.elements:
        if el.role in PLATE_ROLES and el.shape != "text" and el.stroke != "none" and keep(el):
            if el.shape in ("arc", "circle"):
                shape_key = ("arc", round(el.geom["center"][0], 6), round(el.geom["center"][1], 6),
                             round(el.geom["radius"], 6))
            else:
                shape_key = (el.shape,)
            groups.setdefault(_key(el) + shape_key, []).append(el)
    out = []
    for k, els in groups.items():
        role = els[0].role
        whole = role in WHOLE_CIRCLES
        if role in ("cut", "key") or els[0].shape == "point":
            out += els
        elif els[0].shape in ("arc", "circle"):
            out += _merge_arcs(els, disc_mm, whole)
        elif els[0].shape == "segment":
            out += _merge_segments(els, disc_mm, whole)
        else:
            out += _merge_polylines(els, disc_mm)
    return out


def _multiple(value: float, of: float) -> bool:
    return abs(value / of - round(value / of)) < 1e-9


def _picture_keeps(part):
    """Which of the plate's lines the picture draws: every kind, but of the
    almucantars only the tens and of the azimuths only every 30 degrees
    (where the plate has them), so that the lines stay apart at the
    picture's size."""
    alts = {e.values["altitude_deg"] for e in part.with_role("almucantar")}
    azs = {e.values["azimuth_deg"] for e in part.with_role("azimuth")}
    alt_every = 10.0 if any(_multiple(a, 10.0) for a in alts) else None
    az_every = 30.0 if sum(_multiple(a, 30.0) for a in azs) >= 4 else None

    def keep(el):
        if el.role == "almucantar" and alt_every:
            return _multiple(el.values["altitude_deg"], alt_every)
        if el.role == "azimuth" and az_every:
            return _multiple(el.values["azimuth_deg"], az_every)
        return True
    return keep


def scaled(el, scale: float, origin) -> model.Element:
    """An element of a part at ``origin + scale * (x, y)``, in a picture's
    stroke: the cut and key lines of the part are drawn, not to be cut."""
    ox, oy = origin

    def p(q):
        return (ox + scale * q[0], oy + scale * q[1])
    g = dict(el.geom)
    for k in ("center", "from", "to", "at"):
        if k in g:
            g[k] = p(g[k])
    if "radius" in g:
        g["radius"] = g["radius"] * scale
    if "points" in g:
        g["points"] = tuple(p(q) for q in g["points"])
    stroke = "medium" if el.stroke in ("cut", "fold") else el.stroke
    values = {k: v for k, v in el.values.items() if k != "at"}
    return model.Element(el.shape, el.role, g, values, stroke)


#: How far (mm, on the page) a picture's curve may stray from the part's
#: own when its points are thinned: under the 0.042 mm dot of a 600 dpi
#: printer (common practice, no source).
LEAN_MM = 0.02


def lean(el) -> model.Element:
    """A polyline with only the points it needs at :data:`LEAN_MM`
    (kitgen.geometry.simplify); other elements as they are."""
    if el.shape != "polyline" or len(el.geom["points"]) < 3:
        return el
    g = dict(el.geom)
    g["points"] = tuple(simplified(g["points"], LEAN_MM))
    return model.Element(el.shape, el.role, g, el.values, el.stroke)


def sample(el, step_mm: float = 0.5) -> np.ndarray:
    """Points (N, 2) along a line element, about ``step_mm`` apart, every
    one on the element (its vertices and points of its exact circle)."""
    g = el.geom
    if el.shape == "point":
        return np.array([g["at"]])
    if el.shape in ("circle", "arc"):
        a0, a1 = (0.0, 360.0) if el.shape == "circle" else (g["start_deg"], g["end_deg"])
        n = max(2, int(math.radians(a1 - a0) * g["radius"] / step_mm) + 1)
        a = np.radians(np.linspace(a0, a1, n))
        return np.stack([g["center"][0] + g["radius"] * np.cos(a), g["center"][1] + g["radius"] * np.sin(a)], axis=1)
    pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"])
    # Each side's count, max(1, int(math.dist(a, b) / step_mm)), the
    # distances in one map and the rest in numpy: the same floats and
    # truncation (#12).
    sides = np.fromiter(map(math.dist, pts[:-1], pts[1:]), float, len(pts) - 1)
    return _along(pts, np.maximum(1, (sides / step_mm).astype(np.int64)))


def _along(pts, counts) -> np.ndarray:
    """The first of ``pts``, then ``counts[k]`` points evenly along the
    k-th side, its far end the last: the points ``a + t (b - a)`` at
    ``t = np.linspace(0, 1, n + 1)[1:]`` of each side, the same floats
    (``t = i * (1 / n)``, and 1 at the end), computed for all the sides
    at once (#12: a call of ``linspace`` per side was most of the
    pictures' time)."""
    xy = np.fromiter(chain.from_iterable(pts), float, 2 * len(pts)).reshape(-1, 2)
    n = np.asarray(counts, dtype=np.int64)
    side = np.repeat(np.arange(len(n)), n)
    i = np.arange(len(side)) - np.repeat(np.cumsum(n) - n, n) + 1.0
    t = i * (1.0 / n)[side] + 0.0
    t[i == n[side]] = 1.0
    a = xy[:-1][side]
    return np.concatenate([xy[:1], a + t[:, None] * (xy[1:][side] - a)])


# -- the plate's picture ----------------------------------------------------------------

def _plate_names(kit, lines) -> list[tuple[str, dict, str]]:
    """(role, values, name) of each kind of line the picture names: the
    curve a leader must end on is the picture's element of that role whose
    values include ``values``."""
    w = kit.words
    have = {(e.role, e.values.get("declination_deg", e.values.get("altitude_deg"))) for e in lines}
    roles = {e.role for e in lines}
    out = []
    if "horizon" in roles:
        out.append(("horizon", {}, w("plate.line_horizon")))
    alts = sorted({e.values["altitude_deg"] for e in lines if e.role == "almucantar"})
    if alts:
        alt = min(alts, key=lambda a: (abs(a - 30.0), a))
        out.append(("almucantar", {"altitude_deg": alt}, w("instructions.figure_almucantar", altitude=w.number(alt))))
    if "azimuth" in roles:
        out.append(("azimuth", {}, w("instructions.figure_azimuth")))
    if "equator" in roles:
        out.append(("equator", {}, w("plate.line_equator")))
    for dec in sorted({e.values["declination_deg"] for e in lines if e.role == "tropic"}, reverse=True):
        key = "plate.line_tropic_cancer" if dec > 0 else "plate.line_tropic_capricorn"
        out.append(("tropic", {"declination_deg": dec}, w(key)))
    for alt in kit.plan.drawing.twilight_deg:
        if ("twilight", alt) in have:
            name = w("plate.line_twilight", altitude=true_minus(w.number(alt)))
            out.append(("twilight", {"altitude_deg": alt}, name))
    if "unequal_hour" in roles:
        out.append(("unequal_hour", {}, w("instructions.figure_unequal_hours")))
    if "zenith" in roles:
        out.append(("zenith", {}, w("instructions.figure_zenith")))
    if "meridian" in roles:
        out.append(("meridian", {}, w("instructions.figure_meridian")))
    if "east_west" in roles:
        out.append(("east_west", {}, w("instructions.figure_east_west")))
    return out


def _matches(el, role: str, values: dict) -> bool:
    return el.role == role and all(el.values.get(k) == v for k, v in values.items())


#: How far (mm, in the picture) from every other line a leader's end is
#: plainly on its own line.
CLEAR_MM = 1.5


def _nearest_mm(pts, others, reach_mm: float) -> np.ndarray:
    """Per point of ``pts`` (N, 2), the distance to the nearest of
    ``others`` (M, 2) where that is below ``reach_mm`` (the same float as
    ``np.hypot`` of the two differences gives), else ``reach_mm``.  Only
    the pairs in neighbouring cells of a grid a little coarser than the
    reach are measured (a uniform grid of buckets, the classic
    fixed-radius near-neighbour search: Bentley, Stanat and Williams,
    "The complexity of finding fixed-radius near neighbors", Information
    Processing Letters 6, 1977), not every pair (#12)."""
    out = np.full(len(pts), reach_mm)
    if not len(others) or not len(pts):
        return out
    cell = 4.0 / 3.0 * reach_mm   # pairs nearer than the reach are never two cells apart, rounding included
    pc, oc = np.floor(pts / cell).astype(np.int64), np.floor(others / cell).astype(np.int64)
    low = np.minimum(pc.min(axis=0), oc.min(axis=0)) - 1
    rows = int(max(pc[:, 1].max(), oc[:, 1].max()) - low[1]) + 2
    keys = (oc[:, 0] - low[0]) * rows + (oc[:, 1] - low[1])
    order = np.argsort(keys, kind="stable")
    keys = keys[order]
    column = (pc[:, 0] - low[0]) * rows + (pc[:, 1] - low[1])
    which, starts, counts = [], [], []
    for dx in (-1, 0, 1):   # the three cells above one another in each neighbouring column
        k = column + dx * rows
        first, last = np.searchsorted(keys, k - 1, "left"), np.searchsorted(keys, k + 1, "right")
        which.append(np.arange(len(pts)))
        starts.append(first)
        counts.append(last - first)
    which, starts, counts = np.concatenate(which), np.concatenate(starts), np.concatenate(counts)
    point = np.repeat(which, counts)
    other = order[np.repeat(starts, counts) + np.arange(len(point)) - np.repeat(np.cumsum(counts) - counts, counts)]
    d = np.hypot(pts[point, 0] - others[other, 0], pts[point, 1] - others[other, 1])
    np.minimum.at(out, point, d)
    return out


def _choose_targets(named, lines, samples, reach_mm: float, rim_mm: float, spacing_mm: float):
    """For each named kind, the point of its line where the leader ends:
    clear of every other line (so that the dot is plainly on this one), of
    the other leaders' ends, and near the disc's left or right edge (short
    leaders).  Kinds with fewest points to choose from go first."""
    others_all = np.concatenate(samples)
    owner = np.concatenate([np.full(len(s), i) for i, s in enumerate(samples)])
    by_x = np.argsort(others_all[:, 0], kind="stable")
    xs = others_all[by_x, 0]
    chosen: dict[int, tuple] = {}
    by_role: dict[str, list[int]] = {}
    for j, el in enumerate(lines):
        by_role.setdefault(el.role, []).append(j)
    mine = [[j for j in by_role.get(role, ()) if _matches(lines[j], role, values)] for role, values, _ in named]
    order = sorted(range(len(named)), key=lambda i: sum(len(samples[j]) for j in mine[i]))
    for i in order:
        role = named[i][0]
        best = None
        for j in mine[i]:
            pts = samples[j][::2]   # a candidate every millimetre
            if role == "zenith":
                clear = np.full(len(pts), 1.0)
            else:
                # Only the other lines' points near this line's box count:
                # those in its run of x, then of y (the nearest distance
                # is the same in any order of the points).
                lo, hi = pts.min(axis=0) - CLEAR_MM, pts.max(axis=0) + CLEAR_MM
                run = by_x[np.searchsorted(xs, lo[0], "left"):np.searchsorted(xs, hi[0], "right")]
                near = others_all[run]
                near = near[(owner[run] != j) & (near[:, 1] >= lo[1]) & (near[:, 1] <= hi[1])]
                clear = np.minimum(_nearest_mm(pts, near, CLEAR_MM), CLEAR_MM) / CLEAR_MM
            apart = np.ones(len(pts))
            level = np.ones(len(pts))
            balance = np.zeros(len(pts))
            if chosen:
                t = np.array([c[1] for c in chosen.values()])
                dt = np.min(np.hypot(pts[:, None, 0] - t[None, :, 0], pts[:, None, 1] - t[None, :, 1]), axis=1)
                apart = np.minimum(dt, 8.0) / 8.0
                # Apart in height from the targets on the same side, so
                # that the names can stand level with their targets.
                same = np.sign(pts[:, None, 0]) == np.sign(t[None, :, 0])
                dy = np.where(same, np.abs(pts[:, None, 1] - t[None, :, 1]), np.inf)
                level = np.minimum(np.min(dy, axis=1), spacing_mm) / spacing_mm
                lean = np.sum(np.sign(t[:, 0]))   # more on the right: lean left
                balance = -np.sign(pts[:, 0]) * np.sign(lean) * min(abs(lean), 3.0) / 3.0
            edge = np.minimum(np.abs(pts[:, 0]), 0.9 * rim_mm) / reach_mm
            # Not at the rim, where many lines end together.
            rim = np.hypot(pts[:, 0], pts[:, 1]) > 0.93 * rim_mm
            score = 2.0 * clear + 1.0 * apart + 1.5 * level + 0.8 * edge + 0.6 * balance - 1.0 * rim
            k = int(np.argmax(score))
            if best is None or score[k] > best[0]:
                best = (score[k], (float(pts[k, 0]), float(pts[k, 1])), j)
        chosen[i] = (best[2], best[1])
    return chosen


def plate_figure(kit, width_mm: float) -> Figure | None:
    """The kit's first plate, scaled to the column, each kind of its lines
    named (see the module's docstring); ``None`` for a kit without a plate."""
    if "plate" not in kit.plan.parts:
        return None
    w, d = kit.words, kit.dims
    part = kit.part("plate-1")
    disc = d.outer_tropic_radius_mm
    lines = whole_lines(part, disc, _picture_keeps(part))
    named = _plate_names(kit, lines)
    # The columns of names: as wide as the longest name, up to a share of
    # the column; longer names broken into lines.
    longest = max(w.measure(n, FIGURE_PT).width_mm for _, _, n in named)
    col = min(longest, NAME_COLUMN_SHARE * width_mm)
    broken = [name_lines(w, n, col) for _, _, n in named]
    col = max(w.measure(s, FIGURE_PT).width_mm for ls in broken for s in ls)
    x0, y0, x1, y1 = part.bounds_mm
    reach = max(-x0, x1)
    radius = min(MAX_PLATE_RADIUS_MM, (width_mm - 2.0 * (col + COLUMN_GAP_MM)) / 2.0)
    scale = radius / reach
    pin = (width_mm / 2.0, 0.0)
    pictured = [scaled(el, scale, pin) for el in lines]
    samples = [sample(el) for el in pictured]
    # Targets chosen in the picture, about the pin.
    centred = [s - np.asarray(pin) for s in samples]
    chosen = _choose_targets(named, pictured, centred, radius, disc * scale, 1.6 * _line_height_mm(w))
    lh = _line_height_mm(w)
    left, right = [], []
    for i, (role, values, _) in enumerate(named):
        j, (tx, ty) = chosen[i]
        el = pictured[j]
        vals = {"curve": role, **{k: v for k, v in el.values.items() if k in
                                  ("altitude_deg", "declination_deg", "azimuth_deg", "hour")}}
        n = _Name(broken[i], (tx + pin[0], ty + pin[1]), vals, len(broken[i]) * lh)
        (left if tx < 0 else right).append(n)
    bottom, top = pin[1] + scale * y0, pin[1] + scale * y1
    for column in (left, right):
        _stack_column(column, bottom, top)
    xl, xr = pin[0] - radius - COLUMN_GAP_MM, pin[0] + radius + COLUMN_GAP_MM
    _uncross(left, xl + LEADER_GAP_MM)
    _uncross(right, xr - LEADER_GAP_MM)
    els = list(pictured)
    for n in left:
        els += _name_elements(w, n, xl, "end", "figure_name")
    for n in right:
        els += _name_elements(w, n, xr, "start", "figure_name")
    low = min([bottom] + [n.y_mm - n.height_mm / 2 for n in left + right])
    high = max([top] + [n.y_mm + n.height_mm / 2 for n in left + right])
    shift = -low + 1.0
    els = [lean(scaled(el, 1.0, (0.0, shift))) for el in els]
    return Figure(tuple(els), width_mm, high - low + 2.0,
                  {"kind": "plate", "part": part.id, "scale": scale, "pin_mm": (pin[0], pin[1] + shift)})


# -- the stack on the pin -------------------------------------------------------------

#: The part kinds each layer of the stack shows (the first that the kit
#: prints gives the outline), from the back to the front: the order of the
#: templates' ``instructions.stack`` (kitgen.layout.instructions.STACK_ITEM_PARTS).
STACK_LAYERS = (("alidade",), ("mater_front", "mater_back"), ("plate",), ("rete",), ("rule",))
#: The turn (degrees, counter-clockwise in the part's plane) each layer is
#: shown at: the rule turned off the alidade's line, so the two read apart.
LAYER_TURN_DEG = {"rule": -60.0}


def _outline_elements(part) -> tuple:
    """The part's cut outline: its cut elements, the pin's and the
    thread's holes left out."""
    return tuple(el for el in part.elements
                 if el.role == "cut" and el.stroke == "cut" and el.shape != "point" and "purpose" not in el.values)


def _outline(cuts, turn_deg: float) -> list[np.ndarray]:
    """An outline's elements (:func:`_outline_elements`) as point runs in
    the part's plane, turned ``turn_deg``."""
    a = math.radians(turn_deg)
    rot = np.array([[math.cos(a), -math.sin(a)], [math.sin(a), math.cos(a)]])
    return [sample(el, 1.0) @ rot.T for el in cuts]


def layer_name(words, kinds, printed) -> str:
    """A layer's name: the part's title, the mater as one layer of its two
    faces, the rete as the film."""
    if kinds == ("mater_front", "mater_back"):
        if set(kinds) <= printed:
            return words("instructions.figure_mater")
        return words("mater_front.title" if "mater_front" in printed else "mater_back.title")
    key = {"rete": "instructions.figure_rete", "plate": "plate.title"}.get(kinds[0], kinds[0] + ".title")
    return words(key)


def stack_figure(kit, width_mm: float) -> Figure | None:
    """The parts on the pin in an exploded oblique view (see the module's
    docstring), the layers the kit prints; ``None`` with fewer than two.
    The picture is kept for the last few sets of what it is drawn from
    (the layers' names and outlines, the script, the column's width): a
    class set's schools share it where their parts' outlines agree, as
    they do across latitudes (#12)."""
    w = kit.words
    printed = set(kit.plan.parts)
    layers = []
    for kinds in STACK_LAYERS:
        kind = next((k for k in kinds if k in printed), None)
        if kind is None:
            continue
        turn = LAYER_TURN_DEG.get(kind, 0.0)
        turn = -turn if w.rtl else turn   # mirrored: towards the names
        cuts = _outline_elements(kit.part("plate-1" if kind == "plate" else kind))
        layers.append((kinds[0], layer_name(w, kinds, printed), turn, cuts))
    if len(layers) < 2:
        return None
    key = (width_mm, w.script, w.rtl, w("instructions.figure_pin"),
           tuple((kind, name, turn, tuple((el.shape, tuple(sorted(el.geom.items()))) for el in cuts))
                 for kind, name, turn, cuts in layers))
    figure = _STACKS.get(key)
    if figure is None:
        figure = _stack_drawing(w, [(kind, name, _outline(cuts, turn)) for kind, name, turn, cuts in layers],
                                width_mm)
        keep_last(_STACKS, key, figure, 4)
    return figure


#: The stack's pictures last drawn, by what each was drawn from.
_STACKS: dict[tuple, Figure] = {}


def _stack_drawing(w, layers, width_mm: float) -> Figure:
    """The stack's picture of ``layers`` (the part kind, the layer's name,
    its outline's point runs), in the language of ``w``."""
    # The names' column, on the side a line of the kit's language starts from.
    longest = max(w.measure(n, FIGURE_PT).width_mm for n in [lay[1] for lay in layers] + [w("instructions.figure_pin")])
    col = min(longest, 0.4 * width_mm)
    reach = max(float(np.max(np.abs(run[:, 0]))) for lay in layers for run in lay[2])
    scale = min(MAX_STACK_WIDTH_MM, width_mm - col - COLUMN_GAP_MM - 2.0) / (2.0 * reach)
    lh = _line_height_mm(w)
    names_lines = [name_lines(w, lay[1], col) for lay in layers] + [name_lines(w, w("instructions.figure_pin"), col)]
    rtl = w.rtl
    cx = width_mm - scale * reach - 1.0 if rtl else scale * reach + 1.0
    els: list[model.Element] = []
    names: list[_Name] = []
    z = 0.0
    centres = []
    for k, (kind, name, runs) in enumerate(layers):
        depth = [float(np.max(np.abs(r[:, 1]))) for r in runs]
        half = scale * OBLIQUE_DEPTH * max(depth)
        z += half if k else half + 4.0   # room for the fastener's legs below
        pts_all = []
        for run in runs:
            pts = np.stack([cx + scale * run[:, 0], z + scale * OBLIQUE_DEPTH * run[:, 1]], axis=1)
            closed = bool(np.hypot(*(pts[0] - pts[-1])) < 1e-6)
            els.append(model.polyline("figure_layer", [tuple(p) for p in pts], closed, "medium", layer=kind))
            pts_all.append(pts)
        pts = np.concatenate(pts_all)
        edge = pts[np.argmin(pts[:, 0])] if rtl else pts[np.argmax(pts[:, 0])]
        names.append(_Name(names_lines[k], (float(edge[0]), float(edge[1])), {"layer": kind},
                           len(names_lines[k]) * lh))
        centres.append(z)
        front_top = float(np.max(pts[:, 1]))   # the front layer's highest point
        z += half + max(LAYER_GAP_MM, len(names_lines[k]) * lh * 0.6)
    # The fastener: its shank through every centre, its head on the front,
    # its legs opened at the back.
    head_r = 1.6
    top = max(centres[-1] + 3.0, front_top + 1.5)   # the head clear above the front part, its name's leader too
    bottom = centres[0] - 3.5
    els.append(model.segment("figure_pin", (cx, bottom), (cx, top), "heavy"))
    head = [(cx + head_r * math.cos(t), top + 0.6 * head_r * math.sin(t)) for t in np.linspace(0, 2 * math.pi, 41)]
    els.append(model.polyline("figure_pin", head, True, "heavy"))
    for sx in (-1.0, 1.0):
        els.append(model.segment("figure_pin", (cx, bottom), (cx + sx * 3.0, bottom - 1.5), "heavy"))
    # The name points at the fastener's head, above the rule, so that the
    # head is not taken for the thread's loop (#9).
    pin_target = (cx + head_r * (-1.0 if rtl else 1.0), top)
    names.append(_Name(names_lines[-1], pin_target, {"layer": "pin"}, len(names_lines[-1]) * lh))
    high = top + 0.6 * head_r + 1.0
    _stack_column(names, 0.0, max(high, max(n.target[1] for n in names) + lh))
    xe = cx - scale * reach - COLUMN_GAP_MM if rtl else cx + scale * reach + COLUMN_GAP_MM
    _uncross(names, xe + (LEADER_GAP_MM if rtl else -LEADER_GAP_MM))
    for n in names:
        els += _name_elements(w, n, xe, "end" if rtl else "start", "figure_name")
    low = min([bottom - 1.5] + [n.y_mm - n.height_mm / 2 for n in names]) - 1.0
    high = max([high] + [n.y_mm + n.height_mm / 2 for n in names]) + 1.0
    # Centred in the column: the drawing and the names as one.
    used = []
    for el in els:
        if el.shape != "text":
            xs = sample(el, 5.0)[:, 0]
            used += [xs.min(), xs.max()]   # only the extremes count below (#12)
    used += [x for n in names for x in (xe, xe + (-1.0 if rtl else 1.0) * max(
        w.measure(s, FIGURE_PT).width_mm for s in n.lines))]
    dx = (width_mm - (max(used) + min(used))) / 2.0
    els = [lean(scaled(el, 1.0, (dx, -low))) for el in els]
    return Figure(tuple(els), width_mm, high - low,
                  {"kind": "stack", "layers": [lay[0] for lay in layers]})


# -- both, once per kit and column --------------------------------------------------------

#: The pictures of the last few kits, by the kit's identity and the
#: column's width: the pages' split asks for the story several times.
_KEPT: dict[tuple, tuple] = {}


def kit_figures(kit, width_mm: float) -> tuple[Figure | None, Figure | None]:
    """The plate's and the stack's pictures for a column ``width_mm`` wide."""
    key = (id(kit), round(width_mm, 6))
    kept = _KEPT.get(key)
    if kept is not None and kept[0] is kit:
        return kept[1]
    figures = (plate_figure(kit, width_mm), stack_figure(kit, width_mm))
    keep_last(_KEPT, key, (kit, figures), 4)
    return figures

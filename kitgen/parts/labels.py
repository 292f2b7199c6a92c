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

import functools
import math

import numpy as np

from ..geometry import model
from ..words.fit import line_offsets_mm
from ..words.measure import text_corners_mm
from . import curves
from .box_grid import BoxGrid, meets_any, segment_box
from .breaks import MIN_PIECE_MM
from .dimensions import MIN_TEXT_PT

#: Clearance (mm) kept between a label and the lines that bound its room
#: (common practice: about a third of a millimetre reads as "apart" in print).
MARGIN_MM = 0.3


def text_box_mm(at, text: str, size_pt: float, anchor: str, measure):
    """(xmin, ymin, xmax, ymax) of horizontal text set at ``at``, from its
    measured extent (``measure(text, size_pt)``)."""
    ext = measure(text, size_pt)
    return _box_at(at, ext.width_mm, ext.height_mm, anchor)


def _box_at(at, w, h, anchor: str):
    """(xmin, ymin, xmax, ymax) of a text ``w`` by ``h`` mm set at ``at``."""
    x, y = at
    if anchor == "start":
        x0 = x
    elif anchor == "middle":
        x0 = x - w / 2
    elif anchor == "end":
        x0 = x - w
    else:
        raise KeyError(anchor)
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
    # (the farthest corner found only where the nearest point is in)
    return near < r1 and max(((x - cx) ** 2 + (y - cy) ** 2) ** 0.5
                             for x in (box[0], box[2]) for y in (box[1], box[3])) > r0


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
#: Clear paper (mm) along the line between two names side by side (less
#: than :data:`NAME_GAP_MM` apart in height), so that they never read as
#: one name of two words: a word space is about 0.6 mm at 5 pt, and names
#: of two words are common (#12: on an Arabic rete at the equator the
#: names of Capella and Alioth stood 1.3 mm apart on one line).
NAME_GAP_ALONG_MM = 2.0
#: How much nearer (mm) its own dot a name without a leader stands than
#: any other dot, so that it is *clearly* that dot's (#9).
NEARER_BY_MM = 0.5
#: ... and no other dot stands level with a name, with a leader or
#: without, within this many offsets beyond either end (or past an end,
#: over or under the line, as near that end), where a reader looks for a
#: point's name first (#12; 1.5 until a teacher's review found dots 2.2 to
#: 2.8 mm past names' ends on A4 read as theirs) ...
BESIDE_OFFSETS = 2.0
#: ... nor within this many offsets over or under its words, where a
#: reader looks next (#12; 1.0 until the same review found Alioth's dot
#: 2.3 mm under the middle of Dubhe's name; the middle half only until the
#: last found Saiph's 1.5 mm over the last letters of "Alnitak").
OVER_OFFSETS = 1.5
#: Paper (mm) a leader keeps from every word but its own name and from
#: every box kept out, the labels' margin: a leader that grazes a word
#: reads as struck through it or as that word's (#12 review: Alnilam's
#: leader 0.05 mm from "Sirius", Miaplacidus's 0.04 mm from "Acrux").
LEADER_WORD_GAP_MM = MARGIN_MM
#: A leader keeps this far (mm, clear paper) from a line of ``lines_along``
#: (place_labels) wherever it runs within :data:`ALONG_DEG` of that line's
#: direction: closer, the two print as one thicker line and the leader
#: is lost in it (#12 review: Regulus, on the bound of Leo and Virgo of
#: an 85 mm rete, had its leader drawn 0.1 mm beside the bound across the
#: band).  A leader crossing a line at a wider angle still reads as a
#: leader (common practice in map labelling: leaders cross lines
#: steeply, never along them).
ALONG_GAP_MM = MARGIN_MM
#: ... the angle (degrees) under which a leader runs along a line.
ALONG_DEG = 30.0
#: The reaches of those two rules for a point named loosely (place_labels'
#: ``loose``): those kept until a teacher's review (#12), for a bright
#: star that the wider ones leave unnamed (Rigil Kentaurus among the
#: Centaur's and the Cross's dots at 23.5 S).
LOOSE_BESIDE_OFFSETS = 1.5
LOOSE_OVER_OFFSETS = 1.0
#: A name with a leader keeps this many offsets (and :data:`NAME_GAP_MM`
#: at least) from every other dot, so that it never reads as that dot's
#: name (#9: Bellatrix's name, at the end of its leader, stood beside
#: Betelgeuse's dot).
LEADER_NAME_CLEAR = 0.75
#: No dot but its own stands so near a name that a pupil could take it for
#: the name's point: within this (mm, from the name's ends or middle,
#: :func:`_reading_mm`), a dot not claimed by a name of its own beside it
#: is no nearer than :data:`CLEARLY_OWN_RATIO` times the name's own dot,
#: and a claimed one no nearer than the name's own mark (its dot, or the
#: end of its leader).  In millimetres, not offsets, since the names stay
#: 5 pt however small the kit (#12 review: on an 85 mm rete "Capella", at
#: the end of a 10 mm leader, stood level with Alhena's unnamed dot 2.4 mm
#: past its end, and read as Alhena's; the usual rule of map labelling,
#: that a name is nearer its own symbol than any other, common practice).
AMBIGUOUS_WITHIN_MM = 3.0
#: How many times nearer than any unclaimed dot a name's own dot stands
#: (a choice: half as far again reads as clearly the nearer).
CLEARLY_OWN_RATIO = 1.5
#: ... within this (mm) for a point named loosely (place_labels' ``loose``):
#: a first-magnitude star named so rather than not at all (Capella on an
#: 85 mm rete, Rigil Kentaurus among the Centaur's dots).
LOOSE_AMBIGUOUS_WITHIN_MM = 2.0
#: How many placed labels nearest an unplaced point's are tried for a swap
#: (:func:`place_labels`' repair step).
REPAIR_NEIGHBOURS = 6
#: Side (mm) of the cells of the grids (:mod:`kitgen.parts.box_grid`) that
#: hold the boxes, leaders and dots a place is tested against (#12): about
#: a name's height, so that a place meets only the few things near it.
GRID_CELL_MM = 4.0
#: Slack (mm) added round every search of those grids, far above the
#: rounding error of the tests and far below anything printed, so that a
#: search misses nothing a test could find.
SEARCH_SLACK_MM = 1e-6


def _grown(box, by_mm: float):
    """An axis-aligned box grown by ``by_mm`` on every side."""
    return (box[0] - by_mm, box[1] - by_mm, box[2] + by_mm, box[3] + by_mm)


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
    """Whether segment pq meets the annulus ``ring`` ((centre, inner and
    outer radius), mm): its distance from the centre runs without a break
    from its least (at the foot of the perpendicular from the centre, or
    an end) to its greatest (at an end), so it meets the annulus exactly
    where the least is within the outer radius and the greatest reaches
    the inner one (#12: worked, where it had been sampled every 0.1 mm)."""
    (cx, cy), r0, r1 = ring
    px, py, dx, dy = p[0] - cx, p[1] - cy, q[0] - p[0], q[1] - p[1]
    qx, qy = px + dx, py + dy
    if px * px + py * py < r0 * r0 and qx * qx + qy * qy < r0 * r0:
        return False
    length2 = dx * dx + dy * dy
    t = 0.0 if length2 == 0.0 else min(1.0, max(0.0, -(px * dx + py * dy) / length2))
    fx, fy = px + t * dx, py + t * dy
    return fx * fx + fy * fy <= r1 * r1


def leader_ends(point, box, start_mm: float, gap_mm: float = MARGIN_MM):
    """The leader from a point to a label's box: from ``start_mm`` out of
    the point (past its dot) towards the box's nearest point, stopping
    ``gap_mm`` short of it; None when it would be shorter than a line's
    least piece (``breaks.MIN_PIECE_MM``, as the plate's leaders): a
    shorter one prints as a stray hyphen beside the name (#12: a 0.3 mm
    leader by "Betelgeuse" on an Arabic rete, 83 leaders under 1 mm on
    144 retes)."""
    x, y = point
    nx, ny = min(max(x, box[0]), box[2]), min(max(y, box[1]), box[3])
    dx, dy = nx - x, ny - y
    dist = (dx * dx + dy * dy) ** 0.5
    if dist < start_mm + gap_mm + MIN_PIECE_MM:
        return None
    ux, uy = dx / dist, dy / dist
    return ((x + ux * start_mm, y + uy * start_mm), (nx - ux * gap_mm, ny - uy * gap_mm))


def place_labels(points, texts, size_pt: float, offset_mm: float, keep_out=(), inside_radius_mm=None,
                 keep_out_rings=(), *, measure, leaders_from_mm=None, own_boxes=None, marks=(), loose=(),
                 kept=None, lines_along=(), from_marks=False):
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
    than any other point's, by :data:`NEARER_BY_MM`, with no other dot
    level with it within :data:`BESIDE_OFFSETS` offsets of its ends, nor
    over or under its words within :data:`OVER_OFFSETS`; every other place,
    near or far, takes a leader, keeps :data:`LEADER_NAME_CLEAR` offsets
    (and :data:`NAME_GAP_MM` at least) from every other dot, has none
    level with it within :data:`BESIDE_OFFSETS` offsets of its ends nor
    over or under its words within :data:`OVER_OFFSETS`, and its
    leader crosses no other leader and keeps :data:`LEADER_CLEAR_MM` from
    every other dot.  Labels keep :data:`NAME_GAP_MM` from each other
    (:data:`NAME_GAP_ALONG_MM` along the line side by side), no
    leader passes between another label and its point (#9: Hadar's name
    cut off from its dot by Rigil Kentaurus's leader), and a label with no
    free place may take that of one of its :data:`REPAIR_NEIGHBOURS`
    nearest labels if that one then finds another.  A point under one of
    the ``marks`` (boxes kept out, such as the pin's crosshair: a leader
    from it would cross the mark) reads its name alone out to the
    farthest near place, :data:`NEAR_FIRST`'s last, beside the mark
    (#12: Polaris, under the pin of a northern A5 rete, had no name);
    with ``from_marks``, such a point is read as its name's from the
    mark's edge rather than from its dot (the mark is what a pupil sees
    there), for a name that the dot's distance leaves nearer no dot by
    :data:`NEARER_BY_MM`.  The points of ``loose`` (indices) keep other dots only
    :data:`LOOSE_BESIDE_OFFSETS` and :data:`LOOSE_OVER_OFFSETS` from their
    names' ends and middles: a bright star named so rather than not at all.
    ``kept``, a dict shared by calls that differ in ``texts`` and ``loose``
    alone (a rete's names placed again, some of them shortened), keeps
    each point's places and the tests of them that do not depend on what
    is chosen, by (point, text, loosely, from a mark), for the next call (#12): the
    same places, found once.  No leader runs along a line of ``lines_along``
    ((p, q, half_width_mm) segments, such as the rete's sign bounds):
    :func:`runs_along`."""
    with_leaders = leaders_from_mm is not None
    reaches = NEAR_FIRST + (WITH_LEADER if with_leaders else ())
    chosen = {}   # point index -> (at, anchor, box, leader)
    # (#12) A place's box is tested against all the boxes kept out and all
    # the chosen names at once, as arrays; what else it is tested against
    # is held in grids by where it lies, so that it meets only its
    # neighbours: the dots, the boxes kept out (by keys below 0) and the
    # chosen labels' boxes, leaders and links (by point index, so that a
    # point's own are left out of its tests, as while it is not chosen).
    keep_out, keep_out_rings = list(keep_out), list(keep_out_rings)
    dots, placed = BoxGrid(GRID_CELL_MM), BoxGrid(GRID_CELL_MM)
    lines, links = BoxGrid(GRID_CELL_MM), BoxGrid(GRID_CELL_MM)
    for i, other in enumerate(keep_out):
        placed.add(-1 - i, other, other)
    for j, (px, py) in enumerate(points):
        dots.add(j, (px, py, px, py), j)
    dot_mm = max(leaders_from_mm, default=0.0) if with_leaders else 0.0
    # how far out each point's name reads alone: farther for one under a mark
    under = [[m for m in marks if _box_gap_mm(m, p, 0.0) == 0.0] for p in points]
    alone = [NEAR_FIRST[-1] if over_it else ALONE_REACH for over_it in under]
    own_mark = [over_it[0] if from_marks and over_it else None for over_it in under]
    slack = SEARCH_SLACK_MM
    loose = frozenset(loose)
    beside_mm = [(LOOSE_BESIDE_OFFSETS if j in loose else BESIDE_OFFSETS) * offset_mm for j in range(len(points))]
    over_mm = [(LOOSE_OVER_OFFSETS if j in loose else OVER_OFFSETS) * offset_mm for j in range(len(points))]
    within_mm = [LOOSE_AMBIGUOUS_WITHIN_MM if j in loose else AMBIGUOUS_WITHIN_MM for j in range(len(points))]

    def put(k, c):
        chosen[k] = c
        placed.add(k, c[2], c[2])
        if c[3] is not None:
            lines.add(k, segment_box(*c[3]), c[3])
        link = _link(points[k], c[2])
        links.add(k, _link_box(points[k], c[2]), link)

    def take(k):
        for grid in (placed, lines, links):
            grid.remove(k)
        return chosen.pop(k)

    def near(grid, box, k, grow_mm=0.0):
        return [item for j, item in grid.near(box, grow_mm).items() if j != k]

    kept_out = np.array(keep_out, dtype=float).reshape(-1, 4)
    tried = {} if kept is None else kept   # (point index, text, loosely) -> its blocks of places found so far

    def blocks_of(k):
        """Point k's places in the order tried, by blocks (each of
        :func:`_place_blocks`), each found when first needed: its places
        (a table of :func:`_place_table`, read by :func:`_place`), the
        indices of those that meet no box kept out and their boxes as an
        array, and a memo of the tests of each place (by index) that give
        the same whatever is chosen (:func:`_once`): whether it stays
        inside ``inside_radius_mm`` and off the rings kept out, reads as
        its point's, its leader, and whether that passes another dot or
        crosses a ring kept out."""
        found = tried.setdefault((k, texts[k], k in loose, from_marks and bool(under[k])), [])
        for n, (some, needs_leader) in enumerate(_place_blocks(reaches, with_leaders, alone[k])):
            if n == len(found):
                (x, y), text = points[k], texts[k]
                ext = measure(text, size_pt)
                table = _place_table(x, y, ext.width_mm, ext.height_mm, offset_mm, some, needs_leader)
                clear = np.flatnonzero(~meets_any(table[3], kept_out))
                found.append((table, clear.tolist(), table[3][clear], {}))
            yield found[n]

    def room(box):
        """Whether a box stays inside ``inside_radius_mm`` and off the
        rings kept out."""
        return (inside_radius_mm is None or max(abs(box[0]), abs(box[2])) ** 2
                + max(abs(box[1]), abs(box[3])) ** 2 <= inside_radius_mm ** 2) \
            and not any(_meets_ring(box, ring) for ring in keep_out_rings)

    def choose(k):
        """The first free place of point k's label, given those chosen;
        else the first whose leader crosses a ring kept out only from a
        point on it (#9: Kaus Australis's across the band only where there
        is no other place), found in the same pass (#12); else None."""
        x, y = points[k]
        own = own_boxes[k] if own_boxes is not None else None
        g = NAME_GAP_MM
        names = np.array([c[2] for j, c in chosen.items() if j != k], dtype=float).reshape(-1, 4)
        spans = np.array([segment_box(*c[3]) for j, c in chosen.items() if j != k and c[3] is not None],
                         dtype=float).reshape(-1, 4)
        across = None
        for i, table, memo, by_leader in free_of(blocks_of(k), names, g if with_leaders else None, spans):
            at, anchor, needs_leader, box = _place(table, i)
            if across is not None and needs_leader:
                # (only a leader that crosses no ring can come before the
                # one found that does, and most leaders from a dot on a
                # ring cross it at their start: that test first)
                leader = _once(memo, ("leader", i), leader_ends, (x, y), box, leaders_from_mm[k] + MARGIN_MM)
                if leader is None or _once(memo, ("crossed", i), _rings_met, leader, keep_out_rings):
                    continue
            if not _once(memo, ("room", i), room, box) \
                    or by_leader and any(_segment_meets_box(a, b, _grown(box, LEADER_WORD_GAP_MM))
                                         for a, b in near(lines, box, k, LEADER_WORD_GAP_MM + slack)):
                continue
            if with_leaders:
                if not needs_leader and not _once(memo, ("own", i), _nearest_own, box, k, points, leaders_from_mm,
                                                  dots, dot_mm, beside_mm[k], over_mm[k], own_mark[k]):
                    continue
                # (the other dots first: that test is kept for the place,
                # and turns down more places since the rule of dots past a
                # name's ends, #12)
                if needs_leader and _once(memo, ("beside", i), _beside_another, box, k, points, leaders_from_mm,
                                          max(offset_mm * LEADER_NAME_CLEAR, NAME_GAP_MM), dots, dot_mm,
                                          beside_mm[k], over_mm[k]):
                    continue
                # (no leader chosen before passes between this label and
                # its point, with a leader of its own or not)
                if _crosses_link((x, y), box, near(lines, _link_box((x, y), box), k, slack)):
                    continue
            leader = None
            if needs_leader:
                leader = _once(memo, ("leader", i), leader_ends, (x, y), box, leaders_from_mm[k] + MARGIN_MM)
                if leader is None:
                    continue
                span = segment_box(*leader)
                if any(_segment_meets_box(leader[0], leader[1], _grown(other, LEADER_WORD_GAP_MM))
                       for other in near(placed, span, k, LEADER_WORD_GAP_MM + slack) if other is not own) \
                        or any(_segments_cross(leader[0], leader[1], a, b) for a, b in near(lines, span, k, slack)) \
                        or any(_segments_cross(leader[0], leader[1], p, q)
                               for link in near(links, span, k, slack) for p, q in link) \
                        or _once(memo, ("passes", i), _passes_another, leader, k, points, leaders_from_mm,
                                 LEADER_CLEAR_MM, dots, dot_mm):
                    # (two leaders never cross, nor pass between another
                    # label and its point)
                    continue
                if any(runs_along(leader, line) for line in lines_along):
                    continue
                if unclear(k, _once(memo, ("rivals", i), _rivals, box, k, points,
                                    leaders_from_mm, dots, dot_mm, leader, within_mm[k], own_mark[k])):
                    continue
                crossed = _once(memo, ("crossed", i), _rings_met, leader, keep_out_rings)
                if crossed:
                    # (a dot on a ring must cross it)
                    if across is None and all(_segment_meets_ring((x, y), (x, y), ring) for ring in crossed):
                        across = (at, anchor, box, leader)
                    continue
            elif with_leaders \
                    and unclear(k, _once(memo, ("rivals", i), _rivals, box, k, points, leaders_from_mm, dots, dot_mm,
                                         None, within_mm[k], own_mark[k])):
                continue
            return (at, anchor, box, leader)
        return across

    def unclear(k, rivals):
        """Whether a place's ``rivals`` (of :func:`_rivals`) make its name
        ambiguous given the names chosen: a rival dot claimed by its own
        name beside it (nearer that name than this one) only where it is
        nearer than this name's own mark."""
        mark_mm, _, near_dots = rivals
        for j, d_mm in near_dots:
            c = chosen.get(j)
            if c is None and k in loose and j > k and not settled:
                continue   # (a first-magnitude star's rival still to be named: #12 review, Capella)
            claimed = c is not None and (c[3] is not None or _reading_mm(points[j], leaders_from_mm[j], c[2]) < d_mm)
            if not claimed or d_mm < mark_mm:
                return True
        return False

    def free_of(blocks, names, gap_mm, spans):
        """(index, table, memo, by_leader) of each place of the blocks, in
        order, that meets no box of ``names`` (nor, with ``gap_mm``, comes
        within that of one, or within :data:`NAME_GAP_ALONG_MM` of one
        beside it), each block's places tested all at once;
        ``by_leader`` when its box comes within :data:`LEADER_WORD_GAP_MM`
        and the search's slack of a box of ``spans`` (those of the leaders
        chosen): a leader whose box stays farther cannot come that near it
        (a level leader's box has no height: one 0.1 mm over a name had gone
        untested, and ran over the tops of its letters)."""
        along_mm = None if gap_mm is None else max(gap_mm, NAME_GAP_ALONG_MM)
        for table, clear, array, memo in blocks:
            # (a box grown by the gap meets all that the box itself meets)
            grown = array if gap_mm is None else array + np.array([-along_mm, -gap_mm, along_mm, gap_mm])
            taken = meets_any(grown, names)
            reach = LEADER_WORD_GAP_MM + slack
            by_leader = meets_any(array + np.array([-reach, -reach, reach, reach]), spans)
            for i, t, b in zip(clear, taken.tolist(), by_leader.tolist()):
                if not t:
                    yield i, table, memo, b

    settled = False   # (while the rivals of a loose point's name may still be named)
    for k in range(len(points)):
        choice = choose(k)
        if choice is not None:
            put(k, choice)
    if with_leaders:
        # A label with no free place may take a neighbour's, if the
        # neighbour then finds another (a step of repair after the greedy
        # pass, common practice in map labelling).
        for k in range(len(points)):
            if k in chosen:
                continue
            nearest = sorted(chosen, key=lambda j: _box_gap_mm(chosen[j][2], points[k], 0.0))[:REPAIR_NEIGHBOURS]
            for j in nearest:
                kept = take(j)
                mine = choose(k)
                if mine is not None:
                    put(k, mine)
                    theirs = choose(j)
                    if theirs is not None:
                        put(j, theirs)
                        break
                    take(k)
                put(j, kept)
        # A name whose rival dots were to be named (a loose point's) or
        # were named beside them when it was chosen, and are not now, is
        # set again where it reads clearly, or left out.
        settled = True
        for _ in range(len(points)):
            unsure = [k for k, c in chosen.items()
                      if unclear(k, _rivals(c[2], k, points, leaders_from_mm, dots, dot_mm, c[3], within_mm[k],
                                            own_mark[k]))]
            if not unsure:
                break
            for k in unsure:
                take(k)
                again = choose(k)
                if again is not None:
                    put(k, again)
    out = []
    for k in range(len(points)):
        c = chosen.get(k)
        out.append(None if c is None else c[:2] if not with_leaders else (c[0], c[1], c[3]))
    return out


def _once(memo: dict, key, compute, *args):
    """``memo[key]``, found by ``compute(*args)`` the first time (#12: a
    place tried again, as the names are chosen and repaired, is not tested
    again for what does not change)."""
    if key not in memo:
        memo[key] = compute(*args)
    return memo[key]


def _rings_met(segment, rings) -> list:
    """The rings of ``rings`` that a segment meets."""
    return [ring for ring in rings if _segment_meets_ring(segment[0], segment[1], ring)]


def _place_blocks(reaches, with_leaders, alone: float = ALONE_REACH):
    """The places tried for a label, as blocks of (reaches, needs_leader):
    with leaders, first the places a name reads from alone (out to
    ``alone`` offsets), then every place with a leader."""
    if with_leaders:
        return [(tuple(r for r in reaches if r <= alone), False), (reaches, True)]
    return [(reaches, False)]


@functools.lru_cache(maxsize=64)
def _place_terms(offset_mm: float, h: float, reaches):
    """What :func:`_place_table` adds to a point's coordinates for the
    places of a label ``h`` mm high beside it at each of ``reaches`` in
    turn (nearest first if they grow): arrays of the term added to x and
    where it is added; of the first term added to y, and where; of the
    second, and where (the sums made in the order written below, so that
    every place is that of the sums made one by one); of the share of the
    label's width it is set back by its anchor; and the anchors."""
    rows = []   # (x term, first y term, second y term, anchor); None: nothing added
    hh = h / 2
    for reach in reaches:
        o = offset_mm * reach
        d = o * 0.75
        if reach > NEAR_FIRST[-1]:  # far out, with a leader: directions all round the point
            for ca, sa, anchor, side in _LEADER_WAYS:
                rows.append((o * ca, o * sa, hh * side if anchor == "middle" else 0.0, anchor))
            continue
        rows += [(o, None, None, "start"), (-o, None, None, "end"),
                 (None, o, hh, "middle"), (None, -o, -hh, "middle"),
                 (d, d, hh, "start"), (-d, d, hh, "end"), (d, -d, -hh, "start"), (-d, -d, -hh, "end")]
        # then beside the point but raised or lowered by half the name's
        # height, and above or below it to one side (the places of map
        # labelling between those eight)
        rows += [(o, s * hh, None, "start") for s in (1, -1)] + [(-o, s * hh, None, "end") for s in (1, -1)] + \
                [(o / 2, s * (o + hh), None, anchor) for s in (1, -1) for anchor in ("start", "end")]
    columns = list(zip(*rows))
    terms = [(np.array([0.0 if t is None else t for t in col]), np.array([t is not None for t in col]))
             for col in columns[:3]]
    setback = np.array([_SETBACK[anchor] for anchor in columns[3]])
    return terms, setback, columns[3]


#: The share of a label's width that its anchor sets it back by.
_SETBACK = {"start": 0.0, "middle": 0.5, "end": 1.0}


def _place_table(x, y, w, h, offset_mm, reaches, needs_leader):
    """The places for a label ``w`` by ``h`` mm beside the point (x, y) at
    each of ``reaches`` in turn, all at once (#12): (x and y of each place
    as an array n x 2, their anchors, ``needs_leader``, their boxes of
    :func:`_box_at` as an array n x 4, then the two arrays as lists), the
    same numbers, summed in the same order, as one by one."""
    ((tx, on_x), (ty, on_y), (ty2, on_y2)), setback, anchors = _place_terms(offset_mm, h, reaches)
    at_x = np.where(on_x, x + tx, x)
    at_y = np.where(on_y, y + ty, y)
    at_y = np.where(on_y2, at_y + ty2, at_y)
    x0 = at_x - setback * w
    boxes = np.stack([x0, at_y - h / 2, x0 + w, at_y + h / 2], axis=1)
    at = np.stack([at_x, at_y], axis=1)
    # the places also as lists, read place by place without numpy's
    # scalars (#12)
    return at, anchors, needs_leader, boxes, at.tolist(), boxes.tolist()


def _place(table, i: int):
    """(at, anchor, needs_leader, box) of place ``i`` of a table of
    :func:`_place_table`."""
    _, anchors, needs_leader, _, at, boxes = table
    return tuple(at[i]), anchors[i], needs_leader, tuple(boxes[i])


def _leader_ways():
    """(cos, sin, anchor, side) of each direction of :func:`_places` with
    a leader: the anchor that sets the name away from its point, and the
    side (1 up, -1 down) a name set by its middle is lifted to."""
    out = []
    for j in range(LEADER_DIRECTIONS):
        a = 2 * math.pi * j / LEADER_DIRECTIONS
        ca, sa = math.cos(a), math.sin(a)
        out.append((ca, sa, "start" if ca > 0.3 else "end" if ca < -0.3 else "middle", 1 if sa > 0 else -1))
    return tuple(out)


#: The directions with a leader, worked out once (#12).
_LEADER_WAYS = _leader_ways()


def _box_gap_mm(box, point, radius_mm: float) -> float:
    """Paper (mm) between a dot of ``radius_mm`` at ``point`` and a box."""
    x, y = point
    return math.hypot(x - min(max(x, box[0]), box[2]), y - min(max(y, box[1]), box[3])) - radius_mm


def _link_box(point, box):
    """The axis-aligned box that holds a point and its label's box, and so
    every segment of :func:`_link`."""
    return (min(point[0], box[0]), min(point[1], box[1]), max(point[0], box[2]), max(point[1], box[3]))


def _crosses_link(point, box, segments) -> bool:
    """Whether one of ``segments`` crosses a segment of the link from the
    point to its label's box (:func:`_link`), as :func:`_segments_cross`
    finds it.  A segment whose box lies apart from the link's box
    (:func:`_link_box`) by more than :data:`APART_MM` crosses none of
    them, and is not tested: the grid's neighbours of a place are most
    often such (#12)."""
    x0, y0, x1, y1 = _link_box(point, box)
    x0, y0, x1, y1 = x0 - APART_MM, y0 - APART_MM, x1 + APART_MM, y1 + APART_MM
    links = None
    for a, b in segments:
        if (a[0] < x0 and b[0] < x0) or (a[0] > x1 and b[0] > x1) or (a[1] < y0 and b[1] < y0) \
                or (a[1] > y1 and b[1] > y1):
            continue
        if links is None:
            links = _link(point, box)
        for p, q in links:
            if _segments_cross(a, b, p, q):
                return True
    return False


#: A gap (mm) between two boxes far wider than the rounding of their
#: coordinates, past which segments in them cannot be found to cross.
APART_MM = 1e-6


def _link(point, box):
    """The segments from a point to its label's box: to each corner and to
    the box's nearest point.  A line that passes between the label and its
    point (through the shape they span) crosses one of them."""
    x, y = point
    near = (min(max(x, box[0]), box[2]), min(max(y, box[1]), box[3]))
    return [((x, y), c) for c in ((box[0], box[1]), (box[2], box[1]), (box[2], box[3]), (box[0], box[3]), near)]


def _nearest_own(box, k: int, points, radii_mm, dots, dot_mm: float, beside_mm: float = 0.0,
                 over_mm: float = 0.0, own_mark=None) -> bool:
    """Whether the box lies nearer point ``k``'s dot than any other
    point's, by :data:`NEARER_BY_MM` at least, and no other dot stands
    beside one of its ends, level with its words, within ``beside_mm``:
    there a name reads as that dot's whatever the distances, the place
    beside a point being where a name is looked for first (common practice
    in map labelling; #12: "Alioth" beside Dubhe's dot, its own below it).
    Only the points of the grid ``dots`` near enough to fail are tested
    (``dot_mm``: the widest dot's radius); with ``own_mark`` (the box of
    a mark over point ``k``'s dot), a box beside the mark (:func:`_beside_mark`)
    is measured from the mark."""
    own = _box_gap_mm(box, points[k], radii_mm[k])
    if own_mark is not None and _beside_mark(box, own_mark):
        own = min(own, _boxes_gap_mm(box, own_mark))
    reach = max(own + NEARER_BY_MM, beside_mm, over_mm) + dot_mm + SEARCH_SLACK_MM
    for j in dots.near(box, max(reach, 0.0)):
        if j == k:
            continue
        if own + NEARER_BY_MM >= _box_gap_mm(box, points[j], radii_mm[j]):
            return False
        if _reads_as_its(box, points[j], radii_mm[j], beside_mm, over_mm):
            return False
    return True


def _beside_mark(box, mark) -> bool:
    """Whether a name's box stands right beside a mark, where a name reads
    as the mark's: over or under its middle (the words spanning it) or
    level with its middle; not off to one side of it nor off a corner."""
    cx, cy = (mark[0] + mark[2]) / 2, (mark[1] + mark[3]) / 2
    return box[0] <= cx <= box[2] or box[1] <= cy <= box[3]


def _boxes_gap_mm(a, b) -> float:
    """Paper (mm) between two boxes."""
    return math.hypot(max(a[0] - b[2], b[0] - a[2], 0.0), max(a[1] - b[3], b[1] - a[3], 0.0))


def _reading_mm(point, radius_mm: float, box) -> float:
    """Paper (mm) from a dot of ``radius_mm`` at ``point`` to the nearest
    of the places a reader looks from a name for its point: the middles of
    its two ends and its middle (common practice in map labelling: a name
    is set beside its point, or over or under it)."""
    x0, y0, x1, y1 = box
    yc = (y0 + y1) / 2
    return min(math.hypot(point[0] - x, point[1] - yc) for x in (x0, (x0 + x1) / 2, x1)) - radius_mm


def _rivals(box, k: int, points, radii_mm, dots, dot_mm: float, leader=None, within_mm=AMBIGUOUS_WITHIN_MM,
            own_mark=None):
    """(own mark, reach, rivals) of a name's box for point ``k``: the
    :func:`_reading_mm` of its own mark (the dot, or the end of the
    ``leader`` at the name), the reach within which an unclaimed dot makes
    it ambiguous (:data:`CLEARLY_OWN_RATIO` times its own dot's, at most
    :data:`AMBIGUOUS_WITHIN_MM`), and (j, mm) of each other dot within
    that reach (of the points of the grid ``dots`` near it; ``dot_mm``:
    the widest dot's radius; ``own_mark`` as for :func:`_nearest_own`)."""
    own_mm = _reading_mm(points[k], radii_mm[k], box)
    if own_mark is not None and _beside_mark(box, own_mark):
        x0, y0, x1, y1 = box
        own_mm = min(own_mm, min(_box_gap_mm(own_mark, (x, (y0 + y1) / 2), 0.0) for x in (x0, (x0 + x1) / 2, x1)))
    mark_mm = own_mm if leader is None else _reading_mm(leader[1], 0.0, box)
    reach = min(within_mm, CLEARLY_OWN_RATIO * own_mm)
    out = []
    for j in dots.near(box, max(reach, 0.0) + dot_mm + SEARCH_SLACK_MM):
        if j != k:
            d_mm = _reading_mm(points[j], radii_mm[j], box)
            if d_mm < reach:
                out.append((j, d_mm))
    return mark_mm, reach, out


def _reads_as_its(box, point, radius_mm: float, beside_mm: float, over_mm: float = 0.0) -> bool:
    """Whether a dot of ``radius_mm`` at ``point`` stands where a reader
    looks for a point's name, so that the box's words read as that dot's
    name, leader or not (the usual places of a point's name in map
    labelling, beside it, then over or under it; common practice): level
    with the words (its disc reaching into their height) beyond one of
    the box's ends, within ``beside_mm`` (#12: "Elnath", led from its own
    dot, began beside Bellatrix's, whose disc stood 0.03 mm below the
    words' box), or past an end and over or under the line as near that
    end as ``beside_mm`` (#12 review: Dubhe's dot between the lines of
    "Castor" and "Pollux", 2.2 mm past their ends; Betelgeuse's at the
    tops of the letters, 2.1 mm past "Alnilam"), or under or over the
    words within ``over_mm`` (#12: on a southern A4 rete at 33.9 S the
    name of Miaplacidus, at the end of its leader, stood 1.3 mm over
    Canopus's dot; at 40 N Saiph's dot 1.5 mm over the end of
    "Alnitak")."""
    x, y = point
    beyond = max(box[0] - x, x - box[2])   # past the nearer end (negative: within the words' run)
    if box[1] - radius_mm <= y <= box[3] + radius_mm:
        return beyond - radius_mm < beside_mm
    if beyond > 0.0:   # past an end, over or under the line: as near that end in any direction
        return math.hypot(beyond, max(box[1] - y, y - box[3])) - radius_mm < beside_mm
    return max(box[1] - y, y - box[3]) - radius_mm < over_mm


def runs_along(leader, line) -> bool:
    """Whether a ``leader`` ((p, q), mm) runs along a ``line`` ((a, b,
    half_width_mm)): within :data:`ALONG_DEG` of its direction and nearer
    it than its half width and :data:`ALONG_GAP_MM` anywhere (the least
    distance of two segments: zero where they cross, else that of an end
    of one from the other)."""
    (p, q), (a, b, half_mm) = leader, line
    u, v = (q[0] - p[0], q[1] - p[1]), (b[0] - a[0], b[1] - a[1])
    nu, nv = math.hypot(*u), math.hypot(*v)
    if nu == 0.0 or nv == 0.0:
        return False
    if abs(u[0] * v[0] + u[1] * v[1]) / (nu * nv) < math.cos(math.radians(ALONG_DEG)):
        return False
    reach = half_mm + ALONG_GAP_MM
    return _segments_cross(p, q, a, b) or min(_point_segment_mm(p, a, b), _point_segment_mm(q, a, b),
                                               _point_segment_mm(a, p, q), _point_segment_mm(b, p, q)) < reach


def _point_segment_mm(pt, a, b) -> float:
    """Distance (mm) from ``pt`` to segment ab."""
    dx, dy = b[0] - a[0], b[1] - a[1]
    t = ((pt[0] - a[0]) * dx + (pt[1] - a[1]) * dy) / (dx * dx + dy * dy)
    t = min(1.0, max(0.0, t))
    return math.hypot(pt[0] - a[0] - t * dx, pt[1] - a[1] - t * dy)


def _segments_cross(p, q, a, b) -> bool:
    """Whether segments pq and ab cross (the signs of the orientations of
    each one's ends about the other, the usual test of computational
    geometry), the orientations written out: a set's labels ask it
    about a hundred thousand times a kit (#12)."""
    (px, py), (qx, qy), (ax, ay), (bx, by) = p, q, a, b
    ex, ey = qx - px, qy - py
    if (ex * (ay - py) - ey * (ax - px)) * (ex * (by - py) - ey * (bx - px)) >= 0:
        return False
    fx, fy = bx - ax, by - ay
    return (fx * (py - ay) - fy * (px - ax)) * (fx * (qy - ay) - fy * (qx - ax)) < 0


def _passes_another(leader, k: int, points, radii_mm, near_mm: float, dots, dot_mm: float) -> bool:
    """Whether the leader passes within ``near_mm`` of a dot other than
    point ``k``'s, where it could be read as that dot's (of the points of
    the grid ``dots`` near it; ``dot_mm``: the widest dot's radius)."""
    (ax, ay), (bx, by) = leader
    dx, dy = bx - ax, by - ay
    n2 = dx * dx + dy * dy
    for j in dots.near(segment_box(*leader), near_mm + dot_mm + SEARCH_SLACK_MM):
        if j == k:
            continue
        (x, y), r = points[j], radii_mm[j]
        t = min(max(((x - ax) * dx + (y - ay) * dy) / n2, 0.0), 1.0) if n2 > 0 else 0.0
        if math.hypot(x - ax - t * dx, y - ay - t * dy) - r < near_mm:
            return True
    return False


def _beside_another(box, k: int, points, radii_mm, near_mm: float, dots, dot_mm: float,
                    beside_mm: float = 0.0, over_mm: float = 0.0) -> bool:
    """Whether the box stands within ``near_mm`` of a dot other than point
    ``k``'s, or has one level with its words within ``beside_mm`` beyond
    an end or within ``over_mm`` over or under their middle
    (:func:`_reads_as_its`), where it would read as that dot's
    name, leader or not (of the points of the grid ``dots`` near it;
    ``dot_mm``: the widest dot's radius)."""
    return any(_box_gap_mm(box, points[j], radii_mm[j]) < near_mm
               or _reads_as_its(box, points[j], radii_mm[j], beside_mm, over_mm)
               for j in dots.near(box, max(near_mm, beside_mm, over_mm) + dot_mm + SEARCH_SLACK_MM) if j != k)


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

"""The plate's numbers and names, each set where it reads, none on a line.

Every almucantar that is a multiple of 10 degrees (of the numbering step
where that is coarser) carries its number where it crosses the meridian,
above and below the zenith; a circle that meets the meridian only outside
the drawing is numbered where it meets the east-west line, else at its
ends on the rim.  Multiples of 5 degrees are numbered on the meridian too
where their neighbours leave room.  Azimuths are numbered just below the
horizon on their own line continued (at the rim where the horizon point is
outside the drawing, or just beyond it, between the rim and the plate's
cut, where the line has no room), with a degree sign that the almucantars' plain
numbers lack, so that 30° (an azimuth) never reads as 30 (an altitude);
the cardinal letters stand beside the horizon's points, clear of the pin,
the meridian, the east-west line, the equator and the horizon; unequal
hours are numbered between their lines; horizon, equator, tropics and
twilight lines are named along the curve (common practice on printed
astrolabe plates).

Every label is measured with the shipped fonts (``Words.measure``) and
tried at points along its curve (or round its point), nearest first; the
first place whose box stays inside the drawing, keeps :data:`LABEL_GAP_MM`
from every label set before and :data:`CLEAR_MM` from every drawn line but
its own is taken (#9: a number set in a gap it broke in another line reads
as that line's label).  A label breaks only its own line, which is cut
round it afterwards (:mod:`kitgen.parts.breaks`), so no drawn line crosses
a printed character; the meridian and the east-west line, along which the
almucantars are numbered, it may come as near as :data:`MARGIN_MM`.  A
label with no such place is left out, and the build's notes say so
(:func:`left_out`).  Lengths in mm, angles in radians inside.
"""

from __future__ import annotations

import math

import numpy as np

from ..geometry import model
from ..geometry.arrays import ints_not_in, unique_ints
from ..geometry.style import dot_radius_mm, pin_cross_half_mm, stroke_width_mm, zenith_mark_half_mm
from ..projection.stereographic import equatorial_vector, horizontal_vector, project, project_vectors
from .breaks import (MEETS, MIN_PIECE_MM, UNSURE, Box, arcs_meet_boxes, boxes_overlap, meets_near, reach_of,
                     ring_meets_grown, segments_meet_boxes)
from .labels import MARGIN_MM, NAME_GAP_ALONG_MM
from .stroke_index import BoxIndex, StrokeArrays, StrokeIndex

STROKE_SHAPES = ("circle", "arc", "segment", "polyline")
#: Clear paper (mm) kept between a label and every drawn line that is not
#: its own, and between two labels: about a millimetre of white round
#: lettering keeps it from reading as part of a neighbouring line (common
#: practice of map and scale lettering; the value is ours, #9).
CLEAR_MM = 1.0
LABEL_GAP_MM = CLEAR_MM
#: How much farther (mm) a label goes for the full clearance rather than
#: stand MARGIN_MM beside a line.
PREFER_CLEAR_MM = 3.0
#: Centres whose places round them are screened at once
#: (:meth:`PlateLabeller._may_be_free`).
MAY_BE_FREE_CENTRES = 4
#: How far (mm) round each point of a small circle an almucantar's number
#: is sought at last (:meth:`PlateLabeller.almucantar`), and how far apart
#: those points are along it.
ROUND_REACH_MM = 2.5
ROUND_STEP_MM = 0.5
#: A cardinal letter farther than this (mm) from its horizon point gets a
#: leader to it (#9: at low latitudes the north point is at the pin).
NEAR_MM = 2.5
#: How far (mm, along its curve) a number may slide from where it belongs.
SLIDE_MM = 12.0
#: How far (mm) along its line's undrawn continuation below the horizon
#: an azimuth's number stands from its horizon point before its own line,
#: a leader or the horizon are tried: farther a pupil must carry the line
#: on by eye past other lines, and may take the number for a neighbour's
#: (#12 review: "30°" 10.5 mm below its point, past the twilight line and
#: the tropic, on a Letter plate at 52 N); an optional number goes no
#: farther, an owed one only where nothing nearer is found (out to
#: :data:`SLIDE_MM`).
CONTINUED_MM = 5.0
#: Where across its band (as shares of the hour, from line k - 1) an
#: unequal hour's number is sought: the middle first, at every declination
#: between the tropics; then nearer one of its lines, where lines running
#: across the band (three twilight circles on an A5 plate) leave the
#: middle no room (#12 review: the hours 1, 2, 11 and 12 had no number).
HOUR_SHARES = (0.5, 0.42, 0.58, 0.34, 0.66, 0.26, 0.74, 0.18, 0.82, 0.1, 0.9)
#: Clear paper (mm) between a number in the ring beyond the rim and the
#: plate's cut line: scissors a little inside the line would nick it
#: (#12 review: 0.35 mm was too little; a choice).
RIM_CUT_CLEAR_MM = 0.5
#: Where (mm along the ring, from right beyond its line's end) an azimuth's
#: number set between the rim and the plate's edge is sought, nearest
#: first (:meth:`PlateLabeller._beyond_rim`).
RIM_SLIDES_MM = (0.0, 0.5, -0.5, 1.0, -1.0)
#: How far (mm) along its own line from its horizon point the leader of an
#: azimuth's number with no room on its line may meet the line instead.
LED_ALONG_MM = 4.0
#: How far (mm) along its own line above the horizon an owed azimuth's
#: number laid along the horizon may stand from its point: in the band
#: below the first almucantar (:meth:`PlateLabeller._along_horizon`).
ALONG_HORIZON_MM = 3.0
#: The least room (mm) along a curve between its name and an azimuth's
#: number laid along the horizon: 1.5 mm read as one label, "Horizon
#: 240°" (a teacher's look, #12; a choice).
LAID_APART_MM = 3.0
#: The longest such leader (mm, a choice: a number farther from its line
#: is hard to follow to it).
LED_MOST_MM = 4.0
#: The least slope (degrees from level) of a number's leader: a level
#: dash beside a number reads as its minus sign (a choice).
LEADER_LEAST_SLOPE_DEG = 30.0
#: How far (mm) from its horizon point the number's centre may stand: a
#: leader of the most length from the point, and half a three-figure
#: number's width (about 2.5 mm at 6 pt).  (Over 40 kits from 60 S to
#: 60 N every number set with a leader stood within 6.2 mm of its point,
#: with the reach 4 mm longer; the search is the costlier the wider.)
LED_REACH_MM = LED_MOST_MM + 2 * MARGIN_MM + 2.5
#: How far (mm, along its circle) a number slides before it may cross
#: the azimuths near the zenith rather than slide on.
NEAR_SLIDE_MM = 4.0
#: Step (mm) between the places tried.
STEP_MM = 0.25
#: Paper (mm) along its row between a number (an unequal hour's, an
#: almucantar's, an azimuth's) and a cardinal letter level with it: twice
#: the labels' gap for names side by side (kitgen.parts.labels.NAME_GAP_ALONG_MM),
#: since a letter shaped like a digit reads as one of the number's
#: digits (#12 review: "1 O", hour 1 beside the Portuguese west point,
#: read as "10"; the Russian "З" beside "2"; a teacher's look: the French
#: west "O" 2.9 mm from an almucantar's "10" read as "100", "15° N" as a
#: latitude).
CARDINAL_APART_MM = 2 * NAME_GAP_ALONG_MM
#: Least gap (mm) between an azimuth's number at its line's end on the rim
#: and an almucantar's or an unequal hour's number, where the rim leaves
#: such a place: nearer, the two read as one stack and a pupil cannot tell
#: which numbers which line (#12 review: "150°" 1.3 mm over "20" at the
#: rim at 0.4 deg N).  A choice; with no place so far off, the number
#: stands nearer rather than not at all.
STACK_APART_MM = 5.0
#: Least gap (mm) between an azimuth's number on its line below (or just
#: above) the horizon and an almucantar's or an unequal hour's number,
#: where its line leaves such a place: the names' own gap side by side
#: (#12 review: "105°" 1.1 mm over the hour "12" and "255°" over "1"
#: beside the east and west points, read as one stack).  A multiple of 30
#: degrees, owed its number, keeps its first free place, as near its
#: point as it can stand; any other azimuth goes unnumbered where it finds
#: no such place (its neighbours' numbers name it).
BELOW_APART_MM = NAME_GAP_ALONG_MM
#: ... and (mm) right over or under one, their widths overlapping, where
#: two numbers 2 mm apart still read as one label (#12 review: "105°"
#: 2.1 mm over "12" at 51.5 N).
STACKED_APART_MM = 3.0
#: How much farther (mm) from its horizon point than its first free place
#: an azimuth's number may go to keep that gap: farther along the line's
#: undrawn continuation it reads as another line's (#12 review: "105°"
#: 10 mm past its line's end, beside an hour line, on a 140 mm plate).
APART_SLIDE_MM = 2.0
#: A worked example's almucantar is numbered near the example's body
#: where no number of it stands within this many of its radii (about a
#: third of the circle's way round) from the body's place.
EXAMPLE_NEAR_RADII = 1.0
#: ... and keeps this much paper (mm) from the body's place, which the
#: rete's dot of the star (at most about 0.8 mm across) or the point of
#: the Sun on the ecliptic covers when the example is set (#12 review: a
#: number 0.75 mm from Rigel's place lay under its dot).
EXAMPLE_CLEAR_MM = 1.5


class Room:
    """The free room of the drawing: a disc less the labels set so far.

    Every test answers as if each box were tried against every label and
    every line; grid indexes (:mod:`kitgen.parts.stroke_index`) only leave
    out those too far off to meet it, and :meth:`screen` decides many
    boxes at once only where its margins leave no doubt (#12)."""

    def __init__(self, disc_mm: float, dims, keep_out=(), strokes: StrokeIndex | None = None):
        self.disc = disc_mm - MARGIN_MM
        self.dims = dims
        self.taken: list[Box] = list(keep_out)
        # a part's strokes are entered once, however many rooms test against them (#12)
        self.strokes = StrokeIndex() if strokes is None else strokes
        self._labels = BoxIndex()
        self._half_width: dict[str, float] = {}
        self._lists: dict[int, tuple] = {}
        self._arrays = StrokeArrays()
        self._lines: dict[int, tuple] = {}

    def enter(self, elements) -> None:
        """Enter the strokes of ``elements`` in the index and the arrays
        at once, before any test: the arrays are then built once, not
        again whenever a list with a stroke not yet entered is tested
        (#12)."""
        self.strokes.enter(elements)
        self._arrays.enter(elements)

    def give_back(self, box: Box) -> None:
        """Take a label's box out of the room (the index of the labels made
        again from those left, at the next test)."""
        self.taken = [t for t in self.taken if t is not box]
        self._labels = BoxIndex()

    def inside(self, box: Box) -> bool:
        # Far inside the rim (or wholly beyond it) by more than any
        # rounding of the corners, the answer is that of the corners.
        r = math.hypot(*box.center)
        if r + box.radius < self.disc - 1e-6:
            return True
        if r - box.radius > self.disc + 1e-6:
            return False
        return all(math.hypot(x, y) <= self.disc for x, y in box.corners())

    def clear_of_labels(self, box: Box) -> bool:
        g = box.grown(LABEL_GAP_MM)   # the whole gap on the new box's side
        labels = self._labels
        for t in self.taken[labels.count:]:   # labels set since the last test
            labels.add(t)
        for t in labels.near(g.center, g.radius):
            if math.dist(g.center, t.center) < g.radius + t.radius and boxes_overlap(g, t):
                return False
        return True

    def clear_of(self, box: Box, elements, clear_mm: float = MARGIN_MM) -> bool:
        """Whether the box keeps ``clear_mm`` (and half the line's width)
        from every stroke of ``elements``; only the strokes the index
        finds near the box are tested (the same answer, #12)."""
        if not elements:
            return True
        # The line that met the last box tested against these lines is
        # tried first: the next place is most often near it (#12).
        near = self._members(elements)
        last = near.get("last")
        if last is not None and self._meets(last, box, clear_mm + last[1]):
            return False
        for line in self._near_lines(near, box, clear_mm + near["widest"]):
            if line is not last and self._meets(line, box, clear_mm + line[1]):
                near["last"] = line
                return False
        return True

    def crossed(self, box: Box, elements, most: int | None = None) -> int:
        """How many strokes of ``elements`` run through the box, counted
        no further than ``most`` (when a count that high is no use)."""
        if not elements:
            return 0
        count = 0
        for line in self._near_lines(self._members(elements), box, 0.0):
            if self._meets(line, box, 0.0):
                count += 1
                if most is not None and count >= most:
                    break
        return count

    def _near_lines(self, near, box: Box, reach_mm: float) -> list:
        """Of the strokes of a list (``near``, see :meth:`_members`), as
        :meth:`_line` keeps them, those the index holds in the grid cells
        within ``reach_mm`` of the box, kept by the cells' span (neighbouring
        places share it)."""
        span = self.strokes.span(box.center, math.hypot(box.half_w + reach_mm, box.half_h + reach_mm))
        found = near.get(span)
        if found is None:   # the members among the strokes of these cells
            members, line = near["members"], self._line
            found = near[span] = [line(el) for key, el in self.strokes.in_span(span).items() if key in members]
        return found

    def _line(self, el) -> tuple:
        """A stroke as its tests read it, worked out once: (the element,
        half its line's width, then the figures of
        :func:`kitgen.parts.breaks.reach_of`, then an arc's angles in
        radians, as :func:`kitgen.parts.breaks.meets_near` takes them)."""
        got = self._lines.get(id(el))
        if got is None:   # the index keeps the element: its id stays its own
            g = el.geom
            arc = (math.radians(g["start_deg"]), math.radians(g["end_deg"])) if el.shape == "arc" else (0.0, 0.0)
            got = self._lines[id(el)] = (el, self._half_width[el.stroke]) + reach_of(el) + arc
        return got

    def meets(self, el, box: Box, by_mm: float) -> bool:
        """Whether the stroke ``el`` (one entered) runs through ``box``
        grown by ``by_mm``: :func:`kitgen.parts.breaks.meets`, worked as
        :meth:`_meets` works it (#12)."""
        return self._meets(self._line(el), box, by_mm)

    @staticmethod
    def _meets(line, box: Box, by_mm: float) -> bool:
        """Whether the stroke of ``line`` (see :meth:`_line`) runs through
        the box grown by ``by_mm``: :func:`kitgen.parts.breaks.meets`,
        the box grown only where the quick test of
        :func:`kitgen.parts.breaks.may_meet`, worked from the stroke's
        figures, leaves it in doubt, and there only the rest of its
        tests (:func:`kitgen.parts.breaks.meets_near`; for a circle or an
        arc :func:`kitgen.parts.breaks.ring_meets_grown`, which makes the
        grown box only where its quick tests leave it in doubt; the same
        answer, #12)."""
        el, _, ring, a, b, c, d, lo, hi = line
        x, y = box.center
        rr = math.hypot(box.half_w + by_mm, box.half_h + by_mm)   # the grown box's radius
        if ring:
            if abs(math.dist((a, b), (x, y)) - c) > rr:
                return False
            return ring_meets_grown(el, box, by_mm, rr, lo, hi)
        if not (a - rr <= x <= b + rr and c - rr <= y <= d + rr):
            return False
        return meets_near(el, box.grown(by_mm))

    def _members(self, elements) -> dict:
        """For ``elements``: the set of their ids (under "members"), half
        the widest of their lines (under "widest"), the last of them found
        meeting a box (under "last") and, by grid span, those of them the
        index holds there; their strokes entered in the index and their
        line widths known.  Kept for the last few lists asked about (a
        label's places are all tested against the same lists)."""
        kept = self._lists.get(id(elements))
        if kept is not None and kept[0] is elements and kept[1] == len(elements):
            return kept[2]
        members = set(map(id, elements))
        if not members <= self.strokes.entered:   # (else there is nothing to enter, #12)
            self.strokes.enter(elements)
        for stroke in {el.stroke for el in elements} - self._half_width.keys():
            self._half_width[stroke] = stroke_width_mm(stroke, self.dims) / 2
        near = {"members": members, "widest": max(self._half_width.values())}
        if len(self._lists) >= 8:
            self._lists.clear()
        self._lists[id(elements)] = (elements, len(elements), near)   # the list kept: its id stays its own
        return near

    def screen(self, places: "Places", idx, elements, clear_mm: float, widths: bool = True,
               every: bool = True):
        """For the places ``idx`` (an index array) of ``places``: how the
        strokes of ``elements``, grown as in :meth:`clear_of` (by
        ``clear_mm`` and, with ``widths``, half the line's width), stand
        to each box: how many surely meet it (a list along ``idx``), and
        by position in ``idx`` (where there are any) the (stroke, growth
        in mm) that the exact test must decide; without ``every``, a box
        that a circle or an arc surely meets is not tested against the
        segments (its count then only says that it is not clear).  The
        pairs of a box and a circle or arc that may meet (as
        :func:`kitgen.parts.breaks.may_meet` finds them), and of a box
        and a segment in a run whose bounds come near it, are decided at
        once as arrays (:func:`kitgen.parts.breaks.arcs_meet_boxes`,
        :func:`kitgen.parts.breaks.segments_meet_boxes`; a polyline meets
        a box where one of its segments does), the others miss (#12)."""
        n = len(idx)
        if n == 0 or not elements:
            return [0] * n, {}
        arc, run, segs, g_arc, g_run = self._columns(elements, clear_mm, widths)
        strokes = self._arrays.elements
        bx, by, c, sn = places.x[idx], places.y[idx], places.cos[idx], places.sin[idx]
        hw, hh = np.full(n, places.half_w), np.full(n, places.half_h)
        reach = np.hypot(hw, hh) + 1e-3   # beyond a grown box's corners by far more than rounding
        unsure = []
        met = np.zeros(n, dtype=int)
        if len(g_arc):
            dist = np.hypot(arc["x"] - bx[:, None], arc["y"] - by[:, None])
            i, j = np.nonzero(np.abs(dist - arc["r"]) <= reach[:, None] + 1.5 * g_arc)
            own = arc["owner"][j]
            got = arcs_meet_boxes((bx[i], by[i], c[i], sn[i], hw[i], hh[i]), g_arc[j], arc["x"][j],
                                  arc["y"][j], arc["r"][j], arc["lo"][j], arc["hi"][j], arc["whole"][j])
            met += np.bincount(i[got == MEETS], minlength=n)   # one stroke an arc: each pair once
            unsure.append(i[got == UNSURE] * len(strokes) + own[got == UNSURE])
        todo = np.arange(n) if every else np.nonzero(met == 0)[0]
        if len(g_run) and len(todo):
            r = reach[todo][:, None] + 1.5 * g_run
            x, y = bx[todo][:, None], by[todo][:, None]
            i, j = np.nonzero((run["lox"] - r <= x) & (x <= run["hix"] + r)
                              & (run["loy"] - r <= y) & (y <= run["hiy"] + r))
            i = todo[i]
            count = run["size"][j]
            if len(count):   # every segment of those runs
                k = np.repeat(run["start"][j] - (np.cumsum(count) - count), count) + np.arange(int(count.sum()))
                i = np.repeat(i, count)
                own = segs["owner"][k]
                got = segments_meet_boxes((bx[i], by[i], c[i], sn[i], hw[i], hh[i]), np.repeat(g_run[j], count),
                                          segs["px"][k], segs["py"][k], segs["qx"][k], segs["qy"][k])
                key = i * len(strokes) + own
                hit = unique_ints(key[got == MEETS])   # a polyline counted once
                met += np.bincount(hit // len(strokes), minlength=n)
                doubt = key[got == UNSURE]
                if len(doubt):
                    unsure.append(ints_not_in(doubt, hit))
        out = {}
        if unsure:
            half = self._half_width
            for k in np.concatenate(unsure).tolist():
                el = strokes[k % len(strokes)]
                out.setdefault(k // len(strokes), []).append((el, clear_mm + (half[el.stroke] if widths else 0.0)))
        return met.tolist(), out

    def _columns(self, elements, clear_mm: float, widths: bool):
        """The columns of :meth:`screen` for the strokes of ``elements``,
        kept with the list (see :meth:`_members`): their circles and arcs
        (as arrays: centre, radius, angles, whether whole, the stroke's
        position in :class:`StrokeArrays`), their runs of segments (bounds,
        first segment, size), the segments of every stroke entered, and
        the growth (mm) of each circle or arc and of each run's stroke for
        ``clear_mm`` (with half the line's width where ``widths``)."""
        near = self._members(elements)
        if "entered" not in near:   # a list's strokes entered once, not at every screen (#12)
            self._arrays.enter(elements)
            near["entered"] = True
        arcs, segs = self._arrays.arrays()
        got = near.get("columns")
        if got is None or got[0] is not arcs:
            member = np.zeros(len(self._arrays.elements), dtype=bool)
            member[[self._arrays.position[id(el)] for el in elements if id(el) in self._arrays.position]] = True
            arc_cols = np.nonzero(member[arcs["owner"]])[0]
            run_cols = np.nonzero(member[segs["run_owner"]])[0]
            arc = {key: arcs[key][arc_cols] for key in ("owner", "x", "y", "r", "lo", "hi", "whole")}
            run = {key: segs[key][run_cols] for key in ("run_owner", "lox", "hix", "loy", "hiy", "start", "size")}
            got = near["columns"] = (arcs, arc, run, segs, {})
        grows = got[4]
        if (clear_mm, widths) not in grows:
            n = len(self._arrays.elements)
            grow = clear_mm + self._arrays.half_widths(self._half_widths()) if widths else np.full(n, clear_mm)
            grows[(clear_mm, widths)] = (grow[got[1]["owner"]], grow[got[2]["run_owner"]])
        return got[1:4] + grows[(clear_mm, widths)]

    def _half_widths(self) -> dict[str, float]:
        """Half the width of each stroke of the arrays' lines: those of the
        lists tested so far, and of strokes only entered (:meth:`enter`),
        such as a polar plate's fine azimuths entered before any list of
        them is tested."""
        half = self._half_width
        missing = {el.stroke for el in self._arrays.elements} - half.keys()
        if not missing:
            return half
        return {**half, **{stroke: stroke_width_mm(stroke, self.dims) / 2 for stroke in missing}}

    def free(self, box: Box, protected=(), near=(), clear_mm: float = CLEAR_MM) -> bool:
        """Inside the drawing, clear of the labels, ``clear_mm`` from the
        lines ``protected`` and :data:`MARGIN_MM` from those ``near``;
        the lines ``protected`` tested first, as they turn down most
        places (#12)."""
        return (self.inside(box) and self.clear_of(box, protected, clear_mm) and self.clear_of_labels(box)
                and self.clear_of(box, near))


class Places:
    """Boxes of one size at many places (centres as ``Box`` takes them,
    angles in radians), as arrays for :meth:`Room.screen`, each made a
    :class:`Box` only when it is asked for (#12)."""

    def __init__(self, centers, angles_rad, half_w: float, half_h: float):
        self.centers, self.angles = centers, angles_rad
        self.half_w, self.half_h = half_w, half_h
        self.x = np.array([c[0] for c in centers], dtype=float)
        self.y = np.array([c[1] for c in centers], dtype=float)
        a = np.array(angles_rad, dtype=float)
        self.cos, self.sin = np.cos(a), np.sin(a)
        self._boxes: dict[int, Box] = {}

    @classmethod
    def of_arrays(cls, x, y, half_w: float, half_h: float) -> "Places":
        """Upright boxes centred on (``x``[i], ``y``[i]) (arrays), each
        box's centre those arrays' entries, made only when it is asked
        for (#12: a cardinal letter's thousands of places)."""
        out = cls.__new__(cls)
        out.centers, out.angles = None, None
        out.half_w, out.half_h = half_w, half_h
        out.x, out.y = x, y
        out.cos, out.sin = np.ones(len(x)), np.zeros(len(x))
        out._boxes = {}
        return out

    def __len__(self) -> int:
        return len(self.x)

    def box(self, i: int) -> Box:
        b = self._boxes.get(i)
        if b is None:
            if self.centers is None:   # upright, on the arrays' entries
                b = Box((self.x[i], self.y[i]), 0.0, self.half_w, self.half_h)
            else:
                b = Box(self.centers[i], self.angles[i], self.half_w, self.half_h)
            self._boxes[i] = b
        return b

    def inside(self, room: Room) -> np.ndarray:
        """:meth:`Room.inside` of every box: those far inside the rim or
        wholly beyond it decided at once, the others box by box."""
        r, radius = np.hypot(self.x, self.y), math.hypot(self.half_w, self.half_h)
        out = r + radius < room.disc - 1e-6
        band = np.nonzero(~out & ~(r - radius > room.disc + 1e-6))[0]
        if len(band):   # near the rim: the corners, where they clear it by far more than rounding
            x, y, c, s = self.x[band], self.y[band], self.cos[band], self.sin[band]
            far = np.zeros(len(band))
            for dx, dy in ((-self.half_w, -self.half_h), (self.half_w, -self.half_h),
                           (self.half_w, self.half_h), (-self.half_w, self.half_h)):
                corner = np.hypot(x + c * dx - s * dy, y + s * dx + c * dy)
                far = np.maximum(far, corner)
            out[band] = far < room.disc - 1e-6
            for i in band[(far >= room.disc - 1e-6) & (far <= room.disc + 1e-6)].tolist():
                out[i] = room.inside(self.box(i))
        return out


class Screen:
    """Whether boxes of ``places`` (those of the index array ``idx``)
    keep clear of a list of strokes (the answer of :meth:`Room.clear_of`)
    and how many of them run through each (of :meth:`Room.crossed`),
    worked out for them all at once on first use (:meth:`Room.screen`);
    a box is asked for by its position in ``idx`` (#12)."""

    def __init__(self, room: Room, places: Places, idx, elements, clear_mm: float, widths: bool = True):
        self.room, self.places, self.idx, self.elements = room, places, idx, elements
        self.clear_mm, self.widths = clear_mm, widths
        self._found = None

    def _verdicts(self, every: bool):
        if self._found is None or (every and not self._found[0]):
            self._found = (every,) + self.room.screen(self.places, self.idx, self.elements, self.clear_mm,
                                                      self.widths, every)
        return self._found

    def maybe_clear(self) -> list[int]:
        """The positions, in order, of the boxes no stroke surely meets."""
        _, met, _ = self._verdicts(False)
        return [i for i, k in enumerate(met) if k == 0]

    def clear(self, i: int) -> bool:
        """Whether box ``i`` keeps clear of the strokes (with their widths)."""
        _, met, unsure = self._verdicts(False)
        if met[i]:
            return False
        box = self.places.box(int(self.idx[i]))
        return not any(self.room.meets(el, box, by) for el, by in unsure.get(i, ()))

    def crossed(self, i: int, most: int | None = None) -> int:
        """How many strokes run through box ``i`` grown by the clearance
        (a screen without the widths), counted no further than ``most``."""
        _, met, unsure = self._verdicts(True)
        count = met[i]
        box = self.places.box(int(self.idx[i]))
        for el, by in unsure.get(i, ()):
            if most is not None and count >= most:
                break
            count += self.room.meets(el, box, by)
        return count if most is None else min(count, most)


def _runs(count: int, first: int, most: int):
    """The indices 0 to ``count`` - 1 in runs of growing length (index
    arrays): the first places tried are most often taken, later ones
    tested many at a time."""
    at, size = 0, first
    while at < count:
        yield np.arange(at, min(count, at + size))
        at += size
        size = min(2 * size, most)


def upright(angle_rad: float) -> float:
    """A text direction turned so that the text reads from below or the right."""
    return (angle_rad + math.pi / 2) % math.pi - math.pi / 2


def points_along(el, near, step_mm: float = STEP_MM, reach_mm: float = SLIDE_MM):
    """(x, y, tangent angle) of points along a stroke element, every
    ``step_mm`` up to ``reach_mm`` either way from its point nearest
    ``near``, nearest first (the +x side first at equal distance)."""
    g = el.geom
    out = []
    if el.shape in ("circle", "arc"):
        (cx, cy), r = g["center"], g["radius"]
        t0 = math.atan2(near[1] - cy, near[0] - cx)
        lo, hi = (-math.inf, math.inf) if el.shape == "circle" else \
            (math.radians(g["start_deg"]), math.radians(g["end_deg"]))
        if el.shape == "arc":
            t0 = lo + (t0 - lo) % (2 * math.pi)
            if t0 > hi:  # nearest end
                t0 = hi if (t0 - hi) < (lo + 2 * math.pi - t0) else lo
        n = int(min(reach_mm, math.pi * r) / step_mm)
        for k in range(n + 1):
            for sgn in ((1,) if k == 0 else (1, -1)):
                t = t0 + sgn * k * step_mm / r
                if lo <= t <= hi:
                    out.append((cx + r * math.cos(t), cy + r * math.sin(t), t + math.pi / 2))
        # sorted by the keys worked out in one pass (the same stable sort, #12)
        keys = [(round(math.dist((x, y), near) / step_mm), -x) for x, y, _ in out]
        return [out[k] for k in sorted(range(len(out)), key=keys.__getitem__)]
    pts = [g["from"], g["to"]] if el.shape == "segment" else list(g["points"])
    p = np.asarray(pts, dtype=float)
    seg = np.hypot(*(p[1:] - p[:-1]).T)
    s = np.concatenate([[0.0], np.cumsum(seg)])
    if s[-1] <= 0:
        return out
    # the nearest point of the line to ``near``
    best, s0 = math.inf, 0.0
    for i in range(len(p) - 1):
        d = p[i + 1] - p[i]
        ll = float(d @ d)
        t = 0.0 if ll == 0 else float(np.clip((np.asarray(near) - p[i]) @ d / ll, 0.0, 1.0))
        q = p[i] + t * d
        dd = math.dist(q, near)
        if dd < best:
            best, s0 = dd, s[i] + t * seg[i]
    n = int(reach_mm / step_mm)
    for k in range(n + 1):
        for sgn in ((1,) if k == 0 else (1, -1)):
            sk = s0 + sgn * k * step_mm
            if 0.0 <= sk <= s[-1]:
                i = min(int(np.searchsorted(s, sk, side="right")) - 1, len(p) - 2)
                t = (sk - s[i]) / seg[i] if seg[i] > 0 else 0.0
                q = p[i] + t * (p[i + 1] - p[i])
                a = math.atan2(*(p[i + 1] - p[i])[::-1])
                out.append((float(q[0]), float(q[1]), a))
    return out


def _round_centres(el):
    """The points of a small circle (or arc) round which an almucantar's
    number is sought at last, :data:`ROUND_STEP_MM` apart from its middle."""
    return points_along(el, midpoint(el), step_mm=ROUND_STEP_MM, reach_mm=1e4)


def around(point, step_mm: float, reach_mm: float, prefer=(0.0, 0.0)):
    """Points round ``point`` on a square grid ``step_mm`` apart, within
    ``reach_mm``, nearest first; at equal distance those towards the unit
    direction ``prefer`` first."""
    dx, dy = _around_offsets(step_mm, reach_mm, prefer)
    return [(point[0] + float(a), point[1] + float(b)) for a, b in zip(dx, dy)]


def _around_offsets(step_mm: float, reach_mm: float, prefer):
    """The offsets (dx, dy as arrays) of :func:`around`'s points, in its order."""
    n = int(reach_mm / step_mm)
    i, j = np.meshgrid(np.arange(-n, n + 1), np.arange(-n, n + 1))
    dx, dy = (i * step_mm).ravel(), (j * step_mm).ravel()
    d = np.hypot(dx, dy)
    keep = d <= reach_mm
    dx, dy, d = dx[keep], dy[keep], d[keep]
    order = np.lexsort((-(dx * prefer[0] + dy * prefer[1]), np.round(d / step_mm)))
    return dx[order], dy[order]


class PlateLabeller:
    """Sets the plate's labels one after another into a :class:`Room`;
    ``missing`` collects the texts of those it found no place for."""

    def __init__(self, ctx, elements, disc_mm: float, keep_out, strokes: StrokeIndex):
        self.ctx, self.w, self.d = ctx, ctx.words, ctx.dims
        self.els = list(elements)
        d = self.d
        pin = pin_cross_half_mm(d) + MARGIN_MM
        keep = [Box((0.0, 0.0), 0.0, pin, pin)] + list(keep_out)
        for el in self.els:
            if el.shape == "point":
                # with the labels' gap round it, at least MARGIN_MM clear of the mark
                r = max(0.0, max(dot_radius_mm(d), zenith_mark_half_mm(d)) + MARGIN_MM - LABEL_GAP_MM)
                keep.append(Box(el.geom["at"], 0.0, r, r))
        self.room = Room(disc_mm, d, keep, strokes)
        self.out: list[model.Element] = []
        self.missing: list[tuple[str, dict]] = []
        #: The boxes of the labels set, by role (for the numbers' and the
        #: cardinal letters' distances: :meth:`_apart_from_numbers`).
        self.boxes: dict[str, list[Box]] = {}
        #: The azimuths' numbers set on their lines continued below the
        #: horizon: (its element, its box, the horizon point, its own lines).
        self.continued: list[tuple] = []
        self.laid: list[Box] = []   # the azimuths' numbers laid along the horizon (_along_horizon)
        # The meridian and the east-west line (and the azimuths drawn along
        # them): numbers stand beside them, MARGIN_MM off.
        self.reference = [e for e in self.els if e.role in ("meridian", "east_west")
                          or (e.role == "azimuth" and on_meridian(e))]
        self.strokes = [e for e in self.els if e.shape in STROKE_SHAPES
                        and e.stroke not in ("none", "cut", "fold")]
        self.room.enter(self.strokes)

    def role(self, *roles):
        return [e for e in self.els if e.role in roles and e.stroke != "none"]

    def others(self, own=()):
        """Every drawn line but ``own`` and the reference lines: a label keeps
        :data:`CLEAR_MM` from them."""
        skip = {id(e) for e in own} | {id(e) for e in self.reference}
        return [e for e in self.strokes if id(e) not in skip]

    def put(self, role, box: Box, text, size_pt, **values) -> model.Element:
        el = model.text(role, box.center, text, size_pt, math.degrees(box.angle_rad), "middle", **values)
        self.room.taken.append(box)
        self.boxes.setdefault(role, []).append(box)
        self.out.append(el)
        return el

    def first_free(self, candidates, text, size_pt, protected, near=None, unfree: set | None = None):
        """The first free upright box centred on one of the candidate
        points (nearest first): :data:`CLEAR_MM` from the lines
        ``protected`` where one is no more than :data:`PREFER_CLEAR_MM`
        farther on, else the first that comes no nearer them than
        :data:`MARGIN_MM` (beside a line, never in a gap of it).
        ``unfree``, where given, holds candidates already found not free
        (:meth:`Room.free`, with these lines and this text, in the room as
        it is): they are not tested again, and those found now are added
        (#12: an almucantar's wider search goes over its nearer one's
        places again)."""
        near = self.reference if near is None else near
        ext = self.w.measure(text, size_pt)   # measured once for all its places
        box = Box((0.0, 0.0), 0.0, ext.width_mm / 2, ext.height_mm / 2)   # moved to each place
        start, fallback = None, None
        for c in candidates:
            start = start or c
            if fallback is not None and math.dist(c[:2], start[:2]) > fallback[1] + PREFER_CLEAR_MM:
                break
            if unfree is not None and c in unfree:
                continue
            b = box.moved((c[0], c[1]))
            if fallback is not None:   # only a place clear of the lines is of use now: that test first (#12)
                if self.room.clear_of(b, protected, CLEAR_MM):
                    if self.room.free(b, protected, near, MARGIN_MM):
                        return b
                    if unfree is not None:
                        unfree.add(c)
                continue
            if not self.room.free(b, protected, near, MARGIN_MM):
                if unfree is not None:
                    unfree.add(c)
                continue
            if self.room.clear_of(b, protected, CLEAR_MM):
                return b
            fallback = (b, math.dist(c[:2], start[:2]))
        return None if fallback is None else fallback[0]

    def left_out(self, text: str, **values):
        """Say that the label ``text`` found no place (``values`` tell which)."""
        self.missing.append((text, values))
        return None

    # -- the labels ---------------------------------------------------------------

    def cardinal(self, az_deg: float, key: str, phi: float, s: int, R: float, disc: float):
        """A cardinal letter beside the horizon's point of azimuth ``az_deg``,
        on the sky side where there is room, clear of the pin and of every
        line: within :data:`NEAR_MM` of the point, else with a leader to
        it.  A point under the pin's mark (the north or south point at low
        latitudes, #9) gets its letter within :data:`NEAR_MM` of the
        mark, and no leader: piercing the pin would cut it."""
        d = self.d
        v = horizontal_vector(np.radians([0.0, 3.0]), np.full(2, math.radians(az_deg)), phi)
        p0, p1 = project_vectors(v, s, R)
        if not (np.all(np.isfinite(p0)) and np.hypot(*p0) < disc - 2 * d.tick_mm):
            return None
        up = p1 - p0
        n = float(np.hypot(*up))
        prefer = (up / n) if n > 0 else np.zeros(2)
        text = self.w(key)
        size = d.text_pt
        ext = self.w.measure(text, size)
        pin = self.room.taken[0]
        at_pin = pin.contains(*p0)
        target = pin if at_pin else Box((float(p0[0]), float(p0[1])), 0.0, 0.0, 0.0)
        protected = self.others()
        dx, dy = _around_offsets(max(STEP_MM, ext.height_mm / 8), max(6 * ext.height_mm, 12.0), prefer)
        # The places round the point (those of around(), each centre
        # p0's coordinates plus the offsets as arrays: the same sums)
        # tested many at a time, as arrays, and those no line
        # surely meets one by one; what does not change from one pass to
        # the next is found once per place, and only where the place can
        # still be taken: at the pin, never farther than NEAR_MM (#12).
        places = Places.of_arrays(p0[0] + dx, p0[1] + dy, ext.width_mm / 2, ext.height_mm / 2)
        far = _far_from(places, target)
        room = self.room
        can = places.inside(room) & ~(far & at_pin)
        base, leads = {}, {}
        # Last, a letter over other lines (broken round it): a pupil must
        # always find the four points (#9).
        for k, b in self._free_places(places, can, ((protected, CLEAR_MM), (protected, MARGIN_MM), ((), MARGIN_MM))):
            ok = base.get(k)
            if ok is None:
                ok = base[k] = room.clear_of_labels(b) and room.clear_of(b, self.reference)
            if not ok:
                continue
            if far[k]:
                if k not in leads:
                    leads[k] = self._leader(b, p0)
                lead = leads[k]
                if lead is None:
                    continue
                self.out.append(model.segment("cardinal_leader", *lead, "fine", azimuth_deg=az_deg))
            return self.put("cardinal", b, text, size, azimuth_deg=az_deg)
        return self.left_out(text)

    def _free_places(self, places: "Places", can, levels, first: int = 64):
        """(index, box) of each place of ``places`` where ``can``, in order,
        clear of the lines of each (lines, clearance in mm) of ``levels`` in
        turn: screened many at a time, as arrays (:class:`Screen`, #12)."""
        for lines, clear in levels:
            for run in _runs(len(places), first, 1024):
                idx = run[can[run]]
                screen = Screen(self.room, places, idx, lines, clear)
                for i in screen.maybe_clear():
                    if screen.clear(i):
                        k = int(idx[i])
                        yield k, places.box(k)

    def _leader(self, b: Box, p0):
        """The ends of a fine line from the label's box to the point ``p0``,
        stopping MARGIN_MM short of both, where it crosses no line and no
        label; else None.  Its lane is tested from its start (kept
        MARGIN_MM from every line, so that no line runs between it and the
        box either) to 0.6 mm short of its end, where the point's own
        lines meet it."""
        q = _box_nearest(b, p0)
        dx, dy = p0[0] - q[0], p0[1] - q[1]
        L = math.hypot(dx, dy)
        ux, uy = dx / L, dy / L
        a = (q[0] + ux * MARGIN_MM, q[1] + uy * MARGIN_MM)
        z = (p0[0] - ux * MARGIN_MM, p0[1] - uy * MARGIN_MM)
        if L - 2 * MARGIN_MM <= 0.6:
            return None
        lane = _lane(a, (z[0] - ux * 0.6, z[1] - uy * 0.6), 0.05)
        if not self.room.clear_of(lane, self.strokes) or not self.room.clear_of_labels(lane):
            return None
        return a, z

    def almucantar(self, alt: float, number_everywhere: bool):
        """An almucantar's number: where it crosses the meridian (both
        sides of the zenith); else where it meets the east-west line; else
        at its ends on the rim; clear of every other line.  A multiple of
        5 (``number_everywhere`` false) only on the meridian."""
        els = [e for e in self.role("almucantar", "horizon") if abs(e.values["altitude_deg"] - alt) < 1e-9]
        if not els:
            return []
        text, size = self.w.number(alt), self.d.small_text_pt
        protected = self.others(els)
        # Near the zenith the azimuths close in on the meridian: there a
        # ten's number beside the meridian crosses the azimuths it must
        # (they are broken round it), never another kind of line (common
        # practice).
        grid = [e for e in protected if e.role != "azimuth"]
        # Where the circles crowd (round the pin or the zenith of a small
        # plate, or an equatorial plate's north side) it may at last cross
        # its unnumbered neighbours too, never a named line.
        named = [e for e in grid if e.role != "almucantar" or self._numbered(e.values["altitude_deg"])]
        tries = [(NEAR_SLIDE_MM, protected), (NEAR_SLIDE_MM, grid), (SLIDE_MM, protected), (SLIDE_MM, grid),
                 (NEAR_SLIDE_MM, named), (SLIDE_MM, named)] if number_everywhere else [(SLIDE_MM, protected)]
        placed = []
        ext = self.w.measure(text, size)
        for el, a in self._almucantar_anchors(els, number_everywhere):
            b = None
            # (not level with a cardinal letter: "10 O", the French west beside a 10, read as 100)
            along = {reach: self._apart_from_cardinals(points_along(el, a, reach_mm=reach), ext.width_mm / 2,
                                                       ext.height_mm / 2)
                     for reach in {reach for reach, _ in tries}}
            unfree: dict[int, set] = {}   # by list of lines: the places found not free (a farther reach repeats them)
            for reach, lines in tries:
                b = b or self.first_free(along[reach], text, size, lines, unfree=unfree.setdefault(id(lines), set()))
            if b is not None:
                placed.append(self.put("almucantar_label", b, text, size, altitude_deg=float(alt)))
        if placed or not number_everywhere:
            return placed
        # Last, a number that crosses named lines too (they are broken round
        # it) rather than a circle left off the plate: a reading needs the
        # circle more than the lines need their gap (#9).
        small = [el for el in els if el.geom.get("radius", math.inf) <= 4 * self.d.tick_mm + 5.0]
        # Each list of lines holds the next one's, so a search finds a
        # place only where the one of the named lines alone may: where
        # that one surely finds none, the searches before the last are
        # not made, as none of them would find a place (#12).
        levels = (protected, grid, named, ())
        if not self._may_find(els, small, text, size, named):
            levels = ((),)
        for lines in levels:
            # anywhere along the circle where it is clear, then beside a small one
            for el in els:
                b = self.first_free(points_along(el, midpoint(el), reach_mm=1e4), text, size, lines)
                if b is not None:
                    return [self.put("almucantar_label", b, text, size, altitude_deg=float(alt))]
            for el in small:
                centres = _round_centres(el)
                for c, can in zip(centres, self._may_be_free(centres, text, size, lines)):
                    if not can:   # every place round it surely meets a line: first_free finds none
                        continue
                    b = self.first_free([(x, y, 0.0) for x, y in around(c, STEP_MM, ROUND_REACH_MM)], text, size,
                                        lines)
                    if b is not None:
                        return [self.put("almucantar_label", b, text, size, altitude_deg=float(alt))]
        self.left_out(text, altitude_deg=float(alt))
        return []

    def _may_find(self, els, small, text, size_pt, lines) -> bool:
        """Whether :meth:`almucantar`'s last search with ``lines`` may find
        a place: along a piece of the circle (``els``), or round a point
        of a small one (``small``) where some place is not surely met."""
        if any(self.first_free(points_along(el, midpoint(el), reach_mm=1e4), text, size_pt, lines) is not None
               for el in els):
            return True
        return any(any(self._may_be_free(_round_centres(el), text, size_pt, lines)) for el in small)

    def _may_be_free(self, centres, text, size_pt, protected):
        """For each centre (x, y, ...) in turn, whether any of the places
        round it (:func:`around`, out to :data:`ROUND_REACH_MM`) may be
        free as :meth:`first_free` asks (inside the drawing,
        :data:`MARGIN_MM` from the lines ``protected`` and from the
        reference lines): False where every one surely is
        not, found for a few centres' places at once, as arrays
        (:class:`Screen`); a centre's places are then not tried one by
        one, which would find none (#12: the 80 degree circle of a
        crowded A5 plate, tried all round, had cost a tenth of a second)."""
        ext = self.w.measure(text, size_pt)
        dx, dy = _around_offsets(STEP_MM, ROUND_REACH_MM, (0.0, 0.0))
        for at in range(0, len(centres), MAY_BE_FREE_CENTRES):
            some = centres[at:at + MAY_BE_FREE_CENTRES]
            cx = np.array([c[0] for c in some], dtype=float)
            cy = np.array([c[1] for c in some], dtype=float)
            places = Places.of_arrays((cx[:, None] + dx).ravel(), (cy[:, None] + dy).ravel(),
                                      ext.width_mm / 2, ext.height_mm / 2)
            may = places.inside(self.room)
            for lines in (protected, self.reference):
                idx = np.flatnonzero(may)
                screen = Screen(self.room, places, idx, lines, MARGIN_MM)
                may = np.zeros(len(places), dtype=bool)
                may[idx[screen.maybe_clear()]] = True
            yield from may.reshape(len(some), len(dx)).any(axis=1).tolist()

    def _numbered(self, alt: float) -> bool:
        """Whether the almucantar ``alt`` is one the plate numbers."""
        return any(abs(alt - a) < 1e-9 for a in self.ctx.scales.almucantar_labels_deg)

    def example_almucantar(self, alt_deg: float, hour_angle_rad: float, dec_rad: float, s: int, R: float):
        """The almucantar a worked example of the instructions reads
        (``alt_deg``, where a body of declination ``dec_rad`` stands at
        ``hour_angle_rad``) numbered near where the body stands on it,
        where no number of that circle stands within
        :data:`EXAMPLE_NEAR_RADII` of its radius from there: the pupil
        following the example finds the circle by its number where the star
        or the Sun is (#12 review: a Greek A5 plate numbered its 30 deg
        circle on the north side alone, where the star example set Rigel on
        it west of the meridian).  Tried along the circle from that point
        (but :data:`EXAMPLE_CLEAR_MM` off it), clear of every line, then
        across the azimuths, then across unnumbered almucantars, as the
        circle's own numbers; else nothing more (the example still holds:
        the circle is numbered elsewhere)."""
        els = [e for e in self.role("almucantar") if abs(e.values["altitude_deg"] - alt_deg) < 1e-9]
        p = project(hour_angle_rad, dec_rad, s, R)
        if not els or not np.all(np.isfinite(p)) or math.hypot(*p) >= self.room.disc:
            return None
        near = EXAMPLE_NEAR_RADII * min(e.geom.get("radius", math.inf) for e in els)
        if any(e.role == "almucantar_label" and abs(e.values["altitude_deg"] - alt_deg) < 1e-9
               and math.dist(e.geom["at"], p) < near for e in self.out):
            return None
        text, size = self.w.number(alt_deg), self.d.small_text_pt
        protected = self.others(els)
        grid = [e for e in protected if e.role != "azimuth"]
        named = [e for e in grid if e.role != "almucantar" or self._numbered(e.values["altitude_deg"])]
        ext = self.w.measure(text, size)
        body = Box((float(p[0]), float(p[1])), 0.0, 0.0, 0.0)
        # (not under the body's own place, where the rete's dot of the star, or the Sun's point, then lies)
        along = [c for el in els for c in points_along(el, p, reach_mm=near)
                 if _boxes_gap(Box((c[0], c[1]), 0.0, ext.width_mm / 2, ext.height_mm / 2), body) >= EXAMPLE_CLEAR_MM]
        # (nearest first; at equal distances, to the last rounding, in points_along's own order)
        along.sort(key=lambda c: round(math.dist(c[:2], p), 9))
        for lines in (protected, grid, named):
            b = self.first_free(along, text, size, lines)
            if b is not None:
                return self.put("almucantar_label", b, text, size, altitude_deg=float(alt_deg))
        return None

    def _almucantar_anchors(self, els, everywhere):
        """Where a circle's numbers go, as (element, point): its meridian
        crossings inside the drawing and, for a multiple of 10 that crosses
        the meridian outside it, also where it meets the east-west line
        or, if it does not inside the drawing, its ends on the rim."""
        disc = self.room.disc
        meridian, east_west, ends = [], [], []
        for el in els:
            if el.shape not in ("circle", "arc"):
                continue
            (cx, cy), r = el.geom["center"], el.geom["radius"]
            for vertical, group in ((True, meridian), (False, east_west)):
                for q in _circle_meets_line(cx, cy, r, vertical):
                    if math.hypot(*q) < disc and _on_element(el, q):
                        group.append((el, q))
            if el.shape == "arc":
                for t in (el.geom["start_deg"], el.geom["end_deg"]):
                    t = math.radians(t)
                    ends.append((el, (cx + r * math.cos(t), cy + r * math.sin(t))))
        if not everywhere or len(meridian) >= 2:
            return meridian
        return meridian + (east_west or ends)

    def azimuth(self, az: float, phi: float, s: int, R: float):
        """An azimuth's number on its line continued below the horizon (on
        the line itself just above the horizon where a tropic runs there),
        or, where the horizon's point is outside the drawing, at its end on
        the rim, else (an owed number) beside it with a leader, else just
        beyond that end (:meth:`_beyond_rim`); clear of every other line.  It carries a degree sign
        ("90°"), which an almucantar's plain number never does, so the two
        cannot be taken for each other (the template's
        ``plate.azimuth_number``).  Places :data:`BELOW_APART_MM` from the
        almucantars' and hours' numbers come first.  Returns None where it
        has no room (an azimuth of no multiple of 30 degrees may go
        unnumbered, and does where its only places stand nearer another
        number than that: the curve is numbered on the plate wherever its
        neighbours are)."""
        text, size = self.w("plate.azimuth_number", value=self.w.number(az)), self.d.small_text_pt
        A = math.radians(az)
        own = [e for e in self.role("azimuth") if abs(e.values["azimuth_deg"] - az) < 1e-9]
        protected = self.others(own)
        owed = multiple_of(az, 30.0)
        ext = self.w.measure(text, size)
        p0 = project_vectors(horizontal_vector(0.0, A, phi), s, R)
        if np.all(np.isfinite(p0)) and np.hypot(*p0) < self.room.disc:
            alts = np.radians(-np.arange(0.2, 30.0, 0.2))
            pts = project_vectors(horizontal_vector(alts, np.full_like(alts, A), phi), s, R)
            # the points near enough found as arrays (with room for rounding), then tested one by one (#12)
            near = np.all(np.isfinite(pts), axis=1) & (np.hypot(*(pts - p0).T) < SLIDE_MM + 1e-6)
            p0_xy = p0.tolist()
            cands = [(x, y, 0.0) for x, y in pts[near].tolist() if math.dist((x, y), p0_xy) < SLIDE_MM]
            # below the horizon, else on its own line just above it (broken
            # round it); an optional number only apart from the other numbers
            # (a number owed takes its first free place, as near its point as it can stand)
            # (an optional number not level with a cardinal letter: "15° N" reads as a latitude)
            near_cands = [c for c in cands if math.dist(c[:2], p0_xy) < CONTINUED_MM]
            if not owed:
                near_cands = self._apart_from_cardinals(near_cands, ext.width_mm / 2, ext.height_mm / 2)
            b, apart = self._first_free_apart(near_cands, text, size, protected, p0, not owed)
            if b is not None and (apart or owed):
                return self._continued(b, text, size, az, p0, own)
            on_line = [c for el in own for c in points_along(el, p0)]
            if not owed:
                on_line = self._apart_from_cardinals(on_line, ext.width_mm / 2, ext.height_mm / 2)
            b, apart = self._first_free_apart(on_line, text, size, protected, p0, not owed)
            if b is not None and (apart or owed):
                return self.put("azimuth_label", b, text, size, azimuth_deg=float(az))
            if owed:
                # Owed a number: laid along the horizon on its own line, else
                # farther on the line's continuation, else beside its
                # horizon point with a leader to it (near the equator the
                # azimuths meet the horizon close together among the
                # tropics, and on an A5 plate among the almucantars, where
                # no number fits on a line).
                got = self._along_horizon(p0, A, phi, s, R, own, protected, text, size, ext, az)
                if got is not None:
                    return got
                b = self.first_free([c for c in cands if math.dist(c[:2], p0_xy) >= CONTINUED_MM], text, size,
                                    protected)
                if b is not None:
                    return self._continued(b, text, size, az, p0, own)
                return self._led_number(p0, text, size, az, own) or self.left_out(text)
            return None
        rim_ends = [(el, end) for el in own for end in _ends(el)
                    if abs(math.hypot(*end) - (self.room.disc + MARGIN_MM)) < 1e-3]
        for apart in (True, False):   # apart from the other numbers there first, else as near as it must
            for el, end in rim_ends:
                cands = points_along(el, end, reach_mm=2 * SLIDE_MM)
                if apart and cands:
                    keep = self._apart_from_numbers([c[0] for c in cands], [c[1] for c in cands],
                                                    ext.width_mm / 2, ext.height_mm / 2)
                    cands = [c for c, k in zip(cands, keep) if k]
                b = self.first_free(cands, text, size, protected)
                if b is not None:
                    return self.put("azimuth_label", b, text, size, azimuth_deg=float(az))
        if rim_ends and owed:   # owed a number: beside its end, with a leader
            el = self._led_number(rim_ends[0][1], text, size, az, own)
            if el is not None:
                return el
        for _, end in rim_ends:   # else just beyond its end, between the rim and the plate's edge
            b = self._beyond_rim(end, ext, not owed)
            if b is not None:
                return self.put("azimuth_label", b, text, size, azimuth_deg=float(az))
        return self._azimuth_missing(az, text)

    def _continued(self, b: Box, text: str, size_pt: float, az: float, p0, own):
        """Put an azimuth's number at ``b`` on its line continued below the
        horizon (``p0``, its point there; ``own``, its line's pieces)."""
        el = self.put("azimuth_label", b, text, size_pt, azimuth_deg=float(az))
        self.continued.append((el, b, p0, own))
        return el

    def _along_horizon(self, p0, A: float, phi: float, s: int, R: float, own, protected, text: str,
                       size_pt: float, ext, az: float):
        """An owed azimuth's number set along the horizon just above its
        horizon point ``p0``, on its own line (broken round it), in the band
        between the horizon and the first almucantar, else just below it on
        the line continued, turned to read upright:
        where the horizon runs steeply among crowded lines an upright number
        finds no room, but a band, about 2 mm wide, holds one laid along it
        (#12: on A5 plates at 45 to 52 N the 120 and 240 deg numbers, their
        points near the rim among the horizon's, the almucantars' and the
        hour lines' ends, had been left out).  ``A``, ``phi``: the azimuth
        and latitude (radians); ``s``, ``R`` as for the projection; ``ext``
        the number's measure.  None where the band has no room."""
        step = 1e-3
        a, b = (project_vectors(horizontal_vector(0.0, A + d, phi), s, R) for d in (-step, step))
        turn = upright(math.atan2(b[1] - a[1], b[0] - a[0]))
        box = Box((0.0, 0.0), turn, ext.width_mm / 2, ext.height_mm / 2)
        # above the horizon on its line, else just below it on the line continued
        alts = np.radians(-np.arange(0.05, 10.0, 0.05))
        below = project_vectors(horizontal_vector(alts, np.full_like(alts, A), phi), s, R).tolist()
        cands = [(x, y) for el in own for x, y, _ in points_along(el, p0, STEP_MM / 2, ALONG_HORIZON_MM)] \
            + [(x, y) for x, y in below if math.dist((x, y), p0) <= ALONG_HORIZON_MM]
        for x, y in cands:
            placed = box.moved((x, y))
            if self.room.inside(placed) and self.room.clear_of_labels(placed) \
                    and self.room.clear_of(placed, protected):
                self.laid.append(placed)
                return self.put("azimuth_label", placed, text, size_pt, azimuth_deg=float(az))
        return None

    def _beyond_rim(self, end, ext, apart: bool) -> Box | None:
        """A box for a number of extent ``ext`` in the ring between the
        drawing's rim and the plate's cut, just beyond the point ``end``
        where a line meets the rim: set along the rim (its foot towards the
        centre, turned to read upright), :data:`MARGIN_MM` clear of the rim
        and of every other line, :data:`RIM_CUT_CLEAR_MM` of the cut's ink,
        free of the labels, and slid
        along the ring (:data:`RIM_SLIDES_MM`) where the place right
        beyond the end is taken.  With ``apart`` (a number between the
        thirties) only a place :data:`BELOW_APART_MM` from the other
        numbers (:meth:`_apart_from_numbers`, by the turned box's upright
        bounds).  None where the ring is too narrow or no place is free.
        (#12 review: on an A5 plate at 45 deg N the azimuths 120 to 240
        deg end on the rim among the almucantars' numbers, where no
        number fits on a line.)  Lengths in mm, angles in radians."""
        d = self.d
        rim_mm = self.room.disc + MARGIN_MM
        inner = rim_mm + self._rim_half_width() + MARGIN_MM + 1e-3
        outer = d.plate_radius_mm - stroke_width_mm("cut", d) / 2 - RIM_CUT_CLEAR_MM
        hw, hh = ext.width_mm / 2, ext.height_mm / 2
        rc = inner + hh
        if math.hypot(rc + hh, hw) > outer:
            return None
        t0 = math.atan2(end[1], end[0])
        for along in RIM_SLIDES_MM:
            t = t0 + along / rc
            turn = t - math.pi / 2
            if turn <= -math.pi / 2:   # the lower half: turned half round to read upright
                turn += math.pi
            b = Box((rc * math.cos(t), rc * math.sin(t)), turn, hw, hh)
            if apart and not self._apart_from_numbers([b.center[0]], [b.center[1]],
                                                      *_upright_halves(b.cos, b.sin, hw, hh),
                                                      BELOW_APART_MM, STACKED_APART_MM)[0]:
                continue
            if self.room.clear_of_labels(b) and self.room.clear_of(b, self.strokes):
                return b
        return None

    def _rim_half_width(self) -> float:
        """Half the widest line drawn on the plate (mm): any of them may
        end on the rim beside a number set beyond it (the horizon, the
        heaviest, does at high latitudes)."""
        return max(stroke_width_mm(stroke, self.d) / 2 for stroke in {e.stroke for e in self.strokes})

    def _first_free_apart(self, cands, text: str, size_pt: float, protected, p0, seek: bool = True):
        """(box, apart) of the first free of the upright places ``cands``
        (x, y, angle) along a line from its point ``p0``, ``apart`` where
        it keeps :data:`BELOW_APART_MM` (:data:`STACKED_APART_MM` right
        over or under) from the almucantars' and unequal hours' numbers;
        where it does not, with ``seek`` the first free place that does at
        most :data:`APART_SLIDE_MM` farther from ``p0``, else that first
        place (``apart`` False); (None, False) where none is free."""
        unfree: set = set()   # (the places found not free, not tested again)
        b = self.first_free(cands, text, size_pt, protected, unfree=unfree) if cands else None
        if b is None:
            return None, False
        apart = bool(self._apart_from_numbers([b.center[0]], [b.center[1]], b.half_w, b.half_h, BELOW_APART_MM,
                                              STACKED_APART_MM)[0])
        if apart or not seek:
            return b, apart
        keep = self._apart_from_numbers([c[0] for c in cands], [c[1] for c in cands], b.half_w, b.half_h,
                                        BELOW_APART_MM, STACKED_APART_MM)
        reach = math.dist(b.center, p0) + APART_SLIDE_MM
        near = [c for c, k in zip(cands, keep) if k and math.dist(c[:2], p0) <= reach]
        got = self.first_free(near, text, size_pt, protected, unfree=unfree) if near else None
        return (got, True) if got is not None else (b, False)

    def _apart_from_numbers(self, x, y, half_w, half_h, apart_mm: float = STACK_APART_MM, over_mm: float = 0.0,
                            roles=("almucantar_label", "unequal_hour_label")) -> np.ndarray:
        """Whether each upright box centred at (``x[i]``, ``y[i]``) with
        half sizes ``half_w`` and ``half_h`` (mm; numbers, or arrays along
        ``x``) keeps ``apart_mm`` from every number of ``roles`` set so far
        (their boxes taken upright), and ``over_mm`` where it stands right
        over or under one (their widths overlapping), all at once."""
        x, y = np.asarray(x, dtype=float), np.asarray(y, dtype=float)
        out = np.ones(len(x), dtype=bool)
        for t in (t for role in roles for t in self.boxes.get(role, [])):
            dx = np.maximum(np.abs(x - t.center[0]) - half_w - t.half_w, 0.0)
            dy = np.maximum(np.abs(y - t.center[1]) - half_h - t.half_h, 0.0)
            out &= (np.hypot(dx, dy) >= apart_mm) & ((dx > 0.0) | (dy >= over_mm))
        return out

    def lead_the_hidden(self) -> None:
        """Each number owed (a multiple of 30 degrees) that stands on its
        line continued with another line between it and its horizon point,
        where it would read as that line's (#12's teacher-style review: a
        30 deg number 6 mm below its point, past the twilight line), moved
        beside the point with a leader where one can be drawn
        (:meth:`_led_number`, its own place given back first); else left
        where it is."""
        for el, b, p0, own in self.continued:
            az = el.values["azimuth_deg"]
            if not multiple_of(az, 30.0) or self._in_sight(b, p0, self.others(own) + self.reference):
                continue
            self.out = [e for e in self.out if e is not el]
            self.room.give_back(b)
            if self._led_number(p0, el.geom["text"], el.geom["size_pt"], az, own) is None:
                self.room.taken.append(b)
                self.out.append(el)

    def _in_sight(self, b: Box, p0, lines) -> bool:
        """Whether no line of ``lines`` runs between the box and the point
        ``p0``: through the straight lane from the point to the box's
        nearest point, MARGIN_MM short of both."""
        q = _box_nearest(b, p0)
        length = math.dist(q, p0)
        if length <= 2 * MARGIN_MM + 0.1:
            return True
        ux, uy = (q[0] - p0[0]) / length, (q[1] - p0[1]) / length
        lane = _lane((p0[0] + ux * MARGIN_MM, p0[1] + uy * MARGIN_MM),
                     (q[0] - ux * MARGIN_MM, q[1] - uy * MARGIN_MM), 0.05)
        return self.room.clear_of(lane, lines, 0.0)

    def _led_number(self, p0, text: str, size_pt: float, az: float, own):
        """An azimuth's number the nearest it can stand to its horizon
        point ``p0`` (out to :data:`LED_REACH_MM`), clear of every line and
        label, with a fine leader that crosses none (:meth:`_leader`), no
        shorter than a line's least piece (``breaks.MIN_PIECE_MM``) and no
        longer than :data:`LED_MOST_MM`, to
        that point or else to its own line ``own`` (its pieces) within
        :data:`LED_ALONG_MM` of it; else None."""
        targets = [p0] + [(x, y) for el in own for x, y, _ in points_along(el, p0, 1.0, LED_ALONG_MM)]
        # (not where a label stands: its line is broken round it, and the leader would point at nothing)
        targets = [t for t in targets if self.room.clear_of_labels(Box((float(t[0]), float(t[1])), 0.0,
                                                                       MARGIN_MM, MARGIN_MM))]
        if not targets:
            return None
        ext = self.w.measure(text, size_pt)
        dx, dy = _around_offsets(2 * STEP_MM, LED_REACH_MM, np.zeros(2))
        places = Places.of_arrays(p0[0] + dx, p0[1] + dy, ext.width_mm / 2, ext.height_mm / 2)
        room = self.room
        # only the lines that come within the places' reach (with their boxes and clearances) of the point
        reach = LED_REACH_MM + math.hypot(ext.width_mm, ext.height_mm) / 2 + CLEAR_MM + 1.0
        lines = [el for el in self.others() if _comes_within(el, p0, reach)]
        # the places some leader's length suits (from an upright box's nearest point to a target), found at once
        t = np.asarray(targets, dtype=float)
        gap = np.hypot(np.maximum(np.abs(t[None, :, 0] - places.x[:, None]) - places.half_w, 0.0),
                       np.maximum(np.abs(t[None, :, 1] - places.y[:, None]) - places.half_h, 0.0)) - 2 * MARGIN_MM
        suits = np.any((gap >= MIN_PIECE_MM - 1e-9) & (gap <= LED_MOST_MM + 1e-9), axis=1)
        for _, b in self._free_places(places, places.inside(room) & suits, ((lines, CLEAR_MM), (lines, MARGIN_MM)),
                                      1024):
            if not (room.clear_of_labels(b) and room.clear_of(b, self.reference)):
                continue
            lead = None
            for target in targets:
                # (a leader shorter than a line's least piece reads as a
                # stray tick, a long one is hard to follow: its length, known
                # before its lane is tested, rules it out first)
                if not MIN_PIECE_MM <= math.dist(_box_nearest(b, target), target) - 2 * MARGIN_MM <= LED_MOST_MM:
                    continue
                lead = self._leader(b, target)
                if lead is not None and _steep(lead):
                    break
                lead = None
            if lead is not None:
                # the leader's ink, and its line where it points, kept clear of the labels set after it
                room.taken.append(_lane(lead[0], target, stroke_width_mm("fine", self.d) / 2))
                self.out.append(model.segment("azimuth_leader", *lead, "fine", azimuth_deg=float(az)))
                return self.put("azimuth_label", b, text, size_pt, azimuth_deg=float(az))
        return None

    def _azimuth_missing(self, az: float, text: str):
        # Only the multiples of 30 degrees are owed a number (the others
        # are numbered where there is room, as the almucantars' fives).
        if multiple_of(az, 30.0):
            self.left_out(text)
        return None

    def unequal_hour(self, k: int, phi: float, s: int, R: float, eps: float):
        """Hour ``k`` numbered between lines k - 1 and k (the horizon
        being lines 0 and 12), upright, at the declination where it fits
        clear of every line, nearest the middle of the band between the
        equator and the outer tropic."""
        text, size = self.w.number(k), self.d.small_text_pt
        decs = np.radians(np.linspace(-math.degrees(eps), math.degrees(eps), 97))
        x = -np.tan(phi) * np.tan(decs)
        ok = np.abs(x) < 1.0
        if ok.sum() < 2:
            return None
        decs, h0 = decs[ok], np.arccos(x[ok])
        want = -s * eps / 2
        order = np.argsort(np.abs(decs - want))
        ext = self.w.measure(text, size)
        order = order.tolist()
        for share in HOUR_SHARES:
            ha = h0 + (k - 1.0 + share) * (2 * np.pi - 2 * h0) / 12.0
            pts = project_vectors(equatorial_vector(ha, decs), s, R)
            finite, rows = np.all(np.isfinite(pts), axis=1).tolist(), pts.tolist()   # read as arrays once (#12)
            cands = [(rows[i][0], rows[i][1], 0.0) for i in order if finite[i]]
            cands = self._apart_from_cardinals(cands, ext.width_mm / 2, ext.height_mm / 2)
            b = self.first_free(cands, text, size, self.others())
            if b is not None:
                return self.put("unequal_hour_label", b, text, size, hour=k)
        return self.left_out(text)

    def _apart_from_cardinals(self, cands, half_w: float, half_h: float) -> list:
        """The candidates (x, y, ...) where an upright box of these half
        sizes keeps :data:`CARDINAL_APART_MM` along its row from every
        cardinal letter level with it (their heights overlapping): a
        number's, whether an hour's, an almucantar's or an azimuth's."""
        letters = self.boxes.get("cardinal", [])
        return [c for c in cands
                if not any(abs(c[1] - t.center[1]) < half_h + t.half_h
                           and abs(c[0] - t.center[0]) - half_w - t.half_w < CARDINAL_APART_MM for t in letters)]

    def curve_name(self, role: str, text: str, short: str | None = None, apart: bool = False, **match):
        """A curve's name set along it (the curve broken round it), clear
        of every other line; where it cannot be, beside it, on either side
        (the outer tropic is the drawing's edge); where the name finds no
        place, its ``short`` form so (a twilight line's altitude alone,
        "−6°": #12 review, on an A5 plate with the three twilight lines
        none of their names had room among the close arcs), first where it
        keeps :data:`BELOW_APART_MM` from the numbers (``apart``: a bare
        "−6°" 1 mm over "330°" read as one stack)."""
        els = [e for e in self.role(role) if all(abs(e.values[k] - v) < 1e-6 for k, v in match.items())]
        if not els:
            return None
        size = self.d.small_text_pt
        protected = self.others(els)
        ext = self.w.measure(text, size)
        aside = ext.height_mm / 2 + MARGIN_MM + stroke_width_mm(els[0].stroke, self.d) / 2 + 0.05
        radius = min((e.geom["radius"] for e in els if "radius" in e.geom), default=math.inf)
        bulge = 1.2 * (ext.width_mm / 2) ** 2 / (2 * radius) + 0.05  # a straight line's rise off its arc
        # Beside the curve: a straight name tangent to a circle at its
        # middle clears it on the outside at ``aside`` (its ends draw
        # away), and inside only if its middle stands the bulge farther
        # off (a chord's ends reach the circle first).  Positive offsets
        # lie towards the circle's centre (points_along's tangent turned
        # left).  Outside a circle, the bulge farther only left the name
        # floating between two named lines (#12 review: "Tropic of
        # Cancer" halfway to the equator on an 85 mm plate).
        round_ = all(e.shape in ("circle", "arc") for e in els)
        beside = (-aside, aside, aside + bulge) if round_ else (-aside, aside, -aside - bulge, aside + bulge)
        # Where no place is clear of every line, a name along its curve
        # crosses the fewest of the thin lines that run across the curve
        # (almucantars, azimuths, unequal hours: lines it must cross, broken
        # round it), never another named line.
        named = [e for e in protected if e.role in ("horizon", "equator", "tropic", "twilight")]
        thin = [e for e in protected if e.role not in ("horizon", "equator", "tropic", "twilight")]
        best, room = None, self.room
        # the points along each piece of the curve, and the names' turns there, the same at every offset
        paths = []
        for el in els:
            cands = points_along(el, midpoint(el), step_mm=max(1.0, ext.height_mm / 3), reach_mm=4 * room.disc)
            paths.append((cands, [upright(a) for _, _, a in cands]))
        # On the curve, then beside it at four offsets (one list of places
        # for those four, tried in the same order, so that they are
        # screened in fewer and longer runs, #12); CLEAR_MM from the other
        # named lines, and only where no such place is found MARGIN_MM
        # beside them, as any label may stand beside a line (a name where
        # named lines cross, as a twilight line's near a tropic on a small
        # plate, #9).
        for named_clear in (CLEAR_MM, MARGIN_MM):
            for offsets in ((0.0,), beside):
                near = self.reference + (els if offsets[0] else [])   # one list for all places: its index is kept
                centers, angles = [], []
                for offset in offsets:
                    for cands, turns in paths:
                        centers += [(x - math.sin(a) * offset, y + math.cos(a) * offset) for x, y, a in cands]
                        angles += turns
                places = Places(centers, angles, ext.width_mm / 2, ext.height_mm / 2)
                can = places.inside(room)
                if apart:
                    can &= self._apart_turned(places, BELOW_APART_MM)
                for b in self.laid:   # (a name and a number along one curve read as one label)
                    can &= np.hypot(places.x - b.center[0], places.y - b.center[1]) - places.half_w - b.half_w \
                        >= LAID_APART_MM
                for run in _runs(len(places), 32, 512):
                    idx = run[can[run]]
                    b, best = self._name_place(places, idx, (near, protected, named, thin), best, named_clear)
                    if b is not None:
                        return self.put("curve_label", b, text, size, curve=role, **match)
            if best is not None:
                break
        if best is not None:
            return self.put("curve_label", best[1], text, size, curve=role, **match)
        if short is not None:
            got = self.curve_name(role, short, apart=True, **match) or self.curve_name(role, short, **match)
            self.missing = [m for m in self.missing if m[0] != short]   # (the notes name the line by its name)
            if got is not None:
                return got
        return self.left_out(text)

    def _apart_turned(self, places: "Places", apart_mm: float) -> np.ndarray:
        """Whether each box of ``places`` (turned: its upright bounds)
        keeps ``apart_mm`` from every number set so far (almucantars',
        unequal hours' and azimuths': :meth:`_apart_from_numbers`)."""
        return self._apart_from_numbers(places.x, places.y,
                                        *_upright_halves(places.cos, places.sin, places.half_w, places.half_h),
                                        apart_mm, roles=("almucantar_label", "unequal_hour_label", "azimuth_label"))


    def _name_place(self, places: Places, idx, lines, best, named_clear: float = CLEAR_MM):
        """Of :meth:`curve_name`'s places ``idx`` (an index array of
        ``places``), the first MARGIN_MM from the lines ``near``, clear of
        the labels, ``named_clear`` from the named lines and :data:`CLEAR_MM`
        from the lines ``protected``
        (``lines`` is (near, protected, named, thin)), as (its box,
        ``best``); else (None, ``best`` bettered by those of the places
        ``named_clear`` from the named lines: the fewest thin lines through a
        box grown by MARGIN_MM + 0.3, and the first with so few).  The
        tests of :meth:`Room.free`, many places at once: each list's
        screen made only for the places that the ones before let through
        (#12)."""
        near, protected, named, thin = lines
        room = self.room
        # a place clear of every line is clear of the named ones
        beside = Screen(room, places, idx, named, named_clear)
        maybe = np.array(beside.maybe_clear(), dtype=int)
        by_near = Screen(room, places, idx[maybe], near, MARGIN_MM)
        fit = [int(maybe[q]) for q in by_near.maybe_clear()
               if by_near.clear(q) and room.clear_of_labels(places.box(int(idx[maybe[q]])))]
        aside = [i for i in fit if beside.clear(i)]
        crossing = Screen(room, places, idx[aside], thin, MARGIN_MM + 0.3, widths=False)
        # A place clear of every line is clear of the named ones (in
        # ``aside``), and of the thin ones by far more than the crossing
        # test's MARGIN_MM + 0.3: only the places no thin line crosses may
        # be clear, and only those are screened for it (#12: a name with
        # no clear place anywhere, an equator's, had every run screened).
        open_ = [i for p, i in enumerate(aside) if crossing.crossed(p, 1) == 0]
        clear = Screen(room, places, idx[open_], protected, CLEAR_MM)
        for p, i in enumerate(open_):
            if clear.clear(p):
                return places.box(int(idx[i])), best
        if best is not None and best[0] == 0:
            return None, best
        for p, i in enumerate(aside):
            cost = crossing.crossed(p, best[0] if best is not None else None)
            if best is None or cost < best[0]:
                best = (cost, places.box(int(idx[i])))
                if cost == 0:
                    break
        return None, best


def _boxes_gap(b: Box, t: Box) -> float:
    """The gap (mm) between an upright box and an upright box or point."""
    dx = abs(b.center[0] - t.center[0]) - b.half_w - t.half_w
    dy = abs(b.center[1] - t.center[1]) - b.half_h - t.half_h
    return math.hypot(max(dx, 0.0), max(dy, 0.0))


def _far_from(places: Places, target: Box) -> np.ndarray:
    """Whether each box of ``places`` (upright) is farther than
    :data:`NEAR_MM` from the upright box or point ``target``
    (:func:`_boxes_gap`), at once; box by box where the gap is that
    within rounding (#12)."""
    dx = np.abs(places.x - target.center[0]) - places.half_w - target.half_w
    dy = np.abs(places.y - target.center[1]) - places.half_h - target.half_h
    gap = np.hypot(np.maximum(dx, 0.0), np.maximum(dy, 0.0))
    far = gap > NEAR_MM
    for i in np.nonzero(np.abs(gap - NEAR_MM) < 1e-9)[0].tolist():
        far[i] = _boxes_gap(places.box(i), target) > NEAR_MM
    return far


def _upright_halves(cos, sin, half_w: float, half_h: float):
    """The half width and half height (mm) of the upright bounds of a box
    of half sizes ``half_w`` and ``half_h`` turned by the angle of ``cos``
    and ``sin`` (numbers, or arrays)."""
    c, s = np.abs(cos), np.abs(sin)
    return c * half_w + s * half_h, s * half_w + c * half_h


def _box_nearest(b: Box, p):
    """The point of the box nearest ``p``."""
    u, v = b.local(*p)
    u, v = max(-b.half_w, min(b.half_w, u)), max(-b.half_h, min(b.half_h, v))
    c, s = math.cos(b.angle_rad), math.sin(b.angle_rad)
    return (b.center[0] + c * u - s * v, b.center[1] + s * u + c * v)


def on_meridian(el) -> bool:
    """Whether a line runs along the meridian or the east-west line (an
    azimuth of 0 or 180 degrees is the meridian's own line)."""
    if el.shape != "segment":
        return False
    (x0, y0), (x1, y1) = el.geom["from"], el.geom["to"]
    return (abs(x0) < 1e-6 and abs(x1) < 1e-6) or (abs(y0) < 1e-6 and abs(y1) < 1e-6)


def midpoint(el):
    """The middle (mm) of a stroke: a circle's lowest point, an arc's
    middle, a segment's or a polyline's (where :func:`points_along`
    starts to walk it both ways)."""
    g = el.geom
    if el.shape == "circle":
        c, r = g["center"], g["radius"]
        return (c[0], c[1] - r)
    if el.shape == "arc":
        c, r = g["center"], g["radius"]
        t = math.radians((g["start_deg"] + g["end_deg"]) / 2)
        return (c[0] + r * math.cos(t), c[1] + r * math.sin(t))
    pts = [g["from"], g["to"]] if el.shape == "segment" else g["points"]
    if el.shape == "segment":
        return ((pts[0][0] + pts[1][0]) / 2, (pts[0][1] + pts[1][1]) / 2)
    return pts[len(pts) // 2]


def _ends(el):
    g = el.geom
    if el.shape == "segment":
        return [g["from"], g["to"]]
    if el.shape == "polyline":
        return [g["points"][0], g["points"][-1]]
    if el.shape == "arc":
        c, r = g["center"], g["radius"]
        return [(c[0] + r * math.cos(math.radians(t)), c[1] + r * math.sin(math.radians(t)))
                for t in (g["start_deg"], g["end_deg"])]
    return []


def _circle_meets_line(cx, cy, r, vertical: bool):
    """Where the circle meets the meridian (x = 0) or the east-west line (y = 0)."""
    d = cx if vertical else cy
    room = (r - abs(d)) * (r + abs(d))
    if room < 0:
        return []
    h = math.sqrt(room)
    if vertical:
        return [(0.0, cy + h), (0.0, cy - h)]
    return [(cx + h, 0.0), (cx - h, 0.0)]


def _on_element(el, q) -> bool:
    if el.shape == "circle":
        return True
    c = el.geom["center"]
    t = math.degrees(math.atan2(q[1] - c[1], q[0] - c[0]))
    lo, hi = el.geom["start_deg"], el.geom["end_deg"]
    t = lo + (t - lo) % 360.0
    return t <= hi


def multiple_of(value: float, of: float) -> bool:
    """Whether ``value`` is a whole multiple of ``of`` (to rounding)."""
    return abs(value / of - round(value / of)) < 1e-9


def _lane(p, q, half_mm: float) -> Box:
    """The thin box from the point ``p`` to the point ``q``, ``half_mm``
    either side of the line between them."""
    return Box(((p[0] + q[0]) / 2, (p[1] + q[1]) / 2), math.atan2(q[1] - p[1], q[0] - p[0]),
               math.dist(p, q) / 2, half_mm)


def _steep(lead) -> bool:
    """Whether a leader (its two ends) is steeper than
    :data:`LEADER_LEAST_SLOPE_DEG`: a level dash beside a number reads as
    its minus sign."""
    (ax, ay), (zx, zy) = lead
    slope = abs(math.degrees(math.atan2(zy - ay, zx - ax)))
    return LEADER_LEAST_SLOPE_DEG <= slope <= 180.0 - LEADER_LEAST_SLOPE_DEG


def _comes_within(el, p, reach_mm: float) -> bool:
    """Whether a stroke may come within ``reach_mm`` of the point ``p``:
    a circle's or an arc's circle, or a line's bounds (a test that may
    say yes for a stroke that does not)."""
    ring, a, b, c, d = reach_of(el)
    if ring:
        return abs(math.dist((a, b), p) - c) <= reach_mm
    return a - reach_mm <= p[0] <= b + reach_mm and c - reach_mm <= p[1] <= d + reach_mm

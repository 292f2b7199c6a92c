"""The clock correction on the mater's back, read at the calendar's date (#10).

A narrow ring just inside the calendar ring, cut into runs of days whose
correction rounds to the same whole minute: the alidade laid on a date of
the calendar crosses this ring in the run of that date, and the number
written in the run is what to add to the instrument's reading to get the
clock's time (the plan's almanac, :mod:`kitgen.sky.site_almanac`; the
equation of time alone, for local mean time, when the site has no
longitude).  The run boundaries stand halfway between two days' calendar
ticks, so that the ring is read as the calendar is.

The ticks between runs stand at the ring's outer edge and the numbers
below them, each centred on its run; where runs are shorter than their
numbers (near the turn of the year the correction changes by a minute
every two days) only every other run is numbered, its neighbours' numbers
being one more and one less.  The title, the less important of the two,
makes room for the ring: inside it the title may go down to
:data:`~kitgen.parts.dimensions.MIN_TITLE_PT` and onto two or three
lines; only on a kit where even so it cannot fit is the ring left out,
and the build says so (:func:`clock_ring_notes`; the instructions then
carry the table alone).
The horizontal through the centre stops at the ring's inner edge
(kitgen.parts.mater_back breaks it across the ring, as across the
calendar's), so that numbers stand at the equinoxes as on any other
date.  Where the clocks change (summer time begins or
ends: the correction jumps by :data:`CLOCK_CHANGE_MIN` or more from one
day to the next), a heavy bar crosses the whole ring, heavier than the
calendar's month lines beside it, so that the jump of an hour reads as
the change it is (the instructions say so); no number stands within
:data:`BAR_CLEAR_MM` of a bar, and the runs nearest each side of it are
numbered first, so that both sides of the jump are read.  The runs of
the instructions' worked examples' dates are numbered next, so that a
pupil finds on the ring the correction the example quotes.  Each run is
also an undrawn arc carrying its dates and minutes, so that the JSON
says exactly what the ring says.  Lengths in mm, directions in degrees
counter-clockwise from +x, as on the rest of the back.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import Message, Number
from ..geometry import model
from ..geometry.style import pin_hole_radius_mm, pin_mark_reach_mm, stroke_width_mm
from ..words.locale import zone_place
from . import curves, labels, turned_numbers
from .turned_numbers import reads_as_another_turned
from .context import PartContext
from .dimensions import MIN_TEXT_PT, MIN_TICK_MM, MIN_TITLE_PT

#: The title's room on the back (kitgen.parts.mater_back), as shares of
#: the radius it is fitted in: the height of its middle and its height.
TITLE_Y = 0.47
TITLE_H = 0.22


#: The caption's room inside the ring, as shares of the ring's inner
#: radius: the height of its middle and its height; and the taller room
#: it takes where it fits only on two lines and the back's place line is
#: free, the year's line then moving up to the place's
#: (kitgen.parts.mater_back, #9: a small back keeps the ring's caption).
CAPTION_ROW = (0.12, 0.085)
TALL_CAPTION_ROW = (0.175, 0.18)


@dataclass(frozen=True)
class ClockScale:
    """The clock ring of the mater's back: its elements, and the radii that
    what lies inside it must keep within."""

    elements: tuple[model.Element, ...]
    inner_radius_mm: float     # the ring's inner edge: what lies inside must keep within it
    tall_caption: bool = False   # the caption took the place line's room too
    edge_radius_mm: float | None = None   # the ring's inner circle, where the horizontal stops (None: no ring)


#: The least jump of the correction (minutes) from one day to the next
#: that is a change of the clocks: the equation of time moves by well
#: under a minute a day, and zones change by half an hour or an hour.
CLOCK_CHANGE_MIN = 20
#: The room (mm) a number of the ring keeps from a bar's ink, beyond the
#: margin every label keeps: numbers 0.4 mm from the bar read as
#: touching it on paper.
BAR_CLEAR_MM = 0.5
#: How many runs on each side of a bar are tried first for a number,
#: nearest first: the runs beside a change are a day or two long, too
#: short for their numbers, and the next ones show the jump as well.
BAR_RUNS = 4
#: The least room (mm) between two of the ring's numbers, along the ring:
#: a plain space between words at their size is about 0.6 mm, and with
#: only that between them signed numbers run together ("+9+10" reads as
#: a sum); the plate's labels keep as much from one another
#: (kitgen.parts.plate_labels.LABEL_GAP_MM; common practice, no source).
NUMBER_GAP_MM = 1.0
#: The number of a run tried first (beside a bar, or of a worked
#: example's date) stands centred on its run or, where that is not clear
#: of a bar or the numbers placed, slid along the run by steps of this
#: (degrees), its centre kept inside the run.
SLIDE_STEP_DEG = 0.1
#: How much wider (mm) the ring is for the underlines of its numbers
#: (kitgen.parts.turned_numbers: "+9" turned reads "6+"), whose row then
#: stands midway between the ring's inner edge and its ticks' ends, so
#: that an underline keeps about 0.2 mm clear of either (below a number
#: of the upper half it lies towards the edge, of the lower half towards
#: the ticks); it had kept 0.01 mm from the edge.
UNDERLINE_ROOM_MM = 0.22


def _direction_deg(longitude_deg: float) -> float:
    """Direction on the back of ecliptic longitude (as kitgen.parts.mater_back)."""
    return 180.0 - longitude_deg


def runs(correction):
    """[(first index, last index, minutes)]: the days of the year in runs of
    the same whole-minute correction, in date order, a run over the turn of
    the year kept whole (its first index then beyond its last)."""
    minutes = [int(round(x)) for _, _, x in correction]
    n = len(minutes)
    starts = [k for k in range(n) if minutes[k] != minutes[k - 1]] or [0]
    out = []
    for a, b in zip(starts, starts[1:] + starts[:1]):
        out.append((a, (b - 1) % n, minutes[a]))
    return out


def _numbers(w, numbers, r_text: float, size_pt: float, bars_deg=(), bar_half_mm: float = 0.0, first=(),
             underline_mm: float = 0.0):
    """The runs' numbers under their ticks: for each group of runs of
    ``first`` (their positions in ``numbers``) none of which is numbered
    yet, the first of the group that finds room; then, longest first,
    the runs that hold their numbers with room to spare, centred; then
    the other runs in date order, each number at the first clear place
    from its run's earlier end, its centre in the run's middle half (else
    slid as far as the run reaches).
    Each keeps a margin (and, by :data:`BAR_CLEAR_MM` more, from the
    bars of the clock changes: ``bars_deg``, their directions;
    ``bar_half_mm``, half their ink's width), and two numbers keep
    :data:`NUMBER_GAP_MM` between them.  A run of ``first`` where
    centred it is not clear is slid along by :data:`SLIDE_STEP_DEG` as
    far as its run reaches.  In a fast-changing season the runs are
    narrower than their numbers: packed so, every second or third run
    is numbered."""
    placed, out, done = [], [], set()
    bar_deg = math.degrees((bar_half_mm + BAR_CLEAR_MM + labels.MARGIN_MM) / r_text)
    # Numbers stand upright on the ring, so their boxes draw nearer towards
    # the centre: widths and gaps are reckoned at their lower edge, half an
    # em inside the ring's middle.
    r_low = r_text - size_pt * 25.4 / 72.0 / 2.0
    apart_deg = math.degrees(NUMBER_GAP_MM / r_low)

    def roomy(k) -> bool:
        """Whether run ``k`` holds its number centred with room to spare."""
        width_mm = w.measure(signed(w, numbers[k][2]), size_pt).width_mm
        return math.radians(numbers[k][0]) * r_text >= width_mm + 2.0 * NUMBER_GAP_MM

    bars = np.array(bars_deg, dtype=float)

    def first_clear(tried, half: float):
        """The first of the directions ``tried`` (deg, an array) where a
        number ``half`` degrees wide keeps clear of the bars and the
        numbers placed, or None (each tested as one at a time would be:
        the same sums, #12)."""
        ok = ~(np.abs((tried[:, None] - bars + 180.0) % 360.0 - 180.0) < half + bar_deg).any(axis=1)
        if placed:
            other, other_half = np.array(placed).T
            ok &= ~(np.abs((tried[:, None] - other + 180.0) % 360.0 - 180.0) < (half + other_half) + apart_deg
                    ).any(axis=1)
        found = np.flatnonzero(ok)
        return float(tried[found[0]]) if len(found) else None

    def put(k, slide: bool = False, packed: bool = False) -> bool:
        span, mid, minutes, month, day = numbers[k]
        if k in done:
            return False
        text = signed(w, minutes)
        half = math.degrees(math.atan2(w.measure(text, size_pt).width_mm / 2.0, r_low))
        if packed:   # the first clear place from the run's earlier end, in its middle half
            steps = int(span / 2.0 / SLIDE_STEP_DEG)
            tried = (mid + span / 4.0) - np.arange(steps + 1) * SLIDE_STEP_DEG
        else:   # centred on its run, else (``slide``) slid along it, its centre kept inside the run
            steps = int(span / 2.0 / SLIDE_STEP_DEG) if slide else 0
            tried = mid + (np.repeat(np.arange(steps + 1), 2) * np.tile([1, -1], steps + 1)) * SLIDE_STEP_DEG
        at = first_clear(tried, half)
        if at is None:
            return False
        done.add(k)
        placed.append((at, half))
        label = curves.ring_text("clock_number", text, at, r_text, size_pt, minutes=minutes, month=month, day=day)
        out.append(label)
        if reads_as_another_turned(text):   # +9 turned is 6+: underlined, as on a dial
            out.append(turned_numbers.underline("clock_number_underline", label, w, underline_mm,
                                                minutes=minutes, month=month, day=day))
        return True

    for group in first:
        if not done.intersection(group):
            any(put(k, slide=True) for k in group)   # the first of the group that finds room
    for k in sorted(range(len(numbers)), key=lambda k: -numbers[k][0]):
        if roomy(k):
            put(k)
    # The short runs in date order, each number as near the last as it
    # may stand: packed so, every second or third run of a fast-changing
    # season is numbered, where the longest-first order had left up to
    # four in a row unnumbered on A5 and Letter kits.
    start = min(done) if done else 0
    for i in range(len(numbers)):   # else anywhere its centre keeps inside the run
        k = (start + i) % len(numbers)
        put(k, packed=True) or put(k, slide=True)
    return out


def title_min_pt(ctx: PartContext, r_inner_mm: float) -> float:
    """The smallest size the back's title may take inside radius
    ``r_inner_mm``: :data:`MIN_TITLE_PT` where the title fits there at it
    (on up to three lines, kitgen.words.fit), else :data:`MIN_TEXT_PT`, the
    legible minimum of any label."""
    w = ctx.words
    y, h = TITLE_Y * r_inner_mm, TITLE_H * r_inner_mm
    room = 2.0 * math.sqrt(max((r_inner_mm - labels.MARGIN_MM) ** 2 - (y + h / 2) ** 2, 0.0))
    fitted = w.fit(ctx.plan.title or w("kit.default_title"), ctx.dims.title_pt, room, h, style="bold",
                   min_pt=MIN_TITLE_PT)
    return MIN_TITLE_PT if fitted.step < 5 else MIN_TEXT_PT


def _title_fits(ctx: PartContext, r_inner_mm: float) -> bool:
    """Whether the back's title fits inside the ring at no less than
    :data:`MIN_TITLE_PT`; where it does not (a long title on a small kit)
    the ring is left out and the correction is printed in the instructions
    only."""
    return title_min_pt(ctx, r_inner_mm) == MIN_TITLE_PT


def clock_ring_notes(parts, dims) -> tuple[Message, ...]:
    """A note where the finished mater back has no clock ring (read from
    the part, not re-derived): the title left it no room at this size."""
    backs = [p for p in parts if p.kind == "mater_back"]
    if not backs or any(e.role == "clock_run" for p in backs for e in p.elements):
        return ()
    return (Message("notes.clock_ring_left_out", part=Message("notes.part.mater_back"),
                    diameter=Number(2 * dims.mater_radius_mm)),)


def signed(words, minutes: int) -> str:
    """A correction as the ring writes it: +12, −3, 0."""
    if minutes == 0:
        return words.number(0)
    return words("clock_scale.plus" if minutes > 0 else "clock_scale.minus", n=words.number(abs(minutes)))


def clock_scale(ctx: PartContext, r_outer_mm: float, room_above: bool = False) -> ClockScale:
    """The ring of the clock correction inside radius ``r_outer_mm`` (the
    calendar ring's inner edge), and its caption near the centre: in
    :data:`CAPTION_ROW`, or where it does not fit there and ``room_above``
    (the back has no place line) in :data:`TALL_CAPTION_ROW`, on two lines."""
    d, w = ctx.dims, ctx.words
    cal = ctx.sky.calendar
    almanac = ctx.plan.almanac
    size = d.small_text_pt
    h = w.measure(w.number(0) + w.number(8), size).height_mm
    tick = max(MIN_TICK_MM, 0.8 * d.tick_mm)
    r1 = r_outer_mm - labels.MARGIN_MM
    r0 = r1 - tick - h - 3 * labels.MARGIN_MM - UNDERLINE_ROOM_MM
    r_text = r0 + labels.MARGIN_MM + h / 2 + (labels.MARGIN_MM + UNDERLINE_ROOM_MM) / 2
    n = len(cal)
    lon = [x for _, _, x in cal]

    def edge_deg(k):
        """Direction of the boundary before day ``k``, halfway from the day before."""
        a, b = lon[k - 1], lon[k]
        return _direction_deg(a + ((b - a) % 360.0) / 2.0)

    if not _title_fits(ctx, r0 - labels.MARGIN_MM):
        return ClockScale((), r_outer_mm)
    els = [model.circle("clock_edge", (0.0, 0.0), r0, "light"),
           model.circle("clock_edge", (0.0, 0.0), r1, "light")]
    numbers, bars, beside = [], [], []
    ring_runs = runs(almanac.clock_correction)
    for k, (first, last, minutes) in enumerate(ring_runs):
        start, end = edge_deg(first), edge_deg((last + 1) % n)
        span = (start - end) % 360.0 or 360.0
        (m0, d0, _), (m1, d1, _) = cal[first], cal[last]
        els.append(model.arc("clock_run", (0.0, 0.0), r_text, end % 360.0, end % 360.0 + span, "none",
                             minutes=minutes, from_month=m0, from_day=d0, to_month=m1, to_day=d1))
        els.append(curves.radial_tick("clock_tick", start, r1 - tick, r1, r1, "light", month=m0, day=d0))
        before = ring_runs[k - 1][2]
        if len(ring_runs) > 1 and abs(minutes - before) >= CLOCK_CHANGE_MIN:
            els.append(curves.radial_tick("clock_change", start, r0, r1, r1, "heavy", month=m0, day=d0,
                                          minutes_before=before, minutes=minutes))
            bars.append(start)
            beside += [[(k + i) % len(ring_runs) for i in range(BAR_RUNS)],          # after the change
                       [(k - 1 - i) % len(ring_runs) for i in range(BAR_RUNS)]]      # and before it
        numbers.append((span, end + span / 2.0, minutes, m0, d0))
    examples = [ex for ex in (ctx.plan.examples.sun, ctx.plan.examples.star) if ex is not None]
    dates = {(m, dd): i for i, (m, dd, _) in enumerate(cal)}
    quoted = [[k] for ex in examples for k, (first, last, _) in enumerate(ring_runs)
              if (ex.month, ex.day) in dates and (dates[(ex.month, ex.day)] - first) % n <= (last - first) % n]
    els += _numbers(w, numbers, r_text, size, bars, stroke_width_mm("heavy", d) / 2, beside + quoted,
                    stroke_width_mm("light", d))
    key = "clock_scale.caption_zone" if almanac.time == "zone" else "clock_scale.caption_mean"
    # The looked-up town, or the zone's city (or UTC offset), never its IANA name.
    site = ctx.plan.site
    zone = zone_place(site.timezone, w.language, site.clock_place) if almanac.time == "zone" else ""
    # The pin's mark at the centre (kitgen.render.ink) with its ink and a margin below the caption
    floor = (pin_mark_reach_mm(d, pin_hole_radius_mm("centre", ctx.plan.printing.pin_hole_mm))
             + stroke_width_mm("medium", d) / 2 + labels.MARGIN_MM)
    caption = _caption(w, w(key, zone=zone), size, r0, CAPTION_ROW, floor)
    tall = not caption and room_above
    if tall:
        caption = _caption(w, w(key, zone=zone), size, r0, TALL_CAPTION_ROW, floor)
    return ClockScale(tuple(els + caption), r0 - labels.MARGIN_MM, tall and bool(caption), r0)


def _caption(w, text: str, size_pt: float, r0_mm: float, row, floor_mm: float = 0.0) -> list[model.Element]:
    """The ring's caption fitted to the chord of the circle ``r0_mm`` at
    the far edge of ``row`` (its middle's height and its height as shares
    of ``r0_mm``), the row's foot raised to ``floor_mm`` above the centre
    where it lies lower (clear of the pin's mark: on a small back a
    descender had touched its upper arm), or none where it would be cut
    short: the instructions explain the ring too."""
    top = (row[0] + row[1] / 2) * r0_mm
    foot = max((row[0] - row[1] / 2) * r0_mm, floor_mm)
    if top <= foot:
        return []
    y, room_h = (top + foot) / 2, top - foot
    room = 2.0 * math.sqrt(max((r0_mm - labels.MARGIN_MM) ** 2 - (y + room_h / 2) ** 2, 0.0))
    return labels.fitted_text("clock_caption", (0.0, y), text, size_pt, w, room, room_h, optional=True)

"""The mater's back: altitude scale, ecliptic-longitude and calendar
scales, the clock correction ring (kitgen.parts.clock_scale) and the
shadow square for heights.

Seen from the back, with the alidade pivoted at the centre.  Ecliptic
longitude lam lies at the direction 180 - lam deg (ccw from +x): the year
runs clockwise, the March equinox on the left.  Each day's tick sits at the
Sun's apparent longitude at the site's local mean noon of that date in the
epoch year (12:00 UT where the site has no longitude), so the alidade laid
on a date reads the Sun's longitude on the next ring and the clock
correction on the inner one.
"""

from __future__ import annotations

import math

from ..geometry import model, style
from ..words.symbols import ZODIAC_SIGNS
from . import curves, labels
from .ring_numbers import (NUMBERED_TICK, SHORT_TICK, SIGN_NUMBERS_DEG, names_from_edge_mm, number_row,
                           numbers_gap_mm)
from .clock_scale import TITLE_H, TITLE_Y, clock_scale, title_min_pt
from .context import PartContext
from .mater_front import hang_hole
from .shadow_square import LABELLED_RATIOS, SHADOW_RATIOS, decimals, shadow_mark, shadow_side_mm

def longitude_direction_deg(longitude_deg: float) -> float:
    """Direction on the back (degrees ccw from +x) of ecliptic longitude."""
    return 180.0 - longitude_deg


def mater_back(ctx: PartContext) -> model.Part:
    d, w = ctx.dims, ctx.words
    R = d.mater_radius_mm
    r_alt = d.back_altitude_ring_mm
    r_zod = d.back_zodiac_ring_mm
    r_cal = d.back_calendar_ring_mm
    els = [model.circle("cut", (0.0, 0.0), R, "cut"),
           model.arc("scale_edge", (0.0, 0.0), r_alt, 0.0, 180.0, "medium"),
           model.circle("scale_edge", (0.0, 0.0), r_zod, "medium"),
           model.circle("scale_edge", (0.0, 0.0), r_cal, "medium"),
           # The horizontal: the altitude scale's base and the shadow
           # square's top, broken across the calendar ring and the clock
           # ring, whose numbers stand there at the equinoxes (the zodiac
           # ring's first ticks of Aries and Libra lie along it); its
           # middle piece is drawn with the clock ring, below.
           model.segment("scale_edge", (-R, 0.0), (-r_zod, 0.0), "light"),
           model.segment("scale_edge", (r_zod, 0.0), (R, 0.0), "light")]
    els += _altitude_scale(d, w, r_alt, R, ctx.scales.altitude_tick_deg)
    els += _zodiac_scale(d, w, r_zod, r_alt, ctx.scales.zodiac_tick_deg)
    els += _calendar_scale(ctx, r_cal, r_zod)
    # Title, place and epoch inside the calendar ring, each fitted to the
    # chord of that ring at the far edge of its room; a place that is the
    # title already is printed once (#9).  Where there is no place line
    # and the clock ring's caption needs two lines, the epoch takes the
    # place's row and the caption its own and the epoch's (#9).  The
    # owner's line comes later (kitgen.parts.owner).
    place = ctx.plan.site.place
    if place and place.strip().casefold() == (ctx.plan.title or "").strip().casefold():
        place = ""
    clock = clock_scale(ctx, r_cal, room_above=not place)
    middle = clock.edge_radius_mm if clock.edge_radius_mm is not None else r_cal
    els.append(model.segment("scale_edge", (-middle, 0.0), (middle, 0.0), "light"))
    els, r_cal = els + list(clock.elements), clock.inner_radius_mm
    els += _shadow_square(d, w, r_cal, ctx.scales.shadow_labels)
    for role, row, text, size, style in (
            ("title", (TITLE_Y, TITLE_H), ctx.plan.title or w("kit.default_title"), d.title_pt, "bold"),
            ("place", PLACE_ROW, place, d.text_pt, "label"),
            ("epoch", PLACE_ROW if clock.tall_caption else (0.225, 0.09),
             w("mater_back.epoch", year=w.number(ctx.plan.epoch)), d.small_text_pt, "label")):
        # The title goes onto two lines rather than below its 8 pt
        # where it can (kitgen.parts.clock_scale keeps the ring for it).
        low = title_min_pt(ctx, r_cal) if role == "title" else labels.MIN_TEXT_PT
        year_alone = (w.number(ctx.plan.epoch),) if role == "epoch" else ()
        els += inner_words(role, row, text, size, w, r_cal, style, low, year_alone)
    els.append(hang_hole(d))
    els.append(model.point("pin", (0.0, 0.0), hole="centre"))
    return model.Part("mater_back", "card", tuple(els), (-R, -R, R, R), {"words_radius_mm": r_cal},
                      w("mater_back.title"))


#: The place's line on the back: its middle's height and its height as
#: shares of the radius inside which the back's words stand.
PLACE_ROW = (0.33, 0.09)


def inner_words(role: str, row, text: str, size_pt: float, w, r_mm: float, style: str = "label",
                min_pt: float = labels.MIN_TEXT_PT, fallbacks: tuple[str, ...] = ()) -> list[model.Element]:
    """A line of the back's words inside the ring of radius ``r_mm``:
    ``row`` gives its centre's height and its height as fractions of
    ``r_mm``, and the words are fitted to the ring's chord at the row's far
    edge (none for an empty ``text``)."""
    if not text:
        return []
    y, h = r_mm * row[0], r_mm * row[1]
    room = 2 * math.sqrt((r_mm - labels.MARGIN_MM) ** 2 - (y + h / 2) ** 2)
    return labels.fitted_text(role, (0.0, y), text, size_pt, w, room, h, style=style, min_pt=min_pt,
                              fallbacks=fallbacks)


def _altitude_scale(d, w, r0, r1, every_deg=1):
    """The altitude scale; ticks between every ``every_deg`` kept in the
    geometry but not drawn (thinned at this size, kitgen.parts.legibility)."""
    out, ring = [], r1 - r0
    for alt in range(0, 91):
        length = ring * (0.45 if alt % 10 == 0 else 0.3 if alt % 5 == 0 else 0.16)
        stroke = ("light" if alt % 5 == 0 else "fine") if alt % every_deg == 0 else "none"
        for ang in {float(alt), 180.0 - alt}:
            out.append(curves.radial_tick("altitude_tick", ang, r0, r0 + length, r0, stroke,
                                          altitude_deg=float(alt)))
            if alt % 10 == 0 and alt not in (0, 90):
                out.append(curves.ring_text("altitude_label", w.number(alt), ang, r0 + 0.72 * ring,
                                            d.small_text_pt, altitude_deg=float(alt)))
    return out


def _zodiac_scale(d, w, r0, r1, every_deg=1):
    """Ecliptic longitude, every degree, from the ring's inner edge out:
    ticks, then the numbers 10 and 20 of each sign at their ticks' tips,
    then the sign's symbol and name (the rete's ecliptic is labelled
    alike, kitgen.parts.rete, by the name or, where it has no room, the
    symbol)."""
    out, ring = [], r1 - r0
    signs = w.items("zodiac.signs")
    for lon in range(360):
        if lon % 30 == 0:
            length, stroke = ring, "medium"
        else:
            length = ring * (NUMBERED_TICK if lon % 5 == 0 else SHORT_TICK)
            stroke = "light" if lon % 5 == 0 else "fine"
        if lon % every_deg:
            stroke = "none"  # thinned at this size (kitgen.parts.legibility): kept, not drawn
        out.append(curves.radial_tick("zodiac_tick", longitude_direction_deg(lon), r0, r0 + length, r0, stroke,
                                      longitude_deg=float(lon)))
    lift, h = number_row(w, d.small_text_pt, ring)
    r_num = r0 + lift + h / 2
    for lon in range(360):
        if lon % 30 in SIGN_NUMBERS_DEG:
            out.append(curves.ring_text("zodiac_number", w.number(lon % 30), longitude_direction_deg(lon), r_num,
                                        d.small_text_pt, longitude_deg=float(lon)))
    # The names stand between the numbers and the ring's outer edge,
    # within their own 30 degrees, each after its sign (U+2648...): the
    # rete writes a name with no room as its sign alone, and a pupil finds
    # it here (#9).
    inner = r0 + names_from_edge_mm(w, d.small_text_pt, ring)
    r_label = (inner + r1) / 2
    for k in range(12):
        out += labels.ring_label("zodiac_label", f"{ZODIAC_SIGNS[k]}\u00a0{signs[k]}",
                                 longitude_direction_deg(30 * k + 15), r_label,
                                 d.small_text_pt, w, labels.chord_mm(r_label, 28.0) - 2 * labels.MARGIN_MM,
                                 r1 - inner - 2 * labels.MARGIN_MM, short=ZODIAC_SIGNS[k],
                                 longitude_deg=30.0 * k + 15.0)
    return out


def numbered_days(lons_by_date, r_mm, width_mm, gap_mm):
    """The days of each month numbered on a calendar ring of radius
    ``r_mm``: the 10th and the 20th always, and the 5th, 15th and 25th
    where every number, ``width_mm`` wide at most, keeps ``gap_mm`` from
    its neighbours and from the month's boundary ticks (measured along the
    ring at the closest days of the year)."""
    days = sorted(lons_by_date)
    lon = [lons_by_date[k] for k in days]
    steps = [((b - a) % 360.0) for a, b in zip(lon, lon[1:] + lon[:1])]
    daily_mm = r_mm * math.radians(min(steps))
    fives = 5 * daily_mm >= width_mm + gap_mm and 4 * daily_mm >= width_mm / 2 + gap_mm
    return (5, 10, 15, 20, 25) if fives else (10, 20)


def _calendar_scale(ctx, r0, r1):
    """One tick a day, from the ring's outer edge in: the months' first days
    across the ring, the days numbered at their ticks' tips (at least the
    10th and the 20th), and the month's name nearest the centre."""
    d, w = ctx.dims, ctx.words
    out, ring = [], r1 - r0
    months = w.items("calendar.months")
    short = w.items("calendar.months_short")
    first = {}
    every = ctx.scales.calendar_tick_days
    dates = {(m, dd) for m, dd, _ in ctx.sky.calendar}
    for month, day, lon in ctx.sky.calendar:
        if day == 1:
            length, stroke = ring, "medium"
            first[month] = lon
        else:
            length = ring * (NUMBERED_TICK if day % 5 == 0 else SHORT_TICK)
            stroke = "light" if day % 5 == 0 else "fine"
        # Where daily ticks are too fine for this size (kitgen.parts.legibility)
        # only every 5th day and the 1st are drawn, but not a month's last
        # day, a day from the next month's first; the others stay in the
        # geometry, undrawn.
        if day != 1 and (day % every or (every > 1 and (month, day + 1) not in dates)):
            stroke = "none"
        out.append(curves.radial_tick("calendar_tick", longitude_direction_deg(lon), r1 - length, r1, r1, stroke,
                                      month=month, day=day, longitude_deg=lon))
    lift, h = number_row(w, d.small_text_pt, ring)
    r_num = r1 - lift - h / 2
    widest = max(w.measure(w.number(n), d.small_text_pt).width_mm for n in (5, 10, 15, 20, 25))
    numbered = numbered_days({(m, dd): lon for m, dd, lon in ctx.sky.calendar}, r_num, widest,
                             numbers_gap_mm(w, d.small_text_pt))
    for month, day, lon in ctx.sky.calendar:
        if day in numbered:
            out.append(curves.ring_text("day_label", w.number(day), longitude_direction_deg(lon), r_num,
                                        d.small_text_pt, month=month, day=day))
    # The months' names between the ring's inner edge and the numbers.
    outer = r1 - names_from_edge_mm(w, d.small_text_pt, ring)
    r_label = (r0 + outer) / 2
    for month in range(1, 13):
        a, b = first[month], first[month % 12 + 1]
        span = (b - a) % 360.0
        mid = a + span / 2.0
        out += labels.ring_label("month_label", months[month - 1], longitude_direction_deg(mid), r_label,
                                 d.small_text_pt, w, labels.chord_mm(r_label, span - 2.0) - 2 * labels.MARGIN_MM,
                                 outer - r0 - 2 * labels.MARGIN_MM, short=short[month - 1], month=month)
    return out


def _corner_number_at(d, w, L, sx, tick_end, beyond, r_limit):
    """Where the corner's 1 stands: ``beyond`` the corner on its diagonal
    (:func:`~kitgen.parts.shadow_square.shadow_mark`), unless its box
    would reach the ring round the squares (radius ``r_limit``: the clock
    ring's or the calendar's inner edge), as on small kits; then inside
    the corner, on the diagonal past the tick's end, clear of both sides
    and of the tick by a margin and half the sides' line (#9: no line over
    a word)."""
    text = w.number(1.0, 0)
    box = labels.text_box_mm(beyond, text, d.small_text_pt, "middle", w.measure)
    gap = labels.MARGIN_MM + style.stroke_width_mm("medium", d) / 2
    if max(math.hypot(x, y) for x in box[0::2] for y in box[1::2]) <= r_limit - gap:
        return beyond
    ext = w.measure(text, d.small_text_pt)
    hw, hh = ext.width_mm / 2, ext.height_mm / 2
    tick = L - abs(tick_end[0])
    c = max(hw, hh, tick + min(hw, hh)) + gap
    return (sx * (L - c), -L + c)


def _shadow_square(d, w, r_cal, labelled=LABELLED_RATIOS):
    """Two shadow squares below the horizontal: the alidade's lower end
    crosses a side where 10 x tan(altitude) (vertical sides) or
    10 / tan(altitude) (horizontal sides) can be read; here every mark is
    labelled with tan(altitude) itself, the height per unit of distance
    (the ``labelled`` ones: those that fit, kitgen.parts.legibility)."""
    L = shadow_side_mm(d)
    out = []
    for sx in (1.0, -1.0):
        corner = (sx * L, -L)
        out.append(model.segment("shadow_square", (sx * L, 0.0), corner, "medium"))
        out.append(model.segment("shadow_square", corner, (0.0, -L), "medium"))
        for ratio in SHADOW_RATIOS:
            at, tick_end, lab, anchor = shadow_mark(d, L, ratio, sx)
            out.append(model.segment("shadow_tick", at, tick_end, "light", at=at, ratio=ratio))
            if ratio not in labelled:
                continue
            if ratio == 1.0:
                lab = _corner_number_at(d, w, L, sx, tick_end, lab, r_cal)
            out.append(model.text("shadow_label", lab, w.number(ratio, decimals(ratio)), d.small_text_pt,
                                  anchor=anchor, ratio=ratio))
    y = -L - d.tick_mm * 3.5
    room = min(2 * math.sqrt((r_cal - labels.MARGIN_MM) ** 2 - (abs(y) + d.tick_mm) ** 2), 2 * L)
    out += labels.fitted_text("shadow_caption", (0.0, y), w("mater_back.shadow_caption"), d.small_text_pt, w,
                              room, 3 * d.tick_mm)
    return out

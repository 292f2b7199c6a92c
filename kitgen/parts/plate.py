"""The plate (climate) for one latitude: the observer's sky, projected.

Horizon, almucantars (circles of equal altitude), azimuth curves, equator
and tropics, meridian and east-west line, the twilight circles asked for and
the unequal hours below the horizon.  Every circle of the sphere is drawn
as its exact image circle (see kitgen.projection.circles); the unequal
hours are no circles and are drawn through exactly computed points.
"""

from __future__ import annotations

import math

import numpy as np

from ..geometry import model
from ..projection.stereographic import (equatorial_vector, horizontal_vector,
                                        project_vectors)
from ..geometry.style import pin_cross_half_mm, stroke_width_mm
from . import breaks, curves, labels, legibility, plate_labels, stroke_index
from ..sky.worked_example import hour_angle_rad, sun_place_rad
from ..words.locale import true_minus
from .context import PartContext
from .dimensions import MIN_TEXT_PT
from .format import WITHIN_LINE, latitude_text
from .plate_labels import multiple_of


def plate(ctx: PartContext) -> model.Part:
    """The plate for ``ctx.plate``'s latitude, seen from the front, drawn
    for the kit's hemisphere (an equator plate of a southern kit is a
    southern plate)."""
    lat_deg = ctx.plate.latitude_deg
    phi = math.radians(lat_deg)
    s = ctx.hemisphere_sign
    d = ctx.dims
    R, disc = d.equator_radius_mm, d.outer_tropic_radius_mm
    eps = ctx.sky.obliquity_rad
    els: list[model.Element] = []

    els += _outline(d, keyed(ctx.plan))
    north_pole = np.array([0.0, 0.0, 1.0])
    els += curves.whole_circle("equator", north_pole, math.pi / 2, s, R, disc, "medium", declination_deg=0.0)
    for dec in (eps, -eps):
        els += curves.whole_circle("tropic", north_pole, math.pi / 2 - dec, s, R, disc, "medium",
                                   declination_deg=math.degrees(dec))

    zenith = horizontal_vector(math.pi / 2, 0.0, phi)
    horizon = curves.whole_circle("horizon", zenith, math.pi / 2, s, R, disc, "heavy", altitude_deg=0.0)
    els += horizon
    step = ctx.scales.altitude_step_deg
    for alt in np.arange(step, 90.0 - 1e-9, step):
        els += curves.whole_circle("almucantar", zenith, math.radians(90.0 - alt), s, R, disc, "light",
                                   altitude_deg=float(alt))
    for twilight_deg in ctx.plan.drawing.twilight_deg:
        els += curves.whole_circle("twilight", zenith, math.radians(90.0 - twilight_deg), s, R, disc,
                                   "medium", altitude_deg=twilight_deg)
    top = 90.0 - max(10.0, step)
    els += _azimuths(phi, s, R, disc, ctx.scales.azimuth_step_deg, top)
    if ctx.plan.drawing.unequal_hours:
        els += _unequal_hours(phi, eps, s, R, disc)

    els.append(model.segment("meridian", (0.0, -disc), (0.0, disc), "medium"))
    if horizon_gap_mm(horizon) >= EAST_WEST_APART_MM:
        els.append(model.segment("east_west", (-disc, 0.0), (disc, 0.0), "medium"))
    z = project_vectors(zenith, s, R)
    if np.hypot(*z) <= disc:
        els.append(model.point("zenith", z))
    words, missing = _labels(ctx, phi, s, R, disc, els)
    # An almucantar that is owed a number and found no room for it clear of
    # the lines (round the zenith of a small plate) is not drawn (#9).
    unnumbered = sorted(v["altitude_deg"] for _, v in missing if "altitude_deg" in v)
    els = [e for e in els if not (e.role == "almucantar" and e.values["altitude_deg"] in unnumbered)]
    boxes = [breaks.text_box(e, ctx.words) for e in words if e.shape == "text"]
    width_of = lambda stroke: stroke_width_mm(stroke, d)   # noqa: E731
    els = breaks.break_around(els, boxes, labels.MARGIN_MM, width_of)
    els = _twilight_names_set_off(ctx, els, words, width_of)
    els += words
    els.append(model.point("pin", (0.0, 0.0), hole="centre"))
    r = d.plate_radius_mm + d.tick_mm * 4
    return model.Part("plate", "card", tuple(els), (-r, -r, r, r),
                      {"latitude_deg": lat_deg, "place": ctx.plate.place, "number": ctx.plate.number,
                       "labels_left_out": tuple(t for t, v in missing if "altitude_deg" not in v),
                       "almucantars_left_out_deg": tuple(unnumbered)},
                      plate_title(ctx))


#: Least gap (mm) between the horizon and the east-west line, somewhere
#: on the plate, for both to be drawn: nearer the equator the horizon is
#: the east-west line (exactly so at 0 degrees, where it projects to that
#: very diameter), and the two drawn apart by less printed as one line
#: doubled: 0.9 mm apart at the rim at 0.5 degrees N on A4, and a wedge
#: opening to 2.2 mm at the rim at 1.3 degrees S, which a review read as
#: the horizon drawn twice.
EAST_WEST_APART_MM = 3.0
#: Paper (mm) added along its line at each end of a twilight line's name
#: (its altitude at one end), beyond the labels' margin, where the line is
#: broken round it: about a dash's length, so that the gap reads as a gap.
BARE_ALTITUDE_GAP_MM = 1.0


def horizon_gap_mm(horizon) -> float:
    """The greatest distance (mm) of the horizon from the east-west line
    (the plate's horizontal diameter), over its drawn elements, clipped
    to the drawing's disc (kitgen.parts.curves.whole_circle): a segment's
    farther end; a circle's or an arc's point farthest from the line, at
    an end or where it crosses the meridian, its centre lying on it.  No
    horizon drawn: infinite (the east-west line is then drawn)."""
    gap = -math.inf
    for el in horizon:
        g = el.geom
        if el.shape == "segment":
            gap = max(gap, abs(g["from"][1]), abs(g["to"][1]))
            continue
        cy, r = g["center"][1], g["radius"]
        if el.shape == "circle":
            gap = max(gap, abs(cy) + r)
            continue
        a0, a1 = g["start_deg"], g["end_deg"]
        turns = [a for a in (90.0, 270.0, 450.0, 630.0) if a0 <= a <= a1]
        gap = max([gap] + [abs(cy + r * math.sin(math.radians(a))) for a in [a0, a1] + turns])
    return math.inf if gap == -math.inf else gap


def plate_title(ctx: PartContext) -> str:
    """The plate's title: "Plate" on a one-plate kit; with its number and
    latitude where the kit has several, so that each is named apart."""
    w = ctx.words
    if len(ctx.plan.plates) == 1:
        return w("plate.title")
    return w("plate.title_numbered", number=w.number(ctx.plate.number),
             latitude=latitude_text(w, ctx.plate.latitude_deg))


def plate_label_text(ctx: PartContext) -> str:
    """What the plate prints of itself: its latitude, after its place's
    name where it has one."""
    w = ctx.words
    if not ctx.plate.place:
        return latitude_text(w, ctx.plate.latitude_deg)
    latitude = latitude_text(w, ctx.plate.latitude_deg, WITHIN_LINE)
    return w("plate.place_latitude", place=ctx.plate.place, latitude=latitude)


def key_tab_mm(dims) -> tuple[float, float]:
    """Width and length (mm) of the key tab at the foot of the plate that
    slides into the slot cut in the mater (in the gap between the plate and
    the hour ring) and fixes the plate's turn."""
    gap = dims.limb_inner_radius_mm - dims.plate_radius_mm
    return max(6.0, 0.12 * dims.plate_radius_mm), 0.8 * gap


def keyed(plan) -> bool:
    """Whether the plate is kept from turning by a key tab in a slot of the
    mater's front.
    Not in a duplex kit (#9): there the mater's front and back are the two
    sides of one card, and a slot cut through the front would cut the
    back's zodiac and calendar scales and leave the key poking out behind.
    Such a plate is set by its meridian (the noon line) on the limb's 12
    and held by the paper fastener through the centre."""
    return plan.printing.duplex == "none"


def _outline(d, key: bool = True):
    """The plate's cut line: its circle with the key tab at the foot
    (the midnight side, where the Sun is read least), or the whole circle
    for a plate without a key (:func:`keyed`)."""
    rp = d.plate_radius_mm
    if not key:
        return [model.circle("cut", (0.0, 0.0), rp, "cut")]
    tw, tl = key_tab_mm(d)
    half = math.degrees(math.asin(tw / 2 / rp))
    x = tw / 2
    y0 = -math.sqrt(rp * rp - x * x)
    y1 = -(rp + tl)
    return [
        model.arc("cut", (0.0, 0.0), rp, 270.0 + half, 270.0 - half + 360.0, "cut"),
        model.segment("cut", (-x, y0), (-x, y1), "cut"),
        model.segment("cut", (-x, y1), (x, y1), "cut"),
        model.segment("cut", (x, y1), (x, y0), "cut"),
        model.segment("key", (-x, y0), (x, y0), "fine"),
    ]


def _azimuths(phi, s, R, disc, step_deg, top_deg):
    """Azimuth curves: pieces of the great circles through the zenith, from
    the horizon up to the almucantar ``top_deg``, where they would crowd
    into a blot (common practice: azimuths stop short of the zenith)."""
    out = []
    alts = np.radians(np.linspace(0.0, top_deg, 181))
    for az in np.arange(0.0, 360.0 - 1e-9, step_deg):
        A = math.radians(az)
        pole = horizontal_vector(0.0, A + math.pi / 2, phi)
        vecs = horizontal_vector(alts, np.full_like(alts, A), phi)
        out += curves.circle_piece("azimuth", pole, math.pi / 2, vecs, s, R, disc, "fine", azimuth_deg=float(az))
    return out


def _unequal_hours(phi, eps, s, R, disc):
    """Unequal (temporal) hour lines below the horizon.

    For a point of declination d the night arc runs from its setting, hour
    angle H0 with cos H0 = -tan(phi) tan(d) (Meeus 1998, eq. 15.1), to its
    rising at 2 pi - H0; line k (1..11) joins, for every d between the
    tropics, the points k/12 of the way along that arc.  Laying the Sun's
    nadir on line k shows the k-th unequal hour of the day (common practice
    on astrolabes)."""
    out = []
    decs = np.radians(np.linspace(-math.degrees(eps), math.degrees(eps), 241))
    x = -np.tan(phi) * np.tan(decs)
    ok = np.abs(x) < 1.0
    if ok.sum() < 2:
        return out
    decs, h0 = decs[ok], np.arccos(x[ok])
    for k in range(1, 12):
        ha = h0 + k * (2 * np.pi - 2 * h0) / 12.0
        out += curves.curve("unequal_hour", equatorial_vector(ha, decs), s, R, disc, "fine", hour=k)
    return out


def _labels(ctx, phi, s, R, disc, strokes):
    """The plate's words and numbers (see :mod:`kitgen.parts.plate_labels`),
    most needed first, each clear of those set before it: the latitude,
    the cardinal points, the almucantars' tens, the unequal hours, the
    azimuths, the names of the horizon, equator, tropics and twilight lines,
    then the almucantars' fives where there is room.  Returns the labels
    (and the cardinal letters' leaders) and the texts of those that found
    no place clear of the lines (#9), for the build's notes."""
    w, eps = ctx.words, ctx.sky.obliquity_rad
    index = stroke_index.StrokeIndex()   # the lines entered once for the latitude and the other labels (#12)
    first = _latitude_label(ctx, disc, strokes, index)
    lab = plate_labels.PlateLabeller(ctx, strokes, disc, [breaks.text_box(e, w) for e in first], index)
    for az, key in ((0.0, "cardinal.north"), (90.0, "cardinal.east"), (180.0, "cardinal.south"),
                    (270.0, "cardinal.west")):
        lab.cardinal(az, key, phi, s, R, disc)
    step = ctx.scales.altitude_step_deg
    every = legibility.label_every_deg(step)
    numbered = ctx.scales.almucantar_labels_deg
    tens = [a for a in numbered if multiple_of(a, every)]
    for alt in tens:
        lab.almucantar(alt, True)
    for alt_deg, hour_angle, dec in _examples_read(ctx, phi):
        lab.example_almucantar(alt_deg, hour_angle, dec, s, R)
    if ctx.plan.drawing.unequal_hours:
        for k in range(1, 13):
            lab.unequal_hour(k, phi, s, R, eps)
    az_step = ctx.scales.azimuth_step_deg
    azimuths = [a for a in np.arange(0.0, 360.0 - 1e-9, az_step) if not multiple_of(a, 90.0)]
    for az in [a for a in azimuths if multiple_of(a, 30.0)]:
        lab.azimuth(float(az), phi, s, R)
    lab.lead_the_hidden()
    lab.curve_name("horizon", w("plate.line_horizon"))
    lab.curve_name("equator", w("plate.line_equator"))
    lab.curve_name("tropic", w("plate.line_tropic_cancer"), declination_deg=math.degrees(eps))
    lab.curve_name("tropic", w("plate.line_tropic_capricorn"), declination_deg=-math.degrees(eps))
    for alt in ctx.plan.drawing.twilight_deg:
        value = true_minus(w.number(alt))
        lab.curve_name("twilight", w("plate.line_twilight", altitude=value),
                       w("plate.line_twilight_short", altitude=value), altitude_deg=alt)
    # The azimuths between the thirties, numbered where the names have left room (#12: on an A5 plate from
    # 34 S to 34 N the 15 and 345 deg numbers had taken the twilight line's only places, and it had no name)
    for az in [a for a in azimuths if not multiple_of(a, 30.0)]:
        lab.azimuth(float(az), phi, s, R)
    for alt in numbered:
        if alt not in tens:
            lab.almucantar(alt, False)
    return first + lab.out, lab.missing


def _twilight_names_set_off(ctx, els, words, width_of):
    """A twilight line broken :data:`BARE_ALTITUDE_GAP_MM` farther along
    it at each end of its name, so that the minus sign of the altitude at
    a name's end ("−6°" alone, or a right-to-left name such as Arabic's,
    whose number stands at its left end) does not read as one more dash
    of the line (#12 review: "−6°" read as "6°").  Only the line's own
    pieces are cut again, and only where the name stands on it (beside
    it, the widened box does not reach the line); nothing else moves."""
    for e in words:
        if e.role != "curve_label" or e.values.get("curve") != "twilight":
            continue
        alt = e.values["altitude_deg"]
        b = breaks.text_box(e, ctx.words)
        wide = breaks.Box(b.center, b.angle_rad, b.half_w + BARE_ALTITUDE_GAP_MM, b.half_h)
        els = [piece for x in els
               for piece in (breaks.break_around([x], [wide], labels.MARGIN_MM, width_of)
                             if x.role == "twilight" and abs(x.values["altitude_deg"] - alt) < 1e-9 else [x])]
    return els


def _examples_read(ctx, phi: float) -> list[tuple[float, float, float]]:
    """(altitude in degrees, hour angle and declination in radians) of
    where each worked example of the instructions reads its body on this
    plate (the site's, not a second plate's): the Sun in the morning, the
    star east or west, at the hour angle the example itself works out
    (:func:`kitgen.sky.worked_example.hour_angle_rad`)."""
    if abs(math.radians(ctx.plan.site.latitude_deg) - phi) > 1e-9:
        return []
    ex, out = ctx.plan.examples, []
    reads = []
    if ex.sun is not None:
        reads.append((ex.sun.altitude_deg, sun_place_rad(ex.sun.sun_longitude_deg, ctx.sky.obliquity_rad)[1], True))
    if ex.star is not None:
        reads.append((ex.star.altitude_deg, math.radians(ctx.sky.stars[ex.star.star_index].dec_deg), ex.star.east))
    for alt_deg, dec, east in reads:
        h = hour_angle_rad(phi, dec, math.radians(alt_deg))
        if h is not None:
            out.append((alt_deg, -h if east else h, dec))
    return out


def _latitude_label(ctx, disc, strokes, index):
    """The latitude (after the place's name), along the lower meridian,
    moved up or down it (and to the meridian's other side) until it keeps
    plate_labels.CLEAR_MM from every line but the meridian (#9: a caption
    set in a gap of a tropic reads as that line's name); on a small plate
    where no such place is found, across the thin lines only.  The lines
    are entered in ``index``, which the plate's
    other labels then share (#12)."""
    d, w = ctx.dims, ctx.words
    # The latitude, from beside the meridian to the edge of the drawing;
    # raised from 0.9 of the disc's radius where a small plate's chord
    # there is shorter than the words.
    # Where even there it is too long for the minimum size, it gets the
    # height of two lines, so the fitting rule can break it.
    text = plate_label_text(ctx)
    h = max(2.0 * d.tick_mm, w.measure(text, d.text_pt).height_mm + 2 * labels.MARGIN_MM)
    slack = d.tick_mm + 2 * labels.MARGIN_MM + 0.5

    def reach(width_mm):  # how far down a line this long still fits
        return math.sqrt(max(0.0, (disc - labels.MARGIN_MM) ** 2 - (width_mm + slack) ** 2)) - h / 2

    down = reach(w.measure(text, d.text_pt).width_mm)
    if down < disc * 0.6 and " " in text:
        h = max(h, 2.4 * w.measure(text, MIN_TEXT_PT).height_mm)
        head, _, tail = text.partition(" ")
        down = reach(max(w.measure(x, MIN_TEXT_PT).width_mm for x in (head, tail)))
    y0 = -min(disc * 0.9, max(disc * 0.6, down))
    room = plate_labels.Room(disc, d, strokes=index)
    others = [e for e in strokes if e.shape in plate_labels.STROKE_SHAPES and e.role != "meridian"
              and e.stroke not in ("none", "cut", "fold") and not plate_labels.on_meridian(e)]

    def at(y, side):
        width = math.sqrt(max(0.0, (disc - labels.MARGIN_MM) ** 2 - (abs(y) + h / 2) ** 2)) - d.tick_mm
        return labels.fitted_text("plate_label", (side * d.tick_mm, y), text, d.text_pt, w, width, h,
                                  anchor="start" if side > 0 else "end",
                                  fallbacks=(latitude_text(w, ctx.plate.latitude_deg),))

    first = at(y0, 1)
    if any(e.geom["text"].endswith("\u2026") for e in first):
        return first
    low = -(pin_cross_half_mm(d) + plate_labels.CLEAR_MM + h)   # clear of the pin's mark
    # Clear of every line, else beside them, else (a small plate) across
    # the thin lines (almucantars, azimuths, unequal hours), never across
    # a named one: the plate's latitude is never left out.
    named = [e for e in others if e.role in ("horizon", "equator", "tropic", "twilight")]
    texts = [e.geom["text"] for e in first]
    tried = {}   # (y, side): the label there and its boxes, or None where it is set otherwise than ``first`` (#12)
    for clear, lines in ((plate_labels.CLEAR_MM, others), (labels.MARGIN_MM, others), (labels.MARGIN_MM, named)):
        for k in range(int(disc / 0.5)):
            for y in ((y0,) if k == 0 else (y0 + 0.5 * k, y0 - 0.5 * k)):
                if not -disc < y < low:
                    continue
                for side in (1, -1):
                    if (y, side) not in tried:
                        els = at(y, side)
                        same = [e.geom["text"] for e in els] == texts
                        tried[y, side] = (els, [breaks.text_box(e, w) for e in els]) if same else None
                    if tried[y, side] is None:
                        continue
                    els, boxes = tried[y, side]
                    if all(room.inside(b) and room.clear_of(b, lines, clear) for b in boxes):
                        return els
    return first

"""Legible at every size: which lines and numbers a scale can carry.

A scale whose lines would come closer together than a printer can keep
apart, or than an eye can count, is thinned to the next coarser step of a
fixed ladder (a degree scale goes from every degree to every 5 degrees,
say), and the build says so in :attr:`Scales.notes`; nothing is made
silently unreadable.  The rule, in one number:

* :data:`MIN_CLEAR_GAP_MM` = 0.4 mm of clear paper between two neighbouring
  lines, whatever their own width.  With the thinnest line of 0.10 mm
  (``kitgen.geometry.style``) that is a pitch of 0.5 mm, the finest
  graduation of a common steel rule (half millimetres): the finest scale
  people are used to reading by eye (common practice).  It also keeps
  toner and ink, which spread a few hundredths of a millimetre on each side
  of a line on office printers and more on film (from experience), from
  closing the gap.

Numbers are thinned the same way: a number that would touch its neighbour
or sit on the lines (at least :data:`MIN_LABEL_GAP_MM` between their boxes)
is left out: the almucantars' fives from the first whose neighbours on the
meridian leave no room (their tens are numbered on every plate, see
:mod:`kitgen.parts.plate_labels`), the shadow square's where they would
meet.  A label that the fitting rule of
:mod:`kitgen.words.fit` still has to cut short with "..." at the minimum
size is named in a note too (:func:`shortened_notes`).

A note is a :class:`kitgen.errors.Message`: a key of the templates'
``notes`` section and its values (part names as :data:`PART_NAMES`,
numbers as :class:`kitgen.errors.Number`), put into the kit's language
only when the command line shows it; no word is written here.

Everything here is a pure function of the recipe, the sky and the sizes,
computed before the parts are drawn, so every part and the build's notes
agree.  Lengths in mm; angles in degrees at the edges, radians inside.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import Message, Number
from ..projection.circles import PlaneCircle, project_circle
from ..projection.stereographic import equatorial_vector, horizontal_vector, project_vectors
from ..geometry.style import stroke_width_mm
from .ecliptic_points import ecliptic_points_mm
from .labels import text_box_mm
from .ring_numbers import SIGN_NUMBERS_DEG, number_row, numbers_gap_mm, ring_needed_mm
from .shadow_square import LABELLED_RATIOS, decimals, shadow_mark, shadow_side_mm

MIN_CLEAR_GAP_MM = 0.4
MIN_LABEL_GAP_MM = 0.4

#: The ladders scales are thinned along; each step keeps every mark of
#: the coarser ones, so the long ticks stay where they were.
DEGREE_LADDER = (1, 5, 10)
DAY_LADDER = (1, 5)
MINUTE_LADDER = (5, 15, 30, 60)
ALTITUDE_LADDER = (1, 2, 5, 10, 15, 30)
AZIMUTH_LADDER = (5, 10, 15, 30, 45, 90)
#: Almucantars are numbered every 10 degrees (or every step, if coarser).
ALTITUDE_LABEL_EVERY_DEG = 10.0

#: Each part as the notes name it (the templates' ``notes.part`` words).
PART_NAMES = {
    "plate": Message("notes.part.plate"),
    "rete": Message("notes.part.rete"),
    "mater_front": Message("notes.part.mater_front"),
    "mater_back": Message("notes.part.mater_back"),
    "rule": Message("notes.part.rule"),
    "alidade": Message("notes.part.alidade"),
}


@dataclass(frozen=True)
class Scales:
    """What each scale carries at this size (see the module's rule)."""

    altitude_step_deg: float                  # almucantars drawn
    almucantar_labels_deg: tuple[float, ...]  # almucantars numbered
    azimuth_step_deg: float
    hour_tick_minutes: int                    # mater front: finest hour-ring tick
    degree_tick_deg: int                      # mater front: finest degree-ring tick
    altitude_tick_deg: int                    # mater back: altitude scale
    zodiac_tick_deg: int                      # mater back: ecliptic-longitude scale
    calendar_tick_days: int                   # mater back: 1 (every day) or 5 (1, 5, 10, ...)
    ecliptic_ticks_deg: tuple[int, ...]       # rete: longitudes that carry a tick
    shadow_labels: tuple[float, ...]          # mater back: shadow-square ratios numbered
    notes: tuple[Message, ...] = ()
    ecliptic_numbers_deg: tuple[int, ...] = ()  # rete: longitudes numbered (10 and 20 of each sign)


def gap_mm(pitch_mm: float, width_mm: float) -> float:
    """Clear paper (mm) between neighbouring lines ``pitch_mm`` apart."""
    return pitch_mm - width_mm


def thinned(requested: float, ladder, pitch_per_unit_mm: float, width_mm: float) -> float:
    """The finest step from ``requested`` up the ladder whose lines leave
    :data:`MIN_CLEAR_GAP_MM` (steps that are multiples of the requested
    one first); the coarsest one if none does."""
    ups = [s for s in ladder if s > requested + 1e-9]
    steps = [requested] + [s for s in ups if abs(s / requested - round(s / requested)) < 1e-9] + \
        [s for s in ups if abs(s / requested - round(s / requested)) >= 1e-9]
    for s in steps:
        if gap_mm(pitch_per_unit_mm * s, width_mm) >= MIN_CLEAR_GAP_MM - 1e-9:
            return s
    return steps[-1]


def _first_clear(requested: float, ladder, gap_of_step, width_mm: float) -> float:
    """The requested step, or the first coarser one of ``ladder``, whose
    lines (``gap_of_step(step)`` mm apart at their closest) leave
    :data:`MIN_CLEAR_GAP_MM`; the coarsest tried when none does."""
    step = requested
    for candidate in [requested] + [a for a in ladder if a > requested]:
        step = float(candidate)
        if gap_mm(gap_of_step(step), width_mm) >= MIN_CLEAR_GAP_MM - 1e-9:
            break
    return step


# -- the plate --------------------------------------------------------------------

def _almucantar_circles(alts_deg, phi, s, R):
    zenith = horizontal_vector(math.pi / 2, 0.0, phi)
    return [project_circle(zenith, math.radians(90.0 - a), s, R) for a in alts_deg]


def almucantar_gap_mm(step_deg: float, phi: float, s: int, R: float, disc: float) -> float:
    """The least distance (mm), inside the drawing disc, between two
    neighbouring almucantars ``step_deg`` apart (the horizon included),
    measured from points all round the higher one to the lower one."""
    alts = [0.0] + list(np.arange(step_deg, 90.0 - 1e-9, step_deg))
    circles = _almucantar_circles(alts, phi, s, R)
    t = np.linspace(0.0, 2 * np.pi, 721)
    best = math.inf
    for lower, upper in zip(circles, circles[1:]):
        if not (isinstance(lower, PlaneCircle) and isinstance(upper, PlaneCircle)):
            continue
        cx, cy = upper.center_mm
        px, py = cx + upper.radius_mm * np.cos(t), cy + upper.radius_mm * np.sin(t)
        inside = np.hypot(px, py) <= disc
        if not inside.any():
            continue
        d = np.abs(np.hypot(px[inside] - lower.center_mm[0], py[inside] - lower.center_mm[1]) - lower.radius_mm)
        best = min(best, float(d.min()))
    return best


def label_every_deg(step_deg: float) -> float:
    """Almucantars are numbered every 10 degrees, or every step where the
    step is coarser (a multiple of the step)."""
    return step_deg * max(1, round(ALTITUDE_LABEL_EVERY_DEG / step_deg))


def almucantar_labels(step_deg, phi, s, R, disc, tick_mm, text_height_mm) -> tuple[float, ...]:
    """The almucantars numbered: every ``label_every_deg`` (each wherever
    it is drawn, see kitgen.parts.plate_labels) and, where the circles are
    5 degrees apart or closer, the multiples of 5 between them, from the
    horizon up while on the meridian the circles next to one leave room
    for its number set on it (half its height and :data:`MIN_LABEL_GAP_MM`
    on each side; the first one without room and those above it stay
    unnumbered)."""
    every = label_every_deg(step_deg)
    out = [float(a) for a in np.arange(every, 90.0 - 1e-9, every)]
    if every <= 5.0 or step_deg > 5.0 or abs(5.0 / step_deg - round(5.0 / step_deg)) > 1e-9:
        return tuple(out)
    for alt in np.arange(5.0, 90.0 - 1e-9, 10.0):
        room = _meridian_room_mm(float(alt), step_deg, phi, s, R, disc - tick_mm)
        if room is None:
            continue
        if room < text_height_mm / 2 + MIN_LABEL_GAP_MM:
            break
        out.append(float(alt))
    return tuple(sorted(out))


def _meridian_room_mm(alt_deg, step_deg, phi, s, R, inside_mm):
    """The least distance (mm) along the meridian from the almucantar
    ``alt_deg`` to its neighbours ``step_deg`` above and below, at those
    of its two meridian points inside ``inside_mm``; None where neither is."""
    best = None
    for az in (0.0, math.pi):
        alts = np.radians([alt_deg - step_deg, alt_deg, min(alt_deg + step_deg, 90.0)])
        p = project_vectors(horizontal_vector(alts, np.full(3, az), phi), s, R)
        if not (np.all(np.isfinite(p[1])) and np.hypot(*p[1]) < inside_mm):
            continue
        gaps = [float(np.hypot(*(p[1] - p[0]))), float(np.hypot(*(p[2] - p[1])))]
        best = min([g for g in gaps if math.isfinite(g)] + ([best] if best is not None else []))
    return best


def azimuth_gap_mm(step_deg: float, top_deg: float, phi: float, s: int, R: float) -> float:
    """The least distance (mm) between neighbouring azimuth curves where
    they end, on the almucantar ``top_deg``, where they come closest."""
    az = np.radians(np.arange(0.0, 360.0 + step_deg / 2, step_deg))
    v = horizontal_vector(np.full_like(az, math.radians(top_deg)), az, phi)
    p = project_vectors(v, s, R)
    return float(np.min(np.hypot(*(p[1:] - p[:-1]).T)))


# -- the whole plan -------------------------------------------------------------------

def plate_name(plan, plate) -> Message:
    """A plate as the notes name it: "the plate", or "plate 2" on a kit of
    several plates."""
    if len(plan.plates) == 1:
        return PART_NAMES["plate"]
    return Message("notes.part.plate_numbered", number=Number(plate.number))


def plan_scales(plan, plate, dims) -> Scales:
    """What every scale carries for this plan at this size (the plate's
    scales for ``plate``), and the notes that say what was thinned."""
    sky, words = plan.sky, plan.words
    notes = []
    size = Number(2 * dims.mater_radius_mm)
    phi = math.radians(plate.latitude_deg)
    s = plan.hemisphere_sign
    R, disc = dims.equator_radius_mm, dims.outer_tropic_radius_mm
    fine, light = stroke_width_mm("fine", dims), stroke_width_mm("light", dims)
    text_h = words.measure("0123456789", dims.small_text_pt).height_mm
    plate_part = plate_name(plan, plate)

    # Almucantars: the requested step, coarser where circles would touch.
    want = float(plan.drawing.altitude_step_deg)
    step = _first_clear(want, ALTITUDE_LADDER, lambda a: almucantar_gap_mm(a, phi, s, R, disc), light)
    if step != want:
        g = almucantar_gap_mm(want, phi, s, R, disc)
        notes.append(Message("notes.almucantars_thinned", part=plate_part, wanted=Number(want),
                             gap=Number(g, 2), diameter=size, step=Number(step)))
    labels = almucantar_labels(step, phi, s, R, disc, dims.tick_mm, text_h)
    every = label_every_deg(step)
    if every > 5.0 and step <= 5.0 and abs(5.0 / step - round(5.0 / step)) < 1e-9:
        fives = [float(a) for a in np.arange(5.0, 90.0 - 1e-9, 10.0)
                 if _meridian_room_mm(float(a), step, phi, s, R, disc - dims.tick_mm) is not None]
        kept = [a for a in labels if a in fives]
        if kept and len(kept) < len(fives):
            notes.append(Message("notes.almucantar_numbers", part=plate_part, fine=Number(5),
                                 highest=Number(kept[-1]), coarse=Number(every), diameter=size))
        elif fives and not kept:
            notes.append(Message("notes.almucantar_numbers_coarse", part=plate_part, fine=Number(5),
                                 coarse=Number(every), diameter=size))

    # Azimuths: end on the almucantar 90 - max(10, step); coarser if they crowd there.
    top = 90.0 - max(10.0, step)
    want_az = float(plan.drawing.azimuth_step_deg)
    az_step = _first_clear(want_az, AZIMUTH_LADDER, lambda a: azimuth_gap_mm(a, top, phi, s, R), fine)
    if az_step != want_az:
        g = azimuth_gap_mm(want_az, top, phi, s, R)
        notes.append(Message("notes.azimuths_thinned", part=plate_part, wanted=Number(want_az),
                             gap=Number(g, 2), diameter=size, step=Number(az_step)))

    # The rings of the mater: uniform pitch round each ring.  A fine tick's
    # neighbour may be a medium one (an hour, a sign, a month's first day):
    # the gap between them is the pitch less half of each width.
    fine = (fine + stroke_width_mm("medium", dims)) / 2

    def ring(requested, ladder, pitch_per_unit, width, note):
        """The finest tick step that stays legible; ``note(wanted, pitch,
        got)`` gives the message that says so when it is coarser."""
        got = thinned(requested, ladder, pitch_per_unit, width)
        if got != requested:
            notes.append(note(Number(requested), Number(pitch_per_unit * requested, 2), Number(got)))
        return int(got)

    front, back = PART_NAMES["mater_front"], PART_NAMES["mater_back"]
    hour = ring(5, MINUTE_LADDER, 2 * math.pi * dims.limb_inner_radius_mm / (24 * 60), fine,
                lambda wanted, pitch, got: Message("notes.hour_ring", part=front, wanted=wanted, pitch=pitch,
                                                   diameter=size, got=got))
    degree = ring(1, DEGREE_LADDER, 2 * math.pi * dims.hour_ring_outer_mm / 360, fine,
                  lambda wanted, pitch, got: Message("notes.degree_ring", part=front, wanted=wanted, pitch=pitch,
                                                     diameter=size, got=got))
    altitude = ring(1, DEGREE_LADDER, 2 * math.pi * dims.back_altitude_ring_mm / 360, fine,
                    lambda wanted, pitch, got: Message("notes.altitude_scale", part=back, wanted=wanted,
                                                       pitch=pitch, diameter=size, got=got))
    zodiac = ring(1, DEGREE_LADDER, 2 * math.pi * dims.back_zodiac_ring_mm / 360, fine,
                  lambda wanted, pitch, got: Message("notes.ecliptic_scale", part=back, wanted=wanted, pitch=pitch,
                                                     diameter=size, got=got))
    lons = np.array([lon for _, _, lon in sky.calendar])
    daily = float(np.min(np.diff(np.unwrap(np.radians(lons))))) if len(lons) > 1 else math.radians(0.9533)
    days = ring(1, DAY_LADDER, dims.back_zodiac_ring_mm * abs(daily), fine,
                lambda wanted, pitch, got: Message("notes.calendar", part=back, wanted=wanted, pitch=pitch,
                                                   diameter=size, got=got))

    ecliptic = _ecliptic_ticks(sky, s, R, light, stroke_width_mm("medium", dims))
    if len(ecliptic) < 360:
        notes.append(Message("notes.ecliptic_ticks", part=PART_NAMES["rete"], left_out=Number(360 - len(ecliptic)),
                             total=Number(360), gap=Number(MIN_CLEAR_GAP_MM, 1), diameter=size, kept=Number(5)))

    numbers = ecliptic_numbers(sky, s, R, dims, words)
    skipped = [lon for lon in range(360) if lon % 30 in SIGN_NUMBERS_DEG and lon not in numbers]
    if skipped:
        notes.append(Message("notes.ecliptic_numbers", part=PART_NAMES["rete"],
                             longitudes=[Number(lon) for lon in skipped], diameter=size))

    shadow = _shadow_labels(dims, words)
    dropped = [r for r in LABELLED_RATIOS if r not in shadow]
    if dropped:
        notes.append(Message("notes.shadow_numbers", part=PART_NAMES["mater_back"],
                             ratios=[Number(r) for r in dropped], diameter=size))
    return Scales(step, labels, az_step, hour, degree, altitude, zodiac, days, ecliptic, shadow, tuple(notes),
                  numbers)


def _ecliptic_ticks(sky, s, R, light_mm: float, medium_mm: float) -> tuple[int, ...]:
    """Rete: every 5 degrees of longitude (drawn ``medium``), and the four
    degrees between two of them (drawn ``light``) where each of their
    ticks leaves :data:`MIN_CLEAR_GAP_MM` to both neighbours (their
    distance less half of each line's width), all four or none: a run of
    five degrees is graduated evenly, so that a pupil who counts its ticks
    counts degrees (#12 review: where the ticks beside each fifth degree
    were left out and the middle two kept, long, short, short, long read
    as three degrees; common practice in graduating a scale)."""

    pts = ecliptic_points_mm(np.arange(0.0, 361.0, 1.0), sky.obliquity_rad, s, R)
    d = np.hypot(*(pts[1:] - pts[:-1]).T)          # d[k]: from k to k+1 degrees

    def width(lon):
        return medium_mm if lon % 5 == 0 else light_mm

    def fits(lon):
        gaps = (d[lon] - (light_mm + width(lon + 1)) / 2, d[lon - 1] - (light_mm + width(lon - 1)) / 2)
        return min(gaps) >= MIN_CLEAR_GAP_MM - 1e-9

    out = []
    for fifth in range(0, 360, 5):
        out.append(fifth)
        run = range(fifth + 1, fifth + 5)
        if all(fits(lon) for lon in run):
            out += run
    return tuple(out)


def _shadow_labels(dims, words) -> tuple[float, ...]:
    """Shadow square: every numbered ratio up its sides (below 1, L / 5
    apart) and at its corner; along its foot (ratios above 1, at x = L /
    ratio) from the corner inwards, each number whose box keeps
    :data:`MIN_LABEL_GAP_MM` from every number kept before it, on both
    squares (the others are left without a number)."""
    L = shadow_side_mm(dims)
    g = MIN_LABEL_GAP_MM / 2

    def box(ratio, sx):
        _, _, at, anchor = shadow_mark(dims, L, ratio, sx)
        b = text_box_mm(at, words.number(ratio, decimals(ratio)), dims.small_text_pt, anchor, words.measure)
        return (b[0] - g, b[1] - g, b[2] + g, b[3] + g)

    def meets(a, b):
        return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]

    out = [r for r in LABELLED_RATIOS if r <= 1.0]
    kept = [box(r, sx) for r in out for sx in (1.0, -1.0)]
    for r in sorted(r for r in LABELLED_RATIOS if r > 1.0):
        mine = [box(r, sx) for sx in (1.0, -1.0)]
        if meets(mine[0], mine[1]) or any(meets(m, k) for m in mine for k in kept):
            continue
        out.append(r)
        kept += mine
    return tuple(sorted(out))


def ecliptic_band_mm(radius_mm: float, dims, words) -> float:
    """Width (mm) of the rete's ecliptic band: a share of the ecliptic's
    radius, at least 3.5 mm, and at least enough to hold, past the ticks,
    the row of numbers and the tallest sign name at the label size, with
    the labels' margins (kitgen.parts.ring_numbers)."""
    tallest = max(words.measure(name, dims.small_text_pt).height_mm for name in words.items("zodiac.signs"))
    return max(3.5, 0.11 * radius_mm, ring_needed_mm(words, dims.small_text_pt, tallest))


def ecliptic_numbers(sky, s, R, dims, words) -> tuple[int, ...]:
    """Rete: the longitudes numbered, 10 and 20 of each sign: each whose
    number (measured) keeps :data:`MIN_LABEL_GAP_MM` from the tick of its
    sign's bound 10 degrees away, and both where they keep a digit's width
    from each other too (kitgen.parts.ring_numbers.numbers_gap_mm), else
    the 10 alone; so where the projection crowds the
    ecliptic near the pin a sign may carry one number or none (distances
    along the chord at the row of numbers)."""
    from_pole = project_circle(_ecliptic_pole(sky.obliquity_rad), math.pi / 2, s, R)
    c, r = np.asarray(from_pole.center_mm), from_pole.radius_mm
    band = ecliptic_band_mm(r, dims, words)
    lift, h = number_row(words, dims.small_text_pt, band)
    shrink = (r - lift - h / 2) / r
    bound = stroke_width_mm("medium", dims) / 2 + MIN_LABEL_GAP_MM

    def at_row(lons):
        pts = ecliptic_points_mm(np.asarray(lons, dtype=float), sky.obliquity_rad, s, R)
        return c + (pts - c) * shrink

    half = {n: words.measure(words.number(n), dims.small_text_pt).width_mm / 2 for n in SIGN_NUMBERS_DEG}
    out = []
    for start in range(0, 360, 30):
        first, ten, twenty, last = at_row([start, start + 10, start + 20, start + 30])
        fits_ten = np.hypot(*(ten - first)) >= half[10] + bound
        fits_twenty = np.hypot(*(last - twenty)) >= half[20] + bound
        apart = np.hypot(*(twenty - ten)) >= half[10] + half[20] + numbers_gap_mm(words, dims.small_text_pt)
        if fits_ten:
            out.append(start + 10)
        if fits_twenty and (apart or not fits_ten):
            out.append(start + 20)
    return tuple(out)


def _ecliptic_pole(obliquity_rad: float):
    """The ecliptic's north pole in the equatorial frame of the rete
    (right ascension 270 deg, at hour angle -270 deg)."""
    return equatorial_vector(-math.radians(270.0), math.pi / 2 - obliquity_rad)


def shortened_notes(parts, dims, words) -> tuple[Message, ...]:
    """Notes for the labels that the fitting rule (kitgen.words.fit) had to
    cut short with "…" because even at the legible minimum they did not fit
    their room, and for the stars the label placer found no room to name
    (by the names ``words`` prints them with): so that no shortened or
    missing word goes unsaid; for the plate's labels that found no place
    clear of the other lines, an owner's name with no room on its part
    (kitgen.parts.owner.left_out) and the almucantars not drawn for want of
    room for their numbers; and for the rete's ecliptic numbers left
    out because a star's dot lies where they would stand
    (kitgen.parts.band_words)."""
    out = []
    size = Number(2 * dims.mater_radius_mm)
    several = sum(p.kind == "plate" for p in parts) > 1
    for part in parts:
        name = PART_NAMES[part.kind]
        if several and part.kind == "plate":
            name = Message("notes.part.plate_numbered", number=Number(int(part.id.rsplit("-", 1)[1])))
        cut = sorted({e.values.get("full_text", e.geom["text"]) for e in part.elements
                      if e.shape == "text" and e.geom["text"].endswith("\u2026")})
        if cut:
            out.append(Message("notes.shortened", part=name,
                               labels=[Message("notes.quoted", text=c) for c in cut], diameter=size))
        under = part.values.get("ecliptic_numbers_under_stars_deg")
        if under:
            out.append(Message("notes.ecliptic_numbers_under_stars", part=name,
                               longitudes=[Number(int(round(lon))) for lon in under]))
        # The plate's labels with no place clear of the lines not their own,
        # an owner's name with no room on its part (kitgen.parts.owner),
        # and the almucantars left out for want of room for their numbers (#9).
        missing = part.values.get("labels_left_out")
        if missing:
            out.append(Message("notes.plate_labels_left_out", part=name,
                               labels=[Message("notes.quoted", text=t) for t in missing], diameter=size))
        dropped = part.values.get("almucantars_left_out_deg") if part.kind == "plate" else None
        if dropped:
            out.append(Message("notes.almucantars_left_out", part=name,
                               altitudes=[Number(a) for a in dropped], diameter=size))
        named = {e.values.get("name") for e in part.elements if e.role == "star_label"}
        unnamed = [e.values["name"] for e in part.elements if e.role == "star" and e.stroke != "none"
                   and e.values["name"] not in named]
        if unnamed:
            stars = [words.star_name(n) for n in unnamed]
            out.append(Message("notes.unnamed_stars", part=name, stars=stars, diameter=size) if len(stars) == 1
                       else Message("notes.unnamed_stars_many", part=name, stars=stars, diameter=size))
    return tuple(out)

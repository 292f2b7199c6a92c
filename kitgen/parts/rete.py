"""The rete, printed on film: the ecliptic and the stars, turned over the plate.

The rete's own frame is the plate's frame when local sidereal time is 0 h:
a point of right ascension ra sits at hour angle -ra.  Turning the rete by
the sidereal time (clockwise in the north) sets the sky for that moment.
Graduations of the ecliptic are placed by projecting each longitude, not by
dividing the ecliptic circle evenly about its own centre (the projection
does not keep angles about that centre).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from ..errors import Message, Number
from ..geometry import model
from ..geometry.style import MIN_DOT_RADIUS_MM, star_radius_mm, stroke_width_mm
from ..projection.circles import project_circle
from ..projection.stereographic import equatorial_vector, project
from ..sky.rete_rim import MAX_RIM_DEG, rim_for_stars_deg
from ..sky.stars import POLE_STAR
from ..words.fit import line_offsets_mm
from ..words.measure import Extent
from ..words.symbols import ZODIAC_SIGNS
from . import band_words, breaks, curves, labels, legibility
from .ring_numbers import NUMBERED_TICK, SHORT_TICK, SIGN_NUMBERS_DEG, names_from_edge_mm, number_row
from .context import PartContext
from .ecliptic_points import ecliptic_points_mm


#: Paper (mm) a star's name keeps from every other star's dot, so that none
#: reads as touching it (a choice: a third of the labels' margin, which
#: still lets the crowded belt of Orion be named on A4).
NAME_CLEARANCE_MM = 0.1


#: The faintest star (magnitude) named with the looser rule where the
#: strict one leaves it unnamed: the first-magnitude stars a pupil looks
#: for (common practice: "first magnitude" is 1.5 and brighter).
LOOSE_MAG = 1.5
#: The shortest piece (mm) of a tick cut short at a star's dot that is
#: still drawn, from its foot on the ecliptic: a mark of its degree, above
#: the legibility pass's shortest tick (0.4 mm).
MIN_TICK_MM = 0.5


def _ecliptic_round_dots(els: list, center, radius_mm: float, dots, d) -> list:
    """The rete's elements with the ecliptic's heavy line broken round
    every star's dot (centre in mm, radius in mm) that comes within the
    labels' margin of its ink, with that margin of film between the dot
    and the line's ends (#12 review: Regulus, half a degree off the
    ecliptic, was lost in the line on A5; a chart's lines stop short of a
    star, common practice).  Each piece keeps the ecliptic's role, centre
    and radius.  No tick runs into a dot (:func:`_tick_clear_of`)."""
    half = stroke_width_mm("heavy", d) / 2
    margin = labels.MARGIN_MM
    cuts = []
    for (x, y), r in dots:
        if abs(math.hypot(x - center[0], y - center[1]) - radius_mm) < r + half + margin:
            along = math.atan2(y - center[1], x - center[0]) + math.pi / 2   # the line's direction there
            reach = r + margin + half
            cuts.append(breaks.Box((float(x), float(y)), along, reach, reach))
    discs = [((float(x), float(y)), r + margin) for (x, y), r in dots]
    out = []
    for el in els:
        if el.role == "ecliptic" and cuts:
            out += breaks.break_element(el, cuts)
        elif el.role == "ecliptic_tick" and el.stroke != "none":
            out.append(_tick_clear_of(el, cuts, discs))
        else:
            out.append(el)
    return out


def _tick_clear_of(tick, cuts, discs):
    """An ecliptic tick kept off the discs of ``discs`` ((centre, radius)
    in mm: the dots grown by the labels' margin): one that runs into a dot
    from its foot (a dot on the ecliptic) starts beyond it, and is drawn
    where what is left is a line's least piece (``breaks.MIN_PIECE_MM``),
    or :data:`MIN_TICK_MM` for a fifth degree's tick or a sign's bound; a
    degree's tick that runs into a dot farther on (a dot in the band:
    Antares, #12 review) stops short of it, and is drawn where
    :data:`MIN_TICK_MM` is left from its foot, while a fifth degree's tick
    or a sign's bound runs on through the dot whole, since a pupil counts
    degrees by them (#12 review: Sagittarius's 10, cut short at Antares,
    read as a degree's tick).  A degree's tick whose foot lies in a gap of
    the ecliptic (``cuts``) and that meets no dot would float in the gap,
    and is not drawn.  An undrawn tick keeps its element and ``at``
    (stroke ``none``), as the legibility pass leaves them."""
    foot, tip = tick.geom["from"], tick.geom["to"]
    length = math.dist(foot, tip)
    ux, uy = (tip[0] - foot[0]) / length, (tip[1] - foot[1]) / length
    spans = []
    for (cx, cy), r in discs:
        # where the line from the foot meets the disc: t^2 + 2 b t + c = 0
        fx, fy = foot[0] - cx, foot[1] - cy
        b, c = fx * ux + fy * uy, fx * fx + fy * fy - r * r
        if b * b - c > 0.0:
            root = math.sqrt(b * b - c)
            if -b + root > 0.0 and -b - root < length:
                spans.append((-b - root, -b + root))
    # a degree's tick, not a fifth degree's or a sign's bound, which a pupil counts by
    minor = tick.values["longitude_deg"] % 5 != 0
    start, end = 0.0, length
    for t0, t1 in sorted(spans):
        if t0 <= start:
            start = max(start, t1)
        elif t0 < end and minor:
            end = t0
            break
    if start == 0.0 and end == length:
        if minor and any(box.contains(*foot) for box in cuts):
            return replace(tick, stroke="none")
        return tick
    if end - start < (breaks.MIN_PIECE_MM if minor and start > 0.0 else MIN_TICK_MM):
        return replace(tick, stroke="none")
    return model.segment(tick.role, (foot[0] + ux * start, foot[1] + uy * start),
                         (foot[0] + ux * end, foot[1] + uy * end), tick.stroke, **tick.values)


def rete(ctx: PartContext) -> model.Part:
    s = ctx.hemisphere_sign
    d, w = ctx.dims, ctx.words
    R = d.equator_radius_mm
    eps = ctx.sky.obliquity_rad
    # The film is cut at the plate's edge, a little outside the rim (the
    # outer tropic or beyond, kitgen.sky.rete_rim) that bounds the drawing,
    # so the ecliptic never runs into the cut line.
    els: list[model.Element] = [model.circle("cut", (0.0, 0.0), d.plate_radius_mm, "cut"),
                                model.circle("rim", (0.0, 0.0), d.outer_tropic_radius_mm, "fine",
                                             declination_deg=ctx.sky.rim_deg)]

    ecl_pole = equatorial_vector(-math.radians(270.0), math.pi / 2 - eps)
    image = project_circle(ecl_pole, math.pi / 2, s, R)
    c = np.asarray(image.center_mm)
    # The band is wide enough for the names of the divisions below the
    # ticks' tips at the legible minimum size (5 pt) in every language.
    band = legibility.ecliptic_band_mm(image.radius_mm, d, w)
    els.append(model.circle("ecliptic", c, image.radius_mm, "heavy"))
    els.append(model.circle("ecliptic_band", c, image.radius_mm - band, "light"))

    lons = np.arange(0.0, 360.0, 1.0)
    pts = ecliptic_points_mm(lons, eps, s, R)
    drawn = set(ctx.scales.ecliptic_ticks_deg)  # 1-degree ticks drawn only where they have room
    # Laid out as the mater back's ecliptic scale (kitgen.parts.ring_numbers),
    # from the ecliptic inwards: ticks, the numbers 10 and 20 of each sign,
    # then the sign's name.
    # Each tick runs towards the ecliptic's centre (its direction from
    # each point's own norm, as NumPy rounds it), the tips found at once.
    towards = c - pts
    lengths = [band if lon % 30 == 0 else band * (NUMBERED_TICK if lon % 5 == 0 else SHORT_TICK) for lon in lons]
    tips = pts + towards / np.array([np.linalg.norm(v) for v in towards])[:, None] * np.array(lengths)[:, None]
    for lon, p, tip in zip(lons.tolist(), pts.tolist(), tips.tolist()):
        stroke = ("light" if lon % 5 else "medium") if int(lon) in drawn else "none"  # "none": kept, not drawn
        els.append(model.segment("ecliptic_tick", p, tip, stroke, at=(p[0], p[1]), longitude_deg=lon))
    lift, digits_h = number_row(w, d.small_text_pt, band)
    r_num = image.radius_mm - lift - digits_h / 2
    for lon in ctx.scales.ecliptic_numbers_deg:
        p = pts[int(lon)]   # (whole degrees: the ticks' own points)
        ang = math.degrees(math.atan2(p[1] - c[1], p[0] - c[0]))
        els.append(curves.ring_text("ecliptic_number", w.number(lon % 30), ang, r_num, d.small_text_pt,
                                    center=tuple(c), longitude_deg=float(lon)))
    signs = w.items("zodiac.signs")
    mids = ecliptic_points_mm(np.arange(15.0, 360.0, 30.0), eps, s, R)
    # Each name sits in the inner part of the band, past the numbers (or,
    # in a sign too crowded for them, right past the ticks), and within
    # its own 30 degrees.
    numbered = set(ctx.scales.ecliptic_numbers_deg)
    for k, p in enumerate(mids):
        crowded = not numbered & {30 * k + n for n in SIGN_NUMBERS_DEG}
        tick_tip = lift if crowded else names_from_edge_mm(w, d.small_text_pt, band)
        r_label = image.radius_mm - (tick_tip + band) / 2
        ang = math.degrees(math.atan2(p[1] - c[1], p[0] - c[0]))
        # The name is centred on its sign's middle longitude, which the
        # projection sets nearer one bound than the other (longitudes are
        # not evenly spaced round the ecliptic's centre): its room is twice
        # the nearer side, a degree short of the bound, along the name.
        ends = ecliptic_points_mm(np.array([30.0 * k + 1.0, 30.0 * k + 29.0]), eps, s, R)
        along = np.array([-math.sin(math.radians(ang)), math.cos(math.radians(ang))])
        here = c + r_label * np.array([math.cos(math.radians(ang)), math.sin(math.radians(ang))])
        sides = [abs(float((c + (e - c) * r_label / image.radius_mm - here) @ along)) for e in ends]
        room = 2 * min(sides) - 2 * labels.MARGIN_MM
        els += labels.ring_label("zodiac_label", signs[k], ang, r_label, d.small_text_pt, w, room,
                                 band - tick_tip - 2 * labels.MARGIN_MM, center=tuple(c),
                                 short=ZODIAC_SIGNS[k], longitude_deg=30.0 * k + 15.0)

    # brightest first, and named in that order; but the pole star first of
    # all, which a pupil finds north by (its name beside the pin's mark)
    stars = sorted(ctx.sky.stars, key=lambda st: (st.star.label != POLE_STAR, st.star.mag))
    # (all at once, #12: the projection works element by element)
    all_pts = list(project(-np.radians([st.ra_deg for st in stars]), np.radians([st.dec_deg for st in stars]), s, R))
    # Stars closer than the smallest printed dot is wide are one dot (the
    # brightest's), named once for all of them (#9); the others stay in the
    # geometry, undrawn.  Dots of stars farther apart that would still touch
    # are drawn smaller.
    groups = merged_stars(all_pts)
    radii = dot_radii_mm(all_pts, [star_radius_mm(st.star.mag, d) for st in stars], groups)
    lead = [k for k in range(len(stars)) if groups[k] == k]
    pts = [all_pts[k] for k in lead]
    els = _ecliptic_round_dots(els, tuple(c), image.radius_mm, [(q, radii[k]) for k, q in zip(lead, pts)], d)
    sep = w("page.list_separator")
    names = [sep.join(w.star_name(stars[j].star.label) for j in range(len(stars)) if groups[j] == k) for k in lead]
    # A word of the band on a star's dot slides along the band (#9); a
    # number with nowhere to go is left out, and said in the notes.
    numbered = [e.values["longitude_deg"] for e in els if e.role == "ecliptic_number"]
    els = band_words.clear_of_dots(els, [(q, radii[k]) for k, q in zip(lead, pts)], tuple(c), w,
                                   _slide_range(eps, s, R, tuple(c)),
                                   {30.0 * k + 15.0: ZODIAC_SIGNS[k] for k in range(12)})
    kept = {e.values["longitude_deg"] for e in els if e.role == "ecliptic_number"}
    under_stars = [lon for lon in numbered if lon not in kept]
    pin_box = (-2.5, -2.5, 2.5, 2.5)  # the pin's crosshair
    zodiac_boxes = [labels.element_box_mm(e, w) for e in els if e.role in ("zodiac_label", "ecliptic_number")]
    g = NAME_CLEARANCE_MM
    dot_boxes = [(q[0] - radii[k] - g, q[1] - radii[k] - g, q[0] + radii[k] + g, q[1] + radii[k] + g)
                 for k, q in zip(lead, pts)]
    # A name stands beside its dot, farther out with a leader line where
    # the near places are taken; never on the ecliptic's band, nor on the
    # ink of the band's edge lines, whose width grows with the instrument
    # (#9: no line over a word), nor touching that ink: it keeps the
    # labels' margin from it, as a plate's labels keep from their lines.
    edge_out = stroke_width_mm("heavy", d) / 2 + labels.MARGIN_MM
    edge_in = stroke_width_mm("light", d) / 2 + labels.MARGIN_MM
    tried = {}   # each name's places and their fixed tests, shared by the placings below (#12)
    # The signs' bounds run across the whole band: a leader never runs along one (labels.runs_along)
    bounds = [(e.geom["from"], e.geom["to"], stroke_width_mm(e.stroke, d) / 2) for e in els
              if e.role == "ecliptic_tick" and e.values["longitude_deg"] % 30 == 0 and e.stroke != "none"]

    def place(texts, loose=(), from_marks=False):
        return labels.place_labels(pts, texts, d.small_text_pt, d.tick_mm * 1.3, loose=loose, kept=tried,
                                   from_marks=from_marks,
                                   keep_out=[pin_box] + zodiac_boxes + dot_boxes,
                                   inside_radius_mm=d.outer_tropic_radius_mm - labels.MARGIN_MM,
                                   keep_out_rings=[(tuple(c), image.radius_mm - band - edge_in,
                                                    image.radius_mm + edge_out)],
                                   measure=lambda text, size_pt: _lines_extent(w, text, size_pt),
                                   leaders_from_mm=[radii[k] for k in lead], own_boxes=dot_boxes, marks=[pin_box],
                                   lines_along=bounds)

    places = place(names)
    joined = list(names)   # each dot's names, all of them

    def again(names, places, new):
        """The names without a place given ``new(i, name)`` (None: as they
        are), and placed again where that changed any."""
        renamed = [new(i, name) if where is None else None for i, (where, name) in enumerate(zip(places, names))]
        if all(r is None or r == name for r, name in zip(renamed, names)):
            return names, places
        names = [name if r is None else r for r, name in zip(renamed, names)]
        return names, place(names)

    # A dot of several stars with no room for all their names is named
    # for its brightest alone (Rigil Kentaurus near the southern pole).
    alone = [w.star_name(stars[k].star.label) for k in lead]
    names, places = again(names, places, lambda i, name: alone[i])
    # A name of several words still without a place is set on two lines,
    # about half as long: where the sky is crowded round the pin (the
    # southern retes of low latitudes) a long name finds room there (#12:
    # Rigil Kentaurus, 14 mm on one line on A4, had one place with a
    # leader at 20 S, and went unnamed).
    names, places = again(names, places,
                          lambda i, name: _in_two_lines(w, name, d.small_text_pt) if name == alone[i] else None)
    # A name still without a place is set in its customary short form
    # where the language has one, on one line, then on two (#12: "Rigil
    # Kentaurus", on two lines too, found no room among the south polar
    # stars of any southern A5 rete; "Rigil" over "Kent" does).
    short = [w.star_short_name(stars[k].star.label) for k in lead]
    names, places = again(names, places, lambda i, name: short[i])
    names, places = again(names, places,
                          lambda i, name: _in_two_lines(w, name, d.small_text_pt) if name == short[i] else None)
    # A first-magnitude star still unnamed is named with the looser rule of
    # other dots near its name's ends (labels.LOOSE_BESIDE_OFFSETS) where
    # that names more of the rete's stars (#12 review: Rigil Kentaurus at
    # 23.5 S, the sky's third brightest star).
    bright = [i for i, k in enumerate(lead) if stars[k].star.mag <= LOOSE_MAG]
    loose = [i for i in bright if places[i] is None]
    if loose:
        loosely = place(names, loose)

        def named(found):   # the first-magnitude stars named, then all the stars named
            return sum(found[i] is not None for i in bright), sum(p is not None for p in found)

        if named(loosely) > named(places):
            places = loosely
    # The pole star still unnamed is named beside the pin's crosshair as
    # the mark's (read from its edge, not from the dot under it), with the
    # looser reaches of a first-magnitude star, where that names it without
    # naming fewer first-magnitude stars (#12: a long name, "Полярная",
    # 8 mm, on an A5 rete stood 2.8 mm from its dot and so nearer no other
    # dot by the rule's half millimetre; on a Letter rete at 0.3 N Mirfak's
    # dot stood 3.11 mm past the name's end, the strict reach 3.12 mm).
    # Its name on one line first, then as the searches above set it.
    pole = [i for i, k in enumerate(lead) if stars[k].star.label == POLE_STAR and places[i] is None]
    forms = [f for name in ([alone[pole[0]], short[pole[0]]] if pole else []) if name
             for f in (name, _in_two_lines(w, name, d.small_text_pt))]
    for form in dict.fromkeys(forms):
        tried_names = [form if i == pole[0] else name for i, name in enumerate(names)]
        marked = place(tried_names, sorted(set(loose) | {pole[0]}), from_marks=True)
        if marked[pole[0]] is not None and sum(marked[i] is not None for i in bright) >= \
                sum(places[i] is not None for i in bright):
            names, places = tried_names, marked
            break
    where_of = dict(zip(lead, places))
    for k, (placed, p) in enumerate(zip(stars, all_pts)):
        first = groups[k]
        together = [stars[j].star.label for j in range(len(stars)) if groups[j] == first and j != first]
        extra = {"with_stars": together} if first == k and together else {}
        if first != k:
            extra = {"merged_into": stars[first].star.label}
        els.append(model.point("star", p, "heavy" if first == k else "none", name=placed.star.label,
                               ra_deg=placed.ra_deg, dec_deg=placed.dec_deg, mag=placed.star.mag,
                               radius_mm=radii[k], **extra))
        where = where_of.get(k)
        if first == k and where is not None:
            at, anchor, leader = where
            i = lead.index(k)
            text = names[i]
            whole = text.replace("\n", " ")   # a name set on two lines (_in_two_lines)
            names_k = [placed.star.label] + (together if whole == joined[i] != alone[i] else [])
            more = {"names": names_k} if len(names_k) > 1 else {}
            lines = text.split("\n")
            # the whole label, as kitgen.parts.labels.fitted_text keeps it: the name a short form stands for
            full = alone[i] if whole == short[i] != alone[i] else whole
            if len(lines) == 1:
                if full != text:
                    more["full_text"] = full
                els.append(model.text("star_label", at, text, d.small_text_pt, anchor=anchor,
                                      name=placed.star.label, **more))
            else:   # each line an element, as kitgen.parts.labels.fitted_text sets them
                for line, off in zip(lines, _line_offsets_mm(w, lines, d.small_text_pt)):
                    els.append(model.text("star_label", (at[0], at[1] + off), line, d.small_text_pt, anchor=anchor,
                                          name=placed.star.label, full_text=full, **more))
            if leader is not None:
                els.append(model.segment("star_leader", leader[0], leader[1], "fine", name=placed.star.label))
    els.append(model.point("pin", (0.0, 0.0), hole="centre"))
    r = d.plate_radius_mm
    values = {"ecliptic_numbers_under_stars_deg": under_stars} if under_stars else {}
    return model.Part("rete", "film", tuple(els), (-r, -r, r, r), values, w("rete.title"))


def _in_two_lines(w, name: str, size_pt: float) -> str:
    """``name`` broken at the space that makes its longer line shortest
    (measured), the lines joined by a newline; the name as it is where
    it is one word."""
    words = name.split(" ")
    if len(words) < 2:
        return name
    splits = [(" ".join(words[:k]), " ".join(words[k:])) for k in range(1, len(words))]
    first, second = min(splits, key=lambda two: max(w.measure(part, size_pt).width_mm for part in two))
    return first + "\n" + second


def _lines_extent(w, text: str, size_pt: float) -> Extent:
    """The extent of ``text``, on as many lines as it has newlines, as
    they are set about its middle (:func:`kitgen.words.fit.line_offsets_mm`):
    the widest line, and twice the farther reach of the lines' ink from
    the middle, so that the box a label is placed by, centred there,
    holds every line."""
    lines = text.split("\n")
    if len(lines) == 1:
        return w.measure(text, size_pt)
    ext = [w.measure(line, size_pt) for line in lines]
    reach = max(abs(off) + e.height_mm / 2 for off, e in zip(_line_offsets_mm(w, lines, size_pt), ext))
    return Extent(max(e.width_mm for e in ext), 2 * reach, 0.0)


def _line_offsets_mm(w, lines, size_pt: float) -> list[float]:
    """Offsets (mm, upwards) of the middles of a name's ``lines`` about
    its middle, as :func:`kitgen.parts.labels.fitted_text` sets a label's
    lines (by its first line's height)."""
    return line_offsets_mm(len(lines), w.measure(lines[0], size_pt).height_mm)


def _slide_range(eps, s, R, center):
    """``range(el) -> (low, high)``: the degrees about the ecliptic's
    centre through which a word of the band may turn: a sign's name within
    its sign (a degree short of its bounds), a number within
    kitgen.parts.band_words.NUMBER_SLIDE_DEG of its tick."""

    def angle_deg(lon):
        p = ecliptic_points_mm(np.array([float(lon)]), eps, s, R)[0]
        return math.degrees(math.atan2(p[1] - center[1], p[0] - center[0]))

    def turn(a, b):
        return (b - a + 180.0) % 360.0 - 180.0

    def slide(el):
        lon = el.values["longitude_deg"]
        reach = 14.0 if el.role == "zodiac_label" else band_words.NUMBER_SLIDE_DEG
        here = angle_deg(lon)
        ends = (turn(here, angle_deg(lon - reach)), turn(here, angle_deg(lon + reach)))
        return min(ends), max(ends)

    return slide


def merged_stars(points_mm) -> list[int]:
    """For each star (brightest first) the index of the star whose dot it
    is drawn as: its own, or the first brighter one whose centre is closer
    to it than the smallest printed dot is wide (2 x
    :data:`~kitgen.geometry.style.MIN_DOT_RADIUS_MM`): two such dots could
    not be printed apart at any size, so they read as one star (alpha
    Centauri A and B, Rigil Kentaurus and Toliman, 0.0003 deg apart).
    Stars farther apart keep their own dots and names, however small the
    rete (Hadar, 4 deg from Rigil Kentaurus, some 0.8 mm on an 80 mm
    southern kit)."""
    out = []
    for k, p in enumerate(points_mm):
        out.append(next((j for j in range(k) if out[j] == j and
                         math.hypot(p[0] - points_mm[j][0], p[1] - points_mm[j][1]) < 2 * MIN_DOT_RADIUS_MM), k))
    return out


def dot_radii_mm(points_mm, radii_mm, groups) -> list[float]:
    """The radius (mm) each star's dot is drawn at: its own
    (kitgen.geometry.style.star_radius_mm), made smaller where it would
    touch the dot of another drawn star (``groups`` from
    :func:`merged_stars`), the pair sharing the distance between their
    centres in proportion to their radii, never below the smallest dot.
    Brightest first, so a later pair only ever shrinks a dot further; the
    merging rule keeps every pair at least two smallest dots apart, so the
    floor never makes two dots meet."""
    out = list(radii_mm)
    drawn = [k for k, g in enumerate(groups) if g == k]
    for a, j in enumerate(drawn):
        for k in drawn[a + 1:]:
            dist = math.hypot(points_mm[k][0] - points_mm[j][0], points_mm[k][1] - points_mm[j][1])
            if dist >= out[j] + out[k]:
                continue
            fainter = max(MIN_DOT_RADIUS_MM, dist * out[k] / (out[j] + out[k]))
            out[j], out[k] = min(out[j], dist - fainter), fainter
    for k, g in enumerate(groups):
        if g != k:
            out[k] = out[g]
    return out


def rim_notes(plan) -> tuple[Message, ...]:
    """The build's note naming the bright stars that rise well above the
    horizon at the kit's latitudes but lie beyond the rim (#9), with the
    ``rete_limit_deg`` that brings them in (kitgen.sky.rete_rim)."""
    beyond = plan.sky.beyond_rim
    if not beyond or "rete" not in plan.parts:
        return ()
    value = rim_for_stars_deg([p.dec_deg for p in beyond], plan.hemisphere_sign)
    if abs(value) > MAX_RIM_DEG:
        beyond = [p for p in beyond if abs(rim_for_stars_deg([p.dec_deg], plan.hemisphere_sign)) <= MAX_RIM_DEG]
        if not beyond:
            return ()
        value = rim_for_stars_deg([p.dec_deg for p in beyond], plan.hemisphere_sign)
    return (Message("notes.stars_beyond_rim", part=legibility.PART_NAMES["rete"],
                    stars=[plan.words.star_name(p.star.label) for p in beyond],
                    rim=Number(round(plan.sky.rim_deg, 1)),
                    value=f"{value:g}"),)   # as a recipe writes it, to be copied into one: never native digits

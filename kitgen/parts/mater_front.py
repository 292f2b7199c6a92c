"""The mater's front: the limb with its 24-hour ring and degree ring.

The hour ring shows local apparent solar time with noon at the top: the
rule laid over the Sun's place on the rete reads the hour at the ring.  An
hour H lies at hour angle h = 15 (H - 12) deg from the noon line, turned
clockwise for a northern instrument and counter-clockwise for a southern
one (see kitgen.projection.stereographic for the frame).
"""

from __future__ import annotations

import math

from ..geometry import model
from ..geometry.style import stroke_width_mm
from . import breaks, curves, labels, turned_numbers
from .context import PartContext
from .turned_numbers import reads_as_another_turned
from .plate import key_tab_mm, keyed


def hour_angle_deg(hour: float, sign: int) -> float:
    """Direction (degrees ccw from +x) of local apparent solar time ``hour``."""
    return 90.0 - sign * 15.0 * (hour - 12.0)


def upright_hour_label(w, hour: int, sign: int, r_tips_mm: float, r_ring_mm: float, size_pt: float,
                       clear_mm: float = 0.0):
    """The numeral of ``hour``, upright (never turned, so a 6 cannot be
    read as a 9 however the instrument is held: #9), centred on the hour's
    ray between the longest ticks' tips (``r_tips_mm``) and the ring's outer
    circle, as far out as its measured box allows: the box's farthest
    corner (not only its extent along the ray) stays ``clear_mm`` inside
    the circle where the tips leave room (#9: no line over a word)."""
    text = w.number(hour)
    ext = w.measure(text, size_pt)
    a = math.radians(hour_angle_deg(hour, sign))
    half = abs(math.cos(a)) * ext.width_mm / 2.0 + abs(math.sin(a)) * ext.height_mm / 2.0   # along the ray
    room = r_ring_mm - r_tips_mm
    gap = max(0.0, min(0.3 * (room - 2.0 * half), 0.6))
    # A corner at r u + c (|c|^2 = q, u . c <= half) lies at most
    # sqrt(r^2 + 2 r half + q) from the centre.
    limit = r_ring_mm - clear_mm
    q = (ext.width_mm ** 2 + ext.height_mm ** 2) / 4.0
    r_fit = -half + math.sqrt(max(half * half - q + limit * limit, 0.0))
    r = (max(r_tips_mm + half, min(r_ring_mm - half - gap, r_fit)) if room >= 2.0 * half
         else (r_tips_mm + r_ring_mm) / 2.0)
    return model.text("hour_label", (r * math.cos(a), r * math.sin(a)), text, size_pt, 0.0, hour=hour)


#: The least paper (mm) between an hour tick's end and its numeral's box
#: (which holds the glyphs' side bearings too): with less, the tick's
#: end reads as touching the figure at the 5 pt minimum.
TIP_CLEAR_MM = 0.15


def _tip_below_mm(w, label: model.Element, half_width_mm: float) -> float:
    """How far out (mm from the centre) an hour tick ``half_width_mm``
    half wide may reach on its numeral's ray before its square end meets
    the numeral's box (its ink and advance: kitgen.parts.breaks); infinite
    where it never would: the least distance along the ray of the box's
    part within the tick's width (the box clipped to that strip,
    Sutherland and Hodgman, "Reentrant polygon clipping", CACM 17, 1974).
    On a small mater (80 to 130 mm across) a numeral stands as far out
    as the ring lets it (upright_hour_label), which may leave it hard by
    its tick's end, or, a two-figure one near the horizontal, over it:
    its own tick stops :data:`TIP_CLEAR_MM` short of its box, up to a few
    tenths shorter than the others, where it had touched a figure."""
    x, y = label.geom["at"]
    r = math.hypot(x, y)
    u, n = (x / r, y / r), (-y / r, x / r)
    points = breaks.text_box(label, w).corners()
    for sign in (1.0, -1.0):   # keep sign * (p . n) <= half_width_mm
        beyond = [sign * (p[0] * n[0] + p[1] * n[1]) - half_width_mm for p in points]
        kept = []
        for k, p in enumerate(points):
            q, dp, dq = points[k - 1], beyond[k], beyond[k - 1]
            if (dp <= 0.0) != (dq <= 0.0):
                f = dq / (dq - dp)
                kept.append((q[0] + f * (p[0] - q[0]), q[1] + f * (p[1] - q[1])))
            if dp <= 0.0:
                kept.append(p)
        points = kept
    return min((p[0] * u[0] + p[1] * u[1] for p in points), default=math.inf)


def hang_hole(dims) -> model.Element:
    """The hole for the plumb's thread at the top of the mater (#9), cut
    through both faces at the same point (kitgen.parts.dimensions): hung
    from a loop of thread through it, the instrument hangs upright while
    the Sun's altitude is taken."""
    y, radius = dims.hang_hole_mm
    return model.circle("hang_hole", (0.0, y), radius, "cut")


def key_slot(d, w) -> list[model.Element]:
    """The slot for the plate's key (kitgen.parts.plate.key_tab_mm), cut
    across the key halfway along it, in the gap between the plate and the
    hour ring, and its name."""
    tw, tl = key_tab_mm(d)
    y = -(d.plate_radius_mm + 0.5 * tl)
    out = [model.segment("cut", (-(tw / 2 + 0.5), y), (tw / 2 + 0.5, y), "cut", purpose="key_slot")]
    # Named just inside the plate's circle, which covers it once built,
    # as near the slot as the chord leaves room for the words (#9).
    ext = w.measure(w("mater_front.key_slot"), d.small_text_pt)
    h, half = ext.height_mm + 0.1, ext.width_mm / 2 + labels.MARGIN_MM
    rp = d.plate_radius_mm
    y_in = min(rp - labels.MARGIN_MM, math.sqrt(max(rp ** 2 - half ** 2, 0.0))) - h / 2
    out += labels.fitted_text("key_slot_label", (0.0, -y_in), w("mater_front.key_slot"), d.small_text_pt, w,
                              2 * math.sqrt(rp ** 2 - (y_in + h / 2) ** 2) - 2 * labels.MARGIN_MM, h,
                              optional=True)
    return out


#: Clear paper (mm) an underline of the degree ring (kitgen.parts.turned_numbers)
#: keeps from the long ticks' tips, else it is left out: as much as from
#: its own digits.
UNDERLINE_CLEAR_MM = turned_numbers.UNDERLINE_GAP_MM


def mater_front(ctx: PartContext) -> model.Part:
    d, w = ctx.dims, ctx.words
    s = ctx.hemisphere_sign
    r_in, r_mid, r_out = d.limb_inner_radius_mm, d.hour_ring_outer_mm, d.mater_radius_mm
    ring = r_mid - r_in
    els = [model.circle("cut", (0.0, 0.0), r_out, "cut"),
           model.circle("limb", (0.0, 0.0), r_in, "heavy"),
           model.circle("limb", (0.0, 0.0), r_mid, "medium")]
    clear = labels.MARGIN_MM + stroke_width_mm("medium", d) / 2
    hours = [upright_hour_label(w, hour, s, r_in + 0.42 * ring, r_mid, d.text_pt, clear) for hour in range(24)]
    for step in range(24 * 12):
        hour = step / 12.0
        minutes = step * 5
        if minutes % 60 == 0:
            tip = _tip_below_mm(w, hours[step // 12], stroke_width_mm("medium", d) / 2 + TIP_CLEAR_MM) - TIP_CLEAR_MM
            length, stroke = min(0.42 * ring, tip - r_in), "medium"
        elif minutes % 30 == 0:
            length, stroke = 0.30 * ring, "light"
        elif minutes % 15 == 0:
            length, stroke = 0.22 * ring, "light"
        else:
            length, stroke = 0.12 * ring, "fine"
        if minutes % ctx.scales.hour_tick_minutes:
            stroke = "none"  # thinned at this size (kitgen.parts.legibility): kept, not drawn
        els.append(curves.radial_tick("hour_tick", hour_angle_deg(hour, s), r_in, r_in + length, r_in, stroke,
                                      hour=hour))
    els += hours
    deg_ring = r_out - r_mid
    for deg in range(360):
        length = deg_ring * (0.45 if deg % 15 == 0 and deg else 0.28 if deg % 5 == 0 else 0.16)
        stroke = "light" if deg % 5 == 0 else "fine"
        if deg % ctx.scales.degree_tick_deg:
            stroke = "none"  # thinned at this size (kitgen.parts.legibility): kept, not drawn
        els.append(curves.radial_tick("degree_tick", 90.0 - s * deg, r_mid, r_mid + length, r_mid, stroke,
                                      degree=deg))
    # On a small instrument a numeral is taller than the ring leaves room
    # for past the hour ticks' tips: the ring's outer circle is broken
    # round it, as the plate's lines are (kitgen.parts.breaks; #9: no line
    # over a word).  The ticks are left whole: a tick's root is the
    # reading.
    boxes = [b for b in (breaks.text_box(e, w) for e in hours)
             if max(math.hypot(*c) for c in b.corners()) > r_mid - clear + 1e-9]
    rim = [e for e in els if e.role == "limb" and e.geom["radius"] == r_mid]
    els = [e for e in els if not any(e is o for o in rim)]
    els += breaks.break_around(rim, boxes, labels.MARGIN_MM, lambda stroke: stroke_width_mm(stroke, d))
    for deg in range(15, 360, 15):   # at 0, the top, the hang hole stands instead
        label = curves.ring_text("degree_label", w.number(deg), 90.0 - s * deg, r_mid + 0.7 * deg_ring,
                                 d.small_text_pt, degree=deg)
        els.append(label)
        if reads_as_another_turned(label.geom["text"]):   # 90 on its side turned reads 06
            mark = turned_numbers.underline("degree_label_underline", label, w, stroke_width_mm("light", d),
                                            degree=deg)
            # towards the centre, clear of the long ticks' tips (on a small kit there is no room)
            reach = min(math.hypot(*mark.geom["from"]), math.hypot(*mark.geom["to"])) - stroke_width_mm("light", d)
            if reach - (r_mid + 0.45 * deg_ring) >= UNDERLINE_CLEAR_MM:
                els.append(mark)
    if keyed(ctx.plan):   # no slot through a duplex card (kitgen.parts.plate.keyed)
        els += key_slot(d, w)
    els.append(hang_hole(d))
    els.append(model.point("pin", (0.0, 0.0), hole="centre"))
    r = r_out
    return model.Part("mater_front", "card", tuple(els), (-r, -r, r, r), {}, w("mater_front.title"))

"""The owner's name (#9), added to a part that was drawn without it.

Whose kit it is stands small on every part, so a class's parts do not get
mixed up.  The plate, the rete and both faces of the mater are drawn
first without the name and the name is then set into room the finished
part leaves free: so a class set (#12) draws those parts once for all the
pupils of a school and only adds each pupil's name
(:func:`kitgen.kit.build_from_plan`).  The rule and the alidade, which
keep half an arm for the name, are cheap and simply drawn with it.

:data:`ADD_OWNER` maps a part's kind to its function ``(part, ctx) ->
part``; each returns the part itself when the plan has no owner, and
the part with the name among its words left out (:func:`left_out`)
when no room is free.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from ..geometry import model
from ..geometry.style import stroke_width_mm
from . import breaks, curves, labels
from .context import PartContext
from .mater_back import inner_words
from .plate_labels import midpoint, points_along
from .rete import NAME_CLEARANCE_MM

#: The pin's crosshair, kept clear of every word (mm).
PIN_BOX_MM = (-2.5, -2.5, 2.5, 2.5)


def _before_pin(part: model.Part, new) -> model.Part:
    """``part`` with the elements ``new`` drawn just before its closing
    pin mark (the last element of every circular part)."""
    if not new:
        return part
    els = part.elements
    k = len(els) - 1 if els and els[-1].role == "pin" else len(els)
    return replace(part, elements=tuple(els[:k]) + tuple(new) + tuple(els[k:]))


#: The owner's line on a plate (its slot) is this many plate radii wide
#: where the drawing leaves room, whatever the name: the shared plate's
#: lines are broken round the whole slot, so that every pupil's plate of
#: a school shares them (#12); the name is fitted into it, and the lines'
#: pieces in the slot clear of the name are drawn with the name.
SLOT_RADII = 0.5
#: ... and never narrower than this share of the latitude label's width.
SLOT_LEAST = 0.6
#: Where the places by the latitude label are narrower than this (mm), a
#: small plate's, the slot goes to a free row of the plate this wide (or
#: :data:`SLOT_RADII`, if wider), if there is one: room for a long name,
#: some 26 letters at the 5 pt minimum, a first name and a double surname
#: such as "Amélie Beauchamp-Lefèvre" (22 mm), whole (#9).
LONG_NAME_MM = 25.0
#: ... and this many times as high as the label's ink at the name's size:
#: room for a name's capitals, accents and descenders whatever the label's
#: letters are (a label's height is that of its ink, kitgen.words.measure).
SLOT_HEIGHTS = 1.5
#: Another word at either end of the slot, on its row, keeps this many
#: slot heights from it: closer, the two read as one phrase, as a name
#: set just after a tropic's label reads "Tropic of Cancer  Ann Lee"
#: (common practice in map lettering: different features' names stand
#: further apart than the spaces within a name).
APART_HEIGHTS = 2.0


def plate_slot(part: model.Part, ctx: PartContext) -> model.Part:
    """The plate with room for an owner's name, whatever the name: a line
    under the plate's latitude label, or over it, left-aligned with it or
    mirrored across the meridian, :data:`SLOT_RADII` plate radii wide (at
    least :data:`LONG_NAME_MM`) or as far as the drawing's edge if that is
    nearer (but not narrower than :data:`SLOT_LEAST` labels): the widest
    of those places clear of every word and of the pin (:data:`MARGIN_MM`
    apart), the first of them at equal width; where that is narrower than
    :data:`LONG_NAME_MM`, a free row of the plate that wide off its named
    curves (:func:`_free_row_off_named_curves`), if there is one; with no
    place by the label, the widest free row.  The plate's lines are
    broken round that line as round every other word.  The slot, ``(x,
    y, anchor, width, height)`` in mm, is in the part's values under
    ``owner_slot``; a plate with no such room is returned as it is."""
    d, w = ctx.dims, ctx.words
    texts = [e for e in part.elements if e.shape == "text"]
    lines = [e for e in texts if e.role == "plate_label"]
    if not lines:
        return part
    m, size = labels.MARGIN_MM, d.small_text_pt
    boxes = [labels.element_box_mm(e, w) for e in lines]
    height = SLOT_HEIGHTS * w.measure(lines[0].geom["text"], size).height_mm
    disc = d.outer_tropic_radius_mm
    x = lines[0].geom["at"][0]
    top, bottom = max(b[3] for b in boxes), min(b[1] for b in boxes)
    least = SLOT_LEAST * max(b[2] - b[0] for b in boxes)
    most = max(SLOT_RADII * d.plate_radius_mm, LONG_NAME_MM)
    rim = disc - 2 * m - stroke_width_mm("heavy", d)   # the slot's break stops short of the rim
    words = [labels.element_box_mm(e, w) for e in texts]
    # With every other word kept apart from the name (APART_HEIGHTS along
    # its row, a slot's height above and below); where a small plate
    # leaves no such room for a long name, with the margin alone, if that
    # gives a wider one: the name is on every plate.
    apart = max(0.0, APART_HEIGHTS * height - m)
    flats = _flat_stretches(part, height)
    best = None
    for taken in ([_widened(b, apart, 0.0 if e.role == "plate_label" else height) for b, e in zip(words, texts)],
                  words):
        taken = taken + [PIN_BOX_MM]
        found = _slot_by_label((x, top, bottom), height, taken, rim, (least, most))
        if found is None or found[3] < LONG_NAME_MM:
            row = _free_row_off_named_curves(lines[0].geom["at"][1], (bottom, top), height,
                                             taken + flats, rim, (least, most), part, d)
            if row is not None and (found is None or row[3] >= LONG_NAME_MM):
                found = row
        if found is not None and (best is None or found[3] > best[3]):
            best = found
        if best is not None and best[3] >= LONG_NAME_MM:
            break
    if best is None:
        return part
    slot = _slot_box(best)
    strokes = [e for e in part.elements if e.shape != "text" and e.role != "pin"]
    broken = breaks.break_around(strokes, [slot], m, lambda stroke: stroke_width_mm(stroke, d))
    rest = [e for e in part.elements if e.shape == "text" or e.role == "pin"]
    return replace(part, elements=tuple(broken) + tuple(rest), values={**part.values, "owner_slot": best})


def _slot_by_label(label: tuple, height: float, taken: list, rim: float, widths: tuple):
    """:func:`plate_slot`'s places by the latitude label (``label``: its
    lines' x, top and bottom, mm): under it, else over it, left-aligned
    with it or mirrored across the meridian, the widest clear of every
    box of ``taken`` by :data:`MARGIN_MM`, or None."""
    m = labels.MARGIN_MM
    x, top, bottom = label
    least, most = widths
    best = None
    for y in (bottom - m - height / 2, top + m + height / 2):
        reach = rim ** 2 - (abs(y) + height / 2) ** 2
        width = min(most, math.sqrt(max(reach, 0.0)) - abs(x))   # to the drawing's edge, at most
        if width < least or (best is not None and width <= best[3]):
            continue
        for sx, anchor in ((x, "start"), (-x, "end")):
            x0 = sx if anchor == "start" else sx - width
            box = (x0 - m, y - height / 2 - m, x0 + width + m, y + height / 2 + m)
            if not any(labels.boxes_meet(box, t) for t in taken):
                best = (sx, y, anchor, width, height)
                break
    return best


def _widened(box: tuple, along_mm: float, across_mm: float = 0.0) -> tuple:
    """An axis-aligned box (x0, y0, x1, y1) made ``along_mm`` longer at
    each end of its row and ``across_mm`` higher above and below."""
    return (box[0] - along_mm, box[1] - across_mm, box[2] + along_mm, box[3] + across_mm)


#: The plate's named curves: a name in a free row keeps off them where it
#: can (#9: a tropic or a twilight line broken for a name reads wrong),
#: crossing only the thin grid and the straight meridian and east-west
#: line; and off the horizon always, the line of every rising, setting
#: and altitude read on the plate.
NAMED_CURVES = ("horizon", "equator", "tropic", "twilight")


def _free_row_off_named_curves(label_y: float, label_rows: tuple, height: float, taken: list, rim: float,
                               widths: tuple, part: model.Part, d):
    """:func:`_free_row` off the plate's :data:`NAMED_CURVES` (each
    sampled every :data:`MARGIN_MM`, with half its width); off the
    horizon alone where no row off them all is :data:`LONG_NAME_MM`
    wide and a row off the horizon is wider."""
    def off(roles):
        points = np.array([(x, y, stroke_width_mm(e.stroke, d) / 2) for e in part.elements
                           if e.role in roles and e.stroke not in ("none", "cut")
                           for x, y, _ in points_along(e, midpoint(e), step_mm=labels.MARGIN_MM, reach_mm=1e4)])
        return _free_row(label_y, label_rows, height, taken, rim, widths, points.reshape(-1, 3))

    row = off(NAMED_CURVES)
    if row is None or row[3] < LONG_NAME_MM:
        across = off(("horizon",))
        if across is not None and (row is None or across[3] > row[3]):
            return across
    return row


def _free_row(label_y: float, label_rows: tuple, height: float, taken: list, rim: float, widths: tuple,
              points=None):
    """Where :func:`plate_slot`'s places by the label are taken or narrow
    (a small plate): the rows ``height`` mm high, a row every
    :data:`MARGIN_MM`, from the label's towards the plate's centre and on across it, each
    with its widest stretch inside ``rim`` (mm) clear of every box of
    ``taken`` and of the ``points`` (an array of x, y and half a line's
    width, if any); the slot in the first stretch ``widths[1]`` wide, else in
    the widest at least ``widths[0]`` wide (as near the meridian as the
    stretch allows, at most ``widths[1]`` wide), or None."""
    m = labels.MARGIN_MM
    least, most = widths
    inward = 1.0 if label_y <= 0 else -1.0   # from the label towards the centre
    y = label_rows[0] - m - height / 2 if inward > 0 else label_rows[1] + m + height / 2
    best = None
    while abs(y) + height / 2 < rim or y * inward < 0:
        gap = _widest_gap(y, height, taken, rim, points)
        if gap is not None and gap[1] >= least and (best is None or gap[1] > best[0][1]):
            best = (gap, y)
            if gap[1] >= most:
                break
        y += inward * m
    if best is None:
        return None
    (x0, room), y = best
    width = min(room, most)
    return (min(max(x0, -width / 2), x0 + room - width), y, "start", width, height)


def _flat_stretches(part: model.Part, height: float) -> list[tuple]:
    """Boxes (mm) round the top and bottom of each circle and arc of the
    plate, as far along as the curve keeps within ``height`` of its
    extreme point (half width sqrt(2 r h)): a name set there would lie
    along the line, beside its own name, and read as the line's name."""
    out = []
    for e in part.elements:
        if e.shape not in ("circle", "arc") or e.stroke in ("none", "cut"):
            continue
        (cx, cy), r = e.geom["center"], e.geom["radius"]
        half = math.sqrt(2.0 * r * height)
        for angle, y in ((90.0, cy + r), (270.0, cy - r)):
            if e.shape == "arc" and (angle - e.geom["start_deg"]) % 360.0 > e.geom["end_deg"] - e.geom["start_deg"]:
                continue
            out.append((cx - half, y - height, cx + half, y + height))
    return out


def _widest_gap(y: float, height: float, taken: list, rim: float, points=None):
    """The widest stretch ``(x0, width)`` in mm of the row centred at ``y``,
    ``height`` high, inside the circle of radius ``rim`` and clear of
    every box of ``taken`` and every point of ``points`` (an array of x,
    y and how much each is grown) by :data:`MARGIN_MM`; None outside the
    circle."""
    m, half = labels.MARGIN_MM, height / 2
    reach = rim ** 2 - (abs(y) + half) ** 2
    if reach <= 0:
        return None
    edge = math.sqrt(reach)
    spans = [(t[0] - m, t[2] + m) for t in taken if t[1] - m < y + half and t[3] + m > y - half]
    if points is not None:
        near = points[np.abs(points[:, 1] - y) < half + points[:, 2] + m]
        spans += zip((near[:, 0] - near[:, 2] - m).tolist(), (near[:, 0] + near[:, 2] + m).tolist())
    spans.sort()
    best, x = None, -edge
    for lo, hi in spans + [(edge, edge)]:
        if min(lo, edge) - x > (best[1] if best else 0.0):
            best = (x, min(lo, edge) - x)
        x = max(x, hi)
    return best


def plate_owner(part: model.Part, ctx: PartContext, whole: model.Part | None = None) -> model.Part:
    """The name fitted into the plate's slot (:func:`plate_slot`), if it
    has one, and the pieces of ``whole``'s lines (the plate before its
    slot was cut) that run in the slot clear of the name, drawn again
    (values ``beside_owner``): the lines are then broken round the name
    alone, as round every other word."""
    slot = part.values.get("owner_slot")
    if not ctx.plan.owner:
        return part
    if slot is None:
        return left_out(part, ctx.plan.owner)
    d, w = ctx.dims, ctx.words
    x, y, anchor, width, height = slot
    names = labels.fitted_text("owner", (x, y), ctx.plan.owner, d.small_text_pt, w, width, height, anchor=anchor)
    pieces = []
    if whole is not None:
        m = labels.MARGIN_MM
        box, name_boxes = _slot_box(slot), [breaks.text_box(e, w) for e in names]
        for el in whole.elements:
            if el.shape in ("text", "point") or el.role == "pin" or el.stroke in ("none", "cut", "fold"):
                continue
            grow = m + stroke_width_mm(el.stroke, d) / 2
            pieces += [replace(piece, values={**piece.values, "beside_owner": True})
                       for piece in breaks.pieces_within(el, box.grown(grow), [b.grown(grow) for b in name_boxes])]
    return _before_pin(part, pieces + names)


def _slot_box(slot) -> breaks.Box:
    """The box of a plate's owner slot ``(x, y, anchor, width, height)``."""
    x, y, anchor, width, height = slot
    return breaks.Box((x + width / 2 if anchor == "start" else x - width / 2, y), 0.0, width / 2, height / 2)


def rete_owner(part: model.Part, ctx: PartContext) -> model.Part:
    """The name along the inside of the rete's rim, at the first of a few
    places round it (bottom first) where it meets no star's dot, name or
    leader and keeps off the ecliptic's band."""
    owner = ctx.plan.owner
    if not owner:
        return part
    d, w = ctx.dims, ctx.words
    m, size = labels.MARGIN_MM, d.small_text_pt
    g = NAME_CLEARANCE_MM
    taken = []
    for e in part.elements:
        if e.role == "star" and e.stroke != "none":
            (x, y), r = e.geom["at"], e.values["radius_mm"]
            taken.append((x - r - g, y - r - g, x + r + g, y + r + g))
        elif e.shape == "text":
            taken.append(labels.element_box_mm(e, w))
        elif e.role == "star_leader":
            (x0, y0), (x1, y1) = e.geom["from"], e.geom["to"]
            taken.append((min(x0, x1), min(y0, y1), max(x0, x1), max(y0, y1)))
    ecliptic = next(e for e in part.elements if e.role == "ecliptic")
    inner = next(e for e in part.elements if e.role == "ecliptic_band")
    ring = (tuple(ecliptic.geom["center"]), inner.geom["radius"] - m, ecliptic.geom["radius"] + m)
    rim = d.outer_tropic_radius_mm
    ext = w.measure(owner, size)
    width, h = min(ext.width_mm, rim), ext.height_mm
    r_text = math.sqrt((rim - m) ** 2 - (width / 2) ** 2) - h / 2 - m
    for angle in (-90.0, 90.0, -135.0, -45.0, 135.0, 45.0, 180.0, 0.0):
        spot = curves.ring_text("owner", owner, angle, r_text, size)
        els = labels.fitted_text("owner", spot.geom["at"], owner, size, w, width, h * 1.05, spot.geom["angle_deg"])
        boxes = [labels.element_box_mm(e, w) for e in els]
        if any(labels.boxes_meet(b, t) for b in boxes for t in taken) or \
                any(labels.meets_ring(b, ring) for b in boxes):
            continue
        return _before_pin(part, els)
    return left_out(part, owner)


def left_out(part: model.Part, owner: str) -> model.Part:
    """``part`` with the owner's name among the words it leaves out for
    want of room (values ``labels_left_out``), which the kit's notes
    then name (kitgen.parts.legibility.shortened_notes)."""
    return replace(part, values={**part.values, "labels_left_out": (*part.values.get("labels_left_out", ()), owner)})


def mater_front_owner(part: model.Part, ctx: PartContext) -> model.Part:
    """The name in the front's blank middle, which the plate covers."""
    if not ctx.plan.owner:
        return part
    d = ctx.dims
    y, h = 0.5 * d.plate_radius_mm, 3.0 * d.tick_mm
    room = 2 * (d.plate_radius_mm ** 2 - (y + h / 2) ** 2) ** 0.5
    return _before_pin(part, labels.fitted_text("owner", (0.0, y), ctx.plan.owner, d.small_text_pt, ctx.words,
                                                room, h))


def mater_back_owner(part: model.Part, ctx: PartContext) -> model.Part:
    """The name under the title, inside the back's inner ring, fitted to
    that ring's chord (kitgen.parts.mater_back.inner_words)."""
    if not ctx.plan.owner:
        return part
    els = inner_words("owner", OWNER_ROW, ctx.plan.owner, ctx.dims.small_text_pt, ctx.words,
                      part.values["words_radius_mm"])
    k = next((i for i, e in enumerate(part.elements) if e.role == "hang_hole"), len(part.elements))
    return replace(part, elements=part.elements[:k] + tuple(els) + part.elements[k:])


#: Where the back's owner line stands: its centre and height as fractions
#: of the radius of the ring inside which the back's words stand.
OWNER_ROW = (0.76, 0.09)

ADD_OWNER = {
    "plate": plate_owner,
    "rete": rete_owner,
    "mater_front": mater_front_owner,
    "mater_back": mater_back_owner,
}

"""The rule: the pointer turned over the front to read the hour ring.

Its fiducial edge is a straight line through the pin; laid across the
Sun's place on the rete it reads local apparent solar time at the ring.
The body lies on one side of that edge so the edge itself is a cut line.
"""

from __future__ import annotations

from ..geometry import model, style
from . import labels
from .context import PartContext
from .outline import edge_with_boss


def rule(ctx: PartContext) -> model.Part:
    d, w = ctx.dims, ctx.words
    length = d.mater_radius_mm * 0.99
    width = max(7.0, 0.09 * d.mater_radius_mm)
    tail = width * 1.2
    tip_start = d.limb_inner_radius_mm
    boss = width * 0.4
    # The shared outline runs along x with its boss to +y; swapping x and y
    # lays it along the y axis with the boss to +x.
    edge = [(y, x) for x, y in edge_with_boss(-tail, length, boss)]
    outline = edge + [(-width * 0.35, tip_start), (-width, tip_start * 0.9), (-width, -tail)]
    els = [model.polyline("cut", outline, True, "cut"),
           model.segment("fiducial", (0.0, -tail), (0.0, length), "heavy"),
           model.point("pin", (0.0, 0.0), hole="centre")]
    # "reading edge" runs along the fiducial edge, the straight edge through
    # the pin that every reading is taken on (the body's other long edge is
    # straight too: #9), in a band of one line next to it, ending where the
    # tip starts to narrow.  The name runs along the rest of the body's
    # width, from clear of the pin's crosshair (2 mm) to the tip; with an
    # owner (#9) the name takes what it needs next to the pin (half the
    # length at most) and the owner's name the whole rest, centred there
    # (:func:`owner_split_mm`).
    # The band starts beyond half the width of the edge's cut line, which
    # grows with the instrument (kitgen.geometry.style), so that no
    # descender reaches the line (#9).
    m = labels.MARGIN_MM
    lo, hi = 2.0 + m, tip_start * 0.9 - m
    inset = style.stroke_width_mm("cut", d) / 2
    band = w.measure(w("rule.reading_edge"), d.small_text_pt).height_mm + 2 * m + 0.1
    els += reading_edge_label(w, w("rule.reading_edge"), d.small_text_pt, band, hi, hi - lo, inset)
    across, x = width - inset - band - 2 * m, -(inset + band + width) / 2
    mid = owner_split_mm(w, w("rule.title"), d.small_text_pt, lo, hi) if ctx.plan.owner else hi
    els += labels.fitted_text("part_label", (x, (lo + mid) / 2), w("rule.title"), d.small_text_pt, w,
                              mid - lo - m, across, angle_deg=90.0)
    if ctx.plan.owner:
        els += labels.fitted_text("owner", (x, (mid + hi) / 2), ctx.plan.owner, d.small_text_pt, w,
                                  hi - mid - m, across, angle_deg=90.0)
    return model.Part("rule", "card", tuple(els), (-width - 1.0, -tail - 1.0, boss + 1.0, length + 1.0), {},
                      w("rule.title"))


def owner_split_mm(w, title: str, size_pt: float, lo_mm: float, hi_mm: float) -> float:
    """Where the rule's name ends and its owner's line begins, between
    ``lo_mm`` and ``hi_mm`` along it: after what the name ``title`` needs
    at ``size_pt`` with its margin, but never past the middle, so that the
    owner's name has the whole rest of the length and is shortened only
    where even that is too short (#9).  It depends on there being an owner,
    never on the name itself: a class set's rules differ only in the
    owner's words (#12, kitgen.kit)."""
    need = w.measure(title, size_pt).width_mm + 2 * labels.MARGIN_MM   # its room is a margin narrower
    return lo_mm + min(need, (hi_mm - lo_mm) / 2)


def reading_edge_label(w, text: str, size_pt: float, band_mm: float, end_mm: float, most_mm: float,
                       inset_mm: float = 0.0):
    """``text`` ("reading edge") set along the fiducial edge (x = 0) in the
    band ``band_mm`` wide that starts ``inset_mm`` from it, ending
    ``end_mm`` along the rule and at most ``most_mm`` long (#9)."""
    m = labels.MARGIN_MM
    length = min(w.measure(text, size_pt).width_mm + 2 * m, most_mm)
    return labels.fitted_text("reading_edge", (-inset_mm - band_mm / 2, end_mm - length / 2), text, size_pt, w,
                              length - 2 * m, band_mm - 2 * m, angle_deg=90.0)

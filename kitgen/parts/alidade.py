"""The alidade: the sighting arm on the back, with two fold-up vanes.

Seen flat, as cut: a bar along the x axis whose upper edge (y = 0) is the
fiducial line through the pin, and a vane beyond each end that folds up
along the dashed line.  The pinholes are at the same height on both vanes,
so the line through them is parallel to the fiducial edge: sighting, or
letting the Sun's spot through the upper vane fall on the lower one, sets
the edge at the altitude read on the back's scale.
"""

from __future__ import annotations

from ..geometry import model, style
from . import labels
from .context import PartContext
from .dimensions import MIN_TEXT_PT
from .outline import edge_with_boss


#: Size (pt) a caution is printed at, bold, at the least: common practice
#: for safety wording on printed matter (no smaller than the small print
#: around it, and heavier). On an arm too short for it even on two or three
#: lines the caution keeps the part's small text size, still bold (#9).
CAUTION_PT = 7.0


def caution_text(at, d, w, room_mm: float, height_mm: float) -> list[model.Element]:
    """"Never look at the Sun", bold and at least :data:`CAUTION_PT` where
    the arm's room holds it (broken into lines if need be), centred at ``at``."""
    text, size = w("alidade.caution"), max(CAUTION_PT, d.small_text_pt)
    fitted = w.fit(text, size, room_mm, height_mm, style="bold", min_pt=CAUTION_PT)
    low = CAUTION_PT if not any(line.endswith("\u2026") for line in fitted.lines) else MIN_TEXT_PT
    return labels.fitted_text("caution", at, text, size, w, room_mm, height_mm, style="bold", min_pt=low)


#: The words across a vane, and "reading edge" under the cut edge it
#: names, keep this far beyond the cut lines' ink: a cut by hand strays
#: about half a millimetre (common practice).
CUT_CLEAR_MM = 0.5


def alidade(ctx: PartContext) -> model.Part:
    d, w = ctx.dims, ctx.words
    half = d.mater_radius_mm * 0.99
    # At least 10 mm wide, so that "fold up" fits across a vane at 5 pt in
    # every shipped language, clear of the cut lines (CUT_CLEAR_MM), as
    # kitgen.parts.legibility's rule asks: no word cut short.
    width = max(10.0, 0.10 * d.mater_radius_mm)
    vane = max(14.0, 0.16 * d.mater_radius_mm)
    hole_at = vane * 0.55
    edge = edge_with_boss(-half - vane, half + vane, width * 0.4)
    els = [model.polyline("cut", edge + [(half + vane, -width), (-half - vane, -width)], True, "cut"),
           model.segment("fold", (half, 0.0), (half, -width), "fold"),
           model.segment("fold", (-half, 0.0), (-half, -width), "fold"),
           model.segment("fiducial", (-half, 0.0), (half, 0.0), "heavy"),
           model.point("pin", (0.0, 0.0), hole="centre"),
           model.point("pin", (half + hole_at, -width / 2), hole="sight"),
           model.point("pin", (-half - hole_at, -width / 2), hole="sight")]
    # The words keep clear of the pins' crosshairs (PIN_CROSS_HALF_MM in
    # kitgen.geometry.style, 2 mm) and of the fold lines: the name on the
    # left arm, the caution on the right arm, and on each vane, between its
    # fold and its pinhole, "fold up" set along the fold.
    m, cross = labels.MARGIN_MM, 2.0
    arm = half - cross - 2 * m
    left = arm
    if ctx.plan.owner:
        # The owner's name (#9) on the outer half of the left arm.
        left = arm / 2 - m
        els += labels.fitted_text("owner", (-half + m + left / 2, -width / 2), ctx.plan.owner, d.small_text_pt, w,
                                  left, width - 2 * m)
    els += labels.fitted_text("part_label", (-cross - m - left / 2, -width / 2), w("alidade.title"),
                              d.small_text_pt, w, left, width - 2 * m)
    # At the right arm's outer end, "reading edge" along the fiducial edge
    # (#9): the bar's lower edge is straight too; the caution inside it.
    edge_text = w("alidade.reading_edge")
    edge_len = min(w.measure(edge_text, d.small_text_pt).width_mm + 2 * m, 0.5 * arm)
    band = w.measure(edge_text, d.small_text_pt).height_mm + 0.1
    inset = style.stroke_width_mm("cut", d) / 2     # the edge's cut line grows with the instrument
    edge_at = (half - m - edge_len / 2, -(inset + CUT_CLEAR_MM + band / 2))
    els += labels.fitted_text("reading_edge", edge_at, edge_text, d.small_text_pt, w, edge_len - 2 * m, band)
    room = arm - edge_len - m
    els += caution_text((cross + m + room / 2, -width / 2), d, w, room, width - 2 * m)
    gap = hole_at - cross
    for sx in (1.0, -1.0):
        els += labels.fitted_text("vane_label", (sx * (half + gap / 2), -width / 2), w("alidade.vane"),
                                  d.small_text_pt, w, width - 2 * (inset + CUT_CLEAR_MM), gap - 2 * m,
                                  angle_deg=-90.0)
    bounds = (-half - vane - 1, -width - 1, half + vane + 1, width * 0.4 + 1)
    return model.Part("alidade", "card", tuple(els), bounds, {}, w("alidade.title"))

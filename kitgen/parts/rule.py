"""The rule: the pointer turned over the front to read the hour ring.

Its fiducial edge is a straight line through the pin; laid across the
Sun's place on the rete it reads local apparent solar time at the ring.
The body lies on one side of that edge so the edge itself is a cut line.
"""

from __future__ import annotations

from ..geometry import model
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
    # The name runs along the body, from clear of the pin's crosshair (2 mm)
    # to where the tip starts to narrow; the owner's name (#9), if any, on
    # the outer half.
    lo, hi = 2.0 + labels.MARGIN_MM, tip_start * 0.9 - labels.MARGIN_MM
    mid = (lo + hi) / 2 if ctx.plan.owner else hi
    els += labels.fitted_text("part_label", (-width * 0.5, (lo + mid) / 2), w("rule.title"), d.small_text_pt, w,
                              mid - lo - labels.MARGIN_MM, width - 2 * labels.MARGIN_MM, angle_deg=90.0)
    if ctx.plan.owner:
        els += labels.fitted_text("owner", (-width * 0.5, (mid + hi) / 2), ctx.plan.owner, d.small_text_pt, w,
                                  hi - mid - labels.MARGIN_MM, width - 2 * labels.MARGIN_MM, angle_deg=90.0)
    return model.Part("rule", "card", tuple(els), (-width - 1.0, -tail - 1.0, boss + 1.0, length + 1.0), {},
                      w("rule.title"))

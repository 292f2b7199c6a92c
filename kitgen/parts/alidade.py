"""The alidade: the sighting arm on the back, with two fold-up vanes.

Seen flat, as cut: a bar along the x axis whose upper edge (y = 0) is the
fiducial line through the pin, and a vane beyond each end that folds up
along the dashed line.  The pinholes are at the same height on both vanes,
so the line through them is parallel to the fiducial edge: sighting, or
letting the Sun's spot through the upper vane fall on the lower one, sets
the edge at the altitude read on the back's scale.
"""

from __future__ import annotations

from ..geometry import model
from .context import PartContext
from .outline import edge_with_boss


def alidade(ctx: PartContext) -> model.Part:
    d, w = ctx.dims, ctx.words
    half = d.mater_radius_mm * 0.99
    width = max(8.0, 0.10 * d.mater_radius_mm)
    vane = max(14.0, 0.16 * d.mater_radius_mm)
    hole_at = vane * 0.55
    edge = edge_with_boss(-half - vane, half + vane, width * 0.4)
    els = [model.polyline("cut", edge + [(half + vane, -width), (-half - vane, -width)], True, "cut"),
           model.segment("fold", (half, 0.0), (half, -width), "fold"),
           model.segment("fold", (-half, 0.0), (-half, -width), "fold"),
           model.segment("fiducial", (-half, 0.0), (half, 0.0), "heavy"),
           model.point("pin", (0.0, 0.0), hole="centre"),
           model.point("pin", (half + hole_at, -width / 2), hole="sight"),
           model.point("pin", (-half - hole_at, -width / 2), hole="sight"),
           model.text("part_label", (-half * 0.5, -width / 2), w("alidade.title"), d.small_text_pt),
           model.text("vane_label", (half + vane * 0.25, -width * 0.8), w("alidade.vane"), d.small_text_pt),
           model.text("vane_label", (-half - vane * 0.25, -width * 0.8), w("alidade.vane"), d.small_text_pt),
           model.text("caution", (half * 0.45, -width / 2), w("alidade.caution"), d.small_text_pt)]
    return model.Part("alidade", "card", tuple(els), (-half - vane - 1, -width - 1, half + vane + 1, width * 0.4 + 1), {},
                      w("alidade.title"))

"""The shadow square's marks: which ratios it carries and where each stands.

Shared by the mater's back, which draws the square, and the legibility
rule, which decides which numbers fit.  Lengths in mm on the back.
"""

from __future__ import annotations

#: Ratios of height to distance marked on the shadow square; the tangent of
#: the altitude read where the alidade crosses the square.
SHADOW_RATIOS = (0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.25, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 10.0)


#: The marks that carry a number; the others are left bare so that the
#: numbers along the square's foot do not crowd.
LABELLED_RATIOS = (0.2, 0.4, 0.6, 0.8, 1.0, 1.5, 2.0, 3.0, 5.0, 10.0)


def shadow_side_mm(dims) -> float:
    """Side (mm) of each of the two shadow squares."""
    return dims.back_calendar_ring_mm * 0.62


def shadow_mark(d, L, ratio, sx):
    """A ratio's mark on the shadow square of side ``L`` (``sx`` = 1 for
    the right-hand square, -1 for the left): the point it marks, the end of
    its tick, where its number stands and how the number is anchored."""
    if ratio == 1.0:
        return ((sx * L, -L), (sx * (L - d.tick_mm * 1.1), -L + d.tick_mm * 1.1),
                (sx * (L + d.tick_mm * 1.6), -L - d.tick_mm * 1.6), "middle")
    if ratio < 1.0:
        return ((sx * L, -L * ratio), (sx * (L - d.tick_mm * 1.5), -L * ratio),
                (sx * (L - d.tick_mm * 2.2), -L * ratio), "end" if sx > 0 else "start")
    return ((sx * L / ratio, -L), (sx * L / ratio, -L + d.tick_mm * 1.5), (sx * L / ratio, -L + d.tick_mm * 3.0),
            "middle")


def decimals(ratio: float) -> int:
    """Fewest decimals that write a shadow-square ratio exactly."""
    for n in (0, 1, 2):
        if abs(round(ratio, n) - ratio) < 1e-9:
            return n
    return 2

"""Cut outlines shared by the rule and the alidade."""

from __future__ import annotations

import math


def edge_with_boss(x0: float, x1: float, boss_radius_mm: float, samples: int = 24):
    """Points along the straight fiducial edge y = 0 from x0 to x1 (x0 < 0 <
    x1) that bulge round the pin in a half circle on the +y side, so the
    pin hole has card all round while the edge stays straight elsewhere."""
    pts = [(x0, 0.0)]
    for k in range(samples + 1):
        a = math.pi - math.pi * k / samples
        pts.append((boss_radius_mm * math.cos(a), boss_radius_mm * math.sin(a)))
    pts.append((x1, 0.0))
    return pts

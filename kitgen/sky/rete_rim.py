"""Which stars a rete can carry: those inside its rim.

A northern rete is bounded by the Tropic of Capricorn, a southern one by
the Tropic of Cancer (the outer tropic, where the ecliptic touches the
rim), less a small margin so that a star's dot and name fit on the film.
Declinations in degrees at the edges; the obliquity in radians.
"""

from __future__ import annotations

import math

import numpy as np

from .obliquity import mean_obliquity_rad

#: Stars closer than this to the rete's rim (the outer tropic) are left off,
#: so that a pointer and its name fit on the film (common practice).
RIM_MARGIN_DEG = 2.0


def epoch_centuries_tt(epoch: int) -> float:
    """The epoch as Julian centuries of TT from J2000.0 (the middle of the
    epoch year is used: the kit is for the whole year)."""
    return (epoch + 0.5 - 2000.0) / 100.0


def epoch_obliquity_rad(epoch: int) -> float:
    """The IAU 2006 mean obliquity at the middle of the epoch year (rad)."""
    return float(mean_obliquity_rad(epoch_centuries_tt(epoch)))


def rete_fits(hemisphere_sign: int, obliquity_rad: float):
    """``fits(ra_deg, dec_deg) -> bool array``: the places that lie on a
    rete of the given hemisphere (+1 north, -1 south), inside the outer
    tropic less :data:`RIM_MARGIN_DEG`."""
    limit_deg = -math.degrees(obliquity_rad) + RIM_MARGIN_DEG

    def fits(ra_deg, dec_deg):
        return hemisphere_sign * np.asarray(dec_deg) > limit_deg

    return fits

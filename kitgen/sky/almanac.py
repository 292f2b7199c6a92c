"""Everything the kit needs from the sky for one recipe, computed once.

The epoch's obliquity, the Sun's longitude on every date of the epoch year
and the places of the chosen stars at the epoch.  Degrees at the edges.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..recipe.schema import Recipe
from .obliquity import mean_obliquity_rad
from .stars import Star, places_at_epoch, select_stars
from .sun import calendar_longitudes_deg

#: Stars closer than this to the rete's rim (the outer tropic) are left off,
#: so that a pointer and its name fit on the film.
RIM_MARGIN_DEG = 2.0


@dataclass(frozen=True)
class PlacedStar:
    star: Star
    ra_deg: float   # mean place at the epoch
    dec_deg: float


@dataclass(frozen=True)
class SkyForKit:
    epoch: int
    obliquity_rad: float
    calendar: tuple[tuple[int, int, float], ...]  # (month, day, sun longitude deg at 12:00 UT)
    stars: tuple[PlacedStar, ...]


def epoch_centuries_tt(epoch: int) -> float:
    """The epoch as Julian centuries of TT from J2000.0 (the middle of the
    epoch year is used: the kit is for the whole year)."""
    return (epoch + 0.5 - 2000.0) / 100.0


def sky_for_kit(recipe: Recipe) -> SkyForKit:
    eps = float(mean_obliquity_rad(epoch_centuries_tt(recipe.epoch)))
    sign = 1 if recipe.latitude_deg >= 0 else -1
    limit_deg = -np.degrees(eps) + RIM_MARGIN_DEG

    def fits(ra_deg, dec_deg):
        return sign * np.asarray(dec_deg) > limit_deg

    chosen = select_stars(recipe.stars, recipe.epoch + 0.5, fits)
    ra, dec = places_at_epoch(chosen, recipe.epoch + 0.5)
    placed = tuple(PlacedStar(st, float(a), float(d)) for st, a, d in zip(chosen, ra, dec))
    return SkyForKit(recipe.epoch, eps, tuple(calendar_longitudes_deg(recipe.epoch)), placed)

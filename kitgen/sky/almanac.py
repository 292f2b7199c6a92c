"""Everything the kit needs from the sky, computed once for a plan.

The epoch's obliquity, the Sun's longitude on every date of the epoch year
and the places of the chosen stars at the epoch.  Degrees at the edges.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from .rete_rim import epoch_obliquity_rad, rete_fits
from .stars import Star, places_at_epoch, select_stars
from .sun import calendar_longitudes_deg


@dataclass(frozen=True)
class PlacedStar:
    star: Star
    ra_deg: float   # mean place at the epoch
    dec_deg: float


@dataclass(frozen=True)
class SkyForKit:
    epoch: int
    obliquity_rad: float
    calendar: tuple[tuple[int, int, float], ...]  # (month, day, sun longitude deg at the site's noon)
    stars: tuple[PlacedStar, ...]


def sky_for_kit(epoch: int, hemisphere_sign: int, star_names: Sequence[str] = (), brightest: int | None = None,
                magnitude_limit: float | None = None, site_longitude_deg: float | None = None) -> SkyForKit:
    """The sky of a kit for ``epoch`` on a rete of the given hemisphere
    (+1 north, -1 south), with the stars chosen by name, as the N
    brightest, or down to a magnitude (:func:`kitgen.sky.stars.select_stars`),
    and the calendar for local mean noon at ``site_longitude_deg`` (east
    positive; 12:00 UT when it is unknown)."""
    eps = epoch_obliquity_rad(epoch)
    fits = rete_fits(hemisphere_sign, eps)
    chosen = select_stars(star_names, brightest, magnitude_limit, epoch + 0.5, fits)
    ra, dec = places_at_epoch(chosen, epoch + 0.5)
    placed = tuple(PlacedStar(st, float(a), float(d)) for st, a, d in zip(chosen, ra, dec))
    return SkyForKit(epoch, eps, tuple(calendar_longitudes_deg(epoch, site_longitude_deg)), placed)

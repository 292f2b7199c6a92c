"""Everything the kit needs from the sky, computed once for a plan.

The epoch's obliquity, the Sun's longitude on every date of the epoch year
and the places of the chosen stars at the epoch.  Degrees at the edges.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from .ecliptic import ecliptic_to_equatorial_rad
from .rete_rim import VISIBLE_ALTITUDE_DEG, epoch_obliquity_rad, rete_fits, tropic_rim_deg
from .stars import Star, named_stars, places_at_epoch, select_stars
from .sun import calendar_longitudes_deg


@dataclass(frozen=True)
class PlacedStar:
    """A catalogue star at its mean place of the kit's epoch (precessed)."""

    star: Star
    ra_deg: float   # mean place at the epoch
    dec_deg: float


@dataclass(frozen=True)
class SkyForKit:
    """The sky a kit draws for its epoch: the obliquity, the Sun's place on
    each calendar date, the stars at their places, and the rim."""

    epoch: int
    obliquity_rad: float
    calendar: tuple[tuple[int, int, float], ...]  # (month, day, sun longitude deg at the site's noon)
    stars: tuple[PlacedStar, ...]
    #: The declination (degrees, signed) of the rete's and the plates' rim
    #: (kitgen.sky.rete_rim), and the bright stars that rise well above the
    #: horizon at some plate's latitude but lie beyond it (#9).
    rim_deg: float | None = None
    beyond_rim: tuple[PlacedStar, ...] = ()


def sky_for_kit(epoch: int, hemisphere_sign: int, star_names: Sequence[str] = (), brightest: int | None = None,
                magnitude_limit: float | None = None, site_longitude_deg: float | None = None,
                rim_deg: float | None = None, latitudes_deg: Sequence[float] = ()) -> SkyForKit:
    """The sky of a kit for ``epoch`` on a rete of the given hemisphere
    (+1 north, -1 south), with the stars chosen by name, as the N
    brightest (and Polaris on a northern rete), or down to a magnitude
    (:func:`kitgen.sky.stars.select_stars`),
    and the calendar for local mean noon at ``site_longitude_deg`` (east
    positive; 12:00 UT when it is unknown).  The rete reaches ``rim_deg``
    (degrees, signed; the outer tropic when None); the stars beyond it
    that culminate well above the horizon at one of ``latitudes_deg`` are
    told in ``beyond_rim``."""
    eps = epoch_obliquity_rad(epoch)
    rim = tropic_rim_deg(hemisphere_sign, eps) if rim_deg is None else float(rim_deg)
    fits = rete_fits(hemisphere_sign, eps, rim)
    chosen = select_stars(star_names, brightest, magnitude_limit, epoch + 0.5, fits, pole_star=True)
    placed = _placed(chosen, epoch)
    return SkyForKit(epoch, eps, tuple(calendar_longitudes_deg(epoch, site_longitude_deg)), placed, rim,
                     bright_beyond_rim(epoch, fits, latitudes_deg))


def _placed(stars, epoch: int) -> tuple[PlacedStar, ...]:
    ra, dec = places_at_epoch(stars, epoch + 0.5)
    return tuple(PlacedStar(st, float(a), float(d)) for st, a, d in zip(stars, ra, dec))


#: The bright stars whose absence from the rete the build tells: as many
#: as a default rete carries (kitgen.recipe.schema's ``stars`` default).
BRIGHT_STARS_TOLD = 32


def bright_beyond_rim(epoch: int, fits, latitudes_deg: Sequence[float]) -> tuple[PlacedStar, ...]:
    """Of the :data:`BRIGHT_STARS_TOLD` brightest named stars, those that
    ``fits`` leaves off the rete and that culminate at least
    :data:`kitgen.sky.rete_rim.VISIBLE_ALTITUDE_DEG` high (at altitude
    90 - |phi - delta|) at one of the latitudes."""
    if not latitudes_deg:
        return ()
    bright = _placed(named_stars()[:BRIGHT_STARS_TOLD], epoch)
    ok = fits(np.array([p.ra_deg for p in bright]), np.array([p.dec_deg for p in bright]))
    return tuple(p for p, on in zip(bright, ok) if not on and
                 max(90.0 - abs(phi - p.dec_deg) for phi in latitudes_deg) >= VISIBLE_ALTITUDE_DEG)


def calendar_declinations_rad(sky: SkyForKit) -> np.ndarray:
    """The Sun's declination (radians) on each of the calendar's dates, from
    its longitude there on the ecliptic (kitgen.sky.ecliptic), as the kit
    draws it."""
    return ecliptic_to_equatorial_rad(np.radians([lon for _, _, lon in sky.calendar]), sky.obliquity_rad)[1]

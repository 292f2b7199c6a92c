"""Where the rete's and the plates' rim lies, and which stars it takes.

The rim is a circle of declination beyond the equator, on the side away
from the pole at the centre: south of it on a northern instrument, north
on a southern one.  It is never nearer the equator than the outer tropic,
where the ecliptic touches it.  A classical rete stops there; a school
near the equator sees far more of the other hemisphere's sky (Canopus,
Achernar, the Southern Cross from the north), so the rim may go farther
(recipe key ``rete_limit_deg``).  The farther it goes, the smaller the
projection's scale: in Snyder's stereographic projection (USGS PP 1395,
1987, eq. 21-33 with k0 = 1/2 at the pole) the circle of declination
delta lies at radius R tan(pi/4 - sign delta / 2) from the pin, R being
the equator's radius, so a rim at -65 deg takes R tan(77.5 deg) = 4.5 R.

The default reaches the stars that culminate :data:`VISIBLE_ALTITUDE_DEG`
or higher at every plate's latitude, as far as the instrument's size lets
the equator keep :data:`MIN_EQUATOR_RADIUS_MM`.  Declinations in degrees
at the edges; the obliquity in radians; lengths in mm.
"""

from __future__ import annotations

import math

import numpy as np

from .obliquity import mean_obliquity_rad

#: Stars closer than this to the rete's rim are left off, so that a
#: pointer and its name fit on the film (common practice).
RIM_MARGIN_DEG = 2.0

#: A star "rises well above the horizon" when it culminates at least this
#: high: the lowest degrees are lost to haze, trees and buildings (common
#: practice in naked-eye observing; the value is a choice).
VISIBLE_ALTITUDE_DEG = 20.0

#: The least radius (mm) of the equator that the default rim keeps (a
#: choice, #9).  The Sun's year then spans 22 x (tan 56.7 + tan 33.3 deg),
#: some 48 mm across the rete, about 150 mm of ecliptic round: enough, at
#: the 5 pt minimum, for a tick every degree or two, the 10 and 20 of every
#: sign and each sign's name, and for the horizon, the tropics and the
#: unequal hours to stand apart on the plate.  At 14 mm (the first choice)
#: the A4 kit at 0.5 N crowded all of them into the middle third of the
#: plate and read some 13 minutes of time wrong.  A larger instrument takes
#: a farther rim by default: at 300 mm the equator keeps 22 mm out to
#: -68 deg, which holds Canopus, Achernar and Acrux.
MIN_EQUATOR_RADIUS_MM = 22.0

#: The farthest rim kitgen draws (recipe key ``rete_limit_deg``): beyond
#: it the equator shrinks to a fifteenth of the rim or less.
MAX_RIM_DEG = 80.0


def epoch_centuries_tt(epoch: int) -> float:
    """The epoch as Julian centuries of TT from J2000.0 (the middle of the
    epoch year is used: the kit is for the whole year)."""
    return (epoch + 0.5 - 2000.0) / 100.0


def epoch_obliquity_rad(epoch: int) -> float:
    """The IAU 2006 mean obliquity at the middle of the epoch year (rad)."""
    return float(mean_obliquity_rad(epoch_centuries_tt(epoch)))


#: The least ring (mm) between the plate's edge and the rim: room for a
#: number of the smallest text (5 pt digits, 1.33 mm high as the shipped
#: fonts measure them) 0.3 mm clear of the rim's ink and about 0.5 mm of
#: the cut's, so that scissors a little inside the cut line miss it (#12
#: review: at 2 mm, on small plates, the azimuths ending on the rim had no
#: room for their numbers anywhere; at 2.4 mm a teacher found them 0.35 mm
#: from the cut).  The plate grows into the key's gap for it; the drawing
#: keeps its size.
MIN_RIM_RING_MM = 2.6


def plate_and_rim_radii_mm(diameter_mm: float) -> tuple[float, float]:
    """(plate_mm, rim_mm): the radius of the plate's cut circle and of the
    rim, for a mater of ``diameter_mm`` (kitgen.parts.dimensions takes them
    from here).  The limb's hour ring begins at 0.84 of the mater's radius;
    a gap for the plate's key lies between it and the plate, and another
    between the plate's edge and the rim, so that the outermost line never
    runs into the cut, and an azimuth's number fits there beyond its
    line's end (:data:`MIN_RIM_RING_MM`, taken from the key's gap on
    small maters: 3 mm less 0.6 on A5)."""
    r = diameter_mm / 2.0
    s = r / 90.0
    rim = r * 0.84 - max(3.0, 4.0 * s) - max(2.0, 2.5 * s)
    return rim + max(MIN_RIM_RING_MM, 2.5 * s), rim


def rim_radius_factor(rim_declination_deg: float, hemisphere_sign: int) -> float:
    """The rim's radius over the equator's: tan(pi/4 - sign delta / 2)
    (Snyder 1987, eq. 21-33)."""
    return math.tan(math.pi / 4.0 - hemisphere_sign * math.radians(rim_declination_deg) / 2.0)


def tropic_rim_deg(hemisphere_sign: int, obliquity_rad: float) -> float:
    """The nearest rim: the outer tropic, -sign x obliquity (degrees)."""
    return -hemisphere_sign * math.degrees(obliquity_rad)


def farthest_rim_deg(hemisphere_sign: int, diameter_mm: float) -> float:
    """The farthest rim (degrees, signed) that keeps the equator at least
    :data:`MIN_EQUATOR_RADIUS_MM` on a mater of ``diameter_mm``: from
    R tan(pi/4 + |delta|/2) = rim, |delta| = 2 atan(rim / R) - 90 deg."""
    _, rim = plate_and_rim_radii_mm(diameter_mm)
    far = 2.0 * math.degrees(math.atan(rim / MIN_EQUATOR_RADIUS_MM)) - 90.0
    return -hemisphere_sign * min(far, MAX_RIM_DEG)


def visible_rim_deg(latitudes_deg, hemisphere_sign: int) -> float:
    """The rim (degrees, signed) that takes, with :data:`RIM_MARGIN_DEG`
    to spare, every star culminating :data:`VISIBLE_ALTITUDE_DEG` or
    higher at each of the latitudes: a star of declination delta culminates
    at altitude 90 - |phi - delta|, so on the far side of the equator the
    last one seen so high lies at |delta| = 90 - |phi| - altitude.  Whole
    degrees, rounded away from the equator."""
    nearest_equator = min(abs(p) for p in latitudes_deg)
    reach = 90.0 - nearest_equator - VISIBLE_ALTITUDE_DEG + RIM_MARGIN_DEG
    return -hemisphere_sign * float(math.ceil(reach - 1e-9))


def default_rim_deg(latitudes_deg, hemisphere_sign: int, obliquity_rad: float, diameter_mm: float) -> float:
    """The default rim (degrees, signed): the visible one
    (:func:`visible_rim_deg`), no farther than the size allows
    (:func:`farthest_rim_deg`, rounded to whole degrees towards the
    equator) and never nearer than the outer tropic."""
    tropic = abs(tropic_rim_deg(hemisphere_sign, obliquity_rad))
    far = math.floor(abs(farthest_rim_deg(hemisphere_sign, diameter_mm)) + 1e-9)
    want = min(abs(visible_rim_deg(latitudes_deg, hemisphere_sign)), far)
    return -hemisphere_sign * float(max(want, tropic))


def kit_rim_deg(asked_deg: float | None, latitudes_deg, hemisphere_sign: int, epoch: int,
                diameter_mm: float) -> float:
    """The rim of a kit (degrees, signed): as asked (``rete_limit_deg``,
    never nearer than the outer tropic), or the default
    (:func:`default_rim_deg`) for its plates' latitudes and size."""
    eps = epoch_obliquity_rad(epoch)
    if asked_deg is None:
        return default_rim_deg(latitudes_deg, hemisphere_sign, eps, diameter_mm)
    return -hemisphere_sign * max(abs(float(asked_deg)), abs(tropic_rim_deg(hemisphere_sign, eps)))


def rim_for_stars_deg(declinations_deg, hemisphere_sign: int) -> float:
    """The nearest whole-degree rim (degrees, signed) that takes stars of
    these declinations with :data:`RIM_MARGIN_DEG` to spare: the value of
    ``rete_limit_deg`` that lets them in."""
    farthest = max(-hemisphere_sign * d for d in declinations_deg)
    return -hemisphere_sign * float(math.floor(farthest + RIM_MARGIN_DEG) + 1)


def rete_fits(hemisphere_sign: int, obliquity_rad: float, rim_deg: float | None = None):
    """``fits(ra_deg, dec_deg) -> bool array``: the places that lie on a
    rete of the given hemisphere (+1 north, -1 south) inside its rim
    (degrees, signed; the outer tropic when None) less
    :data:`RIM_MARGIN_DEG`."""
    rim = tropic_rim_deg(hemisphere_sign, obliquity_rad) if rim_deg is None else rim_deg
    limit_deg = hemisphere_sign * rim + RIM_MARGIN_DEG

    def fits(ra_deg, dec_deg):
        return hemisphere_sign * np.asarray(dec_deg) > limit_deg

    return fits

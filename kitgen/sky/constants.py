"""Constants of the sky layer, with their units in their names."""

import math

#: Julian Date of the standard epoch J2000.0 (2000 January 1.5 TT).
J2000_JD = 2451545.0
#: Days in a Julian century.
DAYS_PER_JULIAN_CENTURY = 36525.0
#: Arcseconds to radians.
ARCSEC_TO_RAD = math.pi / (180.0 * 3600.0)
#: Milliarcseconds to radians.
MAS_TO_RAD = ARCSEC_TO_RAD / 1000.0
#: Julian Date of 0001-01-01 00:00 (proleptic Gregorian) minus Python's date ordinal 1.
JD_OF_ORDINAL_ZERO_MIDNIGHT = 1721424.5
#: The Sun's altitude (degrees) at the end of each kind of twilight: its
#: centre 6, 12 or 18 deg below the horizon (the definitions of the
#: *Explanatory Supplement to the Astronomical Almanac* (1992), sec. 9.3,
#: from memory; the same limits in every almanac office's tables).
TWILIGHT_DEG = {"civil": -6.0, "nautical": -12.0, "astronomical": -18.0}

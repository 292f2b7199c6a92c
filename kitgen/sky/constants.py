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

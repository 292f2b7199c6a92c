"""The recipe's ``rete_limit_deg``: the declination of the rete's and the
plates' rim (#9).

The rim lies beyond the equator on the side away from the pole at the
centre: south of it on a northern kit, north on a southern one.  The value
is that declination in degrees (-40 on a northern kit, 40 on a southern
one); since the side is fixed by the kit's hemisphere, only its size
counts and the sign may be left out.  It runs from 23.5 degrees, just
beyond the outer tropic where the ecliptic touches the rim, to
:data:`kitgen.sky.rete_rim.MAX_RIM_DEG`.  Without the key the rim follows
the latitude (kitgen.sky.rete_rim.default_rim_deg).
"""

from __future__ import annotations

import math

from ..errors import KeyedError, shown
from ..sky.rete_rim import MAX_RIM_DEG

#: The nearest rim a recipe may ask for: beyond the outer tropic in every
#: epoch kitgen draws (the obliquity is 23.45 deg in 1900, less since).
MIN_RIM_DEG = 23.5


class RimError(KeyedError, ValueError):
    """A rete_limit_deg that cannot be used; the message is one line, a key
    of the templates' ``errors`` section and its values."""


def parse_rete_limit(value) -> float:
    """The rim's declination as given (degrees); :class:`RimError` unless
    it is a number whose size lies from :data:`MIN_RIM_DEG` to
    :data:`MAX_RIM_DEG`."""
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) \
            or not MIN_RIM_DEG <= abs(value) <= MAX_RIM_DEG:
        raise RimError("errors.rete_limit_value", value=shown(value), low=f"{MIN_RIM_DEG:g}",
                       high=f"{MAX_RIM_DEG:g}")
    return float(value)

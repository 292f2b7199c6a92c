"""The nights on which a twilight never ends (#12 review: at 59.9 N the
plate's -18 deg line is never reached by the Sun's point from late April
to August, and nothing said why).

On a given night the Sun sinks lowest at its lower culmination, at
altitude |phi| + s dec - 90 deg (s the sign of the latitude phi, dec the
Sun's declination; the meridian altitude of a body below the pole,
W. M. Smart, *Textbook on Spherical Astronomy*, 6th ed. 1977, ch. II):
where that stays above a twilight's altitude, the twilight lasts all
night.  The Sun's declination is the calendar's (at the site's noon) as
the kit draws it; degrees at the edges, radians inside.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .almanac import SkyForKit, calendar_declinations_rad


@dataclass(frozen=True)
class AllNight:
    """A twilight (its altitude) that lasts all night on the nights after
    the dates from ``first`` to ``last`` (month, day), around midsummer."""

    altitude_deg: float
    first: tuple[int, int]
    last: tuple[int, int]


def lowest_altitude_deg(latitude_deg: float, declination_deg: float) -> float:
    """The Sun's altitude at its lower culmination (see the module
    docstring), in degrees."""
    s = 1.0 if latitude_deg >= 0 else -1.0
    return abs(latitude_deg) + s * declination_deg - 90.0


def all_night_twilights(latitude_deg: float, sky: SkyForKit, altitudes_deg) -> tuple[AllNight, ...]:
    """For each twilight altitude of ``altitudes_deg`` (negative degrees)
    that some nights of the epoch year never reach, the run of calendar
    dates whose night it lasts through (the one run round midsummer; a
    run over the turn of the year, as in the south, from its first date
    in December to its last in January); none where every night or no
    night reaches it."""
    dec = calendar_declinations_rad(sky)
    lowest = [(m, d, lowest_altitude_deg(latitude_deg, math.degrees(x)))
              for (m, d, _), x in zip(sky.calendar, dec.tolist())]
    out = []
    for alt in altitudes_deg:
        light = [h > alt for _, _, h in lowest]
        if all(light) or not any(light):
            continue
        start = next(k for k in range(len(light)) if light[k] and not light[k - 1])
        end = start
        while light[(end + 1) % len(light)]:
            end = (end + 1) % len(light)
        out.append(AllNight(float(alt), lowest[start][:2], lowest[end][:2]))
    return tuple(out)

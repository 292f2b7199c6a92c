"""Read the time from a kit's own parts, as a user reads the paper
instrument (#10): only the drawn geometry, never kitgen's astronomy.

By the Sun: the date's calendar tick on the back and the ecliptic-longitude
ticks on the same ray give the Sun's longitude; that longitude is found
on the rete's ecliptic between its ticks; the rete is turned until the
point lies on the plate's almucantar of the measured altitude (east of the
meridian in the morning, west after noon); the rule through it reads the
hour ring.  By a star: the rete is turned until the star's pointer lies on
the almucantar; the Sun's point, turned with it, is read on the hour ring.

``exact`` reads every scale by interpolation between its ticks; a scale
named in ``graduated`` is read to its nearest drawn tick instead, as a
user reading at the resolution of the printed graduations does.  Angles
in degrees, times in hours.
"""

from __future__ import annotations

import bisect
import math
from dataclasses import dataclass

#: The scales a reading uses, as ``graduated`` names them.
CALENDAR, ECLIPTIC, HOURS = "calendar", "ecliptic", "hours"
#: The parts a reading uses.
READING_PARTS = ("plate", "rete", "mater_front", "mater_back")


def _angle(p) -> float:
    return math.degrees(math.atan2(p[1], p[0])) % 360.0


@dataclass(frozen=True)
class _Scale:
    """Ticks of one scale by direction: sorted angles (deg) and values,
    and the values of the drawn ticks."""

    angles: tuple[float, ...]
    values: tuple[float, ...]
    drawn: tuple[float, ...]
    period: float

    def at(self, direction_deg: float) -> float:
        """The value at a direction, between the two ticks around it."""
        a = direction_deg % 360.0
        k = bisect.bisect_right(self.angles, a)
        n = len(self.angles)
        a0, a1 = self.angles[(k - 1) % n], self.angles[k % n]
        v0, v1 = self.values[(k - 1) % n], self.values[k % n]
        span = (a1 - a0) % 360.0
        f = ((a - a0) % 360.0) / span if span else 0.0
        dv = (v1 - v0 + self.period / 2.0) % self.period - self.period / 2.0
        return (v0 + f * dv) % self.period

    def nearest_drawn(self, value: float) -> float:
        """The drawn tick's value nearest ``value``."""
        return min(self.drawn, key=lambda d: abs((d - value + self.period / 2.0) % self.period - self.period / 2.0))


def _scale(elements, role, key, period, center=(0.0, 0.0)) -> _Scale:
    cx, cy = center
    ticks = sorted((_angle((e.values["at"][0] - cx, e.values["at"][1] - cy)), e.values[key], e.stroke != "none")
                   for e in elements if e.role == role)
    return _Scale(tuple(t[0] for t in ticks), tuple(float(t[1]) for t in ticks),
                  tuple(float(t[1]) for t in ticks if t[2]), period)


class KitReader:
    """Readings from one kit's back, rete, first plate and front."""

    def __init__(self, kit):
        back, rete, front = kit.part("mater_back"), kit.part("rete"), kit.part("mater_front")
        plate = kit.parts_of("plate")[0]
        self._calendar = {(e.values["month"], e.values["day"]): _angle(e.values["at"])
                          for e in back.elements if e.role == "calendar_tick"}
        self._zodiac = _scale(back.elements, "zodiac_tick", "longitude_deg", 360.0)
        ecl = next(e for e in rete.elements if e.role == "ecliptic")
        self._ecliptic_center = ecl.geom["center"]
        self._ecliptic_radius = ecl.geom["radius"]
        ticks = [e for e in rete.elements if e.role == "ecliptic_tick"]
        self._ecliptic = {round(e.values["longitude_deg"]) % 360: _angle(
            (e.geom["from"][0] - ecl.geom["center"][0], e.geom["from"][1] - ecl.geom["center"][1]))
            for e in ticks}
        self._ecliptic_drawn = tuple(float(round(e.values["longitude_deg"]) % 360) for e in ticks
                                     if e.stroke != "none")
        self._hours = _scale(front.elements, "hour_tick", "hour", 24.0)
        self._almucantars = {round(e.values["altitude_deg"], 6): (e.geom["center"], e.geom["radius"])
                             for e in plate.elements if e.role in ("almucantar", "horizon")
                             and e.shape in ("circle", "arc")}
        east = next(e for e in plate.elements if e.role == "cardinal" and e.values.get("azimuth_deg") == 90.0)
        self._east_sign = math.copysign(1.0, east.geom["at"][0])
        self.stars = {e.values["name"]: e for e in rete.elements if e.role == "star"}

    @property
    def altitudes_deg(self) -> tuple[float, ...]:
        """The almucantars drawn on the first plate (degrees)."""
        return tuple(sorted(self._almucantars))

    def sun_longitude_deg(self, month: int, day: int, graduated=()) -> float:
        lon = self._zodiac.at(self._calendar[(month, day)])
        return self._zodiac.nearest_drawn(lon) if CALENDAR in graduated else lon

    def sun_point(self, longitude_deg: float, graduated=()):
        if ECLIPTIC in graduated:
            longitude_deg = min(self._ecliptic_drawn, key=lambda d: abs((d - longitude_deg + 180.0) % 360.0 - 180.0))
        lo = math.floor(longitude_deg)
        a0, a1 = self._ecliptic[lo % 360], self._ecliptic[(lo + 1) % 360]
        a = math.radians(a0 + (longitude_deg - lo) * ((a1 - a0 + 180.0) % 360.0 - 180.0))
        (cx, cy), r = self._ecliptic_center, self._ecliptic_radius
        return (cx + r * math.cos(a), cy + r * math.sin(a))

    def _on_almucantar(self, point, altitude_deg: float, east: bool):
        """Where ``point``, turned about the pin, meets the almucantar on
        the east or west side (None if it never does)."""
        (cx, cy), r = self._almucantars[round(altitude_deg, 6)]
        rho, d = math.hypot(*point), math.hypot(cx, cy)
        if d == 0.0:
            return None
        a = (rho * rho - r * r + d * d) / (2.0 * d)
        if rho * rho < a * a:
            return None
        h = math.sqrt(rho * rho - a * a)
        ux, uy = cx / d, cy / d
        want = self._east_sign if east else -self._east_sign
        for s in (1.0, -1.0):
            q = (ux * a - uy * h * s, uy * a + ux * h * s)
            if math.copysign(1.0, q[0]) == want:
                return q
        return None

    def _hour(self, direction_deg: float, graduated) -> float:
        hour = self._hours.at(direction_deg)
        return self._hours.nearest_drawn(hour) if HOURS in graduated else hour

    def time_by_sun(self, month: int, day: int, altitude_deg: float, morning: bool, graduated=()) -> float | None:
        """Local apparent solar time (hours) read by the Sun."""
        p = self.sun_point(self.sun_longitude_deg(month, day, graduated), graduated)
        q = self._on_almucantar(p, altitude_deg, morning)
        return None if q is None else self._hour(_angle(q), graduated)

    def time_by_star(self, name: str, month: int, day: int, altitude_deg: float, east: bool,
                     graduated=()) -> float | None:
        """Local apparent solar time (hours) read by a star of the rete."""
        star = self.stars[name].geom["at"]
        q = self._on_almucantar(star, altitude_deg, east)
        if q is None:
            return None
        turn = _angle(q) - _angle(star)
        sun = self.sun_point(self.sun_longitude_deg(month, day, graduated), graduated)
        return self._hour(_angle(sun) + turn, graduated)

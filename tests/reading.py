"""Read the time from a kit's exported geometry, as a user does with the
paper instrument: only the JSON geometry is used, never kitgen's astronomy.

1. On the back, the day's calendar tick and the ecliptic-longitude ticks on
   the same ray give the Sun's longitude.
2. On the rete, that longitude is found between its ecliptic graduations.
3. The rete is turned until that point lies on the plate's almucantar of the
   measured altitude (east of the meridian in the morning, west after noon).
4. The rule through that point reads the hour ring of the mater's front.
"""

from __future__ import annotations

import math

import numpy as np


def _angle(p) -> float:
    return math.degrees(math.atan2(p[1], p[0]))


def _wrap(a: float) -> float:
    return (a + 180.0) % 360.0 - 180.0


def _part(geom: dict, key: str) -> dict:
    """The part with id ``key`` (JSON version 2 and later), else the first of kind ``key``."""
    return next((p for p in geom["parts"] if p.get("id") == key), None) or next(
        p for p in geom["parts"] if p["kind"] == key)


def _interpolate_on_ticks(ticks, value_key, direction_deg, center=(0.0, 0.0)):
    """The value at ``direction_deg`` found between the two ticks whose
    ``at`` points (seen from ``center``) bracket that direction."""
    cx, cy = center
    d = [(_wrap(_angle((t["at"][0] - cx, t["at"][1] - cy)) - direction_deg), t[value_key]) for t in ticks]
    below = max((x for x in d if x[0] <= 0), key=lambda x: x[0])
    above = min((x for x in d if x[0] > 0), key=lambda x: x[0])
    v0, v1 = below[1], above[1]
    if abs(v1 - v0) > 180:  # the two ticks straddle 0/360
        v1 = v1 + 360 if v1 < v0 else v1 - 360
    f = -below[0] / (above[0] - below[0])
    return v0 + f * (v1 - v0)


def sun_longitude_from_back(geom, month: int, day: int) -> float:
    back = _part(geom, "mater_back")
    tick = next(e for e in back["elements"] if e["role"] == "calendar_tick" and e["month"] == month
                and e["day"] == day)
    zodiac = [e for e in back["elements"] if e["role"] == "zodiac_tick"]
    return _interpolate_on_ticks(zodiac, "longitude_deg", _angle(tick["at"])) % 360.0


def sun_point_on_rete(geom, longitude_deg: float) -> np.ndarray:
    rete = _part(geom, "rete")
    ecl = next(e for e in rete["elements"] if e["role"] == "ecliptic")
    c = np.array(ecl["center"])
    ticks = {round(e["longitude_deg"]): np.array(e["at"]) for e in rete["elements"] if e["role"] == "ecliptic_tick"}
    lo = math.floor(longitude_deg)
    p0, p1 = ticks[lo % 360], ticks[(lo + 1) % 360]
    a0, a1 = _angle(p0 - c), _angle(p1 - c)
    a = a0 + (longitude_deg - lo) * _wrap(a1 - a0)
    return c + ecl["radius"] * np.array([math.cos(math.radians(a)), math.sin(math.radians(a))])


def turned_to_almucantar(geom, point, altitude_deg: float, morning: bool, plate_id: str = "plate") -> np.ndarray:
    plate = _part(geom, plate_id)
    alm = next(e for e in plate["elements"] if e["role"] in ("almucantar", "horizon")
               and abs(e["altitude_deg"] - altitude_deg) < 1e-9 and e["shape"] in ("circle", "arc"))
    c, r = np.array(alm["center"]), alm["radius"]
    east = next(e for e in plate["elements"] if e["role"] == "cardinal" and e["azimuth_deg"] == 90.0)
    east_sign = math.copysign(1.0, east["at"][0])
    rho = float(np.hypot(*point))
    d = float(np.hypot(*c))
    # Intersections of the circle |p| = rho with the almucantar circle.
    a = (rho * rho - r * r + d * d) / (2 * d)
    h = math.sqrt(max(rho * rho - a * a, 0.0))
    u = c / d
    base = u * a
    perp = np.array([-u[1], u[0]])
    candidates = [base + perp * h, base - perp * h]
    want = east_sign if morning else -east_sign
    return next(p for p in candidates if math.copysign(1.0, p[0]) == want)


def hour_from_front(geom, point) -> float:
    front = _part(geom, "mater_front")
    ticks = [e for e in front["elements"] if e["role"] == "hour_tick"]
    return _interpolate_on_ticks(ticks, "hour", _angle(point)) % 24.0


def read_time(geom, month: int, day: int, altitude_deg: float, morning: bool, plate_id: str = "plate") -> float:
    """Local apparent solar time (hours) read from the kit's geometry, with
    the plate ``plate_id`` (the first plate by default) in the mater."""
    lon = sun_longitude_from_back(geom, month, day)
    p = sun_point_on_rete(geom, lon)
    q = turned_to_almucantar(geom, p, altitude_deg, morning, plate_id)
    return hour_from_front(geom, q)

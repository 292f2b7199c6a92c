"""How well a kit tells the time, from its own geometry as printed (#10).

Simulated readings (kitgen.check.reading) by the Sun, on every fifth day
of the epoch year at each almucantar the plate draws, morning and
afternoon, and by each named star of the rete on the 15th of every month
at 20, 40 and 60 deg east and west, at night, are compared with the local
apparent solar time of the astronomical computation: the instant at which
the Sun (Meeus 1998, ch. 25, apparent longitude and declination at that
instant) or the star (its place at the epoch, as the rete carries it)
stands at that altitude, found by successive approximation, the usual
spherical triangle (Smart 1977, ch. II):

    cos H = (sin h - sin(phi) sin(delta)) / (cos(phi) cos(delta)).

Readings within an hour of the meridian are left out: there the altitude
hardly changes and no instrument tells the time from it.  Each set is
read twice: interpolating every scale exactly, and at the resolution of
the printed graduations (each scale to its nearest drawn tick); and once
with each scale alone at its resolution, to name the part that limits the
accuracy.  Errors in minutes of time.
"""

from __future__ import annotations

import math
import statistics
from dataclasses import dataclass, replace

from ..sky.equation_of_time import apparent_right_ascension_rad
from ..sky.sun_rise_set import declination_rad
from ..sky.timescale import days_of_year, julian_centuries_tt, julian_date_tt, julian_date_ut
from .reading import CALENDAR, ECLIPTIC, HOURS, KitReader

#: Every how many days the Sun is read; the day of the month stars are read.
SUN_EVERY_DAYS = 5
STAR_DAY = 15
STAR_ALTITUDES_DEG = (20.0, 40.0, 60.0)
SUN_LOWEST_DEG = 10.0
#: Readings nearer the meridian than this hour angle are left out.
MIN_HOUR_ANGLE_DEG = 15.0
#: The Sun's altitude below which the stars are read (nautical twilight over).
DARK_SUN_DEG = -12.0
ROUNDS = 4
SCALES = (CALENDAR, ECLIPTIC, HOURS)
#: The diameters (mm) tried for a target accuracy, up to the largest a
#: recipe takes (kitgen.recipe.schema, diameter_mm).
TRIED_DIAMETERS_MM = (180.0, 240.0, 300.0, 360.0, 420.0, 480.0, 540.0, 600.0)


@dataclass(frozen=True)
class Errors:
    """How many readings were compared, and their worst and median error
    in minutes of time."""

    count: int
    worst_min: float
    median_min: float


@dataclass(frozen=True)
class Accuracy:
    """The check's figures: by the Sun and by the stars, exact and at the
    printed graduations, and the worst error each scale alone costs at
    its resolution (``by_scale``: ((scale, worst_min), ...))."""

    sun_exact: Errors | None
    sun_graduated: Errors | None
    star_exact: Errors | None
    star_graduated: Errors | None
    star_count: int
    by_scale: tuple[tuple[str, float], ...]

    @property
    def limiting_scale(self) -> str | None:
        return max(self.by_scale, key=lambda s: s[1])[0] if self.by_scale else None


def _sun(jd_ut: float) -> tuple[float, float]:
    """(apparent right ascension, declination) of the Sun, radians."""
    t = float(julian_centuries_tt(julian_date_tt(jd_ut)))
    return float(apparent_right_ascension_rad(t)) % (2 * math.pi), float(declination_rad(t))


def _cos_h(phi: float, dec: float, alt: float) -> float | None:
    den = math.cos(phi) * math.cos(dec)
    if abs(den) < 1e-12:
        return None
    return (math.sin(alt) - math.sin(phi) * math.sin(dec)) / den


def _jd(year: int, month: int, day: int, solar_hours: float, longitude_deg: float) -> float:
    # Apparent and mean time differ by at most 16 minutes: a hair of the
    # Sun's motion, so apparent time stands for mean time in the instant.
    return julian_date_ut(year, month, day, solar_hours - longitude_deg / 15.0)


def sun_truth_hours(year, month, day, phi, longitude_deg, altitude_deg, morning) -> float | None:
    """Local apparent solar time at which the Sun's centre stands at
    ``altitude_deg`` (no refraction), or None."""
    hours = 12.0
    for _ in range(ROUNDS):
        _, dec = _sun(_jd(year, month, day, hours, longitude_deg))
        c = _cos_h(phi, dec, math.radians(altitude_deg))
        if c is None or not -1.0 <= c <= 1.0:
            return None
        h = math.degrees(math.acos(c))
        hours = 12.0 - h / 15.0 if morning else 12.0 + h / 15.0
    return hours if h >= MIN_HOUR_ANGLE_DEG else None


def star_truth_hours(year, month, day, phi, longitude_deg, ra_deg, dec_deg, altitude_deg, east) -> float | None:
    """Local apparent solar time, that evening before midnight, at which
    the star stands at ``altitude_deg`` on the east or west side while the
    sky is dark, or None."""
    dec = math.radians(dec_deg)
    c = _cos_h(phi, dec, math.radians(altitude_deg))
    if c is None or not -1.0 <= c <= 1.0:
        return None
    h = math.degrees(math.acos(c))
    if h < MIN_HOUR_ANGLE_DEG:
        return None
    star_h = -h if east else h
    hours = 18.0
    for _ in range(ROUNDS):
        sun_ra, sun_dec = _sun(_jd(year, month, day, hours, longitude_deg))
        hours = (12.0 + (ra_deg + star_h - math.degrees(sun_ra)) / 15.0) % 24.0
    if hours < 12.0:
        return None
    sun_alt = math.asin(math.sin(phi) * math.sin(sun_dec)
                        + math.cos(phi) * math.cos(sun_dec) * math.cos(math.radians((hours - 12.0) * 15.0)))
    return hours if math.degrees(sun_alt) < DARK_SUN_DEG else None


def _minutes(read_h: float, true_h: float) -> float:
    return abs((read_h - true_h + 12.0) % 24.0 - 12.0) * 60.0


def _errors(values) -> Errors | None:
    return Errors(len(values), max(values), statistics.median(values)) if values else None


def check_kit(kit, stars: bool = True) -> Accuracy:
    """The accuracy of ``kit`` as printed (see the module docstring); by
    the Sun only when ``stars`` is false."""
    reader = KitReader(kit)
    plan = kit.plan
    year, phi = plan.epoch, math.radians(plan.plates[0].latitude_deg)
    lon = plan.site.longitude_deg or 0.0
    ways = {"exact": (), "graduated": SCALES, **{s: (s,) for s in SCALES}}
    found = {"sun": {k: [] for k in ways}, "star": {k: [] for k in ways}}
    alts = [a for a in reader.altitudes_deg if a >= SUN_LOWEST_DEG]
    for month, day in days_of_year(year)[::SUN_EVERY_DAYS]:
        for alt in alts:
            for morning in (True, False):
                truth = sun_truth_hours(year, month, day, phi, lon, alt, morning)
                if truth is None:
                    continue
                for way, graduated in ways.items():
                    read = reader.time_by_sun(month, day, alt, morning, graduated)
                    if read is not None:
                        found["sun"][way].append(_minutes(read, truth))
    stars = [n for n in reader.stars if n and not n.startswith("HIP")] if stars else []
    star_alts = [a for a in STAR_ALTITUDES_DEG if a in reader.altitudes_deg]
    for name in stars:
        el = reader.stars[name]
        for month in range(1, 13):
            for alt in star_alts:
                for east in (True, False):
                    truth = star_truth_hours(year, month, STAR_DAY, phi, lon, el.values["ra_deg"],
                                             el.values["dec_deg"], alt, east)
                    if truth is None:
                        continue
                    for way, graduated in ways.items():
                        read = reader.time_by_star(name, month, STAR_DAY, alt, east, graduated)
                        if read is not None:
                            found["star"][way].append(_minutes(read, truth))
    by_scale = tuple((s, max(found["sun"][s] + found["star"][s])) for s in SCALES
                     if found["sun"][s] or found["star"][s])
    return Accuracy(_errors(found["sun"]["exact"]), _errors(found["sun"]["graduated"]),
                    _errors(found["star"]["exact"]), _errors(found["star"]["graduated"]), len(stars), by_scale)


def diameter_for_target(kit, accuracy: Accuracy, target_min: float, rebuild) -> float | None:
    """The smallest diameter (mm), this kit's or one of
    :data:`TRIED_DIAMETERS_MM` above it, at which every reading by the Sun
    at the printed graduations is within ``target_min``; None if none is.
    A larger kit draws finer graduations where the smaller one had to thin
    them (kitgen.parts.legibility); the plan is otherwise the same.
    ``rebuild(plan)`` builds a kit (kitgen.kit.build_from_plan, which
    stands above this module)."""
    if accuracy.sun_graduated is not None and accuracy.sun_graduated.worst_min <= target_min:
        return kit.plan.diameter_mm
    for diameter in TRIED_DIAMETERS_MM:
        if diameter <= kit.plan.diameter_mm:
            continue
        larger = rebuild(replace(kit.plan, diameter_mm=diameter))
        found = check_kit(larger, stars=False).sun_graduated
        if found is not None and found.worst_min <= target_min:
            return diameter
    return None

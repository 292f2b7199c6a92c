"""The shipped bright-star catalogue and the choice of stars for a rete.

The catalogue (``kitgen/data/bright_stars.csv``, built by
``tools/build_star_catalogue.py`` from the Hipparcos new reduction; see
``bright_stars.md`` beside it) holds ICRS places at epoch J2000.0 in
degrees and proper motions in mas/yr.  Places at a kit's epoch come from
:func:`kitgen.sky.precession.mean_place_deg` (proper motion, then IAU 2006
precession).  Angles are in degrees throughout this module.
"""

from __future__ import annotations

import csv
import difflib
import io
import re
import unicodedata
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources
from typing import Callable, Iterable, Sequence

import numpy as np

from .precession import mean_place_deg

_HIP_RE = re.compile(r"^hip\s*(\d+)$")


@dataclass(frozen=True)
class Star:
    """One catalogue star: ICRS J2000.0 place (degrees), proper motion
    (mas/yr, the RA part multiplied by cos dec) and Hipparcos Hp magnitude."""

    hip: int
    name: str
    ra_deg: float
    dec_deg: float
    pm_ra_cosdec_mas_yr: float
    pm_dec_mas_yr: float
    mag: float

    @property
    def label(self) -> str:
        """The IAU name, or ``HIP n`` for a star without one."""
        return self.name if self.name else f"HIP {self.hip}"


@lru_cache(maxsize=1)
def catalogue() -> tuple[Star, ...]:
    """Every shipped star, brightest first (ties by HIP number); read once."""
    text = resources.files("kitgen").joinpath("data/bright_stars.csv").read_text(encoding="utf-8")
    stars = [
        Star(hip=int(row["hip"]), name=row["name"].strip(), ra_deg=float(row["ra_deg"]),
             dec_deg=float(row["dec_deg"]), pm_ra_cosdec_mas_yr=float(row["pm_ra_cosdec_mas_yr"]),
             pm_dec_mas_yr=float(row["pm_dec_mas_yr"]), mag=float(row["mag"]))
        for row in csv.DictReader(io.StringIO(text))
    ]
    return tuple(sorted(stars, key=lambda s: (s.mag, s.hip)))


def _fold(text: str) -> str:
    """Case-, accent- and spacing-insensitive form of a name."""
    decomposed = unicodedata.normalize("NFKD", text)
    bare = "".join(c for c in decomposed if not unicodedata.combining(c))
    return " ".join(bare.casefold().split())


def fold_name(text: str) -> str:
    """A star's name as names are matched: without regard to case,
    accents or spacing (:func:`find_star`)."""
    return _fold(text)


@lru_cache(maxsize=1)
def _index() -> dict[str, Star]:
    index = {}
    for star in catalogue():
        index[f"hip {star.hip}"] = star
        if star.name:
            index[_fold(star.name)] = star
    return index


def find_star(name: str) -> Star | None:
    """The star called ``name`` (an IAU name, or ``HIP 1234``), matched
    without regard to case, accents or spacing; ``None`` if there is none."""
    key = _fold(str(name))
    hip = _HIP_RE.match(key)
    if hip:
        key = f"hip {int(hip.group(1))}"
    return _index().get(key)


def closest_name(name: str) -> str | None:
    """The IAU name closest in spelling to ``name`` (difflib's ratio of at
    least 0.6), for a suggestion; ``None`` if none is close."""
    folded_names = {_fold(s.name): s.name for s in named_stars()}
    close = difflib.get_close_matches(_fold(str(name)), list(folded_names), n=1, cutoff=0.6)
    return folded_names[close[0]] if close else None


def named_stars() -> tuple[Star, ...]:
    """The stars that have an IAU name, brightest first."""
    return tuple(s for s in catalogue() if s.name)


def places_at_epoch(stars: Sequence[Star], epoch_year: float) -> tuple[np.ndarray, np.ndarray]:
    """Mean RA and Dec (degrees) of ``stars`` at the equator and equinox of
    ``epoch_year`` (Julian epoch), proper motion applied, as two arrays."""
    if not stars:
        return np.zeros(0), np.zeros(0)
    ra = np.array([s.ra_deg for s in stars])
    dec = np.array([s.dec_deg for s in stars])
    pm_ra = np.array([s.pm_ra_cosdec_mas_yr for s in stars])
    pm_dec = np.array([s.pm_dec_mas_yr for s in stars])
    ra_e, dec_e = mean_place_deg(ra, dec, pm_ra, pm_dec, epoch_year)
    return np.atleast_1d(ra_e), np.atleast_1d(dec_e)


FitTest = Callable[[np.ndarray, np.ndarray], np.ndarray]


def _fitting(stars: Sequence[Star], epoch_year: float, fits: FitTest) -> np.ndarray:
    ra, dec = places_at_epoch(stars, epoch_year)
    if not stars:
        return np.zeros(0, dtype=bool)
    ok = np.asarray(fits(ra, dec), dtype=bool)
    if ok.shape != ra.shape:
        raise ValueError(f"fits() returned shape {ok.shape} for {ra.shape} places")
    return ok


#: The pole star a brightest-N rete carries besides its N where it fits
#: (a northern rete): the star a pupil finds north by, at the pin, on
#: every northern planisphere (common practice, no source), though some 47
#: named stars outshine it and a rete reaching far south leaves it out of
#: its 32 brightest (#12 review: none at 40 N, where 52.2 N had it).
POLE_STAR = "Polaris"


def select_stars(names: Sequence[str], brightest: int | None, magnitude_limit: float | None,
                 epoch_year: float, fits: FitTest, pole_star: bool = False) -> list[Star]:
    """The stars a rete carries.

    ``fits(ra_deg, dec_deg)`` says, for arrays of places at the epoch, which
    lie on the rete.  Named stars (names the catalogue knows, checked by the
    recipe) come in the given order, duplicates dropped, those that do not
    fit left out (see :func:`outside`); ``brightest=N`` gives the N
    brightest named stars that fit, and with ``pole_star`` :data:`POLE_STAR`
    too where it fits and is not among them (in its place by brightness);
    ``magnitude_limit=M`` every star, named or not, of magnitude M or
    brighter that fits.
    """
    if names:
        chosen = list(dict.fromkeys(find_star(n) for n in names))
        if None in chosen:
            raise ValueError("select_stars() needs names the catalogue knows")
        ok = _fitting(chosen, epoch_year, fits)
        return [s for s, inside in zip(chosen, ok) if inside]
    if brightest is not None:
        pool = list(named_stars())
        ok = _fitting(pool, epoch_year, fits)
        fitting = [s for s, inside in zip(pool, ok) if inside]
        n = max(0, int(brightest))
        chosen, fainter = fitting[:n], fitting[n:]
        pole = find_star(POLE_STAR) if pole_star else None
        if pole is not None and pole in fainter:   # after the N brightest: still brightest first
            chosen.append(pole)
        return chosen
    if magnitude_limit is not None:
        pool = [s for s in catalogue() if s.mag <= magnitude_limit]
        ok = _fitting(pool, epoch_year, fits)
        return [s for s, inside in zip(pool, ok) if inside]
    return []


def outside(names: Sequence[str], epoch_year: float, fits: FitTest) -> list[str]:
    """The labels of the named stars that ``fits`` leaves off the rete."""
    stars = [find_star(n) for n in names]
    ok = _fitting([s for s in stars if s], epoch_year, fits)
    return [s.label for s, inside in zip([s for s in stars if s], ok) if not inside]


def filter_stars(name_substring: str | None = None, max_mag: float | None = None) -> list[Star]:
    """Catalogue stars whose label contains ``name_substring`` (case- and
    accent-insensitive) and whose magnitude is at most ``max_mag``."""
    needle = _fold(name_substring) if name_substring else ""
    return [s for s in catalogue()
            if (not needle or needle in _fold(s.label))
            and (max_mag is None or s.mag <= max_mag)]


def _sexagesimal(value: float, decimals: int, words) -> tuple[int, int, str]:
    """Whole units, minutes and seconds (as text) of a non-negative value."""
    scale = 10 ** decimals
    total = round(value * 3600.0 * scale)
    whole, rest = divmod(total, 3600 * scale)
    minutes, seconds = divmod(rest, 60 * scale)
    width = 2 + (decimals + 1 if decimals else 0)
    sec_text = words.number(seconds / scale, decimals).rjust(width, "0")
    return int(whole), int(minutes), sec_text


def format_star_table(stars: Iterable[Star], epoch_year: float, words) -> str:
    """A plain-text table of ``stars`` (HIP, name, RA as h:m:s and Dec as
    d:m:s at the mean equator and equinox of ``epoch_year``, magnitude)
    with column headings from ``words`` (keys ``stars.*``)."""
    stars = list(stars)
    ra, dec = places_at_epoch(stars, epoch_year)
    header = [words("stars.hip"), words("stars.name"), words("stars.ra"), words("stars.dec"), words("stars.mag")]
    rows = []
    for star, ra_deg, dec_deg in zip(stars, ra, dec):
        h, m, s = _sexagesimal(float(ra_deg) / 15.0, 1, words)
        if h == 24:
            h = 0
        sign = "-" if dec_deg < 0 else "+"
        d, dm, ds = _sexagesimal(abs(float(dec_deg)), 0, words)
        rows.append([str(star.hip), star.name, f"{h:02d}:{m:02d}:{s}", f"{sign}{d:02d}:{dm:02d}:{ds}",
                     words.number(star.mag, 2)])
    widths = [max(len(r[i]) for r in [header] + rows) for i in range(len(header))]
    right = (True, False, True, True, True)

    def line(cells):
        return "  ".join(c.rjust(w) if r else c.ljust(w) for c, w, r in zip(cells, widths, right)).rstrip()

    return "\n".join([line(header)] + [line(r) for r in rows]) + "\n"

"""Finding places by name: :func:`search` for a list that follows the
typing, :func:`resolve` for the one place a recipe means.

A query is a name, optionally followed by a region and a country after
commas, as people write addresses: ``Lisbon``, ``Lisbon, PT``,
``Lisbon, Portugal``, ``Lisbon, OH, US``.  The country is its ISO 3166
code or its English name; the region is the GeoNames first-level
division code (a US or Canadian state's postal code, a number elsewhere).
Names match folded (:func:`~kitgen.places.names.fold`: accents, case and
punctuation ignored) against the place's name and all its alternate
names, in every script.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..errors import CountryName, KeyedError, Message, Number, shown
from .index import PlaceIndex, place_index
from .names import fold

#: Longest query read (the longest GeoNames name is far shorter).
MAX_QUERY_CHARS = 120
#: Candidates listed in the message for an ambiguous name.
MAX_CANDIDATES = 5
#: Places of one name this close (degrees, both ways) and in one zone are
#: one place for a kit: 0.1 deg of longitude is 0.4 min of clock time.
SAME_PLACE_DEG = 0.1
#: Rows looked at, in order of population, to put places whose own name
#: matches before those matched by an alternate name.
OWN_NAME_SCAN = 200
#: How many times larger than the next a place known by a name only as an
#: alternate must be to be the one meant, and than the largest place of
#: that very name to be among those it may mean.
ALTERNATE_DOMINANCE = 100
#: Least similarity (0-100, rapidfuzz's ratio) of a suggested spelling.
SUGGESTION_CUTOFF = 75.0


class PlaceError(KeyedError, ValueError):
    """A place name that names no place, or several: a key of the
    templates' ``errors`` section and its values."""


@dataclass(frozen=True)
class Place:
    """One GeoNames populated place.  ``region`` is the first-level
    administrative division's GeoNames code; ``latitude_deg`` is north
    positive and ``longitude_deg`` east positive (WGS 84); ``timezone`` is
    an IANA zone name."""

    name: str
    region: str
    country_code: str
    population: int
    latitude_deg: float
    longitude_deg: float
    timezone: str
    geonameid: int = 0

    def label(self) -> str:
        """``Name, REGION, CC``: a query that finds this place again."""
        return ", ".join(p for p in (self.name, self.region, self.country_code) if p)


def _place(index: PlaceIndex, row: int) -> Place:
    return Place(index.name(row), index.regions[index.region[row]], index.country_codes[index.country[row]],
                 int(index.population[row]), float(index.latitude_deg[row]), float(index.longitude_deg[row]),
                 index.zones[index.timezone[row]], int(index.geonameid[row]))


@dataclass(frozen=True)
class _Query:
    name: str                    # folded
    filters: tuple[tuple, ...]   # possible (country number or None, region number or None) readings


def _country_numbers(index: PlaceIndex, text: str) -> list[int]:
    return index.countries_by_name.get(fold(text), [])


def _region_numbers(index: PlaceIndex, text: str) -> list[int]:
    return index.regions_by_code.get(fold(text), [])


def _parse(index: PlaceIndex, query: str) -> _Query | None:
    """The query's folded name and the ways of reading its qualifiers:
    ``Name, X`` is a country, or else a region; ``Name, X, Y`` a region
    and a country.  ``None`` when a qualifier names neither."""
    parts = [p.strip() for p in str(query)[:MAX_QUERY_CHARS].split(",")]
    name, quals = fold(parts[0]), [q for q in parts[1:] if q]
    if not quals:
        return _Query(name, ((None, None),))
    if len(quals) == 1:
        readings = [(c, None) for c in _country_numbers(index, quals[0])]
        readings += [(None, r) for r in _region_numbers(index, quals[0])]
    else:
        readings = [(c, r) for c in _country_numbers(index, quals[-1]) for r in _region_numbers(index, quals[-2])]
    return _Query(name, tuple(readings)) if readings else None


def _filtered(index: PlaceIndex, rows: np.ndarray, reading: tuple) -> np.ndarray:
    country, region = reading
    if country is not None:
        rows = rows[index.country[rows] == country]
    if region is not None:
        rows = rows[index.region[rows] == region]
    return rows


def _matches(index: PlaceIndex, q: _Query, prefix: bool) -> np.ndarray:
    """Rows matching the query's name exactly (or as a prefix), under the
    first reading of its qualifiers that finds any, most populous first
    (for an unqualified prefix, the :data:`OWN_NAME_SCAN` most populous)."""
    unqualified = q.filters == ((None, None),)
    rows = (index.rows_starting(q.name, OWN_NAME_SCAN if unqualified else None) if prefix
            else index.rows_named(q.name))
    for reading in q.filters:
        found = _filtered(index, rows, reading)
        if len(found):
            return found
    return rows[:0]


def _fuzzy_rows(index: PlaceIndex, q: _Query, limit: int) -> list[int]:
    """Rows of the places whose folded main names are the closest
    spellings of the query's name (Levenshtein-based ratio, rapidfuzz),
    best first, under the qualifiers."""
    from rapidfuzz import fuzz, process   # here: only a misspelt place pays its import

    out: list[int] = []
    for key, _, _ in process.extract(q.name, index.distinct_names, scorer=fuzz.ratio, limit=limit * 3,
                                     score_cutoff=SUGGESTION_CUTOFF):
        for row in _matches(index, _Query(key, q.filters), prefix=False)[:1]:
            if int(row) not in out:
                out.append(int(row))
    return out[:limit]


def _own_first(index: PlaceIndex, rows: np.ndarray, folded: str, prefix: bool, limit: int) -> list[int]:
    """Up to ``limit`` of ``rows`` (most populous first): those whose own
    name matches ``folded`` (equals it, or starts with it) first."""
    own, other = [], []
    key = folded.encode("utf-8")
    for r in rows[:OWN_NAME_SCAN]:
        name = index.main_key(int(r))
        (own if (name.startswith(key) if prefix else name == key) else other).append(int(r))
        if len(own) >= limit:
            break
    return (own + other)[:limit]


def _rows(index: PlaceIndex, q: _Query, limit: int) -> list[int]:
    """Exact matches, then prefix matches, own names first in each."""
    rows = _own_first(index, _matches(index, q, prefix=False), q.name, False, limit)
    rows += _own_first(index, _matches(index, q, prefix=True), q.name, True, limit)
    return list(dict.fromkeys(rows))[:limit]


def search(query: str, limit: int = 10) -> list[Place]:
    """Up to ``limit`` places for ``query`` (see the module docstring),
    best first: places of exactly that name, then places whose name starts
    with it, or else close spellings; in each group
    places whose own name matches come before those that match by an
    alternate name, and larger places before smaller.  A qualifier that
    names no country or region, or none with a place of that name, is
    left out, as one still being typed."""
    index = place_index()
    if not isinstance(query, str) or limit < 1:
        return []
    # A qualifier still being typed ("Lisbon, P") is no filter yet.
    q = _parse(index, query) or _parse(index, query.split(",")[0])
    if q is None or not q.name:
        return []
    rows = _rows(index, q, limit)
    if not rows and q.filters != ((None, None),):
        rows = _rows(index, _Query(q.name, ((None, None),)), limit)  # a qualifier still being typed
    if not rows and len(q.name) >= 3:
        rows = _fuzzy_rows(index, q, limit)
    return [_place(index, r) for r in rows]


def _one_place(index: PlaceIndex, rows: np.ndarray) -> bool:
    """Whether all ``rows`` are, for a kit, the first one: same zone, and
    within :data:`SAME_PLACE_DEG` of it in latitude and longitude."""
    first = rows[0]
    return bool(np.all(index.timezone[rows] == index.timezone[first])
                and np.all(np.abs(index.latitude_deg[rows] - index.latitude_deg[first]) <= SAME_PLACE_DEG)
                and np.all(np.abs(index.longitude_deg[rows] - index.longitude_deg[first]) <= SAME_PLACE_DEG))


def _candidates(index: PlaceIndex, rows: np.ndarray, folded: str) -> np.ndarray:
    """The places a name may mean: those whose own name it is, and those
    that bear it as an alternate name only when they are
    :data:`ALTERNATE_DOMINANCE` times the largest of the first (Cologne is
    Köln as well as a village of that name; a hamlet once called São Paulo
    is not what "São Paulo" means, nor is Bordeaux, which GeoNames also
    calls Porto and which is about as large as Porto, what "Porto"
    means).  Most populous first."""
    own = [r for r in rows if index.is_main_name(int(r), folded)]
    if not own:
        # Alternate names only: the largest place is meant when it is
        # ALTERNATE_DOMINANCE times the next (New York City, not the
        # hamlet of Niu-York).
        if len(rows) > 1 and index.population[rows[0]] >= ALTERNATE_DOMINANCE * index.population[rows[1]]:
            return rows[:1]
        return rows
    least = ALTERNATE_DOMINANCE * index.population[own[0]]
    return np.array([r for r in rows if r in own or index.population[r] >= least], dtype=rows.dtype)


def candidate(place: Place, others=()) -> Message:
    """A place as the ambiguity message lists it: town (region, country,
    population).  A region's GeoNames code that is a number ("60" for the
    Valencian Community) tells a reader nothing, so the country's name
    (CLDR, in the message's language) stands in its place, beside the
    country's code that a query writes: "Valencia (Spain, ES, 824,340)";
    a region's letters, such as a US state's, are kept: "Springfield
    (MO, US, 170,188)"; so is any region's code where another of the
    places listed, ``others``, is in the same country: it is then what
    tells the two apart in a query."""
    twin = any(o is not place and o.country_code == place.country_code for o in others)
    named = place.region and (twin or not place.region.isdigit())
    region = place.region if named else CountryName(place.country_code)
    return Message("errors.place_candidate", name=place.name, region=region,
                   country=place.country_code, population=Number(place.population, 0))


def _how_to_choose(places: list[Place]) -> Message:
    """The hint of an ambiguous name: a qualified example that tells the
    first candidate from the others."""
    first, others = places[0], places[1:]
    if all(p.country_code != first.country_code for p in others):
        example = f"{first.name}, {first.country_code}"
    elif all((p.region, p.country_code) != (first.region, first.country_code) for p in others):
        example = f"{first.name}, {first.region}, {first.country_code}"
    else:
        return Message("errors.hint_place_coordinates")
    return Message("errors.hint_place_qualify", example=example)


@lru_cache(maxsize=1024)
def resolve(name: str) -> Place:
    """The one place ``name`` (a query, see the module docstring) names;
    raises :class:`PlaceError` when it names none (suggesting close
    spellings) or several that are not one place for a kit (listing the
    most populous and saying how to choose).  Kept for the process, as
    the index is: a class set's roster names each school's town on every
    pupil's row (#12)."""
    return _resolve(name, suggest=True)


def query_for(place: Place) -> str:
    """The shortest query that finds ``place`` again, as a suggestion
    writes it: ``Name, CC`` where that names it alone, else ``Name,
    REGION, CC`` (:meth:`Place.label`; a region's GeoNames code is digits
    in many countries, and tells a reader little)."""
    short = f"{place.name}, {place.country_code}"
    try:
        if _resolve(short, suggest=False).geonameid == place.geonameid:
            return short
    except PlaceError:
        pass
    return place.label()


def _resolve(name: str, suggest: bool) -> Place:
    """:func:`resolve`, with close spellings suggested or not."""
    index = place_index()
    text = " ".join(str(name).split())
    q = _parse(index, text)
    if q is None:
        raise PlaceError("errors.place_qualifier", name=shown(text))
    rows = _matches(index, q, prefix=False) if q.name else np.array([], dtype=np.int64)
    if len(rows) == 0:
        close = [query_for(_place(index, r)) for r in _fuzzy_rows(index, q, 3)] if q.name and suggest else []
        hint = (Message("errors.hint_did_you_mean", name=" / ".join(close)) if close
                else Message("errors.hint_place_search"))
        raise PlaceError("errors.place_unknown", name=shown(text), hint=hint)
    rows = _candidates(index, rows, q.name)
    if len(rows) == 1 or _one_place(index, rows):
        # One place for a kit: the one of that very name where there is
        # one (New Delhi, not the larger Delhi that also bears the name).
        own = [r for r in rows if index.is_main_name(int(r), q.name)]
        return _place(index, int(own[0] if own else rows[0]))
    places = [_place(index, int(r)) for r in rows[:MAX_CANDIDATES]]
    raise PlaceError("errors.place_ambiguous", name=shown(text), count=len(rows),
                     candidates=[candidate(p, places) for p in places], hint=_how_to_choose(places))


"""Where the kit is for: the recipe's latitude, longitude, time zone and
place, made one consistent site (#10).

Coordinates given in the recipe win: ``place`` is then only the name
printed on the kit (an invented town still builds), and the gazetteer
is asked only whether the coordinates and zone are the place's own, to
name the clock by the town (:func:`_is_the_towns_own`).  Without a latitude, ``place`` is looked up in the offline
gazetteer (:mod:`kitgen.places`), which gives latitude, longitude and
time zone, and the kit prints the name as written, without its country
or region (:func:`printed_name`); a ``timezone`` key still overrides the
place's zone.  A
longitude without a latitude is refused: half a position is a mistake.
So is a longitude without a time zone, or a zone without a longitude:
the kit's clock time needs both, and one alone would go unused (#10).
"""

from __future__ import annotations

import difflib
from functools import lru_cache

from ..errors import KeyedError, Message, UserError
from ..sky.zone import MAX_ZONE_CHARS, UnknownZone, known_zones, zone


class TimezoneError(KeyedError, ValueError):
    """A time zone that is not an IANA zone name."""


def parse_timezone(value) -> str:
    """An IANA time zone name (``Europe/Lisbon``), checked against the
    database that ``zoneinfo`` reads (the ``tzdata`` package)."""
    text = value if isinstance(value, str) else repr(value)
    try:
        zone(value if isinstance(value, str) else "")  # a list or a mapping is no zone (and not hashable)
    except UnknownZone:
        close = difflib.get_close_matches(text[:MAX_ZONE_CHARS], sorted(known_zones()), n=1, cutoff=0.7)
        hint = Message("errors.hint_did_you_mean", name=close[0]) if close else ""
        raise TimezoneError("errors.timezone_unknown", value=repr(text[:MAX_ZONE_CHARS]), hint=hint) from None
    return value


def printed_name(query: str) -> str:
    """The name a kit prints for a place looked up by ``query``: the name
    as the user wrote it, without the country or region that told the
    gazetteer which place it is ("Le Havre, FR": "Le Havre"; "Wien, AT"
    stays "Wien", where the gazetteer's own name is "Vienna")."""
    return " ".join(str(query).split(",")[0].split())


def look_up_place(query: str, place_where):
    """The gazetteer's place for ``query`` (kitgen.places.resolve); one it
    does not know or cannot tell apart is a :class:`UserError` of the
    ``place`` key at ``place_where`` (its line in messages)."""
    from ..places import PlaceError, resolve   # the gazetteer, only for a recipe that names a place

    try:
        return resolve(query)
    except PlaceError as exc:
        label = Message("errors.key_label", where=place_where, name="place")
        raise UserError("errors.key_problem", label=label, problem=exc) from None


def resolve_site(values: dict, source, place_where) -> None:
    """Complete the validated recipe ``values`` (Recipe field names) with
    the site: look ``place`` up when no latitude is given.  ``source``
    names the recipe and ``place_where`` the place key's line in messages.
    Raises :class:`UserError` for a longitude without a latitude, for a
    longitude or a time zone without the other, and for a place the
    gazetteer does not know or cannot tell apart."""
    if "longitude_deg" in values and "latitude_deg" not in values:
        raise UserError("errors.longitude_without_latitude", source=source)
    if "latitude_deg" not in values and values.get("place"):
        place = look_up_place(values["place"], place_where)
        values["latitude_deg"] = place.latitude_deg
        values["longitude_deg"] = place.longitude_deg
        values["place"] = printed_name(values["place"])
        if values.get("timezone") is None:   # the town's own clock, named by the town (not the zone's city)
            values["timezone"] = place.timezone
            values["clock_place"] = values["place"]
    # Clock time needs both: one alone would be silently unused (#10).
    has_longitude, has_zone = values.get("longitude_deg") is not None, values.get("timezone") is not None
    if has_longitude != has_zone:
        given, missing = ("longitude", "timezone") if has_longitude else ("timezone", "longitude")
        raise UserError("errors.clock_needs_both", source=source, given=given, missing=missing)
    if has_zone and values.get("place") and not values.get("clock_place"):
        if _is_the_towns_own(values["place"], values["latitude_deg"], values["longitude_deg"], values["timezone"]):
            values["clock_place"] = values["place"]


@lru_cache(maxsize=256)   # a roster gives its school's town, coordinates and zone on every pupil's row
def _is_the_towns_own(place: str, latitude_deg: float, longitude_deg: float, timezone: str) -> bool:
    """Whether the recipe's coordinates and zone are the gazetteer's record
    of the place it names (within the gazetteer's own SAME_PLACE_DEG, as
    the web page fills them in for a town picked from its suggestions, or
    a user copies them): its clock is then named by the town, as for a
    town looked up, not by the zone's city ("New Delhi", not "Kolkata").
    A name the gazetteer does not know (an invented town), or coordinates
    or a zone that are not its, keep the zone's city; nothing is refused."""
    from ..places import search   # the gazetteer, only for a recipe that names a place
    from ..places.search import SAME_PLACE_DEG

    try:
        found = search(place, limit=10)
    except Exception:   # any fault of the lookup: the clock keeps the zone's name
        return False
    return any(p.timezone == timezone and abs(p.latitude_deg - latitude_deg) <= SAME_PLACE_DEG
               and abs(p.longitude_deg - longitude_deg) <= SAME_PLACE_DEG for p in found)

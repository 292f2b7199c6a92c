"""A time zone's offset from UT on a date, from the IANA time zone
database (Python's ``zoneinfo``, with the ``tzdata`` package so that every
system has the same data).

The offset on a date is taken at 12:00 local clock time, as a kit's
clock correction is one value per day and read by day; summer time
switches in the small hours, so noon is on the day's side of any switch.
Minutes in and out; no angles here.
"""

from __future__ import annotations

import datetime as _dt
import zoneinfo
from functools import lru_cache

#: Longest IANA zone name accepted (the longest in the database is 32).
MAX_ZONE_CHARS = 64


class UnknownZone(ValueError):
    """Not a zone of the IANA database."""


def zone(name: str) -> zoneinfo.ZoneInfo:
    """The IANA zone ``name`` (such as ``Europe/Lisbon``); raises
    :class:`UnknownZone` for any other text or value."""
    if not isinstance(name, str) or not 0 < len(name) <= MAX_ZONE_CHARS or name != name.strip():
        raise UnknownZone(repr(name)[:MAX_ZONE_CHARS])
    return _zone(name)


@lru_cache(maxsize=64)
def _zone(name: str) -> zoneinfo.ZoneInfo:
    try:
        return zoneinfo.ZoneInfo(name)
    except (zoneinfo.ZoneInfoNotFoundError, ValueError, OSError):
        raise UnknownZone(name) from None


def known_zones() -> frozenset[str]:
    """Every zone name the database offers (for suggestions)."""
    return frozenset(zoneinfo.available_timezones())


def offset_at_noon_min(name: str, year: int, month: int, day: int) -> tuple[float, float]:
    """(offset from UT, of which summer time), minutes, at 12:00 local
    clock time of the date in zone ``name``: zone time = UT + offset."""
    noon = _dt.datetime(year, month, day, 12, 0, tzinfo=zone(name))
    summer = noon.dst()
    return noon.utcoffset().total_seconds() / 60.0, (summer.total_seconds() / 60.0 if summer else 0.0)


def changes_offset(name: str, year: int) -> bool:
    """Whether zone ``name``'s clocks change their offset from UT during
    ``year`` (summer time, or a change of standard time): the offset at
    noon of each day of the year compared with that of 1 January."""
    first = _dt.datetime(year, 1, 1, 12, 0, tzinfo=zone(name)).utcoffset()
    day = _dt.date(year, 1, 1)
    while day.year == year:
        if _dt.datetime(day.year, day.month, day.day, 12, 0, tzinfo=zone(name)).utcoffset() != first:
            return True
        day += _dt.timedelta(days=1)
    return False


def local_clock_min(name: str, unix_s: float) -> tuple[_dt.date, float]:
    """The local date and the minutes after local midnight on the zone's
    clock at the instant ``unix_s`` (seconds of UT since 1970-01-01)."""
    at = _dt.datetime(1970, 1, 1, tzinfo=_dt.timezone.utc) + _dt.timedelta(seconds=unix_s)
    local = at.astimezone(zone(name))
    return local.date(), local.hour * 60.0 + local.minute + (local.second + local.microsecond / 1e6) / 60.0

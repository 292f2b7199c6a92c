"""Longitudes as people write them, in the forms the latitude parser
(:mod:`kitgen.recipe.latitude`) accepts, with E and W for N and S.

A number (``-9.14``, east positive, as ISO 6709 and GeoNames have it) or
text: ``9.14W``, ``9 8 24 W``, ``9°8′24″W``, ``W 9 8.4``, ``151 12 E``,
``-9:08:24``.  The letter (or the words east / west) stands at the end,
or a capital E or W at the start as GPS receivers write it; a minus sign
means west.  A decimal comma is refused, as for a latitude.
"""

from __future__ import annotations

import math
import re

from ..errors import KeyedError, beyond

ACCEPTED_FORMS = "-9.14, 9.14W, 9 8 24 W, 9°8′24″W, 151 12 E"
#: Longest text read as a longitude.
MAX_CHARS = 40

_UNIT_MARKS = re.compile(r"[°º˚d:′'’m″\"”s]")
_NUMBER = r"\d+(?:\.\d+)?"


class LongitudeError(KeyedError, ValueError):
    """A longitude that cannot be read: a key of the templates' ``errors``
    section and its values."""


def _q(value: str) -> str:
    return repr(" ".join(value.split())[:MAX_CHARS])


def parse_longitude(value) -> float:
    """Longitude in degrees (east positive, -180 to 180) from a number or
    a written form; raises :class:`LongitudeError` with a one-line reason."""
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise LongitudeError("errors.longitude_type", forms=ACCEPTED_FORMS)
    if isinstance(value, int) and abs(value) > 1000:
        raise LongitudeError("errors.longitude_range", value=str(value)[:20])
    if isinstance(value, (int, float)):
        if not math.isfinite(value):
            raise LongitudeError("errors.longitude_unreadable", value=repr(value), forms=ACCEPTED_FORMS)
        return _in_range(float(value))
    text = value.strip()
    if len(text) > MAX_CHARS:
        raise LongitudeError("errors.longitude_unreadable", value=_q(value), forms=ACCEPTED_FORMS)
    if re.search(r"\d,\d", text):
        raise LongitudeError("errors.latitude_comma", value=_q(value), forms=ACCEPTED_FORMS)
    hemisphere = 1.0
    m = re.search(r"\s*(E|W|east|west|East|West|EAST|WEST)$", text)
    if not m:
        m = re.match(r"(E|W)\s*(?=\d)", text)
    if m:
        hemisphere = -1.0 if m.group(1).lower().startswith("w") else 1.0
        text = text[: m.start()] + text[m.end():]
    sign = 1.0
    if text.startswith(("-", "+", "−")):
        sign = -1.0 if text[0] in "-−" else 1.0
        text = text[1:]
        if m:
            raise LongitudeError("errors.latitude_sign_and_letter", value=_q(value))
    if re.search(r"\d\s*[ew]$", text):
        raise LongitudeError("errors.longitude_letter_case", value=_q(value))
    parts = _UNIT_MARKS.sub(" ", text).split()
    if not 1 <= len(parts) <= 3 or not all(re.fullmatch(_NUMBER, p) for p in parts):
        raise LongitudeError("errors.longitude_unreadable", value=_q(value), forms=ACCEPTED_FORMS)
    nums = [float(p) for p in parts]
    if any(x >= 60.0 for x in nums[1:]):
        raise LongitudeError("errors.latitude_minutes", value=_q(value))
    if any(float(p) != int(float(p)) for p in parts[:-1]):
        raise LongitudeError("errors.latitude_decimals", value=_q(value))
    degrees = nums[0] + (nums[1] / 60.0 if len(nums) > 1 else 0.0) + (nums[2] / 3600.0 if len(nums) > 2 else 0.0)
    return _in_range(sign * hemisphere * degrees)


def _in_range(lon: float) -> float:
    if not -180.0 <= lon <= 180.0:
        raise LongitudeError("errors.longitude_range", value=beyond(lon, -180.0, 180.0))
    return lon

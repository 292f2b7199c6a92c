"""Latitudes as people write them.

Accepted: a number (``48.2``, ``-33.9``) or text in degrees, minutes and
seconds as maps and atlases print them: ``40°26′46″N``, ``40 26 46 N``,
``40°26.77'N``, ``33.9S``, ``40d26m46sN``, ``-12:30:00``, ``N 40 26.767``.
The hemisphere is an upper-case ``N`` or ``S`` (or the words north / south)
at the end, or a capital ``N`` or ``S`` at the start as GPS receivers write
it; a minus sign means south.  A decimal comma (``40,5``) is refused: in a recipe
it cannot be told from a list.
"""

from __future__ import annotations

import math
import re

from ..errors import KeyedError, beyond

ACCEPTED_FORMS = "48.2, -33.9, 33.9S, 40 26 46 N, 40°26′46″N, 40d26m46sN"
#: Longest text read as a latitude (the longest form above is 14 characters).
MAX_CHARS = 40

_UNIT_MARKS = re.compile(r"[°º˚d:′'’m″\"”s]")
_NUMBER = r"\d+(?:\.\d+)?"


class LatitudeError(KeyedError, ValueError):
    """A latitude that cannot be read: a key of the templates' ``errors``
    section and its values, like :class:`~kitgen.errors.UserError`."""


def _q(value: str) -> str:
    """The text as the user wrote it, quoted, for a message."""
    return repr(" ".join(value.split())[:MAX_CHARS])


def parse_latitude(value) -> float:
    """Latitude in degrees (north positive) from a number or a written
    form; raises :class:`LatitudeError` with a one-line reason."""
    if isinstance(value, bool):
        raise LatitudeError("errors.latitude_type", forms=ACCEPTED_FORMS)
    if isinstance(value, int) and abs(value) > 1000:
        raise LatitudeError("errors.latitude_far", forms=ACCEPTED_FORMS)
    if isinstance(value, (int, float)):
        if not math.isfinite(value):
            raise LatitudeError("errors.latitude_not_finite", value=value)
        return _in_range(float(value))
    if not isinstance(value, str):
        raise LatitudeError("errors.latitude_type", forms=ACCEPTED_FORMS)
    text = value.strip()
    if len(text) > MAX_CHARS:
        raise LatitudeError("errors.latitude_text_long", length=len(text), forms=ACCEPTED_FORMS)
    if re.search(r"\d,\d", text):
        raise LatitudeError("errors.latitude_comma", value=_q(value), forms=ACCEPTED_FORMS)
    hemisphere = 1.0
    m = re.search(r"\s*(N|S|north|south|North|South|NORTH|SOUTH)$", text)
    if not m:
        # The hemisphere first, as GPS receivers write it: N 40 26.767, S33.9.
        m = re.match(r"(N|S)\s*(?=\d)", text)
    if m:
        hemisphere = -1.0 if m.group(1).lower().startswith("s") else 1.0
        text = text[: m.start()] + text[m.end():]
    sign = 1.0
    if text.startswith(("-", "+", "−")):
        sign = -1.0 if text[0] in "-−" else 1.0
        text = text[1:]
        if m:
            raise LatitudeError("errors.latitude_sign_and_letter", value=_q(value))
    if re.search(r"\d\s*[ns]$", text) and len(re.findall(_NUMBER, text)) < 3:
        raise LatitudeError("errors.latitude_hemisphere_case", value=_q(value))
    parts = _UNIT_MARKS.sub(" ", text).split()
    if not 1 <= len(parts) <= 3 or not all(re.fullmatch(_NUMBER, p) for p in parts):
        raise LatitudeError("errors.latitude_unreadable", value=_q(value), forms=ACCEPTED_FORMS)
    nums = [float(p) for p in parts]
    if any(x >= 60.0 for x in nums[1:]):
        raise LatitudeError("errors.latitude_minutes", value=_q(value))
    if any(float(p) != int(float(p)) for p in parts[:-1]):
        raise LatitudeError("errors.latitude_decimals", value=_q(value))
    degrees = nums[0] + (nums[1] / 60.0 if len(nums) > 1 else 0.0) + (nums[2] / 3600.0 if len(nums) > 2 else 0.0)
    return _in_range(sign * hemisphere * degrees)


def _in_range(lat: float) -> float:
    if not -90.0 <= lat <= 90.0:
        raise LatitudeError("errors.latitude_range", value=beyond(lat, -90.0, 90.0))
    return lat

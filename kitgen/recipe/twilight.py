"""The recipe's ``twilight:``: which twilight circles the plates draw (#10).

Twilight ends when the Sun's centre is 6 deg (civil), 12 deg (nautical)
or 18 deg (astronomical) below the horizon (:data:`kitgen.sky.constants.TWILIGHT_DEG`,
with its source).

The key takes one name, several (a list, or names separated by commas as
a form field gives them), ``none``, or ``true`` / ``false`` as before
(``true`` is astronomical twilight, the circle kits have always drawn).
"""

from __future__ import annotations

from ..errors import KeyedError
from ..sky.constants import TWILIGHT_DEG
NONE = "none"
#: What ``twilight: true`` means.
DEFAULT = ("astronomical",)


class TwilightError(KeyedError, ValueError):
    """A twilight value that is none of the names."""


def _names(value) -> list[str]:
    if isinstance(value, bool):
        return list(DEFAULT) if value else []
    if isinstance(value, str):
        return [v.strip().lower() for v in value.split(",") if v.strip()]
    if isinstance(value, list) and all(isinstance(v, str) for v in value):
        return [v.strip().lower() for v in value]
    raise TwilightError("errors.twilight_value", value=repr(value)[:40], names=[*TWILIGHT_DEG, NONE])


def parse_twilight(value) -> tuple[str, ...]:
    """The twilight names asked for, deepest last, without repeats; ``()``
    for none.  Raises :class:`TwilightError` for anything else."""
    names = _names(value)
    if names == [NONE]:
        return ()
    bad = [n for n in names if n not in TWILIGHT_DEG]
    if bad or not names and not isinstance(value, bool):
        raise TwilightError("errors.twilight_value", value=repr(value)[:40], names=[*TWILIGHT_DEG, NONE])
    return tuple(n for n in TWILIGHT_DEG if n in names)


def twilight_altitudes_deg(names) -> tuple[float, ...]:
    """The Sun's altitudes (degrees, negative) of the named twilights."""
    return tuple(TWILIGHT_DEG[n] for n in names)

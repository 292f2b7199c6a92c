"""The recipe's ``print_scale``: how much a printer shrinks or stretches.

Measured on the calibration page (``kitgen calibrate``): the length a bar
measures divided by the length it should have, across the page (``x``)
and down it (``y``); a printer may differ between the two (the paper's
feed and the print head's travel are separate mechanisms).  The kit is then
drawn at 1 / scale, so that the print measures true.
"""

from __future__ import annotations

import math

from ..errors import KeyedError, shown, typed

#: The scales accepted.  "Fit to page" of A4 onto Letter prints at 94 %
#: (279.4 / 297); a printer that is off by more than 15 % is mismeasured.
MIN_SCALE, MAX_SCALE = 0.85, 1.15


class ScaleError(KeyedError, ValueError):
    """A print_scale that cannot be used; the message is one line, a key
    of the templates' ``errors`` section and its values."""


def _factor(value, what: str) -> float:
    """One factor; ``what`` names it in messages ('x', 'y' or '' for both)."""
    name = f"'{what}' " if what else ""
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ScaleError("errors.scale_not_number", name=name, value=shown(value))
    if not MIN_SCALE <= value <= MAX_SCALE:
        raise ScaleError("errors.scale_range", name=name, value=typed(value), low=f"{MIN_SCALE:g}",
                         high=f"{MAX_SCALE:g}")
    return float(value)


def parse_print_scale(value) -> tuple[float, float]:
    """``{x: 0.97, y: 0.985}``, or one number for both directions, as
    ``(x, y)``; :class:`ScaleError` with a one-line message otherwise."""
    if isinstance(value, dict):
        keys = set(value)
        if keys != {"x", "y"}:
            extra = sorted(str(k) for k in keys - {"x", "y"})
            if extra:
                raise ScaleError("errors.scale_unknown_key", name=shown(extra[0]))
            raise ScaleError("errors.scale_both")
        return (_factor(value["x"], "x"), _factor(value["y"], "y"))
    f = _factor(value, "")
    return (f, f)

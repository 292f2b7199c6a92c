"""The recipe's ``cutter_colours``: the colours a laser cutter sorts by.

Laser-cutter software turns an SVG's lines into jobs by their colour; the
common convention (kitgen.geometry.style.CUTTER_COLOURS) is red to cut
through, blue to score and black to engrave, but cutting services differ,
so a recipe may name its own: ``{cut: "#FF0000", score: "#0000FF",
engrave: "#000000"}``, any of the three, each as ``#RRGGBB`` (the
hexadecimal colour form of SVG 1.1, 4.2 "Basic data types", <color>).
"""

from __future__ import annotations

import re

from ..errors import KeyedError, shown
from ..geometry.style import CUTTER_COLOURS

_HEX = re.compile(r"#[0-9A-Fa-f]{6}")


class CutterError(KeyedError, ValueError):
    """A cutter_colours value that cannot be used; the message is one line,
    a key of the templates' ``errors`` section and its values."""


def parse_cutter_colours(value) -> tuple[tuple[str, str], ...]:
    """``{cut: ..., score: ..., engrave: ...}`` (any of them; the others keep
    their defaults) as ``(("cut", "#FF0000"), ("score", ...), ("engrave", ...))``,
    colours in upper case; :class:`CutterError` otherwise."""
    names = ", ".join(CUTTER_COLOURS)
    if not isinstance(value, dict):
        raise CutterError("errors.cutter_not_mapping", names=names)
    out = dict(CUTTER_COLOURS)
    for key, colour in value.items():
        if key not in CUTTER_COLOURS:
            raise CutterError("errors.cutter_unknown_key", name=shown(key), names=names)
        if not isinstance(colour, str) or not _HEX.fullmatch(colour):
            raise CutterError("errors.cutter_not_colour", name=str(key), value=shown(colour))
        out[key] = colour.upper()
    return tuple(out.items())

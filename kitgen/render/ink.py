"""What each element puts on the page, the same for every backend.

An element of the geometry model becomes zero or more *inks*: the
primitives a backend paints, each with its stroke class.  The PDF and the
SVG backends both draw exactly these, so they agree by construction
(#8): the same number of painted primitives per part, in the same stroke
classes.

* A line element (circle, arc, segment, polyline) is one stroked ink of its
  stroke class; with the class ``none`` (thinned by the legibility pass,
  kept in the JSON) it is no ink at all, so no invisible or zero-width
  element is ever written.
* A pin is a hole to cut, a circle of the stated diameter in the ``cut``
  class (``pin_hole_mm`` for the centre, ``sight_hole_mm`` for a vane's
  pinhole), and a crosshair of two ``medium`` segments to aim an awl at.
* The zenith is a small open saltire (x), two ``medium`` segments
  (``style.zenith_mark_half_mm``), so that it is never taken for a pin
  mark (#9).
* A star or any other point is one filled dot (class ``dot``).
* Text is one ink of class ``none`` (filled glyphs, no stroke).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ..geometry import style


@dataclass(frozen=True)
class Ink:
    """One painted primitive in the part's frame (mm): ``shape`` is
    ``circle``, ``arc``, ``segment``, ``polyline``, ``dot`` or ``text``,
    ``geom`` its fields as in the geometry model (a dot: ``center`` and
    ``radius``), ``stroke`` the stroke class (``dot`` for filled dots),
    ``role`` the element's role (for colour accents)."""

    shape: str
    geom: dict[str, Any]
    stroke: str
    role: str


@dataclass(frozen=True)
class Holes:
    """Diameters (mm) of the cut holes at pins."""

    pin_hole_mm: float = style.PIN_HOLE_MM
    sight_hole_mm: float = style.SIGHT_HOLE_MM


def holes_of(printing) -> Holes:
    """The hole sizes a plan's printing options ask for."""
    return Holes(printing.pin_hole_mm, printing.sight_hole_mm)


def inks(el, dims, holes: Holes = Holes()) -> tuple[Ink, ...]:
    """The inks of one element (see the module's docstring)."""
    if el.shape == "text":
        return (Ink("text", el.geom, "none", el.role),)
    if el.stroke == "none":
        return ()
    if el.shape == "point":
        at = el.geom["at"]
        if el.role == "pin":
            r = style.pin_hole_radius_mm(el.values.get("hole", "centre"), holes.pin_hole_mm, holes.sight_hole_mm)
            h = style.pin_mark_reach_mm(dims, r)
            x, y = at
            return (Ink("circle", {"center": at, "radius": r}, "cut", el.role),
                    Ink("segment", {"from": (x - h, y), "to": (x + h, y)}, "medium", el.role),
                    Ink("segment", {"from": (x, y - h), "to": (x, y + h)}, "medium", el.role))
        if el.role == "zenith":
            h = style.zenith_mark_half_mm(dims)
            x, y = at
            return (Ink("segment", {"from": (x - h, y - h), "to": (x + h, y + h)}, "medium", el.role),
                    Ink("segment", {"from": (x - h, y + h), "to": (x + h, y - h)}, "medium", el.role))
        if el.role == "star":
            r = el.values.get("radius_mm") or style.star_radius_mm(el.values.get("mag", 2.0), dims)
        else:
            r = style.dot_radius_mm(dims)
        return (Ink("dot", {"center": at, "radius": r}, "dot", el.role),)
    return (Ink(el.shape, el.geom, el.stroke, el.role),)


def part_inks(part, dims, holes: Holes = Holes()) -> list[Ink]:
    """Every ink of a part, in the order of its elements."""
    return [ink for el in part.elements for ink in inks(el, dims, holes)]

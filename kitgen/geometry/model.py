"""The geometry model: what every part is made of, in millimetres.

A part is a flat list of elements.  Each element is one drawing primitive
(circle, arc, segment, polyline, point or text) with a ``role`` that says
what it means on the instrument (``horizon``, ``almucantar``, ``cut`` ...)
and the role's values (``altitude_deg`` ...).  The model knows nothing about
pages or file formats: renderers (PDF, SVG, JSON) read it, and layout places
whole parts on pages with a transform.

Coordinates: origin at the part's pin hole, x to the right, y up, in mm, the
part seen from the side its user looks at.  Angles of arcs and text are in
degrees, counter-clockwise from +x.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

#: Stroke classes.  Parts choose one per element; renderers map each to a
#: line weight and dash pattern scaled to the instrument (see kitgen.geometry.style).
STROKES = ("cut", "fold", "heavy", "medium", "light", "fine", "none")

SHAPES = ("circle", "arc", "segment", "polyline", "point", "text")


@dataclass(frozen=True)
class Element:
    """One primitive with its meaning.

    ``geom`` holds the shape's fields exactly as the JSON contract names them
    (``center``, ``radius``, ``start_deg`` ...), coordinates in mm as tuples.
    ``values`` holds the role's values (``altitude_deg``, ``name`` ...) and,
    for ticks, ``at``: the exact point the tick marks.
    """

    shape: str
    role: str
    geom: dict[str, Any]
    values: dict[str, Any] = field(default_factory=dict)
    stroke: str = "medium"

    def __post_init__(self) -> None:
        if self.shape not in SHAPES:
            raise ValueError(f"unknown shape {self.shape!r}")
        if self.stroke not in STROKES:
            raise ValueError(f"unknown stroke {self.stroke!r}")


@dataclass(frozen=True)
class Part:
    """A piece of the kit to be cut out: its kind, id, material and elements.

    ``extent_mm`` is the half-width of the square box centred on the pin that
    holds every element (for circular parts: the cut radius), or for long
    parts ``(xmin, ymin, xmax, ymax)`` given by ``bounds_mm``.
    """

    kind: str
    material: str  # "card" or "film"
    elements: tuple[Element, ...]
    bounds_mm: tuple[float, float, float, float]
    values: dict[str, Any] = field(default_factory=dict)
    title: str = ""
    #: The part's identity in the kit (``plate-1``, ``plate-2``, ``rete``,
    #: ``mater-front``...): what file names, page labels and notes name it by.
    id: str = ""

    @property
    def width_mm(self) -> float:
        return self.bounds_mm[2] - self.bounds_mm[0]

    @property
    def height_mm(self) -> float:
        return self.bounds_mm[3] - self.bounds_mm[1]

    def with_role(self, role: str) -> list[Element]:
        return [e for e in self.elements if e.role == role]


# -- constructors: small helpers so parts read as what they draw -------------

def _pt(p) -> tuple[float, float]:
    return (float(p[0]), float(p[1]))


def circle(role: str, center, radius_mm: float, stroke: str = "medium", **values) -> Element:
    return Element("circle", role, {"center": _pt(center), "radius": float(radius_mm)}, values, stroke)


def arc(role: str, center, radius_mm: float, start_deg: float, end_deg: float,
        stroke: str = "medium", **values) -> Element:
    """Arc swept counter-clockwise from ``start_deg`` to ``end_deg`` (end > start)."""
    return Element("arc", role, {"center": _pt(center), "radius": float(radius_mm),
                                 "start_deg": float(start_deg), "end_deg": float(end_deg)},
                   values, stroke)


def segment(role: str, p_from, p_to, stroke: str = "medium", **values) -> Element:
    return Element("segment", role, {"from": _pt(p_from), "to": _pt(p_to)}, values, stroke)


def polyline(role: str, points, closed: bool = False, stroke: str = "medium", **values) -> Element:
    return Element("polyline", role, {"points": tuple(_pt(p) for p in points), "closed": bool(closed)},
                   values, stroke)


def point(role: str, at, stroke: str = "medium", **values) -> Element:
    return Element("point", role, {"at": _pt(at)}, values, stroke)


def text(role: str, at, string: str, size_pt: float, angle_deg: float = 0.0,
         anchor: str = "middle", **values) -> Element:
    """Text centred (``anchor='middle'``) or started/ended at ``at``; the
    vertical centre of the text line sits on ``at``."""
    return Element("text", role, {"at": _pt(at), "text": str(string), "angle_deg": float(angle_deg),
                                  "size_pt": float(size_pt), "anchor": anchor}, values, "none")

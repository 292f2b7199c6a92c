"""How each stroke class looks on paper: line width, dash, grey level.

Parts give every element a stroke class (``cut``, ``fold``, ``heavy``,
``medium``, ``light``, ``fine``; ``none`` for text); renderers ask here how
to draw it, so the PDF and SVG agree.  Widths are given for the A4 default
(a 180 mm mater, ``Dimensions.scale == 1``) and grow with the instrument,
so a larger kit keeps its look.

Minimums, all common practice in print (values from experience, not from a
standard):

* ``fine`` and ``light`` never go below 0.10 mm (about 0.28 pt).  Office
  laser and inkjet printers resolve 600 dpi (0.042 mm a dot), but lines
  thinner than about 0.1 mm break up or vanish, especially on transparency
  film, where toner and ink spread less evenly than on paper.
* ``medium`` keeps at least 0.18 mm and ``heavy`` 0.30 mm, so the four
  drawing weights stay visibly different from each other at every scale.
* ``cut`` is at least 0.45 mm, about 1.5 x ``heavy``: the line the blade
  follows must stand out from every drawn line without relying on colour.
  ``fold`` lines are dashed, so a fold is never mistaken for a cut.

Upwards, lines grow with the instrument up to :data:`MAX_LINE_SCALE`
times their A4 widths (a 360 mm mater) and then stay: a 0.7 mm heavy line
reads across a classroom, and a blade follows a thin cut line more
closely than a thick one.  Every class keeps its rank at every size.

By default everything is drawn in black or grey.  The recipe may ask for
``colour: true``: then a few families of lines get an accent of kitgen's
own (:data:`ACCENTS`): the ecliptic a brick red, the horizon and twilight
a deep blue, the tropics and equator a pine green, the unequal hours a
plum.  Each accent is dark, with a contrast of at least 4.5 : 1 against
white paper (WCAG 2.1's relative luminance and its AA ratio for text), so
that a grey-scale print of a colour kit still shows every line dark; and
the accents only repeat what the lines already say by their weight, dash,
shape and labels.  Nothing depends on colour alone: a grey-scale print or
a photocopy loses nothing.
"""

from __future__ import annotations

from dataclasses import dataclass

#: Widths (mm) at scale 1 and the floor (mm) of each stroke class.
_WIDTH_MM = {
    "cut": (0.45, 0.45),
    "fold": (0.30, 0.25),
    "heavy": (0.35, 0.30),
    "medium": (0.22, 0.18),
    "light": (0.14, 0.10),
    "fine": (0.10, 0.10),
    "none": (0.0, 0.0),
}

#: Lines stop growing at this many times their widths at scale 1.
MAX_LINE_SCALE = 2.0

#: Dash of fold lines at scale 1: (on, off) in mm.
FOLD_DASH_MM = (2.5, 1.5)

#: Grey level (0 black .. 1 white) of each stroke class.  Fine lines are a
#: dark grey so that dense networks (azimuths, unequal hours) stay readable
#: under the heavier lines; still dark enough to print on film.
_GREY = {"fine": 0.25}

#: The colour scheme (sRGB, 0..1) by role, used only with ``colour: true``.
ACCENTS = {
    "ecliptic": (0.627, 0.157, 0.176),       # brick red, #A0282D
    "ecliptic_band": (0.627, 0.157, 0.176),
    "ecliptic_tick": (0.627, 0.157, 0.176),
    "horizon": (0.122, 0.306, 0.549),        # deep blue, #1F4E8C
    "twilight": (0.122, 0.306, 0.549),
    "tropic": (0.180, 0.420, 0.227),         # pine green, #2E6B3A
    "equator": (0.180, 0.420, 0.227),
    "unequal_hour": (0.420, 0.227, 0.478),   # plum, #6B3A7A
}

#: Pin marks (mm, fixed sizes) and the smallest dot drawn (mm).  The
#: holes are cut circles of a physical size, not of the kit's scale: the
#: centre hole takes the shank of a brass paper fastener (about 2 mm across,
#: from memory of common ones; recipe key ``pin_hole_mm``), the alidade's
#: vane holes are pinholes that throw a small spot of sunlight (recipe key
#: ``sight_hole_mm``; 1 mm is common practice for pinhole sights).
PIN_CROSS_HALF_MM = 2.0
PIN_HOLE_MM = 1.8
SIGHT_HOLE_MM = 1.0
MIN_DOT_RADIUS_MM = 0.35

#: The colours laser-cutter software sorts an SVG's jobs by (common practice
#: of cutting services; each service states its own, hence the recipe key
#: ``cutter_colours``): cut through in pure red, score (the folds) in pure
#: blue, engrave in black.  Cut and score lines are hairlines of
#: :data:`HAIRLINE_MM` (0.001 in, the width services ask for, from memory):
#: thin, but never zero, so every program still draws them.
CUTTER_COLOURS = {"cut": "#FF0000", "score": "#0000FF", "engrave": "#000000"}
HAIRLINE_MM = 0.0254


@dataclass(frozen=True)
class Stroke:
    """How a line is drawn: its width, its dash pattern and its grey."""

    width_mm: float
    dash_mm: tuple[float, ...]  # empty: solid
    grey: float                 # 0 = black


def _scale(dims) -> float:
    """The instrument's size relative to the A4 default, for line weights
    and dots: never above MAX_LINE_SCALE."""
    return min(float(dims.scale), MAX_LINE_SCALE)


def stroke_width_mm(stroke: str, dims) -> float:
    """Line width (mm) of a stroke class for a kit of ``dims``."""
    base, floor = _WIDTH_MM[stroke]
    return max(floor, base * _scale(dims))


def stroke_style(stroke: str, dims) -> Stroke:
    """Width, dash pattern and grey of a stroke class."""
    s = _scale(dims)
    dash = tuple(max(0.5, d * s) for d in FOLD_DASH_MM) if stroke == "fold" else ()
    return Stroke(stroke_width_mm(stroke, dims), dash, _GREY.get(stroke, 0.0))


def line_colour(stroke: str, role: str, colour: bool):
    """The colour of a line: ``("grey", level)`` or ``("rgb", (r, g, b))``;
    an accent only in a colour kit, and never on cut or fold lines."""
    if colour and stroke not in ("cut", "fold") and role in ACCENTS:
        return ("rgb", ACCENTS[role])
    return ("grey", _GREY.get(stroke, 0.0))


def relative_luminance(rgb) -> float:
    """WCAG 2.1 relative luminance of an sRGB colour (0..1 channels)."""
    def lin(c):
        return c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4
    r, g, b = (lin(c) for c in rgb)
    return 0.2126 * r + 0.7152 * g + 0.0722 * b


def star_radius_mm(mag: float, dims) -> float:
    """Radius (mm) of a star's dot: brighter stars bigger, linear in the
    magnitude (common practice on star maps), from 1.0 mm at magnitude -1.5
    to the legible floor near magnitude 4, at scale 1."""
    r = (0.75 - 0.17 * float(mag)) * _scale(dims)
    return max(MIN_DOT_RADIUS_MM, min(1.6 * _scale(dims), r))


def dot_radius_mm(dims) -> float:
    """Radius (mm) of a plain marked point."""
    return max(MIN_DOT_RADIUS_MM, 0.45 * _scale(dims))


def zenith_mark_half_mm(dims) -> float:
    """Half the arm's reach (mm, along x and along y) of the zenith's
    mark, a small open saltire (x): unlike the pin's upright cross and
    hole, so that nobody pierces it (#9), and no dot; about as wide as a
    bright star's dot, at least 0.6 mm so that it reads as a cross."""
    return max(0.6, 0.75 * _scale(dims))


def pin_hole_radius_mm(hole: str, pin_hole_mm: float = PIN_HOLE_MM, sight_hole_mm: float = SIGHT_HOLE_MM) -> float:
    """Radius (mm) of the cut circle at a pin: ``hole`` is ``centre`` (the
    fastener's hole) or ``sight`` (an alidade vane's pinhole); diameters as
    the recipe states them.  A physical size, so it does not grow with the
    kit."""
    return (sight_hole_mm if hole == "sight" else pin_hole_mm) / 2.0


def pin_cross_half_mm(dims) -> float:
    """Half length (mm) of a pin's crosshair arms: 4 mm across at every
    scale, enough to aim an awl at, small enough for the narrow rule."""
    return PIN_CROSS_HALF_MM


def pin_mark_reach_mm(dims, hole_radius_mm: float) -> float:
    """How far (mm) a pin's mark reaches from its centre along x and y:
    the crosshair's arms (:func:`pin_cross_half_mm`), or 1 mm past the
    rim of a hole of ``hole_radius_mm`` larger than they are, so that the
    arms always show beyond the cut."""
    return max(pin_cross_half_mm(dims), hole_radius_mm + 1.0)

"""The SVG renderer: one file per part, in true millimetres, for laser cutters.

Each element becomes the inks of :mod:`kitgen.render.ink` (the same the PDF
draws), grouped by what a laser cutter does with them, in the colours its
software sorts jobs by (the recipe's ``cutter_colours``; by default the
common convention of kitgen.geometry.style.CUTTER_COLOURS):

* ``<g id="cut">``: cut lines and the pin and vane holes (circles of the
  recipe's ``pin_hole_mm`` and ``sight_hole_mm``), red hairlines;
* ``<g id="score">``: fold lines, blue hairlines, dashed as printed;
* ``<g id="engrave">``: every other line, in the PDF's line widths and
  dashes, black (a colour kit's accents as in the PDF), the dots of stars
  and marked points, and the text.

Every group and element carries its stroke class as its ``class``.  No
invisible element is written: lines thinned away by the legibility pass
(stroke ``none``) are left out, and every stroke has a width above zero.
SVG's y axis points down, so y is negated and arc and text angles are
mirrored.
"""

from __future__ import annotations

import math
from xml.sax.saxutils import escape, quoteattr

from ..geometry import style
from .ink import holes_of, part_inks

_FONT = "DejaVu Sans, sans-serif"


def _f(v: float) -> str:
    s = f"{v:.4f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _xy(p) -> tuple[str, str]:
    return _f(p[0]), _f(-p[1])


def _hex(rgb) -> str:
    return "#" + "".join(f"{round(c * 255):02X}" for c in rgb)


def _arc_path(g) -> str:
    cx, cy = g["center"]
    r = g["radius"]
    a0, a1 = math.radians(g["start_deg"]), math.radians(g["end_deg"])
    p0 = (cx + r * math.cos(a0), cy + r * math.sin(a0))
    p1 = (cx + r * math.cos(a1), cy + r * math.sin(a1))
    large = 1 if (g["end_deg"] - g["start_deg"]) % 360.0 > 180.0 else 0
    # Counter-clockwise in y-up is sweep-flag 0 once y is negated.
    x0, y0 = _xy(p0)
    x1, y1 = _xy(p1)
    return f'<path d="M {x0} {y0} A {_f(r)} {_f(r)} 0 {large} 0 {x1} {y1}"/>'


def _shape(ink) -> str:
    g = ink.geom
    if ink.shape in ("circle", "dot"):
        x, y = _xy(g["center"])
        return f'<circle cx="{x}" cy="{y}" r="{_f(g["radius"])}"/>'
    if ink.shape == "arc":
        return _arc_path(g)
    if ink.shape == "segment":
        (x0, y0), (x1, y1) = _xy(g["from"]), _xy(g["to"])
        return f'<line x1="{x0}" y1="{y0}" x2="{x1}" y2="{y1}"/>'
    if ink.shape == "polyline":
        pts = " ".join(",".join(_xy(p)) for p in g["points"])
        tag = "polygon" if g["closed"] else "polyline"
        return f'<{tag} points="{pts}"/>'
    if ink.shape == "text":
        x, y = _xy(g["at"])
        anchor = {"start": "start", "middle": "middle", "end": "end"}[g["anchor"]]
        size_mm = g["size_pt"] * 25.4 / 72.0
        return (f'<text x="{x}" y="{y}" font-size="{_f(size_mm)}" text-anchor="{anchor}" '
                f'dominant-baseline="central" transform="rotate({_f(-g["angle_deg"])} {x} {y})">'
                f'{escape(g["text"])}</text>')
    raise ValueError(ink.shape)


def _dash(st) -> str:
    return f' stroke-dasharray="{" ".join(_f(d) for d in st.dash_mm)}"' if st.dash_mm else ""


def render_part_svg(part, kit) -> bytes:
    """One part as a standalone SVG document, 1 user unit = 1 mm."""
    printing = kit.plan.printing
    colours = dict(printing.cutter_colours)
    engrave = colours["engrave"]
    x0, y0, x1, y1 = part.bounds_mm
    w, h = x1 - x0, y1 - y0
    cut, score, dots, texts = [], [], [], []
    lines: dict[tuple[str, str], list[str]] = {}   # (stroke class, colour) -> elements
    for ink in part_inks(part, kit.dims, holes_of(printing)):
        if ink.shape == "text":
            texts.append(_shape(ink))
        elif ink.shape == "dot":
            dots.append(_shape(ink))
        elif ink.stroke == "cut":
            cut.append(_shape(ink))
        elif ink.stroke == "fold":
            score.append(_shape(ink))
        else:
            ink_colour = style.line_colour(ink.stroke, ink.role, printing.colour)
            colour = _hex(ink_colour[1]) if ink_colour[0] == "rgb" else engrave
            lines.setdefault((ink.stroke, colour), []).append(_shape(ink))
    hair = _f(style.HAIRLINE_MM)
    fold = style.stroke_style("fold", kit.dims)
    engraved = []
    for (stroke, colour), items in sorted(lines.items()):
        st = style.stroke_style(stroke, kit.dims)
        engraved.append(f'<g class="{stroke}" stroke="{colour}" stroke-width="{_f(st.width_mm)}"{_dash(st)}>'
                        f'{"".join(items)}</g>')
    out = [
        '<?xml version="1.0" encoding="UTF-8"?>\n',
        "<!-- made by kitgen -->\n",
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{_f(w)}mm" height="{_f(h)}mm" '
        f'viewBox="{_f(x0)} {_f(-y1)} {_f(w)} {_f(h)}">\n',
        f"<title>{escape(part.title)}</title>\n",
        f'<g id="engrave" data-part={quoteattr(part.id)} fill="none" stroke-linecap="butt">'
        f'{"".join(engraved)}'
        + (f'<g class="dot" fill="{engrave}" stroke="none">{"".join(dots)}</g>' if dots else "")
        + (f'<g class="none" fill="{engrave}" stroke="none" font-family="{_FONT}">{"".join(texts)}</g>'
           if texts else "") + "</g>\n",
        f'<g id="score" class="fold" fill="none" stroke="{colours["score"]}" stroke-width="{hair}"{_dash(fold)}>'
        f'{"".join(score)}</g>\n',
        f'<g id="cut" class="cut" fill="none" stroke="{colours["cut"]}" stroke-width="{hair}">{"".join(cut)}</g>\n',
        "</svg>\n",
    ]
    return "".join(out).encode("utf-8")


def render_svg_files(kit) -> dict[str, bytes]:
    """``{file name: SVG bytes}``, one file per part, named by its id."""
    return {f"{part.id}.svg": render_part_svg(part, kit) for part in kit.parts}

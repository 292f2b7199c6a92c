"""The SVG renderer: one file per part, in true millimetres.

Cut lines go in a group of their own (``id="cut"``, hairline, no fill), as
laser cutters expect, apart from the drawn lines (``id="draw"``), fold lines
(``id="fold"``) and text (``id="text"``).  SVG's y axis points down, so y
is negated and arc and text angles are mirrored.
"""

from __future__ import annotations

import math
from xml.sax.saxutils import escape, quoteattr

from ..geometry.style import stroke_width_mm

_GROUPS = ("cut", "fold", "draw", "text")
_FOLD_DASH_MM = "2 1.2"
_FONT = "DejaVu Sans, sans-serif"


def _f(v: float) -> str:
    s = f"{v:.4f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _xy(p) -> tuple[str, str]:
    return _f(p[0]), _f(-p[1])


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


def _shape(el, kit) -> str:
    g = el.geom
    if el.shape == "circle":
        x, y = _xy(g["center"])
        return f'<circle cx="{x}" cy="{y}" r="{_f(g["radius"])}"/>'
    if el.shape == "arc":
        return _arc_path(g)
    if el.shape == "segment":
        (x0, y0), (x1, y1) = _xy(g["from"]), _xy(g["to"])
        return f'<line x1="{x0}" y1="{y0}" x2="{x1}" y2="{y1}"/>'
    if el.shape == "polyline":
        pts = " ".join(",".join(_xy(p)) for p in g["points"])
        tag = "polygon" if g["closed"] else "polyline"
        return f'<{tag} points="{pts}"/>'
    if el.shape == "point":
        x, y = _xy(g["at"])
        if el.role == "pin":
            arm = 2.0
            px, py = g["at"]
            return (f'<circle cx="{x}" cy="{y}" r="0.6"/>'
                    f'<line x1="{_f(px - arm)}" y1="{y}" x2="{_f(px + arm)}" y2="{y}"/>'
                    f'<line x1="{x}" y1="{_f(-py - arm)}" x2="{x}" y2="{_f(-py + arm)}"/>')
        radius = 0.35
        if el.role == "star":
            radius = max(0.3, 0.9 - 0.18 * el.values.get("mag", 2.0))
        return f'<circle cx="{x}" cy="{y}" r="{_f(radius)}" fill="black"/>'
    if el.shape == "text":
        x, y = _xy(g["at"])
        anchor = {"start": "start", "middle": "middle", "end": "end"}[g["anchor"]]
        size_mm = g["size_pt"] * 25.4 / 72.0
        return (f'<text x="{x}" y="{y}" font-size="{_f(size_mm)}" text-anchor="{anchor}" '
                f'dominant-baseline="central" transform="rotate({_f(-g["angle_deg"])} {x} {y})">'
                f'{escape(g["text"])}</text>')
    raise ValueError(el.shape)


def _group_of(el) -> str:
    if el.shape == "text":
        return "text"
    if el.stroke == "cut":
        return "cut"
    if el.stroke == "fold":
        return "fold"
    return "draw"


def render_part_svg(part, kit) -> bytes:
    """One part as a standalone SVG document, 1 user unit = 1 mm."""
    x0, y0, x1, y1 = part.bounds_mm
    w, h = x1 - x0, y1 - y0
    groups: dict[str, list[str]] = {g: [] for g in _GROUPS}
    by_width: dict[str, list[str]] = {}
    for el in part.elements:
        grp = _group_of(el)
        if grp == "draw":
            by_width.setdefault(_f(stroke_width_mm(el.stroke, kit.dims)), []).append(_shape(el, kit))
        else:
            groups[grp].append(_shape(el, kit))
    draw = "".join(f'<g stroke-width="{wd}">{"".join(items)}</g>' for wd, items in sorted(by_width.items()))
    cut_w = _f(stroke_width_mm("cut", kit.dims))
    fold_w = _f(stroke_width_mm("fold", kit.dims))
    title = quoteattr(part.title)
    out = [
        '<?xml version="1.0" encoding="UTF-8"?>\n',
        "<!-- made by kitgen -->\n",
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{_f(w)}mm" height="{_f(h)}mm" '
        f'viewBox="{_f(x0)} {_f(-y1)} {_f(w)} {_f(h)}">\n',
        f"<title>{escape(part.title)}</title>\n",
        f'<g id="draw" data-part={title} fill="none" stroke="black" stroke-linecap="round">{draw}</g>\n',
        f'<g id="fold" fill="none" stroke="black" stroke-width="{fold_w}" '
        f'stroke-dasharray="{_FOLD_DASH_MM}">{"".join(groups["fold"])}</g>\n',
        f'<g id="text" fill="black" font-family="{_FONT}">{"".join(groups["text"])}</g>\n',
        f'<g id="cut" fill="none" stroke="black" stroke-width="{cut_w}">{"".join(groups["cut"])}</g>\n',
        "</svg>\n",
    ]
    return "".join(out).encode("utf-8")


def render_svg_files(kit) -> dict[str, bytes]:
    """``{file name: SVG bytes}``, one file per part, named by its id."""
    return {f"{part.id}.svg": render_part_svg(part, kit) for part in kit.parts}

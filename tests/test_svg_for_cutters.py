"""The SVG set for laser cutters (#9), read back with Python's own XML
parser (xml.etree) by the attribute meanings of SVG 1.1 (W3C
Recommendation, 2nd ed. 2011):

* 7.2 and 7.7: ``width``/``height`` with ``viewBox`` set the user unit, so
  a document of ``W mm`` over a viewBox ``W`` wide draws 1 unit = 1 mm;
* 6.4 and the property index (appendix N): ``fill``, ``stroke``,
  ``stroke-width`` and ``stroke-dasharray`` are inherited properties, set
  on a ``g`` for its children; ``fill`` starts as black, ``stroke`` as
  ``none``, ``stroke-width`` as 1;
* 11.1 and 11.4: a shape is painted by its fill and its stroke; with
  ``stroke="none"`` (or a zero width) and ``fill="none"`` it paints
  nothing;
* 9.3 (``circle``: ``cx``, ``cy``, ``r``).

The colour convention (red cut, blue score, black engrave) and hairlines
are common practice of laser-cutting services (from memory; each states
its own, hence the recipe key).
"""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET
from collections import Counter

import pytest

from kitgen.geometry import style
from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.svg import render_svg_files

NS = "{http://www.w3.org/2000/svg}"
#: SVG 1.1, 1.6 "graphics element".
GRAPHICS = {"circle", "ellipse", "image", "line", "path", "polygon", "polyline", "rect", "text", "use"}
INHERITED = ("fill", "stroke", "stroke-width", "stroke-dasharray")
INITIAL = {"fill": "black", "stroke": "none", "stroke-width": "1", "stroke-dasharray": "none"}


def painted(root):
    """Every graphics element with its effective properties and the class
    of its nearest classed ancestor (or its own)."""
    out = []

    def walk(node, props, klass):
        props = dict(props)
        for name in INHERITED:
            if node.get(name) is not None:
                props[name] = node.get(name)
        klass = node.get("class", klass)
        tag = node.tag.replace(NS, "")
        if tag in GRAPHICS:
            out.append((tag, node, props, klass))
        for child in node:
            walk(child, props, klass)

    walk(root, INITIAL, None)
    return out


def visible(tag, props) -> bool:
    strokes = props["stroke"] != "none" and float(props["stroke-width"]) > 0
    fills = props["fill"] != "none"
    return strokes or fills


@pytest.fixture(scope="module")
def colour_kit():
    return build_kit(parse_recipe_text("latitude: 52.2\nepoch: 2027\ncolour: true\npin_hole_mm: 3\n"
                                       "sight_hole_mm: 1.2\n"))


@pytest.fixture(scope="module")
def colour_svgs(colour_kit):
    return {name: ET.fromstring(data) for name, data in render_svg_files(colour_kit).items()}


def test_one_user_unit_is_one_millimetre(colour_svgs):
    for name, root in colour_svgs.items():
        x, y, w, h = (float(v) for v in root.get("viewBox").split())
        assert root.get("width") == f"{w:g}mm" or float(root.get("width")[:-2]) == pytest.approx(w), name
        assert float(root.get("height")[:-2]) == pytest.approx(h), name


def test_no_invisible_or_zero_width_element(colour_svgs):
    for name, root in colour_svgs.items():
        for tag, node, props, klass in painted(root):
            assert visible(tag, props), (name, tag, node.attrib)
            if props["stroke"] != "none":
                assert float(props["stroke-width"]) > 0, (name, tag)


def test_cut_lines_are_red_hairlines_and_folds_blue(colour_svgs):
    seen = Counter()
    for name, root in colour_svgs.items():
        for tag, node, props, klass in painted(root):
            if klass == "cut":
                assert props["stroke"].upper() == "#FF0000" and props["fill"] == "none", (name, tag)
                # A hairline: thinner than any printed line (0.1 mm, style.py's floor), never zero.
                assert 0 < float(props["stroke-width"]) <= 0.03, name
            elif klass == "fold":
                assert props["stroke"].upper() == "#0000FF" and 0 < float(props["stroke-width"]) <= 0.03
            elif tag != "text" and props["stroke"] != "none":
                assert props["stroke"].upper() != "#FF0000" and props["stroke"].upper() != "#0000FF", name
            seen[klass] += 1
    assert seen["cut"] >= len(colour_svgs) and seen["fold"] >= 2  # every part is cut out; the vanes fold


def test_engraving_is_black_but_the_accents_of_a_colour_kit(colour_svgs):
    strokes = Counter()
    for name, root in colour_svgs.items():
        for tag, node, props, klass in painted(root):
            if klass not in ("cut", "fold") and props["stroke"] != "none":
                strokes[props["stroke"].upper()] += 1
            if tag == "text":
                assert props["fill"].upper() == "#000000"
    accents = {"#" + "".join(f"{round(c * 255):02X}" for c in rgb) for rgb in style.ACCENTS.values()}
    # The ecliptic's brick red is on the rete, the horizon's blue, the tropics' green and the hours' plum on
    # the plate: the accents of style.ACCENTS, as the PDF draws them.
    assert accents <= set(strokes), (accents, strokes)
    assert set(strokes) <= accents | {"#000000"}


def _pins(part):
    return [e for e in part.elements if e.role == "pin"]


def test_pin_and_vane_holes_are_cut_circles_of_the_asked_diameter(colour_kit, colour_svgs):
    for part in colour_kit.parts:
        circles = [(float(n.get("cx")), -float(n.get("cy")), float(n.get("r")))
                   for tag, n, props, klass in painted(colour_svgs[f"{part.id}.svg"])
                   if tag == "circle" and klass == "cut"]
        for pin in _pins(part):
            want = 1.2 if pin.values["hole"] == "sight" else 3.0   # the recipe's sight_hole_mm, pin_hole_mm
            x, y = pin.geom["at"]
            assert any(math.hypot(cx - x, cy - y) < 1e-3 and abs(2 * r - want) < 1e-3 for cx, cy, r in circles), \
                (part.id, pin.values)
    assert sum(p.values["hole"] == "sight" for p in _pins(colour_kit.part("alidade"))) == 2


def test_every_drawn_element_and_no_thinned_one_is_written(colour_kit, colour_svgs):
    """Counted from the geometry model itself: one SVG element per drawn
    element, three per pin (hole and crosshair), two per zenith (its open
    cross, #9), none for a line whose stroke is ``none``."""
    thinned = 0
    for part in colour_kit.parts:
        want = 0
        for e in part.elements:
            if e.shape == "text":
                want += 1
            elif e.stroke == "none":
                thinned += 1
            else:
                want += 3 if e.role == "pin" else 2 if e.role == "zenith" else 1
        assert len(painted(colour_svgs[f"{part.id}.svg"])) == want, part.id
    assert thinned > 0  # the default kit thins ticks: the check above has something to leave out


def test_the_recipe_chooses_the_cutter_colours():
    kit = build_kit(parse_recipe_text('latitude: -33.9\nepoch: 2027\n'
                                      'cutter_colours: {cut: "#00ff00", score: "#FF00FF", engrave: "#333333"}\n'))
    for name, data in render_svg_files(kit).items():
        for tag, node, props, klass in painted(ET.fromstring(data)):
            if klass == "cut":
                assert props["stroke"] == "#00FF00"
            elif klass == "fold":
                assert props["stroke"] == "#FF00FF"
            elif tag == "text" or klass == "dot":
                assert props["fill"] == "#333333"
            else:
                assert props["stroke"] == "#333333", (name, klass)


@pytest.mark.parametrize("value", ["red", "#FF00", {"cut": 5}, {"laser": "#FF0000"}, ["#FF0000"]])
def test_a_bad_cutter_colour_is_one_line(value, tmp_path):
    from kitgen.errors import UserError
    from kitgen.recipe.load import validate_recipe
    with pytest.raises(UserError) as info:
        validate_recipe({"latitude": 50, "epoch": 2027, "cutter_colours": value})
    text = str(info.value)
    assert "\n" not in text and "cutter_colours" in text

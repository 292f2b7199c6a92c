"""A pupil reads a small kit alone (#9): the owner's name on every part,
the twilight line's name on the plate, the clock ring's caption on the
mater's back and the key slot's name on its front are there, whole where
the room exists, inside their part, and neither meet another word nor
are crossed by a line.

Read from the exported geometry (``kitgen geometry``'s JSON,
:func:`kitgen.render.json_export.render_json`) as a user of it would.

References:

* Shapely/GEOS for the geometry: each word's box a polygon, each drawn
  line a line (``tests/geos_lines.py``) buffered by half its printed width
  (``kitgen.geometry.style``), the part's outline a polygon; containment
  and intersection are GEOS's.
* Each word's box from its ink, measured with the shipped fonts by the
  kit's own ``Words`` (its advance width, its leftmost and rightmost ink
  and its height, turned as it is set), as in
  tests/test_owner_on_every_part.py.
* The words themselves from the template files (``templates/LANG.yaml``):
  a label is whole when its lines, joined, are the template's text (a
  label shortened by the fitting rule ends in U+2026).
* Small kits on A5 (120 mm), Letter and 90 to 100 mm across, north,
  south and on the equator, in French, Spanish, English, Arabic (right to
  left) and Hindi (Devanagari), with long invented names.
"""

from __future__ import annotations

import json
import math

import pytest
from shapely.geometry import Point, Polygon

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.parts.dimensions import dimensions
from kitgen.parts.mater_front import key_slot
from kitgen.render.json_export import render_json
from kitgen.template_files import available_languages
from kitgen.words.templates import load_words
from kitgen.words.locale import true_minus
from tests.geos_lines import stroke_line, text_polygon

#: (name, recipe, invented owner, whether the plate has room for the whole name)
KITS = [
    ("fr-a5-90", {"latitude": 51.5, "language": "fr", "sheet": "a5", "diameter_mm": 90},
     "Amélie Beauchamp-Lefèvre", False),
    ("fr-a5", {"latitude": 51.5, "language": "fr", "sheet": "a5"}, "Amélie Beauchamp-Lefèvre", True),
    ("es-a5-south", {"latitude": -45.0, "language": "es", "sheet": "a5"}, "Ximena Montalbán-Echeverría", True),
    ("ar-a5-south", {"latitude": -33.9, "language": "ar", "sheet": "a5"}, "ليلى عبد الرحمن الحدّاد", True),
    ("hi-a5-equator", {"latitude": 0.0, "language": "hi", "sheet": "a5"}, "अनन्या श्रीवास्तव", True),
    ("hi-a5-90-south", {"latitude": -12.0, "language": "hi", "sheet": "a5", "diameter_mm": 90},
     "अनन्या श्रीवास्तव", True),
    ("en-letter-100", {"latitude": 40.7, "language": "en", "sheet": "letter", "diameter_mm": 100},
     "Theodora Quillfeather-Marsh", True),
    ("ar-a4", {"latitude": 24.5, "language": "ar", "sheet": "a4"}, "ليلى عبد الرحمن الحدّاد", True),
]
#: The kits whose plate has room along the twilight line for its name.
TWILIGHT_NAMED = {"fr-a5-90", "fr-a5", "es-a5-south", "ar-a5-south", "en-letter-100", "ar-a4"}

@pytest.fixture(scope="module", params=[k[0] for k in KITS])
def built(request):
    """A kit of :data:`KITS` (its name, the kit and its exported geometry),
    built once for the three tests."""
    name, recipe, owner, _ = next(k for k in KITS if k[0] == request.param)
    kit = build_kit(validate_recipe({**recipe, "owner": owner, "epoch": 2027}))
    return name, kit, json.loads(render_json(kit))


def _style(el: dict) -> str:
    return "bold" if el["role"] in ("title", "part_title") else "label"


def _outline(part: dict) -> Polygon:
    """The part's cut outline: its largest cut circle or closed polyline
    (a plate's rim is an arc broken by its key: its circle)."""
    shapes = []
    for el in part["elements"]:
        if el["role"] != "cut":
            continue
        if el["shape"] in ("circle", "arc"):
            shapes.append(Point(el["center"]).buffer(el["radius"], 256))
        elif el["shape"] == "polyline" and el["closed"]:
            shapes.append(Polygon(el["points"]))
    return max(shapes, key=lambda s: s.area)


class _Line:
    """A JSON stroke element in the form tests/geos_lines.py reads."""

    def __init__(self, el: dict):
        self.shape, self.geom = el["shape"], el


def _ink_lines(part: dict, dims):
    """Every drawn line of the part, as GEOS areas of its printed width."""
    out = []
    for el in part["elements"]:
        if el["shape"] in ("circle", "arc", "segment", "polyline") and el["stroke"] != "none":
            out.append((el, stroke_line(_Line(el)).buffer(stroke_width_mm(el["stroke"], dims) / 2)))
    return out


def _check_clear(kit, part: dict, role: str, select=lambda el: True):
    """The texts of ``role`` (those ``select`` keeps) lie inside the part's
    outline, meet no other text and no drawn line; returns them."""
    words = kit.words
    mine = [el for el in part["elements"] if el["shape"] == "text" and el["role"] == role and select(el)]
    others = [el for el in part["elements"] if el["shape"] == "text" and el not in mine]
    outline = _outline(part)
    lines = _ink_lines(part, kit.dims)
    for el in mine:
        box = text_polygon(el, words)
        assert outline.contains(box), (part["id"], el["text"])
        for other in others:
            assert not box.intersects(text_polygon(other, words, _style(other))), \
                (part["id"], el["text"], other["text"])
        for line, ink in lines:
            assert not box.intersects(ink), (part["id"], el["text"], line["role"])
    return mine


def _joined(els) -> str:
    """The whole label the elements are the lines of (each carries
    ``full_text`` where it was broken or shortened)."""
    full = {el.get("full_text") for el in els} - {None}
    return full.pop() if full else " ".join(el["text"] for el in els)


def _shown(els) -> str:
    return " ".join(el["text"] for el in els)


def test_the_owner_on_every_part_whole_inside_and_clear(built):
    name, kit, data = built
    owner, plate_room = next(k for k in KITS if k[0] == name)[2:]
    said = {m.values["text"] for n in kit.notes if n.key == "notes.shortened" for m in n.values["labels"]}
    for part in data["parts"]:
        els = _check_clear(kit, part, "owner")
        assert els, part["id"]
        assert _joined(els) == owner, part["id"]
        whole = "\u2026" not in _shown(els)
        if part["kind"] != "plate" or plate_room:
            assert whole and _shown(els).replace(" ", "") == owner.replace(" ", ""), (part["id"], _shown(els))
        else:   # shortened only where the plate truly has no room: and then said
            assert not whole and owner in said, (part["id"], said)
            assert owner.startswith(_shown(els).rstrip("\u2026")), _shown(els)


def test_the_twilight_line_is_named_or_the_notes_say_why(built):
    name, kit, data = built
    w = kit.words
    plate = next(p for p in data["parts"] if p["kind"] == "plate")
    for alt in kit.plan.drawing.twilight_deg:
        text = w("plate.line_twilight", altitude=true_minus(w.number(alt)))   # templates/LANG.yaml
        assert any(el["role"] == "twilight" and el["stroke"] != "none" for el in plate["elements"])
        named = _check_clear(kit, plate, "curve_label",
                             lambda el: el.get("curve") == "twilight" and el.get("altitude_deg") == alt)
        if name in TWILIGHT_NAMED:
            assert [el["text"] for el in named] == [text], (name, alt)
        elif not named:
            said = [m.values["text"] for n in kit.notes if n.key == "notes.plate_labels_left_out"
                    for m in n.values["labels"]]
            assert text in plate["labels_left_out"] and text in said, (name, said)


def test_the_clock_rings_caption_is_whole_inside_the_ring(built):
    name, kit, data = built
    back = next(p for p in data["parts"] if p["kind"] == "mater_back")
    caption = _check_clear(kit, back, "clock_caption")
    assert _joined(caption) == kit.words("clock_scale.caption_mean"), name   # no place: local mean time
    assert "\u2026" not in _shown(caption)
    inner = min(el["radius"] for el in back["elements"] if el["role"] == "clock_edge")
    ring = Point(0.0, 0.0).buffer(inner, 256)
    for el in caption:
        assert ring.contains(text_polygon(el, kit.words)), el["text"]


def test_the_key_slot_is_named_whole_and_clear(built):
    name, kit, data = built
    front = next(p for p in data["parts"] if p["kind"] == "mater_front")
    assert any(el.get("purpose") == "key_slot" for el in front["elements"])
    named = _check_clear(kit, front, "key_slot_label")
    assert [el["text"] for el in named] == [kit.words("mater_front.key_slot")], name


@pytest.mark.parametrize("language", available_languages())
def test_the_key_slot_is_named_at_every_size(language):
    # The name had been left out wherever rounding made its room, a chord
    # as wide as the words, a hair too narrow (A5 in French, 90 to 105 mm
    # in English).
    words = load_words(language)
    for diameter in range(80, 605, 5):
        els = key_slot(dimensions(diameter, math.radians(23.44)), words)
        assert [el.geom["text"] for el in els if el.role == "key_slot_label"] == \
            [words("mater_front.key_slot")], (language, diameter)


def test_the_checks_see_a_word_on_a_line_or_a_word():
    # Self-test: the plate's name moved across the tropic below the pin,
    # onto the latitude label and off the plate fails the check that
    # should catch it.
    name, recipe, owner, _ = KITS[1]
    kit = build_kit(validate_recipe({**recipe, "owner": owner, "epoch": 2027}))
    plate = next(p for p in json.loads(render_json(kit))["parts"] if p["kind"] == "plate")
    label = next(el for el in plate["elements"] if el["role"] == "plate_label")
    for at, caught in (((0.0, -20.0), ("tropic",)), (label["at"], (label["text"],)),
                       ((0.0, 2 * kit.dims.plate_radius_mm), ())):
        moved = {**plate, "elements": [{**el, "at": list(at), "anchor": "middle"} if el["role"] == "owner" else el
                                       for el in plate["elements"]]}
        with pytest.raises(AssertionError) as failed:
            _check_clear(kit, moved, "owner")
        assert str(failed.value).startswith(repr(("plate-1", owner) + caught)), str(failed.value)

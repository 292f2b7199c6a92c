"""What a pupil must do to make the kit is all in the instructions and on
the parts (#9): the key slot cut (with a knife, by an adult) before the
mater is glued, the thread hole made, the two top holes lined up when
gluing, the reading edge of the rule and the alidade marked and named, a
list of what to have at hand that follows the kit's options, and the
mater's back naming a place once.

No standard covers these; they are common practice of paper-instrument
kits and of classroom handouts (a materials list before the steps; blades
in an adult's hands).  The geometry is checked against the plate's key as
kitgen.parts.plate draws it, and the words against the templates
themselves, so that no text is copied into the test.
"""

from __future__ import annotations

import math
import re

import pytest

from kitgen.kit import build_kit
from kitgen.layout.instructions import story
from kitgen.layout.pages import layout_kit
from kitgen.parts.plate import key_tab_mm
from kitgen.recipe.load import parse_recipe_text
from kitgen.words.measure import text_corners_mm

RECIPE = "latitude: 52.2\nepoch: 2027\n"


def _story(extra: str = ""):
    kit = build_kit(parse_recipe_text(RECIPE + extra))
    return kit, story(kit, layout_kit(kit))


def _section(blocks, words, heading_key):
    """The texts under the heading ``heading_key`` up to the next heading."""
    heading = words(heading_key)
    k = next(i for i, b in enumerate(blocks) if b.kind == "heading" and b.text == heading)
    out = []
    for b in blocks[k + 1:]:
        if b.kind in ("heading", "title", "page_break"):
            break
        out.append(b.text)
    return out


def test_cutting_names_the_key_slot_and_the_thread_hole():
    kit, blocks = _story()
    w = kit.words
    cutting = _section(blocks, w, "instructions.cut_heading")
    label = w("mater_front.key_slot")
    slot = w("instructions.cut_key_slot", label=label)
    assert slot in cutting and w("instructions.cut_hang_hole") in cutting
    # common practice: a blade only in an adult's hands, and the slot cut
    # while the front is still a single card
    text = slot.lower()
    assert "craft knife" in text and "adult" in text and "before" in text and "glue" in text
    assert "pocket" in text
    assert "thread" in w("instructions.cut_hang_hole") and "pin" in w("instructions.cut_hang_hole")
    # The slot on the part carries the very words the step quotes.
    front = kit.part("mater_front")
    assert [e.geom["text"] for e in front.with_role("key_slot_label")] == [label]


def test_the_gluing_step_lines_up_the_thread_holes_too():
    kit, blocks = _story()
    w = kit.words
    glue = w.items("instructions.stack")[1]
    assert glue in _section(blocks, w, "instructions.stack_heading")
    assert "centres" in glue and "thread holes" in glue and "top" in glue


def test_unglued_slot_step_speaks_of_no_glue():
    """A mater front printed without its back: the slot, nothing to glue.
    (A duplex kit has no slot at all: tests/test_duplex.py.)"""
    kit, blocks = _story("parts: [mater_front, plate, rete, rule]\n")
    w = kit.words
    cutting = _section(blocks, w, "instructions.cut_heading")
    unglued = w("instructions.cut_key_slot_unglued", label=w("mater_front.key_slot"))
    assert unglued in cutting and "glue" not in unglued.lower()
    assert w("instructions.cut_key_slot", label=w("mater_front.key_slot")) not in cutting


def test_no_mater_no_slot_or_thread_hole_step():
    kit, blocks = _story("parts: [plate, rete, rule]\n")
    w = kit.words
    cutting = _section(blocks, w, "instructions.cut_heading")
    assert not any(w("mater_front.key_slot") in t for t in cutting)
    assert w("instructions.cut_hang_hole") not in cutting
    assert w("instructions.read_edge_step", label=w("rule.reading_edge")) in cutting


@pytest.mark.parametrize("recipe", [RECIPE, RECIPE + "sheet: a5\n", RECIPE + "diameter_mm: 80\n",
                                    "latitude: -33.9\nepoch: 2027\n"])
def test_the_key_reaches_the_slot_and_has_a_pocket(recipe):
    """The slot lies across the plate's key, within the key's length, and
    inside the limb: the key's end goes through the front card into the
    room between the two glued cards (kitgen.parts.plate.key_tab_mm)."""
    kit = build_kit(parse_recipe_text(recipe))
    d = kit.dims
    tw, tl = key_tab_mm(d)
    (slot,) = [e for e in kit.part("mater_front").elements
               if e.role == "cut" and e.values.get("purpose") == "key_slot"]
    (x0, y0), (x1, y1) = slot.geom["from"], slot.geom["to"]
    assert y0 == y1 < 0 and abs(x1 - x0) > tw   # wider than the key, across it
    assert d.plate_radius_mm < -y0 < d.plate_radius_mm + tl   # the key reaches it, and goes beyond
    assert -y0 < d.limb_inner_radius_mm      # the pocket is behind the front, inside the mater
    # The slot's name sits just inside the plate's circle (covered once
    # built), within 3 mm of the slot; on a mater too small to hold it
    # whole it is left out, never cut short (#11), and the instructions
    # name the slot.
    labels = kit.part("mater_front").with_role("key_slot_label")
    if "diameter_mm: 80" in recipe and not labels:
        return
    (label,) = labels
    assert label.geom["text"] == kit.words("mater_front.key_slot")
    ext = kit.words.measure(label.geom["text"], label.geom["size_pt"])
    corners = text_corners_mm(label.geom["at"], ext.width_mm, ext.height_mm, 0.0, "middle")
    assert all(math.hypot(x, y) <= d.plate_radius_mm for x, y in corners)
    assert min(abs(y - y0) for _, y in corners) < 3.0


def _fiducial_side(part, role="reading_edge"):
    """Distance (mm) from the fiducial line to the reading-edge label's box,
    its farthest corner, and the box's direction against the line's."""
    (fid,) = part.with_role("fiducial")
    (ax, ay), (bx, by) = fid.geom["from"], fid.geom["to"]
    ux, uy = (bx - ax) / math.hypot(bx - ax, by - ay), (by - ay) / math.hypot(bx - ax, by - ay)
    labels = part.with_role(role)
    assert len(labels) == 1, [e.geom["text"] for e in labels]
    return fid, (ax, ay), (ux, uy), labels[0]


@pytest.mark.parametrize("language", ["en", "el", "hi", "ar"])
@pytest.mark.parametrize("extra", ["", "diameter_mm: 80\nowner: Ada Quillfeather\n"])
@pytest.mark.parametrize("kind", ["rule", "alidade"])
def test_reading_edge_marked_along_the_fiducial(kind, extra, language):
    kit = build_kit(parse_recipe_text(RECIPE + extra + f"language: {language}\n"))
    part = kit.part(kind)
    fid, (ax, ay), (ux, uy), label = _fiducial_side(part)
    w = kit.words
    assert label.geom["text"] == w(f"{kind}.reading_edge")   # whole, never cut short
    # set along the edge (text parallel to the fiducial) ...
    a = math.radians(label.geom["angle_deg"])
    assert abs(abs(math.cos(a) * ux + math.sin(a) * uy) - 1.0) < 1e-9
    # ... next to it: the box within 1 mm of the line, on the part's side,
    # and between the line's ends
    ext = w.measure(label.geom["text"], label.geom["size_pt"])
    corners = text_corners_mm(label.geom["at"], ext.width_mm, ext.height_mm, label.geom["angle_deg"],
                              label.geom["anchor"])
    across = [(x - ax) * -uy + (y - ay) * ux for x, y in corners]     # signed distance from the line
    along = [(x - ax) * ux + (y - ay) * uy for x, y in corners]
    length = math.hypot(fid.geom["to"][0] - ax, fid.geom["to"][1] - ay)
    assert all(c > 0 for c in across) or all(c < 0 for c in across)
    assert min(abs(c) for c in across) < 1.0
    assert 0.0 <= min(along) and max(along) <= length


def _need(extra: str):
    kit, blocks = _story(extra)
    w = kit.words
    items = _section(blocks, w, "instructions.need_heading")
    keys = ("card", "film", "fastener", "thread", "glue", "tape", "scissors", "knife", "pin")
    return {k for k in keys if w(f"instructions.need_{k}") in items}, blocks, w


def test_you_will_need_follows_the_options():
    plain, blocks, w = _need("")
    assert plain == {"card", "film", "fastener", "thread", "glue", "scissors", "knife", "pin"}
    # near the start: after the cautions, before printing
    heads = [b.text for b in blocks if b.kind == "heading"]
    assert heads.index(w("instructions.need_heading")) == heads.index(w("instructions.cautions_heading")) + 1
    duplex, _, _ = _need("duplex: long_edge\n")
    assert duplex == plain - {"glue", "knife"}   # one sheet: nothing to glue, no slot to cut (#9)
    no_film, _, _ = _need("parts: [mater_front, mater_back, plate]\n")
    assert no_film == plain - {"film"}
    no_mater, _, _ = _need("parts: [plate, rete, rule]\n")
    assert no_mater == plain - {"glue", "thread", "knife"}
    tiled, _, _ = _need("diameter_mm: 400\n")
    assert tiled == plain | {"tape"}           # pieces taped together


@pytest.mark.parametrize("place, times", [("Hilltop School", 1), ("hilltop school ", 1), ("Larkspur Valley", 2)])
def test_title_and_place_once_when_the_same(place, times):
    kit = build_kit(parse_recipe_text(RECIPE + f"title: Hilltop School\nplace: \"{place}\"\n"))
    back = kit.part("mater_back")
    texts = [e.geom["text"] for e in back.elements if e.shape == "text" and e.role in ("title", "place")]
    assert len(texts) == times
    assert texts[0] == "Hilltop School"


@pytest.mark.parametrize("language", ["en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi"])
def test_steps_read_along_the_marked_edge(language):
    """The steps that read a scale with the alidade or the rule name the
    edge by the words printed along it."""
    kit, blocks = _story(f"language: {language}\n")
    w = kit.words
    texts = [b.text for b in blocks]
    edge = w("rule.reading_edge")
    assert edge == w("alidade.reading_edge")
    time, height = w.items("instructions.time_steps"), w.items("instructions.height_steps")
    for step in (time[1], time[5], height[2]):    # the altitude, the hour ring, the shadow square
        assert step in texts and edge in step, step


def _term_pattern(printed: str) -> re.Pattern:
    """A printed name as a sentence may use it: the same words in order,
    case folded, where a word of seven letters or more may change its last
    letter and take one more (Russian and Greek decline the noun: Линейка,
    линейки; Κανόνας, κανόνα). Shorter words must stand exactly as printed,
    so that Italian 'regola' never passes for 'Regolo'. Common practice of
    checking translated terms against a glossary; no standard."""
    parts = []
    for word in printed.casefold().split():
        parts.append(re.escape(word[:-1]) + r"\w{0,2}" if len(word) >= 7 else re.escape(word))
    return re.compile(r"\s+".join(parts))


@pytest.mark.parametrize("language", ["en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi"])
def test_sun_and_star_steps_use_the_words_printed_on_the_rule(language):
    """The sunrise steps, the star steps and the two worked examples name
    the rule and the alidade by the names printed on those parts, and their
    reading edge by the words printed along it (#9). The steps that lay the
    rule or the alidade are found from the English kit (the same steps in
    every language); the names are read from the built parts' text."""
    heads = ("almanac.sun_heading", "almanac.star_heading", "almanac.sun_example_heading")
    en_kit, en_blocks = _story("language: en\n")
    kit, blocks = _story(f"language: {language}\n")
    checked = 0
    for kind in ("rule", "alidade"):
        def printed(k, role):
            (e,) = k.part(kind).with_role(role)
            return e.geom["text"]
        en_name = _term_pattern(printed(en_kit, "part_label"))
        name, edge = _term_pattern(printed(kit, "part_label")), _term_pattern(printed(kit, "reading_edge"))
        for head in heads:
            en_texts = _section(en_blocks, en_kit.words, head)
            texts = _section(blocks, kit.words, head)
            assert len(texts) == len(en_texts)
            for en_text, text in zip(en_texts, texts):
                if en_name.search(en_text.casefold()):
                    checked += 1
                    assert name.search(text.casefold()), (kind, text)
                    assert edge.search(text.casefold()), (kind, text)
    assert checked >= 5   # sunrise, two star steps, the two worked examples

"""Whose kit it is stands on every part, or the kit's notes say where it
does not (#9): a class's parts are cut out side by side, and a part
without its owner's name cannot be given back.

References:

* Marking every loose piece of a pupil's work with the pupil's name is
  common practice in a classroom, with no published source.
* The name keeps off every other word on its part: ink boxes measured
  with the shipped fonts by the kit's own ``Words``, each at least
  ``kitgen.parts.labels.MARGIN_MM`` (0.3 mm) apart (common practice of
  map lettering; tests/test_plate_label_clearance.py).  That no line
  crosses the name is checked from the PDF alone by
  tests/test_no_word_crossed.py (one of its kits is a small plate
  whose name stands away from the latitude label).
* Small plates (80 to 100 mm across) at latitudes north, south and on
  the equator, in Latin, Cyrillic, Arabic and Devanagari script, with a
  long invented name: the cases where the room beside the plate's
  latitude label is taken.
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.parts import labels
from kitgen.parts.legibility import shortened_notes
from kitgen.parts.owner import left_out
from kitgen.recipe.load import validate_recipe

#: A long invented owner's name (a double surname).
OWNER = "Anaïs Vermorel-Dubois"

CASES = [(51.5, 90, "fr"), (-45.0, 90, "en"), (0.0, 80, "ru"), (20.0, 100, "ar"), (35.0, 80, "hi"),
         (-12.5, 100, "es"), (66.0, 185, "de")]


def _kit(lat, diameter, language):
    return build_kit(validate_recipe({"latitude": lat, "diameter_mm": diameter, "language": language,
                                      "owner": OWNER, "epoch": 2026}))


def _left_out(part) -> list[str]:
    """The words ``part`` leaves out for want of room, which the kit's
    notes name."""
    return list(part.values.get("labels_left_out", ()))


@pytest.mark.parametrize("lat, diameter, language", CASES)
def test_every_part_carries_the_owner_or_the_notes_say_it_does_not(lat, diameter, language):
    kit = _kit(lat, diameter, language)
    said = [n for n in kit.notes if n.key == "notes.plate_labels_left_out"]
    said_words = [m.values["text"] for n in said for m in n.values["labels"]]
    for part in kit.parts:
        named = [e for e in part.elements if e.role == "owner"]
        if named:
            assert OWNER not in _left_out(part), part.id
        else:
            assert OWNER in _left_out(part), part.id
            assert OWNER in said_words, part.id
    # the plate is where room runs out first; at these sizes it has found some
    plate = next(p for p in kit.parts if p.kind == "plate")
    assert any(e.role == "owner" for e in plate.elements), (lat, diameter, language)


@pytest.mark.parametrize("lat, diameter, language", CASES)
def test_the_plates_name_keeps_off_every_other_word(lat, diameter, language):
    kit = _kit(lat, diameter, language)
    words = kit.words
    plate = next(p for p in kit.parts if p.kind == "plate")
    names = [labels.element_box_mm(e, words) for e in plate.elements if e.role == "owner"]
    others = [labels.element_box_mm(e, words) for e in plate.elements
              if e.shape == "text" and e.role != "owner"]
    m = labels.MARGIN_MM - 1e-6
    for a in names:
        grown = (a[0] - m, a[1] - m, a[2] + m, a[3] + m)
        assert not any(labels.boxes_meet(grown, b) for b in others), (lat, diameter, language)


def test_a_name_with_no_room_is_named_in_the_notes():
    kit = _kit(51.5, 90, "fr")
    plate = next(p for p in kit.parts if p.kind == "plate")
    part = left_out(plate, OWNER)
    notes = [n for n in shortened_notes([part], kit.dims, kit.words) if n.key == "notes.plate_labels_left_out"]
    assert [m.values["text"] for m in notes[-1].values["labels"]][-1] == OWNER
    assert OWNER in notes[-1].text(kit.words)


@pytest.mark.parametrize("lat, diameter, language", CASES + [(-45.0, 85, "en"), (35.0, 80, "ar"), (0.5, 90, "it")])
def test_the_plates_name_does_not_lie_along_a_line(lat, diameter, language):
    """A name set where a circle of the plate runs level (its lowest or
    highest point, where the circle keeps within the name's height for
    sqrt(2 r h) either side) lies along that line beside the line's own
    name, and reads as it (common practice of map lettering: a name
    stands clear of the lines it does not name)."""
    kit = _kit(lat, diameter, language)
    plate = next(p for p in kit.parts if p.kind == "plate")
    for box in [labels.element_box_mm(e, kit.words) for e in plate.elements if e.role == "owner"]:
        for e in plate.elements:
            if e.shape not in ("circle", "arc") or e.stroke in ("none", "cut"):
                continue
            (cx, cy), r = e.geom["center"], e.geom["radius"]
            for angle, y in ((90.0, cy + r), (270.0, cy - r)):
                on_arc = e.shape == "circle" or \
                    (angle - e.geom["start_deg"]) % 360.0 <= e.geom["end_deg"] - e.geom["start_deg"]
                h = box[3] - box[1]   # within a name's height above or below it: along the name
                assert not (on_arc and box[0] <= cx <= box[2] and box[1] - h <= y <= box[3] + h), \
                    (e.role, lat, diameter)

"""The owner's name on a plate never reads as part of another label (#12).

A name set on the same row as a line's label, a few millimetres after
it, reads as one phrase with it: at 40 to 44 degrees south, on A4 and
Letter, "Tropic of Cancer" and then "Lachlan Ridgeway" on one row. Names
of different things stand further apart than the spaces within a name,
so that each is read as its own (E. Imhof, "Positioning names on maps",
The American Cartographer 2, 1975, cited from memory; common practice
of map lettering).

Checked on plates from 66 degrees south to 66 north on A4, Letter and
A5: the ink boxes (measured with the shipped fonts by the kit's own
``Words``) of the name and of every other word on its row are at least
two of the name's heights apart. The plate's latitude label, which the
name is set under or over on purpose, is the one word exempt.
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.parts import labels
from kitgen.recipe.load import validate_recipe

#: An invented pupil's name, about as long as most.
OWNER = "Lachlan Ridgeway"
LATITUDES = [round(-66.0 + 7.3 * k, 1) for k in range(19)]


@pytest.mark.parametrize("sheet", ["a4", "letter", "a5"])
def test_no_word_stands_on_the_names_row_close_to_it(sheet):
    crowded = []
    for latitude in LATITUDES + [-42.9, -40.1, 41.3]:
        kit = build_kit(validate_recipe({"latitude": latitude, "sheet": sheet, "epoch": 2027, "owner": OWNER,
                                         "title": "Derwent Shore Science Club"}))
        for plate in kit.parts_of("plate"):
            (name,) = [e for e in plate.elements if e.role == "owner"]
            box = labels.element_box_mm(name, kit.words)
            height = box[3] - box[1]
            for other in plate.elements:
                if other.shape != "text" or other.role in ("owner", "plate_label"):
                    continue
                near = labels.element_box_mm(other, kit.words)
                if near[1] < box[3] and near[3] > box[1]:   # on the name's row
                    gap = max(near[0] - box[2], box[0] - near[2])
                    if gap < 2.0 * height:
                        crowded.append((latitude, other.geom["text"], round(gap, 2)))
    assert crowded == []

"""No number stands beside a cardinal letter on the plate (#12 review:
hour 1 set 1 mm before the Portuguese west point "O" read as "10"; the
Russian "З" beside "2" read as a number; a teacher's look: the French
west "O" 2.9 mm after an almucantar's "10" read as "100", an optional
"15°" beside "N" as a latitude).

Common practice in lettering: words of different things stand further
apart along a line than the words of one name; a letter shaped like a
digit beside a number keeps twice the kit's own gap for names side by
side (``labels.NAME_GAP_ALONG_MM``, 2 mm): 4 mm, a choice.  The numbers
checked are the hours', the almucantars' and the azimuths' between the
thirties (an owed thirty keeps its place by its point).  Widths and
heights are the shipped fonts' ink, measured as the PDF sets them
(``Words.measure``).
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text

ALONG_MM = 4.0 - 0.01


@pytest.mark.parametrize("head", [
    "latitude: -8.05\nlanguage: pt\n",
    "latitude: 12\nlanguage: it\nsheet: letter\n",
    "latitude: 64.5\nlanguage: ru\nsheet: letter\n",
    "latitude: -27\nlanguage: fr\nsheet: a5\n",
    "latitude: 31\nlanguage: en\nsheet: a5\n",
    "latitude: 19.4\nlanguage: es\ndiameter_mm: 140\n",
    "latitude: 47.4\nlanguage: fr\nsheet: a5\ntwilight: [civil, nautical]\n",   # "10 O"
    "latitude: 52\nlanguage: de\nsheet: letter\ntwilight: civil\n",            # "15° N"
])
def test_no_number_stands_beside_a_cardinal_letter(head):
    kit = build_kit(parse_recipe_text(head + "parts: [plate]\n"))
    plate = kit.part("plate")
    cards = plate.with_role("cardinal")
    hours = plate.with_role("unequal_hour_label")
    assert len(cards) >= 3 and len(hours) >= 9
    numbers = hours + plate.with_role("almucantar_label") + [
        e for e in plate.with_role("azimuth_label") if e.values["azimuth_deg"] % 30]
    beside = []
    for h in numbers:
        hw = kit.words.measure(h.geom["text"], h.geom["size_pt"])
        for c in cards:
            cw = kit.words.measure(c.geom["text"], c.geom["size_pt"])
            level = abs(h.geom["at"][1] - c.geom["at"][1]) < (hw.height_mm + cw.height_mm) / 2
            gap = abs(h.geom["at"][0] - c.geom["at"][0]) - (hw.width_mm + cw.width_mm) / 2
            if level and gap < ALONG_MM:
                beside.append((h.geom["text"], c.geom["text"], round(gap, 2)))
    assert not beside


#: Letters that Unicode lists as confusable with a digit (UTS #39, Unicode
#: Security Mechanisms, its confusables data; quoted from memory): the
#: Cyrillic Ze with 3, Be with 6 and O with 0.
DIGIT_LIKE = {"\u0417": "3", "\u0411": "6", "\u041e": "0"}


@pytest.mark.parametrize("latitude, sheet", [(60.2, "a5"), (55.8, "a5"), (-33.9, "a4")])
def test_the_russian_points_are_words_no_digit_can_be_taken_for(latitude, sheet):
    """The Russian west letter "З" stood among the unequal hours 1, 2 and 3
    by the west point and read as a 3 (a teacher's look, #12); the plate
    names the points in words (Север, Восток, Юг, Запад), as Russian
    star charts write them out round the horizon (common practice, from
    memory)."""
    kit = build_kit(parse_recipe_text(f"latitude: {latitude}\nsheet: {sheet}\nlanguage: ru\nparts: [plate]\n"))
    cards = [e.geom["text"] for e in kit.part("plate").with_role("cardinal")]
    assert len(cards) >= 3
    assert not [t for t in cards if t.strip() in DIGIT_LIKE]

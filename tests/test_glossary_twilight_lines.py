"""The glossary says what each twilight line drawn on the kit's plate
marks, and no other (#12 review: a Russian kit with the -6 and -12 deg
lines explained only the -18 deg one).

The altitudes are the standard definitions of the ends of civil, nautical
and astronomical twilight: the Sun's centre 6, 12 and 18 degrees below the
horizon (the definitions of the Explanatory Supplement to the
Astronomical Almanac, quoted from memory; common practice on planispheres
and in almanacs alike).
The glossary's item is found in the kit's own instruction pages, as
laid out, in the words of each language.
"""

from __future__ import annotations

import re

import pytest

from kitgen.kit import build_kit
from kitgen.layout.instructions import glossary_blocks
from kitgen.recipe.load import validate_recipe

MINUS = "\u2212"


def _twilight_item(recipe):
    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    head = kit.words("instructions.glossary_twilight_lines", lines="").split(":")[0].split("{")[0].strip()
    found = [b.text for b in glossary_blocks(kit) if b.text.startswith(head[:12])]
    return found


@pytest.mark.parametrize("recipe, drawn, undrawn", [
    ({"latitude": 55.8, "language": "ru", "sheet": "a5", "twilight": ["civil", "nautical"]}, (6, 12), (18,)),
    ({"latitude": -33.9, "language": "en"}, (18,), (6, 12)),
    ({"latitude": 24.5, "language": "ar", "twilight": ["civil", "nautical", "astronomical"]}, (6, 12, 18), ()),
    ({"latitude": 48.1, "language": "de", "twilight": "nautical"}, (12,), (6, 18)),
])
def test_the_glossary_names_each_twilight_line_drawn(recipe, drawn, undrawn):
    (item,) = _twilight_item(recipe)
    for alt in drawn:
        assert f"{MINUS}{alt}°" in item
    for alt in undrawn:
        assert f"{MINUS}{alt}°" not in item


def test_no_twilight_lines_no_item():
    assert _twilight_item({"latitude": 40.4, "language": "es", "twilight": "none"}) == []


def _twilight_step(recipe):
    from kitgen.layout.instructions import sunrise_blocks

    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    heads = [kit.words(key, lines="").split("(")[0].strip()
             for key in ("almanac.twilight_step", "almanac.twilight_step_one")]
    return [b.text for b in sunrise_blocks(kit) if b.text.startswith(tuple(heads))], kit


@pytest.mark.parametrize("recipe, drawn", [
    ({"latitude": 38.1, "language": "it", "sheet": "a5", "twilight": ["civil", "astronomical"]}, (6, 18)),
    ({"latitude": -33.9, "language": "en"}, (18,)),
    ({"latitude": 55.8, "language": "ru", "twilight": ["civil", "nautical"]}, (6, 12)),
])
def test_the_sunrise_steps_read_the_twilight_lines_drawn(recipe, drawn):
    """The plate's twilight lines are read as its horizon is, and a step
    says so, naming exactly the lines the plate draws (a teacher's look:
    an Italian kit drew the -6 and -18 deg lines and no step used them).
    The reading: the Sun's point on the almucantar of altitude -h, west
    of the meridian, is the evening's end of that twilight, the
    definitions of civil, nautical and astronomical twilight by the Sun's
    centre 6, 12 and 18 degrees below the horizon (Explanatory Supplement
    to the Astronomical Almanac; from memory)."""
    (step,), kit = _twilight_step(recipe)
    said = [int(a) for a in re.findall(MINUS + r"(\d+)°", step.split(")")[0])]   # (the lines' list)
    assert said == list(drawn)
    if recipe["language"] == "en":
        assert "west of the meridian, the rule's reading edge gives the time that twilight ends" in step
    # one line drawn: it is named as one, not "one of them" (a teacher's look)
    one = len(drawn) == 1
    assert step.startswith(kit.words("almanac.twilight_step_one" if one else "almanac.twilight_step",
                                     lines="").split("(")[0].strip())
    if recipe["language"] == "en":
        assert ("one of them" in step) != one


def test_no_twilight_lines_no_step():
    assert _twilight_step({"latitude": 40.4, "language": "es", "twilight": "none"})[0] == []
    assert _twilight_step({"latitude": 40.4, "language": "en", "parts": ["rule", "alidade"]})[0] == []


@pytest.mark.parametrize("recipe, one", [
    ({"latitude": -33.9, "language": "es"}, True),
    ({"latitude": 28.6, "language": "hi"}, True),
    ({"latitude": 55.8, "language": "ru", "twilight": ["civil", "nautical"]}, False),
])
def test_one_twilight_line_is_named_as_one(recipe, one):
    """A plate with one twilight line names it in the singular (a
    teacher's look: "Las líneas de crepúsculo de esta lámina: −18°")."""
    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    key = "instructions.glossary_twilight_line_one" if one else "instructions.glossary_twilight_lines"
    head = kit.words(key, lines="\uf8ff").split("\uf8ff")[0]
    found = [b.text for b in glossary_blocks(kit) if b.text.startswith(head)]
    assert len(found) == 1, (head, found)

"""Numbers in a recipe as YAML 1.2 reads them (found by a fuzzing helper).

YAML 1.1, which PyYAML follows, reads a number in exponent form without a
decimal point (``1e-9``, ``2e2``) as text, and kitgen then said it could
not read it as a latitude or a width.  The YAML 1.2 core schema (YAML
1.2.2, section 10.3.2, the float pattern
``[-+]? ( \\. [0-9]+ | [0-9]+ ( \\. [0-9]* )? ) ( [eE] [-+]? [0-9]+ )?``)
reads both as numbers, and so does kitgen now.  A title or an owner's
name written like a number keeps the text as written.
"""

from __future__ import annotations

import pytest

from kitgen.recipe.load import parse_recipe_text


@pytest.mark.parametrize("written, value", [("1e-9", 1e-9), ("-2E1", -20.0), ("+5e1", 50.0), ("1.5e1", 15.0)])
def test_a_latitude_in_exponent_form_is_a_number(written, value):
    assert parse_recipe_text(f"latitude: {written}\n").latitude_deg == pytest.approx(value, abs=0.0, rel=1e-15)


def test_a_sheet_side_in_exponent_form_is_a_number():
    recipe = parse_recipe_text("latitude: 40\nsheet: {width_mm: 2e2, height_mm: 3e2}\n")
    assert tuple(recipe.sheet) == (200.0, 300.0)


@pytest.mark.parametrize("written", ["1e5", "12", "0x1F", "3.50", "2e2"])
def test_an_owner_written_like_a_number_keeps_its_text(written):
    assert parse_recipe_text(f"latitude: 40\nowner: {written}\ntitle: {written}\n").owner == written

"""The equator's latitude is written without a hemisphere's letter.

Common practice (no source): atlases and gazetteers write the equator as
0°, neither north nor south; a kit drawn at 0.0° had printed "Latitude
0.0° N" in its footers, its plate and its instructions, and "0.0° N" for
a recipe of 0.04° S.  Every other latitude keeps its letter, as rounded
to the tenth the kit prints.
"""

from __future__ import annotations

import re

import pypdf
import pytest

from kitgen.parts.format import IN_SENTENCE, LABEL, WITHIN_LINE, latitude_text
from kitgen.words.templates import available_languages, load_words

FORMS = (LABEL, WITHIN_LINE, IN_SENTENCE)
SPACES = " \u00a0\u202f\u2009"


@pytest.mark.parametrize("language", sorted(available_languages()))
def test_the_equator_takes_no_letter(language):
    words = load_words(language)
    north, south = words("cardinal.north_short"), words("cardinal.south_short")
    for form in FORMS:
        for latitude_deg in (0.0, -0.0, 0.04, -0.04):
            text = latitude_text(words, latitude_deg, form)
            assert north not in text and south not in text, (form, latitude_deg, text)
            assert text == text.rstrip(SPACES) and "  " not in text, (form, latitude_deg, repr(text))
            assert re.search(r"0[.,]0°", text), text
        # beyond the rounding, the letter is back (0.05 rounds to 0.1, as read)
        assert latitude_text(words, 0.05, form).endswith(north), form
        assert latitude_text(words, -0.05, form).endswith(south), form


def test_an_equator_kit_prints_no_hemisphere(tmp_path):
    recipe = tmp_path / "equator.yaml"
    recipe.write_text("title: Equator Test Club\nlatitude: -0.03\nlanguage: en\n", encoding="utf-8")
    from kitgen.cli import main

    out = tmp_path / "kit.pdf"
    assert main(["build", str(recipe), "-o", str(out)]) == 0
    text = "\n".join(page.extract_text() for page in pypdf.PdfReader(out).pages)
    found = re.findall(r"[Ll]atitude 0\.0°( [NS]\b)?", text)
    assert found, "the kit names its latitude"
    assert all(letter == "" for letter in found), found

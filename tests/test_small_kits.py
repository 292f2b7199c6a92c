"""The smallest kits keep their labels whole (#11): the fitting rule's
steps before the last ("…") are enough for the rete's zodiac names in
every shipped language at the smallest diameter, 80 mm, at the latitude
where the zodiac band is narrowest (the equator) and at a southern one.

References: the zodiac signs' code points from the Unicode Standard
(U+2648 ARIES ... U+2653 PISCES, block Miscellaneous Symbols); the
shipped fonts' character maps through fontTools.
"""

from __future__ import annotations

import unicodedata

import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.template_files import available_languages
from kitgen.words import fonts, locale
from kitgen.words.fit import fit_label
from kitgen.words.symbols import ZODIAC_SIGNS


def test_the_signs_are_unicode_s_and_every_shipped_font_draws_them():
    assert [unicodedata.name(s) for s in ZODIAC_SIGNS] == [
        "ARIES", "TAURUS", "GEMINI", "CANCER", "LEO", "VIRGO", "LIBRA", "SCORPIUS", "SAGITTARIUS", "CAPRICORN",
        "AQUARIUS", "PISCES"]
    for code in available_languages():
        script = locale.script(code)
        for style in fonts.STYLES:
            assert not fonts.missing_chars("".join(ZODIAC_SIGNS), fonts.stack(script, style)), (code, style)


@pytest.mark.parametrize("language, latitude", list(zip(available_languages(), [0.0, -33.9] * 5)))
def test_zodiac_names_are_never_cut_at_the_smallest_size(language, latitude):
    kit = build_kit(parse_recipe_text(f"latitude: {latitude}\nepoch: 2027\nlanguage: {language}\n"
                                      f"diameter_mm: 80\nparts: [rete]\n"))
    labels = [e.geom["text"] for p in kit.parts for e in p.elements if e.role == "zodiac_label"]
    assert labels and not [t for t in labels if "…" in t], labels


def test_three_lines_before_the_ellipsis():
    """A caption too long for two lines of its room goes on three before
    it is cut (a width in characters stands in for the font here)."""
    def measure(text, size_pt):
        class E:
            width_mm = len(text) * size_pt / 10
            height_mm = size_pt / 3
        return E

    text = "one two three four five six"
    fitted = fit_label(text, 5.0, 5.0, measure, 5.0, max_height_mm=6.0)
    assert fitted.step == 4 and len(fitted.lines) == 3 and fitted.text == text
    assert max(len(line) for line in fitted.lines) * 0.5 <= 5.0

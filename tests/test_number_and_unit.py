"""A number and its unit stay on one line (#9): "100 mm" is never broken
into "100" at a line's end and "mm." at the next line's start.

Reference: Unicode Standard Annex #14, "Unicode Line Breaking Algorithm":
NO-BREAK SPACE (U+00A0) is of class GL, and rule LB12 forbids a break
after it ("GL ×"), LB12a before it.  The templates write U+00A0 between
a number and its unit in the text printed on the pages, and the wrapping
of the instructions (kitgen.layout.paragraphs) and of the pictures' names
(kitgen.layout.figures) breaks lines only at ordinary spaces.
"""

from __future__ import annotations

import re

import pytest

from kitgen.layout.figures import name_lines
from kitgen.layout.paragraphs import wrap
from kitgen.words.templates import load_words

LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru")


@pytest.mark.parametrize("language", LANGUAGES)
def test_the_check_bar_keeps_its_length_and_unit_together(language):
    w = load_words(language)
    text = w("page.check_bar", length=w.number(100), percent=w.number(100))
    assert re.search(r"100\u00a0(mm|мм)", text)
    width = w.measure(text, 10.0).width_mm * 72 / 25.4
    for share in [k / 40 for k in range(6, 40)]:   # every width from 15 % to 97.5 % of the line
        lines = wrap(text, share * width, 10.0, w, "body")
        assert not any(re.search(r"100$", line) for line in lines), (share, lines)
        assert " ".join(lines).replace(" ", "").replace("\u00a0", "") == text.replace(" ", "").replace("\u00a0", "")


def test_ordinary_spaces_still_break_and_a_picture_name_keeps_its_unit():
    w = load_words("en")
    assert wrap("one two three", 1.0, 10.0, w, "body") == ["one", "two", "three"]
    assert name_lines(w, "cut 12\u00a0mm deep", 1.0) == ["cut", "12\u00a0mm", "deep"]

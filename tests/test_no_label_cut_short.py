"""No label of a shipped language is cut short with "…" (#11, class 10).

The fitting rule (kitgen.words.fit) shrinks a label to the legible
minimum, then breaks it into lines, and only as a last resort cuts it;
the guide promises that no shipped language reaches that step.  Labels
that have a shorter form say it instead (the epoch's year alone, the
plate's latitude without its place), and captions that the instructions
also explain (the key slot's name, the clock ring's caption) are left out
rather than cut.  Checked here at the small sizes where room runs out, in
every shipped language, with and without a site (the clock ring and its
caption), north, south and on the equator.  The reference is the
templates' own words: a label is whole when it carries no U+2026.
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.template_files import available_languages

SITE = "place: Hilltop School\nlongitude: -0.1\ntimezone: Europe/London\n"


@pytest.mark.parametrize("language", available_languages())
def test_no_label_is_cut_short_at_small_sizes(language):
    cut = []
    for diameter in (80, 100, 120):
        for latitude, extra in ((51.5, SITE), (-33.9, ""), (0.0, "")):
            kit = build_kit(parse_recipe_text(f"latitude: {latitude}\nlanguage: {language}\n"
                                              f"diameter_mm: {diameter}\n{extra}"))
            cut += [(diameter, latitude, p.id, e.geom["text"]) for p in kit.parts for e in p.elements
                    if e.shape == "text" and e.geom["text"].endswith("\u2026")]
            assert not any(n.key == "notes.shortened" for n in kit.notes)
    assert not cut, cut[:5]


@pytest.mark.parametrize("language", ["en", "ar", "hi"])
def test_a_room_as_wide_as_the_words_holds_them_at_their_size(language):
    """A room worked out from the words' own width, as the key slot's
    chord is (kitgen.parts.mater_front), holds them at their size, the
    fitting rule's first step, even at the legible minimum and with the
    room short of the width by floating-point rounding: its words in the
    shipped fonts, measured by the same rule (kitgen.words.measure)."""
    from kitgen.words.fit import fit_label
    from kitgen.words.templates import load_words

    w = load_words(language)
    text = w("mater_front.key_slot")
    width = w.measure(text, 5.0).width_mm
    for room in (width, width * (1 - 1e-12), width - 1e-12):
        fitted = fit_label(text, 5.0, room, w.measure, min_pt=5.0)
        assert (fitted.lines, fitted.size_pt, fitted.step) == ((text,), 5.0, 1)
    # A room truly narrower does not hold them whole at that size.
    assert fit_label(text, 5.0, width * 0.99, w.measure, min_pt=5.0).step != 1

"""The words across the alidade's vanes keep clear of the strip's cut lines.

A pupil cuts the alidade out by hand, with scissors or a blade, and a
cut by hand strays about half a millimetre from its line (common
practice, no published source): a word whose ink comes closer to a cut
line than that may lose its letters' edges, and on the printed page it
reads as touching the line. An Arabic kit's "fold up" filled the
strip's width with 0.4 mm to spare on either side.

Checked for every shipped language on A4, A5 and an 80 mm kit: the ink
of each vane's words (its glyphs' outline bounds, from the shipped
fonts, turned as the PDF sets them) stands at least half a millimetre
beyond the ink of the cut lines on both long edges of the strip (the
line's half width, kitgen's style table), and no word is cut short.
"""

from __future__ import annotations

import pytest

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.parts import breaks
from kitgen.recipe.load import validate_recipe

LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")
HAND_CUT_MM = 0.5


@pytest.mark.parametrize("language", LANGUAGES)
@pytest.mark.parametrize("size", [{"sheet": "a4"}, {"sheet": "a5"}, {"sheet": "a4", "diameter_mm": 80}])
def test_vane_words_stand_half_a_millimetre_off_the_cut_lines(language, size):
    kit = build_kit(validate_recipe({"latitude": 31.95, "language": language, "epoch": 2027, **size}))
    alidade = kit.part("alidade")
    cut = next(e for e in alidade.elements if e.role == "cut")
    ys = [y for _, y in cut.geom["points"]]
    top, bottom = 0.0, min(ys)   # the strip's long edges (the fiducial edge on y = 0)
    half_line = stroke_width_mm("cut", kit.dims) / 2
    vane_words = [e for e in alidade.elements if e.role == "vane_label"]
    assert vane_words
    for word in vane_words:
        assert not word.geom["text"].endswith("\u2026")
        box = breaks.text_box(word, kit.words)
        assert abs(box.angle_rad + 1.5707963) < 1e-6   # set across the strip
        ink_top, ink_bottom = box.center[1] + box.half_w, box.center[1] - box.half_w
        assert top - half_line - ink_top >= HAND_CUT_MM - 1e-9, (word.geom["text"], top - ink_top)
        assert ink_bottom - (bottom + half_line) >= HAND_CUT_MM - 1e-9, (word.geom["text"], ink_bottom - bottom)

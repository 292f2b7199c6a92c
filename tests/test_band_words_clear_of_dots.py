"""The words of the rete's ecliptic band keep a word space from every
star's dot (#12 review: Aldebaran's dot 0.4 mm before "Géminis" on a
Spanish rete at 34.6 S; numbers "10" and "20" set 0.06 mm from a dot).

Common practice in lettering: things that are not one phrase stand
further apart than its words do, so a dot nearer a word than a word
space reads as a mark of that word.  The word space is DejaVu Sans'
own (651 of 2048 units an em, from the shipped font's metrics, read
here with fontTools), the distance Shapely/GEOS's between the word's
turned ink box (the shipped glyph bounds, ``band_words.corners_of``)
and the dot's disc.  A number with no such place is left out and the
build's notes name it; a sign's name becomes its symbol.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from fontTools.ttLib import TTFont
from shapely.geometry import Point, Polygon

import kitgen
from kitgen.kit import build_kit
from kitgen.parts.band_words import corners_of
from kitgen.recipe.load import parse_recipe_text

MM_PER_PT = 25.4 / 72.0   # the PostScript point (ISO 32000-1, 8.3.2.3)


def _space_em() -> float:
    font = TTFont(next(Path(kitgen.__file__).parent.joinpath("fonts").glob("DejaVuSans.ttf")))
    return font["hmtx"]["space"][0] / font["head"].unitsPerEm


@pytest.mark.parametrize("head", [
    # the review's kit
    "latitude: -34.6\nlongitude: -58.4\ntimezone: America/Argentina/Buenos_Aires\nlanguage: es\n",
    "latitude: 35\nlanguage: de\n",
    "latitude: 24.5\nlanguage: hi\nsheet: letter\n",
    "latitude: -45\nlanguage: fr\ndiameter_mm: 100\n",
    "latitude: 47\nlanguage: it\nsheet: a5\n",
    "latitude: -8\nlanguage: pt\ndiameter_mm: 140\n",
])
def test_every_band_word_keeps_a_word_space_from_the_dots(head):
    kit = build_kit(parse_recipe_text("epoch: 2027\n" + head + "parts: [rete]\n"))
    rete = kit.part("rete")
    dots = [(e.geom["at"], e.values["radius_mm"]) for e in rete.elements if e.role == "star" and e.stroke != "none"]
    words = [e for e in rete.elements if e.role in ("zodiac_label", "ecliptic_number")]
    assert len(words) >= 24 and dots
    space = _space_em()
    assert 0.31 < space < 0.33   # DejaVu Sans: 651/2048 (its hmtx table)
    near = []
    for e in words:
        box = Polygon(corners_of(e, kit.words))
        gap = min(box.distance(Point(c)) - r for c, r in dots)
        if gap < space * e.geom["size_pt"] * MM_PER_PT - 1e-6:
            near.append((e.geom["text"], round(gap, 2)))
    assert not near
    # each number left out for a dot is said in the build's notes
    left = list(rete.values.get("ecliptic_numbers_under_stars_deg", ()))
    said = [float(x.value) for n in kit.notes if n.key == "notes.ecliptic_numbers_under_stars"
            for x in n.values["longitudes"]]
    assert said == left

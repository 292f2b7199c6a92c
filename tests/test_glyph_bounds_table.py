"""The shipped glyph bounds (kitgen/fonts/glyph-bounds.npz, #12) against
fontTools' BoundsPen drawing the shipped fonts' outlines: the table is
made from these very files and gives, through kitgen.words.fonts, the
same floats as the pen."""

from __future__ import annotations

import io

import pytest
from fontTools.pens.boundsPen import BoundsPen
from fontTools.ttLib import TTFont

from kitgen.words import fonts, glyph_bounds

FACES = fonts.all_faces()


@pytest.mark.parametrize("face", FACES, ids=[f.filename for f in FACES])
def test_table_is_made_from_the_shipped_file(face):
    data = fonts.font_bytes(face)
    rows = glyph_bounds.shipped_bounds(face.filename, data)
    assert rows is not None, "run tools/build_glyph_bounds.py"
    assert len(rows) == len(TTFont(io.BytesIO(data), lazy=True).getGlyphOrder())


@pytest.mark.parametrize("face", FACES, ids=[f.filename for f in FACES])
def test_bounds_equal_fonttools_pen(face):
    # every 7th glyph and the glyphs of the digits, degree sign and a few
    # letters: the same floats as BoundsPen's bounds over units per em
    font = TTFont(io.BytesIO(fonts.font_bytes(face)), lazy=True)
    glyphs, order, upem = font.getGlyphSet(), font.getGlyphOrder(), font["head"].unitsPerEm
    cmap = font.getBestCmap()
    chosen = set(range(0, len(order), 7)) | {order.index(cmap[ord(c)]) for c in "0189°ANgQ@" if ord(c) in cmap}
    blank = 0
    for gid in sorted(chosen):
        pen = BoundsPen(glyphs)
        glyphs[order[gid]].draw(pen)
        expected = None if pen.bounds is None else tuple(v / upem for v in pen.bounds)
        blank += expected is None
        assert fonts.glyph_bounds_em(face, gid) == expected, order[gid]
    assert blank < len(chosen)


def test_a_changed_font_is_not_looked_up():
    face = fonts.DEJAVU["body"]
    assert glyph_bounds.shipped_bounds(face.filename, fonts.font_bytes(face) + b"\0") is None

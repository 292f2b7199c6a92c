"""The shipped glyph table (kitgen/fonts/glyph-bounds.npz, #12) against
fontTools: its bounds against BoundsPen drawing the shipped fonts'
outlines, its metrics against the fonts' cmap, hmtx, head and hhea
tables read with fontTools.  The table is made from these very files and
gives, through kitgen.words.fonts, the same values as fontTools."""

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


@pytest.mark.parametrize("face", FACES, ids=[f.filename for f in FACES])
def test_metrics_equal_fonttools_tables(face):
    font = TTFont(io.BytesIO(fonts.font_bytes(face)), lazy=True)
    shipped = glyph_bounds.shipped_metrics(face.filename, fonts.font_bytes(face))
    assert shipped is not None, "run tools/build_glyph_bounds.py"
    cmap, hmtx, order, upem, asc, desc = shipped
    assert cmap == font.getBestCmap()
    assert hmtx == {name: adv for name, (adv, _) in font["hmtx"].metrics.items()}
    assert order == font.getGlyphOrder()
    assert (upem, asc, desc) == (font["head"].unitsPerEm, font["hhea"].ascent, font["hhea"].descent)
    assert fonts.advance_em(face, "0") == font["hmtx"][font.getBestCmap()[ord("0")]][0] / upem


def test_a_changed_font_is_not_looked_up():
    face = fonts.DEJAVU["body"]
    changed = fonts.font_bytes(face) + b"\0"
    assert glyph_bounds.shipped_bounds(face.filename, changed) is None
    assert glyph_bounds.shipped_metrics(face.filename, changed) is None

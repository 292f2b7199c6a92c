"""The font faces kitgen registers read their character tables whole and
come out as reportlab reads them (#12: the set's start).

References: reportlab's own ``TTFontFace`` (its reading of a TrueType
file, one number at a time) for every attribute; fontTools, the
general-purpose OpenType library, for the character map and advances
(``getBestCmap``, 'hmtx') and the glyph locations ('loca'), as the
OpenType specification 1.9 defines those tables.
"""

from __future__ import annotations

import struct
from importlib import resources

import pytest
from fontTools.ttLib import TTFont as ToolsFont
from reportlab.pdfbase.ttfonts import TTFont, TTFontFace

from kitgen.render import face_reading
from kitgen.render.face_reading import WholeTableFace
from kitgen.render.pdf_text import TaggedTTFont

SHIPPED = ["DejaVuSans.ttf", "DejaVuSansCondensed.ttf", "DejaVuSans-Bold.ttf", "NotoSansArabic-Regular.ttf",
           "NotoSansArabic-Bold.ttf", "NotoSansDevanagari-Regular.ttf", "NotoSansDevanagari-Bold.ttf"]

#: Attributes that are the reader's own state, not the font's.
STATE = {"_pos", "_pdfScale", "makeSubset"}


def _path(filename: str) -> str:
    return str(resources.files("kitgen").joinpath("fonts", filename))


def _same(a, b) -> bool:
    """Equal, and for a dictionary in the same order (reportlab fills
    ``charWidths`` glyph by glyph)."""
    return a == b and (not isinstance(a, dict) or list(a.items()) == list(b.items()))


@pytest.mark.parametrize("filename", SHIPPED)
def test_face_equals_reportlabs_reading(filename):
    # Reference: reportlab's TTFontFace reading the same file.
    ours, theirs = vars(WholeTableFace(_path(filename))), vars(TTFontFace(_path(filename)))
    assert set(ours) == set(theirs)
    differ = [k for k in theirs if k not in STATE and not _same(ours[k], theirs[k])]
    assert differ == []
    # the numbers' kinds too: the metrics past the long ones hold reportlab's scaled advance
    assert [tuple(map(type, m)) for m in ours["hmetrics"]] == [tuple(map(type, m)) for m in theirs["hmetrics"]]


@pytest.mark.parametrize("filename", ["DejaVuSans.ttf", "NotoSansDevanagari-Regular.ttf"])
def test_tables_against_fonttools(filename):
    # Reference: fontTools' reading of the character map, advances and
    # glyph locations (OpenType 1.9 'cmap', 'hmtx', 'loca').
    face = WholeTableFace(_path(filename))
    tools = ToolsFont(_path(filename))
    order = tools.getGlyphOrder()
    best = tools.getBestCmap()
    mapped = {c: g for c, g in face.charToGlyph.items() if c not in (0xA0, 0x20) and order[g] != ".notdef"}
    assert {c: order[g] for c, g in mapped.items()} == {c: n for c, n in best.items() if c not in (0xA0, 0x20)}
    upem = tools["head"].unitsPerEm
    for code, name in list(best.items())[::37]:
        assert face.charWidths[code] == pytest.approx(tools["hmtx"][name][0] * 1000 / upem)
    loca = tools["loca"]
    assert face.glyphPos == [loca[k] for k in range(len(order))] + [face.glyphPos[-1]]
    assert face.glyphPos[-1] == len(tools.reader["glyf"])


def test_font_as_reportlabs_but_the_face():
    # Reference: reportlab's TTFont made from the same file.
    ours, theirs = TaggedTTFont("Face", _path("DejaVuSans.ttf")), TTFont("Face", _path("DejaVuSans.ttf"))
    assert set(vars(ours)) == set(vars(theirs))
    for key in ("fontName", "shapable"):
        assert getattr(ours, key) == getattr(theirs, key)
    # kitgen's subsets hold only the characters drawn (test_font_subsets.py)
    assert ours._asciiReadable is False
    assert type(ours.encoding) is type(theirs.encoding)
    assert ours.stringWidth("Tropic of Capricorn 23°26′", 9) == theirs.stringWidth("Tropic of Capricorn 23°26′", 9)


def _with_cmap_format(data: bytes, fmt: int) -> bytes:
    """The font with its Windows subtables' format numbers set to ``fmt``."""
    out = bytearray(data)
    tables = {out[12 + 16 * k:16 + 16 * k].decode("latin-1"): struct.unpack_from(">L", out, 20 + 16 * k)[0]
              for k in range(struct.unpack_from(">H", out, 4)[0])}
    at = tables["cmap"]
    count = struct.unpack_from(">H", out, at + 2)[0]
    for k in range(count):
        platform, _, offset = struct.unpack_from(">HHL", out, at + 4 + 8 * k)
        if platform == 3:
            struct.pack_into(">H", out, at + offset, fmt)
    return bytes(out)


def test_other_formats_left_to_reportlab(tmp_path, monkeypatch):
    # A character map of a format read here only by reportlab (its own
    # reading, which meets the changed number and refuses it) is handed to
    # reportlab whole: the same error as reportlab's own.
    data = (resources.files("kitgen") / "fonts" / "NotoSansDevanagari-Regular.ttf").read_bytes()
    path = tmp_path / "odd.ttf"
    path.write_bytes(_with_cmap_format(data, 7))
    read_whole = []
    monkeypatch.setattr(face_reading, "_read_char_info", lambda *a: read_whole.append(a))
    with pytest.raises(ValueError) as ours:
        WholeTableFace(str(path))
    with pytest.raises(ValueError) as theirs:
        TTFontFace(str(path))
    assert str(ours.value) == str(theirs.value)
    assert read_whole == []


def test_small_font_short_offsets_and_shared_advances(tmp_path):
    # A font cut down by fontTools' subsetter (short glyph offsets, 'loca'
    # format 0; a format 4 map) and with its last glyphs sharing one
    # advance (hhea.numberOfHMetrics below the glyph count): read as
    # reportlab reads it.  Reference: reportlab's TTFontFace.
    from fontTools import subset

    font = ToolsFont(_path("DejaVuSans.ttf"))
    options = subset.Options()
    options.notdef_outline = True
    options.drop_tables += ["FFTM"]
    cutter = subset.Subsetter(options)
    cutter.populate(text="Tropic of Capricorn 0123 \u00e9\u03a9\u2014")
    cutter.subset(font)
    names = font.getGlyphOrder()
    for name in names[-3:]:
        font["hmtx"][name] = (font["hmtx"][names[-4]][0], font["hmtx"][name][1])
    path = tmp_path / "small.ttf"
    font.save(str(path))
    assert ToolsFont(str(path))["head"].indexToLocFormat == 0
    assert ToolsFont(str(path))["hhea"].numberOfHMetrics < len(names)
    ours, theirs = vars(WholeTableFace(str(path))), vars(TTFontFace(str(path)))
    assert [k for k in theirs if k not in STATE and not _same(ours[k], theirs[k])] == []

"""A TrueType face for reportlab, its character tables read whole (#12).

reportlab's ``TTFontFace`` reads a font's character map, horizontal
metrics and glyph locations one number at a time: 7 to 9 ms a DejaVu
face, 25 ms of the three every kit and class set registers before its
first kit, where the rest of its reading takes under 1 ms.  This face
lets reportlab read the rest (names, header, OS/2, post, hhea, maxp) and
reads those three tables itself, each as one array (the formats are the
OpenType specification's, 1.9: 'cmap' subtables 4 and 12, 'hmtx',
'loca'), to the very same values, so that widths, subsets and every
byte of a kit stay as reportlab's own reading makes them.  A font with
another kind of character map is read by reportlab throughout.

tests/test_face_reading.py compares every attribute with reportlab's
own reading for each shipped font.
"""

from __future__ import annotations

import struct
from array import array
from sys import byteorder

from reportlab.pdfbase.ttfonts import TTFError, TTFontFace

#: The character map formats read here; any other is left to reportlab.
FORMATS = (4, 12)


class WholeTableFace(TTFontFace):
    """``TTFontFace`` with its character information read table by table
    (see the module docstring); the same attributes, the same values."""

    def extractInfo(self, charInfo=1):
        super().extractInfo(0)   # names, head, OS/2, post, hhea, maxp: reportlab's own reading
        if not charInfo:
            return
        subtable = _chosen_cmap(self._ttf_data, self.table["cmap"]["offset"])
        glyph_data_format = _u16(self._ttf_data, self.table["head"]["offset"] + 52)
        if subtable is None or _u16(self._ttf_data, subtable) not in FORMATS or glyph_data_format != 0:
            super().extractInfo(1)   # another format, or a glyph data format reportlab refuses in its words
            return
        _read_char_info(self, subtable)


def _u16(data: bytes, at: int) -> int:
    return struct.unpack_from(">H", data, at)[0]


def _chosen_cmap(data: bytes, cmap_at: int) -> int | None:
    """The offset in the file of the character map subtable reportlab
    chooses (ttfonts.TTFontFile.extractInfo's rule: the last Windows one,
    else a Unicode one, else Macintosh Roman), or None."""
    version, count = struct.unpack_from(">HH", data, cmap_at)
    if count == 0 and version != 0:
        count = version
    chosen, kind = None, 0
    for k in range(count):
        platform, encoding, offset = struct.unpack_from(">HHL", data, cmap_at + 4 + 8 * k)
        if platform == 3:
            kind, chosen = 1, offset
        elif platform == 1 and encoding == 0 and kind != 1:
            kind, chosen = 2, offset
        elif platform == 1 and encoding == 1:
            kind, chosen = 1, offset
        elif platform == 0 and encoding != 5:
            kind, chosen = 1, offset
    return None if chosen is None else cmap_at + chosen


def _read_char_info(face, at: int) -> None:
    """Set ``charToGlyph``, ``glyphToChar``, ``charWidths``, ``hmetrics``,
    ``defaultWidth`` and ``glyphPos`` from the subtable at ``at`` and the
    'hmtx' and 'loca' tables, as reportlab sets them."""
    data = face._ttf_data
    char_to_glyph = _format_4(data, at) if _u16(data, at) == 4 else _format_12(data, at)
    glyph_to_char: dict[int, list[int]] = {}
    for char, glyph in char_to_glyph.items():
        glyph_to_char.setdefault(glyph, []).append(char)

    hhea = face.table["hhea"]["offset"]
    long_metrics = _u16(data, hhea + 34)
    if long_metrics == 0:
        raise TTFError("Number of horizontal metrics is 0")
    glyphs = face.numGlyphs
    hmtx = face.table["hmtx"]["offset"]
    pairs = _be_array("H", data, hmtx, 2 * long_metrics)
    scale = face._pdfScale
    # The glyphs past the long metrics share the last advance, which
    # reportlab keeps in their metrics scaled to thousandths of an em.
    tail = max(0, glyphs - long_metrics)
    advances = list(pairs[0::2]) + [scale(pairs[2 * long_metrics - 2])] * tail
    bearings = list(pairs[1::2]) + list(_be_array("H", data, hmtx + 4 * long_metrics, tail))
    face.hmetrics = list(zip(advances, bearings))
    face.defaultWidth = scale(advances[0])
    widths = {}
    for glyph in sorted(glyph_to_char):   # by glyph, as reportlab fills it
        if glyph < len(advances):
            chars = glyph_to_char[glyph]
            width = scale(advances[glyph]) if glyph < long_metrics else advances[glyph]
            for char in chars:
                widths[char] = width

    if "loca" not in face.table:
        raise TTFError("missing location table")
    loca = face.table["loca"]["offset"]
    long_offsets = _u16(data, face.table["head"]["offset"] + 50)
    if long_offsets == 0:
        face.glyphPos = [p << 1 for p in _be_array("H", data, loca, glyphs + 1)]
    elif long_offsets == 1:
        face.glyphPos = list(_be_array("L", data, loca, glyphs + 1))
    else:
        raise TTFError("Unknown location table format (%d)" % long_offsets)
    if 0x20 in char_to_glyph:
        char_to_glyph[0xA0] = char_to_glyph[0x20]
        widths[0xA0] = widths[0x20]
    elif 0xA0 in char_to_glyph:
        char_to_glyph[0x20] = char_to_glyph[0xA0]
        widths[0x20] = widths[0xA0]
    face.charToGlyph, face.glyphToChar, face.charWidths = char_to_glyph, glyph_to_char, widths


def _be_array(code: str, data: bytes, at: int, count: int) -> array:
    """``count`` big-endian unsigned numbers (``H`` 16 bits, ``L`` 32)
    from ``at``."""
    out = array(code if code == "H" else "I")
    size = out.itemsize
    out.frombytes(data[at:at + size * count])
    if len(out) != count:
        raise TTFError("table runs past the end of the file")
    if byteorder == "little":
        out.byteswap()
    return out


def _format_4(data: bytes, at: int) -> dict[int, int]:
    """A format 4 subtable (segment mapping to delta values), as
    reportlab maps it: a glyph offset past the subtable maps to glyph 0."""
    length = _u16(data, at + 2)
    limit = at + length
    segments = _u16(data, at + 6) // 2
    ends = _be_array("H", data, at + 14, segments)
    starts = _be_array("H", data, at + 16 + 2 * segments, segments)
    deltas = _be_array("H", data, at + 16 + 4 * segments, segments)
    range_at = at + 16 + 6 * segments
    ranges = _be_array("H", data, range_at, segments)
    out: dict[int, int] = {}
    for n in range(segments):
        start, end, delta, offset = starts[n], ends[n], deltas[n], ranges[n]
        if offset == 0:
            for char in range(start, end + 1):
                out[char] = (char + delta) & 0xFFFF
            continue
        for char in range(start, end + 1):
            place = range_at + 2 * n + offset + 2 * (char - start)
            glyph = 0 if place >= limit else _u16(data, place)
            out[char] = (glyph + delta) & 0xFFFF if glyph else 0
    return out


def _format_12(data: bytes, at: int) -> dict[int, int]:
    """A format 12 subtable (segmented coverage)."""
    groups = struct.unpack_from(">L", data, at + 12)[0]
    rows = _be_array("L", data, at + 16, 3 * groups)
    out: dict[int, int] = {}
    for k in range(0, 3 * groups, 3):
        start, end, glyph = rows[k], rows[k + 1], rows[k + 2]
        out.update(zip(range(start, end + 1), range(glyph, glyph + end - start + 1)))
    return out

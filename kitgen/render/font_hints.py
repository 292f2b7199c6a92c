"""An embedded font subset without its hinting (#12: bytes per kit).

A TrueType font's hinting is a program that moves a glyph's points onto
the pixel grid at small sizes on a screen: the font program ('fpgm'), the
control value program ('prep'), the control values ('cvt ') and each
glyph's own instructions (OpenType specification, "TrueType
Instructions"; 'glyf': a simple glyph's ``instructionLength`` and
instructions after its ``endPtsOfContours``, a composite glyph's after
its last component, flagged ``WE_HAVE_INSTRUCTIONS``).  A printed kit is
drawn at hundreds of pixels to the em, where the outlines alone decide
every pixel, and a PDF reader draws unhinted TrueType as it draws any
other.  The shipped DejaVu and Noto fonts are hinted: their subsets'
hinting was about a third of the font bytes a kit embeds (19 KB of 54
in English, 30 of 82 in Arabic).

Each glyph keeps its outline byte for byte; only its instructions go.
The three hinting tables stay in the file, empty: ISO 32000-1:2008, 9.9
lists them among the tables an embedded TrueType program contains, and an
empty program is a program that does nothing.  The file is rebuilt as
:mod:`.font_names` rebuilds it; 'loca' is made anew in the font's own
format (offsets halved in the short one), every glyph on a four-byte
boundary.
"""

from __future__ import annotations

import struct

from .font_names import font_file, font_tables

#: The hinting tables, kept empty.
HINTING_TABLES = (b"fpgm", b"prep", b"cvt ")
#: Tables whose figures hold only for the hinted glyphs (OpenType 'hdmx',
#: 'LTSH', 'VDMX': widths and heights at pixel sizes), left out.
HINTED_METRICS = (b"hdmx", b"LTSH", b"VDMX")

# A simple glyph's point flags (OpenType 'glyf').
_X_SHORT = 0x02
_Y_SHORT = 0x04
_REPEAT = 0x08
_X_SAME = 0x10
_Y_SAME = 0x20
# A composite glyph's component flags.
_ARGS_ARE_WORDS = 0x0001
_HAS_SCALE = 0x0008
_MORE_COMPONENTS = 0x0020
_HAS_XY_SCALE = 0x0040
_HAS_TWO_BY_TWO = 0x0080
_HAS_INSTRUCTIONS = 0x0100


def without_hinting(font: bytes) -> bytes:
    """``font`` (a TrueType file) with its glyphs' instructions left out
    and its hinting tables empty; the font as it was where it has no
    'glyf' and 'loca' (not a TrueType outline font), no hinting, or a
    glyph this cannot read."""
    tables = font_tables(font)
    if not all(tag in tables for tag in (b"glyf", b"loca", b"head", b"maxp")):
        return font
    try:
        short = struct.unpack_from(">h", tables[b"head"], 50)[0] == 0
        count = struct.unpack_from(">H", tables[b"maxp"], 4)[0]
        offsets = _offsets(tables[b"loca"], count, short)
        glyf = tables[b"glyf"]
        glyphs = [_unhinted(glyf[a:b]) for a, b in zip(offsets, offsets[1:])]
    except (struct.error, IndexError):   # a glyph not as the specification lays it out: the font as it was
        return font
    new_glyf, new_offsets = bytearray(), [0]
    for glyph in glyphs:
        new_glyf += glyph + b"\0" * (-len(glyph) % 4)
        new_offsets.append(len(new_glyf))
    if short and len(new_glyf) > 2 * 0xFFFF:   # beyond the short format's reach: as it was
        return font
    out = {}
    for tag, data in tables.items():
        if tag in HINTED_METRICS:
            continue
        out[tag] = b"" if tag in HINTING_TABLES else data
    out[b"glyf"] = bytes(new_glyf)
    out[b"loca"] = (struct.pack(f">{len(new_offsets)}H", *(o // 2 for o in new_offsets)) if short
                    else struct.pack(f">{len(new_offsets)}I", *new_offsets))
    if out == tables:
        return font
    return font_file(font[:4], out)


def _offsets(loca: bytes, count: int, short: bool) -> list[int]:
    """The glyphs' ``count`` + 1 offsets in 'glyf' (the short format
    stores them halved)."""
    if short:
        return [2 * o for o in struct.unpack_from(f">{count + 1}H", loca)]
    return list(struct.unpack_from(f">{count + 1}I", loca))


def _points_end(glyph: bytes, at: int, points: int) -> int:
    """Where a simple glyph's points end (its flags from ``at``, then the
    x and y coordinates, each one or two bytes or none by its flag), so
    that the glyph's old padding is not carried after it."""
    flags = []
    while len(flags) < points:
        flag = glyph[at]
        repeat = 1 + (glyph[at + 1] if flag & _REPEAT else 0)
        at += 2 if flag & _REPEAT else 1
        flags += [flag] * repeat
    for short, same in ((_X_SHORT, _X_SAME), (_Y_SHORT, _Y_SAME)):
        at += sum(1 if f & short else 0 if f & same else 2 for f in flags[:points])
    return at


def _unhinted(glyph: bytes) -> bytes:
    """One glyph's 'glyf' data without its instructions (an empty glyph
    stays empty)."""
    if not glyph:
        return glyph
    contours = struct.unpack_from(">h", glyph, 0)[0]
    if contours == 0 and len(glyph) < 12:   # a header alone
        return glyph
    if contours >= 0:   # simple: header, endPtsOfContours, instructionLength, instructions, the points
        at = 10 + 2 * contours
        points = struct.unpack_from(">H", glyph, at - 2)[0] + 1 if contours else 0
        start = at + 2 + struct.unpack_from(">H", glyph, at)[0]
        return glyph[:at] + b"\0\0" + glyph[start:_points_end(glyph, start, points)]
    out, at = bytearray(glyph[:10]), 10
    while True:
        flags = struct.unpack_from(">H", glyph, at)[0]
        size = 4 + (4 if flags & _ARGS_ARE_WORDS else 2)
        size += 2 if flags & _HAS_SCALE else 4 if flags & _HAS_XY_SCALE else 8 if flags & _HAS_TWO_BY_TWO else 0
        out += struct.pack(">H", flags & ~_HAS_INSTRUCTIONS) + glyph[at + 2:at + size]
        at += size
        if not flags & _MORE_COMPONENTS:
            return bytes(out)

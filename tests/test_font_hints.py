"""The fonts a kit embeds carry their outlines without their hinting (#12:
bytes per kit).

References: fontTools, the general-purpose OpenType library, reads the
shipped and the embedded fonts (checksums verified, ``checkChecksums=2``)
and decodes every glyph's points and components; the OpenType
specification's 'glyf' table (a glyph's instructions), its hinting
tables 'fpgm', 'prep' and 'cvt ', and its whole-font checksum (0xB1B0AFBA);
pypdf reads the embedded font files out of a kit; PDFium (pypdfium2)
draws a kit's pages with its fonts hinted and unhinted.
"""

from __future__ import annotations

import io
import struct
import subprocess
import sys
from importlib import resources

import numpy as np
import pypdfium2 as pdfium
import pytest
from fontTools.ttLib import TTFont
from pypdf import PdfReader

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.font_hints import without_hinting
from kitgen.render.pdf import build_pdf

FONT_CHECKSUM = 0xB1B0AFBA
HINTING = ("fpgm", "prep", "cvt ")
SHIPPED = ["DejaVuSans.ttf", "DejaVuSansCondensed.ttf", "DejaVuSans-Bold.ttf", "NotoSansArabic-Regular.ttf",
           "NotoSansArabic-Bold.ttf", "NotoSansDevanagari-Regular.ttf", "NotoSansDevanagari-Bold.ttf"]


def _font_sum(data: bytes) -> int:
    padded = data + b"\0" * (-len(data) % 4)
    return sum(struct.unpack(f">{len(padded) // 4}I", padded)) & 0xFFFFFFFF


def _shipped(filename: str) -> bytes:
    return resources.files("kitgen").joinpath("fonts", filename).read_bytes()


def _instructions(glyph) -> bytes:
    program = getattr(glyph, "program", None)
    return program.getBytecode() if program is not None else b""


def _outline(glyph):
    """A simple glyph's points, their on-curve flags and its contours' ends."""
    return (tuple(glyph.coordinates), tuple(f & 1 for f in glyph.flags), tuple(glyph.endPtsOfContours))


@pytest.mark.parametrize("filename", SHIPPED)
def test_a_whole_font_keeps_every_outline_and_loses_its_hinting(filename):
    data = _shipped(filename)
    plain = without_hinting(data)
    before, after = TTFont(io.BytesIO(data)), TTFont(io.BytesIO(plain), checkChecksums=2)
    assert _font_sum(plain) == FONT_CHECKSUM
    assert before.getGlyphOrder() == after.getGlyphOrder()
    hinted = 0
    for name in before.getGlyphOrder():
        old, new = before["glyf"][name], after["glyf"][name]
        hinted += bool(_instructions(old))
        assert _instructions(new) == b"", name
        assert old.numberOfContours == new.numberOfContours, name
        if old.isComposite():
            assert [(c.glyphName, c.x, c.y, getattr(c, "transform", None), c.flags & ~0x0100) for c in old.components] \
                == [(c.glyphName, c.x, c.y, getattr(c, "transform", None), c.flags & ~0x0100)
                    for c in new.components], name
        elif old.numberOfContours:
            assert _outline(old) == _outline(new), name
    # the shipped fonts are hinted (DejaVu Sans Condensed by its tables alone): something to take away
    assert hinted > 100 or any(len(before.reader[tag]) for tag in HINTING if tag in before.reader)
    for tag in HINTING:   # kept, empty (ISO 32000-1:2008, 9.9 lists them)
        assert tag in after.reader and len(after.reader[tag]) == 0
    for tag in before.reader.keys():
        if tag in ("glyf", "loca", *HINTING, "hdmx", "LTSH", "VDMX"):
            continue
        old, new = before.reader[tag], after.reader[tag]
        if tag == "head":   # only checkSumAdjustment (bytes 8 to 12) is made anew
            old, new = old[:8] + old[12:], new[:8] + new[12:]
        assert old == new, tag
    assert len(plain) < len(data)


def _embedded(pdf: bytes):
    """(base font name, font program) of each TrueType font a PDF embeds, once each."""
    seen = {}
    for page in PdfReader(io.BytesIO(pdf)).pages:
        for font in (page["/Resources"].get("/Font") or {}).values():
            font = font.get_object()
            descriptor = font.get("/FontDescriptor")
            if descriptor is not None and "/FontFile2" in descriptor.get_object():
                seen[str(font["/BaseFont"])] = descriptor.get_object()["/FontFile2"].get_object().get_data()
    return seen


@pytest.mark.parametrize("language", ["en", "el", "ar", "hi"])
def test_a_kits_embedded_glyphs_are_the_shipped_outlines_unhinted(language):
    kit = build_kit(validate_recipe({"language": language, "latitude": -30.0, "epoch": 2027, "sheet": "a5"}))
    embedded = _embedded(build_pdf(kit)[1])
    outlines = set()
    for filename in SHIPPED:
        shipped = TTFont(io.BytesIO(_shipped(filename)))
        outlines |= {_outline(shipped["glyf"][n]) for n in shipped.getGlyphOrder()
                     if not shipped["glyf"][n].isComposite() and shipped["glyf"][n].numberOfContours > 0}
    simple = 0
    for name, program in embedded.items():
        font = TTFont(io.BytesIO(program), checkChecksums=2)
        assert _font_sum(program) == FONT_CHECKSUM, name
        assert all(len(font.reader[tag]) == 0 for tag in HINTING if tag in font.reader), name
        for glyph_name in font.getGlyphOrder():
            glyph = font["glyf"][glyph_name]
            assert _instructions(glyph) == b"", (name, glyph_name)
            if not glyph.isComposite() and glyph.numberOfContours > 0:
                assert _outline(glyph) in outlines, (name, glyph_name)   # a shipped glyph, point for point
                simple += 1
    assert len(embedded) >= 3 and simple > 100


_BUILD = """
import sys
from kitgen.render import pdf_text
if sys.argv[1] == "hinted":
    pdf_text.without_hinting = lambda font: font
from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf
kit = build_kit(validate_recipe({"language": sys.argv[2], "latitude": 30.0, "epoch": 2027, "sheet": "a5"}))
sys.stdout.buffer.write(build_pdf(kit)[1])
"""


@pytest.mark.parametrize("language", ["en", "ar"])
def test_pdfium_draws_the_unhinted_kit_as_the_hinted_one(language):
    """Every page drawn at 150 dpi by PDFium: the kit with its fonts hinted
    (the shipped fonts' programs kept, in a process of its own) and as
    kitgen embeds them differ in under 0.1 % of the pixels by more than a
    quarter of the grey scale (hinting moves a stem by a pixel at most)."""
    pdfs = [subprocess.run([sys.executable, "-c", _BUILD, kind, language], capture_output=True, check=True).stdout
            for kind in ("hinted", "plain")]
    assert len(pdfs[1]) < len(pdfs[0])
    hinted, plain = (pdfium.PdfDocument(p) for p in pdfs)
    assert len(hinted) == len(plain)
    for k in range(len(hinted)):
        a = np.asarray(hinted[k].render(scale=150 / 72).to_pil().convert("L"), dtype=int)
        b = np.asarray(plain[k].render(scale=150 / 72).to_pil().convert("L"), dtype=int)
        assert a.shape == b.shape
        assert (np.abs(a - b) > 64).mean() < 1e-3, k
        assert (b < 128).mean() > 1e-3, k   # the page has ink


def test_a_glyph_it_cannot_read_leaves_the_font_as_it_was():
    """A simple glyph whose instruction length runs past its own end (not
    as the OpenType 'glyf' table lays a glyph out): the font is embedded
    as it came, hinting and all, rather than cut wrong."""
    from kitgen.render.font_names import font_file, font_tables

    data = _shipped("NotoSansArabic-Regular.ttf")
    tables = font_tables(data)
    font = TTFont(io.BytesIO(data))
    gid = next(k for k, name in enumerate(font.getGlyphOrder())
               if font["glyf"][name].numberOfContours > 0 and _instructions(font["glyf"][name]))
    start = font["loca"][gid]
    contours = struct.unpack_from(">h", tables[b"glyf"], start)[0]
    glyf = bytearray(tables[b"glyf"])
    struct.pack_into(">H", glyf, start + 10 + 2 * contours, 0xFFFF)   # its instructionLength
    tables[b"glyf"] = bytes(glyf)
    broken = font_file(data[:4], tables)
    assert without_hinting(broken) == broken
    assert without_hinting(data) != data   # the same font, readable, loses its hinting

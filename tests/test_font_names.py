"""The fonts a kit embeds carry their naming table once (#12: bytes per
kit): the Windows records, every notice among them, without the
Macintosh copies.

References: fontTools, the general-purpose OpenType library, reads the
fonts (checksums verified, ``checkChecksums=2``); the OpenType
specification's 'name' table (platform IDs 1 Macintosh and 3 Windows)
and whole-font checksum (0xB1B0AFBA, the 'head' table's
checkSumAdjustment); pypdf reads the embedded font files out of a kit.
"""

from __future__ import annotations

import io
import struct
from importlib import resources

import pytest
from fontTools.ttLib import TTFont
from pypdf import PdfReader

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.font_names import without_mac_names
from kitgen.render.pdf import build_pdf

FONT_CHECKSUM = 0xB1B0AFBA


def _font_sum(data: bytes) -> int:
    padded = data + b"\0" * (-len(data) % 4)
    return sum(struct.unpack(f">{len(padded) // 4}I", padded)) & 0xFFFFFFFF


def _records(font: TTFont, platform: int) -> list:
    return sorted((n.platformID, n.platEncID, n.langID, n.nameID, n.toUnicode()) for n in font["name"].names
                  if n.platformID == platform)


@pytest.mark.parametrize("filename", ["DejaVuSans.ttf", "DejaVuSansCondensed.ttf", "DejaVuSans-Bold.ttf",
                                      "NotoSansArabic-Regular.ttf", "NotoSansDevanagari-Regular.ttf"])
def test_a_whole_font_keeps_all_but_the_mac_names(filename):
    data = resources.files("kitgen").joinpath("fonts", filename).read_bytes()
    trimmed = without_mac_names(data)
    before, after = TTFont(io.BytesIO(data)), TTFont(io.BytesIO(trimmed), checkChecksums=2)
    assert _font_sum(trimmed) == FONT_CHECKSUM
    assert _records(after, 1) == []
    assert _records(after, 3) == _records(before, 3)   # every Windows record, the notices among them
    for tag in before.reader.keys():
        if tag == "name":
            continue
        old, new = before.reader[tag], after.reader[tag]
        if tag == "head":   # only checkSumAdjustment (bytes 8 to 12) is made anew
            old, new = old[:8] + old[12:], new[:8] + new[12:]
        assert old == new, tag
    if not _records(before, 1):
        assert trimmed == data   # nothing to leave out: the same bytes


@pytest.mark.parametrize("language", ["en", "el", "ar", "hi"])
def test_a_kits_embedded_fonts_name_themselves_once(language):
    kit = build_kit(validate_recipe({"language": language, "latitude": 30.0, "epoch": 2027, "sheet": "a5"}))
    reader = PdfReader(io.BytesIO(build_pdf(kit)[1]))
    seen = 0
    for page in reader.pages:
        for font in (page["/Resources"].get("/Font") or {}).values():
            descriptor = font.get_object().get("/FontDescriptor")
            if descriptor is None or "/FontFile2" not in descriptor.get_object():
                continue
            program = descriptor.get_object()["/FontFile2"].get_object().get_data()
            embedded = TTFont(io.BytesIO(program), checkChecksums=2)
            assert _records(embedded, 1) == [] and _records(embedded, 3)
            assert any(n.nameID == 0 for n in embedded["name"].names)   # the copyright notice stays
            seen += 1
    assert seen >= 3

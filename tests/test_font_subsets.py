"""A kit's embedded font subsets hold the characters its pages draw, and
no others (#12: bytes per kit).

ISO 32000-1:2008, 9.6.4: a font subset is a font program that holds only
some of the font's glyphs, embedded to save space.  reportlab's subsets
had also carried every printable ASCII character of each font, drawn or
not (its ``ttfAsciiReadable`` setting, which keeps the codes of a content
stream readable as ASCII): the whole Latin alphabet in each of the three
Latin faces of an Arabic or Hindi kit, where only digits and a few signs
are drawn.  Each kit now embeds only what it draws.

References: pypdf (an independent PDF reader) parses every page's content
stream and those of the forms it draws (the operators Tf, Tj, TJ, ' and
", ISO 32000-1:2008, 9.4.3), and reads each font's ToUnicode map (9.10.3),
whose codes and characters are the subset's.  Only .notdef and the space
may be held undrawn (:data:`PLACEHOLDERS`).
"""

from __future__ import annotations

import io
import re

import pytest
from pypdf import PdfReader
from pypdf.generic import ContentStream

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf

#: What a subset's codes that no page draws may stand for: .notdef
#: (U+0000) and the space (U+0020), which reportlab's subsets hold at code
#: 32 for word spacing and at the codes below 32 not yet given to a
#: character (``TTFont.State``); any other undrawn code is a character
#: embedded for nothing.
PLACEHOLDERS = {0x0000, 0x0020}
#: A ToUnicode map's ``bfchar`` line (one-byte code, UTF-16BE text) and
#: ``bfrange`` line (first and last code, the first one's text).
_CHAR = re.compile(rb"^<([0-9A-Fa-f]{2})>\s*<([0-9A-Fa-f]{4,})>", re.M)
_RANGE = re.compile(rb"^<([0-9A-Fa-f]{2})>\s*<([0-9A-Fa-f]{2})>\s*<([0-9A-Fa-f]{4})>", re.M)


def _characters(font) -> dict[int, int]:
    """The subset's codes, each with the (first) character it stands for."""
    data = font["/ToUnicode"].get_object().get_data()
    body = data.split(b"endcodespacerange", 1)[1]
    found = {int(code, 16): int(text[:4], 16) for code, text in _CHAR.findall(body)}
    for lo, hi, first in _RANGE.findall(body):
        for k, code in enumerate(range(int(lo, 16), int(hi, 16) + 1)):
            found[code] = int(first, 16) + k
    return found


def _bytes(operand) -> bytes:
    return operand.get_original_bytes() if hasattr(operand, "get_original_bytes") else bytes(operand)


def _drawn(reader, contents, resources, used: dict) -> None:
    """Add to ``used`` (font object number: codes) the codes each font
    draws in ``contents``, and in the forms it draws, recursively."""
    fonts = resources.get("/Font", {})
    forms = resources.get("/XObject", {})
    font = None
    for operands, operator in ContentStream(contents, reader).operations:
        if operator == b"Tf":
            font = fonts.raw_get(operands[0]).idnum
        elif operator in (b"Tj", b"'", b'"', b"TJ"):
            strings = operands[0] if operator == b"TJ" else operands[-1:]
            for s in strings:
                if not isinstance(s, (int, float)) and not hasattr(s, "as_numeric"):
                    used.setdefault(font, set()).update(_bytes(s))
        elif operator == b"Do":
            form = forms[operands[0]].get_object()
            _drawn(reader, form, form.get("/Resources", resources), used)


@pytest.mark.parametrize("tree", [
    {"language": "ar", "latitude": 24.7, "sheet": "letter", "owner": "سلمى"},
    {"language": "hi", "latitude": 28.6, "sheet": "a5"},
    {"language": "en", "latitude": -33.9, "owner": "Robin Example"},
    {"language": "ru", "latitude": 55.8, "sheet": "a4"},
], ids=lambda t: t["language"])
def test_every_embedded_character_is_drawn(tree):
    kit = build_kit(validate_recipe({"epoch": 2027, **tree}))
    reader = PdfReader(io.BytesIO(build_pdf(kit)[1]))
    used: dict = {}
    for page in reader.pages:
        _drawn(reader, page.get_contents(), page["/Resources"], used)
    fonts = {}
    for page in reader.pages:
        named = page["/Resources"]["/Font"]
        for name in named:
            fonts[named.raw_get(name).idnum] = named[name]
    assert len(fonts) >= 3
    for ref, font in fonts.items():
        embedded = _characters(font)
        drawn = used.get(ref, set())
        assert drawn <= embedded.keys(), (font["/BaseFont"], sorted(drawn - embedded.keys()))
        undrawn = {chr(c) for code, c in embedded.items() if code not in drawn and c not in PLACEHOLDERS}
        assert not undrawn, (font["/BaseFont"], "".join(sorted(undrawn)))

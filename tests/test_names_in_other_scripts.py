"""A pupil's name in another script than the kit's language (#12): a
class in one language has pupils who write their names in others.  The
name is drawn by the shipped font of its script where the language's own
fonts lack its letters, and refused in one line only where no shipped
font has them.

References:

* HarfBuzz, through uharfbuzz, shaping the name with the shipped Noto Sans
  Devanagari file directly: the glyphs the kit sets are HarfBuzz's (a
  Devanagari name needs its conjuncts and the reph, which an unshaped run
  would not draw).
* fontTools reading the shipped fonts' character maps: which font holds
  which letter, and that none holds a Han character.
* pypdf, an independent PDF reader, for the fonts a kit's PDF embeds.
"""

from __future__ import annotations

import io
from functools import lru_cache
from importlib import resources

import pytest
import uharfbuzz as hb
from fontTools.ttLib import TTFont
from pypdf import PdfReader

from kitgen.errors import UserError
from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.pdf import build_pdf
from kitgen.words import fonts
from kitgen.words.locale import script
from kitgen.words.shaping import set_line

NAME = "अनन्या शर्मा"   # an invented pupil's name, in Devanagari
RECIPE = "latitude: 52.2\nepoch: 2027\ndiameter_mm: 80\nstars: {brightest: 6}\nlanguage: %s\nowner: %s\n"


@lru_cache(maxsize=None)
def _cmap(filename: str) -> dict:
    path = resources.files("kitgen").joinpath("fonts", filename)
    return TTFont(io.BytesIO(path.read_bytes()), lazy=True).getBestCmap()


@pytest.mark.parametrize("language", ["en", "ru", "ar"])
def test_a_devanagari_name_on_another_languages_kit(language):
    devanagari = fonts.SCRIPT_FACES["Deva"]["label"]
    # the language's own fonts lack the letters, the Devanagari font has them (fontTools)
    for face in fonts.stack(script(language), "label"):
        assert not any(ord(ch) in _cmap(face.filename) for ch in NAME if ch.isalpha())
    assert all(ord(ch) in _cmap(devanagari.filename) for ch in NAME if not ch.isspace())
    kit = build_kit(parse_recipe_text(RECIPE % (language, NAME)))
    for part in kit.parts:
        names = [e for e in part.elements if e.role == "owner"]
        assert names or NAME in part.values.get("labels_left_out", ()), part.id
    # the words of the name set in the Devanagari font, with HarfBuzz's glyphs
    line = set_line(NAME, script(language), "label")
    runs = [r for r in line.runs if r.face == devanagari]
    assert "".join(r.text for r in runs).replace(" ", "") == NAME.replace(" ", "")
    font = hb.Font(hb.Face(hb.Blob(fonts.font_bytes(devanagari))))
    for run in runs:
        buf = hb.Buffer()
        buf.add_str(run.text)
        buf.guess_segment_properties()
        hb.shape(font, buf, {})
        assert [g.gid for g in run.glyphs] == [i.codepoint for i in buf.glyph_infos]
        assert len(run.glyphs) < len(run.text)   # conjuncts: fewer glyphs than characters
    _, data = build_pdf(kit)
    names = set()
    for page in PdfReader(io.BytesIO(data)).pages:
        _font_names(page.get("/Resources"), names)
    assert any(n.endswith("+NotoSansDevanagari-Regular") for n in names), names


def _font_names(res, out: set) -> None:
    """The base fonts of a resource dictionary, its forms' included."""
    res = res.get_object() if res is not None else {}
    for font in (res.get("/Font") or {}).values():
        out.add(str(font.get_object().get("/BaseFont")))
    for form in (res.get("/XObject") or {}).values():
        _font_names(form.get_object().get("/Resources"), out)


def test_a_name_no_shipped_font_draws_is_refused_in_one_line():
    han = "王小明"
    for face in fonts.all_faces():
        assert not any(ord(ch) in _cmap(face.filename) for ch in han), face.filename
    with pytest.raises(UserError) as caught:
        parse_recipe_text(RECIPE % ("en", han))
    assert "U+738B" in caught.value.text() and "\n" not in caught.value.text()
    # the character itself beside its code point, so a coordinator finds it in the roster
    assert "'王' U+738B" in caught.value.text()


def test_a_plates_place_no_shipped_font_draws_is_refused_in_one_line():
    """The places named on the plates of a ``plates:`` list are checked
    like the kit's own place (they had reached the drawing and failed
    there): a Han name is refused in one line naming the key."""
    with pytest.raises(UserError) as caught:
        parse_recipe_text("plates:\n- {latitude: 45, place: 李华}\n- 50\nepoch: 2027\n")
    text = caught.value.text()
    assert "'plates'" in text and "U+674E" in text and "\n" not in text

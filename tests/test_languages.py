"""Every language: templates complete, glyphs covered, words in the PDF,
shaping as HarfBuzz does it, and labels that fit.

References outside kitgen:
- the Unicode CLDR, through Babel, for month names and decimal signs;
- the fonts' own character maps and outlines, read with fontTools;
- HarfBuzz (uharfbuzz) shaping the same strings with the same font files;
- PDFium (pypdfium2) extracting the text of the PDF, and pypdf reading its
  content streams and embedded font programs (ISO 32000-1:2008, 9.4 and 9.9).

One kit per language is built, laid out and rendered once for the module.
"""

from __future__ import annotations

import io
import math
import string
import unicodedata
from functools import lru_cache
from importlib import resources

import pytest
import yaml

babel = pytest.importorskip("babel")
hb = pytest.importorskip("uharfbuzz")
pdfium = pytest.importorskip("pypdfium2")
pypdf = pytest.importorskip("pypdf")
from babel import Locale  # noqa: E402
from fontTools.pens.recordingPen import DecomposingRecordingPen  # noqa: E402
from fontTools.ttLib import TTFont  # noqa: E402
from pypdf.generic import ContentStream  # noqa: E402

from kitgen.kit import build_kit  # noqa: E402
from kitgen.recipe.load import parse_recipe_text  # noqa: E402
from kitgen.render.pdf import build_pdf  # noqa: E402
from kitgen.words import fonts  # noqa: E402
from kitgen.words.measure import text_corners_mm  # noqa: E402

LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")
TEMPLATES = resources.files("kitgen.templates")


def _tree(code):
    return yaml.safe_load(TEMPLATES.joinpath(f"{code}.yaml").read_text(encoding="utf-8"))


def _flat(tree, prefix=""):
    out = {}
    for k, v in tree.items():
        if k in ("star_names", "star_short_names", "contractions") and not prefix:   # optional sections, not words by key
            continue
        if isinstance(v, dict):
            out.update(_flat(v, f"{prefix}{k}."))
        else:
            out[f"{prefix}{k}"] = v
    return out


def _fields(value):
    texts = value if isinstance(value, list) else [value]
    return {f for t in texts for _, f, _, _ in string.Formatter().parse(str(t)) if f is not None}


class Built:
    def __init__(self, code: str, native: bool = False):
        recipe = (f"latitude: 38.0\nepoch: 2027\nlanguage: {code}\ntitle: Larkspur Valley School\n"
                  f"native_digits: {'true' if native else 'false'}\n")
        self.code = code
        self.kit = build_kit(parse_recipe_text(recipe))
        self.pages, self.pdf = build_pdf(self.kit)
        doc = pdfium.PdfDocument(self.pdf)
        spans = _actual_texts(self.pdf)
        self.page_texts = [doc[i].get_textpage().get_text_range() + " " + " ".join(spans[i])
                           for i in range(len(doc))]
        self.text = " ".join(self.page_texts)


def _actual_texts(pdf_bytes):
    """Per page, the /ActualText of each marked-content span, in order
    (ISO 32000-1:2008, 14.9.4: the text a reader copies or searches for the
    glyphs inside the span; a conforming reader uses it for shaped and
    right-to-left lines, which PDFium's extractor does not).  The shaping
    test below checks that the glyphs inside are HarfBuzz's for that text."""
    reader = pypdf.PdfReader(io.BytesIO(pdf_bytes))
    out = []
    for page in reader.pages:
        spans = []
        for operands, op in ContentStream(page.get_contents(), reader).operations:
            if op == b"BDC" and len(operands) == 2 and hasattr(operands[1], "get"):
                text = operands[1].get("/ActualText")
                if text is not None:
                    spans.append(str(text))
        out.append(spans)
    return out


@pytest.fixture(scope="module", params=LANGUAGES)
def built(request) -> Built:
    return Built(request.param)


@lru_cache(maxsize=None)
def _font(filename: str) -> TTFont:
    return TTFont(io.BytesIO(resources.files("kitgen").joinpath("fonts", filename).read_bytes()))


# -- the templates ------------------------------------------------------------------

def test_ten_languages_are_shipped():
    names = sorted(p.name for p in TEMPLATES.iterdir() if p.name.endswith(".yaml"))
    assert names == sorted(f"{c}.yaml" for c in LANGUAGES)


@pytest.mark.parametrize("code", LANGUAGES)
def test_every_key_and_placeholder_as_in_english(code):
    """Same keys, same {placeholders}, lists of the same length as en.yaml;
    the file names its own BCP 47 code and says honestly whether a native
    speaker reviewed it (a bool, never missing)."""
    en, tree = _flat(_tree("en")), _tree(code)
    mine = _flat(tree)
    assert tree["language"] == code
    assert isinstance(tree["reviewed_by_native_speaker"], bool)
    assert set(mine) == set(en), set(mine) ^ set(en)
    for key, value in en.items():
        assert isinstance(mine[key], list) == isinstance(value, list), key
        if isinstance(value, list):
            assert len(mine[key]) == len(value), key
        assert _fields(mine[key]) == _fields(value), key


@pytest.mark.parametrize("code", LANGUAGES)
def test_twelve_divisions_of_the_ecliptic_are_distinct_words(code):
    signs = _flat(_tree(code))["zodiac.signs"]
    assert len(signs) == 12 and len(set(signs)) == 12


def _every_string(code, native: bool):
    """Every string a kit in ``code`` can print: the template's, CLDR's
    month names, and numbers in the digits the recipe may ask for."""
    from kitgen.words.templates import load_words

    w = load_words(code, native)
    out = [v for _, v in w.strings()]
    out += [w.number(x, 2) for x in (1234567890.5, 0.25)]
    return out


@pytest.mark.parametrize("native", (False, True))
@pytest.mark.parametrize("code", LANGUAGES)
def test_every_character_is_in_a_font_that_draws_it(code, native):
    """Each character of each string is in the character map (read here
    with fontTools from the shipped file) of a font of the stack that draws
    the language's labels, body text and bold text."""
    from kitgen.words.locale import script

    for style in fonts.STYLES:
        maps = [_font(f.filename).getBestCmap() for f in fonts.stack(script(code), style)]
        for s in _every_string(code, native):
            for ch in s:
                if unicodedata.category(ch) in ("Cf", "Cc"):
                    continue  # joining and direction controls draw nothing
                assert any(ord(ch) in m for m in maps), (code, style, s, f"U+{ord(ch):04X}")


def test_native_digits_are_the_locales_own():
    """CLDR: ar's native numbering system is arab (U+0660-0669), hi's is
    deva (U+0966-096F); Python's unicodedata gives each digit's value."""
    from kitgen.words.locale import format_number

    for code, system in (("ar", "arab"), ("hi", "deva")):
        assert Locale.parse(code).other_numbering_systems["native"] == system
        text = format_number(2027, 0, code, native_digits=True)
        assert [unicodedata.digit(ch) for ch in text] == [2, 0, 2, 7]
        assert all(unicodedata.name(ch).startswith(("ARABIC-INDIC", "DEVANAGARI")) for ch in text)


@pytest.mark.parametrize("code", LANGUAGES)
def test_decimal_sign_is_cldrs(code):
    """52.2 is written with the locale's CLDR decimal symbol (a comma in
    es, fr, de, pt, it, el, ru)."""
    from babel.numbers import get_decimal_symbol

    from kitgen.words.templates import load_words

    assert load_words(code).number(52.2, 1) == f"52{get_decimal_symbol(code)}2"


# -- the kit in each language ---------------------------------------------------------

def test_pdf_holds_the_cldr_month_names(built):
    """Every month name on the calendar ring, as CLDR has it (Babel as the
    reference): the stand-alone wide form, or the abbreviated one where
    the fitting rule chose it."""
    loc = Locale.parse(built.code)
    wide, short = loc.months["stand-alone"]["wide"], loc.months["stand-alone"]["abbreviated"]
    page = next(i for i, p in enumerate(built.pages) for pl in p.placements if pl.part.kind == "mater_back")
    text = built.page_texts[page]
    for m in range(1, 13):
        assert wide[m] in text or short[m] in text, (built.code, wide[m])


def test_pdf_holds_its_own_words_and_no_placeholder_or_english(built):
    """The instructions' sentences of the language itself are in the PDF's
    text; no {placeholder} is left; no English sentence (one the language
    writes differently) appears."""
    flat = " ".join(built.text.split())
    mine = _flat(_tree(built.code))
    for s in mine["instructions.cautions"]:
        assert s in flat, (built.code, s)
    assert mine["instructions.title"] in flat
    assert "{" not in built.text and "}" not in built.text
    if built.code != "en":
        en = _flat(_tree("en"))
        for key, value in en.items():
            for k, s in enumerate(value if isinstance(value, list) else [value]):
                theirs = mine[key][k] if isinstance(value, list) else mine[key]
                if isinstance(s, str) and len(s) > 12 and "{" not in s and s != theirs:
                    assert s not in flat, (built.code, key, s)


def test_labels_inside_their_parts_and_apart(built):
    """Each text element's measured box (the shipped font's advances and
    outlines) lies inside its part's cut outline, and no two text boxes of
    a part overlap (separating-axis test for convex polygons)."""
    w = built.kit.words
    for part in built.kit.parts:
        boxes = []
        for el in part.elements:
            if el.shape != "text" or not el.geom["text"]:
                continue
            style = "bold" if el.role == "title" else "label"
            ext = w.measure(el.geom["text"], el.geom["size_pt"], style)
            corners = text_corners_mm(el.geom["at"], ext.width_mm, ext.height_mm, el.geom["angle_deg"],
                                      el.geom["anchor"])
            assert _inside_part(part, corners), (built.code, part.kind, el.role, el.geom["text"])
            boxes.append((el, corners))
        for i, (a, ca) in enumerate(boxes):
            for b, cb in boxes[i + 1:]:
                assert not _convex_overlap(ca, cb), (built.code, part.kind, a.geom["text"], b.geom["text"])


def test_no_label_was_cut_short(built):
    """The last step of the fitting rule (cut with an ellipsis) is never
    needed for a shipped language."""
    for part in built.kit.parts:
        for el in part.elements:
            if el.shape == "text":
                assert not el.geom["text"].endswith("…"), (built.code, part.kind, el.geom["text"])
                assert el.geom["size_pt"] >= 5.0 - 1e-9


def _inside_part(part, corners) -> bool:
    cuts = [e for e in part.elements if e.role == "cut"]
    circles = [e for e in cuts if e.shape in ("circle", "arc") and e.geom["center"] == (0.0, 0.0)]
    if circles:
        r = max(e.geom["radius"] for e in circles)
        return all(math.hypot(x, y) <= r + 1e-9 for x, y in corners)
    poly = next(e.geom["points"] for e in cuts if e.shape == "polyline" and e.geom["closed"])
    return all(_in_polygon(p, poly) for p in corners)


def _in_polygon(p, poly) -> bool:
    """Ray casting (even-odd rule)."""
    x, y = p
    inside = False
    for (x0, y0), (x1, y1) in zip(poly, poly[1:] + poly[:1]):
        if (y0 > y) != (y1 > y) and x < x0 + (y - y0) * (x1 - x0) / (y1 - y0):
            inside = not inside
    return inside


def _convex_overlap(a, b) -> bool:
    for poly in (a, b):
        for (x0, y0), (x1, y1) in zip(poly, poly[1:] + poly[:1]):
            nx, ny = y0 - y1, x1 - x0
            pa = [nx * x + ny * y for x, y in a]
            pb = [nx * x + ny * y for x, y in b]
            if max(pa) <= min(pb) + 1e-9 or max(pb) <= min(pa) + 1e-9:
                return False
    return True


# -- measuring against outside references ------------------------------------------------

@pytest.mark.parametrize("text", ["Latitude 52.2° N", "Γεωγραφικό πλάτος", "Широта 52,2° с. ш.", "height ÷ distance"])
def test_plain_text_width_is_reportlabs(text):
    """A run set without shaping measures what reportlab's stringWidth
    gives for the same registered TrueType font."""
    from reportlab.pdfbase.pdfmetrics import stringWidth

    from kitgen.render.pdf_text import register_fonts
    from kitgen.words.measure import extent

    register_fonts()
    size = 7.0
    want_mm = stringWidth(text, "KitSansCondensed", size) * 25.4 / 72
    assert extent(text, size, "Latn", "label").width_mm == pytest.approx(want_mm, rel=1e-9)


@pytest.mark.parametrize("text,filename,script", [("الحوت", "NotoSansArabic-Regular.ttf", "Arab"),
                                                  ("वृश्चिक", "NotoSansDevanagari-Regular.ttf", "Deva")])
def test_shaped_width_is_harfbuzzs(text, filename, script):
    """A shaped word measures the sum of HarfBuzz's advances for it."""
    from kitgen.words.measure import extent

    font = hb.Font(hb.Face(hb.Blob(resources.files("kitgen").joinpath("fonts", filename).read_bytes())))
    buf = hb.Buffer()
    buf.add_str(text)
    buf.guess_segment_properties()
    hb.shape(font, buf)
    upem = _font(filename)["head"].unitsPerEm
    want_mm = sum(p.x_advance for p in buf.glyph_positions) / upem * 7.0 * 25.4 / 72
    assert extent(text, 7.0, script, "label", script == "Arab").width_mm == pytest.approx(want_mm, rel=1e-9)


# -- shaping: the PDF's glyphs are HarfBuzz's --------------------------------------------

def _outline(glyph_set, name):
    pen = DecomposingRecordingPen(glyph_set)
    glyph_set[name].draw(pen)
    return tuple((op, tuple(tuple(round(v, 3) for v in pt) for pt in pts)) for op, pts in pen.value)


def _drawn_glyph_runs(pdf_bytes):
    """For each text object (BT .. ET) of each page, the outlines of the
    glyphs it shows, in order, read from the embedded font programs
    (FontFile2) through their own character maps."""
    reader = pypdf.PdfReader(io.BytesIO(pdf_bytes))
    runs = []
    for page in reader.pages:
        fonts_res = page["/Resources"]["/Font"]
        programs = {}
        for name, ref in fonts_res.items():
            font = ref.get_object()
            program = font["/FontDescriptor"]["/FontFile2"].get_object().get_data()
            tt = TTFont(io.BytesIO(program))
            cmap = tt["cmap"].tables[0].cmap
            programs[name] = (str(font["/BaseFont"]), tt.getGlyphSet(), cmap)
        current, seq = None, []
        for operands, op in ContentStream(page.get_contents(), reader).operations:
            if op == b"BT":
                seq = []
            elif op == b"ET":
                runs.append(seq)
            elif op == b"Tf":
                current = programs[operands[0]]
            elif op in (b"Tj", b"TJ"):
                items = operands[0] if op == b"TJ" else [operands[0]]
                for item in items:
                    if isinstance(item, (bytes, str)) or hasattr(item, "original_bytes"):
                        data = item.original_bytes if hasattr(item, "original_bytes") else item
                        for code in data:
                            base, gs, cmap = current
                            seq.append((base.split("+")[-1], _outline(gs, cmap[code])))
    return runs


def _harfbuzz_outlines(text, filename):
    """HarfBuzz's own shaping of ``text`` (direction and script guessed
    from the text, default features), as glyph outlines in visual order."""
    data = resources.files("kitgen").joinpath("fonts", filename).read_bytes()
    font = hb.Font(hb.Face(hb.Blob(data)))
    buf = hb.Buffer()
    buf.add_str(text)
    buf.guess_segment_properties()
    hb.shape(font, buf)
    tt = _font(filename)
    order, gs = tt.getGlyphOrder(), tt.getGlyphSet()
    shaped = [_outline(gs, order[i.codepoint]) for i in buf.glyph_infos]
    naive = [_outline(gs, tt.getBestCmap()[ord(ch)]) for ch in text]
    return shaped, naive


@pytest.mark.parametrize("code,filename", [("ar", "NotoSansArabic-Regular.ttf"),
                                           ("hi", "NotoSansDevanagari-Regular.ttf")])
def test_complex_scripts_are_drawn_from_harfbuzz_glyph_runs(code, filename):
    """Every zodiac name and the caution of the alidade (in bold), as
    printed, is the very glyph sequence HarfBuzz shapes for it, and for some of them
    that sequence differs from the characters' own glyphs (joining forms,
    conjuncts, vowel signs that move), so shaping was needed and done."""
    b = Built(code)
    runs = [[o for _, o in run] for run in _drawn_glyph_runs(b.pdf)]
    words = b.kit.words
    checked = differs = 0
    # the caution is set in bold (#9), the signs' names in the regular face
    bold = filename.replace("Regular", "Bold")
    for s, face in [(z, filename) for z in words.items("zodiac.signs")] + [(words("alidade.caution"), bold)]:
        shaped, naive = _harfbuzz_outlines(s, face)
        n = len(shaped)
        assert any(run[k:k + n] == shaped for run in runs for k in range(len(run) - n + 1)), (code, s)
        checked += 1
        differs += shaped != naive and shaped != naive[::-1]
    assert checked == 13 and differs >= 3


def test_arabic_reads_right_to_left_on_the_text_pages():
    """The instructions' lines of an Arabic kit end at the right margin
    (their right ends align, as PDFium finds the text's boxes), and the
    title carries its logical text."""
    b = Built("ar")
    doc = pdfium.PdfDocument(b.pdf)
    tp = doc[0].get_textpage()
    assert b.kit.words("instructions.title") in _actual_texts(b.pdf)[0]
    rights = []
    for k in range(tp.count_rects()):
        left, bottom, right, top = tp.get_rect(k)
        rights.append(round(right))
    # Most lines share the right margin; a left-to-right page would share the left.
    common = max(set(rights), key=rights.count)
    assert rights.count(common) >= 10
    width = doc[0].get_size()[0]
    assert common > width * 0.8


@pytest.mark.parametrize("code", LANGUAGES)
def test_one_apostrophe_throughout(code):
    """A template writes the apostrophe within words one way throughout:
    the typographic ’ (U+2019) or the typewriter ' (common practice in
    typesetting, no source; French and Italian print ’)."""
    import re

    flat = _flat(_tree(code))
    texts = [t for v in flat.values() if isinstance(v, (str, list)) for t in (v if isinstance(v, list) else [v])]
    # on the kit's pages, an apostrophe may end a word too ("po’", the
    # elision of "poco"); the terminal's messages quote recipe keys ('latitude')
    printed = [t for k, v in flat.items() if not k.startswith("errors.") and isinstance(v, (str, list))
               for t in (v if isinstance(v, list) else [v])]
    straight = sum(len(re.findall(r"(?<=\w)'(?=\w)", t)) for t in texts) + sum(
        len(re.findall(r"(?<=\w)'(?=\s)", t)) for t in printed)
    curly = sum(len(re.findall(r"(?<=\w)\u2019(?=\w|\s)", t)) for t in texts)
    assert not (straight and curly), (straight, curly)
    if code in ("fr", "it"):
        assert curly and not straight


@pytest.mark.parametrize("given, printed", [(31.95, "Latitude 32.0° N"), (-12.35, "Latitude 12.4° S"),
                                            (48.25, "Latitude 48.3° N"), (51.4778, "Latitude 51.5° N")])
def test_a_latitude_is_printed_rounded_as_its_decimal_figures_read(given, printed):
    # One decimal, a half rounded up as a reader rounds the figures given
    # (common practice in print; from memory, rule B of the rounding annex
    # of ISO 80000-1:2009); binary rounding had printed 31.95 as 31.9, a
    # plate's label a teacher would take for a mistake.
    kit = build_kit(parse_recipe_text(f"latitude: {given}\nepoch: 2027\nparts: [plate]\n"))
    labels = [e.geom["text"] for e in kit.part("plate-1").elements if e.shape == "text"]
    assert printed in labels, labels

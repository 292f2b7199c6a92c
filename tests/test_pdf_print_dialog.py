"""The PDF asks for actual size and names its font subsets apart (#9),
read back with pypdf against PDF 32000-1:2008:

* 12.2, table 150: the catalog's ``/ViewerPreferences`` dictionary, whose
  ``/PrintScaling /None`` asks a print dialog not to scale the page;
* 9.6.4 (font subsets): an embedded subset's ``/BaseFont`` begins with a
  tag of exactly six upper-case letters and a plus sign, and "different
  subsets in the same PDF file shall have different tags";
* 9.8.1, table 122: the font descriptor's ``/FontName`` is the same name
  as the font dictionary's ``/BaseFont``.
"""

from __future__ import annotations

import io
import re

import pypdf
import pytest

from kitgen.kit import build_kit
from kitgen.layout.calibration import calibration_page
from kitgen.paper import make_sheet
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.calibration_pdf import render_calibration_pdf
from kitgen.render.pdf import build_pdf
from kitgen.words.templates import load_words

TAG = re.compile(r"/([A-Z]{6})\+(.+)")


def _kit_pdf(recipe: str) -> pypdf.PdfReader:
    _, data = build_pdf(build_kit(parse_recipe_text(recipe)))
    return pypdf.PdfReader(io.BytesIO(data))


@pytest.fixture(scope="module", params=["latitude: 52.2\nepoch: 2027\n",
                                        "latitude: 24.5\nepoch: 2027\nlanguage: ar\n",
                                        "latitude: 28.6\nepoch: 2027\nlanguage: hi\nsheet: a5\n"])
def reader(request):
    return _kit_pdf(request.param)


def _fonts(reader):
    """Every font dictionary the pages use, once."""
    seen = {}
    for page in reader.pages:
        for ref in page["/Resources"]["/Font"].values():
            seen[(ref.idnum, ref.generation)] = ref.get_object()
    return seen


def test_the_kit_asks_viewers_not_to_scale(reader):
    prefs = reader.trailer["/Root"]["/ViewerPreferences"]
    assert prefs["/PrintScaling"] == "/None"


def test_the_calibration_page_asks_viewers_not_to_scale():
    data = render_calibration_pdf(calibration_page(make_sheet("a4")), load_words("en"))
    prefs = pypdf.PdfReader(io.BytesIO(data)).trailer["/Root"]["/ViewerPreferences"]
    assert prefs["/PrintScaling"] == "/None"


def test_every_font_subset_has_a_tag_of_its_own(reader):
    fonts = _fonts(reader)
    tags = []
    for font in fonts.values():
        base = str(font["/BaseFont"])
        match = TAG.fullmatch(base)
        assert match, base
        tags.append(match.group(1))
        descriptor = font["/FontDescriptor"].get_object()
        assert str(descriptor["/FontName"]) == base
        assert "/FontFile2" in descriptor   # embedded
    assert len(fonts) >= 3                   # regular, bold, condensed at least
    assert len(set(tags)) == len(tags), sorted(tags)


def test_two_kits_tag_their_subsets_apart():
    """Different kits draw different characters, so their subsets differ
    and so do their tags: merged into one file (a class set's print files)
    they still follow 9.6.4."""
    a = _fonts(_kit_pdf("latitude: 52.2\nepoch: 2027\ntitle: Hollybrook Primary\n"))
    b = _fonts(_kit_pdf("latitude: -33.9\nepoch: 2027\ntitle: Quillon Bay Science Centre\nlanguage: fr\n"))
    tags_a = {TAG.fullmatch(str(f["/BaseFont"])).group(1) for f in a.values()}
    tags_b = {TAG.fullmatch(str(f["/BaseFont"])).group(1) for f in b.values()}
    assert not tags_a & tags_b


def test_a_class_sets_print_files_ask_for_actual_size_and_keep_tags_apart(tmp_path):
    from kitgen.cli import main
    (tmp_path / "set.yaml").write_text("defaults: {latitude: 53.4, epoch: 2027, title: Hollybrook Primary}\n"
                                       "kits:\n  - {owner: Ava Pennywhistle}\n"
                                       "  - {owner: Escuela Gemela del Sur, latitude: 33.4S, language: es}\n")
    assert main(["batch", str(tmp_path / "set.yaml"), "-o", str(tmp_path / "out"), "--jobs", "1", "--quiet"]) == 0
    for name in ("print-paper.pdf", "print-card.pdf", "print-film.pdf"):
        reader = pypdf.PdfReader(str(tmp_path / "out" / name))
        assert reader.trailer["/Root"]["/ViewerPreferences"]["/PrintScaling"] == "/None"
        subsets = {}
        for font in _fonts(reader).values():
            tag = TAG.fullmatch(str(font["/BaseFont"])).group(1)
            # a subset is known by its face and its glyphs' widths (9.6.2.1 /Widths)
            subsets.setdefault(tag, set()).add((str(font["/BaseFont"]), tuple(float(w) for w in font["/Widths"])))
        assert len(subsets) >= 6                               # two kits' fonts at least
        assert all(len(s) == 1 for s in subsets.values()), [t for t, s in subsets.items() if len(s) > 1]

"""Nothing over a word (#9): no printed character on any page of a kit's PDF
is crossed by a drawn line.

Read from the PDF's own vectors and glyphs by tests/pdf_ink.py, which
follows ISO 32000-1:2008: 8.3-8.5 (graphics state, the CTM, path
construction and painting, dash patterns, clipping), 9.4 (text objects and
the text rendering matrix), 9.2.4 (glyph positioning and widths), 9.6.6.4
(a TrueType font's codes mapped through its embedded cmap), and each
glyph's ink box from the TrueType/OpenType 'glyf' table's glyph header
(xMin, yMin, xMax, yMax).  Nothing comes from kitgen's geometry model.

A character counts as crossed when a stroke's ink (or a filled shape)
reaches more than pdf_ink.TOLERANCE_MM = 0.1 mm into its ink box: print
registration and toner spread on an office printer, common practice with
no published source.  The self-tests below draw a page with reportlab
and check that the reader finds a line through a letter and not one beside
it, so that the check can fail.
"""

from __future__ import annotations

import io
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pypdf
import pytest
from fontTools.ttLib import TTFont
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from reportlab.lib.units import mm
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont as ReportlabTTFont
from reportlab.pdfgen.canvas import Canvas

from kitgen.words import fonts
from tests.ci import examples

from . import pdf_ink
from .printed import PrintedKit

LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")
SHEETS = ("a5", "a4", "a3", "letter", "legal", "tabloid")


# -- the checker can fail -------------------------------------------------------------

FACE = fonts.DEJAVU["body"]
SIZE_PT = 20.0


def _font():
    """The shipped DejaVu Sans under a name of this test's own, and its
    program read by fontTools straight from the shipped file."""
    with fonts.font_path(FACE) as path:
        if "InkTestSans" not in pdfmetrics.getRegisteredFontNames():
            pdfmetrics.registerFont(ReportlabTTFont("InkTestSans", str(path)))
        return TTFont(str(path))


def _box_pt(program, ch, x_pt, y_pt):
    """The 'glyf' header's box of ``ch`` at SIZE_PT, its origin at (x, y) pt."""
    g = program["glyf"][program.getBestCmap()[ord(ch)]]
    u = program["head"].unitsPerEm
    return (x_pt + g.xMin / u * SIZE_PT, y_pt + g.yMin / u * SIZE_PT,
            x_pt + g.xMax / u * SIZE_PT, y_pt + g.yMax / u * SIZE_PT)


def _page(draw) -> pypdf.PdfReader:
    _font()
    buf = io.BytesIO()
    c = Canvas(buf, pagesize=(200 * mm, 200 * mm), invariant=1, initialFontName="InkTestSans")
    c.setFont("InkTestSans", SIZE_PT)
    draw(c)
    c.showPage()
    c.save()
    return pypdf.PdfReader(io.BytesIO(buf.getvalue()))


def _found(draw):
    return pdf_ink.crossings(_page(draw))


def test_reader_finds_each_glyph_box_where_the_font_puts_it():
    """The box read back equals the shipped font's 'glyf' box, scaled and
    placed: the subset's code maps to the right glyph, and the advance from
    /Widths moves the next glyph by the font's advance (hmtx)."""
    program = _font()
    reader = _page(lambda c: c.drawString(100, 100, "Hg H"))
    glyphs = pdf_ink.read_page_ink(reader, reader.pages[0]).glyphs
    assert [g.char for g in glyphs] == ["H", "g", "H"]     # the space has no ink and no box
    advance = {ch: program["hmtx"][program.getBestCmap()[ord(ch)]][0] / program["head"].unitsPerEm * SIZE_PT
               for ch in "Hg "}
    x = 100.0
    for g, ch in zip(glyphs, "HgH"):
        want = _box_pt(program, ch, x, 100.0)
        got = (*g.box.min(axis=0), *g.box.max(axis=0))
        assert got == pytest.approx(want, abs=0.02)    # reportlab writes /Widths to 3 decimals of 1/1000 em
        x += advance[ch] + (advance[" "] if ch == "g" else 0.0)


def test_a_line_through_a_letter_is_found_and_one_beside_it_is_not():
    program = _font()
    x0, y0, x1, y1 = _box_pt(program, "H", 100, 100)
    mid = (y0 + y1) / 2

    def line(c, x, width_mm=0.1, dash=None):
        c.setLineWidth(width_mm * mm)
        if dash:
            c.setDash(dash, 0)
        c.line(x, mid - 30, x, mid + 30)

    def text(c):
        c.drawString(100, 100, "H")

    through = _found(lambda c: (text(c), line(c, (x0 + x1) / 2)))
    assert [(k.char, k.by) for k in through] == [("H", "stroke")]
    assert not _found(lambda c: (text(c), line(c, x1 + 0.5 * mm)))
    # The tolerance: a 0.1 mm line centred 0.02 mm inside the box reaches
    # 0.07 mm in (allowed); centred 0.2 mm inside it reaches 0.25 mm (crossed).
    assert not _found(lambda c: (text(c), line(c, x1 - 0.02 * mm)))
    assert _found(lambda c: (text(c), line(c, x1 - 0.2 * mm)))
    # A dashed line whose gap spans the letter leaves it clear (8.4.3.6).
    h_pt = y1 - y0
    gap = lambda c: (text(c), c.setLineWidth(0.1 * mm), c.setDash([20, h_pt + 10], 0),  # noqa: E731
                     c.line((x0 + x1) / 2, mid - 25 - h_pt / 2, (x0 + x1) / 2, mid + 30))
    assert not _found(gap)
    # A line outside the clip prints nothing (8.5.4).

    def clipped(c):
        text(c)
        c.saveState()
        p = c.beginPath()
        p.rect(0, 0, 100, 400)      # left of the letter only
        c.clipPath(p, stroke=0, fill=0)
        line(c, (x0 + x1) / 2)
        c.restoreState()

    assert not _found(clipped)
    # A filled dot on the letter is found too.
    dot = _found(lambda c: (text(c), c.circle((x0 + x1) / 2, mid, 2, stroke=0, fill=1)))
    assert [(k.char, k.by) for k in dot] == [("H", "fill")]
    # White ink is no ink.
    assert not _found(lambda c: (text(c), c.setStrokeGray(1.0), line(c, (x0 + x1) / 2)))

    # A page drawn mirrored (a film page, 8.3.4: a matrix of negative
    # determinant) keeps its boxes: a line through the mirrored letter is found.
    def mirrored(c, x):
        c.saveState()
        c.transform(-1, 0, 0, 1, 400, 0)
        text(c)
        line(c, x)
        c.restoreState()

    assert [k.char for k in _found(lambda c: mirrored(c, (x0 + x1) / 2))] == ["H"]
    assert not _found(lambda c: mirrored(c, x1 + 0.5 * mm))


def test_a_turned_letter_keeps_a_tight_box():
    """An 'l' turned 45 degrees: a line through the empty corner of its
    axis-aligned box is not a crossing; one through the letter is."""
    program = _font()
    x0, y0, x1, y1 = _box_pt(program, "l", 0, 0)

    def turned(c):
        c.saveState()
        c.translate(100, 100)
        c.rotate(45)
        c.drawString(0, 0, "l")
        c.restoreState()

    reader = _page(turned)
    (g,) = pdf_ink.read_page_ink(reader, reader.pages[0]).glyphs
    r = np.sqrt(0.5)
    corners = [(100 + r * (x - y), 100 + r * (x + y)) for x, y in ((x0, y0), (x1, y0), (x1, y1), (x0, y1))]
    assert sorted(map(tuple, np.round(g.box, 3))) == sorted(tuple(np.round(p, 3)) for p in corners)
    # The axis-aligned box's upper-right corner lies far from the letter,
    # which runs from (100, 100) up to the left: a line across that corner,
    # inside the axis-aligned box, misses the letter.
    lo, hi = g.box.min(axis=0), g.box.max(axis=0)
    assert hi[0] - lo[0] > 5 and hi[1] - lo[1] > 5
    assert not _found(lambda c: (turned(c), c.setLineWidth(0.1 * mm),
                                 c.line(hi[0] - 3, hi[1] - 0.5, hi[0] - 0.5, hi[1] - 3)))
    mid = g.box.mean(axis=0)
    assert _found(lambda c: (turned(c), c.setLineWidth(0.1 * mm),
                             c.line(mid[0] - 5, mid[1] + 5, mid[0] + 5, mid[1] - 5)))


# -- the kits --------------------------------------------------------------------------

def _crossed(recipe: str) -> list:
    kit = PrintedKit(recipe)
    return pdf_ink.crossings(kit.reader)


FIXED = [
    "latitude: 52.2\n",                                    # the default kit (A4, English)
    "latitude: 0.5\n",                                     # the equator
    "latitude: -33.9\nlanguage: es\n",                     # the south
    "latitude: 24.5\nlanguage: ar\nsheet: a5\n",           # Arabic on A5
    "latitude: 28.6\nlanguage: hi\nsheet: a5\n",           # Hindi on A5
    "latitude: 40\ndiameter_mm: 400\n",                    # tiled pieces, doubled line weights
    "latitude: 38\nlanguage: el\nduplex: long_edge\n",    # duplex registration marks
    "latitude: 60\nfilm_parts: [rete]\nfilm_mirror: true\nsheet: letter\ncolour: true\n",   # mirrored film
    "latitude: 33\nlanguage: pt\nsheet: legal\nworksheet: true\naccuracy_page: true\nunequal_hours: true\n"
    "twilight: [civil, nautical, astronomical]\nowner: Rhea Vantongeren\n",
    # a small plate whose owner's name finds room away from the latitude label
    "latitude: 51.5\nlanguage: fr\nsheet: a5\ndiameter_mm: 90\nowner: Anaïs Vermorel-Dubois\n",
    # the smallest mater: the hour ring too narrow for "20" past the ticks' tips (an Arabic
    # kit's figure had met its tick), and a Greek caption's descender low over the pin's mark
    "latitude: 0\nlanguage: ar\nsheet: a5\ndiameter_mm: 80\n",
    "latitude: 20\nlanguage: el\nsheet: a5\ndiameter_mm: 82\n",
    # a tiled mater whose back's seam runs across the owner's line (an invented name)
    "latitude: 15.2\nlanguage: de\nsheet: legal\ndiameter_mm: 283.2\nowner: Zofia Wrenhaven-Castellanos\n",
    # a tiled rete where a level leader (Castor's) had run over the tops of a name chosen after it
    "latitude: 0\nsheet: a5\nlanguage: en\ndiameter_mm: 200\nepoch: 2026\n",
]


@pytest.mark.parametrize("recipe", FIXED)
def test_no_character_is_crossed_on_these_kits(recipe):
    found = _crossed(recipe)
    assert not found, f"{len(found)} crossed:\n" + "\n".join(map(str, found[:30]))


@settings(max_examples=examples(6, 4), deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(latitude=st.floats(-90.0, 90.0), diameter=st.one_of(st.none(), st.floats(80.0, 600.0)),
       sheet=st.sampled_from(SHEETS), language=st.sampled_from(LANGUAGES),
       site=st.sampled_from([None, (2.35, "Europe/Paris"), (-74.0, "America/New_York"),
                             (77.2, "Asia/Kolkata"), (151.2, "Australia/Sydney")]))
def test_no_character_is_crossed_anywhere(latitude, diameter, sheet, language, site):
    # (in fixed notation: YAML 1.1 reads 1e-05 as a word, which no recipe
    # latitude is; a latitude is written with its decimals)
    recipe = f"latitude: {latitude:.9f}\nsheet: {sheet}\nlanguage: {language}\n"
    if diameter is not None:
        recipe += f"diameter_mm: {diameter!r}\n"
    if site is not None:
        recipe += f"longitude: {site[0]}\ntimezone: {site[1]}\n"
    found = _crossed(recipe)
    assert not found, f"{recipe!r}: {len(found)} crossed:\n" + "\n".join(map(str, found[:30]))


def test_no_character_is_crossed_in_a_class_sets_print_files(tmp_path):
    """A class set (#12) through ``kitgen batch``: each kit's file and the
    print files, whose pages carry the set's stamp as a form XObject
    (ISO 32000-1:2008, 8.10), which the reader follows."""
    (tmp_path / "set.yaml").write_text(
        "defaults: {latitude: 40.4, sheet: a5, title: Fernhollow Science Club}\n"
        "kits:\n  - {owner: Mira Quellstone}\n  - {owner: Sami Haddou, language: ar, latitude: -26.2}\n",
        encoding="utf-8")
    env = dict(os.environ, PYTHONPATH=str(Path(__file__).resolve().parents[1]))
    done = subprocess.run([sys.executable, "-m", "kitgen", "batch", str(tmp_path / "set.yaml"), "-o",
                           str(tmp_path / "out"), "--jobs", "1", "--quiet"], capture_output=True, text=True,
                          env=env, timeout=600)
    assert done.returncode == 0, done.stderr
    files = sorted((tmp_path / "out").rglob("*.pdf"))
    assert len(files) >= 3                      # two kits and at least one print file
    for f in files:
        reader = pypdf.PdfReader(f)
        found = pdf_ink.crossings(reader)
        assert not found, f"{f.name}: " + "\n".join(map(str, found[:30]))
        if f.name.startswith("print"):
            # the stamp is read: its owner's name is among the page's glyphs
            texts = {g.text for g in pdf_ink.read_page_ink(reader, reader.pages[0]).glyphs}
            assert any("Mira Quellstone" in t or "Sami Haddou" in t for t in texts), f.name

"""Film pages: printed mirrored on request, exactly; only film parts on
them; the first page says which pages are film and which side takes the
ink.  The PDFs are read back with pypdf by the PDF specification's rules
(ISO 32000-1:2008, 8.3, 8.4 and 9.4; see pdf_paths.py).
"""

from __future__ import annotations


import pytest

pypdf = pytest.importorskip("pypdf")


from kitgen.paper import FOOTER_MM  # noqa: E402

from .pdf_paths import mul  # noqa: E402
from .printed import PrintedKit  # noqa: E402

PT_PER_MM = 72.0 / 25.4
RECIPE = "latitude: -33.9\nepoch: 2027\nsheet: letter\ntitle: Southern Cross Science Centre\nfilm_parts: [rule]\n"


def Printed(extra: str) -> PrintedKit:
    return PrintedKit(RECIPE + extra)


@pytest.fixture(scope="module")
def plain():
    return Printed("film_mirror: false\n")


@pytest.fixture(scope="module")
def mirrored():
    return Printed("film_mirror: true\n")


def test_film_pages_hold_film_parts_only(mirrored):
    """The rete and the recipe's film_parts (the rule) are on film pages,
    every other part on card pages; no page mixes the two."""
    for page in (p for p in mirrored.pages if p.kind != "instructions"):
        materials = {pl.part.material for pl in page.placements}
        assert materials == {page.kind}
        for pl in page.placements:
            assert (pl.part.kind in ("rete", "rule")) == (page.kind == "film")
    assert all(p.mirrored == (p.kind == "film") for p in mirrored.pages)


def _in_footer(page, y_pt: float) -> bool:
    """Below the top of the footer band (kitgen.paper.FOOTER_MM above the
    bottom margin), where no part goes."""
    return y_pt < (page.sheet.margin_mm + FOOTER_MM) * PT_PER_MM


def test_mirrored_film_pages_are_exact_mirror_images(plain, mirrored):
    """Same layout; on each film page every painted point of the parts in
    the mirrored PDF is the plain one's reflected in the page's vertical
    midline, x -> W - x (pt, to 1e-3 pt: reportlab writes 1e-4 pt), with
    the same line widths; each text's rendering matrix (Tm x CTM, 9.4.4) is
    the plain one's followed by the reflection [-1 0 0 1 W 0], so every
    glyph of the parts is drawn mirrored.  The footer (check bar, page
    number, kit line, material note) is read as the page leaves the
    printer, so it is drawn exactly as on the plain page, upright (#9)."""
    assert [(p.kind, p.landscape, len(p.placements)) for p in plain.pages] == \
           [(p.kind, p.landscape, len(p.placements)) for p in mirrored.pages]
    film = [k for k, p in enumerate(plain.pages) if p.kind == "film"]
    assert film
    for k in film:
        w_pt = float(mirrored.reader.pages[k].mediabox.width)
        flip = (-1.0, 0.0, 0.0, 1.0, w_pt, 0.0)
        (paths_p, texts_p), (paths_m, texts_m) = plain.read[k], mirrored.read[k]
        assert len(paths_p) == len(paths_m) and len(texts_p) == len(texts_m)
        page = plain.pages[k]
        footer_paths = 0
        for a, b in zip(paths_p, paths_m):
            assert a.op == b.op and a.line_width == b.line_width
            if all(_in_footer(page, y) for _, y in a.device_points()):
                footer_paths += 1
                want = [v for p in a.device_points() for v in p]
            else:
                want = [v for x, y in a.device_points() for v in (w_pt - x, y)]
            got = [v for p in b.device_points() for v in p]
            assert got == pytest.approx(want, abs=1e-3)
        footer_texts = 0
        for a, b in zip(texts_p, texts_m):
            assert a.matrix[0] * a.matrix[3] - a.matrix[1] * a.matrix[2] > 0
            if _in_footer(page, a.matrix[5]):
                footer_texts += 1
                assert b.matrix == pytest.approx(a.matrix, abs=1e-6)
                assert b.matrix[0] * b.matrix[3] - b.matrix[1] * b.matrix[2] > 0  # upright glyphs
            else:
                assert b.matrix == pytest.approx(mul(a.matrix, flip), abs=1e-6)
                assert b.matrix[0] * b.matrix[3] - b.matrix[1] * b.matrix[2] < 0  # mirrored glyphs
        assert footer_paths >= 3 and footer_texts >= 3   # the check bar and its ticks; number, note, kit line


def test_card_pages_are_untouched_by_mirroring(plain, mirrored):
    """Every card page draws the same paths, at the same points, and the
    same text at the same places (the rendering matrices, 9.4.4) with or
    without mirroring, and pypdf reads the same words from it.  (Its
    bytes may differ: a font subset gives its characters codes in the
    order the document first draws them, and a mirrored film page before
    it draws its words in another order.)"""
    cards = [k for k, page in enumerate(plain.pages) if page.kind == "card"]
    assert cards
    for k in cards:
        (paths_p, texts_p), (paths_m, texts_m) = plain.read[k], mirrored.read[k]
        assert [(a.op, a.line_width, a.device_points()) for a in paths_p] == \
               [(b.op, b.line_width, b.device_points()) for b in paths_m]
        assert [(a.matrix, a.size) for a in texts_p] == [(b.matrix, b.size) for b in texts_m]
        assert plain.text(k) == mirrored.text(k)


def test_first_page_says_which_pages_are_film_and_which_side_up(plain, mirrored):
    w = mirrored.kit.words
    for printed, key in ((plain, "printing.film_plain"), (mirrored, "printing.film_mirrored")):
        text = printed.text(0)
        film = [str(p.number) for p in printed.pages if p.kind == "film"]
        listed = ", ".join(film)
        assert (f"page {listed} on transparency film" in text) or (f"pages {listed} on transparency film" in text)
        assert " ".join(w(key).split()) in text

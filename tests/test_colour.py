"""Grey-scale safe, with an optional colour scheme: the colour kit is the
grey kit with colours added and nothing else, every colour and grey dark
enough to survive a grey-scale print, and the first page says which the
kit was drawn for.

Colour operators are those of ISO 32000-1:2008, 8.6.8 (G, g, RG, rg, K, k,
CS, cs, SC, sc, SCN, scn); darkness is WCAG 2.1's relative luminance and
contrast ratio (its AA level asks 4.5 : 1 for text).
"""

from __future__ import annotations

import re


import pytest

pypdf = pytest.importorskip("pypdf")
from pypdf.generic import ContentStream  # noqa: E402

from .printed import PrintedKit  # noqa: E402

COLOUR_OPS = {"G", "g", "RG", "rg", "K", "k", "CS", "cs", "SC", "sc", "SCN", "scn"}
RECIPE = "latitude: 52.2\nepoch: 2027\nsheet: a4\ntitle: Larkspur Valley School\n"


def wcag_luminance(r, g, b) -> float:
    """WCAG 2.1, "relative luminance": sRGB channels linearised, then
    0.2126 R + 0.7152 G + 0.0722 B."""
    def lin(c):
        return c / 12.92 if c <= 0.03928 else ((c + 0.055) / 1.055) ** 2.4
    return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b)


def contrast_on_white(lum: float) -> float:
    """WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05), white L = 1."""
    return 1.05 / (lum + 0.05)


class Printed(PrintedKit):
    def __init__(self, extra: str):
        super().__init__(RECIPE + extra)
        self.ops = [[(op.decode(), [float(v) if isinstance(v, (int, float)) else v for v in operands])
                     for operands, op in ContentStream(p.get_contents(), self.reader).operations]
                    for p in self.reader.pages]


@pytest.fixture(scope="module")
def grey():
    return Printed("colour: false\n")


@pytest.fixture(scope="module")
def colour():
    return Printed("colour: true\n")


def test_the_grey_kit_uses_greys_only_and_dark_ones(grey):
    for page in grey.ops:
        for op, args in page:
            assert op not in ("RG", "rg", "K", "k", "CS", "cs", "SC", "sc", "SCN", "scn"), op
            if op in ("G", "g"):
                assert contrast_on_white(wcag_luminance(*[args[0]] * 3)) >= 4.5, args


def test_the_colour_kit_has_dark_colours(colour):
    colours = {tuple(args) for page in colour.ops for op, args in page if op in ("RG", "rg")}
    assert len(colours) >= 3
    for rgb in colours:
        assert contrast_on_white(wcag_luminance(*rgb)) >= 4.5, rgb


def test_nothing_depends_on_colour_alone(grey, colour):
    """Take the colour operators out of both kits' pages: what is left (every
    path, width, dash and word, page by page, the first page's sentence
    about grey-scale or colour aside, the instruction pages) is the same, so the colour kit printed
    in grey shows all that the grey kit does."""
    # (the instruction pages aside: the colour kit's longer sentence on
    # colour may set them on one page more)
    parts = [[k for k, page in enumerate(kit.pages) if page.kind != "instructions"] for kit in (grey, colour)]
    assert len(parts[0]) == len(parts[1])
    for k, j in zip(*parts):
        a, b = grey.ops[k], colour.ops[j]
        # A shown string's bytes are codes of the font subset, numbered in the
        # order characters are first used in the document, so they are compared
        # as the words they read (pypdf's text extraction) instead.
        shapes = [[x if x[0] not in ("Tj", "TJ") else (x[0],) for x in ops if x[0] not in COLOUR_OPS]
                  for ops in (a, b)]
        assert shapes[0] == shapes[1], k
        # (each page's footer counts the pages: "5 of 8" where the other has "6 of 9")
        assert re.sub(r"\d+ of \d+", "", grey.text(k)) == re.sub(r"\d+ of \d+", "", colour.text(j)), k


def test_the_first_page_says_grey_scale_or_colour(grey, colour):
    assert "Drawn for grey-scale printing" in grey.text() and "colour printing" not in grey.text()
    assert "Drawn for colour printing" in colour.text() and "grey-scale printing:" not in colour.text()

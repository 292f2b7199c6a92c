"""A heading is never left at the foot of a page (#9): it stands on the
page of its text, with at least the first two lines of that text under
it.  The reference is common practice in typesetting: a heading is kept
with its text (a heading with its text's first two lines, as a
paragraph's first line is not left alone at a page's foot either); a
one-line lead-in such as a table's intro is not enough.

Read back from the layout's own pages, not from the PDF: the blocks each
instructions page holds (kitgen.layout.pages.instructions_split) and the
lines the layout set on it (Page.lines, Page.figures).
"""

from __future__ import annotations

from types import SimpleNamespace

import pytest

from kitgen.kit import build_kit
from kitgen.layout import paragraphs
from kitgen.layout.pages import instructions_split, layout_kit
from kitgen.layout.paragraphs import KINDS, Block, set_page, split_blocks
from kitgen.recipe.load import validate_recipe
from kitgen.words.templates import load_words

#: Lines of its text a heading keeps under it (common practice).
LINES_UNDER_HEADING = 2

CAPE_TOWN = {"latitude": -33.9, "longitude": 18.4, "timezone": "Africa/Johannesburg"}
LISBON = {"latitude": 38.7, "longitude": -9.14, "timezone": "Europe/Lisbon"}
MEAN = {"latitude": 52.2}

KITS = [
    ("es", "a4", CAPE_TOWN, True),      # the review's Spanish kit
    ("fr", "a4", MEAN, False),          # its clock table's heading and lead-in had stood at a page's foot
    ("en", "a5", MEAN, True),
    ("de", "letter", LISBON, False),
    ("ar", "a5", CAPE_TOWN, True),
    ("hi", "a4", MEAN, False),
    ("ru", "a5", LISBON, True),
    ("pt", "legal", CAPE_TOWN, True),
]


def lines_under_last_heading(page, body_pt: float) -> int | None:
    """Lines set on ``page`` below its last heading (a picture counts as
    two), or None for a page without a heading.  Headings are the lines
    set at the heading's size."""
    heading_pt = body_pt * KINDS["heading"][0]
    heads = [ln.baseline_mm for ln in page.lines if abs(ln.size_pt - heading_pt) < 1e-6 and ln.style == "bold"]
    if not heads:
        return None
    below = {round(ln.baseline_mm, 3) for ln in page.lines if ln.baseline_mm < min(heads) - 1e-6}
    return len(below) + LINES_UNDER_HEADING * sum(f.y_mm < min(heads) for f in page.figures)


def _faults(pages, size_pt, chunks) -> list[str]:
    out = []
    text_pages = [p for p in pages if p.kind == "instructions"]
    for number, (page, chunk) in enumerate(zip(text_pages, chunks), start=1):
        if chunk and chunk[-1].kind == "heading":
            out.append(f"page {number} ends with the heading {chunk[-1].text!r}")
        under = lines_under_last_heading(page, size_pt)
        if under is not None and under < LINES_UNDER_HEADING:
            heading = [b.text for b in chunk if b.kind == "heading"][-1]
            out.append(f"page {number}: {under} line(s) under the heading {heading!r}")
    return out


@pytest.mark.parametrize("language, sheet, site, worksheet", KITS)
def test_no_page_ends_with_a_heading(language, sheet, site, worksheet):
    kit = build_kit(validate_recipe({**site, "language": language, "sheet": sheet, "worksheet": worksheet,
                                     "epoch": 2027}))
    pages = layout_kit(kit)
    size_pt, chunks = instructions_split(kit, pages)
    assert len(chunks) > 1, "a kit of one instructions page tests nothing here"
    assert _faults(pages, size_pt, chunks) == []


def _foot_of_page_blocks():
    """Paragraphs that put a heading and a one-line lead-in at the foot of
    the first page, with the lead-in's table after them."""
    filler = "The parts of the astrolabe turn on one axis through their centres. " * 3
    return ([Block("body", filler) for _ in range(5)] + [Block("heading", "The clock correction by week"),
                                                        Block("body", "Minutes to add:")]
            + [Block("item", f"Month {k}: +{k}, +{k + 1}, +{k + 2}", "\u2022") for k in range(1, 13)])


def _split_and_set(blocks, words, height_pt: float):
    box_mm = (0.0, 0.0, 100.0, height_pt / 72.0 * 25.4)
    size_pt, chunks = split_blocks(blocks, 100.0 / 25.4 * 72.0, height_pt, words, 3)
    pages = [SimpleNamespace(kind="instructions", lines=lines, figures=figures)
             for lines, figures in (set_page(ch, box_mm, words, size_pt) for ch in chunks)]
    return pages, size_pt, chunks


def _foot_height_pt(blocks, words) -> float:
    """A page height that holds the filler, the heading and the lead-in
    at the largest body size, and not the first item."""
    size_pt = paragraphs.BODY_SIZES_PT[0]
    width_pt = 100.0 / 25.4 * 72.0
    return (paragraphs.blocks_height_pt(blocks[:7], width_pt, size_pt, words)
            + paragraphs.blocks_height_pt(blocks[:8], width_pt, size_pt, words)) / 2.0


def test_the_lead_in_goes_on_with_its_heading():
    """Built so that the heading and its one-line lead-in end the first
    page: both go on to the next one, with the table."""
    words = load_words("en")
    blocks = _foot_of_page_blocks()
    pages, size_pt, chunks = _split_and_set(blocks, words, _foot_height_pt(blocks, words))
    assert [b.kind for b in chunks[0]] == ["body"] * 5
    assert chunks[1][0].text == "The clock correction by week"
    assert _faults(pages, size_pt, chunks) == []


def test_the_check_finds_a_heading_left_at_the_foot(monkeypatch):
    """Self-test: with the layout told to keep only one line under a
    heading and no lead-in with what it introduces, the same paragraphs leave the heading and its lead-in at the
    first page's foot, and the check says so."""
    monkeypatch.setattr(paragraphs, "HEADING_KEEPS_LINES", 1)
    monkeypatch.setattr(paragraphs, "_leads_in", lambda block: False)   # nor a lead-in kept with its table
    words = load_words("en")
    blocks = _foot_of_page_blocks()
    pages, size_pt, chunks = _split_and_set(blocks, words, _foot_height_pt(blocks, words))
    assert chunks[0][-2].kind == "heading"
    assert _faults(pages, size_pt, chunks) == ["page 1: 1 line(s) under the heading 'The clock correction by week'"]


#: Kits whose instructions run over several pages, in languages and on
#: sheets not all above: on the German A5 kit of a review (#12) the
#: assembly steps' lead-in ("... von hinten nach vorn:") had stood over
#: the picture, its steps on the next page.
LEAD_IN_KITS = [
    ("de", "a5", {"latitude": 47.8, "twilight": ["civil", "nautical", "astronomical"]}),
    ("it", "a5", {"latitude": 45.07}),
    ("el", "letter", LISBON),
    ("es", "a5", CAPE_TOWN),
    ("en", "a5", {"latitude": 12.5}),
]


@pytest.mark.parametrize("language, sheet, site", LEAD_IN_KITS)
def test_a_lead_in_stays_with_what_it_introduces(language, sheet, site):
    # Common practice in typesetting: a paragraph that ends in a colon
    # introduces what follows it and is not parted from it, neither by a
    # page's end nor by a picture.
    kit = build_kit(validate_recipe({**site, "language": language, "sheet": sheet, "epoch": 2027}))
    size_pt, chunks = instructions_split(kit, layout_kit(kit))
    assert len(chunks) > 1
    parted = []
    for number, chunk in enumerate(chunks, start=1):
        for here, after in zip(chunk, chunk[1:] + [None]):
            if here.kind == "body" and here.text.rstrip().endswith(":") and (after is None or after.figure is not None):
                parted.append((number, here.text[:40], "page end" if after is None else "picture"))
    assert not parted
    # the assembly steps' lead-in stands right above the first step
    intro = kit.words("instructions.stack_intro")
    flat = [b for chunk in chunks for b in chunk]
    k = next(i for i, b in enumerate(flat) if b.text == intro)
    assert flat[k + 1].kind == "item"

"""A table of the instructions is never split with one row alone (#12's
class sets print every kit unchecked, so a page break must be right
unaided): where the clock correction's or the sunrise's table by month
breaks across pages, each page holds at least two of its rows.  The
reference is common practice in typesetting, no source: a table's first
row is not left alone at a page's foot, nor its last alone at the top of
the next page, as for a paragraph's lines (no orphan, no widow).

Read back from the layout's own split of the instructions
(kitgen.layout.pages.instructions_split): the blocks each page holds.
Without the rule, 15 of 150 kits (ten languages, three sheets, five
sites) had a lone row; the kits below were among them then (pages
break elsewhere since, so the check's self-test builds its own).
"""

from __future__ import annotations

import itertools

import pytest

from kitgen.kit import build_kit
from kitgen.layout import paragraphs
from kitgen.layout.pages import instructions_split, layout_kit
from kitgen.recipe.load import validate_recipe

from .test_headings_kept import CAPE_TOWN, LISBON

#: Rows of a table kept on each side of a page break (common practice).
ROWS_EACH_SIDE = 2

REYKJAVIK = {"latitude": 64.1, "longitude": -21.9, "timezone": "Atlantic/Reykjavik"}
SINGAPORE = {"latitude": 1.3, "longitude": 103.8, "timezone": "Asia/Singapore"}

KITS = [
    ("en", "a4", LISBON, False),
    ("fr", "a5", CAPE_TOWN, True),
    ("it", "a4", REYKJAVIK, False),
    ("hi", "a5", SINGAPORE, True),
    ("pt", "a4", LISBON, False),
    ("ar", "letter", CAPE_TOWN, True),
]


def split_tables(chunks) -> list[tuple[int, int]]:
    """(rows at the foot of a page, rows at the top of the next) for each
    table that a page break splits."""
    out = []
    for page, following in zip(chunks, chunks[1:]):
        foot = len(list(itertools.takewhile(lambda b: b.row, reversed(page))))
        top = len(list(itertools.takewhile(lambda b: b.row, following)))
        if foot and top:
            out.append((foot, top))
    return out


def _chunks(language, sheet, site, worksheet):
    kit = build_kit(validate_recipe({**site, "language": language, "sheet": sheet, "worksheet": worksheet,
                                     "epoch": 2027}))
    return instructions_split(kit, layout_kit(kit))[1]


@pytest.mark.parametrize("language, sheet, site, worksheet", KITS)
def test_no_table_row_alone_on_a_page(language, sheet, site, worksheet):
    chunks = _chunks(language, sheet, site, worksheet)
    rows = [b for chunk in chunks for b in chunk if b.row]
    assert len(rows) >= 24   # the correction's and the sunrise's months: the tables are there
    assert all(min(split) >= ROWS_EACH_SIDE for split in split_tables(chunks)), split_tables(chunks)


def _foot_of_page_rows():
    """Paragraphs that fill a page but for one row of the table after them."""
    from kitgen.layout.paragraphs import Block
    filler = "The parts of the astrolabe turn on one axis through their centres. " * 3
    return ([Block("body", filler) for _ in range(5)]
            + [Block("item", f"Month {k}: +{k}, +{k + 1}, +{k + 2}", "\u2022", row=True) for k in range(1, 13)])


def _split_with_one_row_room(words):
    blocks = _foot_of_page_rows()
    size_pt, width_pt = paragraphs.BODY_SIZES_PT[0], 100.0 / 25.4 * 72.0
    height_pt = (paragraphs.blocks_height_pt(blocks[:6], width_pt, size_pt, words)
                 + paragraphs.blocks_height_pt(blocks[:7], width_pt, size_pt, words)) / 2.0
    return paragraphs.split_blocks(blocks, width_pt, height_pt, words, 3)[1]


def test_the_check_finds_a_row_alone(monkeypatch):
    """Self-test: paragraphs that leave room for one row at a page's foot,
    split with the layout told to keep one row, leave that row alone, and
    the check says so; with the rule, two rows or none stand there."""
    from kitgen.words.templates import load_words
    words = load_words("en")
    assert all(min(s) >= ROWS_EACH_SIDE for s in split_tables(_split_with_one_row_room(words)))
    monkeypatch.setattr(paragraphs, "TABLE_KEEPS_ROWS", 1)
    assert split_tables(_split_with_one_row_room(words)) == [(1, 11)]

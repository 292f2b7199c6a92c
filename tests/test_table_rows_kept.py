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
sites) had a lone row; the kits below are among them.
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


def test_the_check_finds_a_row_alone(monkeypatch):
    """Self-test: with the layout told to keep one row, a table of one of
    the kits is split with one row alone, and the check says so (which
    kit depends on where its pages break)."""
    monkeypatch.setattr(paragraphs, "TABLE_KEEPS_ROWS", 1)
    found = (split_tables(_chunks(*kit)) for kit in KITS)
    assert any(splits and min(min(s) for s in splits) == 1 for splits in found)

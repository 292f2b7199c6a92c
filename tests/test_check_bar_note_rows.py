"""The check bar's note, where it takes two rows, takes two even rows.

On a narrow sheet in a long-worded language the note under the footer's
check bar goes onto two rows (kitgen.render.pdf).  Wrapped at the whole
width, the French note had left « page ». alone on its second row on A5,
where it reads as a stray scrap.  Reference: the rows as pypdf (an
independent PDF reader) reads them from the kit's first page; the rule
that neither row of a two-line note is much shorter than the other is
common practice in typesetting (no source).
"""

from __future__ import annotations

import io

import pypdf
import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf

#: Languages whose note takes two rows on A5 (alphabetic scripts, whose
#: characters pypdf reads one for one).
LANGUAGES = ("fr", "de", "it", "el", "ru")


def _note_rows(language: str, sheet: str) -> list[str]:
    """The lines pypdf reads between the page number's baseline and the
    kit's line at the foot of the first page: the check bar's note."""
    kit = build_kit(validate_recipe({"latitude": 41.88, "language": language, "sheet": sheet, "epoch": 2027}))
    _, data = build_pdf(kit)
    rows: dict[float, str] = {}

    def visit(text, cm, tm, font, size):
        y = cm[5] + tm[5]
        if text.strip() and y < 60.0:   # the footer band, in points from the foot of the page
            rows[round(y, 1)] = rows.get(round(y, 1), "") + text.strip()
    pypdf.PdfReader(io.BytesIO(data)).pages[0].extract_text(visitor_text=visit)
    heights = sorted(rows)
    return [rows[y] for y in heights[1:-1]]   # not the page number (lowest) nor the kit's line (highest)


@pytest.mark.parametrize("language", LANGUAGES)
def test_a_two_row_note_is_wrapped_evenly(language):
    rows = _note_rows(language, "a5")
    assert len(rows) == 2, rows
    short, long_ = sorted(rows, key=len)
    assert len(short) >= 0.4 * len(long_), rows

"""French punctuation keeps its space (#12: a class set is printed
unchecked): a line never begins with ";", ":", "!", "?" or "»", nor
ends with "«", since the space before those marks and after "«" is a
no-break space (U+00A0, line breaking class GL, Unicode Standard Annex
#14).  The reference is French typography's common practice (the
space before the high marks and inside the guillemets), from memory.

Read back from the layout's own set lines, in kits whose paragraphs had
broken there (A5) and others.
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import validate_recipe

HIGH_MARKS = (";", ":", "!", "?", "»")


@pytest.mark.parametrize("sheet, latitude, worksheet", [("a5", 49.49, True), ("a4", -33.9, True),
                                                        ("letter", 0.5, False)])
def test_no_french_line_begins_with_a_high_mark(sheet, latitude, worksheet):
    kit = build_kit(validate_recipe({"language": "fr", "sheet": sheet, "latitude": latitude, "longitude": 0.11,
                                     "timezone": "Europe/Paris", "worksheet": worksheet, "epoch": 2027}))
    lines = [ln.text.strip() for page in layout_kit(kit) for ln in (page.lines or ()) if ln.text.strip()]
    assert len(lines) > 100
    assert sum(" :" in ln or "\u00a0:" in ln for ln in lines) > 10   # the marks are there to test
    # (a caution's sign "!" stands alone on its own line: not a line of text)
    assert [ln for ln in lines if ln.startswith(HIGH_MARKS) and len(ln) > 1] == []
    assert [ln for ln in lines if ln.endswith("«")] == []

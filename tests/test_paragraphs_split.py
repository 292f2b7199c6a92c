"""A paragraph that does not fit at a page's foot is split over two pages
where at least two of its lines stay at the foot and two go on: no
orphan (a first line alone at the foot) and no widow (a last line alone
at the top), common practice in typesetting.  Its second half goes on
without the bullet.  Before, a paragraph moved whole, and a numbered step
of eight lines left 16 mm empty at the foot of a Greek A5 page.

Read back from the layout's split (kitgen.layout.paragraphs.split_blocks,
kitgen.layout.pages.instructions_split) and the lines it sets
(kitgen.layout.paragraphs.set_page).
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.layout import paragraphs
from kitgen.layout.instructions import story
from kitgen.layout.pages import instructions_split, layout_kit, page_content_mm
from kitgen.layout.paragraphs import Block, blocks_height_pt, set_page, split_blocks, wrap
from kitgen.paper import PT_PER_MM
from kitgen.recipe.load import validate_recipe
from kitgen.words.templates import load_words

WIDTH_PT = 100.0 / 25.4 * 72.0
SIZE_PT = paragraphs.BODY_SIZES_PT[0]
LEAD_PT = SIZE_PT * paragraphs.LEADING
STEP = ("Turn the rete until the star's dot lies on the almucantar of the altitude you measured, "
        "east of the meridian if it is rising and west of it if it is setting. ") * 3


def _blocks():
    return [Block("body", "The parts of the astrolabe turn on one axis through their centres. " * 16),
            Block("item", STEP, "7.")]


def _height_for(lines_at_foot: float, words) -> float:
    """A page that holds the first paragraph and ``lines_at_foot`` lines
    of the step under it."""
    first = blocks_height_pt(_blocks()[:1], WIDTH_PT, SIZE_PT, words)
    before = paragraphs.KINDS["item"][2] * SIZE_PT
    after = paragraphs.KINDS["item"][3] * SIZE_PT
    return first + before + lines_at_foot * LEAD_PT + after + 0.01


def test_a_step_is_split_with_its_bullet_on_the_first_half():
    words = load_words("en")
    step_lines = wrap(STEP, WIDTH_PT - paragraphs.KINDS["item"][4] * SIZE_PT, SIZE_PT, words, "body")
    assert len(step_lines) >= 6
    _, chunks = split_blocks(_blocks(), WIDTH_PT, _height_for(3, words), words, 3)
    first, rest = chunks[0][-1], chunks[1][0]
    assert (first.bullet, rest.bullet, rest.continued) == ("7.", "", True)
    box = (0.0, 0.0, 100.0, 200.0)
    set_first = [ln.text for ln in set_page([first], box, words, SIZE_PT)[0] if ln.text != "7."]
    set_rest = [ln.text for ln in set_page([rest], box, words, SIZE_PT)[0]]
    assert (len(set_first), set_first + set_rest) == (3, step_lines)


@pytest.mark.parametrize("lines_at_foot", [1.5, 0.5])
def test_no_first_line_alone_at_the_foot(lines_at_foot):
    """Room for one line only: the step goes on whole."""
    words = load_words("en")
    _, chunks = split_blocks(_blocks(), WIDTH_PT, _height_for(lines_at_foot, words), words, 3)
    assert [len(ch) for ch in chunks] == [1, 1] and chunks[1][0] == _blocks()[1]


def test_no_last_line_alone_at_the_top():
    """Room for all the step's lines but one: two go on, so that its last
    line does not stand alone at the next page's top."""
    words = load_words("en")
    n = len(wrap(STEP, WIDTH_PT - paragraphs.KINDS["item"][4] * SIZE_PT, SIZE_PT, words, "body"))
    _, chunks = split_blocks(_blocks(), WIDTH_PT, _height_for(n - 1, words), words, 3)
    rest = chunks[1][0]
    assert rest.continued
    assert len(wrap(rest.text, WIDTH_PT - paragraphs.KINDS["item"][4] * SIZE_PT, SIZE_PT, words, "body")) == 2


#: Kits that split paragraphs (measured again 5 December 2026, 22:40 UTC), and an Arabic
#: one that splits none.
@pytest.mark.parametrize("recipe", [{"latitude": 51.5, "language": "de", "sheet": "a4"},
                                    {"latitude": 51.5, "language": "es", "sheet": "a5"},
                                    {"latitude": 51.5, "language": "it", "sheet": "a5"},
                                    {"latitude": 51.5, "language": "ru", "sheet": "a4"},
                                    {"latitude": 24.7, "language": "ar", "sheet": "a5"}])
def test_real_kits_split_paragraphs_only_between_pages_with_two_lines_each_side(recipe):
    kit = build_kit(validate_recipe({**recipe, "epoch": 2027}))
    pages = layout_kit(kit)
    size_pt, chunks = instructions_split(kit, pages)
    x0, _, x1, _ = page_content_mm(next(p for p in pages if p.kind == "instructions"))
    width_pt = (x1 - x0) * PT_PER_MM
    whole = {b.text: b for b in story(kit, pages)}
    splits = 0
    for page, chunk in enumerate(chunks):
        for at, block in enumerate(chunk):
            if not block.continued:
                continue
            splits += 1
            assert at == 0, f"page {page + 1}: a paragraph's second half not at the page's top"
            first = chunks[page - 1][-1]
            limit = width_pt - paragraphs.KINDS[block.kind][4] * size_pt
            style = paragraphs.KINDS[block.kind][1]
            head = wrap(first.text, limit, size_pt, kit.words, style)
            tail = wrap(block.text, limit, size_pt, kit.words, style)
            assert len(head) >= 2 and len(tail) >= 2
            source = next(b for text, b in whole.items()
                          if " ".join(paragraphs.line_words(text)).startswith(" ".join(head)))
            assert head + tail == wrap(source.text, limit, size_pt, kit.words, style)
    assert splits >= 1 or recipe["language"] == "ar"   # each of the others splits a paragraph somewhere


# -- a list's items: two at least on each side of a page break (common
# practice, as for a table's rows; #12 review: "1. the alidade" alone at a
# page's foot, "5. the rule" alone at the next page's top) ---------------

def _list_blocks(n_items: int):
    return ([Block("body", "The parts of the astrolabe turn on one axis through their centres. " * 16)]
            + [Block("item", f"the part number {k}, in its place;", f"{k}.") for k in range(1, n_items + 1)])


@pytest.mark.parametrize("items_at_foot", [1, 4])
def test_no_item_of_a_list_alone_on_either_side(items_at_foot):
    """A page with room for one item after the paragraph: the list goes on
    whole; with room for all but one of five: three stay, two go on."""
    words = load_words("en")
    blocks = _list_blocks(5)
    first = blocks_height_pt(blocks[:1], WIDTH_PT, SIZE_PT, words)
    one = blocks_height_pt(blocks[:2], WIDTH_PT, SIZE_PT, words) - first
    _, chunks = split_blocks(blocks, WIDTH_PT, first + one * (items_at_foot + 0.5), words, 3)
    on_first = sum(b.kind == "item" for b in chunks[0])
    assert on_first == (0 if items_at_foot == 1 else 3)
    assert sum(b.kind == "item" for b in chunks[1]) == 5 - on_first


@pytest.mark.parametrize("recipe", [{"latitude": 51.5, "language": lang, "sheet": sheet}
                                    for lang, sheet in (("es", "a5"), ("fr", "a5"), ("de", "a5"), ("it", "a5"),
                                                        ("ru", "a5"), ("el", "letter"), ("en", "a4"))])
def test_real_kits_leave_no_item_of_a_list_alone_at_a_break(recipe):
    kit = build_kit(validate_recipe({**recipe, "epoch": 2027}))
    _, chunks = instructions_split(kit, layout_kit(kit))
    for page, (this, following) in enumerate(zip(chunks, chunks[1:]), start=1):
        last, first = this[-1], following[0]
        if last.kind == first.kind == "item" and not first.continued and bool(last.bullet[:1].isdigit()) == \
                bool(first.bullet[:1].isdigit()):
            foot = next((n for n, b in enumerate(reversed(this)) if b.kind != "item"), len(this))
            top = next((n for n, b in enumerate(following) if b.kind != "item"), len(following))
            assert foot >= 2 and top >= 2, f"page {page}: {foot} item(s) at its foot, {top} at the next top"

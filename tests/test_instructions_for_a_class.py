"""Instructions a class can follow (#9): never below 9 pt (more pages
instead), no step that contradicts the kit's options, hour numerals that
cannot be turned into each other, film footers printed the right way
round, a glossary in every language.

The PDF is read back with pypdf by PDF 32000-1:2008 (9.4.4: a glyph's
size on the page is the Tf size scaled by the text rendering matrix
Tm x CTM; see pdf_paths.py).  9 pt as the smallest size for continuous
reading on a handout is common practice in print (from experience, not
from a standard).
"""

from __future__ import annotations

import math

import pytest

from kitgen.kit import build_kit
from kitgen.layout.instructions import story
from kitgen.layout.pages import layout_kit
from kitgen.paper import FOOTER_MM
from kitgen.recipe.load import parse_recipe_text
from kitgen.words.templates import available_languages, load_words

from .printed import PrintedKit

PT_PER_MM = 72.0 / 25.4
MIN_PT = 9.0


@pytest.mark.parametrize("recipe", [
    "latitude: 52.2\nepoch: 2027\n",
    "latitude: 28.6\nepoch: 2027\nsheet: a5\nlanguage: hi\n",
    "latitude: 37.9\nepoch: 2027\nsheet: a5\nlanguage: el\nduplex: long_edge\nfilm_mirror: true\n"
    "print_scale: 0.97\ndiameter_mm: 110\n",
    "latitude: 24.5\nepoch: 2027\nsheet: letter\nlanguage: ar\n",
])
def test_no_instruction_text_below_9_pt(recipe):
    printed = PrintedKit(recipe)
    sizes = []
    for page, (paths, texts) in zip(printed.pages, printed.read):
        if page.kind != "instructions":
            continue
        sx, sy = page.print_scale
        band_pt = (page.sheet.margin_mm + FOOTER_MM) * PT_PER_MM / sy
        for t in texts:
            if t.matrix[5] < band_pt:          # the footer: check bar note, page number, kit line
                continue
            a, b, c, d = t.matrix[:4]
            scale = math.sqrt(abs(a * d - b * c))   # Tm x CTM's scale: the glyph's size per Tf unit
            sizes.append(t.size * scale * sx)          # as printed at the recipe's print_scale
    assert sizes and min(sizes) >= MIN_PT - 1e-6, min(sizes)


def _text_blocks(recipe: str):
    printed = PrintedKit(recipe)
    return printed, [b.text for b in story(printed.kit, printed.pages)]


def test_duplex_has_no_gluing_step():
    w = load_words("en")
    glue = w.items("instructions.stack")[1]
    printed, texts = _text_blocks("latitude: 52.2\nepoch: 2027\nduplex: long_edge\n")
    assert glue not in texts and w("instructions.stack_mater_duplex") in texts
    # "glue" only where the page says there is nothing to glue
    front = next(p.number for p in printed.pages if p.duplex == "front")
    nothing = {w("instructions.stack_mater_duplex"),
               w("printing.duplex_long", front=w.number(front), back=w.number(front + 1))}
    assert {t for t in texts if "glue" in t.lower()} <= nothing, [t for t in texts if "glue" in t.lower()]
    _, texts = _text_blocks("latitude: 52.2\nepoch: 2027\n")
    assert glue in texts   # separate pages: glued back to back


def test_the_stack_lists_only_the_parts_printed():
    w = load_words("en")
    stack = w.items("instructions.stack")
    _, texts = _text_blocks("latitude: 52.2\nepoch: 2027\nparts: [plate, rete, rule]\n")
    assert [s for s in stack if s in texts] == [stack[2], stack[3], stack[4]]
    _, texts = _text_blocks("latitude: 52.2\nepoch: 2027\nparts: [mater_front, plate]\n")
    assert w("instructions.stack_mater_plain") in texts and stack[1] not in texts


@pytest.mark.parametrize("language", sorted(available_languages()))
def test_a_glossary_in_every_language(language):
    kit = build_kit(parse_recipe_text(f"latitude: 40\nepoch: 2027\nlanguage: {language}\n"))
    texts = [b.text for b in story(kit, layout_kit(kit))]
    w = kit.words
    assert w("instructions.glossary_heading") in texts
    items = w.items("instructions.glossary")
    assert len(items) == len(load_words("en").items("instructions.glossary")) and all(i in texts for i in items)


def test_the_english_glossary_names_the_terms_of_the_trade():
    text = " ".join(load_words("en").items("instructions.glossary")).lower()
    for term in ("almucantar", "azimuth", "ecliptic longitude", "unequal hours", "twilight", "zenith"):
        assert term in text, term
    # and the parts a pupil is told to stack and turn, each defined by its
    # own entry (#9)
    starts = [item.split(":")[0].lower() for item in load_words("en").items("instructions.glossary")]
    for part in ("mater", "plate", "rete", "rule", "alidade"):
        assert part in starts, part


def test_hour_numerals_are_upright():
    """Every hour numeral on the mater's front is drawn at angle 0: turning
    the instrument cannot make a 6 of a 9, and all read as printed."""
    for latitude in (52.2, -33.9):
        kit = build_kit(parse_recipe_text(f"latitude: {latitude}\nepoch: 2027\n"))
        labels = kit.part("mater_front").with_role("hour_label")
        assert len(labels) == 24
        assert all(e.geom["angle_deg"] == 0.0 for e in labels)
        inner = kit.dims.limb_inner_radius_mm
        outer = kit.dims.hour_ring_outer_mm
        for e in labels:   # inside the hour ring
            assert inner < math.hypot(*e.geom["at"]) < outer


def test_a_tiled_kit_says_which_marks_to_pierce():
    """With parts in pieces, the instructions say that the diamonds on the
    seams are never pierced, and only the circled crosses are (#9)."""
    printed, texts = _text_blocks("latitude: 52.2\nepoch: 2027\ndiameter_mm: 400\n")
    w = printed.kit.words
    assert any(pl.piece is not None for p in printed.pages for pl in p.placements)
    assert w("printing.tiles_pierce") in texts
    _, texts = _text_blocks("latitude: 52.2\nepoch: 2027\n")
    assert w("printing.tiles_pierce") not in texts


def test_the_cutting_step_tells_the_zenith_from_a_hole():
    """The plate's zenith mark, an open ×, sits inside the innermost
    almucantar and looks like a circle with a cross to a pupil told to
    pierce "every cross-marked circle" (a teacher's look): the step says
    the × is the zenith and no hole, in the kit's language, and the plate
    draws it as a point of its own at the zenith's place, no hole."""
    for language in ("en", "fr", "ar"):
        kit = build_kit(parse_recipe_text(f"latitude: 52.2\nepoch: 2027\nlanguage: {language}\n"))
        texts = [b.text for b in story(kit, layout_kit(kit))]
        (cut,) = [t for t in texts if t.startswith(kit.words("instructions.cut")[:30])]
        assert "×" in cut
        plate = kit.part("plate")
        assert len(plate.with_role("zenith")) == 1 and not any(
            e.values.get("hole") for e in plate.with_role("zenith"))
    assert load_words("en")("instructions.cut_zenith") == "The small × on the plate marks the zenith: it is not a hole."
    # A kit printed without a plate has no zenith mark, and its cutting step says nothing of one.
    kit = build_kit(parse_recipe_text("latitude: 52.2\nepoch: 2027\nparts: [rete, rule]\n"))
    texts = [b.text for b in story(kit, layout_kit(kit))]
    (cut,) = [t for t in texts if t.startswith(kit.words("instructions.cut")[:30])]
    assert "×" not in cut and kit.words("instructions.cut_zenith") not in " ".join(texts)


#: The word for a zodiac sign in each language's step (the templates' own).
SIGN_WORD = {"en": "zodiac sign", "de": "Tierkreiszeichen", "es": "signo del zodiaco", "fr": "signe du zodiaque",
             "it": "segno dello zodiaco", "pt": "signo do zodíaco", "ru": "знак зодиака", "el": "ζώδιο",
             "ar": "برج", "hi": "राशि"}


@pytest.mark.parametrize("language", sorted(SIGN_WORD))
def test_the_suns_longitude_is_read_as_the_back_writes_it(language):
    """The step that reads the Sun's ecliptic longitude by the date says
    that the back gives it as a sign and degrees within that sign, as its
    ring is numbered (0 to 29 in each sign, the common practice of
    astrolabes' zodiac scales): the glossary defines the longitude from
    the start of Aries, 0 to 360, and a pupil looked for such a number
    (a teacher's look)."""
    assert set(SIGN_WORD) == set(available_languages())
    kit = build_kit(parse_recipe_text(f"latitude: 45\nlanguage: {language}\n"))
    numbers = [e.geom["text"] for p in kit.parts_of("mater_back") for e in p.elements if e.role == "zodiac_number"]
    digits = [int("".join(ch for ch in t if ch.isdigit()) or -1) for t in numbers if any(c.isdigit() for c in t)]
    assert digits and max(digits) < 30
    step = kit.words.items("instructions.time_steps")[2]
    assert SIGN_WORD[language] in step, step


@pytest.mark.parametrize("language", sorted(SIGN_WORD))
def test_the_backs_year_line_names_the_rete_it_dates(language):
    """The back's year line dates the calendar on it and the rete's star
    places, and says so by the rete's own name: it read "Calendar and
    stars for 2026" on a face that draws no star (a teacher's look)."""
    kit = build_kit(parse_recipe_text(f"latitude: 45\nlanguage: {language}\n"))
    back = [e for p in kit.parts_of("mater_back") for e in p.elements]
    assert not any(e.role.startswith("star") for e in back)
    line = " ".join(e.geom["text"] for e in back if e.role == "epoch")
    rete_name = kit.words("rete.title").split(" (")[0]
    assert rete_name.casefold() in line.casefold(), (line, rete_name)
    assert kit.words.number(kit.plan.epoch) in line

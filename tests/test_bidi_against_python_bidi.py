"""Text direction against an outside implementation of the Unicode
Bidirectional Algorithm (UAX #9): python-bidi, which wraps the Rust crate
unicode-bidi (isolates included).

A title written in the other direction than the kit's language is put
into the kit's lines as an isolate (FSI ... PDI, UAX #9 section 2.4), so
it never reorders the words around it (#11): in an English kit the line
reads "TITLE · 52.2° N · 2027" left to right whatever the title's script,
and in an Arabic kit the Latin title stands whole at the line's start, on
the right.
"""

from __future__ import annotations

import pytest
from bidi import get_display
from hypothesis import given, settings
from hypothesis import strategies as st

from kitgen.words.shaping import FSI, LRI, PDI, RLI, set_line
from kitgen.words.templates import load_words

ISOLATE_CONTROLS = {FSI, LRI, RLI, PDI}


def visual(text: str, words) -> tuple[str, bool]:
    """The line as kitgen sets it: its runs left to right, each run's
    characters in the order they stand on the page; and its direction."""
    line = set_line(text, words.script, "label", words.rtl)
    return "".join(r.text[::-1] if r.rtl else r.text for r in line.runs), line.rtl


def reference(text: str, rtl: bool) -> str:
    """python-bidi's display order of ``text`` in a paragraph of the given
    direction, the isolate controls (which draw nothing) left out."""
    shown = get_display(text, base_dir="R" if rtl else "L")
    return "".join(c for c in shown if c not in ISOLATE_CONTROLS)


ARABIC_TITLES = ["مدرسة الوادي", "نادي الفلك 12", "مدرسة ٣", "מועדון האסטרונומיה", "مدرسة Larkspur 7"]
LATIN_TITLES = ["Larkspur Valley School", "Club 7", "Hilltop 2027 Science"]


@pytest.mark.parametrize("title", ARABIC_TITLES)
def test_a_right_to_left_title_in_an_english_line(title):
    words = load_words("en")
    line = words("page.kit_line", title=title, latitude="52.2° N", year="2027")
    got, rtl = visual(line, words)
    assert not rtl  # the English words decide the line's direction
    assert got == reference(line, rtl)
    # the words around the title stay where the English puts them
    title_alone = "".join(c for c in get_display(title) if c not in ISOLATE_CONTROLS)
    assert got == words.template("page.kit_line").format(title=title_alone, latitude="52.2° N", year="2027")


@pytest.mark.parametrize("title", LATIN_TITLES)
def test_a_left_to_right_title_in_an_arabic_line(title):
    words = load_words("ar")
    line = words("page.kit_line", title=title, latitude="٥٢٫٢", year="٢٠٢٧")
    got, rtl = visual(line, words)
    assert rtl
    assert got == reference(line, rtl)
    assert title in got  # whole, in its own order


def test_without_isolation_the_line_is_reordered():
    """The fault of #11, shown with the reference itself: the same title
    put in without isolates makes the whole line right to left."""
    title = "مدرسة الوادي"
    raw = load_words("en").template("page.kit_line").format(title=title, latitude="52.2° N", year="2027")
    assert get_display(raw) != reference(raw, False)
    assert not get_display(raw).endswith("2027")


@settings(max_examples=40, deadline=None)
@given(title=st.text(alphabet="مدرسةالوايكنب abcxyz 0123٣٤ש", min_size=1, max_size=24),
       language=st.sampled_from(["en", "ar", "fr", "de"]))
def test_any_title_agrees_with_the_reference(title, language):
    words = load_words(language)
    line = words("page.kit_line", title=title, latitude="52", year="2027")
    got, rtl = visual(line, words)
    assert got == reference(line, rtl)


# -- numbers in right-to-left lines (#9) ----------------------------------------
# A number reads left to right inside Arabic text, with its sign, its
# decimal sign, a time's colon and a degree sign after it: "-18°", "+9",
# "10:06" (common practice of Arabic typesetting with European digits; UAX
# #9 alone makes a sign or a degree sign beside a number a neutral that
# takes the text's direction, "°18-").  kitgen isolates each number of an
# Arabic line (kitgen.words.shaping.isolate_numbers); python-bidi, given
# the same string, must show it the same way.

import re  # noqa: E402

from kitgen.parts.clock_scale import signed  # noqa: E402
from kitgen.words.locale import true_minus  # noqa: E402

NUMBER = re.compile(r"(?<![\w])[+\-−]?[0-9٠-٩]+(?:[.,:٫٬][0-9٠-٩]+)*°?")


def _numbers_read_left_to_right(line: str, shown: str) -> None:
    """Every number of ``line`` (logical order, isolate controls left
    out) stands in ``shown`` (visual order) exactly as it is written."""
    plain = "".join(c for c in line if c not in ISOLATE_CONTROLS)
    for number in NUMBER.findall(plain):
        assert number in shown, (number, shown)


@pytest.mark.parametrize("native", [False, True])
@pytest.mark.parametrize("k, n", [(1, 8), (3, 12), (10, 11)])
def test_the_arabic_page_number_reads_k_of_n(k, n, native):
    """"k من n": read right to left, the page's own number first."""
    words = load_words("ar", native_digits=native)
    line = words("page.number", k=words.number(k), n=words.number(n))
    got, rtl = visual(line, words)
    assert rtl and got == reference(line, rtl)
    first, total = words.number(k), words.number(n)
    assert got.endswith(first) and got.startswith(total)      # k at the right, where reading starts
    _numbers_read_left_to_right(line, got)


@pytest.mark.parametrize("native", [False, True])
def test_arabic_signed_numbers_degrees_and_times_read_left_to_right(native):
    words = load_words("ar", native_digits=native)
    lines = [words("plate.line_twilight", altitude=true_minus(words.number(-18))),
             words("plate.latitude", value=words.number(24.5, 1), hemisphere=words("cardinal.north_short")),
             words("almanac.correction_entry", day=words.number(3), minutes=signed(words, -3)),
             words("almanac.correction_entry", day=words.number(17), minutes=signed(words, 9)),
             words("almanac.rise_set_entry", day=words.number(1), rise="6:41", set="17:49",
                   length=words("almanac.length", hours=words.number(11), minutes=words.number(8)))]
    for line in lines:
        got, rtl = visual(line, words)
        assert rtl and got == reference(line, rtl)
        _numbers_read_left_to_right(line, got)
    twilight, _ = visual(lines[0], words)
    assert "\u2212" + words.number(18) + "°" in twilight


def test_without_isolation_the_sign_trails_the_number():
    """The fault of #9, shown with the reference itself: the twilight
    line's name composed without isolating the number shows "°18-"."""
    raw = load_words("ar").template("plate.line_twilight").format(altitude="-18")
    assert "°18-" in reference(raw, True)


def test_every_line_of_an_arabic_kit_agrees_with_the_reference():
    """The whole of an Arabic kit's instructions (worked examples, tables,
    worksheet) and every word on its parts: as python-bidi shows each
    line, and every number in it read left to right."""
    from kitgen.kit import build_kit
    from kitgen.layout.instructions import story
    from kitgen.layout.pages import layout_kit
    from kitgen.recipe.load import parse_recipe_text

    kit = build_kit(parse_recipe_text("latitude: 24.5\nlongitude: 54.4\ntimezone: Asia/Dubai\nlanguage: ar\n"
                                      "worksheet: true\n"))
    words = kit.words
    texts = [b.text for b in story(kit, layout_kit(kit))]
    texts += [e.geom["text"] for p in kit.parts for e in p.elements if e.shape == "text"]
    assert any(c in t for t in texts for c in "+−-")     # signed numbers are among them
    for line in texts:
        got, rtl = visual(line, words)
        assert got == reference(line, rtl), line
        _numbers_read_left_to_right(line, got)


#: Right-to-left letters (Arabic, Hebrew), an Arabic mark, spaces, signs
#: and punctuation, and an isolated number's stand-in: no left-to-right
#: letter and no number, the lines the levels' short cut sets (#12).
RTL_PLAIN = "ابت شمس ליל \u064e ()[]-+%°:.,!\ufffc"


@settings(max_examples=300, deadline=None)
@given(st.text(alphabet=RTL_PLAIN, max_size=24))
def test_a_line_without_left_to_right_letters_reads_right_to_left_as_the_reference(text):
    """Every character at level 1: the line shown wholly reversed, as
    python-bidi shows it in a right-to-left paragraph."""
    from kitgen.words.shaping import embedding_levels

    assert embedding_levels(text, True) == [1] * len(text)
    assert reference(text, True) == text[::-1]

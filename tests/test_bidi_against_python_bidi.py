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

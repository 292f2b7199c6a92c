"""The fast setting of plain lines (#12) gives what the whole method gives.

A plain line (one font, left to right, no shaping: the Latin, Greek and
Cyrillic languages) is set straight from its characters' advances, and a
plain paragraph is wrapped from advances read once.  Checked here, for
strings of every shipped language:

- the :class:`Line` equals the one :func:`set_line_exact` makes by the
  UAX #9 algorithm, the choice of fonts and the glyph bounds, field for
  field, floats bit for bit;
- its width equals the sum of HarfBuzz's advances for the same string in
  the same font file (uharfbuzz, the reference shaper) with kerning and
  ligatures off, as reportlab draws plain strings;
- a paragraph wraps into the same lines as setting every trial line, and
  the width of a shaped line measured alone (:func:`line_width_em`) is
  the width of the line set whole;
- a shaped paragraph, whose lines are found with a few trial lines each
  (``paragraphs._longest_fit``), wraps into the lines of the typewriter's
  first fit, word by word (written out here as the reference).
"""

from __future__ import annotations

import re

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from kitgen.layout import paragraphs
from kitgen.template_files import available_languages
from kitgen.words import fonts
from kitgen.words.shaping import line_width_em, plain_advances, set_line, set_line_exact
from kitgen.words.templates import load_words

hb = pytest.importorskip("uharfbuzz")


def _sample(words, n: int = 60) -> list[str]:
    """Every ``step``-th template string, star names too, and a number."""
    texts = sorted({t for _, t in words.strings() if t})
    step = max(1, len(texts) // n)
    titles = [words.isolated("Benchmark Valley School"), words.isolated("\u0645\u062f\u0631\u0633\u0629 1")]
    return texts[::step] + [words.number(-52.25, 1), "Latitude 52.2° N", "a\u00a0b  c"] + [
        f"{texts[0]} {t}." for t in titles]


def _harfbuzz_width_em(text: str, face) -> float:
    """Sum of HarfBuzz's advances (em) for ``text`` in ``face``'s file,
    left to right, without kerning or ligatures."""
    font = hb.Font(hb.Face(hb.Blob(fonts.font_bytes(face))))
    buf = hb.Buffer()
    buf.add_str(text)
    buf.guess_segment_properties()
    buf.direction = "ltr"
    hb.shape(font, buf, {"kern": False, "liga": False})
    return sum(p.x_advance for p in buf.glyph_positions) / fonts.units_per_em(face)


@pytest.mark.parametrize("code", available_languages())
def test_plain_line_is_the_exact_line(code):
    words = load_words(code)
    plain = 0
    for text in _sample(words):
        for style in fonts.STYLES:
            fast = set_line.__wrapped__(text, words.script, style, words.rtl)
            exact = set_line_exact.__wrapped__(text, words.script, style, words.rtl)
            assert fast == exact, (code, style, text)
            assert line_width_em(text, words.script, style, words.rtl) == exact.width_em
            advances = plain_advances(text, words.script, style)
            if advances is None:
                continue
            plain += 1
            assert fast.width_em == sum(advances)
            face = fonts.stack(words.script, style)[0]
            # uharfbuzz: the reference shaper, on the same font file
            assert fast.width_em == pytest.approx(_harfbuzz_width_em(text, face), rel=1e-9, abs=1e-12)
    # Latin, Greek and Cyrillic lines are plain; Arabic and Devanagari never
    if words.script in ("Arab", "Deva"):
        assert plain == 0
    else:
        assert plain > 50


@pytest.mark.parametrize("code", available_languages())
def test_plain_wrap_is_the_exact_wrap(code, monkeypatch):
    words = load_words(code)
    texts = [t for t in _sample(words, 30) if len(t.split()) > 3]
    fast = [paragraphs.wrap(t, limit, size, words, "body") for t in texts
            for limit, size in ((120.0, 9.0), (300.0, 10.5))]
    monkeypatch.setattr(paragraphs, "plain_advances", lambda *a: None)
    slow = [list(paragraphs._wrap.__wrapped__(t, limit, size, words.script, words.rtl, "body")) for t in texts
            for limit, size in ((120.0, 9.0), (300.0, 10.5))]
    assert fast == slow
    assert any(len(lines) > 1 for lines in fast)


def test_not_plain():
    """Right-to-left letters, Arabic numbers, isolates, characters no font
    holds and the two-font stacks keep the whole method."""
    assert plain_advances("abc \u05d0", "Latn", "label") is None
    assert plain_advances("\u0661\u0662", "Latn", "label") is None
    assert plain_advances("a \u2068b\u2069", "Latn", "label") is None
    assert plain_advances("a \ufffc", "Latn", "label") is None
    assert plain_advances("\u4e2d", "Latn", "label") is None
    assert plain_advances("Vega", "Arab", "label") is None
    assert len(plain_advances("Vega 1.5°", "Grek", "bold")) == 9


def _first_fit(text, limit_pt, size_pt, words, style):
    """The reference: the first fit, one word at a time, each trial line
    set whole; a line breaks only at an ordinary space, never at a
    NO-BREAK SPACE (Unicode Standard Annex #14: U+00A0 is of class GL,
    rule LB12)."""
    lines, current = [], ""
    for word in re.split(r"[ \t\n\r\f\v]+", text.strip(" \t\n\r\f\v")):
        trial = f"{current} {word}" if current else word
        if current and line_width_em(trial, words.script, style, words.rtl) * size_pt > limit_pt:
            lines.append(current)
            current = word
        else:
            current = trial
    return lines + [current] if current else lines


@pytest.mark.parametrize("code", available_languages())
def test_shaped_wrap_is_the_first_fit(code, monkeypatch):
    words = load_words(code)
    texts = [t for t in _sample(words, 40) if len(t.split()) > 3]
    monkeypatch.setattr(paragraphs, "plain_advances", lambda *a: None)   # every language by trial lines
    cases = [(t, limit, size, style) for t in texts for limit, size in ((90.0, 9.0), (250.0, 10.5), (400.0, 5.5))
             for style in ("body", "bold")]
    for text, limit, size, style in cases:
        got = list(paragraphs._wrap.__wrapped__(text, limit, size, words.script, words.rtl, style))
        assert got == _first_fit(text, limit, size, words, style), (text, limit, size, style)


@settings(max_examples=300, deadline=None)
@given(st.integers(1, 60), st.integers(0, 70), st.integers(-5, 70))
def test_longest_fit_finds_the_last_fitting_end(most, threshold, guess):
    # any width that grows with each word: the ends up to a threshold fit
    asked = []

    def fits(end):
        asked.append(end)
        return end <= threshold

    least = 1
    got = paragraphs._longest_fit(fits, least, most, guess)
    assert got == max(least, min(threshold, most))
    assert all(least <= end <= most for end in asked)

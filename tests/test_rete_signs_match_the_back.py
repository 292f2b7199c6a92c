"""Every division of the rete's ecliptic can be matched to the back (#9).

A pupil carries a date from the back's calendar to the zodiac ring beside
it, then to the rete's ecliptic.  Where a sign's name has no room on the
rete it is written as the sign's symbol; so the back prints each sign's
symbol before its name, and the instructions' glossary lists every symbol
with its name.  Every 10 and 20 of a sign that the back numbers is numbered
on the rete too, or the build's notes say it is left out.

References: the symbols are the Unicode Standard's (16.0, block
Miscellaneous Symbols, U+2648 ARIES to U+2653 PISCES, checked by name with
Python's unicodedata); the signs' order from Aries at the March equinox,
30 degrees each, is the ecliptic's common division (common practice,
the IAU's ecliptic longitude from the equinox).  Kits: the review's
equatorial French Letter kit (two names shortened to symbols at 185 mm),
southern Spanish, Arabic at 24.5 N, Hindi at 80 mm and German on A5.
"""

from __future__ import annotations

import unicodedata

import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text

#: The signs by their Unicode names, Aries first (Unicode Standard 16.0).
UNICODE_NAMES = ("ARIES", "TAURUS", "GEMINI", "CANCER", "LEO", "VIRGO", "LIBRA", "SCORPIUS", "SAGITTARIUS",
                 "CAPRICORN", "AQUARIUS", "PISCES")
SYMBOLS = tuple(unicodedata.lookup(n) for n in UNICODE_NAMES)

KITS = [
    "latitude: 3.1\nlanguage: fr\nsheet: letter\n",
    "latitude: -37.8\nlanguage: es\n",
    "latitude: 24.5\nlanguage: ar\n",
    "latitude: 26.9\nlanguage: hi\ndiameter_mm: 80\n",
    "latitude: 52.2\nlanguage: de\nsheet: a5\n",
]


@pytest.fixture(scope="module", params=KITS, ids=lambda h: h.replace("\n", " ").strip())
def kit(request):
    return build_kit(parse_recipe_text("epoch: 2027\n" + request.param + "parts: [mater_back, rete]\n"))


def _sign(el) -> int:
    """The sign (0 = Aries) whose middle longitude a label stands for."""
    return int(el.values["longitude_deg"] // 30)


def test_every_sign_on_the_rete_is_found_on_the_back(kit):
    names = kit.words.items("zodiac.signs")
    rete = [e for e in kit.part("rete").elements if e.role == "zodiac_label"]
    back = [e for e in kit.part("mater_back").elements if e.role == "zodiac_label"]
    assert sorted({_sign(e) for e in rete}) == list(range(12))
    assert sorted(_sign(e) for e in back) == list(range(12))
    back_text = {_sign(e): e.values.get("full_text", e.geom["text"]) for e in back}
    for e in rete:
        k = _sign(e)
        shown = e.values.get("full_text", e.geom["text"])
        assert shown in (names[k], SYMBOLS[k]), (k, shown)
        # The back shows both, so either form on the rete is found there.
        assert SYMBOLS[k] in back_text[k] and names[k] in back_text[k], back_text[k]
        assert back_text[k].index(SYMBOLS[k]) < back_text[k].index(names[k])


def test_the_glossary_lists_every_symbol_with_its_name(kit):
    w = kit.words
    names = w.items("zodiac.signs")
    entry = [s for s in w.items("instructions.glossary") if SYMBOLS[0] in s]
    assert len(entry) == 1
    for symbol, name in zip(SYMBOLS, names):
        assert f"{symbol}\u00a0{name}" in entry[0], (symbol, name)


def test_every_number_of_the_back_is_on_the_rete_or_in_the_notes(kit):
    on_back = {int(e.values["longitude_deg"]) for e in kit.part("mater_back").elements if e.role == "zodiac_number"}
    assert on_back == {30 * k + n for k in range(12) for n in (10, 20)}
    on_rete = {int(round(e.values["longitude_deg"])) for e in kit.part("rete").elements
               if e.role == "ecliptic_number"}
    noted = set()
    for note in kit.notes:
        if note.key in ("notes.ecliptic_numbers", "notes.ecliptic_numbers_under_stars"):
            noted |= {int(round(n.value)) for n in note.values["longitudes"]}
    assert on_back <= on_rete | noted, sorted(on_back - on_rete - noted)
    assert not on_rete & noted

"""The CLDR data kitgen keeps for a language (#12): the sections it never
reads are let go (kitgen.words.locale.UNREAD_SECTIONS), and what it does
read still gives, for every shipped language, what Babel gives from its
whole data read afresh.

Source: the Unicode CLDR as Babel ships it (``babel.localedata``,
``babel.numbers.format_decimal``, ``babel.dates.format_skeleton``,
``babel.dates.get_timezone_location``), read again after
``babel.localedata.clear_caches``; the sections' names are Babel's.
"""

from __future__ import annotations

import datetime as dt

import pytest
from babel import Locale, localedata
from babel.dates import format_skeleton, get_timezone_location
from babel.numbers import format_decimal

from kitgen.template_files import available_languages
from kitgen.words import locale

#: IANA zones a kit's clock may be read by (the database's names).
ZONES = ("Europe/Paris", "Asia/Kolkata", "America/Sao_Paulo", "Asia/Riyadh", "Europe/Moscow", "Australia/Perth")


@pytest.mark.parametrize("code", available_languages() + ["pt-BR"])
def test_the_unread_sections_are_let_go_and_the_read_ones_are_babels(code):
    locale.cldr_locale.cache_clear()   # read here, whatever another test read before
    kept = locale.cldr_locale(code)
    name = str(kept)
    for section in locale.UNREAD_SECTIONS:
        assert section not in localedata.load(name)
        assert section not in localedata.load("root")
    ours = {
        "months": [locale.month_names(code), locale.month_names(code, "abbreviated")],
        "numbers": [locale.format_number(v, d, code, native) for v in (52.2, -3.75, 0.0, 1234.5)
                    for d in (0, 1, 2) for native in (False, True)],
        "dates": [locale.format_date(2027, m, 15, code, with_year=y) for m in (1, 3, 12) for y in (True, False)],
        "zones": [locale.zone_place(zone, code) for zone in ZONES],
        "order": locale.is_right_to_left(code),
    }
    localedata.clear_caches()   # Babel's whole data, read again
    fresh = Locale.parse(name)
    system = locale.native_numbering_system(code)

    def number(v, d, native):
        text = format_decimal(round(v, d), format="0" + ("." + "0" * d if d else ""), locale=fresh,
                              numbering_system=system if native else "latn")
        return text.translate(str.maketrans("0123456789", locale.digits(system))) if native else text

    babels = {
        "months": [[fresh.months["stand-alone"][w][k] for k in range(1, 13)] for w in ("wide", "abbreviated")],
        "numbers": [number(v, d, native) for v in (52.2, -3.75, 0.0, 1234.5) for d in (0, 1, 2)
                    for native in (False, True)],
        "dates": [format_skeleton("yMMMMd" if y else "MMMMd", dt.date(2027, m, 15), locale=fresh)
                  for m in (1, 3, 12) for y in (True, False)],
        "zones": [get_timezone_location(zone, locale=fresh, return_city=True) for zone in ZONES],
        "order": fresh.character_order == "right-to-left",
    }
    assert ours == babels
    assert "unit_patterns" in localedata.load(name)   # read afresh, whole

"""Locale data from the Unicode CLDR, read through Babel.

Month names, the decimal sign, the locale's own digits, its writing
direction and its script are not typed into the templates: they come from
the Common Locale Data Repository (Unicode CLDR) as Babel ships it, so a
language file holds only the words of the instrument.
"""

from __future__ import annotations

import datetime as _dt
import unicodedata
import zoneinfo
from functools import lru_cache

from babel import Locale, UnknownLocaleError, localedata
from babel.core import get_global
from babel.dates import format_skeleton, get_timezone_location
from babel.numbers import format_decimal

#: The first digit of each CLDR numbering system kitgen can print
#: (CLDR common/supplemental/numberingSystems.xml gives each "numeric"
#: system as ten consecutive code points; the Unicode names of the zeros
#: are quoted from memory of that file and checked by the tests against
#: Python's unicodedata, which must call them decimal digit zero).
_ZERO_NAMES = {
    "latn": "DIGIT ZERO",
    "arab": "ARABIC-INDIC DIGIT ZERO",
    "arabext": "EXTENDED ARABIC-INDIC DIGIT ZERO",
    "deva": "DEVANAGARI DIGIT ZERO",
    "beng": "BENGALI DIGIT ZERO",
    "guru": "GURMUKHI DIGIT ZERO",
    "gujr": "GUJARATI DIGIT ZERO",
    "tamldec": "TAMIL DIGIT ZERO",
    "telu": "TELUGU DIGIT ZERO",
    "knda": "KANNADA DIGIT ZERO",
    "mlym": "MALAYALAM DIGIT ZERO",
    "thai": "THAI DIGIT ZERO",
    "mymr": "MYANMAR DIGIT ZERO",
}


class LocaleError(ValueError):
    """The code names no locale that CLDR knows."""


#: The sections of a locale's CLDR data that nothing in kitgen reads
#: (units, currencies, relative dates, intervals, compact numbers, lists,
#: quarters, day periods): more than half of what Babel holds for each
#: locale once read, which a class set's worker kept for every language
#: it built (#12).
UNREAD_SECTIONS = ("unit_patterns", "unit_display_names", "compound_unit_patterns", "currency_names",
                   "currency_names_plural", "currency_symbols", "currency_formats", "compact_currency_formats",
                   "compact_decimal_formats", "date_fields", "interval_formats", "list_patterns", "quarters",
                   "day_periods")


@lru_cache(maxsize=None)
def _parsed(code: str) -> Locale:
    """Babel's locale for a BCP 47 code, its data not read yet (a class
    set's rows are checked with their script alone, before its workers
    start, where reading every language's data cost 5 ms a language)."""
    try:
        return Locale.parse(code.replace("-", "_"))
    except (UnknownLocaleError, ValueError, TypeError):
        raise LocaleError(code) from None


@lru_cache(maxsize=None)
def cldr_locale(code: str) -> Locale:
    """Babel's CLDR locale for a BCP 47 code (``pt``, ``pt-BR``, ``ar``),
    its data read and the sections kitgen never reads let go
    (:data:`UNREAD_SECTIONS`, about 0.7 MB of the 1.4 MB Babel holds for a
    language).  Babel keeps each locale's data once read and gives the
    same dictionary again (``babel.localedata.load``), so the sections
    are taken from the dictionaries of the locale and of those it
    inherits from (``pt_BR``, ``pt``, ``root``)."""
    loc = _parsed(code)
    loc.character_order   # reads the locale's data
    parts = str(loc).split("_")
    for name in ["_".join(parts[:k]) for k in range(len(parts), 0, -1)] + ["root"]:
        if localedata.exists(name):
            data = localedata.load(name)
            for section in UNREAD_SECTIONS:
                data.pop(section, None)
    return loc


def month_names(code: str, width: str = "wide") -> list[str]:
    """The twelve month names, January first, in CLDR's stand-alone form
    (the form a calendar scale shows: Russian январь, not января);
    ``width`` is ``wide`` or ``abbreviated``."""
    months = cldr_locale(code).months["stand-alone"][width]
    return [months[k] for k in range(1, 13)]


def is_right_to_left(code: str) -> bool:
    """Whether the locale writes right to left (CLDR characterOrder)."""
    return cldr_locale(code).character_order == "right-to-left"


def script(code: str) -> str:
    """ISO 15924 script of the locale (``Latn``, ``Grek``, ``Cyrl``,
    ``Arab``, ``Deva``), from CLDR's likely subtags when the code names none."""
    loc = _parsed(code)
    if loc.script:
        return loc.script
    likely = get_global("likely_subtags").get(loc.language, "")
    for part in likely.split("_")[1:]:
        if len(part) == 4:
            return part
    return "Latn"


def native_numbering_system(code: str) -> str:
    """The locale's own digits (CLDR ``native`` numbering system), or
    ``latn`` where CLDR gives none or kitgen has no digits for it."""
    system = cldr_locale(code).other_numbering_systems.get("native", "latn")
    return system if system in _ZERO_NAMES else "latn"


def digits(system: str) -> str:
    """The ten digits of a CLDR numbering system, 0 to 9."""
    zero = ord(unicodedata.lookup(_ZERO_NAMES[system]))
    return "".join(chr(zero + k) for k in range(10))


def format_number(value: float, decimals: int, code: str, native_digits: bool = False) -> str:
    """``value`` with ``decimals`` decimals as the locale writes it: its
    decimal sign (a comma in es, fr, de, pt, it, el, ru), no grouping (the
    numbers of a scale and years are read whole), and, with
    ``native_digits``, the locale's own digits (Arabic-Indic in ar,
    Devanagari in hi) with the decimal sign CLDR gives for them."""
    pattern = "0" + ("." + "0" * decimals if decimals > 0 else "")
    system = native_numbering_system(code) if native_digits else "latn"
    text = format_decimal(round(value, decimals), format=pattern, locale=cldr_locale(code),
                          numbering_system=system)
    if system != "latn":
        text = text.translate(str.maketrans("0123456789", digits(system)))
    return text


def true_minus(text: str) -> str:
    """A formatted number with a true minus sign (U+2212, as print sets
    it and as the kit's tables of corrections have it) for the hyphen-minus
    that CLDR gives many languages (en, fr, de...)."""
    return text.replace("-", "\u2212")


def format_date(year: int, month: int, day: int, code: str, native_digits: bool = False,
                with_year: bool = True) -> str:
    """A date as the locale writes it in running text (CLDR's skeleton
    ``yMMMMd``, or ``MMMMd`` without the year: "15 mars 2027", "15. März",
    Russian "15 марта" in the genitive), with the locale's own digits when
    asked."""
    text = format_skeleton("yMMMMd" if with_year else "MMMMd", _dt.date(year, month, day), locale=cldr_locale(code))
    if native_digits:
        system = native_numbering_system(code)
        if system != "latn":
            text = text.translate(str.maketrans("0123456789", digits(system)))
    return text


#: The first word of the Unicode names of each script's letters ("LATIN
#: SMALL LETTER A", "DEVANAGARI LETTER KA").
SCRIPT_NAMES = {"Latn": "LATIN", "Grek": "GREEK", "Cyrl": "CYRILLIC", "Arab": "ARABIC", "Deva": "DEVANAGARI"}


def in_script(text: str, code: str) -> bool:
    """Whether every letter of ``text`` belongs to the script language
    ``code`` is written in (its ISO 15924 code, :func:`script`, and the
    letters' Unicode character names); a text without letters is."""
    want = SCRIPT_NAMES.get(script(code))
    return want is not None and all(unicodedata.name(ch, "").startswith(want + " ") for ch in text if ch.isalpha())


def zone_place(timezone: str, code: str, town: str = "") -> str:
    """The words for an IANA zone on a kit in language ``code``: ``town``,
    where the kit is for a looked-up town that keeps the zone (a Delhi
    kit's clock is Delhi's, where the zone's city is Kolkata) and its name
    is written in the language's script (:func:`in_script`: a Hindi kit's
    sentences take no Latin name the zone's city can replace); else the
    zone's exemplar city in that language (the Unicode CLDR through Babel:
    ``London`` for Europe/London, ``Londres`` in French), as pupils know
    their clock by a city and never by the database's name; for a zone of
    no city (``UTC``, ``Etc/GMT-3``), its offset from UT in January,
    ``UTC+3``."""
    if town and in_script(town, code):
        return town
    if "/" in timezone and not timezone.startswith("Etc/"):
        try:
            return get_timezone_location(timezone, locale=cldr_locale(code), return_city=True)
        except (LocaleError, LookupError, ValueError):
            return timezone.rsplit("/", 1)[-1].replace("_", " ")
    offset = _dt.datetime(2000, 1, 1, tzinfo=zoneinfo.ZoneInfo(timezone)).utcoffset()
    minutes = int(offset.total_seconds() // 60)
    if minutes == 0:
        return "UTC"
    h, m = divmod(abs(minutes), 60)
    sign = "+" if minutes > 0 else "\u2212"
    return f"UTC{sign}{h}" + (f":{m:02d}" if m else "")

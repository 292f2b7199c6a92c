"""Numbers with their words, for labels (through the language templates)."""

from __future__ import annotations

from decimal import ROUND_HALF_UP, Decimal


#: The forms of a latitude in words (template keys): a label standing
#: alone ("Latitude 48.2° N"), going on within a line or heading after a
#: place's name or in a list ("Le Havre, latitude 49.5° N"), and in a
#: sentence, with the article or case it takes there ("la latitud …").
LABEL = "plate.latitude"
WITHIN_LINE = "almanac.place_latitude_title"
IN_SENTENCE = "almanac.place_latitude"


def latitude_text(words, latitude_deg: float, form: str = LABEL) -> str:
    """'Latitude 48.2° N' in the kit's language, in the ``form`` (one of
    the keys above); one decimal, as recipes give it, rounded as the
    decimal figures read (:func:`tenths`).  The equator, 0.0° as
    rounded, is neither north nor south and takes no letter (as an atlas
    writes it, common practice): "Latitude 0.0°", where it read "0.0° N"
    on a kit drawn at 0.04 S."""
    value = tenths(abs(latitude_deg))
    if value == 0.0:   # every form ends with the letter: the space before it goes too
        return words(form, value=words.number(value, 1), hemisphere="").rstrip(_SPACES)
    hemi = words("cardinal.north_short") if latitude_deg >= 0 else words("cardinal.south_short")
    return words(form, value=words.number(value, 1), hemisphere=hemi)


#: The spaces the languages write before a hemisphere's letter (plain,
#: no-break, narrow no-break, thin).
_SPACES = " \u00a0\u202f\u2009"


def tenths(value: float) -> float:
    """``value`` to one decimal, a half rounded up as its shortest decimal
    figures read (31.95 to 32.0, as a reader rounds it), where binary
    rounding gave 31.9: 31.95 is stored a hair below 31.95."""
    return float(Decimal(repr(value)).quantize(Decimal("0.1"), rounding=ROUND_HALF_UP))

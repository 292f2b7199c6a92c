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
    decimal figures read (:func:`tenths`)."""
    hemi = words("cardinal.north_short") if latitude_deg >= 0 else words("cardinal.south_short")
    return words(form, value=words.number(tenths(abs(latitude_deg)), 1), hemisphere=hemi)


def tenths(value: float) -> float:
    """``value`` to one decimal, a half rounded up as its shortest decimal
    figures read (31.95 to 32.0, as a reader rounds it), where binary
    rounding gave 31.9: 31.95 is stored a hair below 31.95."""
    return float(Decimal(repr(value)).quantize(Decimal("0.1"), rounding=ROUND_HALF_UP))

"""Numbers with their words, for labels (through the language templates)."""

from __future__ import annotations


#: The forms of a latitude in words (template keys): a label standing
#: alone ("Latitude 48.2° N"), going on within a line or heading after a
#: place's name or in a list ("Le Havre, latitude 49.5° N"), and in a
#: sentence, with the article or case it takes there ("la latitud …").
LABEL = "plate.latitude"
WITHIN_LINE = "almanac.place_latitude_title"
IN_SENTENCE = "almanac.place_latitude"


def latitude_text(words, latitude_deg: float, form: str = LABEL) -> str:
    """'Latitude 48.2° N' in the kit's language, in the ``form`` (one of
    the keys above); one decimal, as recipes give it."""
    hemi = words("cardinal.north_short") if latitude_deg >= 0 else words("cardinal.south_short")
    return words(form, value=words.number(abs(latitude_deg), 1), hemisphere=hemi)

"""Numbers with their words, for labels (through the language templates)."""

from __future__ import annotations


def latitude_text(words, latitude_deg: float, after_name: bool = False) -> str:
    """'Latitude 48.2° N' in the kit's language; one decimal, as recipes
    give it.  ``after_name``: as it follows a place's name ("Le Havre,
    latitude 49.5° N"), in the heading's form, not capitalised as a label
    standing alone."""
    hemi = words("cardinal.north_short") if latitude_deg >= 0 else words("cardinal.south_short")
    key = "almanac.place_latitude_title" if after_name else "plate.latitude"
    return words(key, value=words.number(abs(latitude_deg), 1), hemisphere=hemi)

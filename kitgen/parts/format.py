"""Numbers with their words, for labels (through the language templates)."""

from __future__ import annotations


def latitude_text(words, latitude_deg: float) -> str:
    """'Latitude 48.2° N' in the kit's language; one decimal, as recipes give it."""
    hemi = words("cardinal.north_short") if latitude_deg >= 0 else words("cardinal.south_short")
    return words("plate.latitude", value=words.number(abs(latitude_deg), 1), hemisphere=hemi)

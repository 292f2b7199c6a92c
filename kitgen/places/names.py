"""Place names folded for matching: the same key for every way people type
a name.

Unicode compatibility decomposition (NFKD) with the combining marks
dropped, so that "Sao Paulo" finds "São Paulo" and "Αθηνα" finds "Αθήνα";
full case folding (Unicode's ``casefold``, so "STRASSE" finds "Straße");
hyphens, apostrophes and full stops read as spaces or nothing, as
gazetteers write them variously ("Saint-Étienne", "St. Louis"), and runs
of spaces made one.  Letters of every script are kept as they are, so a
name written in Cyrillic, Greek, Arabic or Devanagari is matched against
the alternate names the gazetteer gives in that script.
"""

from __future__ import annotations

import unicodedata

_AS_SPACE = str.maketrans({c: " " for c in "-‐‑‒–—_/,()"})
_DROPPED = str.maketrans({c: None for c in "'’ʼ`´.\u200c\u200d"})
#: Latin letters with a stroke or without a dot, which Unicode does not
#: decompose, read as the plain letter people type for them ("Lodz" for
#: "Łódź", "Agri" for "Ağrı"; common practice of gazetteers' ASCII names).
_PLAIN = str.maketrans({"ł": "l", "ø": "o", "đ": "d", "ı": "i", "ħ": "h", "ŧ": "t", "ƚ": "l"})


def fold(name: str) -> str:
    """The matching key of ``name`` (see the module docstring)."""
    text = unicodedata.normalize("NFKD", name)
    if not text.isascii():  # ASCII has no combining marks; this spares most names the loop
        text = "".join(c for c in text if not unicodedata.combining(c))
    text = text.casefold().translate(_AS_SPACE).translate(_DROPPED).translate(_PLAIN)
    return " ".join(text.split())

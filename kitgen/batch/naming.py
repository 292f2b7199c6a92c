"""File names of a set's kits: ``001-owner-name.pdf`` (#12).

The name keeps the owner's (or else the title's) own letters, in any
script, so that a teacher finds a pupil's kit by the pupil's name.  What
could harm a file system or a reader is replaced by ``-``: path separators,
the characters Windows reserves (``<>:"/\\|?*``), control and format
characters, and spaces; a leading dot and trailing dots or spaces are
dropped; a name too long is cut at the end of a word where it can be.
The kit's number leads every name, so no name is ever a device
name that Windows reserves (CON, NUL, COM1 ...), and two kits never share
a name; names that differ only in case (which a case-insensitive disk
would merge) are still told apart, in kit order, by a ``-2``, ``-3`` ...
"""

from __future__ import annotations

import re
import unicodedata

#: Longest stem, in UTF-8 bytes (a name must stay well under the usual 255).
MAX_STEM_BYTES = 100
_RESERVED = set('<>:"/\\|?*')


def kit_stem(text: str) -> str:
    """``text`` made safe as part of a file name (see the module's
    docstring); may be empty."""
    text = unicodedata.normalize("NFC", str(text))
    out = []
    for ch in text:
        cat = unicodedata.category(ch)
        if ch in _RESERVED or cat[0] in ("C", "Z"):
            out.append("-")
        else:
            out.append(ch)
    whole = stem = re.sub(r"-+", "-", "".join(out)).strip("-. ")
    while len(stem.encode("utf-8")) > MAX_STEM_BYTES:
        stem = stem[:-1]
    word_end = stem.rfind("-")
    if len(stem) < len(whole) and whole[len(stem)] != "-" and word_end >= len(stem) // 2:
        stem = stem[:word_end]   # cut at the end of a word, not inside one (or a syllable)
    return stem.rstrip("-. ")


def kit_file_names(kits, suffix: str = ".pdf") -> list[str]:
    """One file name per kit of the set, in order: its number, padded to
    at least three digits, then the owner, the title or nothing."""
    digits = max(3, len(str(len(kits))))
    names, taken = [], set()
    for kit in kits:
        label = _label(kit.tree)
        stem = f"{kit.number:0{digits}d}" + (f"-{kit_stem(label)}" if kit_stem(label) else "")
        name, n = stem + suffix, 2
        while name.casefold() in taken:
            name, n = f"{stem}-{n}{suffix}", n + 1
        taken.add(name.casefold())
        names.append(name)
    return names


def _label(tree: dict) -> str:
    for key in ("owner", "title"):
        value = tree.get(key)
        if isinstance(value, (str, int, float)) and not isinstance(value, bool) and str(value).strip():
            return str(value)
    return ""

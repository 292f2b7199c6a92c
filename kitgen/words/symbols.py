"""Signs that are the same in every language, from the Unicode Standard.

The twelve signs of the zodiac (Unicode 16.0, block Miscellaneous
Symbols, U+2648 ARIES to U+2653 PISCES) are the trade's own shorthand for
the 30-degree divisions of the ecliptic, engraved on astrolabe retes since
the middle ages (common practice).  A sign's name that has no room on a
small rete is written as its sign instead of being cut short
(:mod:`kitgen.words.fit`, step 3); the shipped fonts draw them.
"""

from __future__ import annotations

#: Aries first, in the order of ``zodiac.signs`` in the templates.
ZODIAC_SIGNS: tuple[str, ...] = tuple(chr(0x2648 + k) for k in range(12))

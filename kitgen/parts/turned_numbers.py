"""Numbers that read as another number when turned half a turn.

A number set along a ring stands sideways at the ring's sides, where the
numbers above the horizontal read from one side and those below from the
other (:func:`kitgen.parts.curves.ring_text`): there "+9" turned is "6+",
and a pupil who tilts their head the way the number above asked reads a
correction 3 minutes wrong.  Such a number is underlined, the mark by which
rotated dials and tiles tell 6 from 9 (common practice, no source).
"""

from __future__ import annotations

import math

from ..geometry import model

#: Each digit that reads as a digit when turned half a turn, and what it
#: reads as (in the shapes of the shipped fonts' Western digits).
TURNED_DIGITS = {"0": "0", "1": "1", "6": "9", "8": "8", "9": "6"}

#: What a number's text may hold besides its digits: signs and spaces,
#: which read the same turned (U+2212 is the minus sign), and the
#: invisible marks of direction a right-to-left kit sets round its
#: numbers (kitgen.words: U+2066 to U+2069, U+200E, U+200F, U+061C).
_MARKS = set("+-\u2212 \u00a0\u2009\u202f\u2066\u2067\u2068\u2069\u200e\u200f\u061c")

#: Clear paper (mm) between the digits' ink and the underline's.
UNDERLINE_GAP_MM = 0.12


def reads_as_another_turned(text: str) -> bool:
    """Whether ``text`` (a number, maybe signed) turned half a turn reads
    as another number: "+9" (as 6), "16" (as 91), "18" (as 81), "−6",
    "+60" and "90" (as 09 and 06, read as a clock's 9 and 6); not "+8",
    "11", "69" (the same turned), nor "10" and "80" (01 and 08: their
    digits stay what they were, and no scale writes a leading zero)."""
    digits = [c for c in text if c not in _MARKS]
    if not digits or any(c not in TURNED_DIGITS for c in digits):
        return False
    turned = "".join(TURNED_DIGITS[c] for c in reversed(digits))
    if turned == "".join(digits):
        return False
    return not (len(turned) > 1 and turned[0] == "0") or any(c in "69" for c in digits)


def underline(role: str, label, words, stroke_width_mm: float, **values):
    """The underline of the text element ``label`` (centred on its
    ``at``, turned by its ``angle_deg``): a segment under the ink of its
    whole line, :data:`UNDERLINE_GAP_MM` below the digits' ink, in stroke
    ``light`` (``stroke_width_mm`` its width)."""
    g = label.geom
    size, text = g["size_pt"], g["text"]
    extent = words.measure(text, size)
    left, right = words.ink_span_mm(text, size)
    a = math.radians(g["angle_deg"])
    along, down = (math.cos(a), math.sin(a)), (math.sin(a), -math.cos(a))
    drop = extent.height_mm / 2 + UNDERLINE_GAP_MM + stroke_width_mm / 2
    x0 = {"start": 0.0, "middle": -extent.width_mm / 2, "end": -extent.width_mm}[g["anchor"]]
    ends = []
    for s in (x0 + left, x0 + right):
        ends.append((g["at"][0] + along[0] * s + down[0] * drop, g["at"][1] + along[1] * s + down[1] * drop))
    return model.segment(role, ends[0], ends[1], "light", **values)

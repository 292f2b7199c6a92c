"""Fit a label into the room its part has for it.

The rule, applied in this order (the first step that fits wins):

1. the label at its own size;
2. the label made smaller, down to the legible minimum of 5 pt
   (``kitgen.parts.dimensions.MIN_TEXT_PT``);
3. the shorter form, where one is given (CLDR's abbreviated month names),
   at the largest size from its own size down to the minimum that fits;
4. two lines, broken at the space that leaves the longer line shortest,
   at the largest size down to the minimum at which both lines fit the
   width and the two lines the height; then three lines, broken the same
   way, for a long caption in a small kit;
5. otherwise the label is cut at the minimum size and ends with "…", so it
   never runs out of its room.  No shipped language reaches this step
   (the tests check it); a language file of one's own may.

Widths are measured with the real fonts (:mod:`kitgen.words.measure`).
"""

from __future__ import annotations

from dataclasses import dataclass

#: Lines of a two-line label are this many times the size apart
#: (common practice in typesetting: leading of about 1.2 em).
LEADING = 1.15
#: Share of the room by which words may exceed it and still fit at their
#: size: floating-point rounding, a billionth of the width.
FIT_TOLERANCE = 1e-9


@dataclass(frozen=True)
class Fitted:
    """A label fitted to its room: its lines, its size, and which step of
    the fitting rule made it fit."""

    lines: tuple[str, ...]
    size_pt: float
    step: int            # which step of the rule fitted (1-5)

    @property
    def text(self) -> str:
        return " ".join(self.lines)


def fit_label(text: str, size_pt: float, max_width_mm: float, measure, min_pt: float = 5.0,
              max_height_mm: float | None = None, short: str | None = None) -> Fitted:
    """Fit ``text`` in ``max_width_mm`` (and ``max_height_mm``, if given).
    ``measure(text, size_pt)`` returns an extent with ``width_mm`` and
    ``height_mm`` (:func:`kitgen.words.measure.extent`)."""
    min_pt = min(min_pt, size_pt)

    def size_for(lines: tuple[str, ...], top_pt: float) -> float | None:
        widths = [measure(s, top_pt).width_mm for s in lines]
        h1 = measure(lines[0], top_pt).height_mm
        height = h1 * (1 + (len(lines) - 1) * LEADING)
        scale = min([1.0] + [max_width_mm / w for w in widths if w > 0])
        if max_height_mm is not None and height > 0:
            scale = min(scale, max_height_mm / height)
        # A room as wide as the words, worked out from their own width,
        # holds them: its last bits of floating-point rounding are no
        # reason to shrink them (below the minimum, where they fit at it).
        s = top_pt if scale >= 1.0 - FIT_TOLERANCE else top_pt * scale * 0.999
        return min(top_pt, s) if s >= min_pt - 1e-9 else None

    s = size_for((text,), size_pt)
    if s is not None:
        return Fitted((text,), s, 1 if s >= size_pt else 2)
    if short:
        s = size_for((short,), size_pt)
        if s is not None:
            return Fitted((short,), s, 3)
    for n_lines in (2, 3):
        lines = _balanced(text.split(" "), n_lines, lambda x: measure(x, size_pt).width_mm)
        if lines is not None:
            s = size_for(lines, size_pt)
            if s is not None:
                return Fitted(lines, s, 4)
    cut = text
    while cut and measure(cut + "…", min_pt).width_mm > max_width_mm:
        cut = cut[:-1]
    return Fitted((cut.rstrip() + "…",), min_pt, 5)


def _balanced(words: list[str], n_lines: int, width) -> tuple[str, ...] | None:
    """``words`` broken into ``n_lines`` lines at the spaces that leave the
    longest line shortest (every way tried: a label has few words);
    ``None`` when there are too few words."""
    if len(words) < n_lines:
        return None
    best = None
    cuts = [()]
    for _ in range(n_lines - 1):
        cuts = [c + (k,) for c in cuts for k in range((c[-1] if c else 0) + 1, len(words))]
    for c in cuts[:5000]:
        bounds = (0, *c, len(words))
        lines = tuple(" ".join(words[a:b]) for a, b in zip(bounds, bounds[1:]))
        longest = max(width(x) for x in lines)
        if best is None or longest < best[0]:
            best = (longest, lines)
    return best[1] if best else None


def line_offsets_mm(n_lines: int, line_height_mm: float) -> list[float]:
    """Offsets (mm, upwards) of the middles of ``n_lines`` lines about the
    label's middle."""
    step = line_height_mm * LEADING
    return [((n_lines - 1) / 2 - k) * step for k in range(n_lines)]

"""Set one line of text: fonts, direction and shaping, without drawing it.

A line is cut into runs that share one font and one embedding level; the
runs are put in visual order and each run is shaped by HarfBuzz (through
uharfbuzz) when its script needs it (Arabic joining, Devanagari
conjuncts and vowel signs) or when it runs right to left (mirrored
brackets).  Other runs are set glyph by glyph from the font's character
map and hmtx advances, exactly as reportlab draws plain strings.  The
measuring of :mod:`kitgen.words.measure` and the drawing of
:mod:`kitgen.render.pdf_text` both use this one setting, so what is
measured is what is printed.

Direction follows the Unicode Bidirectional Algorithm (UAX #9, "Unicode
Bidirectional Algorithm", revision for Unicode 15), for one paragraph
without explicit embeddings: rules W1-W7, N1-N2, I1-I2 and L1-L2.  That is
all the kit's strings need: Arabic words with digits, signs and the Latin
IAU names of stars.  Isolates (LRI, RLI, FSI ... PDI, UAX #9 section 2.4)
are laid out separately: the text between an initiator and its PDI is set
as a paragraph of its own (FSI takes the direction of its first strong
character, P2-P3) and stands in the line around it as one neutral
character (X5a-X5c, X6a), so a title written in the other direction never
reorders the words around it (:meth:`kitgen.words.templates.Words.__call__`
isolates such values).
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import dataclass
from functools import lru_cache
from itertools import groupby
from typing import NamedTuple

import uharfbuzz as hb

from . import fonts
from .fonts import Face

#: HarfBuzz features: kerning and the standard ligatures (required
#: features of Arabic and Indic shaping are always on).
FEATURES = {"kern": True, "liga": True}

_STRONG_R = {"R", "AL"}
_NEUTRAL = {"B", "S", "WS", "ON", "BN"}


class Glyph(NamedTuple):
    """One glyph of a run, in visual order: its id in the font, the index
    (in the run's text) of the first character of its cluster, and its
    advance and offsets in em.  A named tuple: a shaped paragraph makes
    thousands of them while it is wrapped (#12)."""

    gid: int
    cluster: int
    x_advance_em: float
    x_offset_em: float
    y_offset_em: float


@dataclass(frozen=True)
class Run:
    """A stretch of a line in one font and one direction, shaped to glyphs
    (HarfBuzz) where its script needs it, else drawn as plain text."""

    face: Face
    text: str            # logical order
    rtl: bool
    shaped: bool         # drawn from ``glyphs`` (else as plain text)
    glyphs: tuple[Glyph, ...]
    width_em: float


@dataclass(frozen=True)
class Line:
    """One line of text shaped for drawing: its runs in visual order, its
    width and its ink's extent, in em."""

    text: str                 # logical order
    runs: tuple[Run, ...]     # visual order, left to right
    width_em: float
    middle_em: float          # height of the line's middle above the baseline
    ink_top_em: float         # highest ink above the baseline
    ink_bottom_em: float      # lowest ink, above the baseline (negative below)
    rtl: bool                 # the paragraph direction

    @property
    def half_height_em(self) -> float:
        """Half the height of the line's ink."""
        return max(self.ink_top_em - self.ink_bottom_em, 0.0) / 2

    @property
    def ink_middle_em(self) -> float:
        """Height above the baseline of the middle of the line's ink: a
        label is set with this point on its place, so that its ink, whatever
        the script's marks above or below, is centred in its room."""
        return (self.ink_top_em + self.ink_bottom_em) / 2


# -- UAX #9 -------------------------------------------------------------------

LRI, RLI, FSI, PDI = "\u2066", "\u2067", "\u2068", "\u2069"
_INITIATORS = (LRI, RLI, FSI)
#: What an isolate stands as in the line around it: OBJECT REPLACEMENT
#: CHARACTER, of bidirectional class ON, a neutral (as X6a makes the
#: initiator and its PDI).
_STAND_IN = "\ufffc"


#: The isolates' initiators and PDI (U+2066 to U+2069).
_MARKS = re.compile(f"[{LRI}{RLI}{FSI}{PDI}]")


#: A line's isolates kept for the next ask: a line's direction and its
#: runs both need them (#12).
@lru_cache(maxsize=256)
def isolates(text: str) -> tuple[str, tuple[tuple[str, str], ...]]:
    """``text`` with each outermost isolate replaced by one stand-in
    character, and the isolates' (initiator, content) in order.  An
    initiator without its PDI runs to the end of the text (BD9); a PDI
    without an initiator is dropped."""
    if LRI not in text and RLI not in text and FSI not in text and PDI not in text:
        return text, ()
    outer, found = [], []
    depth, start = 0, 0   # the isolate's depth; where the text outside it (or its content) starts
    for m in _MARKS.finditer(text):   # only the marks move the depth (#12: not every character)
        j, ch = m.start(), m.group()
        if depth == 0:
            outer.append(text[start:j])
            start = j + 1
            if ch != PDI:
                opened, depth = ch, 1
        else:
            depth += 1 if ch != PDI else -1
            if depth == 0:
                found.append((opened, text[start:j]))
                outer.append(_STAND_IN)
                start = j + 1
    if depth:
        found.append((opened, text[start:]))
        outer.append(_STAND_IN)
    else:
        outer.append(text[start:])
    return "".join(outer), tuple(found)


_DIGIT = "0-9\u0660-\u0669\u06f0-\u06f9\u0966-\u096f"
#: A number as the kit writes it: a sign where it starts a word, digits
#: (European, Arabic-Indic, extended Arabic-Indic, Devanagari) with the
#: decimal signs, group separators and a time's colon between them, and a
#: degree or per-cent sign after them.
_NUMBER = re.compile(rf"(?:(?<![\w{_DIGIT}])[+\-\u2212])?[{_DIGIT}]+(?:[.,:\u066b\u066c][{_DIGIT}]+)*[°%\u066a]?")


def isolate_numbers(text: str) -> str:
    """``text`` with each number outside an isolate (its sign, decimal
    sign, a time's colon and a degree sign after it with it) wrapped in
    LEFT-TO-RIGHT ISOLATE ... POP DIRECTIONAL ISOLATE (UAX #9, 2.4), for a
    line of a right-to-left language (#9).  By W1-W7 alone a sign or a
    degree sign beside a number in right-to-left text is a neutral and
    takes the text's direction: "الشفق -18°" would show as "°18-" and a
    correction "+9" as "9+".  Isolated, a number reads left to right as a
    whole and stands in the line as one neutral character, so the numbers
    of "1 من 8" keep their places in the right-to-left order."""
    if not _NUMBER.search(text):
        return text
    out, depth, start = [], 0, 0
    for i, ch in enumerate(text + PDI):   # a closing PDI ends the last piece
        if ch in _INITIATORS or (ch == PDI and (depth or i == len(text))):
            piece = text[start:i]
            out.append(_NUMBER.sub(lambda m: LRI + m.group(0) + PDI, piece) if depth == 0 else piece)
            start = i
            depth = depth + 1 if ch in _INITIATORS else max(depth - 1, 0)
    return "".join(out)


#: Each character's bidirectional class, as met.
_CLASS: dict[str, str] = {}


#: Bidirectional classes that leave a right-to-left line at level 1
#: throughout: with no L, EN or AN, W1-W7 leave only R (AL turned R by W3)
#: and neutrals (ES, ET, CS turned ON by W6, W4 and W5 needing a number),
#: N1-N2 give every neutral the R around it or the paragraph's own R at
#: either end, I2 keeps R at level 1 and L1 resets to 1.  An Arabic line
#: whose numbers are isolated is such a line (#12).
_RTL_PLAIN_CLASSES = frozenset({"R", "AL", "NSM", "BN", "B", "S", "WS", "ON", "ES", "ET", "CS"})


#: The characters met whose class is among :data:`_PLAIN_CLASSES`, and
#: those whose class is among :data:`_RTL_PLAIN_CLASSES`: whether a line
#: is all of these is asked of its characters in C, without listing its
#: classes (#12).
_LTR_PLAIN_CHARS: set[str] = set()
_RTL_PLAIN_CHARS: set[str] = set()
#: The characters met of class R or AL.
_STRONG_R_CHARS: set[str] = set()


def _class(ch: str) -> str:
    found = _CLASS.get(ch)
    if found is None:
        found = _CLASS[ch] = unicodedata.bidirectional(ch) or "L"
        if found in _PLAIN_CLASSES:
            _LTR_PLAIN_CHARS.add(ch)
        if found in _RTL_PLAIN_CLASSES:
            _RTL_PLAIN_CHARS.add(ch)
        if found in _STRONG_R:
            _STRONG_R_CHARS.add(ch)
    return found


def _classes(text: str) -> list[str]:
    out = list(map(_CLASS.get, text))   # looked up in C (#12); a character not met yet filled in
    return [c or _class(ch) for c, ch in zip(out, text)] if None in out else out


def paragraph_is_rtl(text: str, prefer_rtl: bool) -> bool:
    """Paragraph direction.  P2-P3 take the first strong character; a
    language written right to left keeps its direction for a line that
    holds any right-to-left letter (a higher-level protocol, HL1)."""
    classes = _classes(text)
    if prefer_rtl and any(c in _STRONG_R for c in classes):
        return True
    for c in classes:
        if c == "L":
            return False
        if c in _STRONG_R:
            return True
    return False


def embedding_levels(text: str, rtl: bool) -> list[int]:
    """The resolved embedding level of each character (UAX #9, W1-I2, L1)."""
    base = 1 if rtl else 0
    sor = "R" if rtl else "L"
    if (_RTL_PLAIN_CHARS if rtl else _LTR_PLAIN_CHARS).issuperset(text):
        return [base] * len(text)   # the two cases below, from characters met before
    t = _classes(text)
    n = len(t)
    if not rtl and _PLAIN_CLASSES.issuperset(t):
        return [0] * n   # no right-to-left letter or number: W1-I2 leave all at 0
    if rtl and _RTL_PLAIN_CLASSES.issuperset(t):
        return [1] * n   # no left-to-right letter or number: W1-I2 and L1 leave all at 1
    for i in range(n):                                   # W1
        if t[i] == "NSM":
            t[i] = t[i - 1] if i else sor
    last = sor
    for i in range(n):                                   # W2, W3
        if t[i] in ("L", "R", "AL"):
            last = t[i]
        if t[i] == "EN" and last == "AL":
            t[i] = "AN"
        if t[i] == "AL":
            t[i] = "R"
    for i in range(1, n - 1):                            # W4
        if t[i] == "ES" and t[i - 1] == t[i + 1] == "EN":
            t[i] = "EN"
        elif t[i] == "CS" and t[i - 1] == t[i + 1] and t[i - 1] in ("EN", "AN"):
            t[i] = t[i - 1]
    i = 0
    while i < n:                                         # W5
        if t[i] == "ET":
            j = i
            while j < n and t[j] == "ET":
                j += 1
            if (i and t[i - 1] == "EN") or (j < n and t[j] == "EN"):
                t[i:j] = ["EN"] * (j - i)
            i = j
        else:
            i += 1
    t = ["ON" if c in ("ES", "ET", "CS") else c for c in t]   # W6
    last = sor
    for i in range(n):                                   # W7
        if t[i] in ("L", "R"):
            last = t[i]
        if t[i] == "EN" and last == "L":
            t[i] = "L"
    i = 0
    while i < n:                                         # N1, N2
        if t[i] in _NEUTRAL:
            j = i
            while j < n and t[j] in _NEUTRAL:
                j += 1
            before = sor if i == 0 else ("R" if t[i - 1] in ("R", "EN", "AN") else "L")
            after = sor if j == n else ("R" if t[j] in ("R", "EN", "AN") else "L")
            t[i:j] = [before if before == after else sor] * (j - i)
            i = j
        else:
            i += 1
    levels = []
    for c in t:                                          # I1, I2
        if base == 0:
            levels.append(1 if c == "R" else 2 if c in ("AN", "EN") else 0)
        else:
            levels.append(2 if c in ("L", "EN", "AN") else 1)
    k = n                                                # L1: trailing white space
    while k > 0 and _classes(text[k - 1])[0] in ("WS", "S", "B", "BN"):
        k -= 1
        levels[k] = base
    return levels


def visual_order(levels: list[int]) -> list[int]:
    """Indices of items in visual order (UAX #9, L2): from the highest
    level down to the lowest odd one, reverse every run at that level or
    higher."""
    order = list(range(len(levels)))
    if not levels:
        return order
    if levels.count(levels[0]) == len(levels):
        return order[::-1] if levels[0] % 2 else order   # one level: one reversal or none (#12)
    lowest_odd = min((lv for lv in levels if lv % 2), default=None)
    if lowest_odd is None:
        return order
    for level in range(max(levels), lowest_odd - 1, -1):
        i = 0
        while i < len(order):
            if levels[order[i]] >= level:
                j = i
                while j < len(order) and levels[order[j]] >= level:
                    j += 1
                order[i:j] = order[i:j][::-1]
                i = j
            else:
                i += 1
    return order


# -- fonts and runs -------------------------------------------------------------

def _faces_for(text: str, stack: tuple[Face, ...]) -> list[Face]:
    """The face of each character: the first of the stack that holds it.
    Marks and neutral characters stay with the face before them where that
    face holds them, so a word is not split between fonts."""
    if _HELD_BY_FIRST.get(stack, frozenset()).issuperset(text):
        return [stack[0]] * len(text)   # each character the first face's: all stay with it
    # A character's face hangs on it and the face before it alone, so the
    # last line's faces hold for the start of a line that begins with it:
    # a wrapped paragraph's trial line is the one before and a word (#12).
    last_text, last_faces = _LAST_FACES.get(stack, ("", []))
    start = len(last_text) if last_text and text.startswith(last_text) else 0
    out: list[Face] = last_faces[:start]
    table = _FACE_OF.setdefault(stack, {})
    get = table.get
    for ch in text[start:]:
        found = get(ch)
        if found is None:
            cat = unicodedata.category(ch)
            holders = tuple(f for f in stack if fonts.has_char(f, ch))
            # another script's font for a character none of the stack holds
            others = () if holders else tuple(f for f in fonts.fallbacks(stack) if fonts.has_char(f, ch))
            stays = cat[0] in "MZPS" or cat in ("Cf", "Nd")
            first = holders[0] if holders else others[0] if others else stack[-1]
            found = table[ch] = (holders + others if stays else (), first)
            if holders and holders[0] == stack[0]:
                _HELD_BY_FIRST[stack] = _HELD_BY_FIRST.get(stack, frozenset()) | {ch}
        holders, face = found
        if holders and out and out[-1] in holders:
            out.append(out[-1])
        else:
            out.append(face)
    _LAST_FACES[stack] = (text, out)
    return out


#: Per stack, each character met: (the faces of the stack that hold it
#: when it stays with the face before it where that face holds it, else
#: none; the first face of the stack that holds it).
_FACE_OF: dict[tuple[Face, ...], dict[str, tuple[tuple[Face, ...], Face]]] = {}
#: Per stack, the characters met that its first face holds: a line of
#: these alone is all in that face, whatever stays with what (#12).
_HELD_BY_FIRST: dict[tuple[Face, ...], frozenset[str]] = {}
#: Per stack, the last line whose faces were found one by one, and its faces.
_LAST_FACES: dict[tuple[Face, ...], tuple[str, list[Face]]] = {}


@lru_cache(maxsize=16)
def _hb_font(face: Face) -> hb.Font:
    return hb.Font(hb.Face(hb.Blob(fonts.font_bytes(face))))


def _shaped(face: Face, text: str, rtl: bool):
    """HarfBuzz's buffer of ``text`` shaped in ``face`` and the given
    direction, its glyphs in visual order."""
    buf = hb.Buffer()
    buf.add_str(text)
    buf.guess_segment_properties()
    buf.direction = "rtl" if rtl else "ltr"
    hb.shape(_hb_font(face), buf, FEATURES)
    return buf


def _needs_shaping(face: Face, rtl: bool) -> bool:
    return rtl or _script_face(face)


@lru_cache(maxsize=64)
def _script_face(face: Face) -> bool:
    """Whether ``face`` is a script's own (shaped) face, looked up once
    for each of the few faces shipped."""
    return any(face in styles.values() for styles in fonts.SCRIPT_FACES.values())


def shape_run(face: Face, text: str, rtl: bool) -> tuple[Glyph, ...]:
    """HarfBuzz's glyphs for ``text`` in ``face`` and the given direction,
    in visual order."""
    buf = _shaped(face, text, rtl)
    upem = fonts.units_per_em(face)
    return tuple([Glyph(info.codepoint, info.cluster, pos.x_advance / upem, pos.x_offset / upem,
                        pos.y_offset / upem)
                  for info, pos in zip(buf.glyph_infos, buf.glyph_positions)])


def _run(face: Face, text: str, level: int) -> Run:
    rtl = bool(level % 2)
    if _needs_shaping(face, rtl):
        glyphs = shape_run(face, text, rtl)
        return Run(face, text, rtl, True, glyphs, sum(g.x_advance_em for g in glyphs))
    return Run(face, text, False, False, (), sum(fonts.advance_em(face, ch) for ch in text))


#: Lines kept set: the labels a kit measures again for each place it tries.
@lru_cache(maxsize=4096)
def set_line(text: str, script: str, style: str, prefer_rtl: bool = False) -> Line:
    """``text`` (one line, logical order) set in ``style`` for a language
    written in ``script``; ``prefer_rtl`` for a right-to-left language.
    A plain line (:func:`plain_advances`) is set straight from its
    characters' advances and bounds; any other goes through the bidi
    algorithm, the choice of fonts and HarfBuzz (:func:`set_line_exact`),
    which would give the plain line the very same :class:`Line`."""
    stack = fonts.stack(script, style)
    if len(stack) == 1:
        line = _plain_line(text, stack[0])
        if line is not None:
            return line
    return set_line_exact(text, script, style, prefer_rtl)


#: Shaped and right-to-left lines kept set, which a class set measures
#: again for each kit (#12); wrapping no longer fills it (line_width_em).
@lru_cache(maxsize=8192)
def set_line_exact(text: str, script: str, style: str, prefer_rtl: bool = False) -> Line:
    """:func:`set_line` by the whole method, for any line."""
    stack = fonts.stack(script, style)
    rtl = _line_is_rtl(text, prefer_rtl)
    middle = fonts.middle_em(stack[0])
    if not text:
        return Line(text, (), 0.0, middle, middle, middle, rtl)
    visual = tuple(_visual_runs(text, stack, rtl))
    top, bottom = _ink(visual, middle)
    return Line(text, visual, sum(r.width_em for r in visual), middle, top, bottom, rtl)


def line_width_em(text: str, script: str, style: str, prefer_rtl: bool = False) -> float:
    """``set_line(text, script, style, prefer_rtl).width_em``, the same
    float, without making the glyphs or reading their ink: the runs'
    widths in visual order, added as :func:`set_line_exact` adds them.
    For wrapping a shaped paragraph, which tries many lines (#12); kept,
    since the pages' split wraps each paragraph at several sizes and
    widths, which try the same lines."""
    return _line_width_em(text, script, style, prefer_rtl)


@lru_cache(maxsize=65536)
def _line_width_em(text: str, script: str, style: str, prefer_rtl: bool) -> float:
    stack = fonts.stack(script, style)
    if not text or (len(stack) == 1 and _plain_chars(stack[0], text) is not None):
        return set_line(text, script, style, prefer_rtl).width_em
    return sum(_visual_runs(text, stack, _line_is_rtl(text, prefer_rtl), _run_width))


def _line_is_rtl(text: str, prefer_rtl: bool) -> bool:
    """The direction of a line.  P2 skips the isolates; a line of a
    right-to-left language with no strong letter of its own outside them
    keeps the language's direction (HL1)."""
    if _LTR_PLAIN_CHARS.issuperset(text):
        return False   # no right-to-left letter and no isolate: P2-P3 and HL1 find no R (#12)
    outer, found = isolates(text)
    if prefer_rtl and not _STRONG_R_CHARS.isdisjoint(outer):
        return True   # a right-to-left letter met before: HL1 (#12)
    outer = outer.replace(_STAND_IN, "")
    return paragraph_is_rtl(outer, prefer_rtl) or bool(prefer_rtl and found and not any(
        c in ("L", "R", "AL") for c in _classes(outer)))


#: Runs kept measured: a wrapped line's runs before its last word are
#: those of the shorter trial lines before it (#12).
@lru_cache(maxsize=16384)
def _run_width(face: Face, text: str, level: int) -> float:
    """``_run(face, text, level).width_em``, the same float, without
    making the run's glyphs."""
    rtl = bool(level % 2)
    if _needs_shaping(face, rtl):
        buf = _shaped(face, text, rtl)
        upem = fonts.units_per_em(face)
        return sum([pos.x_advance / upem for pos in buf.glyph_positions])
    return sum(fonts.advance_em(face, ch) for ch in text)


# -- plain lines -----------------------------------------------------------------

#: Bidirectional classes that leave a line without any right-to-left
#: letter or number at level 0 throughout (UAX #9: W1-W7 turn EN into L
#: when no R or AL precedes it, N1-N2 give neutrals the level of the L
#: around them, I1 keeps L at level 0); explicit embeddings, isolates
#: and R, AL, AN are not among them.
_PLAIN_CLASSES = frozenset({"L", "EN", "ES", "ET", "CS", "NSM", "BN", "B", "S", "WS", "ON"})

#: Per face, each character met so far: (advance, top, bottom) in em, or
#: False when a line holding it is not plain.  Filled as characters come,
#: so a worker only ever reads the glyphs its kits print.
_PLAIN_CHARS: dict[Face, dict[str, tuple[float, float, float] | bool]] = {}


def _plain_char(face: Face, ch: str):
    """(advance, top, bottom) in em of ``ch``'s glyph in ``face`` as
    :func:`_run` and :func:`_ink` read them (the top and bottom of a blank
    glyph at minus and plus infinity, which ``max`` and ``min`` pass
    over), or False when ``ch`` keeps a line from being plain."""
    table = _PLAIN_CHARS.setdefault(face, {})
    info = table.get(ch)
    if info is None:
        plain = (ch != _STAND_IN and fonts.has_char(face, ch)
                 and (unicodedata.bidirectional(ch) or "L") in _PLAIN_CLASSES)
        if not plain:
            info = False
        else:
            box = fonts.char_bounds_em(face, ch)
            top, bottom = (float("-inf"), float("inf")) if box is None else (box[3] + 0.0, box[1] + 0.0)
            info = (fonts.advance_em(face, ch), top, bottom)
        table[ch] = info
    return info


def _plain_chars(face: Face, text: str):
    """The :func:`_plain_char` of each character, or None when ``text``
    is not plain in ``face`` (a face that is shaped is never plain)."""
    if _needs_shaping(face, False):
        return None
    table = _PLAIN_CHARS.get(face) or {}
    get = table.get
    infos = list(map(get, text))   # looked up in C (#12); a character not met yet filled in
    if None in infos:
        infos = [info if info is not None else _plain_char(face, ch) for info, ch in zip(infos, text)]
    return infos if all(infos) else None


def plain_advances(text: str, script: str, style: str) -> list[float] | None:
    """The advance (em) of each character of ``text`` when it is a plain
    line in ``style`` for ``script``, else None.  A plain line is one
    font's glyphs, one to a character, left to right with their hmtx
    advances: the script's stack is a single font (Latin, Greek,
    Cyrillic: DejaVu) that holds every character and needs no shaping,
    and no character is right to left, an Arabic number, an embedding or
    an isolate.  Then every part of the line is plain too, and the width
    of ``text[i:j]`` as :func:`set_line` sets it is exactly
    ``sum(advances[i:j])`` (the same floats added in the same order), so
    a paragraph can be wrapped without setting every trial line."""
    stack = fonts.stack(script, style)
    if len(stack) != 1:
        return None
    infos = _plain_chars(stack[0], text)
    return None if infos is None else [info[0] for info in infos]


def _plain_line(text: str, face: Face) -> Line | None:
    """The :class:`Line` :func:`set_line_exact` makes of a plain ``text``:
    one unshaped run, left to right, its width the sum of the advances and
    its ink from the glyphs' bounds; None when ``text`` is not plain."""
    if not text:
        return None
    infos = _plain_chars(face, text)
    if infos is None:
        return None
    run = Run(face, text, False, False, (), sum([info[0] for info in infos]))
    middle = fonts.middle_em(face)
    top = max(middle, max([info[1] for info in infos]))
    bottom = min(middle, min([info[2] for info in infos]))
    return Line(text, (run,), sum(r.width_em for r in (run,)), middle, top, bottom, False)


def _visual_runs(text: str, stack: tuple[Face, ...], rtl: bool, make=None) -> list:
    """The runs of ``text`` as a paragraph of direction ``rtl``, in visual
    order; each isolate set as a paragraph of its own, its runs kept
    together where its stand-in character falls.  ``make(face, text,
    level)`` makes each run (:func:`_run`, or :func:`_run_width` for
    widths alone)."""
    make = make or _run
    outer, found = isolates(text)
    if not outer:
        return []
    levels = embedding_levels(outer, rtl)
    faces = _faces_for(outer, stack)
    if (not found and levels.count(levels[0]) == len(levels) and faces.count(faces[0]) == len(faces)
            and _STAND_IN not in outer):
        return [make(faces[0], outer, levels[0])]   # one face, one level: one run (#12)
    pieces: list[tuple[Face | None, int, str]] = []
    start = 0
    # Stretches of one face and level (grouped in C, #12), each stand-in
    # a piece of its own.
    for (face, level, stand_in), group in groupby(zip(faces, levels, map(_STAND_IN.__eq__, outer))):
        end = start + len(list(group))
        pieces += [(None, level, _STAND_IN)] * (end - start) if stand_in else [(face, level, outer[start:end])]
        start = end
    inner = iter(found)
    runs: list[list[Run]] = []
    for face, level, piece in pieces:
        if face is None:
            runs.append(_isolate_runs(*next(inner), stack, make))
        else:
            runs.append([make(face, piece, level)])
    order = visual_order([level for _, level, _ in pieces])
    return [run for k in order for run in runs[k]]


#: Isolates kept set: the numbers and names a right-to-left paragraph's
#: trial lines hold again and again (#12).
@lru_cache(maxsize=4096)
def _isolate_runs(initiator: str, content: str, stack: tuple[Face, ...], make) -> tuple:
    """The runs of an isolate's ``content`` as a paragraph of its own, in
    visual order: left to right for LRI, right to left for RLI, and for
    FSI the direction of its first strong character (P2-P3)."""
    inner_rtl = initiator == RLI or (initiator == FSI and paragraph_is_rtl(isolates(content)[0], False))
    return tuple(_visual_runs(content, stack, inner_rtl, make))


def _ink(runs, middle: float) -> tuple[float, float]:
    """Highest and lowest ink (em, from the baseline) of the runs' glyphs,
    from the glyph outlines' bounds."""
    top = bottom = middle
    for run in runs:
        face = run.face
        if run.shaped:
            for g in run.glyphs:
                box = fonts.glyph_bounds_em(face, g.gid)
                if box is not None:
                    dy = g.y_offset_em
                    top, bottom = max(top, box[3] + dy), min(bottom, box[1] + dy)
        else:
            for ch in run.text:
                box = fonts.char_bounds_em(face, ch)
                if box is not None:
                    top, bottom = max(top, box[3] + 0.0), min(bottom, box[1] + 0.0)
    return top, bottom

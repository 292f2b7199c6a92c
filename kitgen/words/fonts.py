"""Which shipped font draws which character.

Every printed string is set in one of three styles: ``label`` (words on
the parts), ``body`` (the text pages) and ``bold`` (titles, headings,
cautions).  A style is a stack of fonts: the font of the language's script
first, then DejaVu Sans, which covers Latin, Greek, Cyrillic and the signs
(degree, times, divide).  Each character is drawn by the first font of the
stack whose character map (read with fontTools) holds it, so an Arabic
page can still print a star's IAU name in Latin letters.  Only fonts in
``kitgen/fonts`` are used; none installed on the system is ever read.
"""

from __future__ import annotations

from functools import lru_cache
from importlib import resources
from typing import NamedTuple

from .glyph_bounds import font_metrics, pen_bounds, shipped_bounds, shipped_metrics

STYLES = ("label", "body", "bold")


class Face(NamedTuple):
    """One shipped font file; ``name`` is the name it is registered under.
    A named tuple, whose hash is C's: every measure looks a face up in
    caches, hundreds of thousands of times for a class set (#12)."""

    name: str
    filename: str


DEJAVU = {"label": Face("KitSansCondensed", "DejaVuSansCondensed.ttf"),
          "body": Face("KitSans", "DejaVuSans.ttf"),
          "bold": Face("KitSans-Bold", "DejaVuSans-Bold.ttf")}

#: The font of each script that DejaVu Sans does not draw well enough
#: (ISO 15924 codes).  Latin, Greek and Cyrillic are DejaVu's own.
SCRIPT_FACES = {
    "Arab": {"label": Face("KitArabic", "NotoSansArabic-Regular.ttf"),
             "body": Face("KitArabic", "NotoSansArabic-Regular.ttf"),
             "bold": Face("KitArabic-Bold", "NotoSansArabic-Bold.ttf")},
    "Deva": {"label": Face("KitDevanagari", "NotoSansDevanagari-Regular.ttf"),
             "body": Face("KitDevanagari", "NotoSansDevanagari-Regular.ttf"),
             "bold": Face("KitDevanagari-Bold", "NotoSansDevanagari-Bold.ttf")},
}


def all_faces() -> list[Face]:
    faces = {f.name: f for f in DEJAVU.values()}
    for styles in SCRIPT_FACES.values():
        faces.update({f.name: f for f in styles.values()})
    return list(faces.values())


def stack(script: str, style: str) -> tuple[Face, ...]:
    """The fonts that draw ``style`` text of a language written in ``script``."""
    own = SCRIPT_FACES.get(script)
    return (own[style], DEJAVU[style]) if own else (DEJAVU[style],)


@lru_cache(maxsize=None)
def fallbacks(stack_: tuple[Face, ...]) -> tuple[Face, ...]:
    """The other scripts' fonts, of the stack's style, for a character
    that no font of ``stack_`` holds: a pupil's name in Devanagari on an
    English kit, or in Arabic letters that DejaVu lacks (#12).  Only such
    characters go to them, so a text the stack draws is drawn as before."""
    style = next(s for s, face in DEJAVU.items() if face in stack_)
    return tuple(faces[style] for faces in SCRIPT_FACES.values() if faces[style] not in stack_)


def font_path(face: Face):
    """A context manager giving the font file's path (importlib.resources)."""
    return resources.as_file(resources.files("kitgen").joinpath("fonts", face.filename))


@lru_cache(maxsize=None)
def font_bytes(face: Face) -> bytes:
    return resources.files("kitgen").joinpath("fonts", face.filename).read_bytes()


@lru_cache(maxsize=None)
def _metrics(face: Face):
    """(character map, advance widths by glyph name, glyph order, units
    per em, ascent, descent): shipped (kitgen.words.glyph_bounds), else
    read with fontTools."""
    data = font_bytes(face)
    return shipped_metrics(face.filename, data) or font_metrics(data)


def cmap(face: Face) -> dict[int, str]:
    """The font's character map (code point -> glyph name), from fontTools."""
    return _metrics(face)[0]


def has_char(face: Face, ch: str) -> bool:
    return ord(ch) in _metrics(face)[0]


def advance_em(face: Face, ch: str) -> float:
    """Advance width of one character's glyph (hmtx), in em."""
    cm, hmtx, _, upem, _, _ = _metrics(face)
    return hmtx[cm[ord(ch)]] / upem


def glyph_advance_em(face: Face, gid: int) -> float:
    _, hmtx, order, upem, _, _ = _metrics(face)
    return hmtx[order[gid]] / upem


@lru_cache(maxsize=None)
def _glyph_set(face: Face):
    import io

    from fontTools.ttLib import TTFont

    return TTFont(io.BytesIO(font_bytes(face)), lazy=True).getGlyphSet()


@lru_cache(maxsize=65536)
def glyph_bounds_em(face: Face, gid: int):
    """(xmin, ymin, xmax, ymax) of a glyph's outline in em, or None for a
    blank glyph (fontTools BoundsPen): from the shipped table
    (kitgen.words.glyph_bounds), else drawn into the pen."""
    shipped = shipped_bounds(face.filename, font_bytes(face))
    if shipped is not None:
        bounds = shipped[gid]
        return None if bounds[0] != bounds[0] else tuple(v / units_per_em(face) for v in bounds)   # NaN: blank
    bounds = pen_bounds(_glyph_set(face), _metrics(face)[2][gid])
    return None if bounds is None else tuple(v / units_per_em(face) for v in bounds)


def char_bounds_em(face: Face, ch: str):
    _, _, order, _, _, _ = _metrics(face)
    name = cmap(face)[ord(ch)]
    return glyph_bounds_em(face, _gid_of(face, name))


def preload(face: Face) -> None:
    """Read the face's metrics and shipped glyph bounds now, as its first
    label would (a class set's main process, so that the workers it
    forks start with them: each had read them again, about 5 ms a face)."""
    shipped_bounds(face.filename, font_bytes(face))
    _gid_index(face)


@lru_cache(maxsize=None)
def _gid_index(face: Face) -> dict:
    return {name: k for k, name in enumerate(_metrics(face)[2])}


def _gid_of(face: Face, name: str) -> int:
    return _gid_index(face)[name]


def middle_em(face: Face) -> float:
    """Height (em) above the baseline of the middle of a line: half the
    font's hhea ascent plus descent, as reportlab centres a line."""
    _, _, _, upem, asc, desc = _metrics(face)
    return (asc + desc) / 2 / upem


def units_per_em(face: Face) -> int:
    return _metrics(face)[3]


def missing_chars(text: str, faces) -> set[str]:
    """Characters of ``text`` that no font of ``faces`` holds (format and
    joining controls, which draw nothing, excepted); each character
    looked at once, however often the text has it.  A face's character
    map is read only while some character is still missing: a class set's
    rows, checked against their language's fonts and then the other
    scripts' (:func:`fallbacks`), read the other scripts' maps only for a
    name that needs them, where reading them all took about 12 ms before
    the first kit (#12)."""
    left = {ch for ch in set(text) if not _invisible(ch)}
    for face in faces:
        if not left:
            break
        char_map = _metrics(face)[0]
        left = {ch for ch in left if ord(ch) not in char_map}
    return left


def _invisible(ch: str) -> bool:
    import unicodedata

    return unicodedata.category(ch) in ("Cf", "Cc") or ch in "\n"

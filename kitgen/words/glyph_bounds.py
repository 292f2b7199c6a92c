"""Every shipped font's glyph outline bounds, computed once and shipped (#12).

A label's box and the ink checks need each glyph's outline bounds
(fontTools' ``BoundsPen``: the tight box of the outline, curves' extremes
included).  Drawing an outline into the pen costs about half a
millisecond, and a kit's first label of a script decompiles the font's
``glyf`` table; a class set of many languages paid that in every worker.
So the bounds of every glyph of every font in ``kitgen/fonts`` are worked
out once, by ``tools/build_glyph_bounds.py`` with :func:`outline_bounds`
(the very computation :mod:`kitgen.words.fonts` would make), and shipped
in ``kitgen/fonts/glyph-bounds.npz``: per font file an array of
(xmin, ymin, xmax, ymax) in font units by glyph id (NaN for a blank
glyph) and the SHA-256 of the file it was made from.  A font whose file
no longer matches is measured with the pen as before.
"""

from __future__ import annotations

import hashlib
import io
from functools import lru_cache
from importlib import resources

import numpy as np

TABLE_NAME = "glyph-bounds.npz"


def outline_bounds(font_data: bytes) -> np.ndarray:
    """The bounds of every glyph of a TrueType font (file bytes), in font
    units, by glyph id; a blank glyph's row NaN (fontTools BoundsPen)."""
    from fontTools.ttLib import TTFont

    font = TTFont(io.BytesIO(font_data), lazy=True)
    glyphs = font.getGlyphSet()
    order = font.getGlyphOrder()
    out = np.full((len(order), 4), np.nan)
    for gid, name in enumerate(order):
        bounds = pen_bounds(glyphs, name)
        if bounds is not None:
            out[gid] = bounds
    return out


def pen_bounds(glyphs, name: str):
    """One glyph's outline bounds in font units, or None for a blank glyph:
    the glyph (of fontTools glyph set ``glyphs``) drawn into a BoundsPen."""
    from fontTools.pens.boundsPen import BoundsPen

    pen = BoundsPen(glyphs)
    glyphs[name].draw(pen)
    return pen.bounds


def file_digest(font_data: bytes) -> str:
    return hashlib.sha256(font_data).hexdigest()


@lru_cache(maxsize=1)
def _table():
    path = resources.files("kitgen").joinpath("fonts", TABLE_NAME)
    if not path.is_file():
        return None
    return np.load(io.BytesIO(path.read_bytes()))


@lru_cache(maxsize=None)
def shipped_bounds(filename: str, font_data: bytes):
    """The shipped bounds of the font file ``filename`` (its bytes
    ``font_data``), as a list of rows by glyph id ([xmin, ymin, xmax,
    ymax] in font units, NaN for a blank glyph), or None where none are
    shipped for these very bytes."""
    table = _table()
    if table is None or f"{filename}:bounds" not in table.files:
        return None
    if str(table[f"{filename}:sha256"]) != file_digest(font_data):
        return None
    return table[f"{filename}:bounds"].tolist()

"""Every shipped font's glyph outline bounds and metrics, computed once and shipped (#12).

A label's box and the ink checks need each glyph's outline bounds
(fontTools' ``BoundsPen``: the tight box of the outline, curves' extremes
included).  Drawing an outline into the pen costs about half a
millisecond, and a kit's first label of a script decompiles the font's
``glyf`` table; a class set of many languages paid that in every worker.
Reading a font's character map, glyph order and advances with fontTools
costs every process 30 to 70 ms a DejaVu face too.  So both are worked
out once, by ``tools/build_glyph_bounds.py`` with :func:`outline_bounds`
and :func:`font_metrics` (the very computations :mod:`kitgen.words.fonts`
would make), and shipped in ``kitgen/fonts/glyph-bounds.npz``: per font
file an array of (xmin, ymin, xmax, ymax) in font units by glyph id (NaN
for a blank glyph), its character map, glyph names, advances and
header figures, and the SHA-256 of the file they were made from.  A font
whose file no longer matches is read with fontTools as before.
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


def font_metrics(font_data: bytes) -> tuple:
    """(character map: code point -> glyph name, advance widths by glyph
    name, glyph order, units per em, hhea ascent, hhea descent) of a
    TrueType font (file bytes), read with fontTools."""
    from fontTools.ttLib import TTFont

    font = TTFont(io.BytesIO(font_data), lazy=True)
    cmap = dict(font.getBestCmap())
    hmtx = {name: adv for name, (adv, _) in font["hmtx"].metrics.items()}
    return cmap, hmtx, font.getGlyphOrder(), font["head"].unitsPerEm, font["hhea"].ascent, font["hhea"].descent


def metrics_arrays(metrics: tuple) -> dict:
    """:func:`font_metrics` as arrays for the shipped table: the character
    map as (code point, glyph id) rows, the glyph names, the advances by
    glyph id and (units per em, ascent, descent)."""
    cmap, hmtx, order, upem, asc, desc = metrics
    gid = {name: k for k, name in enumerate(order)}
    return {"cmap": np.array(sorted((code, gid[name]) for code, name in cmap.items()), dtype=np.int64),
            "names": np.array(order), "advances": np.array([hmtx[name] for name in order], dtype=np.int64),
            "head": np.array([upem, asc, desc], dtype=np.int64)}


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


@lru_cache(maxsize=None)
def shipped_metrics(filename: str, font_data: bytes):
    """The shipped :func:`font_metrics` of the font file ``filename`` (its
    bytes ``font_data``), or None where none are shipped for these very
    bytes."""
    table = _table()
    if table is None or f"{filename}:names" not in table.files:
        return None
    if str(table[f"{filename}:sha256"]) != file_digest(font_data):
        return None
    order = table[f"{filename}:names"].tolist()
    cmap = {code: order[gid] for code, gid in table[f"{filename}:cmap"].tolist()}
    hmtx = dict(zip(order, table[f"{filename}:advances"].tolist()))
    upem, asc, desc = table[f"{filename}:head"].tolist()
    return cmap, hmtx, order, upem, asc, desc

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
header figures, and the SHA-256 of the file they were made from, each in
the form quickest to read back (:func:`metrics_arrays`: names and digest
as one UTF-8 text each, the character map as two arrays of numbers),
about 3 ms a face where arrays of strings had taken 7.  A font
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
    """:func:`font_metrics` as arrays for the shipped table, in the forms
    quickest to read back (:func:`shipped_metrics`): the character map as
    its code points and their glyph ids, the glyph names as one UTF-8
    text a name a line, the advances by glyph id and (units per em,
    ascent, descent)."""
    cmap, hmtx, order, upem, asc, desc = metrics
    gid = {name: k for k, name in enumerate(order)}
    codes = sorted(cmap)
    return {"cmap_codes": np.array(codes, dtype=np.int32),
            "cmap_gids": np.array([gid[cmap[code]] for code in codes], dtype=np.int32),
            "names": text_array("\n".join(order)),
            "advances": np.array([hmtx[name] for name in order], dtype=np.int32),
            "head": np.array([upem, asc, desc], dtype=np.int64)}


def text_array(text: str) -> np.ndarray:
    """``text`` as an array of its UTF-8 bytes (read back whole by
    :func:`_text`, where an array of strings is read a string at a time)."""
    return np.frombuffer(text.encode("utf-8"), dtype=np.uint8)


def _text(array: np.ndarray) -> str:
    return array.tobytes().decode("utf-8")


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
def _shipped_for(filename: str, font_data: bytes) -> bool:
    """Whether the table holds the font file ``filename`` as these very
    bytes ``font_data`` (its SHA-256), worked out once a file."""
    table = _table()
    key = f"{filename}:sha256"
    return table is not None and key in table.files and _text(table[key]) == file_digest(font_data)


@lru_cache(maxsize=None)
def shipped_bounds(filename: str, font_data: bytes):
    """The shipped bounds of the font file ``filename`` (its bytes
    ``font_data``), as a list of rows by glyph id ([xmin, ymin, xmax,
    ymax] in font units, NaN for a blank glyph), or None where none are
    shipped for these very bytes."""
    if not _shipped_for(filename, font_data):
        return None
    return _table()[f"{filename}:bounds"].tolist()


@lru_cache(maxsize=None)
def shipped_metrics(filename: str, font_data: bytes):
    """The shipped :func:`font_metrics` of the font file ``filename`` (its
    bytes ``font_data``), or None where none are shipped for these very
    bytes."""
    if not _shipped_for(filename, font_data):
        return None
    table = _table()
    order = _text(table[f"{filename}:names"]).split("\n")
    gids = table[f"{filename}:cmap_gids"].tolist()
    cmap = dict(zip(table[f"{filename}:cmap_codes"].tolist(), map(order.__getitem__, gids)))
    hmtx = dict(zip(order, table[f"{filename}:advances"].tolist()))
    upem, asc, desc = table[f"{filename}:head"].tolist()
    return cmap, hmtx, order, upem, asc, desc

#!/usr/bin/env python3
"""Build kitgen/fonts/glyph-bounds.npz: every shipped font's glyph bounds and metrics.

For each TrueType file in kitgen/fonts, the outline bounds of every glyph
by glyph id, from fontTools' BoundsPen (kitgen.words.glyph_bounds
.outline_bounds), its character map, glyph names, advances and header
figures (.font_metrics), with the SHA-256 of the file.  Run from the repository
root after adding or changing a font (about 12 s):

    python3 tools/build_glyph_bounds.py
"""

from __future__ import annotations

import io
from pathlib import Path

import numpy as np

from kitgen.words.glyph_bounds import TABLE_NAME, file_digest, font_metrics, metrics_arrays, outline_bounds, text_array

FONTS = Path(__file__).resolve().parents[1] / "kitgen" / "fonts"


def main() -> None:
    arrays = {}
    for path in sorted(FONTS.glob("*.ttf")):
        data = path.read_bytes()
        arrays[f"{path.name}:bounds"] = outline_bounds(data)
        arrays[f"{path.name}:sha256"] = text_array(file_digest(data))
        for key, array in metrics_arrays(font_metrics(data)).items():
            arrays[f"{path.name}:{key}"] = array
    buf = io.BytesIO()
    np.savez_compressed(buf, **arrays)
    (FONTS / TABLE_NAME).write_bytes(buf.getvalue())
    print(f"{FONTS / TABLE_NAME}: {len(list(FONTS.glob('*.ttf')))} fonts, {len(buf.getvalue())} bytes")


if __name__ == "__main__":
    main()

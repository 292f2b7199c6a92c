"""Previews: a PNG picture of every page of the kit's PDF.

The PDF is rendered by PDFium, the PDF engine of the Chromium browser,
through the ``pypdfium2`` package (installed with kitgen; no system tool
to install by hand), so the picture shows what a PDF reader will show.
The PNG file is written here with the standard library (PNG, ISO/IEC
15948:2004: signature, IHDR, tEXt, IDAT of zlib-compressed scanlines
with filter type 0, IEND), with a tEXt chunk ``Software`` = ``kitgen``
that marks it as kitgen's own (kitgen.outfile).  The same PDF and
resolution give the same bytes.
"""

from __future__ import annotations

import struct
import zlib

import numpy as np

#: Resolutions allowed (dots per inch): enough to look at, small enough to
#: mail; 1 pt = 1/72 in.
DEFAULT_DPI = 100.0
MIN_DPI, MAX_DPI = 30.0, 300.0

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def _chunk(kind: bytes, data: bytes) -> bytes:
    return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data) & 0xFFFFFFFF)


def encode_png(rgb: np.ndarray) -> bytes:
    """An 8-bit RGB image (height x width x 3, uint8) as PNG bytes."""
    h, w, channels = rgb.shape
    if channels != 3:
        raise ValueError("encode_png takes RGB images")
    rows = np.concatenate([np.zeros((h, 1), dtype=np.uint8), rgb.reshape(h, w * 3).astype(np.uint8)], axis=1)
    header = struct.pack(">IIBBBBB", w, h, 8, 2, 0, 0, 0)   # 8 bits, truecolour, deflate, filter 0, no interlace
    return (PNG_SIGNATURE + _chunk(b"IHDR", header) + _chunk(b"tEXt", b"Software\x00kitgen")
            + _chunk(b"IDAT", zlib.compress(rows.tobytes(), 6)) + _chunk(b"IEND", b""))


def render_previews(pdf: bytes, dpi: float = DEFAULT_DPI) -> list[bytes]:
    """One PNG (bytes) per page of the PDF, at ``dpi``."""
    import pypdfium2 as pdfium

    doc = pdfium.PdfDocument(pdf)
    try:
        out = []
        for k in range(len(doc)):
            page = doc[k]
            bitmap = page.render(scale=dpi / 72.0, rev_byteorder=True)
            pixels = np.array(bitmap.to_numpy(), dtype=np.uint8)
            out.append(encode_png(np.ascontiguousarray(pixels[:, :, :3])))
            page.close()
        return out
    finally:
        doc.close()

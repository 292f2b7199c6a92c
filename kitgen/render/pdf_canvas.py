"""The reportlab canvas every kitgen PDF is drawn on, made one way.

Invariant (a fixed creation date and document id), so that the same
pages give the same bytes; page streams Flate-compressed (ISO 32000-1:2008,
7.4.4); and no ASCII85 layer over the streams (7.4.3): that filter keeps
a file 7-bit clean for mail systems of old, which no printer or viewer
needs, and costs a quarter more bytes and the time to encode them (#12).
"""

from __future__ import annotations

from reportlab import rl_config
from reportlab.pdfgen.canvas import Canvas


def new_canvas(out, size_pt: tuple[float, float], **options) -> Canvas:
    """A canvas writing to ``out`` (a file object), its first page
    ``size_pt`` (width, height in points); ``options`` go to reportlab's
    :class:`~reportlab.pdfgen.canvas.Canvas` (language, first font)."""
    # reportlab reads this setting when it writes each stream, not per
    # canvas; every PDF kitgen makes is made through here, so it holds.
    rl_config.useA85 = 0
    return Canvas(out, pagesize=size_pt, invariant=1, pageCompression=1, **options)

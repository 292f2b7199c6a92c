"""The reportlab canvas every kitgen PDF is drawn on, made one way.

Invariant (a fixed creation date and document id), so that the same
pages give the same bytes; page streams Flate-compressed (ISO 32000-1:2008,
7.4.4); and no ASCII85 layer over the streams (7.4.3): that filter keeps
a file 7-bit clean for mail systems of old, which no printer or viewer
needs, and costs a quarter more bytes and the time to encode them (#12).
"""

from __future__ import annotations

import re

import numpy as np
from reportlab import rl_config
from reportlab.lib.rl_accel import fp_str
from reportlab.pdfgen.canvas import Canvas


def new_canvas(out, size_pt: tuple[float, float], **options) -> Canvas:
    """A canvas writing to ``out`` (a file object), its first page
    ``size_pt`` (width, height in points); ``options`` go to reportlab's
    :class:`~reportlab.pdfgen.canvas.Canvas` (language, first font)."""
    # reportlab reads this setting when it writes each stream, not per
    # canvas; every PDF kitgen makes is made through here, so it holds.
    rl_config.useA85 = 0
    return Canvas(out, pagesize=size_pt, invariant=1, pageCompression=1, **options)


#: A decimal number as reportlab writes it in an operator.
_NUMBER = re.compile(r"-?\d*\.\d+")


def _thousandths(match) -> str:
    text = f"{round(float(match.group()), 3):.3f}".rstrip("0").rstrip(".")
    if text in ("-0", ""):
        return "0"
    return text.replace("0.", ".", 1) if text.startswith(("0.", "-0.")) else text


def pt_text(value_pt: float) -> str:
    """A number of points as kitgen's line and dot operators write it: to
    the thousandth of a point (0.35 micrometres, far below any printer's
    dot), without trailing zeros or a leading zero, and nothing beyond
    (reportlab's ``fp_str`` writes seven significant digits): fewer bytes
    (#12).  The digits are those of reportlab's ``fp_str`` rounded to the
    thousandth, which is what rounding the number itself gives unless
    ``fp_str``'s own rounding (to at least four decimals below 1000 pt)
    moved it onto a half thousandth; only those numbers, and the ones
    below a thousandth or from 999 pt up, are written both ways."""
    size = value_pt if value_pt >= 0.0 else -value_pt
    if 0.001 <= size < 999.0:
        tie = abs(size * 1000.0 % 1.0 - 0.5)
        if tie > (0.006 if size < 99.0 else 0.06):
            text = ("%.3f" % value_pt).rstrip("0").rstrip(".")
            if text[0] == "0":
                return text[1:]
            return "-" + text[2:] if text.startswith("-0") else text
    return _NUMBER.sub(_thousandths, fp_str(value_pt))


#: The formats of :func:`pt_texts`, by a number's size: one written one
#: by one (``%s``), and three decimals with their trailing zeros left
#: out (``%g``'s significant digits) from 1, 10 and 100 pt on.
_FORMATS = np.array(["%s\n", "%.4g\n", "%.5g\n", "%.6g\n"])
_FORMAT_FROM_PT = np.array([1.0, 10.0, 100.0])


def pt_texts(values_pt) -> list[str]:
    """:func:`pt_text` of each of many numbers (a part's lines), written
    in one formatting, each number from 1 pt up in the ``%g`` format that
    gives it three decimals, those below 1 pt or from 999 pt up, and
    those that :func:`pt_text` would write both ways, one by one: a
    fraction of the cost (#12).  Between 101 and 999 pt ``fp_str``
    writes four decimals, so a number near a half thousandth is written
    in the ``%g`` format unless its fourth decimal is a 5, and then as
    those four decimals rounded to the thousandth."""
    values = list(values_pt)
    size = np.abs(np.asarray(values, dtype=float))
    tie = np.abs(size * 1000.0 % 1.0 - 0.5)
    kind = np.searchsorted(_FORMAT_FROM_PT, size, side="right")
    plain = (size >= 1.0) & (size < 999.0) & (tie > np.where(size < 99.0, 0.006, 0.06))
    for i in np.flatnonzero(~plain).tolist():
        value = values[i]
        size = abs(value)
        if 101.0 <= size < 999.0:
            four = "%.4f" % value
            if four[-1] != "5":
                continue
            # fp_str's four decimals rounded to the thousandth.
            values[i] = ("%.3f" % round(float(four), 3)).rstrip("0").rstrip(".")
        else:
            # Below 1e-8 fp_str writes 0 whatever the sign.
            values[i] = "0" if size < 1e-8 else pt_text(value)
        kind[i] = 0
    texts = ("".join(_FORMATS[kind].tolist()) % tuple(values)).split("\n")
    texts.pop()
    return texts

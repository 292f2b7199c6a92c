"""The line and dot operators' numbers (render.pdf_canvas, #12) are
reportlab's own numbers rounded to the thousandth of a point.

Reference: reportlab's ``fp_str`` (``reportlab/lib/rl_accel.py``: each
number to at most six decimals, fewer from 10 pt up, trailing zeros and
a leading zero dropped), its digits then rounded half to even to three
decimals by Python's ``round`` (the Python language reference, built-in
functions), trailing zeros and the leading zero dropped again, and a
negative zero written ``0``.
"""

from __future__ import annotations

import random
import re

from reportlab.lib.rl_accel import fp_str

from kitgen.render.pdf_canvas import pt_text, pt_texts


def _reference(value_pt: float) -> str:
    def rounded(match) -> str:
        text = f"{round(float(match.group()), 3):.3f}".rstrip("0").rstrip(".")
        if text in ("-0", ""):
            return "0"
        return text.replace("0.", ".", 1) if text.startswith(("0.", "-0.")) else text
    return re.sub(r"-?\d*\.\d+", rounded, fp_str(value_pt))


def _values() -> list[float]:
    rnd = random.Random(12)
    # Residues of a float sum beside a zero (a centre at the pin), below
    # and above where fp_str writes 0 for either sign.
    values = [1e-15, -1.6e-14, -3e-9, 9.9e-9, -9.9e-9, -1.4e-7, 1.4e-7]
    values += [0.0, -0.0, 2e-7, -4e-7, 0.0004, -0.0005, 0.0015, 1.0, 9.9995, 10.0, 99.99995, 100.0, 100.9995,
              101.0005, 998.9995, 999.0, 1000.0, 1000.0005, 12345.678]
    for _ in range(20000):
        v = rnd.choice((1, -1)) * 10 ** rnd.uniform(-4, 4.2)
        tie = round(v, 3) + rnd.choice((0.0005, -0.0005))
        # A number near a half thousandth, where rounding twice may differ
        # from rounding once.
        values += [v, tie, tie + rnd.uniform(-1e-4, 1e-4), tie + rnd.uniform(-1e-6, 1e-6)]
    return values


def test_one_number_as_reportlab_rounded():
    values = _values()
    assert [pt_text(v) for v in values] == [_reference(v) for v in values]
    assert pt_text(-0.0002) == "0" and pt_text(0.25) == ".25" and pt_text(-12.5) == "-12.5"


def test_many_numbers_as_one_by_one():
    values = _values()
    assert pt_texts(values) == [_reference(v) for v in values]
    assert pt_texts([1.0, 283.46456692913387, -0.5]) == ["1", "283.465", "-.5"]

"""The PDF and the SVG of one kit draw the same things (#8): per part, the
same number of painted primitives in each stroke class, and nothing
invisible or of zero width in either.

The PDF is read with pypdf's content-stream parser by the rules of PDF
32000-1:2008: 14.6 (marked content: BDC ... EMC, here the ``/KitPart``
sequence whose properties name the part), 8.4.2-8.4.3 (q/Q save and
restore the graphics state, with ``w`` the line width and ``d`` the dash
pattern), 8.5.3 (the path-painting operators: S, s stroke; f, F, f* fill;
B, B*, b, b* both; n paints nothing) and 8.6.8 (G, g, RG, rg, K, k:
stroke and fill colours).  The SVG is read with xml.etree by the attribute
meanings of SVG 1.1 (see tests/test_svg_for_cutters.py).
"""

from __future__ import annotations

import io
import xml.etree.ElementTree as ET
from collections import Counter, defaultdict

import pypdf
import pytest
from pypdf.generic import ContentStream

from kitgen.geometry import style
from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.pdf import build_pdf
from kitgen.render.svg import render_svg_files

from .test_svg_for_cutters import painted, visible

PT_PER_MM = 72.0 / 25.4
STROKE_OPS = {"S", "s", "B", "B*", "b", "b*"}
FILL_OPS = {"f", "F", "f*", "B", "B*", "b", "b*"}
CLASSES = ("cut", "fold", "heavy", "medium", "light", "fine")


def pdf_paints(data: bytes):
    """``{part id: [(operator, line width in mm, dashed, stroke colour, fill
    colour)]}`` for every painting operator inside a part's marked content."""
    reader = pypdf.PdfReader(io.BytesIO(data))
    out = defaultdict(list)
    for page in reader.pages:
        state = {"w": 1.0, "dash": False, "stroke": (0.0,), "fill": (0.0,)}
        stack, parts = [], []
        for operands, op in ContentStream(page.get_contents(), reader).operations:
            op = op.decode() if isinstance(op, bytes) else op
            if op == "q":
                stack.append(dict(state))
            elif op == "Q":
                state = stack.pop()
            elif op == "w":
                state["w"] = float(operands[0])
            elif op == "d":
                state["dash"] = len(operands[0]) > 0
            elif op in ("G", "RG", "K"):
                state["stroke"] = tuple(float(v) for v in operands)
            elif op in ("g", "rg", "k"):
                state["fill"] = tuple(float(v) for v in operands)
            elif op == "BDC":
                tag, props = operands
                parts.append(str(props["/Part"]) if tag == "/KitPart" else None)
            elif op == "BMC":
                parts.append(None)
            elif op == "EMC":
                parts.pop()
            elif (op in STROKE_OPS or op in FILL_OPS) and any(parts):
                part = next(p for p in reversed(parts) if p)
                out[part].append((op, state["w"] / PT_PER_MM, state["dash"], state["stroke"], state["fill"]))
    return out


def _white(colour) -> bool:
    return all(abs(v - 1.0) < 1e-9 for v in colour) and len(colour) in (1, 3)


def pdf_class(paint, dims) -> str:
    op, width_mm, dashed, _, _ = paint
    if op not in STROKE_OPS:
        return "dot"
    match = [c for c in CLASSES if abs(style.stroke_style(c, dims).width_mm - width_mm) < 1e-4
             and bool(style.stroke_style(c, dims).dash_mm) == dashed]
    assert len(match) == 1, (width_mm, dashed, match)
    return match[0]


@pytest.fixture(scope="module", params=["latitude: 52.2\nepoch: 2027\n",
                                        "latitude: -33.9\nepoch: 2027\ncolour: true\nlanguage: hi\n"])
def kit_outputs(request):
    kit = build_kit(parse_recipe_text(request.param))
    pdf = build_pdf(kit)[1]
    svgs = {name[:-4]: ET.fromstring(data) for name, data in render_svg_files(kit).items()}
    return kit, pdf_paints(pdf), svgs


def test_the_same_primitives_per_part_and_stroke_class(kit_outputs):
    kit, paints, svgs = kit_outputs
    assert set(paints) == {p.id for p in kit.parts} == set(svgs)
    for part in kit.parts:
        in_pdf = Counter(pdf_class(p, kit.dims) for p in paints[part.id])
        in_svg = Counter(klass for tag, node, props, klass in painted(svgs[part.id]) if tag != "text")
        assert in_pdf == in_svg, (part.id, in_pdf - in_svg, in_svg - in_pdf)
        assert sum(in_svg.values()) > 3, part.id


def test_nothing_invisible_or_of_zero_width_in_the_pdf(kit_outputs):
    kit, paints, _ = kit_outputs
    for part_id, items in paints.items():
        for op, width_mm, dashed, stroke, fill in items:
            if op in STROKE_OPS:
                assert width_mm >= 0.1 - 1e-9, (part_id, width_mm)   # style.py's floor
                assert not _white(stroke), part_id
            else:
                assert not _white(fill), part_id


def test_nothing_invisible_or_of_zero_width_in_the_svg(kit_outputs):
    _, _, svgs = kit_outputs
    for part_id, root in svgs.items():
        for tag, node, props, klass in painted(root):
            assert visible(tag, props), (part_id, tag)
            if props["stroke"] != "none":
                assert float(props["stroke-width"]) > 0, (part_id, tag)

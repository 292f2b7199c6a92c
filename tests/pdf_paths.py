"""Read back what a PDF page draws: paths and text with their transforms.

An independent reading of the content stream by pypdf, following the PDF
specification (ISO 32000-1:2008): 8.4.4 (q, Q, cm: the current
transformation matrix, row-vector convention p' = p x M), 8.5.2 (path
construction: m, l, c, v, y, re, h), 8.5.3 (painting: S, s, f, F, f*, B,
B*, b, b*, n; clipping W, W*), 8.4.3.2 (w, the line width, in user space)
and 9.4 (text objects: BT, ET, Tf, Tm, Td, TD, T*, Tj, TJ; the text
rendering matrix is Tm x CTM, 9.4.4).
"""

from __future__ import annotations

from dataclasses import dataclass

from pypdf.generic import ContentStream

IDENTITY = (1.0, 0.0, 0.0, 1.0, 0.0, 0.0)


def mul(m, n):
    """m then n: the matrix product m x n of the PDF's row-vector convention."""
    a, b, c, d, e, f = m
    A, B, C, D, E, F = n
    return (a * A + b * C, a * B + b * D, c * A + d * C, c * B + d * D, e * A + f * C + E, e * B + f * D + F)


def apply(m, x, y):
    a, b, c, d, e, f = m
    return (a * x + c * y + e, b * x + d * y + f)


@dataclass
class Path:
    ctm: tuple            # the CTM when the path was painted
    points: list          # the path's points in user space (as written), control points too
    nodes: list           # the points on the path itself: ends of lines and curves, corners
    op: str               # the painting operator
    line_width: float     # in user space
    clip: bool = False

    def device_points(self):
        return [apply(self.ctm, x, y) for x, y in self.points]

    def device_nodes(self):
        return [apply(self.ctm, x, y) for x, y in self.nodes]


@dataclass
class Text:
    matrix: tuple         # text rendering matrix (Tm x CTM) at the show
    size: float           # Tf size (text space)
    ctm: tuple


def read_page(reader, page) -> tuple[list[Path], list[Text]]:
    ctm = IDENTITY
    stack = []
    width = 1.0
    width_stack = []
    paths, texts = [], []
    current: list = []
    nodes: list = []
    clip_pending = False
    tm = tlm = IDENTITY
    size = 0.0
    leading = 0.0
    for operands, op in ContentStream(page.get_contents(), reader).operations:
        op = op.decode() if isinstance(op, bytes) else op
        v = [float(x) for x in operands] if op in ("cm", "m", "l", "c", "v", "y", "re", "w", "Tm", "Td", "TD",
                                                  "TL") else operands
        if op == "q":
            stack.append(ctm)
            width_stack.append(width)
        elif op == "Q":
            ctm = stack.pop()
            width = width_stack.pop()
        elif op == "cm":
            ctm = mul(tuple(v), ctm)
        elif op == "w":
            width = v[0]
        elif op in ("m", "l"):
            current.append((v[0], v[1]))
            nodes.append((v[0], v[1]))
        elif op == "c":
            current += [(v[0], v[1]), (v[2], v[3]), (v[4], v[5])]
            nodes.append((v[4], v[5]))
        elif op in ("v", "y"):
            current += [(v[0], v[1]), (v[2], v[3])]
            nodes.append((v[2], v[3]))
        elif op == "re":
            x, y, w, h = v
            corners = [(x, y), (x + w, y), (x + w, y + h), (x, y + h)]
            current += corners
            nodes += corners
        elif op in ("W", "W*"):
            clip_pending = True
        elif op in ("S", "s", "f", "F", "f*", "B", "B*", "b", "b*", "n"):
            if current:
                paths.append(Path(ctm, current, nodes, op, width, clip_pending))
            current, nodes = [], []
            clip_pending = False
        elif op == "BT":
            tm = tlm = IDENTITY
        elif op == "Tf":
            size = float(operands[1])
        elif op == "TL":
            leading = v[0]
        elif op == "Tm":
            tm = tlm = tuple(v)
        elif op in ("Td", "TD"):
            tlm = mul((1.0, 0.0, 0.0, 1.0, v[0], v[1]), tlm)
            tm = tlm
            if op == "TD":
                leading = -v[1]
        elif op == "T*":
            tlm = mul((1.0, 0.0, 0.0, 1.0, 0.0, -leading), tlm)
            tm = tlm
        elif op in ("Tj", "TJ", "'", '"'):
            texts.append(Text(mul(tm, ctm), size, ctm))
    return paths, texts

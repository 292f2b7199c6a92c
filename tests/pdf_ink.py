"""Where a PDF page puts ink: every glyph's ink box and every stroked or
filled path, read from the page's own content stream and embedded fonts,
and the places where a drawn line runs over a printed character.

An independent reading of the PDF (nothing from kitgen's geometry model),
by the rules of ISO 32000-1:2008:

- 8.4 graphics state: q, Q, cm (the CTM, row vectors: p' = p x M, 8.3.4),
  w (line width, user space, 8.4.3.2), d (dash pattern, restarted at each
  subpath, 8.4.3.6), G g RG rg K k (colours, 8.6.8), gs (ignored: kitgen's
  states set no line width or dashes);
- 8.5 paths: m l c v y h re, painted by S s f F f* B B* b b* n, and
  clipping by W W* before the painting operator (8.5.4); a clip is kept as
  a convex polygon (the intersection of rectangles and other convex
  paths); a non-convex clip is not applied, so the check errs towards
  reporting more;
- 8.10 form XObjects (Do with their /Matrix), image XObjects carry no
  vectors and are skipped;
- 9.3 text state: Tc Tw Tz TL Tf Tr Ts; 9.4 text objects: BT ET Tm Td TD
  T* Tj TJ ' "; 9.4.4 the text rendering matrix
  Trm = [Tfs*Th 0 0 Tfs 0 Trise] x Tm x CTM; 9.2.4 glyph positioning: after
  each glyph tx = ((w0 - Tj/1000) * Tfs + Tc + Tw) * Th, w0 from /Widths;
- 9.6.6.4 a symbolic TrueType font maps a single-byte code through its
  embedded program's (3,0) cmap (code 0xF000 + c) or (1,0) cmap (code c),
  which is what reportlab's subsets carry;
- the glyph's ink box is its bounding box in the TrueType 'glyf' table
  (xMin, yMin, xMax, yMax of the outline's points; OpenType specification,
  'glyf' table, glyph header), in font units, divided by the 'head' table's
  unitsPerEm to get glyph space in text units.  A glyph with no outline (a
  space) has no ink and no box.

A glyph's box in text space becomes a parallelogram on the page (turned
text keeps a tight, turned box, not the axis-aligned box of a turned
box; a mirrored page keeps it too).  The clip it was shown in cuts off
what does not print.  A font is read at the first string shown in it: a
font set and never used prints nothing.

Curves are flattened to chords in page space by Wang's bound (quoted from
memory: the deviation of a cubic Bezier from n equal-parameter chords is
at most 3/4 max(|P0 - 2P1 + P2|, |P1 - 2P2 + P3|) / n^2), to FLAT_PT.
A stroke's ink is every point within half its line width of a chord
(round ends: a little more than the butt caps kitgen draws with, so the
check errs towards reporting more); the width is scaled by sqrt|det CTM|.

A character counts as crossed when the ink of a stroke reaches more than
TOLERANCE_MM inside the glyph's ink box (the box shrunk by TOLERANCE_MM on
every side, or by a quarter of its thickness where the glyph is thinner
than four times the tolerance, such as a hyphen, so a line through it
still counts; and within its clip shrunk by TOLERANCE_MM).  The
tolerance, 0.1 mm, is about the registration and anti-aliasing blur of
an office print (a 600 dpi dot is 0.042 mm; toner spreads by about that
again): common practice, no published source.  A filled shape (a star's
dot, a mark) is checked the same way: its area reaching more than the
tolerance into the box.
"""

from __future__ import annotations

import io
import math
import re
from dataclasses import dataclass, field

import numpy as np
from fontTools.ttLib import TTFont
from pypdf.generic import ContentStream

MM_PER_PT = 25.4 / 72.0
TOLERANCE_MM = 0.1
#: Chord error of flattened curves, in points (about 0.002 mm).
FLAT_PT = 0.005
IDENTITY = (1.0, 0.0, 0.0, 1.0, 0.0, 0.0)


def mul(m, n):
    """m then n: the product m x n of the PDF's row-vector convention (8.3.4)."""
    a, b, c, d, e, f = m
    A, B, C, D, E, F = n
    return (a * A + b * C, a * B + b * D, c * A + d * C, c * B + d * D, e * A + f * C + E, e * B + f * D + F)


def apply(m, pts):
    """Points (N, 2) through the matrix m."""
    a, b, c, d, e, f = m
    pts = np.asarray(pts, dtype=float).reshape(-1, 2)
    return np.stack([a * pts[:, 0] + c * pts[:, 1] + e, b * pts[:, 0] + d * pts[:, 1] + f], axis=1)


# -- convex polygons ----------------------------------------------------------------

def ccw(poly: np.ndarray) -> np.ndarray:
    """The polygon's vertices counter-clockwise."""
    x, y = poly[:, 0], poly[:, 1]
    area2 = float(np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y))
    return poly if area2 >= 0 else poly[::-1].copy()


def is_convex(poly: np.ndarray) -> bool:
    if len(poly) < 3:
        return False
    d = np.roll(poly, -1, axis=0) - poly
    cross = d[:, 0] * np.roll(d[:, 1], -1) - d[:, 1] * np.roll(d[:, 0], -1)
    scale = float(np.max(np.abs(d))) ** 2 or 1.0
    cross = cross[np.abs(cross) > 1e-9 * scale]
    return bool(np.all(cross > 0) or np.all(cross < 0))


def clip_polygon(poly: np.ndarray, clip: np.ndarray) -> np.ndarray:
    """Sutherland-Hodgman: the part of ``poly`` inside the convex,
    counter-clockwise ``clip`` (possibly empty)."""
    out = list(map(tuple, poly))
    n = len(clip)
    for i in range(n):
        if not out:
            break
        ax, ay = clip[i]
        bx, by = clip[(i + 1) % n]

        def side(p):
            return (bx - ax) * (p[1] - ay) - (by - ay) * (p[0] - ax)

        src, out = out, []
        for j, p in enumerate(src):
            q = src[j - 1]
            sp, sq = side(p), side(q)
            if sp >= 0:
                if sq < 0:
                    t = sq / (sq - sp)
                    out.append((q[0] + t * (p[0] - q[0]), q[1] + t * (p[1] - q[1])))
                out.append(p)
            elif sq >= 0:
                t = sq / (sq - sp)
                out.append((q[0] + t * (p[0] - q[0]), q[1] + t * (p[1] - q[1])))
    return np.array(out, dtype=float).reshape(-1, 2)


def clip_segments(seg: np.ndarray, clip: np.ndarray | None) -> np.ndarray:
    """Cyrus-Beck: the parts of segments (N, 4: x0 y0 x1 y1) inside the
    convex counter-clockwise polygon ``clip`` (None: no clip)."""
    if clip is None or len(seg) == 0:
        return seg
    p0, d = seg[:, :2], seg[:, 2:] - seg[:, :2]
    t0, t1 = np.zeros(len(seg)), np.ones(len(seg))
    n = len(clip)
    for i in range(n):
        a, b = clip[i], clip[(i + 1) % n]
        normal = np.array([-(b[1] - a[1]), b[0] - a[0]])           # inward for a ccw polygon
        num = (p0 - a) @ normal                                     # >= 0 inside
        den = d @ normal
        with np.errstate(divide="ignore", invalid="ignore"):
            t = -num / den
        entering = den > 0
        leaving = den < 0
        t0 = np.where(entering, np.maximum(t0, t), t0)
        t1 = np.where(leaving, np.minimum(t1, t), t1)
        outside = (den == 0) & (num < 0)
        t1 = np.where(outside, -1.0, t1)
    keep = t1 > t0
    p0, d, t0, t1 = p0[keep], d[keep], t0[keep], t1[keep]
    return np.concatenate([p0 + d * t0[:, None], p0 + d * t1[:, None]], axis=1)


def shrink(poly: np.ndarray, by: float) -> np.ndarray | None:
    """A convex counter-clockwise polygon with every edge moved ``by``
    inwards (None where nothing is left)."""
    n = len(poly)
    lines = []
    for i in range(n):
        a, b = poly[i], poly[(i + 1) % n]
        d = b - a
        length = math.hypot(*d)
        if length < 1e-12:
            continue
        normal = np.array([-d[1], d[0]]) / length
        lines.append((a + normal * by, d))
    out = []
    m = len(lines)
    for i in range(m):
        (p, d), (q, e) = lines[i - 1], lines[i]
        den = d[0] * e[1] - d[1] * e[0]
        if abs(den) < 1e-12:
            out.append(q)
            continue
        t = ((q[0] - p[0]) * e[1] - (q[1] - p[1]) * e[0]) / den
        out.append(p + d * t)
    out = np.array(out, dtype=float).reshape(-1, 2)
    # the offset polygon keeps its orientation only if something is left
    return out if len(out) >= 3 and _area(out) > 0 and (by <= 0 or _inside_all(out, poly)) else None


def _area(poly):
    x, y = poly[:, 0], poly[:, 1]
    return 0.5 * float(np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y))


def _inside_all(pts, poly) -> bool:
    n = len(poly)
    for i in range(n):
        a, b = poly[i], poly[(i + 1) % n]
        if np.any((b[0] - a[0]) * (pts[:, 1] - a[1]) - (b[1] - a[1]) * (pts[:, 0] - a[0]) < -1e-9):
            return False
    return True


def thickness(poly: np.ndarray) -> float:
    """The convex polygon's least width (over its edges' directions)."""
    best = math.inf
    n = len(poly)
    for i in range(n):
        a, b = poly[i], poly[(i + 1) % n]
        d = b - a
        length = math.hypot(*d)
        if length < 1e-12:
            continue
        normal = np.array([-d[1], d[0]]) / length
        depth = (poly - a) @ normal
        best = min(best, float(depth.max() - depth.min()))
    return best


def _point_segment_distance(p, a, b):
    """Distances from points p (..., 2) to segments a-b (..., 2), broadcast."""
    ab = b - a
    den = np.sum(ab * ab, axis=-1)
    t = np.where(den > 0, np.sum((p - a) * ab, axis=-1) / np.where(den > 0, den, 1.0), 0.0)
    t = np.clip(t, 0.0, 1.0)
    q = a + ab * t[..., None]
    return np.hypot(*(p - q).transpose(-1, *range(p.ndim - 1)))


def segments_to_polygon(seg: np.ndarray, poly: np.ndarray) -> np.ndarray:
    """Distance from each segment (N, 4) to the convex ccw polygon
    (zero where the segment meets it)."""
    a, b = seg[:, None, :2], seg[:, None, 2:]
    v, w = poly[None, :, :], np.roll(poly, -1, axis=0)[None, :, :]
    # an end inside the polygon
    e = w - v

    def inside(p):
        return np.all(e[..., 0] * (p[..., 1] - v[..., 1]) - e[..., 1] * (p[..., 0] - v[..., 0]) >= 0, axis=1)

    hit = inside(a) | inside(b)
    # a proper crossing of an edge

    def orient(p, q, r):
        return (q[..., 0] - p[..., 0]) * (r[..., 1] - p[..., 1]) - (q[..., 1] - p[..., 1]) * (r[..., 0] - p[..., 0])

    o1, o2 = orient(a, b, v), orient(a, b, w)
    o3, o4 = orient(v, w, a), orient(v, w, b)
    hit |= np.any((o1 * o2 <= 0) & (o3 * o4 <= 0) & ~((o1 == 0) & (o2 == 0)), axis=1)
    d = np.minimum(_point_segment_distance(a, v, w), _point_segment_distance(b, v, w))
    d = np.minimum(d, _point_segment_distance(v, a, b))
    d = d.min(axis=1)
    return np.where(hit, 0.0, d)


# -- the font programs ----------------------------------------------------------------

@dataclass
class FontInfo:
    name: str
    first: int
    widths: list
    missing: float
    boxes: dict          # code -> (x0, y0, x1, y1) in text space units per 1 of font size, or None
    unicode: dict        # code -> str (ToUnicode), for reports

    def width(self, code: int) -> float:
        k = code - self.first
        return float(self.widths[k]) if 0 <= k < len(self.widths) else self.missing


def _to_unicode(stream) -> dict:
    """A ToUnicode CMap's bfchar and bfrange entries (9.10.3), for naming
    characters in reports only."""
    out = {}
    if stream is None:
        return out
    text = stream.get_object().get_data().decode("latin-1")

    def u(hexs):
        return bytes.fromhex(hexs).decode("utf-16-be", "replace")

    for block in re.findall(r"beginbfchar(.*?)endbfchar", text, re.S):
        for src, dst in re.findall(r"<([0-9A-Fa-f]+)>\s*<([0-9A-Fa-f]+)>", block):
            out[int(src, 16)] = u(dst)
    for block in re.findall(r"beginbfrange(.*?)endbfrange", text, re.S):
        for lo, hi, dst in re.findall(r"<([0-9A-Fa-f]+)>\s*<([0-9A-Fa-f]+)>\s*<([0-9A-Fa-f]+)>", block):
            start = int(dst, 16)
            for k, code in enumerate(range(int(lo, 16), int(hi, 16) + 1)):
                out[code] = chr(start + k)
    return out


def read_font(font) -> FontInfo:
    """A simple TrueType font of the page: its /Widths and, from its
    embedded program (FontFile2), each code's glyph box."""
    font = font.get_object()
    subtype = font.get("/Subtype")
    descriptor = font.get("/FontDescriptor")
    if subtype != "/TrueType" or descriptor is None or "/FontFile2" not in descriptor.get_object():
        raise NotImplementedError(f"font {font.get('/BaseFont')} ({subtype}): only embedded TrueType is read")
    descriptor = descriptor.get_object()
    program = TTFont(io.BytesIO(descriptor["/FontFile2"].get_object().get_data()))
    upem = program["head"].unitsPerEm
    glyf = program["glyf"]
    cmap = {(t.platformID, t.platEncID): t.cmap for t in program["cmap"].tables}
    boxes = {}
    for code in range(256):
        if (3, 0) in cmap:
            name = cmap[(3, 0)].get(0xF000 + code)
        else:
            name = cmap.get((1, 0), {}).get(code)
        if name is None:
            continue
        g = glyf[name]
        if g.numberOfContours == 0 or not hasattr(g, "xMin"):
            boxes[code] = None
            continue
        boxes[code] = (g.xMin / upem, g.yMin / upem, g.xMax / upem, g.yMax / upem)
    return FontInfo(str(font.get("/BaseFont")), int(font.get("/FirstChar", 0)),
                    [float(w) for w in font.get("/Widths", [])], float(descriptor.get("/MissingWidth", 0)),
                    boxes, _to_unicode(font.get("/ToUnicode")))


# -- what a page draws ----------------------------------------------------------------

@dataclass
class Glyph:
    box: np.ndarray       # the glyph's ink box on the page (pt), a ccw parallelogram
    clip: np.ndarray | None   # the clip it was shown in (convex, ccw), or None
    char: str
    text: str             # the whole string shown with it
    part: str             # the /KitPart it was drawn in ('' for page furniture)


@dataclass
class Strokes:
    seg: list = field(default_factory=list)      # arrays (N, 4), page pt
    half: list = field(default_factory=list)     # half widths (pt), one per segment
    part: list = field(default_factory=list)

    def arrays(self):
        if not self.seg:
            return np.zeros((0, 4)), np.zeros(0), []
        parts = [p for s, p in zip(self.seg, self.part) for _ in range(len(s))]
        return (np.concatenate(self.seg), np.concatenate([np.full(len(s), h) for s, h in zip(self.seg, self.half)]),
                parts)


@dataclass
class Fill:
    subpaths: list        # arrays (N, 2), page pt, each closed
    part: str


@dataclass
class PageInk:
    glyphs: list
    strokes: Strokes
    fills: list


@dataclass
class _State:
    ctm: tuple = IDENTITY
    width: float = 1.0
    dash: tuple = ((), 0.0)
    stroke_ink: bool = True
    fill_ink: bool = True
    clip: np.ndarray | None = None
    font: FontInfo | None = None
    size: float = 0.0
    tc: float = 0.0
    tw: float = 0.0
    th: float = 1.0
    tl: float = 0.0
    tr: int = 0
    rise: float = 0.0

    def copy(self):
        return _State(**self.__dict__)


def _inked(values) -> bool:
    """Whether a colour leaves ink on white paper: anything but white.
    One operand: grey (1 = white); three: RGB; four: CMYK (8.6.4)."""
    v = [float(x) for x in values]
    if len(v) == 1:
        return v[0] < 0.99
    if len(v) == 3:
        return min(v) < 0.99
    return max(v) > 0.01


def _flatten_cubic(p0, p1, p2, p3):
    """A cubic Bezier (page pt) as points, chords within FLAT_PT (Wang)."""
    m = max(np.hypot(*(p0 - 2 * p1 + p2)), np.hypot(*(p1 - 2 * p2 + p3)))
    n = max(1, int(math.ceil(math.sqrt(0.75 * m / FLAT_PT))))
    t = np.linspace(0.0, 1.0, n + 1)[1:, None]
    s = 1 - t
    return s ** 3 * p0 + 3 * s * s * t * p1 + 3 * s * t * t * p2 + t ** 3 * p3


def _dashed(points: np.ndarray, pattern, phase: float) -> list:
    """A polyline (page pt) cut into its dashes' polylines (8.4.3.6)."""
    if not pattern or sum(pattern) <= 0:
        return [points]
    pattern = list(pattern) * (2 if len(pattern) % 2 else 1)
    total = sum(pattern)
    pos = phase % total
    k = 0
    while pos >= pattern[k]:
        pos -= pattern[k]
        k = (k + 1) % len(pattern)
    left = pattern[k] - pos          # length left in the current dash or gap
    on = k % 2 == 0
    out, current = [], [points[0]] if on else []
    for a, b in zip(points[:-1], points[1:]):
        length = float(np.hypot(*(b - a)))
        done = 0.0
        while length - done > left:
            done += left
            p = a + (b - a) * (done / length)
            if on:
                current.append(p)
                out.append(np.array(current))
                current = []
            else:
                current = [p]
            on = not on
            k = (k + 1) % len(pattern)
            left = pattern[k]
        left -= length - done
        if on:
            current.append(b)
    if on and len(current) > 1:
        out.append(np.array(current))
    return out


def read_page_ink(reader, page, fonts: dict | None = None) -> PageInk:
    """Every glyph's printed ink box, every stroked segment and every
    filled area of the page, in the page's default user space (pt);
    ``fonts`` keeps the fonts read, by object, across a document's pages."""
    fonts = {} if fonts is None else fonts
    ink = PageInk([], Strokes(), [])
    _run(reader, page.get_contents(), page.get("/Resources"), _State(), ink, fonts)
    return ink


def _run(reader, contents, resources, gs: _State, ink: PageInk, fonts, part=""):
    resources = resources.get_object() if resources is not None else {}
    stack = []
    parts = [part]
    subpaths: list = []      # each: list of (kind, points in user space), closed flag
    current = None
    clip_next = None
    tm = tlm = IDENTITY
    for operands, op in ContentStream(contents, reader).operations:
        op = op.decode("latin-1") if isinstance(op, bytes) else op
        if op == "q":
            stack.append(gs.copy())
        elif op == "Q":
            gs = stack.pop()
        elif op == "cm":
            gs.ctm = mul(tuple(float(x) for x in operands), gs.ctm)
        elif op == "w":
            gs.width = float(operands[0])
        elif op == "d":
            gs.dash = (tuple(float(x) for x in operands[0]), float(operands[1]))
        elif op in ("G", "RG", "K"):
            gs.stroke_ink = _inked(operands)
        elif op in ("g", "rg", "k"):
            gs.fill_ink = _inked(operands)
        elif op in ("CS", "cs", "SC", "SCN", "sc", "scn"):
            raise NotImplementedError(f"colour operator {op}")
        elif op == "BDC":
            props = operands[1] if len(operands) > 1 else None
            name = ""
            if operands[0] == "/KitPart" and hasattr(props, "get"):
                name = str(props.get("/Part", ""))
            parts.append(name or parts[-1])
        elif op == "BMC":
            parts.append(parts[-1])
        elif op == "EMC":
            if len(parts) > 1:
                parts.pop()
        # paths (8.5.2)
        elif op == "m":
            current = [np.array([[float(operands[0]), float(operands[1])]])]
            subpaths.append([current, False])
        elif op == "l":
            current.append(np.array([[float(operands[0]), float(operands[1])]]))
        elif op in ("c", "v", "y"):
            v = [float(x) for x in operands]
            last = current[-1]
            p0 = last[2][-1] if isinstance(last, tuple) else last[-1]
            if op == "c":
                ctrl = [(v[0], v[1]), (v[2], v[3]), (v[4], v[5])]
            elif op == "v":
                ctrl = [tuple(p0), (v[0], v[1]), (v[2], v[3])]
            else:
                ctrl = [(v[0], v[1]), (v[2], v[3]), (v[2], v[3])]
            current.append(("curve", p0, np.array(ctrl)))
        elif op == "h":
            if subpaths:
                subpaths[-1][1] = True
        elif op == "re":
            x, y, w, h = (float(t) for t in operands)
            current = [np.array([[x, y], [x + w, y], [x + w, y + h], [x, y + h]])]
            subpaths.append([current, True])
        elif op in ("W", "W*"):
            clip_next = True
        elif op in ("S", "s", "f", "F", "f*", "B", "B*", "b", "b*", "n"):
            polys = [_subpath_points(sp, gs.ctm, closed or op in ("s", "b", "b*")) for sp, closed in subpaths]
            if op in ("S", "s", "B", "B*", "b", "b*") and gs.stroke_ink:
                _stroke(polys, gs, ink, parts[-1])
            if op in ("f", "F", "f*", "B", "B*", "b", "b*") and gs.fill_ink:
                closed = [p for p in polys if len(p) >= 3]
                if closed:
                    ink.fills.append(Fill(_clip_fill(closed, gs.clip), parts[-1]))
            if clip_next:
                gs.clip = _new_clip(polys, gs.clip)
            subpaths, current, clip_next = [], None, None
        # text (9.3, 9.4)
        elif op == "BT":
            tm = tlm = IDENTITY
        elif op == "Tf":
            # Read when a string is shown: a font set and never used
            # (reportlab's first BT ... ET) prints nothing.
            ref = resources["/Font"].raw_get(operands[0])
            key = (ref.idnum, ref.generation) if hasattr(ref, "idnum") else id(ref)
            gs.font, gs.size = _LazyFont(fonts, key, ref), float(operands[1])
        elif op == "Tc":
            gs.tc = float(operands[0])
        elif op == "Tw":
            gs.tw = float(operands[0])
        elif op == "Tz":
            gs.th = float(operands[0]) / 100.0
        elif op == "TL":
            gs.tl = float(operands[0])
        elif op == "Tr":
            gs.tr = int(operands[0])
        elif op == "Ts":
            gs.rise = float(operands[0])
        elif op == "Tm":
            tm = tlm = tuple(float(x) for x in operands)
        elif op in ("Td", "TD"):
            tx, ty = float(operands[0]), float(operands[1])
            if op == "TD":
                gs.tl = -ty
            tlm = mul((1.0, 0.0, 0.0, 1.0, tx, ty), tlm)
            tm = tlm
        elif op in ("T*", "'", '"'):
            if op == '"':
                gs.tw, gs.tc = float(operands[0]), float(operands[1])
            tlm = mul((1.0, 0.0, 0.0, 1.0, 0.0, -gs.tl), tlm)
            tm = tlm
            if op != "T*":
                tm = _show(_bytes(operands[-1]), tm, gs, ink, parts[-1])
        elif op == "Tj":
            tm = _show(_bytes(operands[0]), tm, gs, ink, parts[-1])
        elif op == "TJ":
            text = "".join(gs.font.unicode.get(c, "?") for item in operands[0]
                           if not isinstance(item, (int, float)) and not hasattr(item, "as_numeric")
                           for c in _bytes(item))
            for item in operands[0]:
                if isinstance(item, (int, float)) or hasattr(item, "as_numeric"):
                    tm = mul((1.0, 0.0, 0.0, 1.0, -float(item) / 1000.0 * gs.size * gs.th, 0.0), tm)
                else:
                    tm = _show(_bytes(item), tm, gs, ink, parts[-1], text)
        elif op == "Do":
            xobj = resources["/XObject"][operands[0]].get_object()
            if xobj.get("/Subtype") == "/Form":
                inner = gs.copy()
                inner.ctm = mul(tuple(float(x) for x in xobj.get("/Matrix", IDENTITY)), gs.ctm)
                _run(reader, xobj, xobj.get("/Resources", resources), inner, ink, fonts, parts[-1])
        elif op in ("BI", "ID", "EI", "sh"):
            raise NotImplementedError(f"operator {op}")


class _LazyFont:
    """A font of the page, read (once per document) at its first use."""

    def __init__(self, cache, key, ref):
        self.cache, self.key, self.ref = cache, key, ref

    def __getattr__(self, name):
        if self.key not in self.cache:
            self.cache[self.key] = read_font(self.ref)
        return getattr(self.cache[self.key], name)


def _bytes(s) -> bytes:
    if isinstance(s, bytes):
        return bytes(s)
    raw = getattr(s, "original_bytes", None)
    return bytes(raw) if raw is not None else str(s).encode("latin-1")


def _show(codes: bytes, tm, gs: _State, ink: PageInk, part: str, text: str | None = None):
    """Show a string: each glyph's box on the page, then move Tm (9.4.4, 9.2.4)."""
    font = gs.font
    if text is None:
        text = "".join(font.unicode.get(c, "?") for c in codes)
    scale = (gs.size * gs.th, 0.0, 0.0, gs.size, 0.0, gs.rise)
    for code in codes:
        box = font.boxes.get(code)
        if box is not None and gs.tr != 3 and gs.tr != 7 and (gs.fill_ink or gs.tr in (1, 2, 5, 6)):
            x0, y0, x1, y1 = box
            a, b, c, d, e, f = mul(mul(scale, tm), gs.ctm)
            corners = ((x0, y0), (x1, y0), (x1, y1), (x0, y1)) if a * d - b * c > 0 else \
                ((x0, y0), (x0, y1), (x1, y1), (x1, y0))       # a mirrored matrix turns the order round
            poly = np.array([(a * x + c * y + e, b * x + d * y + f) for x, y in corners])
            shown = poly if gs.clip is None else clip_polygon(poly, gs.clip)
            if len(shown) >= 3 and abs(_area(shown)) > 1e-9:
                ink.glyphs.append(Glyph(poly, gs.clip, font.unicode.get(code, "?"), text, part))
        tx = ((font.width(code) / 1000.0) * gs.size + gs.tc + (gs.tw if code == 32 else 0.0)) * gs.th
        tm = mul((1.0, 0.0, 0.0, 1.0, tx, 0.0), tm)
    return tm


def _subpath_points(sp, ctm, closed: bool) -> np.ndarray:
    """A subpath's points on the page (pt), curves flattened, closed
    subpaths ending where they started."""
    pts = []
    for piece in sp:
        if isinstance(piece, tuple):
            _, p0, ctrl = piece
            q = apply(ctm, np.vstack([p0, ctrl]))
            pts.append(_flatten_cubic(q[0], q[1], q[2], q[3]))
        else:
            pts.append(apply(ctm, piece))
    pts = np.vstack(pts)
    if closed and len(pts) > 1 and not np.allclose(pts[0], pts[-1]):
        pts = np.vstack([pts, pts[:1]])
    return pts


def _stroke(polys, gs: _State, ink: PageInk, part: str):
    a, b, c, d, _, _ = gs.ctm
    scale = math.sqrt(abs(a * d - b * c))      # user space to page, for widths and dashes
    pattern, phase = gs.dash
    half = max(gs.width, 0.0) * scale / 2.0
    for pts in polys:
        if len(pts) < 2:
            continue
        for run in _dashed(pts, [x * scale for x in pattern], phase * scale):
            if len(run) < 2:
                continue
            seg = np.concatenate([run[:-1], run[1:]], axis=1)
            seg = clip_segments(seg, gs.clip)
            if len(seg):
                ink.strokes.seg.append(seg)
                ink.strokes.half.append(half)
                ink.strokes.part.append(part)


def _clip_fill(polys, clip):
    if clip is None:
        return polys
    out = []
    for p in polys:
        p = ccw(p[:-1] if np.allclose(p[0], p[-1]) else p)
        if is_convex(p):
            q = clip_polygon(p, clip)
            if len(q) >= 3:
                out.append(q)
        else:
            out.append(p)
    return out


def _new_clip(polys, clip):
    """The clip after W n: the intersection with a convex path; a
    non-convex clip path is not applied (more ink, never less)."""
    if len(polys) != 1:
        return clip
    p = polys[0]
    p = p[:-1] if len(p) > 1 and np.allclose(p[0], p[-1]) else p
    p = ccw(p)
    if not is_convex(p):
        return clip
    return p if clip is None else ccw(clip_polygon(p, clip))


# -- lines over characters --------------------------------------------------------------

@dataclass(frozen=True)
class Crossing:
    page: int             # 1-based
    part: str
    text: str
    char: str
    at_mm: tuple          # the glyph's box centre on the page (mm from the lower left)
    by: str               # 'stroke' or 'fill'
    line_mm: tuple        # the stroke's segment (x0, y0, x1, y1) mm, or the fill's box
    width_mm: float

    def __str__(self):
        x, y = self.at_mm
        line = ", ".join(f"{v:.2f}" for v in self.line_mm)
        return (f"page {self.page} {self.part or 'furniture'}: {self.char!r} of {self.text!r} at ({x:.1f}, {y:.1f}) mm "
                f"under a {self.by} ({line}) mm, width {self.width_mm:.2f} mm")


def _core(g: Glyph, tol_pt: float) -> np.ndarray | None:
    """The glyph's box shrunk by the tolerance (or by a quarter of its
    thickness for a glyph thinner than four tolerances), within its clip
    shrunk by the tolerance: the edge of a clip is where ink ends, just as
    the edge of the glyph's box is."""
    core = shrink(g.box, min(tol_pt, thickness(g.box) / 4.0))
    if core is None or g.clip is None:
        return core
    inner = shrink(g.clip, tol_pt)
    if inner is None:
        return None
    core = clip_polygon(core, inner)
    return ccw(core) if len(core) >= 3 and abs(_area(core)) > 1e-12 else None


def crossings_on_page(ink: PageInk, page_number: int, tolerance_mm: float = TOLERANCE_MM) -> list[Crossing]:
    """Every glyph of the page that a stroke or a fill reaches more than
    ``tolerance_mm`` into."""
    tol = tolerance_mm / MM_PER_PT
    seg, half, seg_part = ink.strokes.arrays()
    lo = np.minimum(seg[:, :2], seg[:, 2:]) - half[:, None]
    hi = np.maximum(seg[:, :2], seg[:, 2:]) + half[:, None]
    fill_edges = []
    for f in ink.fills:
        for p in f.subpaths:
            q = p if np.allclose(p[0], p[-1]) else np.vstack([p, p[:1]])
            fill_edges.append((np.concatenate([q[:-1], q[1:]], axis=1), p, f))
    fill_boxes = np.array([[*p.min(axis=0), *p.max(axis=0)] for _, p, _ in fill_edges]).reshape(-1, 4)
    out = []
    # Broad phase: the glyphs whose box's bounds meet a segment's or a fill's.
    if not ink.glyphs:
        return out
    boxes = np.array([g.box for g in ink.glyphs])
    grow = max(0.0, -tol)         # a negative tolerance (a margin asked for) widens the box
    gmin, gmax = boxes.min(axis=1) - grow, boxes.max(axis=1) + grow
    hit = np.zeros(len(ink.glyphs), dtype=bool)
    for a in range(0, len(seg), 2048):
        l, h = lo[a:a + 2048], hi[a:a + 2048]
        hit |= np.any((l[None, :, 0] <= gmax[:, None, 0]) & (l[None, :, 1] <= gmax[:, None, 1])
                      & (h[None, :, 0] >= gmin[:, None, 0]) & (h[None, :, 1] >= gmin[:, None, 1]), axis=1)
    if len(fill_boxes):
        hit |= np.any((fill_boxes[None, :, 0] <= gmax[:, None, 0]) & (fill_boxes[None, :, 1] <= gmax[:, None, 1])
                      & (fill_boxes[None, :, 2] >= gmin[:, None, 0]) & (fill_boxes[None, :, 3] >= gmin[:, None, 1]),
                      axis=1)
    for i in np.nonzero(hit)[0]:
        g = ink.glyphs[i]
        core = _core(g, tol)
        if core is None:
            continue
        glo, ghi = core.min(axis=0), core.max(axis=0)
        centre = tuple(float(v) * MM_PER_PT for v in g.box.mean(axis=0))
        cand = np.nonzero(np.all(lo <= ghi, axis=1) & np.all(hi >= glo, axis=1))[0]
        if len(cand):
            dist = segments_to_polygon(seg[cand], core)
            bad = cand[dist < half[cand]]
            if len(bad):
                k = bad[0]
                out.append(Crossing(page_number, g.part, g.text, g.char, centre, "stroke",
                                    tuple(float(v) * MM_PER_PT for v in seg[k]), float(2 * half[k]) * MM_PER_PT))
                continue
        for edges, p, f in fill_edges:
            if np.any(p.max(axis=0) < glo) or np.any(p.min(axis=0) > ghi):
                continue
            met = np.any(segments_to_polygon(edges, core) == 0.0) or _point_in(core.mean(axis=0), p)
            if met:
                box = tuple(float(v) * MM_PER_PT for v in (*p.min(axis=0), *p.max(axis=0)))
                out.append(Crossing(page_number, g.part, g.text, g.char, centre, "fill", box, 0.0))
                break
    return out


def _point_in(pt, poly) -> bool:
    """Even-odd rule."""
    x, y = pt
    xs, ys = poly[:, 0], poly[:, 1]
    xj, yj = np.roll(xs, 1), np.roll(ys, 1)
    cond = (ys > y) != (yj > y)
    with np.errstate(divide="ignore", invalid="ignore"):
        xcross = (xj - xs) * (y - ys) / (yj - ys) + xs
    return bool(np.sum(cond & (x < xcross)) % 2)


def crossings(reader, tolerance_mm: float = TOLERANCE_MM) -> list[Crossing]:
    """Every crossed character of every page of the document."""
    out, fonts = [], {}
    for k, page in enumerate(reader.pages):
        out += crossings_on_page(read_page_ink(reader, page, fonts), k + 1, tolerance_mm)
    return out
